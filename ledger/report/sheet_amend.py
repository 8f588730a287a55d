"""What an amended sheet changed from the sheet it amends, as tables to lay out (issue 13
item 4): the load, fuel and people changed, and each phase's mass and CG before and after.

Read from the document's ``amendment.differences`` (docs/sheet-document.md); a sheet saved
before that key existed shows its ``amendment.changes`` (measured from the first sheet of the
chain) instead, without the phases.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from ledger.report.sheet_format import number
from ledger.report.sheet_tables import TableData

if TYPE_CHECKING:
    from ledger.report.sheet_view import SheetView

__all__ = ["amendment_tables"]


def amendment_tables(view: SheetView) -> list[TableData]:
    """The changes table and the phases table of an amended sheet (none for another)."""
    am = view.doc.get("amendment") or {}
    if not am:
        return []
    diff = am.get("differences") or {}
    of = diff.get("from_sheet", am.get("of", "?"))
    first = am.get("first_sheet")
    changes = diff.get("changes") if diff else am.get("changes")
    out = [_changes_table(view, changes or [], of if diff else first)]
    if diff.get("phases"):
        out.append(_phases_table(view, diff["phases"], of))
    return out


def _persons(before, after) -> str:
    b, a = int(before or 0), int(after or 0)
    return "" if a == b else f"{b} \u2192 {a}"


def _changes_table(view: SheetView, changes: list, of) -> TableData:
    mu = view.mass_unit
    headers = ["Changed", "What", f"Before\n{mu}", f"After\n{mu}", f"Change\n{mu}", "Persons"]
    rows = []
    for c in changes:
        before, after = number(c.get("before_kg")), number(c.get("after_kg"))
        delta = None if before is None or after is None else after - before
        rows.append([str(c.get("kind") or "?"), str(c.get("subject") or ""),
                     view.mass(before), view.mass(after), view.mass(delta, signed=True),
                     _persons(c.get("persons_before"), c.get("persons_after"))])
    notes = [] if rows else ["No load, fuel or person changed."]
    return TableData(f"Changes from sheet #{of}", headers, rows, {2, 3, 4}, notes)


def _phases_table(view: SheetView, phases: list, of) -> TableData:
    mu, lu = view.mass_unit, view.length_unit
    headers = ["Phase", f"Mass\nbefore\n{mu}", f"Mass\nafter\n{mu}", f"Change\n\n{mu}",
               f"CG\nbefore\n{lu}", f"CG\nafter\n{lu}", f"Change\n\n{lu}"]
    rows = []
    for p in phases:
        mb, ma = number(p.get("mass_before_kg")), number(p.get("mass_after_kg"))
        cb = number((p.get("cg_before_m") or {}).get("x"))
        ca = number((p.get("cg_after_m") or {}).get("x"))
        rows.append([view.phase_label(p), view.mass(mb), view.mass(ma),
                     view.mass(None if mb is None or ma is None else ma - mb, signed=True),
                     view.length(cb), view.length(ca),
                     view.length(None if cb is None or ca is None else ca - cb, signed=True)])
    return TableData(f"Phases against sheet #{of}", headers, rows, set(range(1, 7)),
                     ["Change: this sheet minus the sheet it amends (+ aft for the CG)"])
