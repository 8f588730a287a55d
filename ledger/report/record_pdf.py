"""The weight-and-balance record to print, sign and file: a PDF of A4 or Letter pages.

The same tables as the terminal (:func:`ledger.report.record.record_tables`, with the reason,
reference and signatory as columns of the running record), laid out with the loading sheet's
page layout (:class:`ledger.report.pdf_layout.Layout`): a title, the caution in a box on the
first page and in the footer of every page with the ledger head, the heading, the tables, the
current empty state, and signature lines. No creation date: the same record gives the same
bytes. matplotlib is imported inside the functions only.
"""

from __future__ import annotations

from pathlib import Path

from ledger.caution import CAUTION_SHORT
from ledger.files import replacing
from ledger.report.pdf_layout import (
    CAUTION_EDGE,
    CAUTION_FILL,
    GREY,
    INK,
    MARGIN,
    RULE,
    SANS,
    Layout,
    Measure,
    draw_page,
    figure_line,
    signature_block,
)
from ledger.report.record import SIGNATURE_ROLES, current_line, record_heading, record_tables
from ledger.report.sheet_pdf import PAPER_SIZES  # the loading sheet's pages, one home

__all__ = ["check_paper", "write_record_pdf"]

TITLE = "Weight and balance record"


def _layout(rec, page_w: float, page_h: float) -> Layout:
    lay = Layout(page_w, page_h)
    lay.text(lay.left, lay.y + 0.22, TITLE, 17, "bold")
    lay.text(lay.left + lay.m.width(TITLE, 17, "bold") + 0.15, lay.y + 0.22, rec.registration,
             17, "normal", GREY)
    lay.y += 0.45
    lay.box([(rec.caution, 9.0, "bold", INK)], CAUTION_EDGE, CAUTION_FILL, lw=1.6)
    pairs = record_heading(rec)
    label_w = max(lay.m.width(k, 8.0, "bold") for k, _ in pairs) + 0.15
    for label, value in pairs:
        lay.need(lay.lh(8.0))
        lay.text(lay.left, lay.y + 8 / 72, label, 8.0, "bold")
        lay.text(lay.left + label_w, lay.y + 8 / 72, value, 8.0)
        lay.y += lay.lh(8.0)
    for t in record_tables(rec, who_columns=True):
        lay.section(t.title, keep=lay.lh(8) * min(len(t.rows) + 2, 5))
        lay.table(t)
    lay.y += 0.1
    lay.paragraph(current_line(rec), 9.0, "bold")
    signature_block(lay, SIGNATURE_ROLES, "Sign only after checking each entry against its "
                    "work order and the approved data.")
    return lay


def _footer(fig, rec, page_w: float, page_h: float, page_text: str) -> None:
    y = page_h - MARGIN - 0.49

    def at(x: float, dy: float, text: str, **style) -> None:
        fig.text(x, 1 - (y + dy) / page_h, text, family=SANS, parse_math=False, **style)

    fig.add_artist(figure_line(fig, [MARGIN / page_w, 1 - MARGIN / page_w],
                               [1 - y / page_h, 1 - y / page_h], 0.5, RULE))
    at(MARGIN / page_w, 0.14, f"wbledger {TITLE.lower()} {rec.registration}", fontsize=6.5,
       color=GREY)
    at(1 - MARGIN / page_w, 0.14, page_text, fontsize=6.5, color=GREY, ha="right")
    if rec.head_hash:  # anchors the paper to the ledger: `wbledger verify REG --expect HASH`
        fig.text(MARGIN / page_w, 1 - (y + 0.26) / page_h, f"ledger head {rec.head_hash}",
                 fontsize=5.2, color=GREY, family="monospace", parse_math=False)
    width = page_w - 2 * MARGIN
    for k, line in enumerate(Measure().wrap(CAUTION_SHORT, 6.5, width, "bold")):
        at(MARGIN / page_w, 0.42 + k * 0.11, line, fontsize=6.5, color=CAUTION_EDGE,
           fontweight="bold")


def check_paper(paper: str) -> tuple[float, float]:
    """The page size of ``paper`` in inches (InputError naming ``--paper`` if unknown)."""
    if paper not in PAPER_SIZES:
        from ledger.errors import InputError

        raise InputError("--paper", paper, "one of " + ", ".join(PAPER_SIZES))
    return PAPER_SIZES[paper]


def write_record_pdf(rec, path, *, paper: str = "A4") -> Path:
    """Write the record (a :class:`ledger.services.record.MaintenanceRecord`) as a PDF.

    Parameters
    ----------
    rec : MaintenanceRecord
        The record.
    path : str or os.PathLike
        The file to write (mode 0600, replaced in one step, as every output of
        :mod:`ledger.files`).
    paper : {"A4", "Letter"}
        Portrait page size.

    Returns
    -------
    pathlib.Path
        ``path``.
    """
    import matplotlib
    from matplotlib.backends.backend_pdf import PdfPages
    from matplotlib.figure import Figure

    page_w, page_h = check_paper(paper)
    path = Path(path)
    rc = {"pdf.fonttype": 42, "text.parse_math": False, "font.family": SANS,
          "axes.unicode_minus": True}
    meta = {"Title": f"{TITLE} {rec.registration}", "Creator": "wbledger",
            "Producer": "wbledger (matplotlib)", "CreationDate": None, "ModDate": None}
    with matplotlib.rc_context(rc):
        lay = _layout(rec, page_w, page_h)
        pages = lay.page + 1
        with replacing(path, "--pdf") as out, PdfPages(out, metadata=meta) as pdf:
            for n in range(pages):
                fig = Figure(figsize=(page_w, page_h))
                draw_page(fig, [o for o in lay.ops if o.page == n], page_w, page_h)
                _footer(fig, rec, page_w, page_h, f"page {n + 1} of {pages}")
                pdf.savefig(fig)
    return path
