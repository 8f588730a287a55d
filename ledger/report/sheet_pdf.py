"""The loading sheet to print and sign: PDF (A4 or Letter pages) and SVG.

Same content as the terminal sheet (both come from :class:`ledger.report.sheet_view.SheetView`),
laid out for paper: a title with the verdict, the caution in a box at the top of the first page
and in the footer of every page, the heading, the tables, one envelope chart per envelope drawn
with matplotlib (outline, phase CG points, the burn path and where it leaves the envelope), the
violations and fixes, the verdict, and signature lines (prepared by, checked by, commander or
driver, each with a date).

matplotlib is imported inside the functions only, so importing this module (and so the CLI)
stays fast. Output is deterministic: the PDF has no creation date, the SVG no date and a fixed
id salt, so the same document gives the same bytes.

The PDF flows over as many portrait pages as it needs. The SVG is one page of the same width
and as tall as the content (an SVG file has no pages).
"""

from __future__ import annotations

from pathlib import Path
from typing import BinaryIO

from ledger.caution import CAUTION_SHORT
from ledger.files import replacing
from ledger.report.pdf_layout import (
    BAD,
    CAUTION_EDGE,
    CAUTION_FILL,
    FOOTER,
    GREY,
    INK,
    MARGIN,
    OK,
    RULE,
    SANS,
    Layout,
    Measure,
    draw_page,
    figure_line,
    signature_block,
)
from ledger.report.sheet_charts import ChartData, mass_lines_legend
from ledger.report.sheet_format import DASH
from ledger.report.sheet_tables import TableData
from ledger.report.sheet_view import SheetView

__all__ = ["PAPER_SIZES", "write_pdf", "write_svg"]

DRAFT_MARK = "DRAFT"
PAPER_SIZES = {"A4": (8.27, 11.69), "Letter": (8.5, 11.0)}
"""Portrait page sizes in inches."""


def _layout(view: SheetView, page_w: float, page_h: float | None) -> Layout:
    """The whole sheet laid out, top to bottom."""
    lay = Layout(page_w, page_h)
    _title(lay, view)
    _heading(lay, view)
    for t in (*view.amendment_tables(), view.items_table(),
              view.stations_table(), view.fuel_table(),
              view.phases_table(), view.margins_table()):
        _table(lay, t)
    _charts(lay, view)
    _table(lay, view.axles_table())
    if view.ground_caution:
        lay.paragraph(view.ground_caution, 7.5, style="italic")
    _limits_and_fixes(lay, view)
    lay.y += 0.1
    colour = OK if view.ok else BAD
    verdict = [(view.verdict_text, 13.0, "bold", colour),
               (view.verdict_detail, 8.5, "normal", INK)]
    # The verdict and the signatures (or the draft notice) share a page: a signature is
    # never alone on the last page, away from what it signs (issue 13 item 6).
    lay.need(lay.box_height(verdict) + _signatures_height(lay, view))
    lay.box(verdict, colour, None, lw=2.0)
    _signatures(lay, view)
    return lay


def _title(lay: Layout, view: SheetView) -> None:
    """Title line with the verdict on the right, then the caution in its box."""
    lay.text(lay.left, lay.y + 0.22, "Loading sheet", 17, "bold")
    reg = (view.doc.get("vehicle") or {}).get("registration") or "?"
    reg_x = lay.left + lay.m.width("Loading sheet", 17, "bold") + 0.15
    lay.text(reg_x, lay.y + 0.22, reg, 17, "normal", GREY)
    if view.is_draft:
        lay.text(reg_x + lay.m.width(reg, 17) + 0.2, lay.y + 0.22, DRAFT_MARK, 17, "bold",
                 BAD)
    colour = OK if view.ok else BAD
    vw = lay.m.width(view.verdict_text, 12, "bold") + 0.3
    lay.op("rect", x=lay.right - vw, y=lay.y, w=vw, h=0.32, edge=colour, fill=None, lw=2.0)
    lay.text(lay.right - vw / 2, lay.y + 0.22, view.verdict_text, 12, "bold", colour,
             ha="center")
    lay.y += 0.45
    lay.box([(view.caution, 9.0, "bold", INK)], CAUTION_EDGE, CAUTION_FILL, lw=1.6)


def _heading(lay: Layout, view: SheetView) -> None:
    """Heading: label / value pairs."""
    label_w = max(lay.m.width(k, 8.0, "bold") for k, _ in view.heading()) + 0.15
    for k, v in view.heading():
        if k == "Verdict":
            continue
        lines = lay.m.wrap(v, 8.0, lay.cw - label_w)
        lay.need(lay.lh(8.0) * len(lines))
        lay.text(lay.left, lay.y + 8 / 72, k, 8.0, "bold")
        for line in lines:
            lay.text(lay.left + label_w, lay.y + 8 / 72, line, 8.0)
            lay.y += lay.lh(8.0)


def _table(lay: Layout, t: TableData | None) -> None:
    """A titled table, on one page when it fits on one (issue 13 item 6); a longer one
    splits between rows, its header repeated."""
    if t is None:
        return
    whole = lay.table_height(t) + 0.1
    keep = whole if whole + 0.4 <= lay.page_room else lay.lh(8) * min(len(t.rows) + 2, 5)
    lay.section(t.title, keep=keep)
    lay.table(t)


def _chart_notes(c: ChartData, view: SheetView) -> list[str]:
    """The legend printed under a chart: its points, the mass limits, where the path leaves."""
    limits = mass_lines_legend(c, view)
    return (list(c.legend) + ([f"dashed lines, mass limits: {limits}"] if limits else [])
            + ([f"\u00d7 {c.exit_note}"] if c.exit_note else []))


def _charts(lay: Layout, view: SheetView) -> None:
    """The envelope charts, two a row when there are several, each with its legend."""
    charts = view.charts()
    if not charts:
        return
    ch_h = 3.3
    lay.section("Envelope" + ("s" if len(charts) > 1 else ""), keep=ch_h)
    per_row = 2 if len(charts) > 1 else 1
    gap = 0.3
    cw = (lay.cw - gap * (per_row - 1)) / per_row
    for start in range(0, len(charts), per_row):
        row = charts[start:start + per_row]
        legend_h = max(lay.lh(7.0) * len(_chart_notes(c, view)) for c in row)
        lay.need(ch_h + 0.05 + legend_h)  # a chart and its legend on one page
        for k, c in enumerate(row):
            lay.op("chart", x=lay.left + k * (cw + gap), y=lay.y, w=cw, h=ch_h, chart=c)
        lay.y += ch_h + 0.05
        ends = []
        for k, c in enumerate(row):
            notes = _chart_notes(c, view)
            y0 = lay.y
            for line in notes:
                for part in lay.m.wrap(line, 7.0, cw):
                    lay.text(lay.left + k * (cw + gap), y0 + 7 / 72, part, 7.0)
                    y0 += lay.lh(7.0)
            ends.append(y0)
        lay.y = max(ends) + 0.08


def _limits_and_fixes(lay: Layout, view: SheetView) -> None:
    viol = view.violations()
    if viol:
        lay.section(f"Limits exceeded ({len(viol)})")
        for i, (msg, figures) in enumerate(viol, 1):
            lay.need(lay.lh(8.5))
            lay.text(lay.left, lay.y + 8.5 / 72, f"{i}.", 8.5, "bold", BAD)
            lay.paragraph(msg, 8.5, indent=0.25)
            if figures:
                lay.paragraph(figures, 7.5, color=GREY, indent=0.25)
    fixes = view.fixes()
    note = view.fixes_note if not view.ok else None
    if fixes or note:
        lay.section("Ways to bring the load within limits")
    if note:
        lay.paragraph(note, 8.5)
    if fixes:
        for i, f in enumerate(fixes, 1):
            lay.need(lay.lh(8.5))
            lay.text(lay.left, lay.y + 8.5 / 72, f"{chr(ord('A') + i - 1)})", 8.5, "bold")
            lay.paragraph(f, 8.5, indent=0.25)
        lay.paragraph("Each option is re-checked on its own; apply one, then prepare a new "
                      "sheet.", 7.0, color=GREY, style="italic")


def _draft_lines(view: SheetView) -> list[tuple[str, float, str, str]]:
    return [(f"{DRAFT_MARK}: not saved, no sheet number", 12.0, "bold", BAD),
            (view.draft_notice, 8.5, "normal", INK)]


def _signatures_height(lay: Layout, view: SheetView) -> float:
    """The height of the signature block (or of the draft notice that replaces it)."""
    if view.is_draft:
        return lay.box_height(_draft_lines(view))
    return 0.72 + 0.55 * len(view.signature_roles)


def _signatures(lay: Layout, view: SheetView) -> None:
    """Signature lines, kept together; a draft gets a DRAFT notice instead, since a sheet
    without a number cannot be traced from its signed paper copy."""
    if view.is_draft:
        lay.box(_draft_lines(view), BAD, None, lw=1.6)
        return
    signature_block(lay, view.signature_roles,
                    "Sign only after checking this sheet against the approved data.")


def _footer_lines(view: SheetView) -> str:
    doc = view.doc
    reg = (doc.get("vehicle") or {}).get("registration") or "?"
    prepared = dict(view.heading()).get("Prepared", DASH)
    return f"wbledger loading sheet {reg} \u00b7 prepared {prepared}"


def _render(doc: dict, path, fmt: str, paper: str) -> Path:
    if paper not in PAPER_SIZES:
        from ledger.errors import InputError

        raise InputError("paper", paper, "one of " + ", ".join(PAPER_SIZES))
    view = SheetView(doc)
    page_w, page_h = PAPER_SIZES[paper]
    path = Path(path)
    rc = {"svg.fonttype": "none", "svg.hashsalt": "wbledger-sheet", "pdf.fonttype": 42,
          "text.parse_math": False, "font.family": SANS, "axes.unicode_minus": True}
    # A new 0600 file renamed over the target when complete: a kill mid-way leaves no half PDF.
    with replacing(path, f"--{fmt}") as out:
        _write(doc, view, out, fmt, page_w, page_h, rc)
    return path


def _write(doc: dict, view: SheetView, out: BinaryIO, fmt: str, page_w: float,
           page_h: float, rc: dict) -> None:
    import matplotlib
    from matplotlib.backends.backend_pdf import PdfPages
    from matplotlib.figure import Figure

    with matplotlib.rc_context(rc):
        if fmt == "pdf":
            lay = _layout(view, page_w, page_h)
            pages = lay.page + 1
            meta = {"Title": f"Loading sheet {(doc.get('vehicle') or {}).get('registration')}",
                    "Creator": "wbledger", "Producer": "wbledger (matplotlib)",
                    "CreationDate": None, "ModDate": None}
            with PdfPages(out, metadata=meta) as pdf:
                for n in range(pages):
                    fig = Figure(figsize=(page_w, page_h))
                    draw_page(fig, [o for o in lay.ops if o.page == n], page_w, page_h)
                    _footer(fig, view, page_w, page_h, f"page {n + 1} of {pages}")
                    pdf.savefig(fig)
        else:
            lay = _layout(view, page_w, None)
            height = lay.y + MARGIN + FOOTER
            fig = Figure(figsize=(page_w, height))
            draw_page(fig, lay.ops, page_w, height)
            _footer(fig, view, page_w, height, "")
            fig.savefig(out, format="svg", metadata={"Date": None, "Creator": "wbledger"})


def _footer(fig, view: SheetView, page_w: float, page_h: float, page_text: str) -> None:
    y = page_h - MARGIN - 0.49
    fig.add_artist(figure_line(fig, [MARGIN / page_w, 1 - MARGIN / page_w],
                         [1 - y / page_h, 1 - y / page_h], 0.5, RULE))
    fig.text(MARGIN / page_w, 1 - (y + 0.14) / page_h, _footer_lines(view), fontsize=6.5,
             color=GREY, family=SANS, parse_math=False)
    if page_text:
        fig.text(1 - MARGIN / page_w, 1 - (y + 0.14) / page_h, page_text, fontsize=6.5,
                 color=GREY, ha="right", family=SANS, parse_math=False)
    # The hashes that anchor the paper copy to the ledger (`wbledger verify --expect HASH`).
    anchors = [f"{label.lower()} {value}" for label, value in view.anchors()]
    for k in range(0, len(anchors), 2):
        fig.text(MARGIN / page_w, 1 - (y + 0.25 + k * 0.05) / page_h,
                 "   ".join(anchors[k:k + 2]), fontsize=5.2, color=GREY, family="monospace",
                 parse_math=False)
    width = page_w - 2 * MARGIN
    for k, line in enumerate(Measure().wrap(CAUTION_SHORT, 6.5, width, "bold")):
        fig.text(MARGIN / page_w, 1 - (y + 0.48 + k * 0.11) / page_h, line, fontsize=6.5,
                 color=CAUTION_EDGE, fontweight="bold", family=SANS, parse_math=False)


def write_pdf(doc: dict, path, *, paper: str = "A4") -> Path:
    """Write the loading sheet of a ``wbledger.sheet/1`` document as a PDF to print and sign.

    Parameters
    ----------
    doc : dict
        The sheet document (docs/sheet-document.md).
    path : str or os.PathLike
        The file to write.
    paper : {"A4", "Letter"}
        Portrait page size.

    Returns
    -------
    pathlib.Path
        ``path``. The PDF has no creation date, so the same document gives the same bytes. It is
        written as :mod:`ledger.files` writes every output: mode 0600, replaced in one step, and
        a symbolic link or a file that is not a regular one is refused.
    """
    return _render(doc, path, "pdf", paper)


def write_svg(doc: dict, path, *, paper: str = "A4") -> Path:
    """Write the loading sheet as one SVG page of the paper's width (text kept as text).

    Parameters
    ----------
    doc : dict
        The sheet document (docs/sheet-document.md).
    path : str or os.PathLike
        The file to write.
    paper : {"A4", "Letter"}
        Sets the page width; the height is what the content needs.

    Returns
    -------
    pathlib.Path
        ``path``.
    """
    return _render(doc, path, "svg", paper)
