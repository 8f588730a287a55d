"""Scale readings as a user gives them → the empty vehicle they weigh, and what to keep of them.

The computation is :func:`ledger.core.weighing.empty_weight_from_scales` (FAA-H-8083-1, weighing
chapter: net = reading − tare; CG = Σ(R·x)/ΣR; remove usable fuel, keep unusable). This module
reads the user's readings, tares, fuel quantities and adjustments against the vehicle type
(its weighing points, tanks and display units), refuses what cannot be right with the user's own
figures in the message, and returns the measured state with the detail the ledger keeps.
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import Any

from ledger.core.weighing import (
    PLAUSIBLE_EMPTY_MULTIPLE,
    Correction,
    empty_weight_from_scales,
    plausible_empty_mass,
    vertical_cg_from_pitch,
)
from ledger.errors import ConflictError, InputError
from ledger.typedata.readings import (
    match_name,
    parse_amount,
    parse_length,
    parse_mass,
    parse_text,
)
from ledger.units import format_quantity, parse_quantity_of, to_unit

__all__ = ["ScaleWeighing", "PitchedWeighing", "weighing_from_readings",
           "implausible_empty_mass"]


@dataclass(frozen=True)
class ScaleWeighing:
    """The empty vehicle a weighing measured (kg, kg·m; ``mz_kgm`` None when not measured)
    and the detail the ledger keeps with it (readings, fuel, adjustments, equipment)."""

    mass_kg: float
    mx_kgm: float
    my_kgm: float
    mz_kgm: float | None
    detail: dict
    cg_height: dict | None = None  # {"cg_z_m", "detail"} from a pitched weighing, if any


@dataclass(frozen=True)
class PitchedWeighing:
    """A second set of readings at the same weighing points with the vehicle pitched nose-up
    (issue 13 item 17); the same tares apply. ``pitch`` is the nose-up angle (degrees, or a
    text with its unit), ``points_z`` the vertical arm of the plane of the weighing points
    (jack pads or load cells fixed to the body; m, or a text in the type's length unit)."""

    readings: Mapping[str, Any]
    pitch: Any
    points_z: Any


def implausible_empty_mass(vtype, mass_kg: float, unit: str) -> str | None:
    """None when ``mass_kg`` is a plausible empty mass for ``vtype``
    (:func:`ledger.core.weighing.plausible_empty_mass`); else what is allowed, in ``unit``, for
    the error that refuses it."""
    largest = vtype.limits.largest_maximum()
    if plausible_empty_mass(mass_kg, None if largest is None else largest[0]):
        return None
    if largest is None:
        return "a finite empty mass above 0"
    limit, name = largest
    times = "" if PLAUSIBLE_EMPTY_MULTIPLE == 1 else f"{PLAUSIBLE_EMPTY_MULTIPLE:g} times "
    return (f"an empty mass above 0 and at most {times}the largest maximum mass of type "
            f"{vtype.name}, {format_quantity(PLAUSIBLE_EMPTY_MULTIPLE * limit, unit, 1)} "
            f"({name})")


def _points_by_name(vtype) -> dict:
    return {p.name: p for p in vtype.weighing_points()}


def _gross(readings: Mapping[str, Any] | None, points: Mapping[str, Any], units,
           type_name: str, listing: str, option: str = "--reading") -> dict[str, float]:
    """One reading per weighing point, by the type's point names (``option`` names them)."""
    given: dict[str, float] = {}
    for raw_name, value in (readings or {}).items():
        name = match_name(raw_name, points)
        if name is None:
            raise InputError(option, raw_name, f"not a weighing point of type {type_name}; "
                             f"its points are {listing}")
        if name in given:
            raise InputError(option, raw_name, "given twice; one reading per point")
        given[name] = parse_mass(value, units, f"{option} {name}")
    for name in points:
        if name not in given:
            raise InputError(option, name, f"missing; type {type_name} is weighed at "
                             f"{listing}: give one {option} POINT=MASS for each")
    return given


def _tares(tares: Mapping[str, Any] | None, given: Mapping[str, float],
           points: Mapping[str, Any], units, type_name: str, listing: str) -> dict[str, float]:
    """The tares given, each no more than its point's reading."""
    tare: dict[str, float] = {}
    for raw_name, value in (tares or {}).items():
        name = match_name(raw_name, points)
        if name is None:
            raise InputError("--tare", raw_name, f"not a weighing point of type {type_name}; "
                             f"its points are {listing}")
        tare[name] = parse_mass(value, units, f"--tare {name}")
        if tare[name] > given[name]:
            # Caught here, in the user's units, before the pure core sees a negative net.
            mu = units.mass
            net = float(to_unit(given[name] - tare[name], mu, "mass"))
            raise InputError(f"net reaction at {name!r}", round(net, 6),
                             f"a net reading of 0 {mu} or more (reading "
                             f"{format_quantity(given[name], mu, 2)} − tare "
                             f"{format_quantity(tare[name], mu, 2)})",
                             hint="Check the tare and the scale zero")
    return tare


def _tank_quantity(tank, tname: str, value, units) -> float:
    """The contents of a tank as weighed, in its basis (m³ or kg), within its capacity."""
    if isinstance(value, str):
        q, dim = parse_quantity_of(value, ("volume", "mass"), units.volume,
                                   field=f"--fuel {tname}")
        if dim == "mass" and tank.basis == "volume":
            q = q / tank.density_kg_m3
        elif dim == "volume" and tank.basis == "mass":
            q = q * tank.density_kg_m3
    else:
        q = parse_amount(value, "volume" if tank.basis == "volume" else "mass", None,
                         f"--fuel {tname}")
    if q < 0:
        raise InputError(f"--fuel {tname}", value, "a quantity of 0 or more")
    if q > tank.capacity * (1 + 1e-9):
        cap = format_quantity(tank.capacity, units.volume if tank.basis == "volume"
                              else units.mass, 1)
        raise InputError(f"--fuel {tname}", value, f"at most the tank's capacity ({cap})")
    return q


def _fuel(fuel: Mapping[str, Any] | None, vt, units, type_name: str,
          corrections: list) -> list[dict]:
    """Corrections for the fuel on board as weighed (appended to ``corrections``); the detail."""
    fuel_detail = []
    tanks = {t.name: t for t in vt.tanks}
    for raw_name, value in (fuel or {}).items():
        tname = match_name(raw_name, tanks)
        if tname is None or not tanks[tname].is_fuel:
            fuel_tanks = ", ".join(t.name for t in vt.tanks if t.is_fuel) or "none"
            raise InputError("--fuel", raw_name, f"not a fuel tank of type {type_name}; its "
                             f"fuel tanks are {fuel_tanks}")
        tank = tanks[tname]
        q = _tank_quantity(tank, tname, value, units)
        if q != tank.unusable:
            xq, yq, zq = tank.arms_at(q)
            xu, yu, zu = tank.arms_at(tank.unusable)
            corrections.append(Correction.remove(f"fuel in {tname} as weighed",
                                                 tank.mass_of(q), xq, yq, zq))
            corrections.append(Correction.add(f"unusable fuel, {tname}",
                                              tank.unusable_kg(), xu, yu, zu))
        fuel_detail.append({"tank": tname, "quantity": q, "basis": tank.basis,
                            "mass_kg": tank.mass_of(q), "unusable_kg": tank.unusable_kg()})
    return fuel_detail


def _adjustments(adjustments: Sequence[Mapping[str, Any]], units,
                 corrections: list) -> list[dict]:
    """Other corrections to the as-weighed state (appended to ``corrections``); the detail."""
    adj_detail = []
    for adj in adjustments:
        label = parse_text(adj.get("label", adj.get("name")), "--adjust", required=True)
        mv = parse_amount(adj.get("mass"), "mass", units.mass, f"--adjust {label} mass")
        ax = parse_length(adj.get("x"), units, f"--adjust {label} arm")
        ay = 0.0 if adj.get("y") is None else parse_length(adj["y"], units, f"--adjust {label} y")
        az = None if adj.get("z") is None else parse_length(adj["z"], units, f"--adjust {label} z")
        c = (Correction.add if mv >= 0 else Correction.remove)(label, abs(mv), ax, ay, az)
        corrections.append(c)
        adj_detail.append({"label": label, "mass_kg": mv, "x_m": ax, "y_m": ay, "z_m": az})
    return adj_detail


def _as_weighed_height(level, pitched: PitchedWeighing, vt, points: Mapping[str, Any],
                       names: list[str], tare: Mapping[str, float], type_name: str,
                       listing: str) -> tuple[float, dict]:
    """The as-weighed vertical CG from the pitched readings, and what the entry keeps of it.

    The pitched readings are reduced with the level arms; the apparent CG moves aft by
    ``h·tanθ`` for a CG ``h`` above the plane of the points
    (:func:`ledger.core.weighing.vertical_cg_from_pitch`).
    """
    units = vt.units
    gp = _gross(pitched.readings, points, units, type_name, listing, "--pitched-reading")
    deg = parse_amount(pitched.pitch, "angle", "deg", "--pitch")
    if deg < 0:  # the core takes either way; the command is a nose-up weighing
        raise InputError("--pitch", pitched.pitch, "a nose-up pitch, greater than 0",
                         hint="Give the angle of the nose-up attitude as a positive angle")
    plane = parse_length(pitched.points_z, units, "--points-z")
    tilted = empty_weight_from_scales(
        [gp[n] for n in names], [tare.get(n, 0.0) for n in names],
        [points[n].x_m for n in names], points=names)
    try:
        fit = vertical_cg_from_pitch(level.weighed_cg_x, tilted.weighed_cg_x, math.radians(deg),
                                     plane_z=plane, mass_level=level.weighed_mass,
                                     mass_pitched=tilted.weighed_mass)
    except InputError as exc:  # the core's names, as the command's options
        if exc.field.startswith("pitch_rad"):
            raise InputError("--pitch", deg, exc.allowed.split(" (")[0], hint=exc.hint) from None
        if exc.field.startswith("mass_pitched"):
            raise InputError("--pitched-reading", format_quantity(
                tilted.weighed_mass, units.mass, 2), exc.allowed.replace(
                    f"{level.weighed_mass:g} kg", format_quantity(level.weighed_mass,
                                                                  units.mass, 2)),
                hint=exc.hint) from None
        raise
    detail = {"method": "pitched weighing", "pitch_deg": deg, "points_z_m": plane,
              "points": {n: {"reading_kg": gp[n], "tare_kg": tare.get(n, 0.0)} for n in names},
              "apparent_cg_x_m": tilted.weighed_cg_x, "level_cg_x_m": level.weighed_cg_x,
              "as_weighed_cg_z_m": fit.z_cg}
    return fit.z_cg, detail


def _empty_height(points: Mapping[str, Any], names: list[str], given: Mapping[str, float],
                  tare: Mapping[str, float], corrections: list, z_cg: float) -> float:
    """The empty vehicle's vertical CG from the as-weighed one, through the same corrections
    (each needs its vertical arm)."""
    try:
        r = empty_weight_from_scales(
            [given[n] for n in names], [tare.get(n, 0.0) for n in names],
            [points[n].x_m for n in names], [points[n].y_m for n in names], points=names,
            corrections=corrections, z_cg=z_cg)
    except InputError as exc:
        if not exc.field.endswith(".z"):
            raise
        named = re.search(r"\('(.*)'\)\.z$", exc.field)
        raise InputError("vertical arm", named.group(1) if named else exc.field,
                         "a vertical arm (z) for every correction when a pitched weighing "
                         "gives the vertical CG: give the tank's z in the type file or the "
                         "adjustment's VERT arm, or weigh without it") from None
    assert r.cg_z is not None  # z_cg was given
    return r.cg_z


def _refuse_implausible(vt, mass_kg: float, units, readings: Mapping[str, Any],
                        points: Mapping[str, Any], names: list[str]) -> None:
    allowed = implausible_empty_mass(vt, mass_kg, units.mass)
    if allowed is None:
        return
    typed = {match_name(k, points): v for k, v in readings.items()}  # as the user gave them
    shown = ", ".join(f"{n}={typed[n]}" for n in names)
    value = to_unit(mass_kg, units.mass)
    mass = (format_quantity(mass_kg, units.mass, 1) if abs(value) < 1e9
            else f"{value:.3g} {units.mass}")
    raise InputError("empty mass", mass, allowed, hint=f"The readings were {shown}: check "
                     "each, and the unit of the scales")


def weighing_from_readings(vtype, type_name: str, type_revision: int,
                           readings: Mapping[str, Any], *,
                           tares: Mapping[str, Any] | None = None,
                           fuel: Mapping[str, Any] | None = None,
                           adjustments: Sequence[Mapping[str, Any]] = (),
                           scales: str | None = None, level: str | None = None,
                           note: str | None = None,
                           pitched: PitchedWeighing | None = None) -> ScaleWeighing:
    """The empty vehicle a weighing of type ``vtype`` measured (see
    :func:`ledger.store.entries.record_weighing` for the parameters).

    Raises
    ------
    ConflictError
        The type defines no weighing points.
    InputError
        A missing or unknown weighing point, a negative net reading, a non-finite value, an
        unknown tank, a quantity above the tank's capacity; a result that is not a plausible
        empty mass for the type (:func:`implausible_empty_mass`), naming the readings.
    """
    vt, units = vtype, vtype.units
    points = _points_by_name(vt)
    if not points:
        raise ConflictError(f"type {type_name} defines no weighing points; add "
                            "[[reaction_point]] tables to its type file")
    listing = ", ".join(points)
    given = _gross(readings, points, units, type_name, listing)
    tare = _tares(tares, given, points, units, type_name, listing)
    names = list(points)
    corrections: list = []
    fuel_detail = _fuel(fuel, vt, units, type_name, corrections)
    adj_detail = _adjustments(adjustments, units, corrections)
    result = empty_weight_from_scales(
        [given[n] for n in names], [tare.get(n, 0.0) for n in names],
        [points[n].x_m for n in names], [points[n].y_m for n in names], points=names,
        corrections=corrections)
    _refuse_implausible(vt, result.mass, units, readings, points, names)
    detail = {
        "type": type_name, "type_revision": type_revision,
        "points": {n: {"reading_kg": given[n], "tare_kg": tare.get(n, 0.0),
                       "net_kg": float(result.net[i]), "x_m": points[n].x_m,
                       "y_m": points[n].y_m} for i, n in enumerate(names)},
        "as_weighed": {"mass_kg": result.weighed_mass, "mx_kgm": result.weighed_moment_x,
                       "my_kgm": result.weighed_moment_y},
        "fuel": fuel_detail,
        "fuel_not_named": [t.name for t in vt.tanks if t.is_fuel and t.name not in
                           {f["tank"] for f in fuel_detail}],
        "adjustments": adj_detail,
    }
    for key, value in (("scales", scales), ("level", level), ("note", note)):
        text = parse_text(value, f"--{key}", max_len=2000)
        if text:
            detail[key] = text
    height = None
    if pitched is not None:
        z_weighed, height_detail = _as_weighed_height(result, pitched, vt, points, names, tare,
                                                      type_name, listing)
        height = {"cg_z_m": _empty_height(points, names, given, tare, corrections,
                                          z_weighed), "detail": height_detail}
    return ScaleWeighing(result.mass, result.moment_x, result.moment_y, result.moment_z, detail,
                         height)
