"""The hash chain of a vehicle's ledger: canonical content, SHA-256, and verification.

Every ledger entry stores ``entry_hash``, the SHA-256 of its *canonical content*, and that
content includes ``prev_hash``, the ``entry_hash`` of the entry before it for the same vehicle
(64 zeros for the first). Changing any stored field of an entry — a mass, a running total, a
date, who recorded it, a byte of its detail JSON — changes its canonical content, so its stored
hash no longer matches; re-computing that hash breaks the link from the next entry.

Canonical content
-----------------
A JSON object with sorted keys, no whitespace, UTF-8, no NaN or infinity, holding:

``v`` (the layout version, 1), ``vehicle`` (the registration), ``seq``, ``kind``,
``entry_date`` (ISO date), ``recorded_at`` (UTC, ``YYYY-MM-DDTHH:MM:SS.ffffffZ``), ``actor``,
``reason``, ``reference``, ``item``, ``item_mass_kg``, ``item_x_m``, ``item_y_m``, ``item_z_m``,
``delta_mass_kg``, ``delta_mx_kgm``, ``delta_my_kgm``, ``delta_mz_kgm``, ``empty_mass_kg``,
``empty_mx_kgm``, ``empty_my_kgm``, ``empty_mz_kgm``, ``z_known`` (0 or 1), ``baseline_seq``,
``reverses_seq``, ``detail`` (the stored ``detail_json`` text, as a string) and ``prev_hash``.

Numbers are written by Python's ``repr`` of the stored double, which reads back to the same bits;
``-0.0`` is written as ``0.0`` (SQLite does not keep the sign of a zero). Absent values are
``null``. The row's database ``id`` is not part of the content, so an exported history imported
into another database under the same registration has the same hashes.

What the chain cannot show by itself: deleting the *newest* entries leaves a shorter chain that
is still valid. Keep the head hash that ``wbledger verify`` prints (or an exported file) and
compare it later; :func:`verify_vehicle` accepts it as ``expect_head``.
"""

from __future__ import annotations

import datetime as dt
import hashlib
import json
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import dataclass
from operator import itemgetter
from typing import Any

from ledger.core.ledger_rule import ABSOLUTE_KINDS  # the ledger's rule; re-exported here

__all__ = [
    "GENESIS_HASH",
    "CHAIN_VERSION",
    "HASHED_COLUMNS",
    "ABSOLUTE_KINDS",
    "canonical_json",
    "canonical_content",
    "canonical_object",
    "content_hash",
    "utc_text",
    "ChainReport",
    "check_entries",
    "entries_query",
    "verify_vehicle",
    "verify_all",
]

#: ``prev_hash`` of the first entry of every vehicle.
GENESIS_HASH = "0" * 64

#: Layout version of the canonical content (the ``v`` key).
CHAIN_VERSION = 1

#: Columns of ``ledger_entries`` that the canonical content covers, in the order
#: :func:`check_entries` expects them (with ``entry_hash`` after them).
HASHED_COLUMNS = (
    "seq", "kind", "entry_date", "recorded_at", "actor", "reason", "reference", "item",
    "item_mass_kg", "item_x_m", "item_y_m", "item_z_m",
    "delta_mass_kg", "delta_mx_kgm", "delta_my_kgm", "delta_mz_kgm",
    "empty_mass_kg", "empty_mx_kgm", "empty_my_kgm", "empty_mz_kgm",
    "z_known", "baseline_seq", "reverses_seq", "detail_json", "prev_hash",
)
_hashed_values = itemgetter(*HASHED_COLUMNS)  # one C call per entry (a bulk import hashes many)


_FLOATS = ("item_mass_kg", "item_x_m", "item_y_m", "item_z_m",
           "delta_mass_kg", "delta_mx_kgm", "delta_my_kgm", "delta_mz_kgm",
           "empty_mass_kg", "empty_mx_kgm", "empty_my_kgm", "empty_mz_kgm")

_ENCODER = json.JSONEncoder(sort_keys=True, separators=(",", ":"), ensure_ascii=False,
                            allow_nan=False)


def canonical_json(data: Any) -> str:
    """Compact JSON with sorted keys and exact float ``repr``; refuses NaN and infinity.

    Examples
    --------
    >>> canonical_json({"b": 0.1, "a": [1, None, "é"]})
    '{"a":[1,null,"é"],"b":0.1}'
    """
    return _ENCODER.encode(data)


def _num(value) -> float | None:
    if value is None:
        return None
    return float(value) + 0.0  # -0.0 + 0.0 == 0.0


def _opt_int(value) -> int | None:
    return None if value is None else int(value)


_UTC_LAST: list = [None, ""]


def utc_text(value: dt.datetime) -> str:
    """A timestamp as UTC text with microseconds; a naive value is taken as UTC (SQLite).

    Examples
    --------
    >>> import datetime as dt
    >>> utc_text(dt.datetime(2026, 3, 1, 12, 0, tzinfo=dt.timezone(dt.timedelta(hours=2))))
    '2026-03-01T10:00:00.000000Z'
    """
    if value is _UTC_LAST[0]:  # a bulk import stamps every row with the same instant
        return _UTC_LAST[1]
    v = value
    if v.tzinfo is not None:
        v = v.astimezone(dt.UTC).replace(tzinfo=None)
    text = v.isoformat(timespec="microseconds") + "Z"
    _UTC_LAST[0], _UTC_LAST[1] = value, text
    return text


_jstring = json.encoder.encode_basestring  # the C escaper json.dumps uses (ensure_ascii=False)


def _s(value) -> str:
    return "null" if value is None else _jstring(value)


def _f(value) -> str:
    if value.__class__ is float and value and value - value == 0.0:
        return repr(value)  # the common case: finite, not zero (what json.dumps writes)
    if value is None:
        return "null"
    if value == 0.0:  # also -0.0, written 0.0 (SQLite does not keep the sign of a zero)
        return "0.0"
    if value - value != 0.0:  # NaN or infinity
        raise ValueError(f"non-finite number {value!r} in a ledger entry")
    # what json.dumps writes for a finite float
    return repr(value) if value.__class__ is float else repr(float(value))


def _i(value) -> str:
    return "null" if value is None else str(int(value))


def _date(value) -> str:
    return _jstring(value if isinstance(value, str) else value.isoformat())


def canonical_content(entry: Mapping[str, Any], registration: str) -> str:
    """The canonical content of one entry (see the module notes).

    ``entry`` maps the column names of :data:`HASHED_COLUMNS` to their values as stored
    (``entry_date`` a date, ``recorded_at`` a datetime, ``detail_json`` the stored text).
    The text is exactly ``json.dumps(obj, sort_keys=True, separators=(",", ":"),
    ensure_ascii=False, allow_nan=False)`` of the object described above; it is assembled
    key by key, in sorted order, because that is several times faster for bulk imports.
    """
    return _content_of_row(_hashed_values(entry), _jstring(registration))


def _content_of_row(r: Sequence[Any], vehicle_json: str) -> str:
    """:func:`canonical_content` of a row of the :data:`HASHED_COLUMNS` values, in order;
    ``vehicle_json`` is the registration as a JSON string (the same for a whole chain)."""
    (seq, kind, entry_date, recorded_at, actor, reason, reference, item, imk, ixm, iym, izm,
     dm, dmx, dmy, dmz, em, emx, emy, emz, zk, base, reverses, detail, prev) = r[:25]
    return (
        f'{{"actor":{_jstring(actor)},"baseline_seq":{int(base)},'
        f'"delta_mass_kg":{_f(dm)},"delta_mx_kgm":{_f(dmx)},'
        f'"delta_my_kgm":{_f(dmy)},"delta_mz_kgm":{_f(dmz)},'
        f'"detail":{_jstring(detail)},"empty_mass_kg":{_f(em)},'
        f'"empty_mx_kgm":{_f(emx)},"empty_my_kgm":{_f(emy)},'
        f'"empty_mz_kgm":{_f(emz)},"entry_date":{_date(entry_date)},'
        f'"item":{"null" if item is None else _jstring(item)},"item_mass_kg":{_f(imk)},'
        f'"item_x_m":{_f(ixm)},"item_y_m":{_f(iym)},'
        f'"item_z_m":{_f(izm)},"kind":{_jstring(kind)},'
        f'"prev_hash":{_jstring(prev)},"reason":{"null" if reason is None else _jstring(reason)},'
        f'"recorded_at":"{utc_text(recorded_at)}",'
        f'"reference":{"null" if reference is None else _jstring(reference)},'
        f'"reverses_seq":{"null" if reverses is None else int(reverses)},'
        f'"seq":{int(seq)},"v":{CHAIN_VERSION},"vehicle":{vehicle_json},'
        f'"z_known":{int(zk)}}}'
    )


def canonical_object(entry: Mapping[str, Any], registration: str) -> dict:
    """The object whose canonical JSON is :func:`canonical_content` (for checks and tools)."""
    date = entry["entry_date"]
    return {
        "v": CHAIN_VERSION, "vehicle": registration, "seq": int(entry["seq"]),
        "kind": entry["kind"],
        "entry_date": date if isinstance(date, str) else date.isoformat(),
        "recorded_at": utc_text(entry["recorded_at"]), "actor": entry["actor"],
        "reason": entry["reason"], "reference": entry["reference"], "item": entry["item"],
        **{k: _num(entry[k]) for k in _FLOATS},
        "z_known": int(entry["z_known"]), "baseline_seq": int(entry["baseline_seq"]),
        "reverses_seq": _opt_int(entry["reverses_seq"]), "detail": entry["detail_json"],
        "prev_hash": entry["prev_hash"],
    }


def content_hash(entry: Mapping[str, Any], registration: str) -> str:
    """SHA-256 (hex) of :func:`canonical_content`: the ``entry_hash`` an entry must carry.

    Examples
    --------
    >>> import datetime as dt
    >>> e = dict(seq=1, kind="weighing", entry_date=dt.date(2026, 1, 5),
    ...          recorded_at=dt.datetime(2026, 1, 5, 9, 30, tzinfo=dt.timezone.utc),
    ...          actor="A. Weigher", reason=None, reference=None, item=None,
    ...          item_mass_kg=None, item_x_m=None, item_y_m=None, item_z_m=None,
    ...          delta_mass_kg=700.0, delta_mx_kgm=1400.0, delta_my_kgm=0.0, delta_mz_kgm=0.0,
    ...          empty_mass_kg=700.0, empty_mx_kgm=1400.0, empty_my_kgm=0.0, empty_mz_kgm=0.0,
    ...          z_known=0, baseline_seq=1, reverses_seq=None, detail_json="{}",
    ...          prev_hash=GENESIS_HASH)
    >>> h = content_hash(e, "KV-101")
    >>> len(h), h == content_hash({**e, "empty_mass_kg": 700.0000000000001}, "KV-101")
    (64, False)
    """
    return hashlib.sha256(canonical_content(entry, registration).encode("utf-8")).hexdigest()


@dataclass(frozen=True)
class ChainReport:
    """Outcome of verifying one vehicle's chain.

    ``bad_seq`` is the first entry that does not match (``None`` when the chain verifies) and
    ``problem`` says what is wrong with it.
    """

    registration: str
    entries: int
    head_seq: int | None
    head_hash: str | None
    ok: bool
    bad_seq: int | None = None
    problem: str | None = None

    def to_dict(self) -> dict:
        return {"registration": self.registration, "entries": self.entries,
                "head_seq": self.head_seq, "head_hash": self.head_hash, "ok": self.ok,
                "bad_seq": self.bad_seq, "problem": self.problem}


_I_SEQ, _I_KIND, _I_RECORDED, _I_ZK, _I_BASE, _I_PREV = (
    HASHED_COLUMNS.index(c) for c in ("seq", "kind", "recorded_at", "z_known", "baseline_seq",
                                      "prev_hash"))
_I_DELTA = HASHED_COLUMNS.index("delta_mass_kg")  # then mx, my, mz
_I_EMPTY = HASHED_COLUMNS.index("empty_mass_kg")  # then mx, my, mz
_STATE_NAMES = ("mass_kg", "mx_kgm", "my_kgm", "mz_kgm")


def _totals_follow(prev: Sequence[Any] | None, r: Sequence[Any]) -> str | None:
    """Why the running totals of row ``r`` do not follow from row ``prev`` (None if they do).

    The checks repeat the arithmetic the ledger does when it appends, so they are exact.
    """
    kind = r[_I_KIND]
    seq = int(r[_I_SEQ])
    if prev is None:
        if kind != "weighing":
            return "the first entry of a vehicle must be a weighing"
        before = (0.0, 0.0, 0.0, 0.0)
    else:
        before = prev[_I_EMPTY:_I_EMPTY + 4]
    delta = r[_I_DELTA:_I_DELTA + 4]
    after = r[_I_EMPTY:_I_EMPTY + 4]
    if kind in ABSOLUTE_KINDS:
        for name, p, d, a in zip(_STATE_NAMES, before, delta, after):
            if d != a - p:
                return f"delta_{name} is not empty_{name} minus that of the previous entry"
    else:
        for name, p, d, a in zip(_STATE_NAMES, before, delta, after):
            if a != p + d:
                return f"empty_{name} is not the previous entry's plus delta_{name}"
    expected_base = seq if kind == "weighing" else (int(prev[_I_BASE]) if prev else seq)
    if int(r[_I_BASE]) != expected_base:
        return f"baseline_seq is {r[_I_BASE]}, expected {expected_base}"
    return None


def check_entries(registration: str, rows: Iterable[Sequence[Any]], *,
                  expect_head: str | None = None) -> ChainReport:
    """Verify a stream of one vehicle's entries, in ``seq`` order.

    Each row holds the values of :data:`HASHED_COLUMNS` followed by ``entry_hash``. Checks, per
    entry: its ``seq`` follows the previous one (no entry missing), its ``prev_hash`` is the
    previous entry's hash (the genesis hash for the first), its stored hash matches its content,
    and its running totals follow from the previous entry. ``expect_head``, if given, is a head
    hash recorded earlier: the chain must still contain it (catches deleted newest entries).
    """
    n_cols = len(HASHED_COLUMNS)
    vehicle_json = _jstring(registration)
    sha256 = hashlib.sha256
    prev: Sequence[Any] | None = None
    prev_hash = GENESIS_HASH
    count = 0
    seen_expected = expect_head is None
    for row in rows:
        stored = row[n_cols]
        expected_seq = count + 1
        count += 1
        seq = row[_I_SEQ]
        if seq.__class__ is not int:  # text, or 2.5 that int() would quietly make 2
            return ChainReport(registration, count, None, None, False, expected_seq,
                               f"entry {expected_seq}: its seq {seq!r} is not a whole number")

        def bad(problem: str, at: int = seq) -> ChainReport:
            # Called within this iteration only, so the loop's names are the current ones.
            return ChainReport(registration, count, None, None, False, at, problem)  # noqa: B023

        if seq != expected_seq:
            if seq > expected_seq:
                missing = (f"entry {expected_seq} is missing" if seq == expected_seq + 1
                           else f"entries {expected_seq} to {seq - 1} are missing")
                return bad(f"entry {seq} follows entry {expected_seq - 1}: {missing}")
            return bad(f"entry {seq} is out of order (expected entry {expected_seq})")
        if row[_I_PREV] != prev_hash:
            what = "the genesis hash" if prev is None else f"the hash of entry {seq - 1}"
            return bad(f"entry {seq}: prev_hash does not match {what}")
        try:
            recorded = row[_I_RECORDED]
            if recorded.__class__ is str:  # SQLite text, read raw by entries_query
                row = list(row)
                row[_I_RECORDED] = dt.datetime.fromisoformat(recorded)
            actual = sha256(_content_of_row(row, vehicle_json).encode("utf-8")).hexdigest()
        except (ValueError, TypeError, AttributeError) as exc:
            return bad(f"entry {seq}: its content cannot be read ({exc})")
        if actual != stored:
            return bad(f"entry {seq}: its content does not match its hash "
                       "(a field was changed after it was written)")
        try:
            why = _totals_follow(prev, row)
        except (ValueError, TypeError) as exc:
            why = f"a stored value cannot be read ({exc})"
        if why:
            return bad(f"entry {seq}: running totals do not follow: {why}")
        if not seen_expected and stored == expect_head:
            seen_expected = True
        prev, prev_hash = row, stored
    if not seen_expected:
        return ChainReport(registration, count, count or None, prev_hash if count else None,
                           False, count + 1,
                           f"the recorded head hash {expect_head[:12]}… is not in the chain: "
                           "entries were removed or replaced")
    return ChainReport(registration, count, count or None, prev_hash if count else None, True)


def entries_query(vehicle_ids=None):
    """The query :func:`check_entries` reads: vehicle id, the hashed columns and the hash,
    by vehicle and seq (of ``vehicle_ids`` only, if given)."""
    from sqlalchemy import String, select, type_coerce

    from ledger.store.models import LedgerEntryRow as E

    # Dates are read as the stored text where the driver gives text (SQLite), so that a value
    # changed by hand into something that is not a date is reported by check_entries instead
    # of failing inside the result processor; PostgreSQL still returns date objects.
    raw = {"entry_date", "recorded_at"}
    cols = [type_coerce(getattr(E, name), String).label(name) if name in raw
            else getattr(E, name) for name in HASHED_COLUMNS] + [E.entry_hash]
    query = select(E.vehicle_id, *cols).order_by(E.vehicle_id, E.seq)
    if vehicle_ids is not None:
        query = query.where(E.vehicle_id.in_(vehicle_ids))
    return query


def verify_vehicle(session, registration: str, *, expect_head: str | None = None) -> ChainReport:
    """Verify the chain of one vehicle (streamed; raises NotFoundError for an unknown one)."""
    from ledger.store.catalog import get_vehicle

    if expect_head is not None:
        import re

        from ledger.errors import InputError

        if not re.fullmatch(r"[0-9a-f]{64}", expect_head):
            raise InputError("--expect", expect_head, "a head hash: 64 hexadecimal digits "
                             "(0-9, a-f) as `wbledger verify` prints it")
    vehicle = get_vehicle(session, registration)
    result = session.connection().execute(
        entries_query([vehicle.id]).execution_options(yield_per=5000))
    return check_entries(registration, (r[1:] for r in result), expect_head=expect_head)


def verify_all(session) -> list[ChainReport]:
    """Verify every vehicle's chain; one report per vehicle, ordered by registration."""
    import itertools

    from sqlalchemy import select

    from ledger.store.models import VehicleRow

    vehicles = session.execute(select(VehicleRow.id, VehicleRow.registration)).all()
    names = {vid: reg for vid, reg in vehicles}
    reports: dict[int, ChainReport] = {}
    result = session.connection().execute(entries_query().execution_options(yield_per=5000))
    for vid, rows in itertools.groupby(result, key=lambda r: r[0]):
        reports[vid] = check_entries(names[vid], (r[1:] for r in rows))
    out = [reports.get(vid) or ChainReport(reg, 0, None, None, True) for vid, reg in vehicles]
    return sorted(out, key=lambda r: r.registration)
