"""The ledger exported in display units (``wbledger export --units display``): for people and
spreadsheets, not for import.

One row per entry of a :class:`ledger.services.record.MaintenanceRecord`: what was done, by whom
and why, the item's mass and arm, the change, and the running empty mass, moment index and CG,
each figure with the record's precision (:class:`ledger.report.record.RecordFigures`: the unit's
usual decimals, not the 16 digits of the exact SI export) and its unit in the column name. The
lossless SI export (:mod:`ledger.store.history_file`) stays the default: only it can be imported
back.
"""

from __future__ import annotations

import csv
import io
import json

from ledger.report.record import RecordFigures

__all__ = ["DISPLAY_FORMAT", "display_columns", "export_display"]

DISPLAY_FORMAT = "wbledger-history-display"


def _tag(text: str) -> str:
    """A unit as a column-name tag: ``lb*in/1000`` → ``lbin_per_1000``."""
    return text.replace("*", "").replace("·", "").replace("/", "_per_")


def display_columns(units) -> list[str]:
    """Column names, each figure's unit in its name (``empty_mass_lb``, ``cg_x_in``)."""
    m, ln, mom = _tag(units.mass), _tag(units.length), _tag(units.moment_label)
    return ["seq", "kind", "entry_date", "item", "reverses_seq", "reason", "reference", "actor",
            f"item_mass_{m}", f"item_x_{ln}", f"delta_mass_{m}", f"delta_moment_{mom}",
            f"empty_mass_{m}", f"empty_moment_{mom}", f"cg_x_{ln}", "entry_hash"]


def _rows(rec) -> list[list]:
    scale = rec.current.empty_mass_kg if rec.current is not None else None
    f = RecordFigures(rec.units, scale)
    rows = []
    for e in rec.entries:
        changed = e.added is not None
        rows.append([e.seq, e.kind, e.entry_date, e.item, e.reverses_seq, e.reason,
                     e.reference, e.signatory,
                     f.mass(e.item_mass) if e.item_mass is not None else None,
                     f.length(e.item_arm) if e.item_arm is not None else None,
                     f.mass(e.change_mass, True) if changed else None,
                     f.moment(e.change_moment, True) if changed else None,
                     f.mass(e.empty_mass), f.moment(e.empty_moment), f.length(e.cg),
                     e.entry_hash])
    return rows


def export_display(rec, fmt: str) -> str:
    """The record's entries as CSV or JSON text in display units (see the module notes).

    Figures are text in CSV and numbers in JSON, rounded to the shown decimals; JSON carries
    ``{"format": "wbledger-history-display", "registration", "type", "units", "entries"}``.
    """
    cols = display_columns(rec.units)
    rows = _rows(rec)
    if fmt == "csv":
        buf = io.StringIO()
        w = csv.writer(buf, lineterminator="\n")
        w.writerow(cols)
        w.writerows([["" if v is None else v for v in row] for row in rows])
        return buf.getvalue()
    u = rec.units
    entries = [{c: (float(v) if c.startswith(("item_mass", "item_x", "delta_", "empty_",
                                              "cg_")) and v is not None else v)
                for c, v in zip(cols, row)} for row in rows]
    doc = {"format": DISPLAY_FORMAT, "registration": rec.registration,
           "type": rec.type_name, "type_revision": rec.type_revision,
           "units": {"mass": u.mass, "length": u.length, "moment": u.moment_label},
           "head_hash": rec.head_hash, "entries": entries}
    return json.dumps(doc, indent=1, ensure_ascii=False, allow_nan=False) + "\n"
