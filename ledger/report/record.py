"""The weight-and-balance record on the terminal (``wbledger record``), readable at 80 columns.

Input is a :class:`ledger.services.record.MaintenanceRecord` (``rec`` below; its entries
``e``, its units ``units``: the report does not import the service layer); its tables
(:func:`record_tables`) are the same ones the printed record lays out
(:mod:`ledger.report.record_pdf`). Text from the ledger (item names, reasons, signatories) is
shown as text, never as markup.
"""

from __future__ import annotations

from ledger.caution import CAUTION_SHORT
from ledger.report.safe_text import plain, text_console
from ledger.report.sheet_tables import TableData
from ledger.units import display_decimals

__all__ = ["SIGNATURE_ROLES", "RecordFigures", "record_tables", "record_heading",
           "current_line", "render_record"]

#: Who signs the paper record: the person who made the entries and the one who checked them.
SIGNATURE_ROLES = ("Entries made by", "Checked by")

KIND_WORDS = {"weighing": "weighing", "install": "install", "remove": "remove",
              "correction": "correction", "cg_height": "CG height"}


class RecordFigures:
    """Numbers of one record as text, each column with one number of decimals: masses to the
    unit's usual decimals (more for a small vehicle), arms to 0.01 in or 0.1 mm, the moment
    index to 0.001 when it is reduced (÷100, ÷1000), else to 0.1 (common practice)."""

    def __init__(self, units, scale_kg: float | None):
        self.units = units
        self.mass_digits = display_decimals(units.mass, scale_kg)
        self.length_digits = display_decimals(units.length)
        self.moment_digits = 3 if units.moment_divisor > 1 else 1

    @staticmethod
    def _num(value: float | None, digits: int, signed: bool) -> str:
        if value is None:
            return "-"
        text = f"{value:+.{digits}f}" if signed else f"{value:.{digits}f}"
        return f"{0.0:.{digits}f}" if float(text) == 0.0 else text  # no "-0.0"

    def mass(self, value: float | None, signed: bool = False) -> str:
        return self._num(value, self.mass_digits, signed)

    def length(self, value: float | None, signed: bool = False) -> str:
        return self._num(value, self.length_digits, signed)

    def moment(self, value: float | None, signed: bool = False) -> str:
        return self._num(value, self.moment_digits, signed)


def _figures(rec) -> RecordFigures:
    scale = rec.current.empty_mass_kg if rec.current is not None else None
    return RecordFigures(rec.units, scale)


def _what(e) -> str:
    text = KIND_WORDS.get(e.kind, e.kind)
    if e.item:
        text += f" {e.item}"
    if e.reverses_seq:
        text += f" (reverses #{e.reverses_seq})"
    return text


def _who(e) -> list[str]:
    lines = [f"why: {e.reason}"] if e.reason else []
    if e.reference:
        lines.append(f"ref: {e.reference}")
    return lines + [f"by: {e.signatory}"]


def _weighing_table(rec, e, f: RecordFigures) -> TableData:
    u = rec.units
    rows = [[r.point, f.length(r.arm), f.mass(r.reading), f.mass(r.tare), f.mass(r.net)]
            for r in e.readings]
    rows.append(["empty (after corrections)", f.length(e.cg), "", "", f.mass(e.empty_mass)])
    notes = [f"Entry #{e.seq} of {e.entry_date}; " + "; ".join(_who(e))]
    notes += [f"{label}: {text}" for label, text in (("Scales", e.scales), ("Level", e.level),
                                                     ("Note", e.note)) if text]
    return TableData(f"Weighing of {e.entry_date} (entry #{e.seq})",
                     ["Point", f"Arm {u.length}", f"Reading {u.mass}", f"Tare {u.mass}",
                      f"Net {u.mass}"], rows, numeric={1, 2, 3, 4}, notes=notes,
                     bold_rows={len(rows) - 1})


def _running_table(rec, f: RecordFigures, *, who_columns: bool) -> TableData:
    """The running record; who did what and why in columns (paper), or as lines under the
    table (terminal: in columns they would squeeze the figures out of 80 columns)."""
    u = rec.units
    rows, notes = [], []
    for e in rec.entries:
        changed = e.added is not None
        row = [str(e.seq), e.entry_date, _what(e),
               f.mass(e.change_mass, True) if changed else "",
               f.length(e.item_arm) if changed else "",
               f.moment(e.change_moment, True) if changed else "",
               f.mass(e.empty_mass), f.moment(e.empty_moment), f.length(e.cg)]
        if who_columns:
            row += [e.reason or "", e.reference or "", e.signatory]
        else:
            notes.append(f"#{e.seq} " + "; ".join(_who(e)))
        rows.append(row)
    headers = ["#", "Date", "Entry", f"Δ {u.mass}", f"Arm {u.length}", "Δ mom",
               f"Empty {u.mass}", "Moment", f"CG {u.length}"]
    if who_columns:
        headers += ["Reason", "Reference", "Signed by"]
    notes.append(f"Moment index in {u.moment_label}; Δ: the change the entry made (+ added, "
                 "- removed). A weighing starts a new baseline.")
    return TableData("Running record of the empty vehicle", headers, rows,
                     numeric={0, 3, 4, 5, 6, 7, 8}, notes=notes)


def _equipment_table(rec, f: RecordFigures) -> TableData:
    u = rec.units
    rows = [[i.name, f.mass(i.mass), f.length(i.arm), f.length(i.lateral_arm, True),
             f.moment(i.moment), f"#{i.seq}", i.entry_date] for i in rec.equipment]
    notes = [] if rows else ["No item installed through the ledger."]
    return TableData("Equipment installed through the ledger",
                     ["Item", f"Mass {u.mass}", f"Arm {u.length}", f"Lateral {u.length}",
                      "Moment", "Entry", "Date"], rows, numeric={1, 2, 3, 4}, notes=notes)


def record_tables(rec, *, who_columns: bool = False) -> list[TableData]:
    """The record's tables in order: each weighing's readings, the running record (with
    reason, reference and signatory as columns when ``who_columns``, else as notes), the
    equipment list."""
    f = _figures(rec)
    return ([_weighing_table(rec, w, f) for w in rec.weighings]
            + [_running_table(rec, f, who_columns=who_columns), _equipment_table(rec, f)])


def record_heading(rec) -> list[tuple[str, str]]:
    """Label / value pairs at the top of the record."""
    u = rec.units
    pairs = [("Vehicle", rec.registration),
             ("Type", f"{rec.type_name} revision {rec.type_revision} ({rec.type_title})")]
    if rec.serial:
        pairs.append(("Serial", rec.serial))
    pairs += [("Units", f"mass {u.mass}, arm {u.length}, moment {u.moment_label}"),
              ("Ledger", f"{len(rec.entries)} entries, chain verified")]
    if rec.head_hash:
        pairs.append(("Ledger head", rec.head_hash))
    return pairs


def current_line(rec) -> str:
    """The current empty mass, CG and moment in one sentence."""
    cur = rec.current
    if cur is None:
        return (f"No weighing recorded. Record one with `wbledger weigh {rec.registration} "
                "--reading POINT=MASS …`.")
    f = _figures(rec)
    u = rec.units
    return (f"Empty mass now {f.mass(cur.empty_mass)} {u.mass}, CG {f.length(cur.cg)} "
            f"{u.length}, moment {f.moment(cur.empty_moment)} {u.moment_label} "
            f"(after entry #{cur.seq} of {cur.entry_date}).")


def _print_table(con, t: TableData) -> None:
    from rich import box
    from rich.table import Table
    from rich.text import Text

    con.print()
    con.print(Text(plain(t.title), style="bold"))
    table = Table(box=box.SIMPLE_HEAD, pad_edge=False, padding=(0, 1, 0, 0), show_edge=False)
    # The one column that may fold: the running record's entry, else the first (a name).
    fold = 2 if t.headers[:3] == ["#", "Date", "Entry"] else 0
    for i, h in enumerate(t.headers):
        wide = i == fold
        table.add_column(h, justify="right" if i in t.numeric else "left",
                         no_wrap=not wide, overflow="fold" if wide else "ellipsis",
                         min_width=12 if wide else None)
    for j, row in enumerate(t.rows):
        table.add_row(*(Text(plain(c)) for c in row), style="bold" if j in t.bold_rows else None)
    con.print(table)
    for note in t.notes:
        con.print(Text(plain(note)), overflow="fold")


def render_record(rec) -> None:
    """The record on the terminal: heading, tables, current state, signature lines, caution."""
    from rich.text import Text

    con = text_console()  # stored text (names, reasons, signatories) is shown as text
    con.print(Text(f"Weight and balance record: {plain(rec.registration)}", style="bold"))
    for label, value in record_heading(rec):
        con.print(Text(plain(f"{label}: {value}")), overflow="fold")
    for t in record_tables(rec):
        _print_table(con, t)
    con.print()
    con.print(Text(plain(current_line(rec))), overflow="fold")
    con.print()
    for role in SIGNATURE_ROLES:
        con.print(f"{role + ':':<17}{'_' * 34}  Date: {'_' * 12}")
    con.print(Text(CAUTION_SHORT), overflow="fold")
