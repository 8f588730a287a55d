"""The loading sheet in the terminal, rendered with rich from a ``wbledger.sheet/1`` document.

The document (docs/sheet-document.md) carries SI values and the display units to show them
in. :class:`~ledger.report.sheet_view.SheetView` turns it into display-ready text once
(headings, table rows, chart data, verdict, caution) so that the terminal sheet here and the
printed sheet in :mod:`ledger.report.sheet_pdf` show the same content; this module only lays
it out.

The layout is our own. From top to bottom:

1. a heading panel (vehicle, type and revision, empty-weight entry used, configuration,
   preparer and time, standard-mass set or "actual", display units) with a one-line verdict;
2. "Load by station": the empty weight, the configuration's items (a removed one with a
   negative mass), every item with mass, arm and moment, and the zero-fuel total they add up
   to;
3. "Fuel": per tank, and the burn sequence;
4. "Phases": mass against its limit, CG, %MAC, moment index; then "Envelope margins":
   per phase and envelope, the distance to the forward and aft (or left and right) limits;
5. one character chart per envelope: outline, phase CG points by letter, the burn path;
6. "Axles" for ground vehicles;
7. "Limits exceeded", "Ways to bring the load within limits", the verdict and the caution.

At ``width=80`` no line is wider than 80 columns.
"""

from __future__ import annotations

import io

from rich import box
from rich.cells import cell_len
from rich.console import Console, Group
from rich.panel import Panel
from rich.rule import Rule
from rich.table import Table
from rich.text import Text

from ledger.errors import InputError
from ledger.report.safe_text import clean
from ledger.report.sheet_charts import ChartData, mass_lines_legend
from ledger.report.sheet_format import DASH
from ledger.report.sheet_tables import TableData
from ledger.report.sheet_view import SheetView
from ledger.report.textchart import LEVEL, PATH, envelope_chart

__all__ = ["DASH", "MIN_WIDTH", "ChartData", "SheetView", "TableData", "check_lines",
           "render_sheet", "sheet_text"]

EXIT_MARK = "!"


# --- rich rendering -------------------------------------------------------------------------

MIN_WIDTH = 60
"""The narrowest sheet: every table's first column and its widest figure fit side by side."""
_GAP = 3  # columns between two table columns: padding, divider, padding


def _min_width(t: TableData, i: int) -> int:
    """The narrowest column ``i`` can be: a figure is never split across lines (issue 13
    item 3), and neither is a word of a label or header."""
    cells = [line for line in t.headers[i].split("\n")]
    cells += [r[i] if i in t.numeric or i == 0 else max(r[i].split() or [""], key=cell_len)
              for r in t.rows]
    return max([cell_len(c) for c in cells] + [1])


def _parts(t: TableData, width: int) -> list[TableData]:
    """``t`` as it fits in ``width`` columns: whole, or its columns in parts side by side no
    longer but one after the other, each part starting with the first (label) column."""
    mins = [_min_width(t, i) for i in range(len(t.headers))]
    groups: list[list[int]] = [[0]]
    used = mins[0]
    for i in range(1, len(t.headers)):
        if used + _GAP + mins[i] > width and len(groups[-1]) > 1:
            groups.append([0])
            used = mins[0]
        groups[-1].append(i)
        used += _GAP + mins[i]
    if len(groups) == 1:
        return [t]
    out = []
    for k, cols in enumerate(groups):
        last = k == len(groups) - 1
        out.append(TableData(
            t.title if k == 0 else f"{t.title} (continued)", [t.headers[i] for i in cols],
            [[r[i] for i in cols] for r in t.rows],
            {j for j, i in enumerate(cols) if i in t.numeric},
            t.notes if last else [], t.bold_rows))
    return out


def _rich_table(t: TableData) -> Table:
    table = Table(box=box.SIMPLE_HEAD, show_edge=False, pad_edge=False, padding=(0, 1),
                  header_style="bold", expand=False)
    for i, h in enumerate(t.headers):
        # A figure is never folded (issue 13 item 3): _parts made the room for it.
        table.add_column(Text(h), justify="right" if i in t.numeric else "left",
                         overflow="fold", no_wrap=(i == 0 or i in t.numeric))
    for i, r in enumerate(t.rows):
        # Text, not str: a label typed by a user ("[/]") must not be read as rich markup.
        table.add_row(*(Text(c) for c in r), style="bold" if i in t.bold_rows else None,
                      end_section=(i + 1 in t.bold_rows))
    return table


def _section(console: Console, title: str, width: int) -> None:
    console.print()
    console.print(Rule(Text(f" {title.upper()} ", style="bold"), align="left",
                       characters="\u2500"), width=width)


def render_sheet(doc: dict, console: Console | None = None, width: int = 80) -> None:
    """Print the loading sheet of a ``wbledger.sheet/1`` document.

    Parameters
    ----------
    doc : dict
        The sheet document (docs/sheet-document.md).
    console : rich.console.Console, optional
        Where to print; a new console ``width`` columns wide if not given.
    width : int
        Layout width in columns; the sheet never prints wider than this (or than the
        console, whichever is narrower). At least :data:`MIN_WIDTH` (60): a narrower width
        is refused. A table too wide for it goes on in a second part below (its first
        column repeated); a figure is never split across lines.

    Raises
    ------
    InputError
        ``width`` is under :data:`MIN_WIDTH`.
    """
    if width < MIN_WIDTH:
        raise InputError("--width", width, f"at least {MIN_WIDTH} columns")
    doc = clean(doc)  # stored text shown as text (issue 13 item 10)
    if console is None:
        console = Console(width=width, highlight=False)
    view = SheetView(doc)
    page = _Page(console, max(MIN_WIDTH, min(width, console.width)), view)
    page.out(_heading_panel(view, page.width))
    for table in (*view.amendment_tables(),
                  view.items_table(), view.stations_table(), view.fuel_table(),
                  view.phases_table(), view.margins_table()):
        page.table(table)
    for chart in view.charts():
        _chart_block(page, chart)
    page.table(view.axles_table())
    if view.ground_caution:
        page.out(Text(view.ground_caution, style="italic"), overflow="fold")
    _limits_and_fixes(page, view)
    _closing(page, view)


class _Page:
    """The console and the layout width every block of the sheet prints within."""

    def __init__(self, console: Console, width: int, view: SheetView):
        self.console = console
        self.width = width
        self.view = view

    def out(self, *a, **kw) -> None:
        kw.setdefault("width", self.width)
        self.console.print(*a, **kw)

    def section(self, title: str) -> None:
        _section(self.console, title, self.width)

    def table(self, t: TableData | None) -> None:
        """A titled table and its notes (nothing for a table the sheet does not have)."""
        if t is None:
            return
        for part in _parts(t, self.width):
            self.section(part.title)
            self.out(_rich_table(part))
            for n in part.notes:
                self.out(Text(n, style="dim"), overflow="fold")


def _heading_panel(view: SheetView, width: int) -> Panel:
    head = Table.grid(padding=(0, 2))
    head.add_column(style="bold", no_wrap=True)
    head.add_column(overflow="fold")
    for k, v in view.heading():
        style = None
        if k == "Verdict":
            style = "bold green" if view.ok else "bold red"
        head.add_row(k, Text(v, style=style or ""))
    return Panel(head, title=Text(view.title, style="bold"), title_align="left",
                 box=box.HEAVY, width=width)


def _chart_block(page: _Page, chart: ChartData) -> None:
    """An envelope chart with its legend."""
    page.section(chart.title)
    pts = chart.points + [(x, y, EXIT_MARK) for x, y in chart.exits]
    for line in envelope_chart([chart.polygon], pts, chart.path, width=page.width,
                               height=16, x_label=chart.x_label, y_label=chart.y_label,
                               levels=[m for m, _ in chart.mass_lines]):
        page.out(Text(line), no_wrap=True, overflow="crop", soft_wrap=False)
    legend = list(chart.legend)
    limits = mass_lines_legend(chart, page.view)
    if limits:
        legend.append(f"{LEVEL} mass limits: {limits}")
    if chart.path:
        legend.append(f"{PATH} burn path: the CG as fuel burns")
    if chart.exit_note:
        legend.append(f"{EXIT_MARK} {chart.exit_note}")
    legend.append("+-|/\\ envelope outline (limits inclusive: on the line is inside)")
    for line in legend:  # a long line goes on under its own text, not at column 0
        page.out(_hanging(" ", line, page.width))


def _limits_and_fixes(page: _Page, view: SheetView) -> None:
    """The limits exceeded, numbered, and the ways to bring the load within limits."""
    w = page.width
    viol = view.violations()
    if viol:
        page.section(f"Limits exceeded ({len(viol)})")
        for i, (msg, figures) in enumerate(viol, 1):
            page.out(_hanging(f"{i}.", msg + (f"\n{figures}" if figures else ""), w))
    fixes = view.fixes()
    note = view.fixes_note if not view.ok else None
    if fixes or note:
        page.section("Ways to bring the load within limits")
    if note:
        page.out(Text(note), overflow="fold")
    if fixes:
        for i, f in enumerate(fixes, 1):
            page.out(_hanging(f"{chr(ord('A') + i - 1) if i <= 26 else i})", f, w))
        page.out(Text("Each option is re-checked on its own; apply one, then prepare a new "
                      "sheet.", style="dim"), overflow="fold")


def _closing(page: _Page, view: SheetView) -> None:
    """The verdict, the caution and the hashes a paper copy keeps."""
    page.console.print()
    parts = [Text(view.verdict_text, style="bold"), Text(view.verdict_detail)]
    if view.is_draft:  # issue 13 item 6: a draft says so where the sheet closes
        parts.append(Text(f"DRAFT: {view.draft_notice}", style="bold"))
    verdict = Group(*parts)
    page.out(Panel(verdict, title="Verdict", title_align="left", box=box.DOUBLE,
                   border_style="green" if view.ok else "red", width=page.width))
    page.out(Panel(Text(view.caution, style="bold"), box=box.HEAVY, border_style="yellow",
                   width=page.width))
    for label, value in view.anchors():
        page.out(Text(f"{label:<11} {value}"), overflow="fold")


def _hanging(mark: str, text: str, width: int) -> Table:
    t = Table.grid(padding=(0, 1))
    t.add_column(no_wrap=True, width=len(mark))
    t.add_column(overflow="fold", max_width=width - len(mark) - 1)
    t.add_row(Text(mark), Text(text))
    return t


def sheet_text(doc: dict, width: int = 80) -> str:
    """The loading sheet as plain text (no colour), ``width`` columns wide.

    Examples
    --------
    Used by tests and by anything that wants the sheet as a string::

        text = sheet_text(doc)
        assert "CAUTION" in text
    """
    buf = io.StringIO()
    console = Console(file=buf, width=width, color_system=None, force_terminal=False,
                      highlight=False, legacy_windows=False, emoji=False)
    render_sheet(doc, console=console, width=width)
    return "".join(line.rstrip() + "\n" for line in buf.getvalue().splitlines())


def check_lines(doc: dict, width: int = 80) -> list[str]:
    """The short text of ``wbledger check``: verdict, violations, fixes, caution (``width`` wide).

    Examples
    --------
    >>> doc = {"vehicle": {"registration": "X-1"}, "verdict": "in_limits", "violations": [],
    ...        "fixes": [], "caution": "CAUTION: not approved data."}
    >>> check_lines(doc)
    ['X-1: IN LIMITS', 'CAUTION: not approved data.']
    """
    import textwrap

    doc = clean(doc)  # stored text shown as text (issue 13 item 10)
    ok = doc["verdict"] == "in_limits"
    lines = [f"{doc['vehicle']['registration']}: {'IN LIMITS' if ok else 'OUT OF LIMITS'}"]

    def wrapped(text: str, first: str, rest: str) -> list[str]:
        return textwrap.wrap(text, width, initial_indent=first, subsequent_indent=rest,
                             break_on_hyphens=False)

    for v in doc["violations"]:
        lines += wrapped(v["message"], "  - ", "    ")
    if doc["fixes"]:
        if doc.get("fixes_note"):
            lines += wrapped(doc["fixes_note"], "  ", "  ")
        for f in doc["fixes"]:
            lines += wrapped(f["description"], "  fix: ", "       ")
    elif not ok and doc.get("fixes_note"):
        lines += wrapped(doc["fixes_note"], "  ", "  ")
    lines += wrapped(doc["caution"], "", "")
    return lines
