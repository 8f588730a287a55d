"""The envelope charts of a loading sheet in display units (:class:`ChartData`): the outline,
each phase's CG by its letter, the fuel-burn path and where it first leaves the envelope.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING

from ledger.report.sheet_format import number
from ledger.units import fixed, to_unit

if TYPE_CHECKING:
    from ledger.report.sheet_view import SheetView

__all__ = ["ChartData", "LIMIT_LINES", "PHASE_MARKS", "charts", "mass_lines_legend"]

PHASE_MARKS = {"zero_fuel": "Z", "ramp": "R", "takeoff": "T", "landing": "L",
               "departure": "D", "arrival": "A"}
#: The mass limits a chart draws as horizontal lines (issue 13 item 1), by phase.
LIMIT_LINES = {"zero_fuel": "max. zero-fuel", "takeoff": "max. take-off",
               "landing": "max. landing"}


@dataclass
class ChartData:
    """One envelope chart in display units."""

    title: str
    x_label: str
    y_label: str
    polygon: list[tuple[float, float]]
    points: list[tuple[float, float, str]]
    path: list[tuple[float, float]]
    exits: list[tuple[float, float]]
    legend: list[str]
    """One line per phase point: mark, phase, mass, CG, inside or not."""
    axis: str = "longitudinal"
    exit_note: str | None = None
    """Where the burn path first leaves the envelope, if it does."""
    mass_lines: list[tuple[float, str]] = field(default_factory=list)
    """The phases' mass limits drawn across the chart: (mass in display units, short name)."""


def charts(view: SheetView) -> list[ChartData]:
    """One chart per envelope polygon of the document."""
    d = view.doc
    bp = d.get("burn_path") or {}
    exits = {(e.get("name"), e.get("axis") or "longitudinal"): e.get("first_exit")
             for e in bp.get("envelopes") or []}
    out = []
    for poly in d.get("envelope_polygons") or []:
        ax = _Axes(view, poly.get("axis") or "longitudinal", poly.get("coordinates") or "arm")
        points, legend = _phase_points(ax, poly, d.get("phases") or [])
        ex, exit_note = _path_exit(ax, poly, bp, exits.get((poly.get("name"), ax.axis)))
        name = poly.get("name") or poly.get("category") or "envelope"
        lines = _mass_lines(ax, d.get("phases") or []) if ax.axis != "lateral" else []
        out.append(ChartData(f"Envelope {name}, {ax.axis}", ax.x_label(),
                             f"mass ({view.mass_unit})", ax.polygon(poly), points,
                             ax.path(bp.get("points") or []), ex, legend, ax.axis, exit_note,
                             lines))
    return out


def _mass_lines(ax: _Axes, phases: list) -> list[tuple[float, str]]:
    """The maximum zero-fuel, take-off and landing masses (those the type gives), lowest
    first; one line, with both names, where two limits are equal."""
    by_mass: dict[float, list[str]] = {}
    for p in phases:
        short = LIMIT_LINES.get(str(p.get("name")))
        limit = number(p.get("mass_limit_kg"))
        if short and limit is not None:
            by_mass.setdefault(round(ax.y(limit), 9), []).append(short)
    return [(m, " and ".join(names)) for m, names in sorted(by_mass.items())]


def mass_lines_legend(chart: ChartData, view: SheetView) -> str | None:
    """One legend line for the mass-limit lines: "max. zero-fuel 1500.0 lb, …"."""
    if not chart.mass_lines:
        return None
    return ", ".join(f"{name} {fixed(m, view.mass_decimals)} {view.mass_unit}"
                     for m, name in chart.mass_lines)


class _Axes:
    """The chart's axes for one envelope: x is an arm or a moment index, y the mass."""

    def __init__(self, view: SheetView, axis: str, coords: str):
        self.view = view
        self.axis = axis
        self.coords = coords
        self.key = "y" if axis == "lateral" else "x"
        self.pkey = "cg_y_m" if axis == "lateral" else "cg_x_m"

    def x(self, cg_m, mass_kg, moment_kgm=None) -> float | None:
        """The x of a state: its CG in the display length, or its moment index."""
        if self.coords == "moment":
            if moment_kgm is None:
                if cg_m is None or mass_kg is None:
                    return None
                moment_kgm = cg_m * mass_kg
            return self.view.du.moment_index(moment_kgm)
        return None if cg_m is None else to_unit(cg_m, self.view.length_unit)

    def y(self, mass_kg: float) -> float:
        return to_unit(mass_kg, self.view.mass_unit)

    def polygon(self, poly: dict) -> list[tuple[float, float]]:
        mu, lu = self.view.mass_unit, self.view.length_unit
        if self.coords == "moment":
            return [(self.view.du.moment_index(float(x)), to_unit(float(m), mu))
                    for x, m in poly.get("points") or []]
        return [(to_unit(float(x), lu), to_unit(float(m), mu))
                for x, m in poly.get("points") or []]

    def path(self, path_pts: list) -> list[tuple[float, float]]:
        """The burn path's states."""
        path = []
        mkey = "moment_y_kgm" if self.axis == "lateral" else "moment_x_kgm"
        for q in path_pts:
            m, c = number(q.get("mass_kg")), number(q.get(self.pkey))
            x = self.x(c, m, number(q.get(mkey)))
            if x is not None and m is not None:
                path.append((x, self.y(m)))
        return path

    def x_label(self) -> str:
        du, lu = self.view.du, self.view.length_unit
        if self.coords == "moment":
            return f"moment index ({du.moment_unit}" + (
                f" / {du.moment_divisor:g})" if du.moment_divisor != 1 else ")")
        if self.axis == "lateral":
            return f"lateral CG ({lu}, + right)"
        return f"CG arm ({lu} from datum, + aft)"


def _phase_points(ax: _Axes, poly: dict, phases: list,
                  ) -> tuple[list[tuple[float, float, str]], list[str]]:
    """Each phase's point (x, mass, letter) and its legend line."""
    view, axis = ax.view, ax.axis
    mu, lu = view.mass_unit, view.length_unit
    points, legend = [], []
    for p in phases:
        name = str(p.get("name"))
        mass = number(p.get("mass_kg"))
        cg = number((p.get("cg_m") or {}).get(ax.key))
        mom = number((p.get("moment_kgm") or {}).get(ax.key))
        x = ax.x(cg, mass, mom)
        if x is None or mass is None:
            continue
        mark = PHASE_MARKS.get(name, name[:1].upper() or "?")
        points.append((x, ax.y(mass), mark))
        state = ", not an envelope phase" if not p.get("envelopes") and any(
            q.get("envelopes") for q in phases) else ""
        for e in p.get("envelopes") or []:
            if e.get("name") == poly.get("name") and \
                    (e.get("axis") or "longitudinal") == axis:
                state = ", inside" if e.get("inside") else ", OUTSIDE"
        over = view.over_mass_limit(p)
        if over:  # the verdict counts it: the legend must not read as "inside" alone
            state = (", CG inside the envelope" if state == ", inside" else state) + \
                f", OVER {over}"
        where = (f"index {view.index(mom if mom is not None else cg * mass)}"
                 if ax.coords == "moment" else
                 f"{'lat. ' if axis == 'lateral' else ''}CG "
                 f"{view.length(cg, signed=axis == 'lateral')} {lu}")
        legend.append(f"{mark} {view.phase_label(p)}: {view.mass(mass)} {mu}, "
                      f"{where}{state}")
    return points, legend


def _path_exit(ax: _Axes, poly: dict, bp: dict, first: dict | None,
               ) -> tuple[list[tuple[float, float]], str | None]:
    """Where the burn path first leaves the envelope (as a point and a note), if it does."""
    # Mark where the path leaves only if it starts inside: a take-off already
    # outside is its own violation, and "leaves" would mislead.
    start = ax.view.phase(str(bp.get("from") or "takeoff")) or {}
    for e in start.get("envelopes") or []:
        if e.get("name") == poly.get("name") and \
                (e.get("axis") or "longitudinal") == ax.axis and not e.get("inside"):
            first = None
    ex = []
    if first:
        m, c = number(first.get("mass_kg")), number(first.get(ax.pkey))
        x = ax.x(c, m)
        if x is not None and m is not None:
            ex.append((x, ax.y(m)))
    if not ex:
        return ex, None
    assert first is not None
    return ex, (f"the burn path leaves this envelope at "
                f"{ax.view.mass(first.get('mass_kg'))} {ax.view.mass_unit}")
