"""Importing a history into a vehicle's ledger: every record checked, then inserted in bulk.

:func:`import_entries` appends records (from :func:`ledger.store.history_file.parse_history`)
after the vehicle's newest entry, all or nothing; see :mod:`ledger.store.transfer` for what is
checked. Each record's effect on the running state is the ledger's one rule
(:func:`ledger.core.ledger_rule.apply_entry`), as for an entry appended by hand.
"""

from __future__ import annotations

import datetime as dt
import gc
import json
from collections.abc import Callable, Iterable, Iterator, Mapping
from contextlib import contextmanager
from dataclasses import dataclass, field
from typing import Any, NamedTuple

from sqlalchemy import insert, select
from sqlalchemy.orm import Session

from ledger.bounds import load_json
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
    check_date,
    check_first,
    is_late,
    item_delta,
    leaves_installed,
    reversal_delta,
)
from ledger.errors import InputError
from ledger.store.catalog import get_vehicle
from ledger.store.chain import GENESIS_HASH, canonical_json, content_hash
from ledger.store.heads import baseline_date, date_refusal, newest_entry
from ledger.store.history_file import Record, parse_history, parse_recorded
from ledger.store.models import ENTRY_KINDS, LedgerEntryRow
from ledger.store.sqlite_path import sqlite_insert
from ledger.store.typeinfo import vehicle_type_info
from ledger.typedata.readings import parse_date

__all__ = ["ImportSummary", "CHUNK", "import_entries", "import_history"]

_COMPUTED_FLOATS = frozenset({"delta_mass_kg", "delta_mx_kgm", "delta_my_kgm", "delta_mz_kgm",
                              "empty_mass_kg", "empty_mx_kgm", "empty_my_kgm", "empty_mz_kgm"})
_COMPUTED_INTS = frozenset({"baseline_seq", "z_known"})
_COMPUTED = _COMPUTED_FLOATS | _COMPUTED_INTS
_E = LedgerEntryRow
CHUNK = 5000


@dataclass(frozen=True)
class ImportSummary:
    registration: str
    imported: int
    first_seq: int | None
    last_seq: int | None
    head_hash: str | None

    def to_dict(self) -> dict:
        return {"registration": self.registration, "imported": self.imported,
                "first_seq": self.first_seq, "last_seq": self.last_seq,
                "head_hash": self.head_hash}


def _close(a: float, b: float) -> bool:
    return a == b or abs(a - b) <= 1e-9 * max(abs(a), abs(b)) + 1e-9


class _ItemLast(NamedTuple):
    """The newest entry naming an item, as the import follows it."""

    seq: int
    installed: bool
    mass_kg: float
    x_m: float
    y_m: float
    z_m: float | None
    shape: Any


class _Target(NamedTuple):
    """An installation, removal or correction a later correction may reverse."""

    kind: str
    item: str
    mass_kg: float
    x_m: float
    y_m: float
    z_m: float | None
    dm: float
    dmx: float
    dmy: float
    dmz: float
    shape: Any


@dataclass
class _Items:
    """What the import knows of the vehicle's items: the newest entry naming each, the entries
    a correction may reverse, and those reversed already."""

    last: dict[str, _ItemLast] = field(default_factory=dict)
    targets: dict[int, _Target] = field(default_factory=dict)
    reversed_: set[int] = field(default_factory=set)

    @classmethod
    def read(cls, session: Session, vid: int) -> _Items:
        """The item entries already in the ledger of vehicle ``vid``."""
        out = cls()
        for (s_, kind, item, m, x, y, z, dm, dmx, dmy, dmz, rev, detail) in session.execute(
                select(_E.seq, _E.kind, _E.item, _E.item_mass_kg, _E.item_x_m, _E.item_y_m,
                       _E.item_z_m, _E.delta_mass_kg, _E.delta_mx_kgm, _E.delta_my_kgm,
                       _E.delta_mz_kgm, _E.reverses_seq, _E.detail_json)
                .where(_E.vehicle_id == vid, _E.item.is_not(None)).order_by(_E.seq)):
            d = json.loads(detail)
            installs = leaves_installed(kind, d.get("reverses_kind"))
            out.last[item] = _ItemLast(s_, installs, m, x, y, z, d.get("shape"))
            out.targets[s_] = _Target(kind, item, m, x, y, z, dm, dmx, dmy, dmz, d.get("shape"))
            if rev is not None:
                out.reversed_.add(rev)
        return out


class _ItemChange(NamedTuple):
    """The item columns of an installation, removal or correction, and its change."""

    mass_kg: float
    x_m: float
    y_m: float
    z_m: float | None
    reverses_seq: int | None
    delta: Moments


def _install(row: Record, seq: int, item: str, detail: dict, items: _Items) -> _ItemChange:
    state = items.last.get(item)
    if state is not None and state.installed:
        raise row.err("item", item, f"an item not installed already (entry "
                      f"{state.seq} installed it); remove it first")
    im = row.num("item_mass_kg", required=True, what="the item's mass in kg, 0 or more")
    ix = row.num("item_x_m", required=True, what="the item's arm x in m")
    iy = row.num("item_y_m") or 0.0
    iz = row.num("item_z_m")
    if im < 0:
        raise row.err("item_mass_kg", row.rec.get("item_mass_kg"), "a mass of 0 kg or more")
    items.last[item] = _ItemLast(seq, True, im, ix, iy, iz, detail.get("shape"))
    return _ItemChange(im, ix, iy, iz, None, item_delta("install", im, ix, iy, iz))


def _remove(row: Record, seq: int, item: str, items: _Items) -> _ItemChange:
    state = items.last.get(item)
    if state is None or not state.installed:
        raise row.err("item", item, "an item installed before this entry and not "
                      "removed since")
    im = row.num("item_mass_kg")
    im = state.mass_kg if im is None else im
    ix = row.num("item_x_m")
    ix = state.x_m if ix is None else ix
    iy = row.num("item_y_m")
    iy = state.y_m if iy is None else iy
    iz = row.num("item_z_m")
    iz = state.z_m if iz is None else iz
    if im < 0:
        raise row.err("item_mass_kg", row.rec.get("item_mass_kg"), "a mass of 0 kg or more")
    items.last[item] = _ItemLast(seq, False, im, ix, iy, iz, state.shape)
    return _ItemChange(im, ix, iy, iz, None, item_delta("remove", im, ix, iy, iz))


def _correct(row: Record, seq: int, item: str, detail: dict, items: _Items) -> _ItemChange:
    state = items.last.get(item)
    rev_seq = row.int("reverses_seq", required=True,
                      what="the number of the entry it reverses")
    tgt = items.targets.get(rev_seq)
    if tgt is None or tgt.kind not in ("install", "remove"):
        raise row.err("reverses_seq", rev_seq,
                      "an earlier installation or removal of this vehicle")
    if rev_seq in items.reversed_:
        raise row.err("reverses_seq", rev_seq, "an entry not reversed already")
    if item != tgt.item:
        raise row.err("item", item, f"{tgt.item!r}, the item of entry {rev_seq}")
    if state is None or state.seq != rev_seq:
        raise row.err("reverses_seq", rev_seq,
                      f"an entry whose item was not changed since (entry "
                      f"{state.seq if state else '?'} changed {item!r})")
    if detail.setdefault("reverses_kind", tgt.kind) != tgt.kind:
        raise row.err("detail_json", f"reverses_kind={detail['reverses_kind']}",
                      f"reverses_kind {tgt.kind!r}, the kind of entry {rev_seq}")
    items.reversed_.add(rev_seq)
    items.last[item] = _ItemLast(seq, leaves_installed("correction", tgt.kind), tgt.mass_kg,
                                 tgt.x_m, tgt.y_m, tgt.z_m, tgt.shape)
    return _ItemChange(tgt.mass_kg, tgt.x_m, tgt.y_m, tgt.z_m, rev_seq,
                       reversal_delta(tgt.dm, tgt.dmx, tgt.dmy, tgt.dmz, tgt.z_m))


def _item_change(row: Record, kind: str, seq: int, item: str | None, detail: dict,
                 items: _Items) -> _ItemChange:
    """Check an installation, removal or correction against the items, and follow it."""
    if item is None:
        raise row.err("item", "", f"required for a {kind}")
    if kind == "install":
        return _install(row, seq, item, detail, items)
    if kind == "remove":
        return _remove(row, seq, item, items)
    return _correct(row, seq, item, detail, items)


def _measured(row: Record, kind: str, plausible: Callable[[float], str | None]) -> Moments:
    """The measured state of a weighing or CG-height row (``mz`` None when not known)."""
    m = row.num("empty_mass_kg", required=True, what="the empty mass in kg, above 0")
    if kind == "weighing" and m > 0:  # 0 or less: refused by the rule, as for any entry
        allowed = plausible(m)
        if allowed is not None:
            raise row.err("empty_mass_kg", m, allowed)
    mx = row.num("empty_mx_kgm", required=True, what="the empty moment x in kg*m")
    my = row.num("empty_my_kgm", required=True, what="the empty moment y in kg*m")
    zk = row.int("z_known", what="0 or 1")
    if zk not in (None, 0, 1):
        raise row.err("z_known", zk, "0 or 1")
    mz_given = row.num("empty_mz_kgm", what="the empty moment z in kg*m")
    if kind == "cg_height" or (zk is None and mz_given is not None):
        zk = 1
    if zk == 1 and mz_given is None:
        raise row.err("empty_mz_kgm", "", "required when z_known is 1")
    return Moments(m, mx, my, mz_given if zk == 1 else None)


def _row_date(row: Record, dates: dict[str, dt.date], today: dt.date) -> dt.date:
    """The row's entry date (each distinct text parsed once)."""
    raw_date = row.rec.get("entry_date")
    day = dates.get(raw_date) if raw_date.__class__ is str else None
    if day is None:
        raw_date = row.raw("entry_date")
        if raw_date is None:
            raise row.err("entry_date", "", "required: a date written YYYY-MM-DD")
        try:
            day = parse_date(raw_date, field="entry_date", today=today)
        except InputError as exc:
            raise exc.with_source(row.where) from None
        if raw_date.__class__ is str:
            dates[raw_date] = day
    return day


def _row_detail(row: Record) -> dict:
    raw_detail = row.rec.get("detail_json")
    if raw_detail is None or raw_detail == "":
        return {}
    if isinstance(raw_detail, dict):
        return raw_detail
    if not isinstance(raw_detail, str):
        raise row.err("detail_json", type(raw_detail).__name__, "a JSON object")
    try:
        detail = load_json(raw_detail, source=row.where, root="detail_json")
    except json.JSONDecodeError as exc:
        raise row.err("detail_json", raw_detail[:40], f"a JSON object ({exc.msg})") from None
    if not isinstance(detail, dict):
        raise row.err("detail_json", raw_detail[:40], "a JSON object")
    return detail


def _check_computed(row: Record, values: Mapping[str, Any]) -> None:
    """Columns the ledger computes, where the row gives them, must agree."""
    rec = row.rec
    if _COMPUTED.isdisjoint(rec):  # the common case: a file of new entries
        return
    for name in _COMPUTED_FLOATS.intersection(rec):
        given = row.num(name)
        if given is not None and not _close(given, values[name]):
            raise row.err(name, given, f"{values[name]!r}, as the ledger computes it",
                          hint="Leave the column empty to have it computed")
    for name in _COMPUTED_INTS.intersection(rec):
        given = row.int(name)
        if given is not None and given != values[name]:
            raise row.err(name, given, f"{values[name]}, as the ledger computes it",
                          hint="Leave the column empty to have it computed")


_NEW_ENTRIES_HINT = "Remove the prev_hash and entry_hash columns to import it as new entries"


def _sealed(row: Record, values: Mapping[str, Any], registration: str) -> str:
    """The row's hash; given hashes must agree with the chain and the content."""
    seq, prev_hash = values["seq"], values["prev_hash"]
    given_prev = row.raw("prev_hash")
    if given_prev is not None and given_prev != prev_hash:
        raise row.err("prev_hash", given_prev[:12] + "…",
                      f"the hash of entry {seq - 1} in this ledger ({prev_hash[:12]}…)",
                      hint=_NEW_ENTRIES_HINT)
    digest = content_hash(values, registration)
    given_hash = row.raw("entry_hash")
    if given_hash is not None and given_hash != digest:
        raise row.err("entry_hash", given_hash[:12] + "…",
                      "the hash of the row's content under this registration: the row "
                      "was changed after export, or it was exported from another vehicle",
                      hint=_NEW_ENTRIES_HINT)
    return digest


def _follow_rule(row: Record, state: RunningState, kind: str, day: dt.date,
                 given: Moments, base: dt.date | None) -> EntryEffect:
    """:func:`ledger.core.ledger_rule.apply_entry`, its refusals located at the row."""
    try:
        return apply_entry(state, kind, day, given, baseline_date=base)
    except EmptyMassNotPositive as exc:
        raise row.err("empty_mass_kg", exc.mass_kg,
                      "an empty mass above 0 kg after this entry") from None


class _Importer:
    """Checks the records of one import in order and builds their rows (nothing written)."""

    def __init__(self, session: Session, vehicle, source: str) -> None:
        self.session = session
        self.vehicle = vehicle
        # Plain attributes: read once per row, the ORM's descriptors would cost more.
        self.vid, self.registration = vehicle.id, vehicle.registration
        self.source = source
        head = newest_entry(session, vehicle.id)
        self.state = RunningState() if head is None else head.state()
        self.prev_hash = GENESIS_HASH if head is None else head.entry_hash
        self.items = _Items.read(session, vehicle.id) if head is not None else _Items()
        self.today = dt.date.today()
        self.now = dt.datetime.now(dt.UTC)
        self.vtype = None  # read for the first weighing, whose empty mass must be plausible
        self.dates: dict[str, dt.date] = {}
        self.weighed: dt.date | None = None  # the date of the newest weighing in this file

    def _plausible(self, mass_kg: float) -> str | None:
        # Imported here: it loads numpy, which only an import with a weighing needs.
        from ledger.typedata.scales import implausible_empty_mass

        if self.vtype is None:
            self.vtype = vehicle_type_info(self.session, self.vehicle).vtype
        return implausible_empty_mass(self.vtype, mass_kg, "kg")

    def row(self, line: int, rec: Mapping[str, Any]) -> dict:
        """The stored values of record ``rec`` (at ``line``), checked; the state follows it."""
        row = Record(rec, f"{self.source} line {line}")
        state = self.state
        seq = state.seq + 1
        given_seq = row.int("seq", what="the entry number")
        if given_seq is not None and given_seq != seq:
            hint = ("the file continues the ledger after its newest entry"
                    if seq > 1 else "the first entry of a vehicle is entry 1")
            raise row.err("seq", given_seq, f"entry {seq} here", hint=hint.capitalize())
        kind = row.text("kind", required=True)
        if kind not in ENTRY_KINDS:
            raise row.err("kind", kind, "one of " + ", ".join(ENTRY_KINDS))
        day = _row_date(row, self.dates, self.today)
        base = self.baseline_date(day)
        try:
            check_date(state, kind, day, base)
        except (EntryOutOfOrder, EntryBeforeBaseline) as exc:
            raise row.err("entry_date", day.isoformat(), date_refusal(exc, kind)) from None
        recorded = parse_recorded(row, self.now)
        actor = row.text("actor", required=True)
        reason = row.text("reason", max_len=4000)
        reference = row.text("reference")
        item = row.text("item")
        detail = _row_detail(row)
        try:
            check_first(state, kind)
        except FirstEntryNotWeighing:
            raise row.err("kind", kind, "weighing: the first entry of a vehicle is a "
                          "weighing") from None
        change = None
        if kind in ABSOLUTE_KINDS:
            given = _measured(row, kind, self._plausible)
        else:
            change = _item_change(row, kind, seq, item, detail, self.items)
            given = change.delta
        effect = _follow_rule(row, state, kind, day, given, base)
        if change is not None:
            self.items.targets[seq] = _Target(
                kind, item, change.mass_kg, change.x_m, change.y_m, change.z_m,
                effect.delta_mass_kg, effect.delta_mx_kgm, effect.delta_my_kgm,
                effect.delta_mz_kgm, detail.get("shape"))
        try:
            detail_json = canonical_json(detail) if detail else "{}"
        except (ValueError, TypeError):
            raise row.err("detail_json", "…", "JSON without NaN or infinity") from None
        if change is None:
            im = ix = iy = iz = reverses = None
        else:
            im, ix, iy, iz, reverses = (change.mass_kg, change.x_m, change.y_m, change.z_m,
                                        change.reverses_seq)
        values = {
            "vehicle_id": self.vid, "kind": kind, "entry_date": day, "recorded_at": recorded,
            "actor": actor, "reason": reason, "reference": reference, "item": item,
            "item_mass_kg": im, "item_x_m": ix, "item_y_m": iy, "item_z_m": iz,
            **effect.columns(),
            "reverses_seq": reverses, "detail_json": detail_json, "prev_hash": self.prev_hash,
        }
        _check_computed(row, values)
        values["entry_hash"] = _sealed(row, values, self.registration)
        self.state, self.prev_hash = effect.after, values["entry_hash"]
        if kind == "weighing":
            self.weighed = day
        return values

    def baseline_date(self, day: dt.date) -> dt.date | None:
        """The date of the weighing the state starts from, for late paperwork: one weighed in
        this file, else read from the stored ledger."""
        if not is_late(self.state, day):
            return None
        if self.weighed is not None:
            return self.weighed
        return baseline_date(self.session, self.vehicle.id, self.state, day)


@contextmanager
def _gc_paused() -> Iterator[None]:
    """The cyclic garbage collector paused while the rows are built: each row adds objects
    that live until the insert, none in a cycle, so its passes over them (more of them as the
    list grows) find nothing to collect. Restored as it was, whatever happens."""
    was_enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if was_enabled:
            gc.enable()


def import_entries(session: Session, registration: str, records: Iterable[tuple[int, Mapping]],
                   *, source: str = "file",
                   progress: Callable[[int], None] | None = None,
                   chunk: int = CHUNK) -> ImportSummary:
    """Append ``records`` (from :func:`parse_history`) to a vehicle's ledger, all or nothing.

    Every record is checked and its hash computed before anything is inserted; then the rows go
    in with Core ``executemany`` in chunks of ``chunk``, calling ``progress(rows written so
    far)`` after each. Runs in the caller's transaction (commit or roll back around it). Each
    record's effect on the running state is :func:`ledger.core.ledger_rule.apply_entry`, as for
    an entry appended by hand.

    Raises
    ------
    InputError
        The first bad record, located ``FILE line N``; nothing is written.
    """
    vehicle = get_vehicle(session, registration, lock=True)
    importer = _Importer(session, vehicle, source)
    with _gc_paused():
        out = [importer.row(line, rec) for line, rec in records]
    _insert_rows(session.connection(), out, chunk, progress)
    first = out[0]["seq"] if out else None
    return ImportSummary(vehicle.registration, len(out), first,
                         out[-1]["seq"] if out else None,
                         out[-1]["entry_hash"] if out else None)


def _insert_rows(conn, rows: list[dict], chunk: int,
                 progress: Callable[[int], None] | None) -> None:
    """Insert ``rows`` in chunks, one ``executemany`` each, in the connection's transaction.

    On SQLite the rows go to the driver as tuples, with dates and timestamps converted by
    SQLAlchemy's own SQLite bind processors (so they are stored exactly as the ORM stores
    them, and read back the same; :func:`ledger.store.sqlite_path.sqlite_insert`), each distinct
    value once: this skips SQLAlchemy's per-row
    parameter processing, which otherwise costs more than the insert itself. Elsewhere it is a
    plain Core ``executemany`` of the dicts.
    """
    table = _E.__table__
    written = 0
    if conn.dialect.name != "sqlite":
        stmt = insert(table)
        for i in range(0, len(rows), chunk):
            part = rows[i:i + chunk]
            conn.execute(stmt, part)
            written += len(part)
            if progress is not None:
                progress(written)
        return
    plan = sqlite_insert(conn.dialect)
    memo = plan.memo()
    for i in range(0, len(rows), chunk):
        conn.exec_driver_sql(plan.sql, [plan.row(r, memo) for r in rows[i:i + chunk]])
        written += min(chunk, len(rows) - i)
        if progress is not None:
            progress(written)


def import_history(session: Session, registration: str, text: str, fmt: str, *,
                   source: str = "file",
                   progress: Callable[[int], None] | None = None) -> ImportSummary:
    """Parse ``text`` (CSV or JSON) and append its entries to the vehicle, all or nothing."""
    records = parse_history(text, fmt, source=source)
    return import_entries(session, registration, records, source=source, progress=progress)
