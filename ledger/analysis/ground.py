"""Road-vehicle weighings as report documents: corner weights and CG height by axle lift.

Pure: numbers in SI (kg, m, degrees for angles) and, optionally, a parsed
:class:`ledger.typedata.VehicleType` in; JSON-able dicts out (SI, the unit in every key). The
service (:mod:`ledger.services.ground`, :mod:`ledger.services.cg_height`) parses what the user
typed and fetches the type from the store; :mod:`ledger.report.ground` renders the documents,
whose types are in :mod:`ledger.analysis.ground_types`.

Documents
---------
``wbledger.corners/1`` (:func:`corner_weights_document`)
    Total, axle and side sums, CG x and y, left/right/front/rear percentages and both diagonal
    percentages under their names ``"RF+LR"`` and ``"LF+RR"`` (the "cross weight" is quoted
    either way in practice, so neither is called that here).
``wbledger.cg-height/1`` (:func:`cg_height_document`)
    CG height above the ground from an axle-lift weighing at one or more angles (ISO 10392
    method through :func:`ledger.core.ground.cg_height_axle_lift`), the least-squares residual,
    each angle's own height, and the vertical arm z in the type's datum.

Sources: corner-weight definitions as in the domain notes (left % = (LF + LR)/T,
rear % = (LR + RR)/T, diagonals named; common practice); ISO 10392 for the axle-lift relation.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Any, cast

from ledger.analysis import MISSING
from ledger.analysis.ground_types import (
    CgHeightDocument,
    CgHeightInputs,
    CgHeightReading,
    CornersDocument,
    GroundVehicle,
    RuleSetDocument,
)
from ledger.bounds import item_field
from ledger.caution import CAUTION_SHORT, GROUND_CAUTION
from ledger.core.ground import cg_height_axle_lift, corner_weights
from ledger.errors import InputError
from ledger.rules import bridge_table

__all__ = [
    "CORNERS_SCHEMA",
    "CG_HEIGHT_SCHEMA",
    "Geometry",
    "type_geometry",
    "angles_from_lift",
    "corner_weights_document",
    "cg_height_document",
    "rule_set_document",
]

CORNERS_SCHEMA = "wbledger.corners/1"
CG_HEIGHT_SCHEMA = "wbledger.cg-height/1"

DIAGONAL_NOTE = ("The 'cross weight' is quoted with either diagonal: RF+LR = (right front + left "
                 "rear)/total and LF+RR = (left front + right rear)/total; both are given, named.")


class Geometry(dict):
    """Wheelbase, tracks and front-axle arm of a two-axle vehicle (m), as a plain dict with keys
    ``wheelbase_m``, ``track_front_m``, ``track_rear_m``, ``front_axle_x_m``, ``source``."""


def _vehicle(vtype: Any, registration: str | None) -> GroundVehicle | None:
    if vtype is None and registration is None:
        return None
    return {"registration": registration,
            "type": getattr(vtype, "name", None),
            "title": getattr(vtype, "title", None),
            "kind": getattr(vtype, "kind", None)}


def type_geometry(vtype: Any, *, wheelbase_m: float | None = None,
                  track_front_m: float | None = None, track_rear_m: float | None = None
                  ) -> Geometry:
    """Wheelbase and tracks of a two-axle ground vehicle from its type, or as given.

    Given values win over the type's (and the result says which came from where). A type with
    more than two axles has no single wheelbase for four corners: give the figures explicitly.

    Parameters
    ----------
    vtype : VehicleType or None
    wheelbase_m, track_front_m, track_rear_m : float, optional
        Override or supply the figures, m. A missing rear track takes the front track.

    Raises
    ------
    InputError
        A figure missing (no type, or the type lacks it), or a type that is not a two-axle
        ground vehicle while a figure is missing.

    Examples
    --------
    >>> g = type_geometry(None, wheelbase_m=2.5, track_front_m=1.5)
    >>> g["wheelbase_m"], g["track_rear_m"], g["source"]["track_rear_m"]
    (2.5, 1.5, 'as the front track')
    """
    src: dict[str, str] = {}
    wb = tf = tr = None
    x0 = 0.0
    axles = tuple(getattr(vtype, "axles", ()) or ()) if vtype is not None else ()
    two = len(axles) == 2
    if vtype is not None and two:
        front, rear = axles
        x0 = front.x_m
        wb = rear.x_m - front.x_m
        tf, tr = front.track_m, rear.track_m
        src.update(wheelbase_m="type", track_front_m="type" if tf is not None else "",
                   track_rear_m="type" if tr is not None else "", front_axle_x_m="type")
    else:
        src["front_axle_x_m"] = "taken as 0 (the datum)" if vtype is None else ""
    if wheelbase_m is not None:
        wb, src["wheelbase_m"] = float(wheelbase_m), "given"
    if track_front_m is not None:
        tf, src["track_front_m"] = float(track_front_m), "given"
    if track_rear_m is not None:
        tr, src["track_rear_m"] = float(track_rear_m), "given"
    why = ""
    if vtype is not None and not two:
        why = (f"; type {vtype.name} has {len(axles)} axle(s), so its figures do not give four "
               "corners")
        if axles:
            x0 = axles[0].x_m
            src["front_axle_x_m"] = "type (first axle)"
    if wb is None:
        raise InputError("--wheelbase", MISSING, "a length, e.g. '3.9 m'" + why)
    if tf is None:
        raise InputError("--track", MISSING, "a track width, e.g. '1.72 m'" + why)
    if tr is None:
        tr, src["track_rear_m"] = tf, "as the front track"
    for field, v in (("--wheelbase", wb), ("--track", tf), ("--rear-track", tr)):
        if not math.isfinite(v) or v <= 0:
            raise InputError(field, v, "a length greater than 0")
    return Geometry(wheelbase_m=wb, track_front_m=tf, track_rear_m=tr, front_axle_x_m=x0,
                    source=src)


def angles_from_lift(lift_m: Sequence[float], wheelbase_m: float) -> list[float]:
    """Lift angles (degrees) from how far the raised axle's wheel centres were lifted.

    ``θ = asin(Δh / L)``: the wheel centres move on a circle of radius L about the grounded
    axle's wheel centres (rigid body).

    Examples
    --------
    >>> [round(a, 9) for a in angles_from_lift([0.5], 1.0)]
    [30.0]
    """
    out = []
    for i, h in enumerate(lift_m):
        if not math.isfinite(h) or h <= 0 or h >= wheelbase_m:
            raise InputError(item_field("--lift", i), h,
                             f"a lift height greater than 0 and less than the wheelbase "
                             f"{wheelbase_m:g} m")
        out.append(math.degrees(math.asin(h / wheelbase_m)))
    return out


def corner_weights_document(lf_kg: float, rf_kg: float, lr_kg: float, rr_kg: float,
                            geometry: Geometry, *, vtype: Any = None,
                            registration: str | None = None) -> CornersDocument:
    """Corner weights from four wheel-scale readings as a ``wbledger.corners/1`` document.

    Parameters
    ----------
    lf_kg, rf_kg, lr_kg, rr_kg : float
        Left front, right front, left rear, right rear loads, kg (left and right seen from
        behind, looking forward).
    geometry : Geometry
        From :func:`type_geometry`.
    vtype, registration : optional
        The vehicle, for the heading and the display units.

    Returns
    -------
    dict
        See the module notes. ``cg_m.x`` is in the datum's x (front-axle arm + wheelbase ×
        rear share); ``cg_m.y`` is positive right.

    Examples
    --------
    >>> g = type_geometry(None, wheelbase_m=2.5, track_front_m=1.5)
    >>> d = corner_weights_document(400, 380, 360, 360, g)
    >>> d["total_kg"], round(d["cg_m"]["x"], 6), d["diagonals_percent"]["LF+RR"]
    (1500.0, 1.2, 50.666666666666664)
    """
    c = corner_weights(lf_kg, rf_kg, lr_kg, rr_kg, geometry["wheelbase_m"],
                       geometry["track_front_m"], geometry["track_rear_m"],
                       geometry["front_axle_x_m"])
    units = vtype.units.to_dict() if vtype is not None else None
    return {
        "schema": CORNERS_SCHEMA,
        "caution": CAUTION_SHORT,
        "vehicle": _vehicle(vtype, registration),
        "units": units,
        "readings_kg": {"LF": float(lf_kg), "RF": float(rf_kg), "LR": float(lr_kg),
                        "RR": float(rr_kg)},
        "geometry_m": {k: geometry[k] for k in ("wheelbase_m", "track_front_m", "track_rear_m",
                                                "front_axle_x_m")},
        "geometry_source": dict(geometry["source"]),
        "total_kg": c.total,
        "front_kg": c.front, "rear_kg": c.rear, "left_kg": c.left, "right_kg": c.right,
        "cg_m": {"x": c.cg_x, "y": c.cg_y},
        "cg_x_behind_front_axle_m": c.cg_x - geometry["front_axle_x_m"],
        "percent": {"left": c.left_pct, "right": 100.0 - c.left_pct,
                    "front": 100.0 - c.rear_pct, "rear": c.rear_pct},
        "diagonals_percent": dict(c.diagonals),
        "diagonal_note": DIAGONAL_NOTE,
        "formulas": {"cg_x": "front_axle_x + L·(LR + RR)/T",
                     "cg_y": "[(RF − LF)·t_front/2 + (RR − LR)·t_rear/2]/T, positive right",
                     "left_percent": "(LF + LR)/T", "rear_percent": "(LR + RR)/T"},
    }


def cg_height_document(*, total_kg: float, wheelbase_m: float, wheel_radius_m: float,
                       level_kg: float, tilted_kg: Sequence[float], angles_deg: Sequence[float],
                       raised: str = "rear", total_tilted_kg: Sequence[float] | None = None,
                       datum_height_m: float | None = None, empty_mass_kg: float | None = None,
                       mass_rtol: float = 0.02, vtype: Any = None,
                       registration: str | None = None,
                       angle_source: str = "given") -> CgHeightDocument:
    """CG height from an axle-lift weighing as a ``wbledger.cg-height/1`` document.

    One axle is raised by θ; the other stays on the scales. With the rear raised the front
    axle load rises by ``W·(h − r)·tanθ / L`` (ISO 10392); with the front raised the rear axle
    load rises the same way, so the same fit applies to the grounded axle's loads.

    Parameters
    ----------
    total_kg : float
        Total mass W with the vehicle level, kg.
    wheelbase_m : float
        L, m (between the wheel centres of the grounded and the raised axle).
    wheel_radius_m : float
        Static loaded wheel radius r, m (the same front and rear).
    level_kg : float
        Load on the axle that stays on the scales, vehicle level, kg.
    tilted_kg, angles_deg : sequence of float
        That axle's load at each lift angle, kg, and the angles, degrees.
    raised : {"rear", "front"}
        Which axle was raised.
    total_tilted_kg : sequence of float, optional
        The total at each angle (both axles' scales); each must agree with W within 0.5 %.
    datum_height_m : float, optional
        Height above the ground of the type datum's z = 0 (vehicle level), m; with it the
        document gives ``z_m = h − datum_height_m``, the vertical arm the ledger stores.
    empty_mass_kg : float, optional
        The vehicle's recorded empty mass; the weighed total must agree within ``mass_rtol``
        for the height to be the empty vehicle's.
    mass_rtol : float
        Relative tolerance for ``empty_mass_kg`` (default 2 %).

    Raises
    ------
    InputError
        Unequal numbers of loads and angles, angles or loads out of range, totals that
        disagree, a weighed total far from the recorded empty mass.

    Examples
    --------
    >>> import math
    >>> W, L, r, h, wf = 1500.0, 2.7, 0.3, 0.55, 850.0
    >>> ft = [wf + W * (h - r) * math.tan(math.radians(a)) / L for a in (8.0, 12.0)]
    >>> d = cg_height_document(total_kg=W, wheelbase_m=L, wheel_radius_m=r, level_kg=wf,
    ...                        tilted_kg=ft, angles_deg=[8.0, 12.0], datum_height_m=0.3)
    >>> round(d["height_m"], 12), round(d["z_m"], 12), d["residual_rms_kg"] < 1e-9
    (0.55, 0.25, True)
    """
    if raised not in ("rear", "front"):
        raise InputError("--raised", raised, "'rear' or 'front'")
    grounded = "front" if raised == "rear" else "rear"
    tilted = [float(v) for v in tilted_kg]
    angles = [float(a) for a in angles_deg]
    _check_readings(grounded, tilted, angles, total_tilted_kg)
    _check_empty_mass(total_kg, empty_mass_kg, mass_rtol)
    try:
        res = cg_height_axle_lift(total_kg, wheelbase_m, level_kg, tilted,
                                  [math.radians(a) for a in angles], wheel_radius_m,
                                  total_tilted=total_tilted_kg, mass_rtol=0.005)
    except InputError as exc:
        _as_options(exc, grounded)
        raise
    heights = [float(v) for v in res.heights]
    z = None if datum_height_m is None else res.height - float(datum_height_m)
    readings: list[CgHeightReading] = []
    for i, (a, t) in enumerate(zip(angles, tilted)):
        readings.append(cast(CgHeightReading, {
            "angle_deg": a, f"{grounded}_tilted_kg": t, "load_change_kg": t - level_kg,
            "total_tilted_kg": None if total_tilted_kg is None else float(total_tilted_kg[i]),
            "height_m": heights[i]}))
    n = len(readings)
    return {
        "schema": CG_HEIGHT_SCHEMA,
        "caution": CAUTION_SHORT,
        "vehicle": _vehicle(vtype, registration),
        "units": vtype.units.to_dict() if vtype is not None else None,
        "method": ("ISO 10392 axle lift: h = r + L·(W′ − W)/(W·tanθ), W′ − W the change of the "
                   "grounded axle's load; " + (f"least squares over {n} angles" if n > 1
                                               else "one angle (no residual)")),
        "raised_axle": raised,
        "grounded_axle": grounded,
        "angle_source": angle_source,
        "inputs": cast(CgHeightInputs, {
            "total_kg": float(total_kg), "wheelbase_m": float(wheelbase_m),
            "wheel_radius_m": float(wheel_radius_m), f"{grounded}_level_kg": float(level_kg),
            "datum_height_m": None if datum_height_m is None else float(datum_height_m)}),
        "readings": readings,
        "height_m": res.height,
        "residual_rms_kg": res.residual_rms,
        "height_spread_m": (max(heights) - min(heights)) if n > 1 else 0.0,
        "z_m": z,
        "assumptions": ["rigid body: suspension blocked, fluids topped up or drained, nothing "
                        "loose", "equal static loaded wheel radius front and rear; tyre "
                        "deflection change not corrected",
                        "the vehicle weighed in its empty condition as the type data defines"],
    }


def _check_readings(grounded: str, tilted: list[float], angles: list[float],
                    total_tilted_kg: Sequence[float] | None) -> None:
    """One angle (and one total, if any) per tilted load, and at least one load."""
    if not tilted:
        raise InputError(f"--{grounded}-tilted", MISSING,
                         "at least one load with the axle raised, with its --angle or --lift")
    if len(angles) != len(tilted):
        raise InputError("--angle", angles,
                         f"one angle (or lift) per --{grounded}-tilted load: {len(tilted)} "
                         f"load(s), {len(angles)} angle(s)")
    if total_tilted_kg is not None and len(total_tilted_kg) != len(tilted):
        raise InputError("--total-tilted", list(total_tilted_kg),
                         f"one total per --{grounded}-tilted load ({len(tilted)})")


def _check_empty_mass(total_kg: float, empty_mass_kg: float | None, mass_rtol: float) -> None:
    """The weighed total is the recorded empty mass, within ``mass_rtol``."""
    if empty_mass_kg is not None and empty_mass_kg > 0:
        dev = (total_kg - empty_mass_kg) / empty_mass_kg
        if abs(dev) > mass_rtol:
            raise InputError(
                "--total", round(total_kg, 3),
                f"within {mass_rtol * 100:g} % of the recorded empty mass "
                f"{empty_mass_kg:.1f} kg (it is {dev * 100:+.1f} %)",
                hint="Weigh the vehicle in its empty condition, or record a new weighing first")


def _as_options(exc: InputError, grounded: str) -> None:
    """Name the command's options in an error of the core fit (and its angles in degrees)."""
    names = {"total_mass": "--total", "wheelbase": "--wheelbase",
             "wheel_radius": "--wheel-radius", "front_level": f"--{grounded}-level",
             "front_tilted": f"--{grounded}-tilted", "theta_rad": "--angle",
             "total_tilted": "--total-tilted"}
    base, _, rest = exc.field.partition("[")
    if base in names:
        exc.field = item_field(names[base], int(rest.rstrip("]"))) if rest else names[base]
        if base == "theta_rad":
            exc.value = _degrees_of(exc.value)
            exc.allowed = _degrees_text(exc.allowed)
        exc.args = (exc._build(),)


def _degrees_of(value: Any) -> Any:
    try:
        if isinstance(value, (list, tuple)):
            return [round(math.degrees(v), 6) for v in value]
        return round(math.degrees(float(value)), 6)
    except (TypeError, ValueError):
        return value


def _degrees_text(text: str) -> str:
    # "a lift angle of 2° to 45° (0.03491 to 0.7854 rad)" -> drop the radians for CLI users.
    i = text.find(" (")
    return text[:i] if i > 0 and text.endswith("rad)") else text


def rule_set_document(rules: Any, *, lengths_ft: Sequence[float] | None = None,
                      axle_counts: Sequence[int] = (2, 3, 4, 5, 6, 7)) -> RuleSetDocument:
    """A rule set (:class:`ledger.rules.RuleSetFile`) as a ``wbledger.axle-rules/1`` document,
    with the bridge-formula table for ``lengths_ft`` when given and the rule set uses it.

    Examples
    --------
    >>> from ledger.rules import load_rule_set
    >>> d = rule_set_document(load_rule_set("us-federal-interstate"), lengths_ft=[10])
    >>> d["bridge_table"]["rows"][0]["max_lb"][:2], d["caution"][:25]
    ([40000.0, 43500.0], 'Axle-group rules are show')
    """
    doc = cast(RuleSetDocument, {"schema": "wbledger.axle-rules/1", "caution": GROUND_CAUTION,
                                 **rules.to_dict(), "bridge_table": None})
    if lengths_ft is not None and rules.bridge_formula:
        doc["bridge_table"] = bridge_table(rules, list(lengths_ft), tuple(axle_counts))
    return doc
