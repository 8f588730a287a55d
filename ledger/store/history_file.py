"""The history file: a vehicle's ledger as CSV or JSON, written exactly and read back.

Both formats carry every stored column of every entry (:data:`COLUMNS`): SI values, floats
written with Python's ``repr`` (which reads back to the same double), dates as ISO text,
``recorded_at`` in UTC with microseconds, the detail as canonical JSON, and the hashes. Reading
gives ``(line number, {column: value})`` records for :mod:`ledger.store.bulk_import`; a JSON
history is held to :mod:`ledger.bounds` as a whole. See :mod:`ledger.store.transfer`.
"""

from __future__ import annotations

import csv
import datetime as dt
import io
import json
import math
from collections.abc import Mapping
from typing import Any

from sqlalchemy import select
from sqlalchemy.orm import Session

from ledger.bounds import NUMBER_RULE, TEXT_MAX, check_text, in_range, item_field, load_json, shown
from ledger.errors import InputError
from ledger.store.catalog import get_vehicle
from ledger.store.chain import utc_text
from ledger.store.models import LedgerEntryRow, VehicleTypeRow

__all__ = ["COLUMNS", "FORMATS", "FORMAT_NAME", "FORMAT_VERSION", "FLOAT_COLUMNS",
           "Record", "export_history", "parse_history", "parse_recorded"]

FORMAT_NAME = "wbledger-history"
FORMAT_VERSION = 1
FORMATS = ("csv", "json")

#: Columns of an exported history, in file order.
COLUMNS = (
    "seq", "kind", "entry_date", "recorded_at", "actor", "reason", "reference", "item",
    "item_mass_kg", "item_x_m", "item_y_m", "item_z_m",
    "delta_mass_kg", "delta_mx_kgm", "delta_my_kgm", "delta_mz_kgm",
    "empty_mass_kg", "empty_mx_kgm", "empty_my_kgm", "empty_mz_kgm",
    "z_known", "baseline_seq", "reverses_seq", "detail_json", "prev_hash", "entry_hash",
)
FLOAT_COLUMNS = frozenset(c for c in COLUMNS if c.endswith(("_kg", "_m", "_kgm")))
_INT_COLS = frozenset({"seq", "z_known", "baseline_seq", "reverses_seq"})
_E = LedgerEntryRow


# --- export ---------------------------------------------------------------------------------

def _export_rows(session: Session, registration: str):
    vehicle = get_vehicle(session, registration)
    cols = [getattr(_E, c) for c in COLUMNS]
    rows = session.execute(select(*cols).where(_E.vehicle_id == vehicle.id).order_by(_E.seq)
                           .execution_options(yield_per=5000))
    return vehicle, rows


def _cell(name: str, value) -> str:
    if value is None:
        return ""
    if name in FLOAT_COLUMNS:
        return repr(float(value) + 0.0)
    if name == "entry_date":
        return value.isoformat()
    if name == "recorded_at":
        return utc_text(value)
    return str(value)


def _json_value(name: str, value):
    if value is None:
        return None
    if name in FLOAT_COLUMNS:
        return float(value) + 0.0
    if name in _INT_COLS:
        return int(value)
    if name == "entry_date":
        return value.isoformat()
    if name == "recorded_at":
        return utc_text(value)
    return value


def export_history(session: Session, registration: str, fmt: str) -> str:
    """A vehicle's whole ledger as CSV or JSON text (see the module notes).

    The JSON document is ``{"format": "wbledger-history", "version": 1, "registration": …,
    "type": …, "head_hash": …, "entries": [{column: value, …, "detail": {…}}]}`` with one entry
    per line; CSV has a header row with :data:`COLUMNS`.
    """
    if fmt not in FORMATS:
        raise InputError("--format", fmt, "csv or json")
    vehicle, rows = _export_rows(session, registration)
    if fmt == "csv":
        buf = io.StringIO()
        w = csv.writer(buf, lineterminator="\n")
        w.writerow(COLUMNS)
        for row in rows:
            w.writerow([_cell(n, v) for n, v in zip(COLUMNS, row)])
        return buf.getvalue()
    tname = session.scalar(select(VehicleTypeRow.name)
                           .where(VehicleTypeRow.id == vehicle.type_id))
    lines = []
    head = None
    for row in rows:
        doc = {}
        for n, v in zip(COLUMNS, row):
            if n == "detail_json":
                doc["detail"] = json.loads(v)
            else:
                doc[n] = _json_value(n, v)
        head = doc["entry_hash"]
        lines.append(json.dumps(doc, ensure_ascii=False, allow_nan=False))
    header = json.dumps({"format": FORMAT_NAME, "version": FORMAT_VERSION,
                         "registration": vehicle.registration, "type": tname,
                         "head_hash": head}, ensure_ascii=False)
    body = ",\n".join(lines)
    return header[:-1] + ',\n"entries": [\n' + body + ("\n" if lines else "") + "]}\n"


# --- parse ----------------------------------------------------------------------------------

def _json_entry_lines(text: str, count: int) -> list[int] | None:
    """Line numbers where the elements of the top-level "entries" array start (best effort)."""
    decoder = json.JSONDecoder()
    try:
        obj, _ = decoder.raw_decode(text.lstrip())
        at = text.index('"entries"')
        pos = text.index("[", at) + 1
        out = []
        ws = " \t\r\n,"
        line, counted = 1, 0  # newlines are counted once, from where the last count ended
        for _ in range(count):
            while text[pos] in ws:
                pos += 1
            line += text.count("\n", counted, pos)
            counted = pos
            out.append(line)
            _, pos = decoder.raw_decode(text, pos)
        return out
    except (ValueError, IndexError):
        return None


def parse_history(text: str, fmt: str, *, source: str = "file") -> list[tuple[int, dict]]:
    """Read an exported (or hand-written) history: ``[(line number, {column: value})]``.

    CSV values are text ("" for empty); JSON values keep their JSON types. The line number is
    where the row (or the entry's object) starts in the file.
    """
    if fmt not in FORMATS:
        raise InputError("--format", fmt, "csv or json")
    if fmt == "csv":
        return _parse_csv(text, source)
    return _parse_json(text, source)


def _parse_csv(text: str, source: str) -> list[tuple[int, dict]]:
    reader = csv.reader(io.StringIO(text, newline=""))
    try:
        header = next(reader)
    except StopIteration:
        raise InputError("header", "", "a header row naming the columns: "
                         + ", ".join(COLUMNS[:8]) + ", …", source=f"{source} line 1") from None
    except csv.Error as exc:
        raise InputError("header", "", f"not valid CSV ({exc})",
                         source=f"{source} line 1") from None
    header = [h.strip() for h in header]
    for h in header:
        if h not in COLUMNS:
            raise InputError("column", h, "a column of a wbledger history: "
                             + ", ".join(COLUMNS), source=f"{source} line 1")
    for h in ("kind", "entry_date", "actor"):
        if h not in header:
            raise InputError("column", h, "required: the header must name it",
                             source=f"{source} line 1")
    out = []
    start = reader.line_num + 1
    try:
        for row in reader:
            if not row or all(not c.strip() for c in row):
                start = reader.line_num + 1
                continue
            if len(row) != len(header):
                raise InputError("row", ",".join(row)[:40],
                                 f"{len(header)} values, one per column (it has {len(row)})",
                                 source=f"{source} line {start}")
            out.append((start, dict(zip(header, row))))
            start = reader.line_num + 1
    except csv.Error as exc:
        raise InputError("row", "", f"not valid CSV ({exc})",
                         source=f"{source} line {reader.line_num}") from None
    return out


def _parse_json(text: str, source: str) -> list[tuple[int, dict]]:
    try:
        doc = load_json(text, source=source)  # nesting, numbers and texts within ledger.bounds
    except json.JSONDecodeError as exc:
        raise InputError("document", "", f"not valid JSON: {exc.msg}",
                         source=f"{source} line {exc.lineno}") from None
    if not isinstance(doc, dict) or not isinstance(doc.get("entries"), list):
        raise InputError("entries", type(doc).__name__, 'a JSON object with an "entries" list',
                         source=source)
    if doc.get("format", FORMAT_NAME) != FORMAT_NAME:
        raise InputError("format", doc.get("format"), f"{FORMAT_NAME!r}", source=source)
    if doc.get("version", FORMAT_VERSION) != FORMAT_VERSION:
        raise InputError("version", doc.get("version"), f"{FORMAT_VERSION}", source=source)
    entries = doc["entries"]
    lines = _json_entry_lines(text, len(entries))
    out = []
    for i, e in enumerate(entries):
        where = lines[i] if lines else None
        if not isinstance(e, dict):
            raise InputError(item_field("entries", i), type(e).__name__, "a JSON object",
                             source=f"{source} line {where}" if where else source)
        rec = dict(e)
        if "detail" in rec:
            if "detail_json" in rec:
                raise InputError(f"{item_field('entries', i)}.detail", "…",
                                 "detail or detail_json, not both",
                                 source=f"{source} line {where}" if where else source)
            rec["detail_json"] = rec.pop("detail")
        for k in rec:
            if k not in COLUMNS:
                raise InputError(k, rec[k] if isinstance(rec[k], (str, int, float)) else "…",
                                 "a field of a wbledger history entry: " + ", ".join(COLUMNS),
                                 source=f"{source} line {where}" if where else source)
        out.append((where or i + 1, rec))
    return out


# --- reading the fields of a record -------------------------------------------------------

class Record:
    """The fields of one record of a history, converted on demand; errors are located at its
    line (``where``, e.g. ``FILE line 3``)."""

    __slots__ = ("rec", "where")

    def __init__(self, rec: Mapping[str, Any], where: str) -> None:
        self.rec = rec
        self.where = where

    def err(self, field: str, value, allowed: str, hint: str | None = None) -> InputError:
        return InputError(field, value, allowed, source=self.where, hint=hint)

    def raw(self, name: str):
        v = self.rec.get(name)
        if isinstance(v, str):
            v = v.strip()
            if v == "":
                return None
        return v

    def num(self, name: str, *, required: bool = False, what: str = "a finite number"):
        v = self.rec.get(name)
        if v.__class__ is float:  # the common case (JSON), checked without a conversion
            if in_range(v):
                return v + 0.0
            raise self.err(name, v, what if v - v != 0.0 else NUMBER_RULE)
        if v is None or v == "":
            if required:
                raise self.err(name, "", f"required: {what}")
            return None
        if isinstance(v, bool):
            raise self.err(name, v, what)
        try:
            f = float(v)
        except (TypeError, ValueError, OverflowError):
            raise self.err(name, shown(v), what) from None
        if not math.isfinite(f):
            raise self.err(name, shown(v), what)
        if not in_range(f):
            raise self.err(name, shown(v), NUMBER_RULE)
        return f + 0.0

    def int(self, name: str, *, required: bool = False, what: str = "a whole number"):
        v = self.rec.get(name)
        if v.__class__ is int:
            if in_range(v):
                return v
            raise self.err(name, shown(v), NUMBER_RULE)
        if isinstance(v, str):
            v = v.strip() or None
        if v is None:
            if required:
                raise self.err(name, "", f"required: {what}")
            return None
        if isinstance(v, bool):
            raise self.err(name, v, what)
        try:
            i = int(str(v))
        except ValueError:  # also a number of more digits than Python converts
            raise self.err(name, shown(v), what) from None
        if not in_range(i):
            raise self.err(name, shown(v), NUMBER_RULE)
        return i

    def text(self, name: str, *, required: bool = False, max_len: int = TEXT_MAX):
        v = self.rec.get(name)
        if v.__class__ is str:
            if v and not (v[0].isspace() or v[-1].isspace()):
                return check_text(name, v, max_len, source=self.where)
            v = v.strip() or None
        if v is None:
            if required:
                raise self.err(name, "", "required: a non-empty text")
            return None
        if not isinstance(v, str):
            raise self.err(name, v, "a text")
        return check_text(name, v, max_len, source=self.where)


def parse_recorded(row: Record, now: dt.datetime) -> dt.datetime:
    """The record's ``recorded_at`` in UTC (a naive time is UTC); ``now`` when not given."""
    v = row.raw("recorded_at")
    if v is None:
        return now
    if not isinstance(v, str):
        raise row.err("recorded_at", v, "a UTC timestamp such as 2026-03-01T10:00:00.000000Z")
    text = v[:-1] + "+00:00" if v.endswith("Z") else v
    try:
        t = dt.datetime.fromisoformat(text)
    except ValueError:
        raise row.err("recorded_at", v, "a UTC timestamp such as "
                      "2026-03-01T10:00:00.000000Z") from None
    if t.tzinfo is None:
        t = t.replace(tzinfo=dt.UTC)
    return t.astimezone(dt.UTC)
