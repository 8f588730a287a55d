"""Build the loading-sheet document (``wbledger.sheet/1``) from a type, an empty weight and a plan.

Pure: numbers in, a JSON-able dict out; no database, no terminal, no files. The document's
layout is described in ``docs/sheet-document.md``.

What is computed
----------------
Aircraft: four phases. Zero-fuel = empty weight + configuration + people + cargo; ramp = that
+ the usable fuel loaded; take-off = ramp − taxi fuel; landing = take-off − trip fuel, the fuel
drawn in the plan's burn sequence (:func:`ledger.core.fuel.burn_states`). Each phase has its
mass, CG per axis, moments, moment index and %MAC. Checked:

- each phase's mass limit (maximum zero-fuel, ramp, take-off and landing mass; minimum flight
  mass at take-off and landing);
- every station limit (seats and compartments), the floor loading of a compartment, and every
  tank's usable capacity;
- every envelope of the chosen category, per axis, at zero-fuel, take-off and landing (the ramp
  is a ground phase: its mass limit is checked, not the flight envelope);
- the fuel-burn path from take-off to landing as a whole
  (:func:`ledger.core.envelope.path_inside` over the burn states), so a non-convex envelope
  that the path leaves between its end points is caught.

Ground vehicles: two phases, departure (everything aboard) and arrival (after taxi and trip
fuel), each checked against the gross vehicle rating, with the load on every axle and wheel side
(:func:`ledger.core.ground.axle_loads`) against the axle and axle-group ratings; axle-group
rules of a named rule set (:mod:`ledger.core.ground`) are shown as an advisory.

Limits are inclusive: a CG exactly on an envelope edge, or a mass exactly at its limit, is in
limits. When anything is out of limits, :mod:`ledger.loadsheet.fixes` proposes changes, each
re-checked by building the sheet again with the change applied.
"""

from __future__ import annotations

import datetime as dt
import math
from collections.abc import Iterable, Mapping
from dataclasses import dataclass
from typing import Any

import numpy as np

from ledger.caution import CAUTION, GROUND_CAUTION
from ledger.errors import PlanError
from ledger.loadsheet.text import excess_text, length_text, mass_text, phase_title, volume_text

__all__ = [
    "SCHEMA",
    "EmptyWeight",
    "ConfigurationItem",
    "build_sheet",
    "AIRCRAFT_PHASES",
    "GROUND_PHASES",
]

SCHEMA = "wbledger.sheet/1"
AIRCRAFT_PHASES = ("zero_fuel", "ramp", "takeoff", "landing")
GROUND_PHASES = ("departure", "arrival")
#: Phases whose CG is checked against the flight envelopes.
ENVELOPE_PHASES = ("zero_fuel", "takeoff", "landing")
_LIMIT_NAMES = {"zero_fuel": ("max_zero_fuel_kg", "maximum zero-fuel mass"),
                "ramp": ("max_ramp_kg", "maximum ramp mass"),
                "takeoff": ("max_takeoff_kg", "maximum take-off mass"),
                "landing": ("max_landing_kg", "maximum landing mass")}
_REL = 1e-9  # relative slack for "exactly at the limit" after unit conversions


@dataclass(frozen=True)
class EmptyWeight:
    """The empty vehicle a sheet starts from (the attributes :class:`ledger.store.entries.
    EmptyState` also has, so either can be passed).

    ``mz_kgm`` means something only when ``z_known``.
    """

    mass_kg: float
    mx_kgm: float
    my_kgm: float = 0.0
    mz_kgm: float = 0.0
    z_known: bool = False
    seq: int | None = None
    entry_date: dt.date | str | None = None
    entry_id: int | None = None


@dataclass(frozen=True)
class ConfigurationItem:
    """An item a configuration installs (``action="install"``) or removes (``"remove"``)."""

    name: str
    mass_kg: float
    x_m: float
    y_m: float | None = 0.0
    z_m: float | None = None
    action: str = "install"


# --- small helpers ------------------------------------------------------------------------------

def _f(v) -> float | None:
    """A finite float, or None (NaN and None become None)."""
    if v is None:
        return None
    v = float(v)
    return v if math.isfinite(v) else None


def _attr(obj, name, default=None):
    if isinstance(obj, Mapping):
        return obj.get(name, default)
    return getattr(obj, name, default)


def _iso_date(v) -> str | None:
    if v is None:
        return None
    return v.isoformat() if hasattr(v, "isoformat") else str(v)


@dataclass
class _State:
    """Mass and first moments; ``mz`` None when some vertical arm is unknown."""

    mass: float
    mx: float
    my: float
    mz: float | None

    def plus(self, m: float, x: float, y: float | None, z: float | None) -> _State:
        y = y or 0.0
        mz = None if (self.mz is None or z is None) else self.mz + m * z
        return _State(self.mass + m, self.mx + m * x, self.my + m * y, mz)

    def cg(self) -> dict:
        m = self.mass
        if m <= 0:
            return {"x": None, "y": None, "z": None}
        return {"x": self.mx / m, "y": self.my / m,
                "z": None if self.mz is None else self.mz / m}


# --- inputs -------------------------------------------------------------------------------------

def _empty_state(empty) -> _State:
    m = float(_attr(empty, "mass_kg"))
    if not (math.isfinite(m) and m > 0):
        raise PlanError("empty weight", m, "a recorded empty mass greater than 0",
                        hint="Record a weighing first")
    z_known = bool(_attr(empty, "z_known", False))
    mz = _attr(empty, "mz_kgm", None)
    return _State(m, float(_attr(empty, "mx_kgm")), float(_attr(empty, "my_kgm", 0.0) or 0.0),
                  float(mz) if (z_known and mz is not None) else None)


def _config_items(vtype, plan, configuration_items):
    """(name, items as dicts) of the configuration in use."""
    if configuration_items is None:
        if plan.configuration is None:
            return None, []
        try:
            cfg = vtype.configuration(plan.configuration)
        except LookupError:
            known = ", ".join(c.name for c in vtype.configurations) or "none"
            raise PlanError("configuration", plan.configuration,
                            f"a configuration of type {vtype.name}: {known}") from None
        items = [ConfigurationItem(i.name, i.mass_kg, i.x_m, i.y_m, i.z_m, cfg.action)
                 for i in cfg.items]
    else:
        items = list(configuration_items)
    out = []
    for it in items:
        action = _attr(it, "action", "install")
        mass = _f(_attr(it, "mass_kg"))
        x = _f(_attr(it, "x_m"))
        if mass is None or x is None:
            raise PlanError(f"configuration item {_attr(it, 'name')!r}", _attr(it, "mass_kg"),
                            "an item with a recorded mass and arm")
        out.append({"name": _attr(it, "name"), "action": action, "mass_kg": mass,
                    "x_m": x, "y_m": _f(_attr(it, "y_m")) or 0.0, "z_m": _f(_attr(it, "z_m")),
                    "signed_mass_kg": mass if action == "install" else -mass})
    return plan.configuration, out


def _station_arm(st, load) -> float:
    x = getattr(load, "x_m", None)
    return st.x_m if x is None else x


def _items(vtype, plan) -> list[dict]:
    out = []
    for p in plan.persons:
        st = vtype.station(p.seat)
        out.append({"station": st.name, "kind": st.kind, "label": p.name or "",
                    "mass_kg": p.mass_kg, "x_m": st.x_m, "y_m": st.y_m, "z_m": st.z_m,
                    "moment_x_kgm": p.mass_kg * st.x_m, "max_mass_kg": st.max_mass_kg,
                    "mass_source": p.mass_source, "occupant_class": p.occupant_class})
    for c in plan.cargo:
        st = vtype.station(c.station)
        x = _station_arm(st, c)
        out.append({"station": st.name, "kind": st.kind, "label": c.what or "",
                    "mass_kg": c.mass_kg, "x_m": x, "y_m": st.y_m, "z_m": st.z_m,
                    "moment_x_kgm": c.mass_kg * x, "max_mass_kg": st.max_mass_kg,
                    "mass_source": "actual", "occupant_class": None})
    return out


# --- fuel ---------------------------------------------------------------------------------------

@dataclass
class _Fuel:
    """Fuel states (usable fuel only: the unusable fuel is in the empty weight)."""

    tanks: list                # type Tank objects of the fuel tanks loaded, in burn-list order
    loads: list                # TankLoad per tank
    ramp: np.ndarray           # (T,) usable kg per tank
    takeoff: np.ndarray
    landing: np.ndarray
    ramp_moment: np.ndarray    # (3,) usable fuel moment (x, y, z)
    takeoff_moment: np.ndarray
    landing_moment: np.ndarray
    path_mass: np.ndarray      # (n,) usable fuel mass along the trip burn
    path_moment: np.ndarray    # (n, 3)
    path_kind: tuple
    z_known: bool
    other: list                # non-fuel tanks loaded: (tank, load) pairs; constant mass


def _core_tank(tank, load, mass_kg):
    from ledger.core.fuel import Tank as CoreTank

    rho = load.density_kg_m3
    unusable = tank.unusable if tank.basis == "mass" else tank.unusable * rho
    if tank.arm_table:
        tm = [r.quantity if tank.basis == "mass" else r.quantity * rho for r in tank.arm_table]
        ta = [(r.x_m, r.y_m, r.z_m if r.z_m is not None else 0.0) for r in tank.arm_table]
        return CoreTank(mass=mass_kg + unusable, unusable=unusable, table_mass=tm,
                        table_arm=ta, name=tank.name), unusable
    return CoreTank(mass=mass_kg + unusable, unusable=unusable,
                    arm=(tank.x_m, tank.y_m, tank.z_m if tank.z_m is not None else 0.0),
                    name=tank.name), unusable


def _tank_z_known(tank) -> bool:
    if tank.arm_table:
        return all(r.z_m is not None for r in tank.arm_table)
    return tank.z_m is not None


def _fuel(vtype, plan, samples: int) -> _Fuel:
    from ledger.core.fuel import burn_states

    fuel_loads, other = [], []
    for load in plan.tanks:
        tank = vtype.tank(load.tank)
        (fuel_loads if tank.is_fuel else other).append((tank, load))
    if plan.burn_sequence == "tank order":
        order_names = list(plan.burn_order)
        fuel_loads.sort(key=lambda tl: order_names.index(tl[0].name)
                        if tl[0].name in order_names else len(order_names))
    z_known = all(_tank_z_known(t) for t, _ in fuel_loads)
    zero3 = np.zeros(3)
    if not fuel_loads:
        e = np.zeros(0)
        return _Fuel([], [], e, e, e, zero3, zero3, zero3, np.zeros(1), np.zeros((1, 3)),
                     ("start",), True, other)
    tanks = [t for t, _ in fuel_loads]
    loads = [ld for _, ld in fuel_loads]
    if plan.burn_sequence == "tank order":
        seq: Any = [i for i, t in enumerate(tanks) if t.name in plan.burn_order]
        if not seq:
            seq = [0]
    else:
        seq = "proportional"
    core, unusable = [], []
    for t, ld in fuel_loads:
        ct, u = _core_tank(t, ld, ld.mass_kg)
        core.append(ct)
        unusable.append(u)
    unusable = np.asarray(unusable)
    unusable_moment = np.zeros(3)
    for (t, _), u in zip(fuel_loads, unusable):
        x, y, z = t.arms_at(t.unusable)
        unusable_moment += u * np.array([x, y, z if z is not None else 0.0])
    base = burn_states(core, 0.0, seq, samples=2)
    ramp_moment = base.fuel_moment[0] - unusable_moment

    taxi = burn_states(core, plan.taxi_fuel_kg, seq, samples=2)
    to_total = taxi.tank_mass[-1]
    core_to = [_core_tank(t, ld, max(m - u, 0.0))[0]
               for (t, ld), m, u in zip(fuel_loads, to_total, unusable)]
    trip = burn_states(core_to, plan.trip_fuel_kg, seq, samples=samples)
    takeoff_moment = trip.fuel_moment[0] - unusable_moment
    landing_moment = trip.fuel_moment[-1] - unusable_moment
    ramp = np.array([ld.mass_kg for ld in loads])
    takeoff = np.maximum(to_total - unusable, 0.0)
    landing = np.maximum(trip.tank_mass[-1] - unusable, 0.0)
    return _Fuel(tanks, loads, ramp, takeoff, landing, ramp_moment, takeoff_moment,
                 landing_moment, trip.fuel_mass - unusable.sum(),
                 trip.fuel_moment - unusable_moment, trip.kind, z_known, other)


# --- checks -------------------------------------------------------------------------------------

def _envelopes(vtype, category) -> list:
    if category is None:
        return []
    return [e for e in vtype.envelopes if e.category == category]


def _polygon(env) -> np.ndarray:
    return np.asarray(env.points, dtype=float)


def _envelope_result(vtype, env, phase: str, mass: float, cg: dict, moments: dict,
                     violations: list) -> dict:
    from ledger.core.envelope import margins

    du = vtype.units
    key = "y" if env.axis == "lateral" else "x"
    cg_v = cg[key]
    coord = moments[key] if env.coordinates == "moment" else cg_v
    r = margins(_polygon(env), coord, mass)
    scale = mass if env.coordinates == "moment" else 1.0
    to_fwd = _f(r.to_fwd)
    to_aft = _f(r.to_aft)
    fwd_limit = _f(r.fwd_limit)
    aft_limit = _f(r.aft_limit)
    if scale != 1.0:
        to_fwd = None if to_fwd is None else to_fwd / scale
        to_aft = None if to_aft is None else to_aft / scale
        fwd_limit = None if fwd_limit is None else fwd_limit / scale
        aft_limit = None if aft_limit is None else aft_limit / scale
    pm_f = pm_a = None
    if vtype.mac is not None and env.axis == "longitudinal":
        if to_fwd is not None:
            pm_f = to_fwd / vtype.mac.length_m * 100.0
        if to_aft is not None:
            pm_a = to_aft / vtype.mac.length_m * 100.0
    inside = bool(r.inside)
    out = {"name": env.name, "axis": env.axis, "category": env.category,
           "coordinates": env.coordinates, "inside": inside,
           "forward_limit_m": fwd_limit, "aft_limit_m": aft_limit,
           "forward_margin_m": to_fwd, "aft_margin_m": to_aft,
           "forward_margin_percent_mac": pm_f, "aft_margin_percent_mac": pm_a,
           "mass_margin_kg": _f(r.to_max_mass)}
    if not inside:
        violations.append(_envelope_violation(vtype, env, phase, mass, cg_v, out, r))
    return out


def _envelope_violation(vtype, env, phase, mass, cg_v, res, r) -> dict:
    du = vtype.units
    lateral = env.axis == "lateral"
    what = f"{'lateral ' if lateral else ''}CG"
    title = phase_title(phase)
    base = {"code": "envelope", "phase": phase, "envelope": env.name, "axis": env.axis,
            "subject": f"{env.name} envelope ({env.axis})"}
    to_fwd, to_aft = res["forward_margin_m"], res["aft_margin_m"]
    if to_fwd is not None and to_fwd < 0:
        side = "left" if lateral else "forward"
        limit = res["forward_limit_m"]
        return {**base, "side": side, "limit": limit, "actual": cg_v, "excess": -to_fwd,
                "unit": "m",
                "message": f"{title} {what} {length_text(cg_v, du)} is {side} of the "
                           f"{env.name} envelope's limit {length_text(limit, du)} at "
                           f"{mass_text(mass, du)} by {excess_text(length_text, -to_fwd, du)}"}
    if to_aft is not None and to_aft < 0:
        side = "right" if lateral else "aft"
        limit = res["aft_limit_m"]
        return {**base, "side": side, "limit": limit, "actual": cg_v, "excess": -to_aft,
                "unit": "m",
                "message": f"{title} {what} {length_text(cg_v, du)} is {side} of the "
                           f"{env.name} envelope's limit {length_text(limit, du)} at "
                           f"{mass_text(mass, du)} by {excess_text(length_text, -to_aft, du)}"}
    to_max, to_min = _f(r.to_max_mass), _f(r.to_min_mass)
    if to_max is not None and to_max < 0:
        top = mass + to_max
        return {**base, "side": "above", "limit": top, "actual": mass, "excess": -to_max,
                "unit": "kg",
                "message": f"{title} mass {mass_text(mass, du)} is above the {env.name} "
                           f"envelope ({mass_text(top, du)} at {what} "
                           f"{length_text(cg_v, du)}) by {excess_text(mass_text, -to_max, du)}"}
    if to_min is not None and to_min < 0:
        bottom = mass + to_min
        return {**base, "side": "below", "limit": bottom, "actual": mass, "excess": -to_min,
                "unit": "kg",
                "message": f"{title} mass {mass_text(mass, du)} is below the {env.name} "
                           f"envelope ({mass_text(bottom, du)} at {what} "
                           f"{length_text(cg_v, du)}) by {excess_text(mass_text, -to_min, du)}"}
    pts = np.asarray(env.points, dtype=float)
    top, bottom = float(pts[:, 1].max()), float(pts[:, 1].min())
    if mass > top:
        return {**base, "side": "above", "limit": top, "actual": mass, "excess": mass - top,
                "unit": "kg",
                "message": f"{title} mass {mass_text(mass, du)} is above the top of the "
                           f"{env.name} envelope ({mass_text(top, du)}) by "
                           f"{excess_text(mass_text, mass - top, du)}"}
    if mass < bottom:
        return {**base, "side": "below", "limit": bottom, "actual": mass,
                "excess": bottom - mass, "unit": "kg",
                "message": f"{title} mass {mass_text(mass, du)} is below the bottom of the "
                           f"{env.name} envelope ({mass_text(bottom, du)}) by "
                           f"{excess_text(mass_text, bottom - mass, du)}"}
    return {**base, "side": "outside", "limit": None, "actual": cg_v, "excess": None,
            "unit": "m",
            "message": f"{title} {what} {length_text(cg_v, du)} at {mass_text(mass, du)} is "
                       f"outside the {env.name} envelope"}


def _mass_checks(vtype, phase: str, mass: float, violations: list) -> tuple:
    du = vtype.units
    lim = vtype.limits
    title = phase_title(phase)
    if phase in GROUND_PHASES:
        limit, subject, code = lim.gross_rating_kg, "gross vehicle rating", "gross"
    else:
        attr, subject = _LIMIT_NAMES[phase]
        limit, code = getattr(lim, attr), "mass_limit"
    if limit is not None and mass > limit * (1 + _REL):
        violations.append({
            "code": code, "phase": phase, "subject": subject, "limit": limit, "actual": mass,
            "excess": mass - limit, "unit": "kg",
            "message": f"{title} mass {mass_text(mass, du)} is over the {subject} "
                       f"{mass_text(limit, du)} by {excess_text(mass_text, mass - limit, du)}"})
    if phase in ("takeoff", "landing") and lim.min_flight_kg is not None \
            and mass < lim.min_flight_kg * (1 - _REL):
        violations.append({
            "code": "mass_limit", "phase": phase, "subject": "minimum flight mass",
            "limit": lim.min_flight_kg, "actual": mass, "excess": lim.min_flight_kg - mass,
            "unit": "kg",
            "message": f"{title} mass {mass_text(mass, du)} is under the minimum flight mass "
                       f"{mass_text(lim.min_flight_kg, du)} by "
                       f"{excess_text(mass_text, lim.min_flight_kg - mass, du)}"})
    return limit, (None if limit is None else limit - mass)


def _station_checks(vtype, plan, violations: list) -> list[dict]:
    du = vtype.units
    out = []
    for st in vtype.stations:
        loaded = plan.station_mass_kg(st.name)
        entry = {"station": st.name, "kind": st.kind, "mass_kg": loaded,
                 "max_mass_kg": st.max_mass_kg,
                 "margin_kg": None if st.max_mass_kg is None else st.max_mass_kg - loaded,
                 "floor_loading_kg_m2": None, "floor_load_limit_kg_m2": None,
                 "in_limits": True}
        if st.max_mass_kg is not None and loaded > st.max_mass_kg * (1 + _REL):
            entry["in_limits"] = False
            violations.append({
                "code": "station_limit", "phase": None, "station": st.name,
                "subject": f"station '{st.name}'", "limit": st.max_mass_kg, "actual": loaded,
                "excess": loaded - st.max_mass_kg, "unit": "kg",
                "message": f"Station '{st.name}' holds {mass_text(loaded, du)}, over its limit "
                           f"{mass_text(st.max_mass_kg, du)} by "
                           f"{excess_text(mass_text, loaded - st.max_mass_kg, du)}"})
        ext = st.extent
        if ext is not None and ext.floor_area_m2 and ext.floor_load_limit_kg_m2:
            load = loaded / ext.floor_area_m2
            entry["floor_loading_kg_m2"] = load
            entry["floor_load_limit_kg_m2"] = ext.floor_load_limit_kg_m2
            if load > ext.floor_load_limit_kg_m2 * (1 + _REL):
                entry["in_limits"] = False
                unit = f"{du.mass}/{du.length}2"
                from ledger.units import to_unit

                def fl(v):
                    return f"{to_unit(v, unit):,.1f} {unit}"

                violations.append({
                    "code": "floor_loading", "phase": None, "station": st.name,
                    "subject": f"floor of '{st.name}'", "limit": ext.floor_load_limit_kg_m2,
                    "actual": load, "excess": load - ext.floor_load_limit_kg_m2,
                    "unit": "kg/m2",
                    "message": f"Floor loading in '{st.name}' is {fl(load)} over "
                               f"{ext.floor_area_m2:g} m2, above its limit "
                               f"{fl(ext.floor_load_limit_kg_m2)}"})
        if loaded > 0 or st.max_mass_kg is not None:
            out.append(entry)
    return out


def _tank_checks(vtype, plan, violations: list) -> None:
    """Usable capacity (the plan parser refuses an overfull tank; a plan built in code might
    not have been through it)."""
    du = vtype.units
    for ld in plan.tanks:
        t = vtype.tank(ld.tank)
        room = t.capacity - t.unusable
        loaded = ld.volume_m3 if t.basis == "volume" else ld.mass_kg
        if loaded > room * (1 + _REL):
            show = (volume_text if t.basis == "volume" else mass_text)
            violations.append({
                "code": "tank_capacity", "phase": "ramp", "tank": t.name,
                "subject": f"tank '{t.name}'", "limit": room, "actual": loaded,
                "excess": loaded - room, "unit": "m3" if t.basis == "volume" else "kg",
                "message": f"Tank '{t.name}' holds {show(loaded, du)} of usable fuel, over its "
                           f"usable capacity {show(room, du)} by "
                           f"{excess_text(show, loaded - room, du)}"})


# --- the document -------------------------------------------------------------------------------

def _phase_doc(vtype, name: str, st: _State, violations: list, envs: list,
               z_known: bool) -> dict:
    from ledger.core.massprops import moment_index

    du = vtype.units
    cg = st.cg()
    if not z_known:
        cg["z"] = None
    moments = {"x": st.mx, "y": st.my, "z": st.mz if z_known else None}
    limit, margin = _mass_checks(vtype, name, st.mass, violations)
    from ledger.units import to_unit

    index = moment_index(to_unit(st.mx, du.moment_unit), du.moment_divisor)
    pmac = None
    if vtype.mac is not None and cg["x"] is not None:
        pmac = vtype.mac.percent_mac(cg["x"])
    env_docs = []
    if name in ENVELOPE_PHASES:
        for env in envs:
            env_docs.append(_envelope_result(vtype, env, name, st.mass, cg, moments,
                                             violations))
    phase_violations = [v for v in violations if v.get("phase") == name]
    return {"name": name, "label": phase_title(name), "mass_kg": st.mass, "cg_m": cg,
            "moment_kgm": moments, "moment_index": index, "percent_mac": pmac,
            "mass_limit_kg": limit, "mass_margin_kg": margin, "envelopes": env_docs,
            "in_limits": not phase_violations}


def _burn_path(vtype, zf: _State, fuel: _Fuel, envs: list, phases: dict,
               violations: list, ground: bool) -> dict:
    from ledger.core.envelope import covers, path_inside

    masses = zf.mass + fuel.path_mass
    mx = zf.mx + fuel.path_moment[:, 0]
    my = zf.my + fuel.path_moment[:, 1]
    cgx, cgy = mx / masses, my / masses
    points = [{"mass_kg": float(m), "cg_x_m": float(x), "cg_y_m": float(y),
               "moment_x_kgm": float(a), "kind": k}
              for m, x, y, a, k in zip(masses, cgx, cgy, mx, fuel.path_kind)]
    results = []
    du = vtype.units
    start, end = ("departure", "arrival") if ground else ("takeoff", "landing")
    for env in ([] if ground else envs):
        lateral = env.axis == "lateral"
        first = (my if lateral else mx) if env.coordinates == "moment" else \
            (cgy if lateral else cgx)
        poly = _polygon(env)
        chk = path_inside(poly, first, masses)
        exit_doc = None
        if not chk.inside:
            seg = chk.segment or 0
            fx, fm = chk.first_exit
            j = min(seg + 1, len(masses) - 1)
            span_m = masses[j] - masses[seg]
            span_f = first[j] - first[seg]
            t = ((fm - masses[seg]) / span_m if abs(span_m) > 1e-12 else
                 (fx - first[seg]) / span_f if abs(span_f) > 1e-15 else 0.0)
            t = min(max(float(t), 0.0), 1.0)
            m_e = float(masses[seg] + t * span_m)
            mx_e = float(mx[seg] + t * (mx[j] - mx[seg]))
            my_e = float(my[seg] + t * (my[j] - my[seg]))
            exit_doc = {"mass_kg": m_e, "cg_x_m": mx_e / m_e, "cg_y_m": my_e / m_e,
                        "fuel_burned_kg": float(zf.mass + fuel.path_mass[0] - m_e)}
            ends_in = bool(covers(poly, first[0], masses[0])) and \
                bool(covers(poly, first[-1], masses[-1]))
            if ends_in:
                cg_e = exit_doc["cg_y_m" if lateral else "cg_x_m"]
                violations.append({
                    "code": "burn_path", "phase": "trip", "envelope": env.name,
                    "axis": env.axis, "subject": f"{env.name} envelope ({env.axis}) while "
                    "fuel burns", "limit": None, "actual": cg_e, "excess": None,
                    "unit": "m", "first_exit": exit_doc,
                    "message": f"While fuel burns from take-off to landing the "
                               f"{'lateral ' if lateral else ''}CG leaves the {env.name} "
                               f"envelope at {mass_text(m_e, du)}, CG "
                               f"{length_text(cg_e, du)}, after "
                               f"{mass_text(exit_doc['fuel_burned_kg'], du)} of trip fuel, "
                               f"although take-off and landing are in limits"})
        results.append({"name": env.name, "axis": env.axis, "category": env.category,
                        "inside": bool(chk.inside), "first_exit": exit_doc})
    return {"from": start, "to": end, "points": points, "envelopes": results}


def _fuel_doc(vtype, plan, fuel: _Fuel) -> list[dict]:
    out = []
    idx = {t.name: i for i, t in enumerate(fuel.tanks)}
    for t in vtype.tanks:
        ld = plan.tank_load(t.name)
        rho = ld.density_kg_m3 if ld else t.density_kg_m3
        if ld is None:
            source = "type" if t.density_from_file else "nominal"
        else:
            source = ld.density_source
        cap_kg = t.capacity if t.basis == "mass" else t.capacity * rho
        unu_kg = t.unusable if t.basis == "mass" else t.unusable * rho
        ramp = ld.mass_kg if ld else 0.0
        if t.name in idx:
            i = idx[t.name]
            to, land = float(fuel.takeoff[i]), float(fuel.landing[i])
        else:
            to = land = ramp  # a tank that does not feed (or holds another fluid)
        out.append({"tank": t.name, "fluid": t.fluid, "basis": t.basis,
                    "density_kg_m3": rho, "density_source": source,
                    "temperature_c": ld.temperature_c if ld else None,
                    "density_15c_kg_m3": ld.density_15c_kg_m3 if ld else None,
                    "ramp_mass_kg": ramp, "ramp_volume_m3": ramp / rho,
                    "capacity_m3": cap_kg / rho, "capacity_kg": cap_kg,
                    "unusable_m3": unu_kg / rho, "unusable_kg": unu_kg,
                    "taxi_mass_kg": ramp - to, "takeoff_mass_kg": to,
                    "trip_mass_kg": to - land, "landing_mass_kg": land,
                    "feeds": t.name in plan.burn_order})
    return out


def _standard_doc(vtype, plan) -> dict:
    if plan.standard_masses == "actual":
        return {"name": "actual", "description": "actual masses as entered", "source": None}
    s = vtype.mass_set(plan.standard_masses)
    return {"name": s.name, "description": s.description, "source": s.source,
            "masses_kg": {c: m for c, m in s.masses_kg}}


def _compute(vtype, empty, plan, *, configuration_items, prepared_by, prepared_at,
             type_revision, registration, samples, axle_rule_set) -> dict:
    du = vtype.units
    ground = vtype.kind == "ground_vehicle"
    violations: list[dict] = []
    base = _empty_state(empty)
    empty_cg = base.cg()
    cfg_name, cfg_items = _config_items(vtype, plan, configuration_items)
    z_known = base.mz is not None
    for it in cfg_items:
        base = base.plus(it["signed_mass_kg"], it["x_m"], it["y_m"], it["z_m"])
    if base.mass <= 0:
        raise PlanError("configuration", cfg_name, "a configuration that leaves a positive "
                        "empty mass")
    items = _items(vtype, plan)
    zf = base
    for it in items:
        zf = zf.plus(it["mass_kg"], it["x_m"], it["y_m"], it["z_m"])
    fuel = _fuel(vtype, plan, samples)
    for t, ld in fuel.other:
        x, y, z = t.arms_at(t.unusable + (ld.volume_m3 if t.basis == "volume" else ld.mass_kg))
        zf = zf.plus(ld.mass_kg, x, y, z)
        items.append({"station": t.name, "kind": "tank", "label": t.fluid,
                      "mass_kg": ld.mass_kg, "x_m": x, "y_m": y, "z_m": z,
                      "moment_x_kgm": ld.mass_kg * x, "max_mass_kg": None,
                      "mass_source": ld.density_source, "occupant_class": None})
    z_known = zf.mz is not None and fuel.z_known

    def with_fuel(mass, moment) -> _State:
        mz = None if zf.mz is None else zf.mz + float(moment[2])
        return _State(zf.mass + float(mass), zf.mx + float(moment[0]),
                      zf.my + float(moment[1]), mz)

    ramp = with_fuel(fuel.ramp.sum(), fuel.ramp_moment)
    takeoff = with_fuel(fuel.takeoff.sum(), fuel.takeoff_moment)
    landing = with_fuel(fuel.landing.sum(), fuel.landing_moment)

    stations = _station_checks(vtype, plan, violations)
    _tank_checks(vtype, plan, violations)
    envs = _envelopes(vtype, plan.category)
    if ground:
        states = {"departure": ramp, "arrival": landing}
    else:
        states = {"zero_fuel": zf, "ramp": ramp, "takeoff": takeoff, "landing": landing}
    phases = [_phase_doc(vtype, name, st, violations, envs, z_known)
              for name, st in states.items()]
    burn = _burn_path(vtype, zf, fuel, envs, states, violations, ground)

    axles = axle_rules = rule_doc = None
    if ground:
        from ledger.loadsheet.axles import axle_checks

        axles, axle_rules, rule_doc = axle_checks(vtype, phases, states, plan.axle_rules,
                                                  violations, axle_rule_set)

    return {
        "schema": SCHEMA,
        "caution": CAUTION,
        "ground_caution": GROUND_CAUTION if ground else None,
        "sheet": {"id": None, "amends": None, "saved": False},
        "vehicle": {"registration": registration or plan.vehicle, "type": vtype.name,
                    "type_revision": type_revision, "kind": vtype.kind, "title": vtype.title,
                    "type_sha256": vtype.content_hash()},
        "empty_weight": {"entry_seq": _attr(empty, "seq"),
                         "entry_id": _attr(empty, "entry_id"),
                         "entry_date": _iso_date(_attr(empty, "entry_date")),
                         "entry_hash": _attr(empty, "entry_hash"),
                         "mass_kg": _empty_state(empty).mass,
                         "cg_m": empty_cg,
                         "moment_kgm": {"x": _empty_state(empty).mx,
                                        "y": _empty_state(empty).my,
                                        "z": _empty_state(empty).mz}},
        "configuration": {"name": cfg_name, "items": cfg_items,
                          "mass_change_kg": math.fsum(i["signed_mass_kg"] for i in cfg_items)},
        "prepared": {"by": prepared_by or plan.prepared_by,
                     "at": _iso_date(prepared_at)},
        "plan_source": plan.source,
        "category": plan.category,
        "standard_masses": _standard_doc(vtype, plan),
        "units": {"mass": du.mass, "length": du.length, "volume": du.volume,
                  "moment": du.moment_unit, "density": du.density_unit,
                  "moment_reduction": du.moment_divisor},
        "items": items,
        "stations": stations,
        "fuel": _fuel_doc(vtype, plan, fuel),
        "burn": {"sequence": plan.burn_sequence, "order": list(plan.burn_order),
                 "taxi_fuel_kg": plan.taxi_fuel_kg, "trip_fuel_kg": plan.trip_fuel_kg},
        "phases": phases,
        "burn_path": burn,
        "axles": axles,
        "axle_rules": axle_rules,
        "axle_rule_set": rule_doc,
        "violations": violations,
        "fixes": [],
        "fixes_note": None,
        "envelope_polygons": [{"name": e.name, "axis": e.axis, "category": e.category,
                               "coordinates": e.coordinates,
                               "points": [[float(a), float(b)] for a, b in e.points]}
                              for e in envs],
        "verdict": "in_limits" if not violations else "out_of_limits",
    }


def build_sheet(vtype, empty_state, plan, *, configuration_items: Iterable | None = None,
                prepared_by: str | None = None, prepared_at: dt.datetime | str | None = None,
                type_revision: int | None = None, registration: str | None = None,
                with_fixes: bool = True, samples: int = 41, axle_rule_set=None) -> dict:
    """The loading-sheet document for ``plan`` (see ``docs/sheet-document.md``).

    Parameters
    ----------
    vtype : VehicleType
        The vehicle's type (:mod:`ledger.typedata`).
    empty_state : EmptyWeight or ledger.store.entries.EmptyState
        The current empty weight: ``mass_kg``, ``mx_kgm``, ``my_kgm``, ``mz_kgm``,
        ``z_known``, and for the heading ``seq``, ``entry_date``, ``entry_id``.
    plan : Plan
        From :func:`ledger.typedata.plan.parse_plan`.
    configuration_items : iterable, optional
        Items of the configuration in use (objects or dicts with ``name``, ``action``,
        ``mass_kg``, ``x_m``, ``y_m``, ``z_m``), e.g. those of
        :func:`ledger.store.configs.configuration_items`. None: the type-file configuration
        the plan names, if any.
    prepared_by, prepared_at : optional
        Shown in the heading (default: the plan's ``prepared_by``; no time).
    type_revision : int, optional
        Revision of the type data used.
    registration : str, optional
        Default: the plan's vehicle.
    with_fixes : bool
        Look for fixes when out of limits (each re-checked with ``with_fixes=False``).
    samples : int
        Evenly spaced burn states from take-off to landing, besides every tank switch and
        arm-table row (see :func:`ledger.core.fuel.burn_states`).
    axle_rule_set : ledger.core.ground.RuleSet, optional
        Ground vehicles: the advisory axle-group rules for the plan's ``axle_rules`` name
        (e.g. from :func:`ledger.rules.load_rule_set`); without it the name is looked up among
        the core's built-in rule sets.

    Returns
    -------
    dict
        The document; ``verdict`` is ``"in_limits"`` or ``"out_of_limits"``.
    """
    kwargs = dict(configuration_items=None if configuration_items is None
                  else list(configuration_items),
                  prepared_by=prepared_by, prepared_at=prepared_at,
                  type_revision=type_revision, registration=registration, samples=samples,
                  axle_rule_set=axle_rule_set)
    doc = _compute(vtype, empty_state, plan, **kwargs)
    if with_fixes and doc["violations"]:
        from ledger.loadsheet.fixes import find_fixes

        def rebuild(changed_plan) -> dict:
            return _compute(vtype, empty_state, changed_plan, **kwargs)

        fixes, note = find_fixes(vtype, plan, doc, rebuild)
        doc["fixes"] = fixes
        doc["fixes_note"] = note
    return doc

