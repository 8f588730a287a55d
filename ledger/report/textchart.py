r"""An envelope chart drawn with characters, for the terminal loading sheet.

The chart is a pure function of numbers: polygon outlines, labelled points and a path go in,
a list of strings comes out, so it can be tested without a terminal. It imports nothing heavy.

What the characters mean
------------------------
``+``                a polygon vertex
``-`` ``|`` ``/`` ``\``   a polygon edge, by its slope on the grid
``.``                the path (for example the CG while fuel burns, take-off to landing)
``=``                a level line across the chart (for example a maximum mass), under the
                     outline; its value is written in the left margin
a letter or digit    a labelled point (a phase CG); it is drawn last, so it shows even where
                     it falls on an edge or a vertex of the outline

The plotted range covers every polygon vertex, every point and every path point, plus a small
margin, so a point outside the envelope is still drawn (outside the outline). When two labels
fall in the same cell, the later one moves to the nearest free neighbouring cell, so neither is
lost; the legend the caller prints next to the chart gives the exact values.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field

__all__ = ["LEVEL", "PATH", "VERTEX", "Grid", "envelope_chart", "nice_ticks", "plot_grid"]

VERTEX = "+"
PATH = "."
LEVEL = "="
_EDGE_CHARS = set("+-|/\\")


@dataclass
class Grid:
    """A character grid with the mapping from data coordinates to cells.

    Row 0 is the top row (largest y); column 0 is the left column (smallest x).

    Attributes
    ----------
    cells : list of list of str
        ``height`` rows of ``width`` one-character strings.
    x_range, y_range : (float, float)
        Data values of the first and the last column / of the bottom and the top row.
    labels : dict
        Label → (row, col) where it was finally drawn.
    """

    width: int
    height: int
    x_range: tuple[float, float]
    y_range: tuple[float, float]
    cells: list[list[str]] = field(default_factory=list)
    labels: dict[str, tuple[int, int]] = field(default_factory=dict)

    def __post_init__(self) -> None:
        if not self.cells:
            self.cells = [[" "] * self.width for _ in range(self.height)]

    def col(self, x: float) -> int:
        """Column of data value ``x`` (nearest cell centre, clamped to the grid)."""
        x0, x1 = self.x_range
        c = round((x - x0) / (x1 - x0) * (self.width - 1))
        return min(max(c, 0), self.width - 1)

    def row(self, y: float) -> int:
        """Row of data value ``y`` (row 0 at the top)."""
        y0, y1 = self.y_range
        r = round((y1 - y) / (y1 - y0) * (self.height - 1))
        return min(max(r, 0), self.height - 1)

    def cell(self, x: float, y: float) -> tuple[int, int]:
        """(row, col) of a data point."""
        return self.row(y), self.col(x)

    def lines(self) -> list[str]:
        """The grid as strings, trailing blanks kept so that every line has ``width``."""
        return ["".join(r) for r in self.cells]


def _finite_pairs(points, what: str) -> list[tuple[float, float]]:
    out = []
    for p in points:
        x, y = float(p[0]), float(p[1])
        if not (math.isfinite(x) and math.isfinite(y)):
            raise ValueError(f"{what}: point ({x}, {y}) is not finite")
        out.append((x, y))
    return out


def _padded(lo: float, hi: float, pad: float) -> tuple[float, float]:
    if hi == lo:
        half = abs(lo) * 0.05 or 1.0
        return lo - half, hi + half
    span = hi - lo
    return lo - span * pad, hi + span * pad


def _edge_char(dc: float, dr: float) -> str:
    """Character for a segment going ``dc`` columns right and ``dr`` rows down."""
    # A terminal cell is about twice as tall as it is wide, so weigh rows double.
    adc, adr = abs(dc), abs(dr) * 2.0
    if adr <= adc * 0.5:
        return "-"
    if adc <= adr * 0.5:
        return "|"
    # rows grow downwards: right-and-up is '/'
    return "/" if (dc > 0) == (dr < 0) else "\\"


def _segment_cells(r0: int, c0: int, r1: int, c1: int) -> list[tuple[int, int]]:
    n = max(abs(r1 - r0), abs(c1 - c0))
    if n == 0:
        return [(r0, c0)]
    return [(round(r0 + (r1 - r0) * i / n), round(c0 + (c1 - c0) * i / n))
            for i in range(n + 1)]


def plot_grid(polygons: Sequence[Sequence[Sequence[float]]],
              points: Sequence[tuple[float, float, str]] = (),
              path: Sequence[Sequence[float]] = (),
              width: int = 60, height: int = 16, *,
              pad: float = 0.06, levels: Sequence[float] = ()) -> Grid:
    r"""Rasterise envelope outlines, a path and labelled points onto a character grid.

    Parameters
    ----------
    polygons : sequence of sequences of (x, y)
        Closed outlines (the last vertex joins the first; repeating the first is allowed).
    points : sequence of (x, y, label)
        Labelled points; the first character of ``label`` is drawn.
    path : sequence of (x, y)
        A polyline drawn with ``.`` under the points and over the outline.
    width, height : int
        Grid size in characters (at least 8 × 4).
    pad : float
        Margin around the data, as a fraction of the data span on each side.
    levels : sequence of float
        y values drawn as horizontal lines of ``=`` across the grid, under everything else
        (the plotted range covers them).

    Returns
    -------
    Grid

    Notes
    -----
    A point exactly on an edge or a vertex is drawn over the outline, so it always shows.

    Examples
    --------
    >>> g = plot_grid([[(0, 0), (4, 0), (4, 4), (0, 4)]], [(4, 2, "E")], width=9, height=5,
    ...               pad=0)
    >>> print("\n".join(g.lines()))
    +-------+
    |       |
    |       E
    |       |
    +-------+
    """
    if width < 8 or height < 4:
        raise ValueError(f"chart size {width}x{height} is too small; at least 8x4")
    polys = [_finite_pairs(poly, "polygon") for poly in polygons]
    pts = [(float(x), float(y), str(label)) for x, y, label in points]
    for x, y, label in pts:
        if not (math.isfinite(x) and math.isfinite(y)):
            raise ValueError(f"point {label!r}: ({x}, {y}) is not finite")
    line = _finite_pairs(path, "path")
    flat = [float(v) for v in levels if math.isfinite(float(v))]
    xs = [p[0] for poly in polys for p in poly] + [p[0] for p in pts] + [p[0] for p in line]
    ys = [p[1] for poly in polys for p in poly] + [p[1] for p in pts] + [p[1] for p in line]
    if not xs:
        xs, ys = [0.0, 1.0], [0.0, 1.0]
    ys += flat
    grid = Grid(width, height, _padded(min(xs), max(xs), pad), _padded(min(ys), max(ys), pad))
    cells = grid.cells
    for v in flat:
        cells[grid.row(v)] = [LEVEL] * width

    for poly in polys:
        if len(poly) > 1 and poly[0] == poly[-1]:
            poly = poly[:-1]
        n = len(poly)
        for i in range(n):
            (r0, c0), (r1, c1) = grid.cell(*poly[i]), grid.cell(*poly[(i + 1) % n])
            ch = _edge_char(c1 - c0, r1 - r0)
            for r, c in _segment_cells(r0, c0, r1, c1):
                if cells[r][c] != VERTEX:
                    cells[r][c] = ch
        for x, y in poly:
            r, c = grid.cell(x, y)
            cells[r][c] = VERTEX

    for i in range(len(line) - 1):
        (r0, c0), (r1, c1) = grid.cell(*line[i]), grid.cell(*line[i + 1])
        for r, c in _segment_cells(r0, c0, r1, c1):
            cells[r][c] = PATH
    if len(line) == 1:
        r, c = grid.cell(*line[0])
        cells[r][c] = PATH

    taken: set[tuple[int, int]] = set()
    for x, y, label in pts:
        mark = (label or "*")[0]
        r, c = grid.cell(x, y)
        spot = (r, c)
        if spot in taken:
            for dr, dc in ((0, 1), (0, -1), (-1, 0), (1, 0), (-1, 1), (1, 1), (-1, -1),
                           (1, -1), (0, 2), (0, -2)):
                rr, cc = r + dr, c + dc
                if 0 <= rr < height and 0 <= cc < width and (rr, cc) not in taken:
                    spot = (rr, cc)
                    break
        cells[spot[0]][spot[1]] = mark
        taken.add(spot)
        grid.labels[label] = spot
    return grid


def nice_ticks(lo: float, hi: float, count: int = 5) -> list[float]:
    """Round tick values (1, 2, 2.5 or 5 × 10ⁿ apart) within [lo, hi].

    Examples
    --------
    >>> nice_ticks(0, 10, 5)
    [0.0, 2.0, 4.0, 6.0, 8.0, 10.0]
    >>> nice_ticks(1480, 2620, 4)
    [1500.0, 2000.0, 2500.0]
    """
    if not (math.isfinite(lo) and math.isfinite(hi)) or hi <= lo or count < 1:
        return [lo]
    raw = (hi - lo) / count
    if not raw >= 1e-300:  # a subnormal span: log10 of its step would underflow to log10(0)
        return [lo]
    mag = 10 ** math.floor(math.log10(raw))
    step = next(m * mag for m in (1, 2, 2.5, 5, 10) if m * mag >= raw * 0.999)
    first = math.ceil(lo / step - 1e-9) * step
    ticks = []
    t = first
    while t <= hi + step * 1e-9:
        ticks.append(round(t, 10) + 0.0)
        t += step
    return ticks


def _tick_text(v: float, step: float) -> str:
    # as many decimals as the step needs: 2.5 -> 1, 0.25 -> 2, 500 -> 0
    decimals = next((d for d in range(7) if abs(step * 10 ** d - round(step * 10 ** d))
                     < 1e-6 * max(1.0, step * 10 ** d)), 6)
    text = f"{v:.{decimals}f}"
    return text.lstrip("-") if float(text) == 0 else text


def _level_text(v: float) -> str:
    # A maximum mass in the margin: whole where it is whole, else one decimal.
    return f"{v:.0f}" if abs(v - round(v)) < 0.05 else f"{v:.1f}"


def envelope_chart(polygons: Sequence[Sequence[Sequence[float]]],
                   points: Sequence[tuple[float, float, str]] = (),
                   path: Sequence[Sequence[float]] = (),
                   width: int = 78, height: int = 16,
                   x_label: str = "", y_label: str = "",
                   levels: Sequence[float] = ()) -> list[str]:
    """An envelope chart as lines of text: outline, path, labelled points and both axes.

    Parameters
    ----------
    polygons : sequence of sequences of (x, y)
        Envelope outlines in display units (for example CG arm in inches, mass in lb).
    points : sequence of (x, y, label)
        The phase CG points; the first character of each label is drawn.
    path : sequence of (x, y)
        The CG path while fuel burns, drawn with ``.``.
    width : int
        Total width of every returned line, axes included (at least 30).
    height : int
        Rows of the plotting area (the axis and its labels add three more lines).
    x_label, y_label : str
        Axis titles; ``y_label`` heads the chart, ``x_label`` is centred under it.
    levels : sequence of float
        y values drawn as lines of ``=`` (maximum masses), each with its value in the left
        margin in place of a tick.

    Returns
    -------
    list of str
        No line is longer than ``width``.

    Examples
    --------
    >>> lines = envelope_chart([[(0, 0), (10, 0), (10, 10), (0, 10)]], [(5, 5, "T")],
    ...                        width=40, height=6, x_label="CG (in)", y_label="mass (lb)")
    >>> len(lines), max(len(s) for s in lines) <= 40, any("T" in s for s in lines)
    (10, True, True)
    """
    if width < 30:
        raise ValueError(f"chart width {width} is too small; at least 30")
    # The y tick labels take the left margin; size the grid after measuring them.
    probe = plot_grid(polygons, points, path, 10, max(height, 4), levels=levels)
    y0, y1 = probe.y_range
    yt = nice_ticks(y0, y1, max(2, min(6, height // 3)))
    ystep = yt[1] - yt[0] if len(yt) > 1 else 1.0
    ytexts = [_tick_text(v, ystep) for v in yt]
    # Levels on one row (2,400 and 2,450 lb at 100 lb a row) share it: "2400/2450".
    by_row: dict[int, list[str]] = {}
    for v in sorted(levels):
        by_row.setdefault(probe.row(v), []).append(_level_text(v))
    ltexts = ["/".join(dict.fromkeys(t)) for t in by_row.values()]
    margin = max(len(t) for t in ytexts + ltexts) + 1
    grid_w = width - margin - 1
    grid = plot_grid(polygons, points, path, grid_w, max(height, 4), levels=levels)
    row_text = {grid.row(v): t for v, t in zip(yt, ytexts)}
    level_rows = {grid.row(v) for v in levels}
    # A level's own value replaces a tick on its row, and a tick next to it (one row away)
    # is dropped, so that the margin never shows two numbers for neighbouring lines.
    row_text = {r: t for r, t in row_text.items()
                if not any(abs(r - lr) <= 1 for lr in level_rows)}
    row_text.update(dict(zip(by_row, ltexts)))

    lines: list[str] = []
    if y_label:
        lines.append(y_label[:width])
    for r, cells in enumerate(grid.lines()):
        left = row_text.get(r, "")
        axis = LEVEL if r in level_rows else "+" if left else "|"
        lines.append((f"{left:>{margin - 1}} {axis}{cells}").rstrip())

    x0, x1 = grid.x_range
    xt = nice_ticks(x0, x1, max(2, min(8, grid_w // 10)))
    xstep = xt[1] - xt[0] if len(xt) > 1 else 1.0
    axis_row = [" "] * margin + ["+"] + ["-"] * grid_w
    label_row = [" "] * width
    last_end = -1
    for v in xt:
        c = margin + 1 + grid.col(v)
        axis_row[c] = "+"
        t = _tick_text(v, xstep)
        start = min(max(c - len(t) // 2, 0), width - len(t))
        if start > last_end + 1:
            label_row[start:start + len(t)] = list(t)
            last_end = start + len(t) - 1
    lines.append("".join(axis_row))
    lines.append("".join(label_row).rstrip())
    if x_label:
        lines.append(f"{x_label:^{width}}".rstrip()[:width])
    return lines
