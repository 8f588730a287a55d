"""Reading a vehicle's ledger: its current empty state, its entries, its installed items.

Figures for operation start from :func:`current_empty`, which verifies the vehicle's evidence
first. ``as_of`` (a date or ``YYYY-MM-DD`` text) reads the ledger as it stood on that date:
the entries, in sequence, up to the first one dated after it. Every state read so is one the
ledger stored (a running state is kept after each entry, in sequence), so late paperwork (an
entry dated before one recorded earlier, issue 13 item 15) counts from its place in the
sequence: an entry recorded after one dated later than ``as_of`` is not included, whatever
its own date.
"""

from __future__ import annotations

import datetime as dt
import json

from sqlalchemy import func, select
from sqlalchemy.orm import Session

from ledger.errors import ConflictError, NotFoundError
from ledger.store.heads import VehicleKey, installs, newest_entry, vehicle_key
from ledger.store.models import LedgerEntryRow
from ledger.store.records import ENTRY_COLUMNS, EmptyState, Entry, InstalledItem, entry_from_row
from ledger.typedata.readings import parse_date

__all__ = ["current_empty", "entries_of", "get_entry", "installed_items", "entry_at",
           "no_weighing"]

_E = LedgerEntryRow


def no_weighing(registration: str) -> ConflictError:
    """The refusal of anything that needs a weighing on a vehicle that has none."""
    return ConflictError(f"vehicle {registration!r} has no weighing recorded yet; record one "
                         f"first with `wbledger weigh {registration} --reading POINT=MASS …`")


def entry_at(session: Session, vehicle: VehicleKey, seq: int) -> Entry:
    """Entry ``seq`` of ``vehicle`` (NotFoundError naming the entries it has)."""
    cols = [getattr(_E, c) for c in ENTRY_COLUMNS]
    row = session.execute(select(*cols).where(_E.vehicle_id == vehicle.id, _E.seq == seq)).first()
    if row is None:
        head = session.scalar(select(func.max(_E.seq)).where(_E.vehicle_id == vehicle.id))
        hint = (f"{vehicle.registration} has entries 1 to {head}" if head
                else f"{vehicle.registration} has no entries yet")
        raise NotFoundError(f"entry of {vehicle.registration}", seq, hint)
    return entry_from_row(vehicle.registration, row)


def _as_of_filter(query, as_of, vehicle_id: int):
    """``query`` limited to the entries before the first one dated after ``as_of``."""
    if as_of is not None:
        day = parse_date(as_of, field="--as-of")
        first_later = (select(func.min(_E.seq))
                       .where(_E.vehicle_id == vehicle_id, _E.entry_date > day)
                       .scalar_subquery())
        query = query.where(_E.entry_date <= day,
                            (first_later.is_(None)) | (_E.seq < first_later))
    return query


def current_empty(session: Session, registration: str, *,
                  as_of: dt.date | str | None = None) -> EmptyState:
    """The empty vehicle now (or on ``as_of``): mass, moments, entry id and seq.

    This is what a loading sheet or an inertia report starts from; apply a configuration's
    items (:func:`ledger.store.configs.configuration_items`) on top. The vehicle's whole hash
    chain is verified first: figures for operation are never built on a ledger that was
    changed behind wbledger's back.

    Raises
    ------
    NotFoundError
        Unknown vehicle.
    ConflictError
        No weighing recorded (on or before ``as_of``).
    ChainError
        The vehicle's evidence does not verify (as ``wbledger verify`` reports it): its
        record, its type's revisions, its ledger chain, or the head its newest sheet recorded.
    """
    from ledger.store.evidence import require_vehicle

    vehicle = vehicle_key(session, registration)
    require_vehicle(session, vehicle)
    query = _as_of_filter(
        select(_E.id, _E.seq, _E.entry_date, _E.empty_mass_kg, _E.empty_mx_kgm,
               _E.empty_my_kgm, _E.empty_mz_kgm, _E.z_known, _E.baseline_seq, _E.entry_hash)
        .where(_E.vehicle_id == vehicle.id), as_of, vehicle.id).order_by(_E.seq.desc()).limit(1)
    row = session.execute(query).first()
    if row is None:
        if as_of is not None and newest_entry(session, vehicle.id) is not None:
            raise ConflictError(f"vehicle {registration!r} has no entry on or before {as_of}")
        raise no_weighing(registration)
    eid, seq, day, m, mx, my, mz, zk, base, ehash = row
    return EmptyState(vehicle.registration, eid, seq, day, m, mx, my, mz, bool(zk), base,
                      ehash)


def entries_of(session: Session, registration: str, *,
               as_of: dt.date | str | None = None) -> list[Entry]:
    """Every entry of a vehicle in ``seq`` order (up to ``as_of`` if given)."""
    vehicle = vehicle_key(session, registration)
    cols = [getattr(_E, c) for c in ENTRY_COLUMNS]
    query = _as_of_filter(select(*cols).where(_E.vehicle_id == vehicle.id), as_of, vehicle.id)
    rows = session.execute(query.order_by(_E.seq))
    return [entry_from_row(vehicle.registration, r) for r in rows]


def get_entry(session: Session, registration: str, seq: int) -> Entry:
    """Entry ``seq`` of a vehicle (NotFoundError if none)."""
    return entry_at(session, vehicle_key(session, registration), seq)


def installed_items(session: Session, registration: str, *,
                    as_of: dt.date | str | None = None,
                    _vehicle_row: VehicleKey | None = None) -> list[InstalledItem]:
    """Items installed through the ledger and not removed since, by name."""
    vehicle = _vehicle_row or vehicle_key(session, registration)
    query = _as_of_filter(
        select(_E.seq, _E.kind, _E.entry_date, _E.item, _E.item_mass_kg, _E.item_x_m,
               _E.item_y_m, _E.item_z_m, _E.detail_json)
        .where(_E.vehicle_id == vehicle.id, _E.item.is_not(None)), as_of,
        vehicle.id).order_by(_E.seq)
    on: dict[str, InstalledItem] = {}
    for seq, kind, day, name, m, x, y, z, detail_json in session.execute(query):
        if installs(kind, detail_json):
            shape = json.loads(detail_json).get("shape")
            on[name] = InstalledItem(name, seq, day, m, x, y, z, shape)
        else:
            on.pop(name, None)
    return sorted(on.values(), key=lambda i: i.name)
