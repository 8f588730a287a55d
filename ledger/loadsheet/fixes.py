"""Ways to bring an out-of-limits load within limits, each re-checked before it is shown.

Options, sized with :mod:`ledger.core.corrections` (and :mod:`ledger.core.ground` for axles):

- **shift**: move cargo from one station to another (``shift_mass``, FAA-H-8083-25 ch. 9:
  Δm / M = ΔCG / (arm_to − arm_from)), also to clear a station or floor over its limit;
- **ballast**: add ballast at a ballast station the type has (``ballast_mass``,
  FAA-H-8083-30 ch. 4);
- **offload_payload**: take cargo off a station (``offload_for_mass_limit``,
  ``offload_for_cg_limit``), or leave a passenger off;
- **offload_fuel**: load less fuel, never less than the taxi and trip fuel;
- **move_load** (ground vehicles): move the load within its load area, forward or aft
  (``axle_overload_fix``).

Every option is applied to the plan and the whole sheet is built again
(:func:`ledger.loadsheet.build.build_sheet` without fixes); only options whose rebuilt sheet is
in limits are returned (``rechecked`` and ``in_limits_after`` are then both true). An amount
that a first estimate leaves a hair short (a sloped envelope edge moves with the mass, the CG
path while fuel burns) is grown from the rebuilt sheet a few times before the option is given
up. Amounts are rounded up to the display resolution, so the figure shown is the figure that
was checked.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from ledger.errors import InputError
from ledger.loadsheet.text import length_text, mass_text

__all__ = ["find_fixes", "MAX_FIXES"]

MAX_FIXES = 6
_ITERATIONS = 5


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


def _cg_problems(doc: dict) -> list[_CgProblem]:
    from ledger.core.envelope import margins

    out = []
    for v in doc["violations"]:
        if v["code"] == "envelope" and v.get("side") in _SIDE_DIR:
            phase = next(p for p in doc["phases"] if p["name"] == v["phase"])
            axis = "y" if v["axis"] == "lateral" else "x"
            out.append(_CgProblem(phase["mass_kg"], phase["cg_m"][axis], v["limit"], axis,
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


def _mass_excess(doc: dict, phases=None) -> float:
    worst = 0.0
    for v in doc["violations"]:
        if v["code"] in ("mass_limit", "gross") and v["subject"] != "minimum flight mass" \
                and (phases is None or v["phase"] in phases):
            worst = max(worst, v["excess"])
    return worst


def _station_excess(doc: dict, station: str) -> float:
    worst = 0.0
    for v in doc["violations"]:
        if v.get("station") != station:
            continue
        if v["code"] == "station_limit":
            worst = max(worst, v["excess"])
        elif v["code"] == "floor_loading":
            st = next(s for s in doc["stations"] if s["station"] == station)
            area = st["mass_kg"] / st["floor_loading_kg_m2"] if st["floor_loading_kg_m2"] else 0
            worst = max(worst, v["excess"] * area)
    return worst


def _needs_other(doc: dict, handled: set[str]) -> bool:
    """Whether the document has a violation of a kind the option does not address."""
    return any(v["code"] not in handled for v in doc["violations"])


# --- the options ------------------------------------------------------------------------------

@dataclass
class _Option:
    kind: str
    size: Callable[[dict], float | None]       # more amount needed, from a sheet
    apply: Callable[[float], object]           # the plan with this amount
    describe: Callable[[float], str]
    limit: float                               # the most this option can take
    resolution: float
    extra: Callable[[float], dict]
    fixed: float | None = None                 # an all-or-nothing amount (a whole person)


class _Finder:
    def __init__(self, vtype, plan, doc, rebuild):
        self.t = vtype
        self.du = vtype.units
        self.plan = plan
        self.doc = doc
        self.rebuild = rebuild
        from ledger.units import from_unit

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
    def shift_need(self, doc, a_from: str, a_to: str, axis_filter=None) -> float | None:
        from ledger.core.corrections import shift_mass

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

    def ballast_need(self, doc, station: str) -> float | None:
        from ledger.core.corrections import ballast_mass

        if _needs_other(doc, {"envelope", "burn_path"}):
            return None
        need = 0.0
        for p in _cg_problems(doc):
            arm = self.arm(station, p.axis)
            if (arm - p.limit) * p.direction <= 0:
                return None
            need = max(need, float(ballast_mass(p.mass, p.cg, p.limit, arm)))
        return need

    def offload_need(self, doc, station: str) -> float | None:
        from ledger.core.corrections import offload_for_cg_limit, offload_for_mass_limit

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

    def fuel_need(self, doc) -> float | None:
        if _needs_other(doc, {"mass_limit", "gross", "axle", "envelope", "burn_path"}):
            return None
        if _mass_excess(doc, ("zero_fuel",)) > 0:
            return None
        return _mass_excess(doc, ("ramp", "takeoff", "landing", "departure", "arrival"))

    def axle_offload_need(self, doc, station: str) -> float | None:
        from ledger.core.ground import axle_loads
        from ledger.loadsheet.axles import supports

        axles, groups, shares = supports(self.t)
        ax = np.array([a.x_m for a in axles])
        x = self.arm(station, "x")
        try:
            frac = axle_loads(1.0, x, ax, groups=groups, shares=shares).axle
        except InputError:
            return None
        need = 0.0
        for v in doc["violations"]:
            if v["code"] != "axle":
                continue
            idx = [i for i, a in enumerate(axles) if a.name == v.get("axle")]
            if not idx or frac[idx[0]] <= 0:
                return None
            need = max(need, v["excess"] / float(frac[idx[0]]))
        return need

    def move_need(self, doc, station: str) -> float | None:
        """Signed distance (m, + aft) to move the load in a load area to clear the axles."""
        from ledger.core.ground import axle_overload_fix
        from ledger.loadsheet.axles import supports

        if _needs_other(doc, {"axle"}):
            return None
        axles, groups, shares = supports(self.t)
        cargo = self.cargo_at(station)
        if cargo <= 0:
            return None
        ratings = [a.rating_kg if a.rating_kg is not None else math.nan for a in axles]
        worst = 0.0
        for p in doc["phases"]:
            fix = axle_overload_fix(p["mass_kg"], p["cg_m"]["x"], [a.x_m for a in axles],
                                    ratings, payload_mass=cargo, groups=groups,
                                    shares=shares)
            if fix.needed and not fix.feasible:
                return None
            if fix.needed and abs(fix.distance) > abs(worst):
                if worst and np.sign(fix.distance) != np.sign(worst):
                    return None
                worst = fix.distance
        return worst

    def move_size(self, doc, station: str, sign: float) -> float | None:
        d = self.move_need(doc, station)
        if d is None or (d and math.copysign(1.0, d) != sign):
            return None
        return abs(d)

    # --- options -----------------------------------------------------------------------------
    def options(self) -> list[_Option]:
        doc = self.doc
        du = self.du
        opts: list[_Option] = []
        cg_probs = _cg_problems(doc)
        stations = self.cargo_stations()
        loaded = [s for s in stations if self.cargo_at(s.name) > 0]
        ground = self.t.kind == "ground_vehicle"

        def extra_shift(a, b):
            return lambda m: {"mass_kg": m, "from_station": a, "to_station": b}

        for a in loaded:
            for b in stations:
                if b.name == a.name:
                    continue
                if self.shift_need(doc, a.name, b.name) is None:
                    continue
                opts.append(_Option(
                    "shift",
                    size=lambda d, a=a.name, b=b.name: self.shift_need(d, a, b),
                    apply=lambda m, a=a.name, b=b.name: self.plan.with_cargo(a, -m)
                    .with_cargo(b, m),
                    describe=lambda m, a=a.name, b=b.name:
                        f"Move {mass_text(m, du)} of cargo from '{a}' to '{b}'",
                    limit=min(self.cargo_at(a.name), self.room(b.name)),
                    resolution=self.mass_res, extra=extra_shift(a.name, b.name)))
        if cg_probs:
            for c in self.t.stations:
                if c.kind != "ballast" or self.ballast_need(doc, c.name) is None:
                    continue
                opts.append(_Option(
                    "ballast", size=lambda d, c=c.name: self.ballast_need(d, c),
                    apply=lambda m, c=c.name: self.plan.with_cargo(c, m, "ballast"),
                    describe=lambda m, c=c.name:
                        f"Add {mass_text(m, du)} of ballast at '{c}'",
                    limit=self.room(c.name), resolution=self.mass_res,
                    extra=lambda m, c=c.name: {"mass_kg": m, "from_station": None,
                                               "to_station": c}))
        for s in loaded:
            if self.offload_need(doc, s.name) is None:
                continue
            opts.append(_Option(
                "offload_payload", size=lambda d, s=s.name: self.offload_need(d, s),
                apply=lambda m, s=s.name: self.plan.with_cargo(s, -m),
                describe=lambda m, s=s.name: f"Offload {mass_text(m, du)} of cargo from '{s}'",
                limit=self.cargo_at(s.name), resolution=self.mass_res,
                extra=lambda m, s=s.name: {"mass_kg": m, "from_station": s,
                                           "to_station": None}))
        if cg_probs:
            for p in self.plan.persons:
                if self.station(p.seat).kind != "passenger":
                    continue
                for seat in self.free_seats():
                    if seat.name == p.seat:
                        continue
                    opts.append(_Option(
                        "shift", size=lambda d: None,
                        apply=lambda m, frm=p.seat, to=seat.name: _moved_person(self.plan,
                                                                                frm, to),
                        describe=lambda m, frm=p.seat, to=seat.name, pm=p.mass_kg:
                            f"Move the passenger in seat '{frm}' ({mass_text(pm, du)}) to "
                            f"seat '{to}'",
                        limit=p.mass_kg, resolution=self.mass_res,
                        extra=lambda m, frm=p.seat, to=seat.name: {
                            "mass_kg": m, "from_station": frm, "to_station": to},
                        fixed=p.mass_kg))
        weighty = bool(cg_probs) or _mass_excess(doc) > 0
        for p in (self.plan.persons if weighty else ()):
            st = self.station(p.seat)
            if st.kind != "passenger":
                continue
            opts.append(_Option(
                "offload_payload", size=lambda d: None,
                apply=lambda m, seat=p.seat: _without_person(self.plan, seat),
                describe=lambda m, seat=p.seat, pm=p.mass_kg:
                    f"Leave the passenger in seat '{seat}' ({mass_text(pm, du)}) off",
                limit=p.mass_kg, resolution=self.mass_res,
                extra=lambda m, seat=p.seat: {"mass_kg": m, "from_station": seat,
                                              "to_station": None},
                fixed=p.mass_kg))
        spare = self.plan.fuel_kg - self.plan.taxi_fuel_kg - self.plan.trip_fuel_kg
        if self.plan.tanks and spare > 0 and self.fuel_need(doc):
            opts.append(_Option(
                "offload_fuel", size=self.fuel_need, apply=self.less_fuel,
                describe=self.describe_fuel, limit=spare, resolution=self.mass_res,
                extra=lambda m: {"mass_kg": m, "from_station": None, "to_station": None,
                                 "tanks_kg": self.fuel_split(m)}))
        if ground:
            for s in loaded:
                if s.extent is None:
                    continue
                d0 = self.move_need(doc, s.name)
                if not d0:
                    continue
                sign = math.copysign(1.0, d0)
                opts.append(_Option(
                    "move_load",
                    size=lambda d, s=s.name, sign=sign: self.move_size(d, s, sign),
                    apply=lambda dist, s=s, sign=sign: self.plan.with_cargo_moved(
                        s.name, sign * dist, s.x_m),
                    describe=lambda dist, s=s, sign=sign: self.describe_move(s, sign * dist),
                    limit=self.move_room(s, sign), resolution=self.length_res,
                    extra=lambda dist, s=s, sign=sign: {
                        "mass_kg": self.cargo_at(s.name), "from_station": s.name,
                        "to_station": s.name, "distance_m": sign * dist}))
        return opts

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

    def fuel_split(self, m: float) -> dict:
        total = self.plan.fuel_kg
        return {t.tank: m * t.mass_kg / total for t in self.plan.tanks if t.mass_kg > 0}

    def less_fuel(self, m: float):
        plan = self.plan
        for tank, dm in self.fuel_split(m).items():
            plan = plan.with_tank_mass(tank, plan.tank_load(tank).mass_kg - dm)
        return plan

    def describe_fuel(self, m: float) -> str:
        du = self.du
        parts = ", ".join(f"{t} {mass_text(dm, du)}" for t, dm in self.fuel_split(m).items())
        left = self.plan.fuel_kg - m
        burn = self.plan.taxi_fuel_kg + self.plan.trip_fuel_kg
        return (f"Load {mass_text(m, du)} less fuel ({parts}); {mass_text(left, du)} remains "
                f"for {mass_text(burn, du)} of taxi and trip fuel")

    # --- trying an option ----------------------------------------------------------------------
    def attempt(self, opt: _Option):
        if opt.fixed is not None:
            amounts = [opt.fixed]
        else:
            first = opt.size(self.doc)
            if first is None or first <= 0:
                return None
            amounts = [self.up(first, opt.resolution)]
        amount = amounts[0]
        for _ in range(_ITERATIONS):
            if amount > opt.limit * (1 + 1e-9) + 1e-12:
                return None
            try:
                plan = opt.apply(amount)
                after = self.rebuild(plan)
            except (InputError, ValueError):
                return None
            if after["verdict"] == "in_limits":
                return amount, after
            if opt.fixed is not None:
                return None
            more = opt.size(after)
            if more is None or more <= 0:
                return None
            amount = self.up(amount + more, opt.resolution)
        return None


def _moved_person(plan, frm: str, to: str):
    from dataclasses import replace

    out, moved = [], False
    for p in plan.persons:
        if p.seat == frm and not moved:
            p, moved = replace(p, seat=to), True
        out.append(p)
    return replace(plan, persons=tuple(out))


def _without_person(plan, seat: str):
    from dataclasses import replace

    kept, dropped = [], False
    for p in plan.persons:
        if p.seat == seat and not dropped:
            dropped = True
            continue
        kept.append(p)
    return replace(plan, persons=tuple(kept))


def _fix_doc(opt: _Option, amount: float, after: dict) -> dict:
    return {"kind": opt.kind, "description": opt.describe(amount), **opt.extra(amount),
            "rechecked": True, "in_limits_after": after["verdict"] == "in_limits",
            "after": {"verdict": after["verdict"],
                      "phases": [{"name": p["name"], "mass_kg": p["mass_kg"],
                                  "cg_m": p["cg_m"]} for p in after["phases"]]}}


_ORDER = ["shift", "move_load", "ballast", "offload_payload", "offload_fuel", "combined"]
_PAIR_FIRSTS = 8


def _pairs(finder: _Finder, options: list[_Option]) -> list[dict]:
    """Two changes together, when no single one is enough: the first at the amount its own
    sizing asks for (or all it can take), the second found on the sheet after the first."""
    out = []
    for first in options[:_PAIR_FIRSTS]:
        if first.fixed is not None:
            amount = first.fixed
        else:
            need = first.size(finder.doc)
            if need is None or need <= 0:
                continue
            amount = min(finder.up(need, first.resolution), first.limit)
            if amount <= 0:
                continue
        try:
            plan1 = first.apply(amount)
            doc1 = finder.rebuild(plan1)
        except (InputError, ValueError):
            continue
        if doc1["verdict"] == "in_limits":
            continue  # found as a single option already (or nearly); not a pair
        sub = _Finder(finder.t, plan1, doc1, finder.rebuild)
        for second in sub.options():
            if second.kind == first.kind and second.extra(0.0).get("from_station") == \
                    first.extra(0.0).get("from_station"):
                continue
            result = sub.attempt(second)
            if result is None:
                continue
            amount2, after = result
            a, b = first.describe(amount), second.describe(amount2)
            out.append({"kind": "combined", "description": f"{a}, and {b[0].lower()}{b[1:]}",
                        "mass_kg": first.extra(amount).get("mass_kg", 0.0)
                        + second.extra(amount2).get("mass_kg", 0.0),
                        "from_station": None, "to_station": None,
                        "steps": [{"kind": first.kind, "description": a,
                                   **first.extra(amount)},
                                  {"kind": second.kind, "description": b,
                                   **second.extra(amount2)}],
                        "rechecked": True, "in_limits_after": True,
                        "after": _fix_doc(second, amount2, after)["after"]})
            break
        if len(out) >= MAX_FIXES:
            break
    return out


def find_fixes(vtype, plan, doc: dict, rebuild: Callable) -> tuple[list[dict], str]:
    """Options that bring the load within limits, each re-checked; and a note saying so.

    Parameters
    ----------
    vtype, plan
        As given to :func:`ledger.loadsheet.build.build_sheet`.
    doc : dict
        The out-of-limits document.
    rebuild : callable
        ``rebuild(changed_plan) -> document`` (the sheet built again, without fixes).

    Returns
    -------
    (list of dict, str)
        The document's ``fixes`` and ``fixes_note``. When no single change is enough, pairs
        of changes are tried (``kind`` ``"combined"`` with its ``steps``).
    """
    finder = _Finder(vtype, plan, doc, rebuild)
    options = finder.options()
    found = []
    for opt in options:
        result = finder.attempt(opt)
        if result is not None:
            found.append(_fix_doc(opt, *result))
    if not found:
        found = _pairs(finder, options)
    found.sort(key=lambda f: (_ORDER.index(f["kind"]), f["mass_kg"] or 0.0))
    shown = found[:MAX_FIXES]
    if shown:
        alone = "on its own" if shown[0]["kind"] != "combined" else \
            "with both of its changes (no single change was enough)"
        note = ("Each option below was re-checked by building the whole sheet again with the "
                f"change applied: {alone} it brings every phase, every station and the "
                "fuel-burn path within limits. Only options that do are shown.")
    elif options:
        note = (f"None of the {len(options)} changes tried (moving cargo, ballast, offloading "
                "payload or fuel, alone or two together) brings the load within limits when "
                "re-checked; change the plan.")
    else:
        note = ("No change could be proposed for these violations (nothing to move or "
                "offload); change the plan.")
    return shown, note
