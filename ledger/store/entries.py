"""The running empty-weight record of each vehicle: weighings, installations, removals,
corrections and CG-height records, appended under a lock and chained by hash.

Rules the ledger keeps
----------------------
- **Append only.** Nothing here updates or deletes an entry (the ORM refuses to); a mistake is
  put right by a *correction*, a new entry that reverses an earlier installation or removal and
  says why.
- **A weighing starts a baseline.** The first entry of a vehicle is a weighing; each later
  weighing sets the running empty state to what was measured and becomes the new baseline.
  Installations and removals add to the running state.
- **Items.** An item is installed under a name; it can be removed only while installed, and the
  removal takes the mass and arms recorded at installation unless others are given. A lateral
  arm that is not given is 0 (on the centreline, common practice); a vertical arm that is not
  given makes the vertical CG unknown from then on (never assumed 0).
- **Dates.** An entry's date is not after today and not before the previous entry's date, so
  the state "as of" a date is the last entry on or before it.
- **Concurrency.** Each append runs in the caller's transaction: on SQLite that transaction
  began with ``BEGIN IMMEDIATE`` (see :mod:`ledger.store.db`), on PostgreSQL the vehicle's row
  is locked with ``SELECT … FOR UPDATE`` first; the next ``seq`` is then ``max + 1`` and the
  ``UNIQUE (vehicle_id, seq)`` constraint backs that up.

Quantities passed to the functions here are either numbers, in SI (kg, m), or strings as a user
types them ("12 lb", "47.5 in", "30 USgal"), in which a bare number takes the vehicle type's
display unit (:mod:`ledger.typedata.readings`).

What an entry does to the running state is the ledger's one rule,
:func:`ledger.core.ledger_rule.apply_entry`; the bulk import (:mod:`ledger.store.transfer`) calls
it too. Scale readings become a weighing in :mod:`ledger.typedata.scales`; the reads of the
append path are in :mod:`ledger.store.heads`, its SQLite driver-level insert in
:mod:`ledger.store.sqlite_path`, the results in :mod:`ledger.store.records`. The names this
module has always offered (results, type look-ups, parsers, assessments) are re-exported here.
"""

from __future__ import annotations

import datetime as dt
import json
import math
from collections.abc import Mapping, Sequence
from typing import Any

from sqlalchemy import event, select
from sqlalchemy.orm import Session

from ledger.core.ledger_rule import (
    ABSOLUTE_KINDS,
    EmptyMassNotPositive,
    EntryBeforeBaseline,
    EntryEffect,
    EntryOutOfOrder,
    FirstEntryNotWeighing,
    Moments,
    RunningState,
    apply_entry,
    item_delta,
    negligible_change,
    reversal_delta,
)
from ledger.core.ledger_rule import LB as LB_KG
from ledger.errors import ConflictError, InputError
from ledger.store.chain import GENESIS_HASH, canonical_json, content_hash
from ledger.store.entry_reads import (
    current_empty,
    entries_of,
    entry_at,
    get_entry,
    installed_items,
    no_weighing,
)
from ledger.store.heads import (
    INSERT,
    Head,
    VehicleKey,
    baseline_date,
    date_refusal,
    locked_item_state,
    newest_entry,
    newest_item_entry,
    vehicle_key,
)
from ledger.store.models import ENTRY_KINDS, LedgerEntryRow
from ledger.store.records import EmptyState, Entry, InstalledItem, utc
from ledger.store.roles import recorder
from ledger.store.sqlite_path import driver, sqlite_insert
from ledger.store.typeinfo import TypeInfo, type_info, vehicle_type_info
from ledger.typedata.readings import (
    parse_date,
    parse_length,
    parse_mass,
    parse_shape,
    parse_text,
)
from ledger.typedata.reweigh import drift_warnings

__all__ = [
    "Entry",
    "EmptyState",
    "InstalledItem",
    "TypeInfo",
    "append_entry",
    "record_weighing",
    "install_item",
    "remove_item",
    "correct_entry",
    "record_cg_height",
    "current_empty",
    "installed_items",
    "entries_of",
    "get_entry",
    "vehicle_type_info",
    "type_info",
    "parse_date",
    "parse_shape",
    "negligible_change",
    "drift_warnings",
    "sqlite_insert",
    "LB_KG",
]

_E = LedgerEntryRow


@event.listens_for(LedgerEntryRow, "before_update")
def _refuse_update(_mapper, _connection, target) -> None:
    raise ConflictError(f"ledger entry {target.seq} is recorded and cannot be changed; "
                        "reverse it with `wbledger correct REG SEQ --reason …`")


@event.listens_for(LedgerEntryRow, "before_delete")
def _refuse_delete(_mapper, _connection, target) -> None:
    raise ConflictError(f"ledger entry {target.seq} is recorded and cannot be deleted; "
                        "reverse it with `wbledger correct REG SEQ --reason …`")


def _now() -> dt.datetime:
    return dt.datetime.now(dt.UTC)


# --- appending ------------------------------------------------------------------------------

def append_entry(session: Session, registration: str, kind: str, *, actor: str,
                 entry_date: dt.date | str | None = None,
                 delta: Sequence[float | None] | None = None,
                 state: Sequence[float | None] | None = None,
                 reason: str | None = None, reference: str | None = None,
                 item: str | None = None, item_mass_kg: float | None = None,
                 item_x_m: float | None = None, item_y_m: float | None = None,
                 item_z_m: float | None = None, reverses_seq: int | None = None,
                 detail: Mapping[str, Any] | None = None,
                 recorded_at: dt.datetime | None = None,
                 _vehicle_row: VehicleKey | None = None, _head_row=False) -> Entry:
    """Append one entry to a vehicle's ledger, in the caller's transaction; return it.

    The generic append every specific function here goes through; other modules use it for
    entries of their own (``kind="cg_height"``). It locks the vehicle, checks the date, computes
    the running state, the baseline and the hash, and inserts the row.

    Parameters
    ----------
    session : Session
        An open session (its transaction is the caller's, e.g. :func:`db.session_scope`).
    registration : str
        The vehicle.
    kind : str
        One of ``ENTRY_KINDS``.
    actor : str
        Who records it.
    entry_date : date or str, optional
        Date of the work (default today); not after today, not before the previous entry.
    delta : (dm, dmx, dmy, dmz), for install, remove and correction
        Change to the empty vehicle in kg and kg·m; ``dmz`` None when the vertical arm is not
        known (the vertical CG becomes unknown).
    state : (m, mx, my, mz), for weighing and cg_height
        The measured empty state in kg and kg·m; ``mz`` None when not measured.
    detail : mapping, optional
        Anything else worth keeping (readings, shape, fit), stored as canonical JSON.

    Raises
    ------
    NotFoundError
        Unknown vehicle.
    ConflictError
        Not a weighing although the vehicle has none yet; an empty mass that would not stay
        above 0.
    InputError
        A date in the future or before the previous entry; non-finite numbers.
    """
    given = _given(kind, delta, state)
    for name, v in (("item mass", item_mass_kg), ("--arm", item_x_m), ("--lat-arm", item_y_m),
                    ("--vert-arm", item_z_m)):
        if v is not None and not math.isfinite(v):
            raise InputError(name, v, "a finite number")
    day = parse_date(entry_date)
    conn = session.connection()
    actor_text = recorder(conn, parse_text(actor, "--by", required=True))

    vehicle = _vehicle_row if _vehicle_row is not None else vehicle_key(session, registration,
                                                                      lock=True)
    head = newest_entry(session, vehicle.id) if _head_row is False else _head_row
    effect = _apply(head, kind, day, given, registration,
                    None if head is None else baseline_date(session, vehicle.id,
                                                            head.state(), day))
    values = {
        "vehicle_id": vehicle.id, "kind": kind, "entry_date": day,
        "recorded_at": _now() if recorded_at is None else utc(recorded_at),
        "actor": actor_text,
        "reason": parse_text(reason, "--reason", max_len=4000),
        "reference": parse_text(reference, "--ref"), "item": parse_text(item, "item"),
        "item_mass_kg": item_mass_kg, "item_x_m": item_x_m, "item_y_m": item_y_m,
        "item_z_m": item_z_m, **effect.columns(), "reverses_seq": reverses_seq,
        "detail_json": canonical_json(dict(detail or {})),
        "prev_hash": GENESIS_HASH if head is None else head.entry_hash,
    }
    for k in ("item_mass_kg", "item_x_m", "item_y_m", "item_z_m"):
        if values[k] is not None:
            values[k] = float(values[k]) + 0.0
    values["entry_hash"] = content_hash(values, vehicle.registration)
    if conn.dialect.name == "sqlite":
        plan = sqlite_insert(conn.dialect)
        new_id = driver(conn).execute(plan.sql, plan.row(values)).lastrowid
    else:
        new_id = conn.execute(INSERT, values).inserted_primary_key[0]
    values.pop("vehicle_id")
    values["z_known"] = effect.after.z_known
    return Entry(registration=vehicle.registration, id=new_id, **values)


def _given(kind: str, delta: Sequence[float | None] | None,
           state: Sequence[float | None] | None) -> Moments:
    """The four values an entry of ``kind`` is given: its measured ``state`` for a weighing or
    CG height, else its ``delta``; finite, ``mz`` None when not known."""
    if kind not in ENTRY_KINDS:
        raise InputError("kind", kind, "one of " + ", ".join(ENTRY_KINDS))
    absolute = kind in ABSOLUTE_KINDS
    if absolute == (state is None) or (delta is None) == (state is None):
        need = "state" if absolute else "delta"
        raise InputError(need, None, f"a {kind} entry is given its {need} (and not the other)")
    given = state if absolute else delta
    assert given is not None  # one of the two, checked above
    what = "state" if absolute else "delta"
    if len(given) != 4:
        raise InputError(what, given, "four values: m, mx, my, mz")
    for name, v in zip(("mass", "mx", "my"), given[:3]):
        if v is None or not math.isfinite(v):
            raise InputError(f"{what}.{name}", v, "a finite number")
    if given[3] is not None and not math.isfinite(given[3]):
        raise InputError(f"{what}.mz", given[3], "a finite number")
    return Moments(*given)


def _apply(head: Head | None, kind: str, day: dt.date, given: Moments,
           registration: str, baseline: dt.date | None) -> EntryEffect:
    """:func:`ledger.core.ledger_rule.apply_entry` on the vehicle's newest entry, its refusals
    worded for an entry recorded by hand (``baseline``: :func:`baseline_date`)."""
    try:
        return apply_entry(RunningState() if head is None else head.state(), kind, day, given,
                           baseline_date=baseline)
    except FirstEntryNotWeighing:
        raise no_weighing(registration) from None
    except (EntryOutOfOrder, EntryBeforeBaseline) as exc:
        raise InputError("--date", day.isoformat(), date_refusal(exc, kind)) from None
    except EmptyMassNotPositive as exc:
        from ledger.units import format_quantity

        raise ConflictError(
            f"this {kind} would leave vehicle {registration!r} with an empty mass of "
            f"{format_quantity(exc.mass_kg, 'kg', 3)}; the empty mass must stay above 0 kg"
        ) from None


def _units_for(session: Session, vehicle: VehicleKey, *values) -> Any:
    """The type's display units if any value needs parsing (a string), else None."""
    if any(isinstance(v, str) for v in values):
        return vehicle_type_info(session, vehicle).vtype.units
    return None


def install_item(session: Session, registration: str, item: str, *, mass, arm,
                 lat_arm=None, vert_arm=None, shape=None, actor: str, reason: str | None,
                 entry_date: dt.date | str | None = None,
                 reference: str | None = None) -> Entry:
    """Record the installation of an item: adds ``mass`` at (``arm``, ``lat_arm``,
    ``vert_arm``) to the empty vehicle.

    ``mass`` and the arms are SI numbers or user strings (see the module notes); ``lat_arm``
    defaults to 0, ``vert_arm`` to unknown. ``shape`` (``"box,length=…"`` or a dict, see
    :func:`parse_shape`) is kept for inertia reports.

    Raises
    ------
    ConflictError
        An item of that name is installed already; the vehicle has no weighing yet.
    InputError
        A mass that is negative or not finite, an arm that is not finite, a bad date or shape.
    """
    name = parse_text(item, "ITEM", required=True)
    parse_text(reason, "--reason", required=True, max_len=4000)
    vehicle, head, state = locked_item_state(session, registration, name)
    units = _units_for(session, vehicle, mass, arm, lat_arm, vert_arm, shape)
    m = parse_mass(mass, units, "--mass")
    x = parse_length(arm, units, "--arm")
    y = 0.0 if lat_arm is None else parse_length(lat_arm, units, "--lat-arm")
    z = None if vert_arm is None else parse_length(vert_arm, units, "--vert-arm")
    shp = parse_shape(shape, units)
    if state is not None and state.installed:
        raise ConflictError(f"item {name!r} is installed on {registration} already (entry "
                            f"{state.seq}); remove it first or give this one another name")
    detail = {"shape": shp} if shp else {}
    return append_entry(session, registration, "install", actor=actor, entry_date=entry_date,
                        delta=item_delta("install", m, x, y, z), reason=reason,
                        reference=reference, item=name, item_mass_kg=m, item_x_m=x,
                        item_y_m=y, item_z_m=z, detail=detail, _vehicle_row=vehicle,
                        _head_row=head)


def remove_item(session: Session, registration: str, item: str, *, mass=None, arm=None,
                lat_arm=None, vert_arm=None, actor: str, reason: str | None,
                entry_date: dt.date | str | None = None,
                reference: str | None = None) -> Entry:
    """Record the removal of an installed item, with the mass and arms recorded when it was
    installed unless others are given (say why in ``reason``).

    Raises
    ------
    ConflictError
        The item is not installed (never, or removed since).
    """
    name = parse_text(item, "ITEM", required=True)
    parse_text(reason, "--reason", required=True, max_len=4000)
    vehicle, head, state = locked_item_state(session, registration, name)
    if state is None or not state.installed:
        on = installed_items(session, registration, _vehicle_row=vehicle)
        known = ", ".join(repr(i.name) for i in on[:12]) or "none"
        why = ("was never installed" if state is None
               else f"is not installed (removed by entry {state.seq})")
        raise ConflictError(f"item {name!r} {why} on {registration}; installed items: {known}")
    seq0, _kind, _date, m0, x0, y0, z0, detail0 = state
    units = _units_for(session, vehicle, mass, arm, lat_arm, vert_arm)
    m = m0 if mass is None else parse_mass(mass, units, "--mass")
    x = x0 if arm is None else parse_length(arm, units, "--arm")
    y = y0 if lat_arm is None else parse_length(lat_arm, units, "--lat-arm")
    z = z0 if vert_arm is None else parse_length(vert_arm, units, "--vert-arm")
    detail: dict[str, Any] = {"installed_seq": seq0}
    shape = json.loads(detail0).get("shape")
    if shape:
        detail["shape"] = shape
    if (m, x, y, z) != (m0, x0, y0, z0):
        detail["as_installed"] = {"mass_kg": m0, "x_m": x0, "y_m": y0, "z_m": z0}
    return append_entry(session, registration, "remove", actor=actor, entry_date=entry_date,
                        delta=item_delta("remove", m, x, y, z),
                        reason=reason, reference=reference, item=name, item_mass_kg=m,
                        item_x_m=x, item_y_m=y, item_z_m=z, detail=detail,
                        _vehicle_row=vehicle, _head_row=head)


def correct_entry(session: Session, registration: str, seq: int, *, reason: str | None,
                  actor: str,
                  entry_date: dt.date | str | None = None,
                  reference: str | None = None) -> Entry:
    """Reverse installation or removal ``seq`` with a new entry that says why.

    The correction applies the opposite change (same item, mass and arms). A weighing is not
    reversed (record a new one); an entry is reversed at most once, and only while nothing
    later has changed the same item.

    Raises
    ------
    NotFoundError
        No entry ``seq``.
    ConflictError
        Not an installation or removal, reversed already, or its item changed since.
    InputError
        No reason given.
    """
    why = parse_text(reason, "--reason", required=True, max_len=4000)
    if isinstance(seq, bool) or not isinstance(seq, int) or seq < 1:
        raise InputError("SEQ", seq, "an entry number, 1 or more")
    vehicle = vehicle_key(session, registration, lock=True)
    target = entry_at(session, vehicle, seq)
    if target.kind not in ("install", "remove"):
        what = {"weighing": "a weighing is not reversed; record a new weighing with "
                            f"`wbledger weigh {registration}`",
                "correction": "a correction is not reversed; record the change again"}
        raise ConflictError(f"entry {seq} of {registration} is a {target.kind}: "
                            + what.get(target.kind, "only installations and removals are "
                                       "reversed"))
    done = session.scalar(select(_E.seq).where(_E.vehicle_id == vehicle.id,
                                               _E.reverses_seq == seq).limit(1))
    if done is not None:
        raise ConflictError(f"entry {seq} of {registration} was reversed already by entry "
                            f"{done}")
    latest = newest_item_entry(session, vehicle.id, target.item)
    if latest is not None and latest.seq != seq:
        raise ConflictError(f"entry {seq} of {registration} ({target.kind} of "
                            f"{target.item!r}) cannot be reversed: entry {latest.seq} changed "
                            f"{target.item!r} since; reverse entry {latest.seq} first")
    detail = {"reverses_kind": target.kind}
    shape = target.detail.get("shape")
    if shape:
        detail["shape"] = shape
    return append_entry(session, registration, "correction", actor=actor,
                        entry_date=entry_date,
                        delta=reversal_delta(target.delta_mass_kg, target.delta_mx_kgm,
                                             target.delta_my_kgm, target.delta_mz_kgm,
                                             target.item_z_m),
                        reason=why, reference=reference, item=target.item,
                        item_mass_kg=target.item_mass_kg, item_x_m=target.item_x_m,
                        item_y_m=target.item_y_m, item_z_m=target.item_z_m,
                        reverses_seq=seq, detail=detail, _vehicle_row=vehicle)


def record_cg_height(session: Session, registration: str, z_m, *, actor: str,
                     entry_date: dt.date | str | None = None, reason: str | None = None,
                     reference: str | None = None,
                     detail: Mapping[str, Any] | None = None) -> Entry:
    """Record a measured vertical CG (e.g. an axle-lift CG height) of the current empty
    vehicle: keeps mass and horizontal moments, sets the vertical moment to ``mass × z_m``.

    ``z_m`` is the vertical arm in the type's z (m, or a user string). ``detail`` keeps the
    measurement (angles, loads, fit residual).
    """
    vehicle = vehicle_key(session, registration, lock=True)
    units = _units_for(session, vehicle, z_m)
    z = parse_length(z_m, units, "vertical CG")
    head = newest_entry(session, vehicle.id)
    if head is None:
        raise no_weighing(registration)
    m, mx, my = head.mass_kg, head.mx_kgm, head.my_kgm
    return append_entry(session, registration, "cg_height", actor=actor,
                        entry_date=entry_date, state=(m, mx, my, m * z), reason=reason,
                        reference=reference, detail={"cg_z_m": z, **dict(detail or {})},
                        _vehicle_row=vehicle)


def record_weighing(session: Session, registration: str, readings: Mapping[str, Any], *,
                    actor: str, tares: Mapping[str, Any] | None = None,
                    fuel: Mapping[str, Any] | None = None,
                    adjustments: Sequence[Mapping[str, Any]] = (),
                    entry_date: dt.date | str | None = None, scales: str | None = None,
                    level: str | None = None, note: str | None = None,
                    reason: str | None = None, reference: str | None = None,
                    pitched: Any = None) -> Entry:
    """Record a weighing: a reading at every weighing point of the type → new baseline.

    Parameters
    ----------
    readings : mapping point name → mass
        One scale reading per weighing point the type defines (kg, or user strings).
    tares : mapping point name → mass, optional
        Tare at a point (chocks, blocks left on the scale); default 0.
    fuel : mapping tank name → quantity, optional
        Total contents of a fuel tank as weighed (a volume or a mass; a number is in the
        tank's basis: m³ or kg). The usable part (above the type's unusable quantity) is
        removed at the tank's arms; a tank holding less than its unusable fuel has the
        shortfall added. A fuel tank not named is taken to hold exactly its unusable fuel.
    adjustments : sequence of {"label", "mass", "x", "y"?, "z"?}
        Other corrections to the as-weighed condition: a positive mass is added (oil drained
        for the weighing), a negative one removed (equipment not part of the empty vehicle).
    scales, level, note : str, optional
        Equipment used, how the vehicle was levelled, anything else; kept in the entry.
    pitched : ledger.typedata.scales.PitchedWeighing, optional
        Readings with the vehicle pitched nose-up: the vertical CG they give
        (:func:`ledger.core.weighing.vertical_cg_from_pitch`) is recorded as a CG-height entry
        right after the weighing, with the same date (issue 13 item 17).

    Returns the weighing's entry.

    The computation is :func:`ledger.core.weighing.empty_weight_from_scales` (FAA-H-8083-1,
    weighing chapter: net = reading − tare; CG = Σ(R·x)/ΣR; remove usable fuel, keep unusable).

    Raises
    ------
    InputError
        A missing or unknown weighing point, a negative net reading, a non-finite value, an
        unknown tank, a quantity above the tank's capacity; a result that is not a plausible
        empty mass for the type (:func:`implausible_empty_mass`), naming the readings.
    """
    # Imported here: the weighing computation loads numpy, which no other append needs.
    from ledger.typedata.scales import weighing_from_readings

    vehicle = vehicle_key(session, registration, lock=True)
    info = vehicle_type_info(session, vehicle)
    w = weighing_from_readings(info.vtype, info.name, info.revision, readings, tares=tares,
                               fuel=fuel, adjustments=adjustments, scales=scales, level=level,
                               note=note, pitched=pitched)
    weighing = append_entry(session, registration, "weighing", actor=actor,
                            entry_date=entry_date,
                            state=(w.mass_kg, w.mx_kgm, w.my_kgm, w.mz_kgm), reason=reason,
                            reference=reference, detail=w.detail, _vehicle_row=vehicle)
    if w.cg_height is not None:
        record_cg_height(session, registration, w.cg_height["cg_z_m"], actor=actor,
                         entry_date=weighing.entry_date, reason=reason, reference=reference,
                         detail=w.cg_height["detail"])
    return weighing
