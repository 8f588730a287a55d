"""The loading sheet to print and sign: PDF (A4 or Letter pages) and SVG.

Same content as the terminal sheet (both come from :class:`ledger.report.sheet_text.SheetView`),
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

from dataclasses import dataclass, field
from pathlib import Path
from typing import BinaryIO

from ledger.caution import CAUTION_SHORT
from ledger.files import replacing
from ledger.report.sheet_text import DASH, ChartData, SheetView, TableData

__all__ = ["PAPER_SIZES", "write_pdf", "write_svg"]

PAPER_SIZES = {"A4": (8.27, 11.69), "Letter": (8.5, 11.0)}
"""Portrait page sizes in inches."""

_MARGIN = 0.6  # in
_FOOTER = 0.76  # in kept free at the bottom of each page
_SANS = "DejaVu Sans"
_INK = "#1a1a1a"
_GREY = "#555555"
_RULE = "#999999"
_OK = "#1b6e2e"
_BAD = "#b00020"
_CAUTION_EDGE = "#8a5a00"
_CAUTION_FILL = "#fff4d6"


@dataclass
class _Op:
    kind: str
    page: int
    args: dict = field(default_factory=dict)


class _Measure:
    """Text widths in inches, measured with matplotlib's Agg renderer."""

    def __init__(self):
        from matplotlib.backends.backend_agg import FigureCanvasAgg
        from matplotlib.figure import Figure
        from matplotlib.font_manager import FontProperties

        self._fp = FontProperties
        fig = Figure(figsize=(1, 1), dpi=72)
        self._renderer = FigureCanvasAgg(fig).get_renderer()
        self._cache: dict[tuple, float] = {}

    def width(self, text: str, size: float, weight: str = "normal") -> float:
        key = (text, size, weight)
        if key not in self._cache:
            fp = self._fp(family=_SANS, size=size, weight=weight)
            w, _, _ = self._renderer.get_text_width_height_descent(text, fp, ismath=False)
            self._cache[key] = w / 72.0
        return self._cache[key]

    def wrap(self, text: str, size: float, width: float, weight: str = "normal") -> list[str]:
        """Greedy word wrap of ``text`` to ``width`` inches."""
        out: list[str] = []
        for para in text.split("\n"):
            words = para.split()
            line = ""
            for w in words:
                trial = f"{line} {w}" if line else w
                if line and self.width(trial, size, weight) > width:
                    out.append(line)
                    line = w
                else:
                    line = trial
            out.append(line)
        return out


class _Layout:
    """Flows blocks down pages; records drawing operations in inches from the page top."""

    def __init__(self, page_w: float, page_h: float | None):
        self.w, self.h = page_w, page_h  # page_h None: one endless page (SVG)
        self.left, self.right = _MARGIN, page_w - _MARGIN
        self.cw = self.right - self.left
        self.page = 0
        self.y = _MARGIN
        self.ops: list[_Op] = []
        self.m = _Measure()

    @property
    def bottom(self) -> float:
        return float("inf") if self.h is None else self.h - _MARGIN - _FOOTER

    def need(self, height: float) -> None:
        """Start a new page unless ``height`` inches fit below the cursor."""
        if self.y + height > self.bottom and self.y > _MARGIN + 0.01:
            self.page += 1
            self.y = _MARGIN

    def op(self, kind: str, **args) -> None:
        self.ops.append(_Op(kind, self.page, args))

    def text(self, x, y, s, size=8.0, weight="normal", color=_INK, ha="left",
             style="normal") -> None:
        self.op("text", x=x, y=y, s=s, size=size, weight=weight, color=color, ha=ha,
                style=style)

    def rule(self, y, x0=None, x1=None, lw=0.5, color=_RULE) -> None:
        self.op("line", x0=self.left if x0 is None else x0, x1=self.right if x1 is None else x1,
                y0=y, y1=y, lw=lw, color=color)

    def lh(self, size: float) -> float:
        return size * 1.32 / 72.0

    def paragraph(self, text, size=8.0, weight="normal", color=_INK, indent=0.0,
                  style="normal", width=None) -> None:
        lines = self.m.wrap(text, size, (width or self.cw) - indent, weight)
        self.need(self.lh(size) * len(lines))  # a short paragraph stays on one page
        for line in lines:
            self.need(self.lh(size))
            self.text(self.left + indent, self.y + size / 72.0, line, size, weight, color,
                      style=style)
            self.y += self.lh(size)

    def section(self, title: str, keep: float = 0.6) -> None:
        self.need(0.32 + keep)
        self.y += 0.12
        self.text(self.left, self.y + 10 / 72.0, title, 10.5, "bold")
        self.y += 0.2
        self.rule(self.y, lw=0.8, color=_INK)
        self.y += 0.06

    def table(self, t: TableData, size: float = 8.0) -> None:
        pad = 0.2
        ncol = len(t.headers)
        head_lines = [h.split("\n") for h in t.headers]
        nhead = max(len(h) for h in head_lines)

        def widths(sz):
            ws = []
            for i in range(ncol):
                cells = [self.m.width(x, sz, "bold") for x in head_lines[i]]
                cells += [self.m.width(r[i], sz, "bold" if j in t.bold_rows else "normal")
                          for j, r in enumerate(t.rows)]
                ws.append(max(cells + [0.2]) + pad)
            return ws

        ws = widths(size)
        while sum(ws) > self.cw and size > 6.0:
            size -= 0.5
            ws = widths(size)
        # Spread the spare width: a third to the label column, the rest evenly.
        spare = max(0.0, self.cw - sum(ws))
        ws[0] += spare / 3
        ws = [w + spare * 2 / 3 / ncol for w in ws]
        xs = [self.left]
        for w in ws[:-1]:
            xs.append(xs[-1] + w)
        row_h = self.lh(size) + 0.02

        def header():
            self.need(row_h * (nhead + 1))
            for k in range(nhead):
                for i in range(ncol):
                    lines = head_lines[i]
                    # bottom-align multi-line headers
                    idx = k - (nhead - len(lines))
                    if idx < 0:
                        continue
                    self._cell(xs[i], ws[i], self.y + size / 72.0, lines[idx], size, "bold",
                               i in t.numeric, pad)
                self.y += self.lh(size)
            self.y += 0.03
            self.rule(self.y, lw=0.6, color=_INK)
            self.y += 0.03

        header()
        # the notes stay on the page of the last row
        notes_h = sum(self.lh(6.8) * len(self.m.wrap(n, 6.8, self.cw)) for n in t.notes) + 0.07
        for j, r in enumerate(t.rows):
            extra = notes_h if j == len(t.rows) - 1 else 0.0
            if self.y + row_h + extra > self.bottom:
                self.need(row_h * 3)
                header()
            if j in t.bold_rows:
                self.rule(self.y, lw=0.5)
                self.y += 0.02
            weight = "bold" if j in t.bold_rows else "normal"
            for i in range(ncol):
                color = _BAD if r[i] in ("OUT", "NO") else _INK
                self._cell(xs[i], ws[i], self.y + size / 72.0, r[i], size,
                           "bold" if color == _BAD else weight, i in t.numeric, pad, color)
            self.y += row_h
        self.rule(self.y, lw=0.4)
        self.y += 0.05
        for n in t.notes:
            self.paragraph(n, 6.8, color=_GREY, style="italic")

    def _cell(self, x, w, y, s, size, weight, numeric, pad, color=_INK) -> None:
        if numeric:
            self.text(x + w - pad / 2, y, s, size, weight, color, ha="right")
        else:
            self.text(x + pad / 2 if x > self.left else x, y, s, size, weight, color)

    def box(self, lines: list[tuple[str, float, str, str]], edge: str, fill: str | None,
            lw: float = 1.2, pad: float = 0.1) -> None:
        """A framed block of (text, size, weight, colour) lines, wrapped to the box."""
        wrapped = []
        for s, size, weight, color in lines:
            for line in self.m.wrap(s, size, self.cw - 2 * pad, weight):
                wrapped.append((line, size, weight, color))
        h = sum(self.lh(sz) for _, sz, _, _ in wrapped) + 2 * pad
        self.need(h)
        self.op("rect", x=self.left, y=self.y, w=self.cw, h=h, edge=edge, fill=fill, lw=lw)
        y = self.y + pad
        for line, size, weight, color in wrapped:
            self.text(self.left + pad, y + size / 72.0, line, size, weight, color)
            y += self.lh(size)
        self.y += h + 0.08


def _layout(view: SheetView, page_w: float, page_h: float | None) -> _Layout:
    lay = _Layout(page_w, page_h)
    doc = view.doc

    # Title line with the verdict on the right.
    lay.text(lay.left, lay.y + 0.22, "Loading sheet", 17, "bold")
    reg = (doc.get("vehicle") or {}).get("registration") or "?"
    lay.text(lay.left + lay.m.width("Loading sheet", 17, "bold") + 0.15, lay.y + 0.22, reg,
             17, "normal", _GREY)
    colour = _OK if view.ok else _BAD
    vw = lay.m.width(view.verdict_text, 12, "bold") + 0.3
    lay.op("rect", x=lay.right - vw, y=lay.y, w=vw, h=0.32, edge=colour, fill=None, lw=2.0)
    lay.text(lay.right - vw / 2, lay.y + 0.22, view.verdict_text, 12, "bold", colour,
             ha="center")
    lay.y += 0.45
    lay.box([(view.caution, 9.0, "bold", _INK)], _CAUTION_EDGE, _CAUTION_FILL, lw=1.6)

    # Heading: label / value pairs.
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

    def table(t: TableData | None) -> None:
        if t is not None:
            lay.section(t.title, keep=lay.lh(8) * min(len(t.rows) + 2, 5))
            lay.table(t)

    table(view.items_table())
    table(view.stations_table())
    table(view.fuel_table())
    table(view.phases_table())
    table(view.margins_table())

    charts = view.charts()
    if charts:
        ch_h = 3.3
        lay.section("Envelope" + ("s" if len(charts) > 1 else ""), keep=ch_h)
        per_row = 2 if len(charts) > 1 else 1
        gap = 0.3
        cw = (lay.cw - gap * (per_row - 1)) / per_row
        for start in range(0, len(charts), per_row):
            row = charts[start:start + per_row]
            legend_h = max(lay.lh(7.0) * (len(c.legend) + (1 if c.exit_note else 0))
                           for c in row)
            lay.need(ch_h + 0.05 + legend_h)  # a chart and its legend on one page
            for k, c in enumerate(row):
                lay.op("chart", x=lay.left + k * (cw + gap), y=lay.y, w=cw, h=ch_h, chart=c)
            lay.y += ch_h + 0.05
            ends = []
            for k, c in enumerate(row):
                notes = list(c.legend) + ([f"\u00d7 {c.exit_note}"] if c.exit_note else [])
                y0 = lay.y
                for line in notes:
                    for part in lay.m.wrap(line, 7.0, cw):
                        lay.text(lay.left + k * (cw + gap), y0 + 7 / 72, part, 7.0)
                        y0 += lay.lh(7.0)
                ends.append(y0)
            lay.y = max(ends) + 0.08

    table(view.axles_table())
    if view.ground_caution:
        lay.paragraph(view.ground_caution, 7.5, style="italic")

    viol = view.violations()
    if viol:
        lay.section(f"Limits exceeded ({len(viol)})")
        for i, (msg, figures) in enumerate(viol, 1):
            lay.need(lay.lh(8.5))
            lay.text(lay.left, lay.y + 8.5 / 72, f"{i}.", 8.5, "bold", _BAD)
            lay.paragraph(msg, 8.5, indent=0.25)
            if figures:
                lay.paragraph(figures, 7.5, color=_GREY, indent=0.25)
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
                      "sheet.", 7.0, color=_GREY, style="italic")

    lay.y += 0.1
    lay.box([(view.verdict_text, 13.0, "bold", colour), (view.verdict_detail, 8.5, "normal",
                                                          _INK)], colour, None, lw=2.0)

    # Signatures, kept together.
    roles = view.signature_roles
    block = 0.4 + 0.55 * len(roles)
    lay.need(block)
    lay.section("Signatures", keep=block)
    lay.paragraph("Sign only after checking this sheet against the approved data.", 7.0,
                  color=_GREY, style="italic")
    lay.y += 0.1
    name_x0 = lay.left + 1.35
    date_x0 = lay.right - 1.5
    for role in roles:
        lay.y += 0.38
        lay.text(lay.left, lay.y - 0.03, role, 9.0, "bold")
        lay.rule(lay.y, name_x0, date_x0 - 0.65, lw=0.7, color=_INK)
        lay.text(date_x0 - 0.5, lay.y - 0.03, "Date", 9.0, "bold")
        lay.rule(lay.y, date_x0, lay.right, lw=0.7, color=_INK)
        lay.text(name_x0, lay.y + 0.12, "name and signature", 6.5, color=_GREY)
        lay.y += 0.15
    lay.y += 0.1
    return lay


def _footer_lines(view: SheetView) -> str:
    doc = view.doc
    reg = (doc.get("vehicle") or {}).get("registration") or "?"
    prepared = dict(view.heading()).get("Prepared", DASH)
    return f"wbledger loading sheet {reg} \u00b7 prepared {prepared}"


def _draw(fig, ops: list[_Op], page_w: float, page_h: float) -> None:
    """Draw the operations of one page onto a figure ``page_w`` × ``page_h`` inches."""
    from matplotlib.patches import Rectangle

    def fx(x):
        return x / page_w

    def fy(y):
        return 1.0 - y / page_h

    for op in ops:
        a = op.args
        if op.kind == "text":
            fig.text(fx(a["x"]), fy(a["y"]), a["s"], fontsize=a["size"], fontweight=a["weight"],
                     color=a["color"], ha=a["ha"], va="baseline", family=_SANS,
                     fontstyle=a["style"], parse_math=False)
        elif op.kind == "line":
            fig.add_artist(_line(fig, [fx(a["x0"]), fx(a["x1"])], [fy(a["y0"]), fy(a["y1"])],
                                 a["lw"], a["color"]))
        elif op.kind == "rect":
            fig.add_artist(Rectangle((fx(a["x"]), fy(a["y"] + a["h"])), a["w"] / page_w,
                                     a["h"] / page_h, transform=fig.transFigure,
                                     facecolor=a["fill"] or "none", edgecolor=a["edge"],
                                     linewidth=a["lw"]))
        elif op.kind == "chart":
            ax = fig.add_axes((fx(a["x"]) + 0.75 / page_w, fy(a["y"] + a["h"]) + 0.5 / page_h,
                               (a["w"] - 0.85) / page_w, (a["h"] - 0.8) / page_h))
            _chart(ax, a["chart"])


def _line(fig, xs, ys, lw, color):
    from matplotlib.lines import Line2D

    return Line2D(xs, ys, transform=fig.transFigure, linewidth=lw, color=color)


def _chart(ax, c: ChartData) -> None:
    if c.polygon:
        xs = [p[0] for p in c.polygon] + [c.polygon[0][0]]
        ys = [p[1] for p in c.polygon] + [c.polygon[0][1]]
        ax.fill(xs, ys, facecolor="#dfe8f3", edgecolor="none", zorder=1)
        ax.plot(xs, ys, color="#1f3b63", linewidth=1.4, zorder=2, label="envelope")
    if c.path:
        ax.plot([p[0] for p in c.path], [p[1] for p in c.path], color="#6b6b6b",
                linewidth=1.0, linestyle="--", marker=".", markersize=3, zorder=3,
                label="burn path")
    outside = {line.split(" ", 1)[0] for line in c.legend if line.endswith("OUTSIDE")}
    allx = [p[0] for p in c.polygon] + [p[0] for p in c.points]
    ally = [p[1] for p in c.polygon] + [p[1] for p in c.points]
    sx = (max(allx) - min(allx)) or 1.0
    sy = (max(ally) - min(ally)) or 1.0
    # Labels of points that nearly coincide (ramp and take-off) go to different sides.
    offsets = [(5, 3), (-11, 3), (5, -10), (-11, -10)]
    placed: list[tuple[float, float]] = []
    for x, y, mark in c.points:
        col = _BAD if mark in outside else _INK
        near = sum(1 for px, py in placed if abs(px - x) / sx < 0.04 and abs(py - y) / sy < 0.04)
        placed.append((x, y))
        ax.plot([x], [y], marker="o", markersize=4.5, color=col, zorder=5, linestyle="none")
        ax.annotate(mark, (x, y), xytext=offsets[near % len(offsets)],
                    textcoords="offset points", fontsize=8, fontweight="bold", color=col,
                    zorder=7)
    for x, y in c.exits:
        ax.plot([x], [y], marker="x", markersize=9, markeredgewidth=1.2, color=_BAD, zorder=4,
                linestyle="none", label="leaves envelope")
    ax.set_title(c.title, fontsize=9, fontweight="bold", loc="left")
    ax.set_xlabel(c.x_label, fontsize=7.5)
    ax.set_ylabel(c.y_label, fontsize=7.5)
    ax.tick_params(labelsize=7)
    ax.grid(True, color="#cccccc", linewidth=0.4, zorder=0)
    ax.set_axisbelow(True)
    ax.margins(0.08)
    handles, labels = ax.get_legend_handles_labels()
    if handles:
        ax.legend(fontsize=6.5, loc="best", frameon=True, framealpha=0.85)


def _render(doc: dict, path, fmt: str, paper: str) -> Path:
    if paper not in PAPER_SIZES:
        from ledger.errors import InputError

        raise InputError("paper", paper, "one of " + ", ".join(PAPER_SIZES))
    view = SheetView(doc)
    page_w, page_h = PAPER_SIZES[paper]
    path = Path(path)
    rc = {"svg.fonttype": "none", "svg.hashsalt": "wbledger-sheet", "pdf.fonttype": 42,
          "text.parse_math": False, "font.family": _SANS, "axes.unicode_minus": True}
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
                    _draw(fig, [o for o in lay.ops if o.page == n], page_w, page_h)
                    _footer(fig, view, page_w, page_h, f"page {n + 1} of {pages}")
                    pdf.savefig(fig)
        else:
            lay = _layout(view, page_w, None)
            height = lay.y + _MARGIN + _FOOTER
            fig = Figure(figsize=(page_w, height))
            _draw(fig, lay.ops, page_w, height)
            _footer(fig, view, page_w, height, "")
            fig.savefig(out, format="svg", metadata={"Date": None, "Creator": "wbledger"})


def _footer(fig, view: SheetView, page_w: float, page_h: float, page_text: str) -> None:
    y = page_h - _MARGIN - 0.49
    fig.add_artist(_line(fig, [_MARGIN / page_w, 1 - _MARGIN / page_w],
                         [1 - y / page_h, 1 - y / page_h], 0.5, _RULE))
    fig.text(_MARGIN / page_w, 1 - (y + 0.14) / page_h, _footer_lines(view), fontsize=6.5,
             color=_GREY, family=_SANS, parse_math=False)
    if page_text:
        fig.text(1 - _MARGIN / page_w, 1 - (y + 0.14) / page_h, page_text, fontsize=6.5,
                 color=_GREY, ha="right", family=_SANS, parse_math=False)
    # The hashes that anchor the paper copy to the ledger (`wbledger verify --expect HASH`).
    anchors = [f"{label.lower()} {value}" for label, value in view.anchors()]
    for k in range(0, len(anchors), 2):
        fig.text(_MARGIN / page_w, 1 - (y + 0.25 + k * 0.05) / page_h,
                 "   ".join(anchors[k:k + 2]), fontsize=5.2, color=_GREY, family="monospace",
                 parse_math=False)
    width = page_w - 2 * _MARGIN
    for k, line in enumerate(_Measure().wrap(CAUTION_SHORT, 6.5, width, "bold")):
        fig.text(_MARGIN / page_w, 1 - (y + 0.48 + k * 0.11) / page_h, line, fontsize=6.5,
                 color=_CAUTION_EDGE, fontweight="bold", family=_SANS, parse_math=False)


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
