"""The reads of the append path: the vehicle, its newest entry, and the newest entry naming an
item, under the vehicle's lock.

Statements are built once (building one costs more than running it). On SQLite an installation
or removal reads all three in one driver-level query (:mod:`ledger.store.sqlite_path`); on
PostgreSQL the vehicle's row is locked first and the entries read after it.
"""

from __future__ import annotations

import datetime as dt
import json
from functools import lru_cache
from typing import NamedTuple

from sqlalchemy import bindparam, insert, select, true
from sqlalchemy.orm import Session

from ledger.core.ledger_rule import (
    EntryBeforeBaseline,
    EntryOutOfOrder,
    RunningState,
    is_late,
    leaves_installed,
)
from ledger.store.catalog import get_vehicle, registration_key
from ledger.store.models import LedgerEntryRow, VehicleRow
from ledger.store.sqlite_path import driver

__all__ = [
    "VehicleKey",
    "Head",
    "ItemState",
    "INSERT",
    "VEHICLE_HEAD_ITEM",
    "installs",
    "vehicle_key",
    "newest_entry",
    "baseline_date",
    "date_refusal",
    "newest_item_entry",
    "head_and_item",
    "locked_item_state",
]

_E = LedgerEntryRow


def installs(kind: str, detail_json: str) -> bool:
    """Whether an entry of ``kind`` that names an item leaves that item installed."""
    if kind == "correction":
        return leaves_installed(kind, json.loads(detail_json).get("reverses_kind"))
    return leaves_installed(kind)


class VehicleKey(NamedTuple):
    """A vehicle's id, registration and type id: what an append needs of it."""

    id: int
    registration: str
    type_id: int


# Statements of the append path, built once (building a statement costs more than running it).
_VEHICLE = (select(VehicleRow.id, VehicleRow.registration, VehicleRow.type_id)
            .where(VehicleRow.registration == bindparam("reg")))
_VEHICLE_LOCKED = _VEHICLE.with_for_update()


def vehicle_key(session: Session, registration: str, *, lock: bool = False) -> VehicleKey:
    """The vehicle's id, registration and type; with ``lock`` its row is locked (PostgreSQL
    ``FOR UPDATE``; on SQLite the transaction's ``BEGIN IMMEDIATE`` already serialises
    writers). A plain Core query on the session's connection: appends are the hot path."""
    row = session.connection().execute(_VEHICLE_LOCKED if lock else _VEHICLE,
                                       {"reg": registration_key(registration)}).first()
    if row is None:
        get_vehicle(session, registration)  # raises NotFoundError with the known vehicles
    return VehicleKey(*row)


class Head(NamedTuple):
    """The newest entry of a vehicle, as the append path reads it."""

    seq: int
    entry_date: dt.date
    mass_kg: float
    mx_kgm: float
    my_kgm: float
    mz_kgm: float
    z_known: int
    baseline_seq: int
    entry_hash: str

    def state(self) -> RunningState:
        return RunningState(self.seq, self.entry_date, self.mass_kg, self.mx_kgm, self.my_kgm,
                            self.mz_kgm, bool(self.z_known), self.baseline_seq)


def baseline_date(session: Session, vehicle_id: int, state: RunningState,
                  day: dt.date) -> dt.date | None:
    """The date of the weighing ``state`` starts from, read only for late paperwork (an entry
    dated ``day``, before the newest entry): what
    :func:`ledger.core.ledger_rule.check_date` needs then."""
    if not is_late(state, day) or state.baseline_seq is None:
        return None
    return session.scalar(select(_E.entry_date).where(_E.vehicle_id == vehicle_id,
                                                      _E.seq == state.baseline_seq))


def date_refusal(exc: EntryOutOfOrder | EntryBeforeBaseline, kind: str) -> str:
    """What date an entry may have, for a date the ledger's rule refused."""
    if isinstance(exc, EntryBeforeBaseline):
        return (f"a date on or after that of the weighing the empty state starts from, entry "
                f"{exc.baseline_seq} ({exc.baseline_date}): that weighing already measured "
                "the work done before it")
    return (f"a date on or after that of entry {exc.previous_seq} ({exc.previous_date}): a "
            f"{kind.replace('_', ' ')} sets the empty state to what was measured, so it is not "
            "dated before changes already recorded")


class ItemState(NamedTuple):
    """The newest entry that names an item, as the append path reads it."""

    seq: int
    kind: str
    entry_date: dt.date
    mass_kg: float
    x_m: float
    y_m: float
    z_m: float | None
    detail_json: str

    @property
    def installed(self) -> bool:
        """Whether this entry left the item installed."""
        return installs(self.kind, self.detail_json)


_HEAD_COLS = (_E.seq, _E.entry_date, _E.empty_mass_kg, _E.empty_mx_kgm, _E.empty_my_kgm,
              _E.empty_mz_kgm, _E.z_known, _E.baseline_seq, _E.entry_hash)
_ITEM_COLS = (_E.seq, _E.kind, _E.entry_date, _E.item_mass_kg, _E.item_x_m, _E.item_y_m,
              _E.item_z_m, _E.detail_json)


def _newest(cols, vehicle_id, item: bool):
    query = select(*cols).where(_E.vehicle_id == vehicle_id)
    if item:
        query = query.where(_E.item == bindparam("item"))
    return query.order_by(_E.seq.desc()).limit(1)


_HEAD = _newest(_HEAD_COLS, bindparam("vid"), False)
_ITEM = _newest(_ITEM_COLS, bindparam("vid"), True)
INSERT = insert(_E.__table__)
# The newest entry and the newest entry naming one item, in one round trip (both read after
# the vehicle's lock): an installation or removal needs both.
_head_sq = _HEAD.subquery("h")
_item_sq = _ITEM.subquery("i")
_HEAD_AND_ITEM = (select(*_head_sq.c, *_item_sq.c)
                  .select_from(_head_sq.outerjoin(_item_sq, true())))
# SQLite only (see locked_item_state): the vehicle too, in the same query.
_vid_of_reg = (select(VehicleRow.id).where(VehicleRow.registration == bindparam("reg"))
               .scalar_subquery())
_head_sq2 = _newest(_HEAD_COLS, _vid_of_reg, False).subquery("h")
_item_sq2 = _newest(_ITEM_COLS, _vid_of_reg, True).subquery("i")
VEHICLE_HEAD_ITEM = (
    select(VehicleRow.id, VehicleRow.registration, VehicleRow.type_id, *_head_sq2.c,
           *_item_sq2.c)
    .select_from(VehicleRow.__table__.outerjoin(_head_sq2, true())
                 .outerjoin(_item_sq2, true()))
    .where(VehicleRow.registration == bindparam("reg")))


@lru_cache(maxsize=4)
def _sqlite_vehicle_head_item(dialect):
    """(SQL, parameter names in order, fixed parameters (the limits), result converters by
    column) of VEHICLE_HEAD_ITEM."""
    compiled = VEHICLE_HEAD_ITEM.compile(dialect=dialect)
    fixed = {n: compiled.binds[n].effective_value for n in compiled.positiontup
             if n not in ("reg", "item")}
    procs = []
    for k, col in enumerate(VEHICLE_HEAD_ITEM.selected_columns):
        proc = col.type.dialect_impl(dialect).result_processor(dialect, None)
        if proc is not None:
            procs.append((k, proc))
    return compiled.string, tuple(compiled.positiontup), fixed, tuple(procs)


def newest_entry(session: Session, vehicle_id: int) -> Head | None:
    """The newest entry of vehicle ``vehicle_id``, or None."""
    row = session.connection().execute(_HEAD, {"vid": vehicle_id}).first()
    return None if row is None else Head(*row)


def head_and_item(session: Session, vehicle_id: int, name: str):
    """(head, item state) as :func:`newest_entry` and :func:`newest_item_entry` give them, in
    one query."""
    row = session.connection().execute(_HEAD_AND_ITEM, {"vid": vehicle_id,
                                                        "item": name}).first()
    if row is None:  # no entry at all
        return None, None
    head, item = Head(*row[:9]), row[9:]
    return head, (ItemState(*item) if item[0] is not None else None)


def locked_item_state(session: Session, registration: str, name: str):
    """(vehicle, head, item state) for an installation or removal, the vehicle locked.

    On SQLite the transaction began with ``BEGIN IMMEDIATE``, so nothing else can write until
    it ends and one query can read all three. On PostgreSQL the vehicle's row is locked first
    and the entries are read by a second statement, so that they are read after the lock
    (under READ COMMITTED a statement that waited for a lock still sees its own snapshot).
    """
    conn = session.connection()
    if conn.dialect.name != "sqlite":
        vehicle = vehicle_key(session, registration, lock=True)
        return (vehicle, *head_and_item(session, vehicle.id, name))
    sql, names, fixed, procs = _sqlite_vehicle_head_item(conn.dialect)
    params = {**fixed, "reg": registration_key(registration), "item": name}
    row = driver(conn).execute(sql, tuple(params[n] for n in names)).fetchone()
    if row is not None:
        row = list(row)
        for k, proc in procs:
            row[k] = proc(row[k])
    if row is None:
        get_vehicle(session, registration)  # raises NotFoundError with the known vehicles
    head = Head(*row[3:12]) if row[3] is not None else None
    item = ItemState(*row[12:]) if row[12] is not None else None
    return VehicleKey(*row[:3]), head, item


def newest_item_entry(session: Session, vehicle_id: int, name: str) -> ItemState | None:
    """The newest entry that names item ``name``, or None."""
    row = session.connection().execute(_ITEM, {"vid": vehicle_id, "item": name}).first()
    return None if row is None else ItemState(*row)
