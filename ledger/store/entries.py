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
display unit.

Negligible changes (AC 43.13-1B CHG 1, §10-2c): a change of empty weight of 1 lb or less for an
aircraft whose empty weight is under 5,000 lb, 2 lb or less from 5,000 to 50,000 lb, 5 lb or less
above 50,000 lb, together with a CG change under 0.05 % MAC (fixed wing) or under 0.2 % of the
maximum allowable CG range (rotary wing). An empty weight of exactly 5,000 lb is put in the
2 lb band (the circular leaves it open). Types without a MAC (fixed wing), drones and ground
vehicles are not assessed.
"""

from __future__ import annotations

import datetime as dt
import json
import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from functools import lru_cache
from typing import Any, NamedTuple

from sqlalchemy import bindparam, event, func, insert, select, true
from sqlalchemy.orm import Session

from ledger.bounds import TEXT_MAX, check_text
from ledger.errors import ChainError, ConflictError, InputError, NotFoundError
from ledger.core.ledger_rule import (
    ABSOLUTE_KINDS,
    EmptyMassNotPositive,
    EntryEffect,
    EntryOutOfOrder,
    FirstEntryNotWeighing,
    Moments,
    RunningState,
    apply_entry,
    item_delta,
    leaves_installed,
    reversal_delta,
)
from ledger.store.chain import GENESIS_HASH, canonical_json, content_hash
from ledger.store.models import (
    ENTRY_KINDS,
    LedgerEntryRow,
    VehicleRow,
    VehicleTypeRow,
)
from ledger.store.roles import recorder
from ledger.typedata.model import SHAPE_DIMENSIONS

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
    "LB_KG",
]

LB_KG = 0.45359237  # kg per lb, exact (NIST SP 811, appendix B)

#: Columns read back for an :class:`Entry`, in order.
_ENTRY_COLUMNS = (
    "id", "seq", "kind", "entry_date", "recorded_at", "actor", "reason", "reference", "item",
    "item_mass_kg", "item_x_m", "item_y_m", "item_z_m",
    "delta_mass_kg", "delta_mx_kgm", "delta_my_kgm", "delta_mz_kgm",
    "empty_mass_kg", "empty_mx_kgm", "empty_my_kgm", "empty_mz_kgm",
    "z_known", "baseline_seq", "reverses_seq", "detail_json", "prev_hash", "entry_hash",
)
_E = LedgerEntryRow


@event.listens_for(LedgerEntryRow, "before_update")
def _refuse_update(_mapper, _connection, target) -> None:
    raise ConflictError(f"ledger entry {target.seq} is recorded and cannot be changed; "
                        "reverse it with `wbledger correct REG SEQ --reason …`")


@event.listens_for(LedgerEntryRow, "before_delete")
def _refuse_delete(_mapper, _connection, target) -> None:
    raise ConflictError(f"ledger entry {target.seq} is recorded and cannot be deleted; "
                        "reverse it with `wbledger correct REG SEQ --reason …`")


# --- results --------------------------------------------------------------------------------

@dataclass(frozen=True)
class Entry:
    """One ledger entry as stored. Masses kg, arms m, moments kg·m.

    ``delta_*`` is the change this entry made to the empty vehicle, ``empty_*`` the running
    empty state after it. ``empty_mz_kgm`` means something only when ``z_known``.
    """

    registration: str
    id: int
    seq: int
    kind: str
    entry_date: dt.date
    recorded_at: dt.datetime
    actor: str
    reason: str | None
    reference: str | None
    item: str | None
    item_mass_kg: float | None
    item_x_m: float | None
    item_y_m: float | None
    item_z_m: float | None
    delta_mass_kg: float
    delta_mx_kgm: float
    delta_my_kgm: float
    delta_mz_kgm: float
    empty_mass_kg: float
    empty_mx_kgm: float
    empty_my_kgm: float
    empty_mz_kgm: float
    z_known: bool
    baseline_seq: int
    reverses_seq: int | None
    detail_json: str = field(repr=False)
    prev_hash: str = field(repr=False)
    entry_hash: str = field(repr=False)

    @property
    def detail(self) -> dict:
        try:
            return json.loads(self.detail_json)
        except (TypeError, ValueError):
            raise ChainError(f"entry {self.seq} of {self.registration}: its stored detail is "
                             "not valid JSON; it was changed outside wbledger. See "
                             f"`wbledger verify {self.registration}`") from None

    @property
    def cg_x_m(self) -> float:
        return self.empty_mx_kgm / self.empty_mass_kg

    @property
    def cg_y_m(self) -> float:
        return self.empty_my_kgm / self.empty_mass_kg

    @property
    def cg_z_m(self) -> float | None:
        return self.empty_mz_kgm / self.empty_mass_kg if self.z_known else None

    def state(self) -> EmptyState:
        """The running empty state after this entry."""
        return EmptyState(self.registration, self.id, self.seq, self.entry_date,
                          self.empty_mass_kg, self.empty_mx_kgm, self.empty_my_kgm,
                          self.empty_mz_kgm, self.z_known, self.baseline_seq,
                          self.entry_hash)

    def to_dict(self) -> dict:
        """JSON-able, SI values with unit-named keys."""
        return {
            "registration": self.registration, "seq": self.seq, "kind": self.kind,
            "entry_date": self.entry_date.isoformat(),
            "recorded_at": _utc(self.recorded_at).isoformat(),
            "actor": self.actor, "reason": self.reason, "reference": self.reference,
            "item": self.item, "item_mass_kg": self.item_mass_kg, "item_x_m": self.item_x_m,
            "item_y_m": self.item_y_m, "item_z_m": self.item_z_m,
            "delta_mass_kg": self.delta_mass_kg, "delta_mx_kgm": self.delta_mx_kgm,
            "delta_my_kgm": self.delta_my_kgm,
            "delta_mz_kgm": self.delta_mz_kgm if self.z_known else None,
            "empty_mass_kg": self.empty_mass_kg, "empty_mx_kgm": self.empty_mx_kgm,
            "empty_my_kgm": self.empty_my_kgm,
            "empty_mz_kgm": self.empty_mz_kgm if self.z_known else None,
            "cg_x_m": self.cg_x_m, "cg_y_m": self.cg_y_m, "cg_z_m": self.cg_z_m,
            "z_known": self.z_known, "baseline_seq": self.baseline_seq,
            "reverses_seq": self.reverses_seq, "detail": self.detail,
            "entry_hash": self.entry_hash,
        }


@dataclass(frozen=True)
class EmptyState:
    """The empty vehicle after one ledger entry: what a loading sheet starts from.

    ``entry_id`` is the database id of that entry (a saved sheet keeps it), ``seq`` its number
    in the vehicle's ledger. ``mz_kgm`` means something only when ``z_known``.
    """

    registration: str
    entry_id: int
    seq: int
    entry_date: dt.date
    mass_kg: float
    mx_kgm: float
    my_kgm: float
    mz_kgm: float
    z_known: bool
    baseline_seq: int
    #: The entry's hash: the ledger head a sheet built on this state records and prints.
    entry_hash: str | None = None

    @property
    def moments_kgm(self) -> tuple[float, float, float | None]:
        """(Σm·x, Σm·y, Σm·z or None when the vertical CG is not known)."""
        return (self.mx_kgm, self.my_kgm, self.mz_kgm if self.z_known else None)

    @property
    def cg_m(self) -> tuple[float, float, float | None]:
        m = self.mass_kg
        return (self.mx_kgm / m, self.my_kgm / m, self.mz_kgm / m if self.z_known else None)


@dataclass(frozen=True)
class InstalledItem:
    """An item on the vehicle by the ledger: installed at ``seq`` and not removed since."""

    name: str
    seq: int
    entry_date: dt.date
    mass_kg: float
    x_m: float
    y_m: float
    z_m: float | None
    shape: dict | None = None

    def to_dict(self) -> dict:
        return {"name": self.name, "seq": self.seq, "entry_date": self.entry_date.isoformat(),
                "mass_kg": self.mass_kg, "x_m": self.x_m, "y_m": self.y_m, "z_m": self.z_m,
                "shape": self.shape}


@dataclass(frozen=True)
class TypeInfo:
    """The type a vehicle is computed with: its newest revision."""

    name: str
    revision_id: int
    revision: int
    vtype: Any  # ledger.typedata.VehicleType


# --- small helpers --------------------------------------------------------------------------

def _utc(value: dt.datetime) -> dt.datetime:
    if value.tzinfo is None:  # SQLite gives back naive datetimes; they were stored as UTC
        return value.replace(tzinfo=dt.UTC)
    return value.astimezone(dt.UTC)


def _now() -> dt.datetime:
    return dt.datetime.now(dt.UTC)


def parse_date(value: dt.date | str | None, *, field: str = "--date",
               today: dt.date | None = None) -> dt.date:
    """A date as given (``YYYY-MM-DD`` text or a date); ``None`` is today. Not after today.

    Examples
    --------
    >>> import datetime as dt
    >>> parse_date("2026-03-01", today=dt.date(2026, 12, 1))
    datetime.date(2026, 3, 1)
    >>> parse_date("2027-01-01", today=dt.date(2026, 12, 1))
    Traceback (most recent call last):
    ...
    ledger.errors.InputError: --date = '2027-01-01': a date not after today (2026-12-01)
    >>> parse_date("1/3/2026")
    Traceback (most recent call last):
    ...
    ledger.errors.InputError: --date = '1/3/2026': a date written YYYY-MM-DD, e.g. 2026-03-01
    """
    today = today or dt.date.today()
    if value is None:
        return today
    if isinstance(value, dt.datetime):
        value = value.date()
    if isinstance(value, str):
        text = value.strip()
        try:
            if len(text) != 10:
                raise ValueError
            parsed = dt.date.fromisoformat(text)
        except ValueError:
            raise InputError(field, value, "a date written YYYY-MM-DD, e.g. 2026-03-01") from None
    elif isinstance(value, dt.date):
        parsed = value
    else:
        raise InputError(field, value, "a date written YYYY-MM-DD, e.g. 2026-03-01")
    if parsed > today:
        raise InputError(field, parsed.isoformat(), f"a date not after today ({today})")
    return parsed


def _text(value, field: str, *, required: bool = False, max_len: int = TEXT_MAX) -> str | None:
    """``value`` stripped, or None when empty; no NUL and at most ``max_len`` characters
    (:func:`ledger.bounds.check_text`)."""
    if value is None or (isinstance(value, str) and not value.strip()):
        if required:
            raise InputError(field, value or "", "required: a non-empty text")
        return None
    return check_text(field, str(value).strip(), max_len)


def _quantity(value, dimension: str, default_unit: str | None, field: str, *,
              nonnegative: bool = False, positive: bool = False) -> float:
    from ledger.units import parse_quantity

    if value is None:
        raise InputError(field, "", f"required: a {dimension}")
    if isinstance(value, str):
        v = parse_quantity(value, dimension, default_unit, field=field)
    elif isinstance(value, bool) or not isinstance(value, (int, float)):
        raise InputError(field, value, f"a finite {dimension}")
    else:
        v = float(value)
        if not math.isfinite(v):
            raise InputError(field, v, f"a finite {dimension}")
    if positive and v <= 0:
        raise InputError(field, value, f"a {dimension} greater than 0")
    if nonnegative and v < 0:
        raise InputError(field, value, f"a {dimension} of 0 or more")
    return v + 0.0


def _mass(value, units, field: str) -> float:
    return _quantity(value, "mass", units.mass if units else None, field, nonnegative=True)


def _length(value, units, field: str) -> float:
    return _quantity(value, "length", units.length if units else None, field)




def parse_shape(spec, units=None, *, field: str = "--shape") -> dict | None:
    """An item's shape for its own inertia: ``"KIND,KEY=VALUE,…"`` text or a dict.

    Kinds and keys as in type files: ``box,length=…,width=…,height=…``;
    ``cylinder,radius=…,length=…,axis=x``; ``hollow_cylinder,radius=…,inner_radius=…,
    length=…,axis=…``; ``disk,radius=…,axis=…``; ``rod,length=…,axis=…``; ``sphere,radius=…``;
    ``point``. Lengths take the type's display unit when bare. Returns the SI dict stored in
    the entry's detail (``{"kind": "box", "length_m": …}``), or None.

    Examples
    --------
    >>> parse_shape("box,length=0.5 m,width=0.4 m,height=20 cm")
    {'kind': 'box', 'length_m': 0.5, 'width_m': 0.4, 'height_m': 0.2}
    >>> parse_shape("cone,radius=1 m")
    Traceback (most recent call last):
    ...
    ledger.errors.InputError: --shape = 'cone': one of point, box, cylinder, hollow_cylinder, disk, rod, sphere
    """
    if spec is None or spec == "":
        return None
    if isinstance(spec, dict):
        raw = dict(spec)
        kind = raw.pop("kind", None)
    else:
        parts = [p.strip() for p in str(spec).split(",")]
        kind, raw = parts[0], {}
        for p in parts[1:]:
            key, sep, val = p.partition("=")
            if not sep:
                raise InputError(field, spec, "KIND,KEY=VALUE,… e.g. box,length=20 in,"
                                 "width=12 in,height=8 in")
            raw[key.strip()] = val.strip()
    if kind not in SHAPE_DIMENSIONS:
        raise InputError(field, kind, "one of " + ", ".join(SHAPE_DIMENSIONS))
    dims = SHAPE_DIMENSIONS[kind]
    out: dict[str, Any] = {"kind": kind}
    for key in raw:
        base = key[:-2] if key.endswith("_m") else key
        if base not in dims:
            raise InputError(f"{field} {key}", raw[key],
                             f"not a dimension of a {kind}; it takes "
                             + (", ".join(dims) or "none"))
    for d in dims:
        value = raw.get(d, raw.get(f"{d}_m"))
        if value is None:
            raise InputError(f"{field} {d}", "(missing)",
                             f"required for a {kind}: " + ", ".join(dims))
        if d == "axis":
            if value not in ("x", "y", "z"):
                raise InputError(f"{field} axis", value, "x, y or z")
            out["axis"] = value
        else:
            out[f"{d}_m"] = _quantity(value, "length", units.length if units else None,
                                      f"{field} {d}", positive=True)
    if kind == "hollow_cylinder" and out["inner_radius_m"] >= out["radius_m"]:
        raise InputError(f"{field} inner_radius", raw.get("inner_radius"),
                         "less than the radius")
    return out


# --- type and head lookups ------------------------------------------------------------------


def vehicle_type_info(session: Session, vehicle) -> TypeInfo:
    """The newest revision of the vehicle's type, parsed (cached by content hash)."""
    return type_info(session, vehicle.type_id)


def type_info(session: Session, type_id: int) -> TypeInfo:
    """The newest revision of type ``type_id``, parsed, once the type's chain of revisions
    verifies (:func:`ledger.store.evidence.checked_type`)."""
    from ledger.store.evidence import checked_type

    row, vtype = checked_type(session, type_id)
    name = session.scalar(select(VehicleTypeRow.name).where(VehicleTypeRow.id == type_id))
    return TypeInfo(name, row.id, row.revision, vtype)


class _Vehicle(NamedTuple):
    id: int
    registration: str
    type_id: int


# Statements of the append path, built once (building a statement costs more than running it).
_VEHICLE = (select(VehicleRow.id, VehicleRow.registration, VehicleRow.type_id)
            .where(VehicleRow.registration == bindparam("reg")))
_VEHICLE_LOCKED = _VEHICLE.with_for_update()


def _vehicle(session: Session, registration: str, *, lock: bool = False) -> _Vehicle:
    """The vehicle's id, registration and type; with ``lock`` its row is locked (PostgreSQL
    ``FOR UPDATE``; on SQLite the transaction's ``BEGIN IMMEDIATE`` already serialises
    writers). A plain Core query on the session's connection: appends are the hot path."""
    row = session.connection().execute(_VEHICLE_LOCKED if lock else _VEHICLE,
                                       {"reg": registration}).first()
    if row is None:
        from ledger.store.catalog import get_vehicle

        get_vehicle(session, registration)  # raises NotFoundError with the known vehicles
    return _Vehicle(*row)


class _Head(NamedTuple):
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


class _ItemState(NamedTuple):
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
        return _installs(self.kind, self.detail_json)


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
_INSERT = insert(_E.__table__)
# The newest entry and the newest entry naming one item, in one round trip (both read after
# the vehicle's lock): an installation or removal needs both.
_head_sq = _HEAD.subquery("h")
_item_sq = _ITEM.subquery("i")
_HEAD_AND_ITEM = (select(*_head_sq.c, *_item_sq.c)
                  .select_from(_head_sq.outerjoin(_item_sq, true())))
# SQLite only (see _locked_item_state): the vehicle too, in the same query.
_vid_of_reg = (select(VehicleRow.id).where(VehicleRow.registration == bindparam("reg"))
               .scalar_subquery())
_head_sq2 = _newest(_HEAD_COLS, _vid_of_reg, False).subquery("h")
_item_sq2 = _newest(_ITEM_COLS, _vid_of_reg, True).subquery("i")
_VEHICLE_HEAD_ITEM = (
    select(VehicleRow.id, VehicleRow.registration, VehicleRow.type_id, *_head_sq2.c,
           *_item_sq2.c)
    .select_from(VehicleRow.__table__.outerjoin(_head_sq2, true())
                 .outerjoin(_item_sq2, true()))
    .where(VehicleRow.registration == bindparam("reg")))


# --- SQLite driver-level statements ----------------------------------------------------------
# A single append is one short transaction, and SQLAlchemy's per-statement work (cache look-up,
# parameter and result processing) costs about as much as SQLite's own insert. On SQLite the
# two statements of an append therefore go to the driver (sqlite3, on the session's connection
# and in its transaction) as plain SQL and tuples, converted by
# SQLAlchemy's own SQLite bind and result processors so that values are stored and read back
# exactly as through the ORM (tests/store check both paths against each other).

class SqliteInsert(NamedTuple):
    """The entry insert as SQLite driver SQL: column names and the bind converters by index."""

    sql: str
    cols: tuple[str, ...]
    converters: tuple[tuple[int, Any], ...]

    def memo(self) -> tuple[dict, ...]:
        """Empty memos for :meth:`row` (one per converter), for a bulk insert."""
        return tuple({} for _ in self.converters)

    def row(self, values: Mapping[str, Any], memo: tuple[dict, ...] | None = None) -> tuple:
        """``values`` (column → value) as the driver's parameter tuple; a ``memo`` kept across
        the rows of a bulk insert converts each distinct value once."""
        t = [values[c] for c in self.cols]
        for (k, proc), seen in zip(self.converters, memo or self.memo()):
            v = t[k]
            if v is not None:
                done = seen.get(v)
                if done is None:
                    done = seen[v] = proc(v)
                t[k] = done
        return tuple(t)


def _driver(conn):
    """The sqlite3 connection under ``conn``, in ``conn``'s transaction."""
    return conn.connection.driver_connection


@lru_cache(maxsize=4)
def sqlite_insert(dialect) -> SqliteInsert:
    table = _E.__table__
    cols = tuple(c.name for c in table.columns if c.name != "id")
    converters = []
    for k, name in enumerate(cols):
        proc = table.c[name].type.dialect_impl(dialect).bind_processor(dialect)
        if proc is not None:
            converters.append((k, proc))
    sql = (f"INSERT INTO {table.name} ({', '.join(cols)}) "
           f"VALUES ({', '.join('?' for _ in cols)})")
    return SqliteInsert(sql, cols, tuple(converters))


@lru_cache(maxsize=4)
def _sqlite_vehicle_head_item(dialect):
    """(SQL, parameter names in order, fixed parameters (the limits), result converters by
    column) of _VEHICLE_HEAD_ITEM."""
    compiled = _VEHICLE_HEAD_ITEM.compile(dialect=dialect)
    fixed = {n: compiled.binds[n].effective_value for n in compiled.positiontup
             if n not in ("reg", "item")}
    procs = []
    for k, col in enumerate(_VEHICLE_HEAD_ITEM.selected_columns):
        proc = col.type.dialect_impl(dialect).result_processor(dialect, None)
        if proc is not None:
            procs.append((k, proc))
    return compiled.string, tuple(compiled.positiontup), fixed, tuple(procs)


def _head(session: Session, vehicle_id: int) -> _Head | None:
    """The newest entry of vehicle ``vehicle_id``, or None."""
    row = session.connection().execute(_HEAD, {"vid": vehicle_id}).first()
    return None if row is None else _Head(*row)


def _no_weighing(registration: str) -> ConflictError:
    return ConflictError(f"vehicle {registration!r} has no weighing recorded yet; record one "
                         f"first with `wbledger weigh {registration} --reading POINT=MASS …`")


def _entry_from_row(registration: str, row) -> Entry:
    values = dict(zip(_ENTRY_COLUMNS, row))
    values["z_known"] = bool(values["z_known"])
    values["recorded_at"] = _utc(values["recorded_at"])
    return Entry(registration=registration, **values)


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
                 _vehicle_row: _Vehicle | None = None, _head_row=False) -> Entry:
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
    if kind not in ENTRY_KINDS:
        raise InputError("kind", kind, "one of " + ", ".join(ENTRY_KINDS))
    absolute = kind in ABSOLUTE_KINDS
    if absolute == (state is None) or (delta is None) == (state is None):
        need = "state" if absolute else "delta"
        raise InputError(need, None, f"a {kind} entry is given its {need} (and not the other)")
    given = state if absolute else delta
    if len(given) != 4:
        raise InputError("state" if absolute else "delta", given, "four values: m, mx, my, mz")
    for name, v in zip(("mass", "mx", "my"), given[:3]):
        if v is None or not math.isfinite(v):
            raise InputError(f"{'state' if absolute else 'delta'}.{name}", v, "a finite number")
    if given[3] is not None and not math.isfinite(given[3]):
        raise InputError(f"{'state' if absolute else 'delta'}.mz", given[3], "a finite number")
    for name, v in (("item mass", item_mass_kg), ("--arm", item_x_m), ("--lat-arm", item_y_m),
                    ("--vert-arm", item_z_m)):
        if v is not None and not math.isfinite(v):
            raise InputError(name, v, "a finite number")
    day = parse_date(entry_date)
    conn = session.connection()
    actor_text = recorder(conn, _text(actor, "--by", required=True))

    vehicle = _vehicle_row if _vehicle_row is not None else _vehicle(session, registration,
                                                                      lock=True)
    head = _head(session, vehicle.id) if _head_row is False else _head_row
    effect = _apply(head, kind, day, Moments(*given), registration)
    values = {
        "vehicle_id": vehicle.id, "kind": kind, "entry_date": day,
        "recorded_at": _now() if recorded_at is None else _utc(recorded_at),
        "actor": actor_text,
        "reason": _text(reason, "--reason", max_len=4000),
        "reference": _text(reference, "--ref"), "item": _text(item, "item"),
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
        new_id = _driver(conn).execute(plan.sql, plan.row(values)).lastrowid
    else:
        new_id = conn.execute(_INSERT, values).inserted_primary_key[0]
    values.pop("vehicle_id")
    values["z_known"] = effect.after.z_known
    return Entry(registration=vehicle.registration, id=new_id, **values)


def _apply(head: _Head | None, kind: str, day: dt.date, given: Moments,
           registration: str) -> EntryEffect:
    """:func:`ledger.core.ledger_rule.apply_entry` on the vehicle's newest entry, its refusals
    worded for an entry recorded by hand."""
    try:
        return apply_entry(RunningState() if head is None else head.state(), kind, day, given)
    except FirstEntryNotWeighing:
        raise _no_weighing(registration) from None
    except EntryOutOfOrder as exc:
        raise InputError("--date", day.isoformat(),
                         f"a date on or after that of entry {exc.previous_seq} "
                         f"({exc.previous_date}): entries are kept in date order",
                         hint="Record it with today's date and give the date of the work "
                              "in --reason") from None
    except EmptyMassNotPositive as exc:
        from ledger.units import format_quantity

        raise ConflictError(
            f"this {kind} would leave vehicle {registration!r} with an empty mass of "
            f"{format_quantity(exc.mass_kg, 'kg', 3)}; the empty mass must stay above 0 kg"
        ) from None


def _head_and_item(session: Session, vehicle_id: int, name: str):
    """(head, item state) as :func:`_head` and :func:`_item_state` give them, in one query."""
    row = session.connection().execute(_HEAD_AND_ITEM, {"vid": vehicle_id,
                                                        "item": name}).first()
    if row is None:  # no entry at all
        return None, None
    head, item = _Head(*row[:9]), row[9:]
    return head, (_ItemState(*item) if item[0] is not None else None)


def _locked_item_state(session: Session, registration: str, name: str):
    """(vehicle, head, item state) for an installation or removal, the vehicle locked.

    On SQLite the transaction began with ``BEGIN IMMEDIATE``, so nothing else can write until
    it ends and one query can read all three. On PostgreSQL the vehicle's row is locked first
    and the entries are read by a second statement, so that they are read after the lock
    (under READ COMMITTED a statement that waited for a lock still sees its own snapshot).
    """
    conn = session.connection()
    if conn.dialect.name != "sqlite":
        vehicle = _vehicle(session, registration, lock=True)
        return (vehicle, *_head_and_item(session, vehicle.id, name))
    sql, names, fixed, procs = _sqlite_vehicle_head_item(conn.dialect)
    params = {**fixed, "reg": registration, "item": name}
    row = _driver(conn).execute(sql, tuple(params[n] for n in names)).fetchone()
    if row is not None:
        row = list(row)
        for k, proc in procs:
            row[k] = proc(row[k])
    if row is None:
        from ledger.store.catalog import get_vehicle

        get_vehicle(session, registration)  # raises NotFoundError with the known vehicles
    head = _Head(*row[3:12]) if row[3] is not None else None
    item = _ItemState(*row[12:]) if row[12] is not None else None
    return _Vehicle(*row[:3]), head, item


def _item_state(session: Session, vehicle_id: int, name: str) -> _ItemState | None:
    """The newest entry that names item ``name``, or None."""
    row = session.connection().execute(_ITEM, {"vid": vehicle_id, "item": name}).first()
    return None if row is None else _ItemState(*row)


def _installs(kind: str, detail_json: str) -> bool:
    """Whether an entry of ``kind`` that names an item leaves that item installed."""
    if kind == "correction":
        return leaves_installed(kind, json.loads(detail_json).get("reverses_kind"))
    return leaves_installed(kind)


def _units_for(session: Session, vehicle: _Vehicle, *values) -> Any:
    """The type's display units if any value needs parsing (a string), else None."""
    if any(isinstance(v, str) for v in values):
        return vehicle_type_info(session, vehicle).vtype.units
    return None


def install_item(session: Session, registration: str, item: str, *, mass, arm,
                 lat_arm=None, vert_arm=None, shape=None, actor: str, reason: str,
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
    name = _text(item, "ITEM", required=True)
    _text(reason, "--reason", required=True, max_len=4000)
    vehicle, head, state = _locked_item_state(session, registration, name)
    units = _units_for(session, vehicle, mass, arm, lat_arm, vert_arm, shape)
    m = _mass(mass, units, "--mass")
    x = _length(arm, units, "--arm")
    y = 0.0 if lat_arm is None else _length(lat_arm, units, "--lat-arm")
    z = None if vert_arm is None else _length(vert_arm, units, "--vert-arm")
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
                lat_arm=None, vert_arm=None, actor: str, reason: str,
                entry_date: dt.date | str | None = None,
                reference: str | None = None) -> Entry:
    """Record the removal of an installed item, with the mass and arms recorded when it was
    installed unless others are given (say why in ``reason``).

    Raises
    ------
    ConflictError
        The item is not installed (never, or removed since).
    """
    name = _text(item, "ITEM", required=True)
    _text(reason, "--reason", required=True, max_len=4000)
    vehicle, head, state = _locked_item_state(session, registration, name)
    if state is None or not state.installed:
        on = installed_items(session, registration, _vehicle_row=vehicle)
        known = ", ".join(repr(i.name) for i in on[:12]) or "none"
        why = ("was never installed" if state is None
               else f"is not installed (removed by entry {state.seq})")
        raise ConflictError(f"item {name!r} {why} on {registration}; installed items: {known}")
    seq0, _kind, _date, m0, x0, y0, z0, detail0 = state
    units = _units_for(session, vehicle, mass, arm, lat_arm, vert_arm)
    m = m0 if mass is None else _mass(mass, units, "--mass")
    x = x0 if arm is None else _length(arm, units, "--arm")
    y = y0 if lat_arm is None else _length(lat_arm, units, "--lat-arm")
    z = z0 if vert_arm is None else _length(vert_arm, units, "--vert-arm")
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


def _target(session: Session, vehicle: _Vehicle, seq: int):
    cols = [getattr(_E, c) for c in _ENTRY_COLUMNS]
    row = session.execute(select(*cols).where(_E.vehicle_id == vehicle.id, _E.seq == seq)).first()
    if row is None:
        head = session.scalar(select(func.max(_E.seq)).where(_E.vehicle_id == vehicle.id))
        hint = (f"{vehicle.registration} has entries 1 to {head}" if head
                else f"{vehicle.registration} has no entries yet")
        raise NotFoundError(f"entry of {vehicle.registration}", seq, hint)
    return _entry_from_row(vehicle.registration, row)


def correct_entry(session: Session, registration: str, seq: int, *, reason: str, actor: str,
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
    why = _text(reason, "--reason", required=True, max_len=4000)
    if isinstance(seq, bool) or not isinstance(seq, int) or seq < 1:
        raise InputError("SEQ", seq, "an entry number, 1 or more")
    vehicle = _vehicle(session, registration, lock=True)
    target = _target(session, vehicle, seq)
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
    latest = _item_state(session, vehicle.id, target.item)
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
    vehicle = _vehicle(session, registration, lock=True)
    units = _units_for(session, vehicle, z_m)
    z = _length(z_m, units, "vertical CG")
    head = _head(session, vehicle.id)
    if head is None:
        raise _no_weighing(registration)
    m, mx, my = head.mass_kg, head.mx_kgm, head.my_kgm
    return append_entry(session, registration, "cg_height", actor=actor,
                        entry_date=entry_date, state=(m, mx, my, m * z), reason=reason,
                        reference=reference, detail={"cg_z_m": z, **dict(detail or {})},
                        _vehicle_row=vehicle)


def _points_by_name(vtype) -> dict:
    return {p.name: p for p in vtype.weighing_points()}


def _match(name: str, choices: Mapping[str, Any]) -> str | None:
    if name in choices:
        return name
    folded = [c for c in choices if c.casefold() == name.strip().casefold()]
    return folded[0] if len(folded) == 1 else None


def implausible_empty_mass(vtype, mass_kg: float, unit: str) -> str | None:
    """None when ``mass_kg`` is a plausible empty mass for ``vtype``
    (:func:`ledger.core.weighing.plausible_empty_mass`); else what is allowed, in ``unit``, for
    the error that refuses it."""
    from ledger.core.weighing import PLAUSIBLE_EMPTY_MULTIPLE, plausible_empty_mass
    from ledger.units import format_quantity

    largest = vtype.limits.largest_maximum()
    if plausible_empty_mass(mass_kg, None if largest is None else largest[0]):
        return None
    if largest is None:
        return "a finite empty mass above 0"
    limit, name = largest
    times = "" if PLAUSIBLE_EMPTY_MULTIPLE == 1 else f"{PLAUSIBLE_EMPTY_MULTIPLE:g} times "
    return (f"an empty mass above 0 and at most {times}the largest maximum mass of type "
            f"{vtype.name}, {format_quantity(PLAUSIBLE_EMPTY_MULTIPLE * limit, unit, 1)} "
            f"({name})")


def record_weighing(session: Session, registration: str, readings: Mapping[str, Any], *,
                    actor: str, tares: Mapping[str, Any] | None = None,
                    fuel: Mapping[str, Any] | None = None,
                    adjustments: Sequence[Mapping[str, Any]] = (),
                    entry_date: dt.date | str | None = None, scales: str | None = None,
                    level: str | None = None, note: str | None = None,
                    reason: str | None = None, reference: str | None = None) -> Entry:
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

    The computation is :func:`ledger.core.weighing.empty_weight_from_scales` (FAA-H-8083-1,
    weighing chapter: net = reading − tare; CG = Σ(R·x)/ΣR; remove usable fuel, keep unusable).

    Raises
    ------
    InputError
        A missing or unknown weighing point, a negative net reading, a non-finite value, an
        unknown tank, a quantity above the tank's capacity; a result that is not a plausible
        empty mass for the type (:func:`implausible_empty_mass`), naming the readings.
    """
    from ledger.core.weighing import Correction, empty_weight_from_scales
    from ledger.units import parse_quantity_of

    vehicle = _vehicle(session, registration, lock=True)
    info = vehicle_type_info(session, vehicle)
    vt, units = info.vtype, info.vtype.units
    points = _points_by_name(vt)
    if not points:
        raise ConflictError(f"type {info.name} defines no weighing points; add "
                            "[[reaction_point]] tables to its type file")
    listing = ", ".join(points)
    given: dict[str, float] = {}
    for raw_name, value in (readings or {}).items():
        name = _match(raw_name, points)
        if name is None:
            raise InputError("--reading", raw_name, f"not a weighing point of type {info.name}; "
                             f"its points are {listing}")
        if name in given:
            raise InputError("--reading", raw_name, "given twice; one reading per point")
        given[name] = _mass(value, units, f"--reading {name}")
    for name in points:
        if name not in given:
            raise InputError("--reading", name, f"missing; type {info.name} is weighed at "
                             f"{listing}: give one --reading POINT=MASS for each")
    tare: dict[str, float] = {}
    for raw_name, value in (tares or {}).items():
        name = _match(raw_name, points)
        if name is None:
            raise InputError("--tare", raw_name, f"not a weighing point of type {info.name}; "
                             f"its points are {listing}")
        tare[name] = _mass(value, units, f"--tare {name}")
        if tare[name] > given[name]:
            from ledger.units import format_quantity, to_unit

            # Caught here, in the user's units, before the pure core sees a negative net.
            mu = units.mass
            net = float(to_unit(given[name] - tare[name], mu, "mass"))
            raise InputError(f"net reaction at {name!r}", round(net, 6),
                             f"a net reading of 0 {mu} or more (reading "
                             f"{format_quantity(given[name], mu, 2)} − tare "
                             f"{format_quantity(tare[name], mu, 2)})",
                             hint="Check the tare and the scale zero")
    names = list(points)
    corrections = []
    fuel_detail = []
    tanks = {t.name: t for t in vt.tanks}
    for raw_name, value in (fuel or {}).items():
        tname = _match(raw_name, tanks)
        if tname is None or not tanks[tname].is_fuel:
            fuel_tanks = ", ".join(t.name for t in vt.tanks if t.is_fuel) or "none"
            raise InputError("--fuel", raw_name, f"not a fuel tank of type {info.name}; its "
                             f"fuel tanks are {fuel_tanks}")
        tank = tanks[tname]
        if isinstance(value, str):
            q, dim = parse_quantity_of(value, ("volume", "mass"), units.volume,
                                       field=f"--fuel {tname}")
            if dim == "mass" and tank.basis == "volume":
                q = q / tank.density_kg_m3
            elif dim == "volume" and tank.basis == "mass":
                q = q * tank.density_kg_m3
        else:
            q = _quantity(value, "volume" if tank.basis == "volume" else "mass", None,
                          f"--fuel {tname}")
        if q < 0:
            raise InputError(f"--fuel {tname}", value, "a quantity of 0 or more")
        if q > tank.capacity * (1 + 1e-9):
            from ledger.units import format_quantity

            cap = format_quantity(tank.capacity, units.volume if tank.basis == "volume"
                                  else units.mass, 1)
            raise InputError(f"--fuel {tname}", value, f"at most the tank's capacity ({cap})")
        if q != tank.unusable:
            xq, yq, zq = tank.arms_at(q)
            xu, yu, zu = tank.arms_at(tank.unusable)
            corrections.append(Correction.remove(f"fuel in {tname} as weighed",
                                                 tank.mass_of(q), xq, yq, zq))
            corrections.append(Correction.add(f"unusable fuel, {tname}",
                                              tank.unusable_kg(), xu, yu, zu))
        fuel_detail.append({"tank": tname, "quantity": q, "basis": tank.basis,
                            "mass_kg": tank.mass_of(q), "unusable_kg": tank.unusable_kg()})
    adj_detail = []
    for j, adj in enumerate(adjustments):
        label = _text(adj.get("label", adj.get("name")), "--adjust", required=True)
        mv = _quantity(adj.get("mass"), "mass", units.mass, f"--adjust {label} mass")
        ax = _length(adj.get("x"), units, f"--adjust {label} arm")
        ay = 0.0 if adj.get("y") is None else _length(adj["y"], units, f"--adjust {label} y")
        az = None if adj.get("z") is None else _length(adj["z"], units, f"--adjust {label} z")
        c = (Correction.add if mv >= 0 else Correction.remove)(label, abs(mv), ax, ay, az)
        corrections.append(c)
        adj_detail.append({"label": label, "mass_kg": mv, "x_m": ax, "y_m": ay, "z_m": az})
    result = empty_weight_from_scales(
        [given[n] for n in names], [tare.get(n, 0.0) for n in names],
        [points[n].x_m for n in names], [points[n].y_m for n in names], points=names,
        corrections=corrections)
    allowed = implausible_empty_mass(vt, result.mass, units.mass)
    if allowed is not None:
        from ledger.units import format_quantity, to_unit

        typed = {_match(k, points): v for k, v in readings.items()}  # as the user gave them
        shown = ", ".join(f"{n}={typed[n]}" for n in names)
        value = to_unit(result.mass, units.mass)
        mass = (format_quantity(result.mass, units.mass, 1) if abs(value) < 1e9
                else f"{value:.3g} {units.mass}")
        raise InputError("empty mass", mass, allowed, hint=f"The readings were {shown}: check "
                         "each, and the unit of the scales")
    detail = {
        "type": info.name, "type_revision": info.revision,
        "points": {n: {"reading_kg": given[n], "tare_kg": tare.get(n, 0.0),
                       "net_kg": float(result.net[i]), "x_m": points[n].x_m,
                       "y_m": points[n].y_m} for i, n in enumerate(names)},
        "as_weighed": {"mass_kg": result.weighed_mass, "mx_kgm": result.weighed_moment_x,
                       "my_kgm": result.weighed_moment_y},
        "fuel": fuel_detail,
        "fuel_not_named": [t.name for t in vt.tanks if t.is_fuel and t.name not in
                           {f["tank"] for f in fuel_detail}],
        "adjustments": adj_detail,
    }
    for key, value in (("scales", scales), ("level", level), ("note", note)):
        text = _text(value, f"--{key}", max_len=2000)
        if text:
            detail[key] = text
    return append_entry(session, registration, "weighing", actor=actor, entry_date=entry_date,
                        state=(result.mass, result.moment_x, result.moment_y, result.moment_z),
                        reason=reason, reference=reference, detail=detail,
                        _vehicle_row=vehicle)


# --- reading --------------------------------------------------------------------------------

def _as_of_filter(query, as_of):
    if as_of is not None:
        query = query.where(_E.entry_date <= parse_date(as_of, field="--as-of"))
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

    vehicle = _vehicle(session, registration)
    require_vehicle(session, vehicle)
    query = _as_of_filter(
        select(_E.id, _E.seq, _E.entry_date, _E.empty_mass_kg, _E.empty_mx_kgm,
               _E.empty_my_kgm, _E.empty_mz_kgm, _E.z_known, _E.baseline_seq, _E.entry_hash)
        .where(_E.vehicle_id == vehicle.id), as_of).order_by(_E.seq.desc()).limit(1)
    row = session.execute(query).first()
    if row is None:
        if as_of is not None and _head(session, vehicle.id) is not None:
            raise ConflictError(f"vehicle {registration!r} has no entry on or before {as_of}")
        raise _no_weighing(registration)
    eid, seq, day, m, mx, my, mz, zk, base, ehash = row
    return EmptyState(vehicle.registration, eid, seq, day, m, mx, my, mz, bool(zk), base,
                      ehash)


def entries_of(session: Session, registration: str, *,
               as_of: dt.date | str | None = None) -> list[Entry]:
    """Every entry of a vehicle in ``seq`` order (up to ``as_of`` if given)."""
    vehicle = _vehicle(session, registration)
    cols = [getattr(_E, c) for c in _ENTRY_COLUMNS]
    query = _as_of_filter(select(*cols).where(_E.vehicle_id == vehicle.id), as_of)
    rows = session.execute(query.order_by(_E.seq))
    return [_entry_from_row(vehicle.registration, r) for r in rows]


def get_entry(session: Session, registration: str, seq: int) -> Entry:
    """Entry ``seq`` of a vehicle (NotFoundError if none)."""
    return _target(session, _vehicle(session, registration), seq)


def installed_items(session: Session, registration: str, *,
                    as_of: dt.date | str | None = None,
                    _vehicle_row: _Vehicle | None = None) -> list[InstalledItem]:
    """Items installed through the ledger and not removed since, by name."""
    vehicle = _vehicle_row or _vehicle(session, registration)
    query = _as_of_filter(
        select(_E.seq, _E.kind, _E.entry_date, _E.item, _E.item_mass_kg, _E.item_x_m,
               _E.item_y_m, _E.item_z_m, _E.detail_json)
        .where(_E.vehicle_id == vehicle.id, _E.item.is_not(None)), as_of).order_by(_E.seq)
    on: dict[str, InstalledItem] = {}
    for seq, kind, day, name, m, x, y, z, detail_json in session.execute(query):
        if _installs(kind, detail_json):
            shape = json.loads(detail_json).get("shape")
            on[name] = InstalledItem(name, seq, day, m, x, y, z, shape)
        else:
            on.pop(name, None)
    return sorted(on.values(), key=lambda i: i.name)


# --- assessments ----------------------------------------------------------------------------

def _cg_range_m(vtype) -> float | None:
    xs = []
    for env in vtype.envelopes_for("longitudinal"):
        for cg, mass in env.points:
            xs.append(cg if env.coordinates == "arm" else cg / mass)
    return (max(xs) - min(xs)) if len(xs) >= 2 else None


def negligible_change(vtype, before_mass_kg: float, before_cg_x_m: float, after_mass_kg: float,
                      after_cg_x_m: float) -> tuple[bool | None, str]:
    """Whether a change of the empty vehicle is negligible under AC 43.13-1B §10-2c.

    Returns ``(verdict, why)``: ``verdict`` is None when the rule does not apply to this type.

    Examples
    --------
    >>> from types import SimpleNamespace as NS
    >>> plane = NS(kind="airplane", mac=NS(length_m=1.5), envelopes_for=lambda axis: ())
    >>> negligible_change(plane, 1000.0, 2.0, 1000.0 + 0.45359237, 2.0)[0]
    True
    >>> negligible_change(plane, 1000.0, 2.0, 1000.5, 2.0)[0]
    False
    """
    before_lb = before_mass_kg / LB_KG
    limit_lb = 1.0 if before_lb < 5000.0 else 2.0 if before_lb <= 50000.0 else 5.0
    dm = abs(after_mass_kg - before_mass_kg)
    dcg = abs(after_cg_x_m - before_cg_x_m)
    # 1e-9 kg of slack absorbs the rounding of a difference of two large totals.
    mass_ok = dm <= limit_lb * LB_KG + 1e-9
    if vtype.kind == "airplane":
        if vtype.mac is None:
            return None, "not assessed: the type has no MAC"
        cg_limit = 0.0005 * vtype.mac.length_m
        cg_text = "0.05 % MAC"
    elif vtype.kind == "helicopter":
        rng = _cg_range_m(vtype)
        if rng is None:
            return None, "not assessed: the type has no longitudinal CG range"
        cg_limit = 0.002 * rng
        cg_text = "0.2 % of the CG range"
    else:
        return None, "not assessed: AC 43.13-1B §10-2c covers airplanes and rotorcraft"
    cg_ok = dcg < cg_limit
    verdict = mass_ok and cg_ok
    why = (f"{'within' if mass_ok else 'beyond'} {limit_lb:g} lb and "
           f"{'under' if cg_ok else 'not under'} {cg_text} (AC 43.13-1B §10-2c)")
    return verdict, why


def _reference_mass(vtype) -> tuple[float, str]:
    lim = vtype.limits
    for value, label in ((lim.max_landing_kg, "maximum landing mass"),
                         (lim.max_takeoff_kg, "maximum take-off mass"),
                         (lim.gross_rating_kg, "gross vehicle rating")):
        if value is not None:
            return value, label
    return float("nan"), "no mass limit"


def drift_warnings(vtype, base_mass_kg: float, base_mx_kgm: float, mass_kg: float,
                   mx_kgm: float, *, base_seq: int | None = None,
                   base_date: dt.date | None = None) -> list[dict]:
    """Warnings when the change since the last weighing passes the type's reweigh tolerances.

    The change is the net one: current empty state minus the state the weighing set. Each
    warning is ``{"code": …, "message": …}`` with values in the type's display units.
    """
    from ledger.units import format_quantity

    tol = vtype.tolerances
    units = vtype.units
    out = []
    since = (f"since the weighing of {base_date} (entry {base_seq})" if base_seq
             else "since the last weighing")
    dm = mass_kg - base_mass_kg
    cg0, cg = base_mx_kgm / base_mass_kg, mx_kgm / mass_kg
    dcg = cg - cg0
    if tol.reweigh_mass_percent is not None:
        ref, label = _reference_mass(vtype)
        limit = tol.reweigh_mass_percent / 100.0 * ref
        if abs(dm) > limit:
            sign = "+" if dm > 0 else "-"
            out.append({"code": "reweigh_mass", "message": (
                f"empty mass changed by {sign}{format_quantity(abs(dm), units.mass, 1)} "
                f"{since}, more than the type's {tol.reweigh_mass_percent:g} % of {label} "
                f"({format_quantity(limit, units.mass, 1)}): consider a new weighing")})
    if tol.reweigh_cg_percent_mac is not None and vtype.mac is not None:
        dpct = dcg / vtype.mac.length_m * 100.0
        if abs(dpct) > tol.reweigh_cg_percent_mac:
            out.append({"code": "reweigh_cg", "message": (
                f"empty CG moved {dpct:+.2f} % MAC {since}, more than the type's "
                f"{tol.reweigh_cg_percent_mac:g} % MAC: consider a new weighing")})
    if tol.reweigh_cg_shift_m is not None and abs(dcg) > tol.reweigh_cg_shift_m:
        sign = "+" if dcg > 0 else "-"
        out.append({"code": "reweigh_cg_shift", "message": (
            f"empty CG moved {sign}{format_quantity(abs(dcg), units.length, 2)} {since}, more "
            f"than the type's {format_quantity(tol.reweigh_cg_shift_m, units.length, 2)}: "
            "consider a new weighing")})
    return out
