"""The limits a sheet checks: phase masses, envelopes, stations and floors, tank capacities.

Internal to :mod:`ledger.loadsheet`. Each check returns its rows of the document and appends
what is exceeded to the document's ``violations`` (with a one-line message in the type's
display units). Limits are inclusive: a CG on an envelope edge, or a mass exactly at its
limit, is in limits (``REL`` absorbs the rounding of unit conversions).
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Literal, NamedTuple, TypedDict

import numpy as np

from ledger.core.envelope import margins
from ledger.loadsheet.document import GROUND_PHASES, EnvelopeResult, StationDoc, Vector, Violation
from ledger.loadsheet.inputs import finite
from ledger.loadsheet.text import excess_text, length_text, mass_text, phase_title, volume_text
from ledger.units import fixed, to_unit

if TYPE_CHECKING:
    from ledger.typedata.model import Envelope, VehicleType
    from ledger.typedata.plan import Plan

__all__ = ["REL", "envelopes_of", "polygon", "envelope_result", "mass_checks",
           "station_checks", "tank_checks"]

REL = 1e-9  # relative slack for "exactly at the limit" after unit conversions
_LIMIT_NAMES = {"zero_fuel": ("max_zero_fuel_kg", "maximum zero-fuel mass"),
                "ramp": ("max_ramp_kg", "maximum ramp mass"),
                "takeoff": ("max_takeoff_kg", "maximum take-off mass"),
                "landing": ("max_landing_kg", "maximum landing mass")}


def envelopes_of(vtype: VehicleType, category: str | None) -> list[Envelope]:
    """The type's envelopes of ``category`` (none when no category is checked)."""
    if category is None:
        return []
    return [e for e in vtype.envelopes if e.category == category]


def polygon(env: Envelope) -> np.ndarray:
    return np.asarray(env.points, dtype=float)


# --- envelopes ----------------------------------------------------------------------------------

def envelope_result(vtype: VehicleType, env: Envelope, phase: str, mass: float, cg: Vector,
                    moments: Vector, violations: list[Violation]) -> EnvelopeResult:
    """The margins of one phase's CG in ``env``; a violation when it is outside."""
    key: Literal["x", "y"] = "y" if env.axis == "lateral" else "x"
    cg_v = cg[key]
    coord = moments[key] if env.coordinates == "moment" else cg_v
    r = margins(polygon(env), coord, mass)
    scale = mass if env.coordinates == "moment" else 1.0
    to_fwd = finite(r.to_fwd)
    to_aft = finite(r.to_aft)
    fwd_limit = finite(r.fwd_limit)
    aft_limit = finite(r.aft_limit)
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
    out: EnvelopeResult = {
        "name": env.name, "axis": env.axis, "category": env.category,
        "coordinates": env.coordinates, "inside": inside,
        "forward_limit_m": fwd_limit, "aft_limit_m": aft_limit,
        "forward_margin_m": to_fwd, "aft_margin_m": to_aft,
        "forward_margin_percent_mac": pm_f, "aft_margin_percent_mac": pm_a,
        "mass_margin_kg": finite(r.to_max_mass)}
    if not inside:
        assert cg_v is not None  # margins() found the point outside, so it has a CG
        violations.append(_envelope_violation(vtype, env, phase, mass, cg_v, out,
                                              finite(r.to_max_mass), finite(r.to_min_mass)))
    return out


class _Subject(TypedDict):
    """The keys every envelope violation starts with."""

    code: str
    phase: str
    envelope: str
    axis: str
    subject: str


class _Where(NamedTuple):
    """What an envelope violation's message names: phase title, "CG" or "lateral CG"."""

    title: str
    what: str


def _envelope_violation(vtype: VehicleType, env: Envelope, phase: str, mass: float,
                        cg_v: float, res: EnvelopeResult, to_max: float | None,
                        to_min: float | None) -> Violation:
    """The violation of a CG outside ``env``: beyond a side, above or below, or outside."""
    lateral = env.axis == "lateral"
    where = _Where(phase_title(phase), f"{'lateral ' if lateral else ''}CG")
    base: _Subject = {"code": "envelope", "phase": phase, "envelope": env.name,
                      "axis": env.axis, "subject": f"{env.name} envelope ({env.axis})"}
    to_fwd, to_aft = res["forward_margin_m"], res["aft_margin_m"]
    if to_fwd is not None and to_fwd < 0:
        return _side_violation(vtype, env, base, where, "left" if lateral else "forward",
                               res["forward_limit_m"], cg_v, mass, -to_fwd)
    if to_aft is not None and to_aft < 0:
        return _side_violation(vtype, env, base, where, "right" if lateral else "aft",
                               res["aft_limit_m"], cg_v, mass, -to_aft)
    return _mass_range_violation(vtype, env, base, where, cg_v, mass, to_max, to_min)


def _side_violation(vtype: VehicleType, env: Envelope, base: _Subject, where: _Where,
                    side: str, limit: float | None, cg_v: float, mass: float,
                    excess: float) -> Violation:
    du = vtype.units
    assert limit is not None  # a finite margin has a finite limit
    return {**base, "side": side, "limit": limit, "actual": cg_v, "excess": excess,
            "unit": "m",
            "message": f"{where.title} {where.what} {length_text(cg_v, du)} is {side} of the "
                       f"{env.name} envelope's limit {length_text(limit, du)} at "
                       f"{mass_text(mass, du)} by {excess_text(length_text, excess, du)}"}


def _mass_range_violation(vtype: VehicleType, env: Envelope, base: _Subject, where: _Where,
                          cg_v: float, mass: float, to_max: float | None,
                          to_min: float | None) -> Violation:
    """A CG within the sides but above or below the envelope (or outside it otherwise)."""
    du = vtype.units
    title, what = where
    if to_max is not None and to_max < 0:
        top = mass + to_max
        return {**base, "side": "above", "limit": top, "actual": mass, "excess": -to_max,
                "unit": "kg",
                "message": f"{title} mass {mass_text(mass, du)} is above the {env.name} "
                           f"envelope ({mass_text(top, du)} at {what} "
                           f"{length_text(cg_v, du)}) by {excess_text(mass_text, -to_max, du)}"}
    if to_min is not None and to_min < 0:
        bottom = mass - to_min  # to_min = mass − the envelope's bottom at this CG
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


# --- masses, stations, tanks --------------------------------------------------------------------

def mass_checks(vtype: VehicleType, phase: str, mass: float, violations: list[Violation],
                ) -> tuple[float | None, float | None]:
    """(mass limit, margin to it) of a phase; violations over it or under the minimum."""
    du = vtype.units
    lim = vtype.limits
    title = phase_title(phase)
    limit: float | None
    if phase in GROUND_PHASES:
        limit, subject, code = lim.gross_rating_kg, "gross vehicle rating", "gross"
    else:
        attr, subject = _LIMIT_NAMES[phase]
        limit, code = getattr(lim, attr), "mass_limit"
    if limit is not None and mass > limit * (1 + REL):
        violations.append({
            "code": code, "phase": phase, "subject": subject, "limit": limit, "actual": mass,
            "excess": mass - limit, "unit": "kg",
            "message": f"{title} mass {mass_text(mass, du)} is over the {subject} "
                       f"{mass_text(limit, du)} by {excess_text(mass_text, mass - limit, du)}"})
    if phase in ("takeoff", "landing") and lim.min_flight_kg is not None \
            and mass < lim.min_flight_kg * (1 - REL):
        violations.append({
            "code": "mass_limit", "phase": phase, "subject": "minimum flight mass",
            "limit": lim.min_flight_kg, "actual": mass, "excess": lim.min_flight_kg - mass,
            "unit": "kg",
            "message": f"{title} mass {mass_text(mass, du)} is under the minimum flight mass "
                       f"{mass_text(lim.min_flight_kg, du)} by "
                       f"{excess_text(mass_text, lim.min_flight_kg - mass, du)}"})
    return limit, (None if limit is None else limit - mass)


def station_checks(vtype: VehicleType, plan: Plan, violations: list[Violation],
                   ) -> list[StationDoc]:
    """The document's ``stations`` (those loaded or with a limit), each against its limits."""
    du = vtype.units
    out: list[StationDoc] = []
    for st in vtype.stations:
        loaded = plan.station_mass_kg(st.name)
        entry: StationDoc = {
            "station": st.name, "kind": st.kind, "mass_kg": loaded,
            "max_mass_kg": st.max_mass_kg,
            "margin_kg": None if st.max_mass_kg is None else st.max_mass_kg - loaded,
            "floor_loading_kg_m2": None, "floor_load_limit_kg_m2": None,
            "in_limits": True}
        if st.max_mass_kg is not None and loaded > st.max_mass_kg * (1 + REL):
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
            if load > ext.floor_load_limit_kg_m2 * (1 + REL):
                entry["in_limits"] = False
                unit = f"{du.mass}/{du.length}2"
                violations.append({
                    "code": "floor_loading", "phase": None, "station": st.name,
                    "subject": f"floor of '{st.name}'", "limit": ext.floor_load_limit_kg_m2,
                    "actual": load, "excess": load - ext.floor_load_limit_kg_m2,
                    "unit": "kg/m2",
                    "message": f"Floor loading in '{st.name}' is {_floor_text(load, unit)} "
                               f"over {ext.floor_area_m2:g} m2, above its limit "
                               f"{_floor_text(ext.floor_load_limit_kg_m2, unit)}"})
        if loaded > 0 or st.max_mass_kg is not None:
            out.append(entry)
    return out


def _floor_text(kg_m2: float, unit: str) -> str:
    return f"{fixed(to_unit(kg_m2, unit), 1)} {unit}"


def tank_checks(vtype: VehicleType, plan: Plan, violations: list[Violation]) -> None:
    """Usable capacity (the plan parser refuses an overfull tank; a plan built in code might
    not have been through it)."""
    du = vtype.units
    for ld in plan.tanks:
        t = vtype.tank(ld.tank)
        room = t.capacity - t.unusable
        loaded = ld.volume_m3 if t.basis == "volume" else ld.mass_kg
        if loaded > room * (1 + REL):
            show = (volume_text if t.basis == "volume" else mass_text)
            violations.append({
                "code": "tank_capacity", "phase": "ramp", "tank": t.name,
                "subject": f"tank '{t.name}'", "limit": room, "actual": loaded,
                "excess": loaded - room, "unit": "m3" if t.basis == "volume" else "kg",
                "message": f"Tank '{t.name}' holds {show(loaded, du)} of usable fuel, over its "
                           f"usable capacity {show(room, du)} by "
                           f"{excess_text(show, loaded - room, du)}"})
