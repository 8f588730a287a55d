"""The changes a fix may propose, each sized for the limits a sheet exceeds.

Internal to :mod:`ledger.loadsheet.fixes`, which tries them. A :class:`FixFinder` reads what
is wrong from an out-of-limits document (CG problems, masses over a limit, stations over
theirs) and lists every :class:`FixOption` that could help: move cargo (``shift``), add
ballast, offload payload or fuel, move a passenger, move the load in a load area of a ground
vehicle. Each option can size itself again from any rebuilt sheet, which is how an amount that
falls a hair short is grown. Sizing uses :mod:`ledger.core.corrections` and
:mod:`ledger.core.ground`.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, replace
from typing import TYPE_CHECKING, Any, Literal, TypeAlias, cast

import numpy as np

from ledger.core.corrections import (
    ballast_mass,
    offload_for_cg_limit,
    offload_for_mass_limit,
    shift_mass,
)
from ledger.core.envelope import margins
from ledger.core.ground import axle_loads, axle_overload_fix
from ledger.errors import InputError
from ledger.loadsheet.axles import supports
from ledger.loadsheet.document import SheetDocument
from ledger.loadsheet.text import length_text, mass_text
from ledger.units import from_unit

if TYPE_CHECKING:
    from ledger.typedata.model import Axle, Station, VehicleType
    from ledger.typedata.plan import Plan

__all__ = ["FixOption", "FixFinder", "Rebuild"]

#: ``rebuild(changed_plan) -> document``: the sheet built again, without fixes.
Rebuild: TypeAlias = "Callable[[Plan], SheetDocument]"


# --- what is wrong, read back from a document ---------------------------------------------------

@dataclass(frozen=True)
class _CgProblem:
    """A state whose CG is beyond a limit on one axis: needs moment Δ in ``direction``."""

    mass: float
    cg: float
    limit: float
    axis: str        # "x" or "y"
    direction: int   # -1: the CG must move to smaller arms (forward / left); +1: larger


_SIDE_DIR = {"aft": -1, "right": -1, "forward": +1, "left": +1}


def _known(value: float | None) -> float:
    """A figure the violation's code or the phase always carries (``excess``, a CG)."""
    return cast(float, value)


def _cg_problems(doc: SheetDocument) -> list[_CgProblem]:
    """Every CG beyond a side limit, at a phase or (the worst state) on the burn path."""
    out = []
    for v in doc["violations"]:
        if v["code"] == "envelope" and v.get("side") in _SIDE_DIR:
            phase = next(p for p in doc["phases"] if p["name"] == v["phase"])
            axis: Literal["x", "y"] = "y" if v["axis"] == "lateral" else "x"
            out.append(_CgProblem(phase["mass_kg"], _known(phase["cg_m"][axis]),
                                  _known(v["limit"]), axis,
                                  _SIDE_DIR[v["side"]]))
    bp = doc.get("burn_path") or {}
    polys = {(e["name"], e["axis"]): e for e in doc.get("envelope_polygons") or []}
    pts = bp.get("points") or []
    for res in bp.get("envelopes") or []:
        if res["inside"] or not pts:
            continue
        env = polys.get((res["name"], res["axis"]))
        if env is None:
            continue
        axis = "y" if env["axis"] == "lateral" else "x"
        m = np.array([p["mass_kg"] for p in pts])
        cg = np.array([p["cg_y_m" if axis == "y" else "cg_x_m"] for p in pts])
        coord = cg * m if env["coordinates"] == "moment" else cg
        r = margins(np.asarray(env["points"], dtype=float), coord, m)
        scale = m if env["coordinates"] == "moment" else np.ones_like(m)
        to_fwd = np.asarray(r.to_fwd, dtype=float) / scale
        to_aft = np.asarray(r.to_aft, dtype=float) / scale
        for arr, lim, direction in ((to_fwd, np.asarray(r.fwd_limit) / scale, +1),
                                    (to_aft, np.asarray(r.aft_limit) / scale, -1)):
            bad = np.isfinite(arr) & (arr < 0) & ~np.asarray(r.inside, dtype=bool)
            if bad.any():
                need = np.where(bad, -arr * m, 0.0)
                i = int(np.argmax(need))
                out.append(_CgProblem(float(m[i]), float(cg[i]), float(lim[i]), axis,
                                      direction))
    return out


def _mass_excess(doc: SheetDocument, phases: tuple[str, ...] | None = None) -> float:
    worst = 0.0
    for v in doc["violations"]:
        if v["code"] in ("mass_limit", "gross") and v["subject"] != "minimum flight mass" \
                and (phases is None or v["phase"] in phases):
            worst = max(worst, _known(v["excess"]))
    return worst


def _station_excess(doc: SheetDocument, station: str) -> float:
    worst = 0.0
    for v in doc["violations"]:
        if v.get("station") != station:
            continue
        if v["code"] == "station_limit":
            worst = max(worst, _known(v["excess"]))
        elif v["code"] == "floor_loading":
            st = next(s for s in doc["stations"] if s["station"] == station)
            area = st["mass_kg"] / st["floor_loading_kg_m2"] if st["floor_loading_kg_m2"] else 0
            worst = max(worst, _known(v["excess"]) * area)
    return worst


def _needs_other(doc: SheetDocument, handled: set[str]) -> bool:
    """Whether the document has a violation of a kind the option does not address."""
    return any(v["code"] not in handled for v in doc["violations"])


# --- the options ------------------------------------------------------------------------------

@dataclass
class FixOption:
    kind: str
    size: Callable[[SheetDocument], float | None]       # more amount needed, from a sheet
    apply: Callable[[float], Plan]           # the plan with this amount
    describe: Callable[[float], str]
    limit: float                               # the most this option can take
    resolution: float
    extra: Callable[[float], dict[str, Any]]
    fixed: float | None = None                 # an all-or-nothing amount (a whole person)


class FixFinder:
    def __init__(self, vtype: VehicleType, plan: Plan, doc: SheetDocument,
                 rebuild: Rebuild) -> None:
        self.t = vtype
        self.du = vtype.units
        self.plan = plan
        self.doc = doc
        self.rebuild = rebuild
        top = vtype.limits.max_takeoff_kg or vtype.limits.gross_rating_kg or 1000.0
        shown = top / from_unit(1.0, self.du.mass)
        self.mass_res = from_unit(min(1.0, 10.0 ** math.floor(math.log10(shown / 1000.0))),
                                  self.du.mass) if shown > 0 else from_unit(1.0, self.du.mass)
        self.length_res = {"in": from_unit(0.1, "in"), "m": 0.01, "mm": 0.001, "cm": 0.001,
                           "ft": from_unit(0.01, "ft")}.get(self.du.length, 0.001)

    # --- helpers -----------------------------------------------------------------------------
    def up(self, amount: float, res: float) -> float:
        return math.ceil(amount / res - 1e-9) * res

    def station(self, name):
        return self.t.station(name)

    def cargo_at(self, name: str) -> float:
        return math.fsum(c.mass_kg for c in self.plan.cargo if c.station == name)

    def arm(self, name: str, axis: str, plan=None) -> float:
        st = self.station(name)
        if axis == "y":
            return st.y_m
        plan = plan or self.plan
        loads = [c for c in plan.cargo if c.station == name]
        mass = math.fsum(c.mass_kg for c in loads)
        if mass > 0 and any(c.x_m is not None for c in loads):
            return math.fsum(c.mass_kg * (st.x_m if c.x_m is None else c.x_m)
                             for c in loads) / mass
        return st.x_m

    def room(self, name: str) -> float:
        st = self.station(name)
        if st.max_mass_kg is None:
            return math.inf
        return max(st.max_mass_kg - self.plan.station_mass_kg(name), 0.0)

    def cargo_stations(self):
        return [s for s in self.t.stations if not s.is_seat and s.kind != "ballast"
                and s.name not in self._disabled()]

    def _disabled(self):
        for c in self.t.configurations:
            if c.name == self.plan.configuration:
                return c.disables_stations
        return ()

    # --- sizing ------------------------------------------------------------------------------
    def shift_need(self, doc: SheetDocument, a_from: str, a_to: str,
                   axis_filter: str | None = None) -> float | None:
        need = _station_excess(doc, a_from)
        for p in _cg_problems(doc):
            if axis_filter and p.axis != axis_filter:
                continue
            xf, xt = self.arm(a_from, p.axis), self.arm(a_to, p.axis)
            if (xt - xf) * p.direction <= 0:
                return None  # this move pushes the CG the wrong way (or not at all)
            need = max(need, float(shift_mass(p.mass, p.cg, p.limit, xf, xt)))
        if _needs_other(doc, {"envelope", "burn_path", "station_limit", "floor_loading"}):
            return None
        return need

    def ballast_need(self, doc: SheetDocument, station: str) -> float | None:
        if _needs_other(doc, {"envelope", "burn_path"}):
            return None
        need = 0.0
        for p in _cg_problems(doc):
            arm = self.arm(station, p.axis)
            if (arm - p.limit) * p.direction <= 0:
                return None
            need = max(need, float(ballast_mass(p.mass, p.cg, p.limit, arm)))
        return need

    def offload_need(self, doc: SheetDocument, station: str) -> float | None:
        need = _station_excess(doc, station)
        for v in doc["violations"]:
            if v["code"] in ("mass_limit", "gross") and v["subject"] != "minimum flight mass":
                need = max(need, float(offload_for_mass_limit(v["actual"], v["limit"])))
        for p in _cg_problems(doc):
            arm = self.arm(station, p.axis)
            if (arm - p.cg) * p.direction >= 0:
                return None  # removing weight there moves the CG the wrong way
            need = max(need, float(offload_for_cg_limit(p.mass, p.cg, p.limit, arm)))
        if _needs_other(doc, {"envelope", "burn_path", "station_limit", "floor_loading",
                              "mass_limit", "gross", "axle"}):
            return None
        if any(v["code"] == "axle" for v in doc["violations"]):
            need = max(need, self.axle_offload_need(doc, station) or 0.0)
        return need

    def fuel_need(self, doc: SheetDocument) -> float | None:
        if _needs_other(doc, {"mass_limit", "gross", "axle", "envelope", "burn_path"}):
            return None
        if _mass_excess(doc, ("zero_fuel",)) > 0:
            return None
        return _mass_excess(doc, ("ramp", "takeoff", "landing", "departure", "arrival"))

    def axle_limits(self) -> tuple[list[Axle], list[list[int]] | None,
                                   list[list[float]] | None, list[float]]:
        """The supports as :func:`supports` gives them, and each axle's effective rating.

        An axle group's rating limits the group's load; inside the group axle ``i`` carries
        ``share_i`` of it (lever rule: the group acts as one support), so the group rating is
        the axle rating ``share_i × rating_group``. The effective rating is the smaller of that
        and the axle's own (``nan`` where neither is given), so every axle and group limit the
        checks report is one the sizing clears.
        """
        axles, groups, shares = supports(self.t)
        ratings = [a.rating_kg if a.rating_kg is not None else math.nan for a in axles]
        index = {a.name: i for i, a in enumerate(axles)}
        for g in self.t.axle_groups:
            if g.rating_kg is None:
                continue
            total = math.fsum(g.load_share)
            for name, share in zip(g.axles, g.load_share):
                i = index[name]
                cap = g.rating_kg * share / total
                ratings[i] = cap if math.isnan(ratings[i]) else min(ratings[i], cap)
        return axles, groups, shares, ratings

    def axle_members(self, name: str | None) -> list[int]:
        """Indices (front to rear) of the axle, or of the axle group's axles, named ``name``."""
        axles = sorted(self.t.axles, key=lambda a: a.x_m)
        group = next((g for g in self.t.axle_groups if g.name == name), None)
        names = set(group.axles) if group is not None else {name}
        return [i for i, a in enumerate(axles) if a.name in names]

    def axle_fractions(self, x: float) -> np.ndarray | None:
        """The load each axle takes from 1 kg at arm ``x`` (lever rule between the two supports;
        behind the rear support the front share is negative), or None if the axles do not
        stand as two supports."""
        axles, groups, shares, _ = self.axle_limits()
        ax = np.array([a.x_m for a in axles])
        units = groups or [[0], [1]]
        weights = shares or [[1.0], [1.0]]
        gx = [math.fsum(s * ax[i] for i, s in zip(u, w)) / math.fsum(w)
              for u, w in zip(units, weights)]
        try:
            front, rear = (axle_loads(1.0, float(g), ax, groups=groups, shares=shares).axle
                           for g in gx)
        except InputError:
            return None
        return cast(np.ndarray, front + (x - gx[0]) / (gx[1] - gx[0]) * (rear - front))

    def axle_offload_need(self, doc: SheetDocument, station: str) -> float | None:
        frac = self.axle_fractions(self.arm(station, "x"))
        if frac is None:
            return None
        need = 0.0
        for v in doc["violations"]:
            if v["code"] != "axle":
                continue
            idx = self.axle_members(v.get("axle"))
            share = float(frac[idx].sum()) if idx else 0.0
            if share <= 0:
                return None
            need = max(need, _known(v["excess"]) / share)
        return need

    def move_need(self, doc: SheetDocument, station: str) -> float | None:
        """Signed distance (m, + aft) to move the load in a load area to clear the axles."""
        if _needs_other(doc, {"axle"}):
            return None
        axles, groups, shares, ratings = self.axle_limits()
        cargo = self.cargo_at(station)
        if cargo <= 0:
            return None
        worst = 0.0
        for p in doc["phases"]:
            fix = axle_overload_fix(p["mass_kg"], _known(p["cg_m"]["x"]), [a.x_m for a in axles],
                                    ratings, payload_mass=cargo, groups=groups,
                                    shares=shares)
            if not fix.needed:
                continue
            if not fix.feasible:
                return None
            d = fix.distance
            assert d is not None  # a feasible fix says how far
            if abs(d) > abs(worst):
                if worst and np.sign(d) != np.sign(worst):
                    return None
                worst = d
        return worst

    def move_size(self, doc: SheetDocument, station: str, sign: float) -> float | None:
        d = self.move_need(doc, station)
        if d is None or (d and math.copysign(1.0, d) != sign):
            return None
        return abs(d)

    # --- options ----------------------------------------------------------------------------
    def options(self) -> list[FixOption]:
        """Every change that could help, in the order they are tried."""
        cg_probs = bool(_cg_problems(self.doc))
        stations = self.cargo_stations()
        loaded = [s for s in stations if self.cargo_at(s.name) > 0]
        opts = [self._shift(a.name, b.name) for a in loaded for b in stations
                if b.name != a.name and self.shift_need(self.doc, a.name, b.name) is not None]
        if cg_probs:
            opts += [self._ballast(c.name) for c in self.t.stations
                     if c.kind == "ballast" and self.ballast_need(self.doc, c.name) is not None]
        opts += [self._offload(s.name) for s in loaded
                 if self.offload_need(self.doc, s.name) is not None]
        if cg_probs:
            opts += [self._move_person(p, seat.name) for p in self.plan.persons
                     if self.station(p.seat).kind == "passenger"
                     for seat in self.free_seats() if seat.name != p.seat]
        if cg_probs or _mass_excess(self.doc) > 0:
            opts += [self._leave_off(p) for p in self.plan.persons
                     if self.station(p.seat).kind == "passenger"]
        spare = self.plan.fuel_kg - self.plan.taxi_fuel_kg - self.plan.trip_fuel_kg
        if self.plan.tanks and spare > 0 and self.fuel_need(self.doc):
            opts.append(self._less_fuel(spare))
        if self.t.kind == "ground_vehicle":
            for s in loaded:
                d0 = self.move_need(self.doc, s.name) if s.extent is not None else None
                if d0:
                    opts.append(self._move_load(s, math.copysign(1.0, d0)))
        return opts

    def _shift(self, a: str, b: str) -> FixOption:
        du = self.du
        return FixOption(
            "shift", size=lambda d: self.shift_need(d, a, b),
            apply=lambda m: self.plan.with_cargo(a, -m).with_cargo(b, m),
            describe=lambda m: f"Move {mass_text(m, du)} of cargo from '{a}' to '{b}'",
            limit=min(self.cargo_at(a), self.room(b)),
            resolution=self.mass_res,
            extra=lambda m: {"mass_kg": m, "from_station": a, "to_station": b})

    def _ballast(self, c: str) -> FixOption:
        du = self.du
        return FixOption(
            "ballast", size=lambda d: self.ballast_need(d, c),
            apply=lambda m: self.plan.with_cargo(c, m, "ballast"),
            describe=lambda m: f"Add {mass_text(m, du)} of ballast at '{c}'",
            limit=self.room(c), resolution=self.mass_res,
            extra=lambda m: {"mass_kg": m, "from_station": None, "to_station": c})

    def _offload(self, s: str) -> FixOption:
        du = self.du
        return FixOption(
            "offload_payload", size=lambda d: self.offload_need(d, s),
            apply=lambda m: self.plan.with_cargo(s, -m),
            describe=lambda m: f"Offload {mass_text(m, du)} of cargo from '{s}'",
            limit=self.cargo_at(s), resolution=self.mass_res,
            extra=lambda m: {"mass_kg": m, "from_station": s, "to_station": None})

    def _move_person(self, p: Any, to: str) -> FixOption:
        du = self.du
        frm, pm = p.seat, p.mass_kg
        return FixOption(
            "shift", size=_no_size,
            apply=lambda m: _moved_person(self.plan, frm, to),
            describe=lambda m: f"Move the passenger in seat '{frm}' ({mass_text(pm, du)}) to "
                               f"seat '{to}'",
            limit=pm, resolution=self.mass_res,
            extra=lambda m: {"mass_kg": m, "from_station": frm, "to_station": to},
            fixed=pm)

    def _leave_off(self, p: Any) -> FixOption:
        du = self.du
        seat, pm = p.seat, p.mass_kg
        return FixOption(
            "offload_payload", size=_no_size,
            apply=lambda m: _without_person(self.plan, seat),
            describe=lambda m: f"Leave the passenger in seat '{seat}' ({mass_text(pm, du)}) off",
            limit=pm, resolution=self.mass_res,
            extra=lambda m: {"mass_kg": m, "from_station": seat, "to_station": None},
            fixed=pm)

    def _less_fuel(self, spare: float) -> FixOption:
        return FixOption(
            "offload_fuel", size=self.fuel_need, apply=self.less_fuel,
            describe=self.describe_fuel, limit=spare, resolution=self.mass_res,
            extra=lambda m: {"mass_kg": m, "from_station": None, "to_station": None,
                             "tanks_kg": self.fuel_split(m)})

    def _move_load(self, s: Station, sign: float) -> FixOption:
        return FixOption(
            "move_load", size=lambda d: self.move_size(d, s.name, sign),
            apply=lambda dist: self.plan.with_cargo_moved(s.name, sign * dist, s.x_m),
            describe=lambda dist: self.describe_move(s, sign * dist),
            limit=self.move_room(s, sign), resolution=self.length_res,
            extra=lambda dist: {"mass_kg": self.cargo_at(s.name), "from_station": s.name,
                                "to_station": s.name, "distance_m": sign * dist})

    def free_seats(self):
        taken: dict[str, int] = {}
        for p in self.plan.persons:
            taken[p.seat] = taken.get(p.seat, 0) + 1
        return [s for s in self.t.stations if s.kind == "passenger"
                and taken.get(s.name, 0) < s.persons and s.name not in self._disabled()]

    def move_room(self, st, direction: float) -> float:
        loads = [c for c in self.plan.cargo if c.station == st.name]
        xs = [st.x_m if c.x_m is None else c.x_m for c in loads]
        if direction > 0:
            return max(st.extent.x_max_m - max(xs), 0.0)
        return max(min(xs) - st.extent.x_min_m, 0.0)

    def describe_move(self, st, dist: float) -> str:
        du = self.du
        where = "aft" if dist > 0 else "forward"
        new_x = self.arm(st.name, "x", self.plan.with_cargo_moved(st.name, dist, st.x_m))
        return (f"Move the load in '{st.name}' {length_text(abs(dist), du)} {where} "
                f"(its CG to {length_text(new_x, du)})")

    def fuel_split(self, m: float) -> dict[str, float]:
        total = self.plan.fuel_kg
        return {t.tank: m * t.mass_kg / total for t in self.plan.tanks if t.mass_kg > 0}

    def less_fuel(self, m: float) -> Plan:
        plan = self.plan
        for tank, dm in self.fuel_split(m).items():
            load = plan.tank_load(tank)
            assert load is not None  # fuel_split names the tanks loaded
            plan = plan.with_tank_mass(tank, load.mass_kg - dm)
        return plan

    def describe_fuel(self, m: float) -> str:
        du = self.du
        parts = ", ".join(f"{t} {mass_text(dm, du)}" for t, dm in self.fuel_split(m).items())
        left = self.plan.fuel_kg - m
        burn = self.plan.taxi_fuel_kg + self.plan.trip_fuel_kg
        return (f"Load {mass_text(m, du)} less fuel ({parts}); {mass_text(left, du)} remains "
                f"for {mass_text(burn, du)} of taxi and trip fuel")


def _no_size(doc: SheetDocument) -> float | None:
    """An all-or-nothing option (a whole person) has no amount to grow."""
    return None


def _moved_person(plan, frm: str, to: str):
    out, moved = [], False
    for p in plan.persons:
        if p.seat == frm and not moved:
            p, moved = replace(p, seat=to), True
        out.append(p)
    return replace(plan, persons=tuple(out))


def _without_person(plan, seat: str):
    kept, dropped = [], False
    for p in plan.persons:
        if p.seat == seat and not dropped:
            dropped = True
            continue
        kept.append(p)
    return replace(plan, persons=tuple(kept))
