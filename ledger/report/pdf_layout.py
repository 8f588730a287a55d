"""A flowing page layout for the printed sheet, and its drawing with matplotlib.

:class:`Layout` places text, rules, boxes, tables and charts top to bottom in inches, starting
a new page (PDF) when a block does not fit; it records drawing operations (:class:`Op`) per
page, which :func:`draw_page` then draws onto a matplotlib figure. Text is measured with
matplotlib's Agg renderer (:class:`Measure`), so wrapping matches the drawn text. matplotlib is
imported inside the functions only.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from ledger.report.sheet_charts import ChartData
from ledger.report.sheet_tables import TableData

__all__ = ["MARGIN", "FOOTER", "SANS", "INK", "GREY", "RULE", "OK", "BAD", "CAUTION_EDGE",
           "CAUTION_FILL", "Op", "Measure", "Layout", "draw_page", "figure_line"]

MARGIN = 0.6  # in
FOOTER = 0.76  # in kept free at the bottom of each page
SANS = "DejaVu Sans"
INK = "#1a1a1a"
GREY = "#555555"
RULE = "#999999"
OK = "#1b6e2e"
BAD = "#b00020"
CAUTION_EDGE = "#8a5a00"
CAUTION_FILL = "#fff4d6"


@dataclass
class Op:
    kind: str
    page: int
    args: dict = field(default_factory=dict)


class Measure:
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
            fp = self._fp(family=SANS, size=size, weight=weight)
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


class Layout:
    """Flows blocks down pages; records drawing operations in inches from the page top."""

    def __init__(self, page_w: float, page_h: float | None):
        self.w, self.h = page_w, page_h  # page_h None: one endless page (SVG)
        self.left, self.right = MARGIN, page_w - MARGIN
        self.cw = self.right - self.left
        self.page = 0
        self.y = MARGIN
        self.ops: list[Op] = []
        self.m = Measure()

    @property
    def bottom(self) -> float:
        return float("inf") if self.h is None else self.h - MARGIN - FOOTER

    def need(self, height: float) -> None:
        """Start a new page unless ``height`` inches fit below the cursor."""
        if self.y + height > self.bottom and self.y > MARGIN + 0.01:
            self.page += 1
            self.y = MARGIN

    def op(self, kind: str, **args) -> None:
        self.ops.append(Op(kind, self.page, args))

    def text(self, x, y, s, size=8.0, weight="normal", color=INK, ha="left",
             style="normal") -> None:
        self.op("text", x=x, y=y, s=s, size=size, weight=weight, color=color, ha=ha,
                style=style)

    def rule(self, y, x0=None, x1=None, lw=0.5, color=RULE) -> None:
        self.op("line", x0=self.left if x0 is None else x0, x1=self.right if x1 is None else x1,
                y0=y, y1=y, lw=lw, color=color)

    def lh(self, size: float) -> float:
        return size * 1.32 / 72.0

    def paragraph(self, text, size=8.0, weight="normal", color=INK, indent=0.0,
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
        self.rule(self.y, lw=0.8, color=INK)
        self.y += 0.06

    def _fit(self, t: TableData, size: float, pad: float) -> tuple[float, list[float]]:
        """The font size (shrunk to 6 pt at most) and column widths that fit the page."""
        head_lines = [h.split("\n") for h in t.headers]

        def widths(sz):
            ws = []
            for i, head in enumerate(head_lines):
                cells = [self.m.width(x, sz, "bold") for x in head]
                cells += [self.m.width(r[i], sz, "bold" if j in t.bold_rows else "normal")
                          for j, r in enumerate(t.rows)]
                ws.append(max(cells + [0.2]) + pad)
            return ws

        ws = widths(size)
        while sum(ws) > self.cw and size > 6.0:
            size -= 0.5
            ws = widths(size)
        return size, ws

    def table_height(self, t: TableData, size: float = 8.0) -> float:
        """The height :meth:`table` takes for ``t`` on one page, notes included."""
        size, _ = self._fit(t, size, 0.2)
        nhead = max(len(h.split("\n")) for h in t.headers)
        return (self.lh(size) * nhead + 0.06 + (self.lh(size) + 0.02) * len(t.rows)
                + 0.02 * len(t.bold_rows) + 0.05 + self._notes_height(t))

    def _notes_height(self, t: TableData) -> float:
        return sum(self.lh(6.8) * len(self.m.wrap(n, 6.8, self.cw)) for n in t.notes)

    @property
    def page_room(self) -> float:
        """The height of a whole page's text area."""
        return self.bottom - MARGIN

    def table(self, t: TableData, size: float = 8.0) -> None:
        pad = 0.2
        ncol = len(t.headers)
        head_lines = [h.split("\n") for h in t.headers]
        nhead = max(len(h) for h in head_lines)
        size, ws = self._fit(t, size, pad)
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
            self.rule(self.y, lw=0.6, color=INK)
            self.y += 0.03

        header()
        # the notes stay on the page of the last row
        notes_h = self._notes_height(t) + 0.07
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
                color = BAD if r[i] in ("OUT", "NO") else INK
                self._cell(xs[i], ws[i], self.y + size / 72.0, r[i], size,
                           "bold" if color == BAD else weight, i in t.numeric, pad, color)
            self.y += row_h
        self.rule(self.y, lw=0.4)
        self.y += 0.05
        for n in t.notes:
            self.paragraph(n, 6.8, color=GREY, style="italic")

    def _cell(self, x, w, y, s, size, weight, numeric, pad, color=INK) -> None:
        if numeric:
            self.text(x + w - pad / 2, y, s, size, weight, color, ha="right")
        else:
            self.text(x + pad / 2 if x > self.left else x, y, s, size, weight, color)

    def _box_lines(self, lines: list[tuple[str, float, str, str]], pad: float) -> list:
        return [(line, size, weight, color) for s, size, weight, color in lines
                for line in self.m.wrap(s, size, self.cw - 2 * pad, weight)]

    def box_height(self, lines: list[tuple[str, float, str, str]], pad: float = 0.1) -> float:
        """The height :meth:`box` takes, the gap after it included."""
        return sum(self.lh(sz) for _, sz, _, _ in self._box_lines(lines, pad)) + 2 * pad + 0.08

    def box(self, lines: list[tuple[str, float, str, str]], edge: str, fill: str | None,
            lw: float = 1.2, pad: float = 0.1) -> None:
        """A framed block of (text, size, weight, colour) lines, wrapped to the box."""
        wrapped = self._box_lines(lines, pad)
        h = sum(self.lh(sz) for _, sz, _, _ in wrapped) + 2 * pad
        self.need(h)
        self.op("rect", x=self.left, y=self.y, w=self.cw, h=h, edge=edge, fill=fill, lw=lw)
        y = self.y + pad
        for line, size, weight, color in wrapped:
            self.text(self.left + pad, y + size / 72.0, line, size, weight, color)
            y += self.lh(size)
        self.y += h + 0.08


def signature_block(lay: Layout, roles, note: str) -> None:
    """A "Signatures" section kept together on one page: ``note`` in small italics, then per
    role a line for the name and signature and one for the date (the printed sheet and the
    printed record sign alike)."""
    block = 0.4 + 0.55 * len(roles)
    lay.need(block)
    lay.section("Signatures", keep=block)
    lay.paragraph(note, 7.0, color=GREY, style="italic")
    lay.y += 0.1
    name_x0, date_x0 = lay.left + 1.35, lay.right - 1.5
    for role in roles:
        lay.y += 0.38
        lay.text(lay.left, lay.y - 0.03, role, 9.0, "bold")
        lay.rule(lay.y, name_x0, date_x0 - 0.65, lw=0.7, color=INK)
        lay.text(date_x0 - 0.5, lay.y - 0.03, "Date", 9.0, "bold")
        lay.rule(lay.y, date_x0, lay.right, lw=0.7, color=INK)
        lay.text(name_x0, lay.y + 0.12, "name and signature", 6.5, color=GREY)
        lay.y += 0.15
    lay.y += 0.1


def draw_page(fig, ops: list[Op], page_w: float, page_h: float) -> None:
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
                     color=a["color"], ha=a["ha"], va="baseline", family=SANS,
                     fontstyle=a["style"], parse_math=False)
        elif op.kind == "line":
            fig.add_artist(figure_line(fig, [fx(a["x0"]), fx(a["x1"])], [fy(a["y0"]), fy(a["y1"])],
                                 a["lw"], a["color"]))
        elif op.kind == "rect":
            fig.add_artist(Rectangle((fx(a["x"]), fy(a["y"] + a["h"])), a["w"] / page_w,
                                     a["h"] / page_h, transform=fig.transFigure,
                                     facecolor=a["fill"] or "none", edgecolor=a["edge"],
                                     linewidth=a["lw"]))
        elif op.kind == "chart":
            ax = fig.add_axes((fx(a["x"]) + 0.75 / page_w, fy(a["y"] + a["h"]) + 0.5 / page_h,
                               (a["w"] - 0.85) / page_w, (a["h"] - 0.8) / page_h))
            draw_chart(ax, a["chart"])


def figure_line(fig, xs, ys, lw, color):
    from matplotlib.lines import Line2D

    return Line2D(xs, ys, transform=fig.transFigure, linewidth=lw, color=color)


LABEL_SIZE = 8.0  # pt, the phase letters on a chart


@dataclass(frozen=True)
class PlacedLabel:
    """A chart label: its text, the point it names and its box's lower-left corner as an
    offset from that point (points, 1/72 in)."""

    text: str
    x: float
    y: float
    dx: float
    dy: float


def _box_of(lab: PlacedLabel, size: float) -> tuple[float, float, float, float]:
    w, h = 0.68 * size * len(lab.text), 0.75 * size
    return (lab.x + lab.dx, lab.y + lab.dy, lab.x + lab.dx + w, lab.y + lab.dy + h)


def _overlap(a, b) -> float:
    w = min(a[2], b[2]) - max(a[0], b[0])
    h = min(a[3], b[3]) - max(a[1], b[1])
    return w * h if w > 0 and h > 0 else 0.0


def place_labels(points: list[tuple[float, float, str]], size: float = LABEL_SIZE,
                 marker: float = 3.0) -> list[PlacedLabel]:
    """Labels for points given in display points, none over another label or a marker.

    Points closer than a marker's radius (ramp and take-off with no taxi fuel) share one
    label ("R,T"); every other label takes the first of eight places around its point that
    covers no marker and no label already placed (else the least covered one).

    Examples
    --------
    >>> [(p.text, p.dx > 0) for p in place_labels([(0, 0, "R"), (0.5, 0.5, "T"),
    ...                                             (100, 0, "L")])]
    [('R,T', True), ('L', True)]
    """
    groups: list[tuple[float, float, list[str]]] = []
    for x, y, mark in points:
        for gx, gy, marks in groups:
            if abs(gx - x) <= marker and abs(gy - y) <= marker:
                marks.append(mark)
                break
        else:
            groups.append((x, y, [mark]))
    dots = [(x - marker, y - marker, x + marker, y + marker) for x, y, _ in points]
    placed: list[PlacedLabel] = []
    for x, y, marks in groups:
        text = ",".join(dict.fromkeys(marks))
        w, h = 0.68 * size * len(text), 0.75 * size
        gap = marker + 1.5
        tries = [(gap, 1.0), (-gap - w, 1.0), (gap, -1.0 - h), (-gap - w, -1.0 - h),
                 (-w / 2, gap), (-w / 2, -gap - h), (gap + 4, -h / 2), (-gap - 4 - w, -h / 2)]
        boxes = dots + [_box_of(p, size) for p in placed]
        costs = [sum(_overlap(_box_of(PlacedLabel(text, x, y, *d), size), b) for b in boxes)
                 for d in tries]
        best = tries[costs.index(min(costs))]  # the first of equal costs: the usual place
        placed.append(PlacedLabel(text, x, y, *best))
    return placed


def _label_points(ax, c: ChartData, outside: set[str]) -> None:
    """Phase letters placed in display space, after the axes have their final limits."""
    if not c.points:
        return
    ax.autoscale_view()
    to_pt = 72.0 / ax.figure.dpi
    shown = []
    for x, y, mark in c.points:
        px, py = ax.transData.transform((x, y))
        shown.append((px * to_pt, py * to_pt, mark))
    data_at = {(round(px, 6), round(py, 6)): (x, y)
               for (px, py, _), (x, y, _) in zip(shown, c.points)}
    for lab in place_labels(shown):
        col = BAD if any(m in outside for m in lab.text.split(",")) else INK
        ax.annotate(lab.text, data_at[(round(lab.x, 6), round(lab.y, 6))],
                    xytext=(lab.dx, lab.dy), textcoords="offset points", fontsize=LABEL_SIZE,
                    fontweight="bold", color=col, zorder=7, ha="left", va="baseline")


def draw_chart(ax, c: ChartData) -> None:
    if c.polygon:
        xs = [p[0] for p in c.polygon] + [c.polygon[0][0]]
        ys = [p[1] for p in c.polygon] + [c.polygon[0][1]]
        ax.fill(xs, ys, facecolor="#dfe8f3", edgecolor="none", zorder=1)
        ax.plot(xs, ys, color="#1f3b63", linewidth=1.4, zorder=2, label="envelope")
    if c.path:
        ax.plot([p[0] for p in c.path], [p[1] for p in c.path], color="#6b6b6b",
                linewidth=1.0, linestyle="--", marker=".", markersize=3, zorder=3,
                label="burn path")
    outside = {line.split(" ", 1)[0] for line in c.legend if "OUTSIDE" in line}
    for x, y, mark in c.points:
        ax.plot([x], [y], marker="o", markersize=4.5, color=BAD if mark in outside else INK,
                zorder=5, linestyle="none")
    for k, (m, name) in enumerate(c.mass_lines):  # the maximum masses (issue 13 item 1)
        ax.axhline(m, color="#7a4b00", linewidth=0.9, linestyle=(0, (4, 2)), zorder=2.5,
                   label="maximum mass" if k == 0 else None)
        ax.text(0.99, m, name, transform=ax.get_yaxis_transform(), ha="right",
                va="bottom" if k % 2 == 0 else "top", fontsize=6, color="#7a4b00", zorder=6)
    for x, y in c.exits:
        ax.plot([x], [y], marker="x", markersize=9, markeredgewidth=1.2, color=BAD, zorder=4,
                linestyle="none", label="leaves envelope")
    ax.set_title(c.title, fontsize=9, fontweight="bold", loc="left")
    ax.set_xlabel(c.x_label, fontsize=7.5)
    ax.set_ylabel(c.y_label, fontsize=7.5)
    ax.tick_params(labelsize=7)
    ax.grid(True, color="#cccccc", linewidth=0.4, zorder=0)
    ax.set_axisbelow(True)
    ax.margins(0.08)
    _label_points(ax, c, outside)  # last: the axes have their final limits
    handles, labels = ax.get_legend_handles_labels()
    if handles:
        ax.legend(fontsize=6.5, loc="best", frameon=True, framealpha=0.85)
