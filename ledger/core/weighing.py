"""Weighing: empty weight and CG from scale readings, corrections, vertical CG by pitching.

SI throughout: masses in kg (a scale reading is taken as the mass it indicates), arms in m,
angles in radians. x is positive aft of the datum, y positive right, z positive up.

Sources
-------
- FAA-H-8083-1 (Aircraft Weight and Balance Handbook), weighing chapter: net weight at each
  weighing point = scale reading − tare; the arm of a point is the axle centreline or jack-pad
  centre; CG = Σ(R·x)/ΣR; if weighed with fuel, remove the usable fuel at its arm and keep the
  unusable fuel; add any item (such as drained oil) that belongs to the empty condition.
- Vertical CG from a pitched weighing: rigid-body statics, derived in
  :func:`vertical_cg_from_pitch` (no handbook formula is used).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from ledger.core._common import finite_float
from ledger.errors import InputError, MassPropertiesError

__all__ = [
    "PLAUSIBLE_EMPTY_MULTIPLE",
    "plausible_empty_mass",
    "Correction",
    "BreakdownLine",
    "WeighingResult",
    "empty_weight_from_scales",
    "PitchedCG",
    "vertical_cg_from_pitch",
]


#: A weighed empty mass is plausible for a type up to this multiple of the type's largest
#: maximum mass (maximum ramp or take-off mass; gross vehicle rating). An empty vehicle weighs
#: less than the most it may weigh loaded, so 1.0 already gives room; a result beyond it is a
#: misread scale, a reading in the wrong unit or a reading typed twice, not a vehicle.
PLAUSIBLE_EMPTY_MULTIPLE = 1.0


def plausible_empty_mass(mass: float, largest_max_mass: float | None) -> bool:
    """Whether ``mass`` (kg) is a plausible empty mass for a type whose largest maximum mass is
    ``largest_max_mass`` (kg; None when the type states none).

    Plausible: finite, above 0, and not above :data:`PLAUSIBLE_EMPTY_MULTIPLE` times the largest
    maximum mass (common practice: the empty weight is part of every loaded weight that the
    type's limits bound).

    Examples
    --------
    >>> plausible_empty_mass(700.0, 1111.0), plausible_empty_mass(1200.0, 1111.0)
    (True, False)
    >>> plausible_empty_mass(float("inf"), None), plausible_empty_mass(0.0, 1111.0)
    (False, False)
    """
    if not (math.isfinite(mass) and mass > 0):
        return False
    return largest_max_mass is None or mass <= PLAUSIBLE_EMPTY_MULTIPLE * largest_max_mass


@dataclass(frozen=True)
class Correction:
    """An item added to or removed from the as-weighed condition.

    Attributes
    ----------
    label : str
        What it is ("usable fuel, left tank", "engine oil drained").
    mass : float
        Its mass, kg, 0 or more.
    x, y, z : float
        Its arms, m. ``y`` is needed when the weighing points have lateral arms, ``z`` when an
        as-weighed vertical CG is given.
    sign : int
        +1 to add the item (it belongs to the empty condition but was off the vehicle), −1 to
        remove it (it was on the vehicle but is not part of the empty condition).

    Examples
    --------
    >>> Correction.remove("usable fuel", 100.0, 2.4).sign
    -1
    """

    label: str
    mass: float
    x: float
    y: float | None = None
    z: float | None = None
    sign: int = 1

    @classmethod
    def add(cls, label: str, mass: float, x: float, y: float | None = None,
            z: float | None = None) -> Correction:
        """An item to add to the as-weighed condition (e.g. oil drained for weighing)."""
        return cls(label, mass, x, y, z, +1)

    @classmethod
    def remove(cls, label: str, mass: float, x: float, y: float | None = None,
               z: float | None = None) -> Correction:
        """An item to remove from the as-weighed condition (e.g. usable fuel on board)."""
        return cls(label, mass, x, y, z, -1)


@dataclass(frozen=True)
class BreakdownLine:
    """One line of the weighing computation: a weighing point's net reaction or a correction.

    ``mass`` is signed (negative for a removed item); moments are ``mass × arm`` in kg·m, ``None``
    for an axis that is not computed.
    """

    label: str
    mass: float
    moment_x: float
    moment_y: float | None
    moment_z: float | None


@dataclass(frozen=True)
class WeighingResult:
    """Result of :func:`empty_weight_from_scales`.

    ``weighed_*`` describe the vehicle as it sat on the scales; the plain fields describe it after
    the corrections. Lateral fields are ``None`` when no lateral arms were given, vertical fields
    ``None`` when no as-weighed vertical CG was given (a level weighing cannot find it).
    """

    points: tuple[str, ...]
    net: np.ndarray
    weighed_mass: float
    weighed_moment_x: float
    weighed_moment_y: float | None
    weighed_cg_x: float
    weighed_cg_y: float | None
    mass: float
    moment_x: float
    moment_y: float | None
    moment_z: float | None
    cg_x: float
    cg_y: float | None
    cg_z: float | None
    breakdown: tuple[BreakdownLine, ...]


def _vector(value, n: int | None, field: str, names: Sequence[str] | None = None) -> np.ndarray:
    try:
        arr = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise MassPropertiesError(field, value, "a list of finite numbers") from None
    if n is not None:
        if arr.ndim == 0:
            arr = np.full(n, float(arr))
        if arr.shape != (n,):
            raise MassPropertiesError(field, value, f"{n} values, one per weighing point")
    elif arr.ndim != 1 or arr.size == 0:
        raise MassPropertiesError(field, value, "a non-empty list, one value per weighing point")
    bad = ~np.isfinite(arr)
    if np.any(bad):
        i = int(np.argmax(bad))
        who = repr(names[i]) if names else str(i)
        raise MassPropertiesError(f"{field}[{who}]", float(arr[i]), "a finite number")
    return arr


def _finite(value, field: str, allowed: str) -> float:
    return finite_float(value, field, allowed, MassPropertiesError)


def _needed_arm(value, field: str, because: str) -> float:
    if value is None:
        raise MassPropertiesError(field, None, f"an arm in m, since {because}")
    return _finite(value, field, "a finite arm in m")


def empty_weight_from_scales(readings, tares, x, y=None, *, points: Sequence[str] | None = None,
                             corrections: Sequence[Correction] = (),
                             z_cg: float | None = None) -> WeighingResult:
    """Empty mass and CG from scale readings at the weighing points, with corrections.

    At each point the net reaction is ``reading − tare``; the as-weighed mass is their sum and
    the CG is ``Σ(R·x)/ΣR`` per axis (FAA-H-8083-1, weighing chapter). Each correction then adds
    or removes ``mass`` at its arms: for a vehicle weighed with fuel, remove the usable fuel at
    the tank arm and keep the unusable fuel; add oil drained for the weighing, and so on.

    Parameters
    ----------
    readings : array_like, shape (n,)
        Scale readings at the n weighing points, kg (nose, left main, right main; or axles).
    tares : float or array_like, shape (n,)
        Tare at each point (chocks, blocks, jacks left on the scale), kg.
    x : array_like, shape (n,)
        Longitudinal arm of each point (axle centreline or jack-pad centre), m.
    y : array_like, shape (n,), optional
        Lateral arm of each point, m (positive right). Gives the lateral CG.
    points : sequence of str, optional
        Names of the points for the breakdown and error messages (default "point 1", …).
    corrections : sequence of Correction
        Items to add or remove, in order.
    z_cg : float, optional
        As-weighed vertical CG, m (for example from :func:`vertical_cg_from_pitch`); when given,
        the corrected vertical CG is computed too.

    Returns
    -------
    WeighingResult

    Raises
    ------
    MassPropertiesError
        A non-finite reading, tare or arm (naming the point); a negative net reaction (naming the
        point); a zero total; a correction without the arms needed; a corrected total of 0 or
        less.

    Examples
    --------
    Nose wheel at 1.27 m, mains at 3.25 m, weighed with 60 kg of usable fuel at 2.40 m:

    >>> r = empty_weight_from_scales([160.0, 420.0, 424.0], [4.0, 0.0, 0.0], [1.27, 3.25, 3.25],
    ...                              points=["nose", "left main", "right main"],
    ...                              corrections=[Correction.remove("usable fuel", 60.0, 2.40)])
    >>> round(r.weighed_mass, 1), round(r.weighed_cg_x, 4)
    (1000.0, 2.9411)
    >>> round(r.mass, 1), round(r.cg_x, 4)
    (940.0, 2.9757)
    """
    names, rd, net, xs, ys = _net_reactions(readings, tares, x, y, points)
    n = len(names)
    w0 = float(net.sum())
    if w0 <= 0:
        raise MassPropertiesError("readings", rd.tolist(),
                                  "net readings whose total is greater than 0 kg")
    mx0 = float(net @ xs)
    my0 = None if ys is None else float(net @ ys)
    zc = None if z_cg is None else _finite(z_cg, "z_cg", "a finite vertical CG in m")

    lines = [BreakdownLine(f"net at {names[i]}", float(net[i]), float(net[i] * xs[i]),
                           None if ys is None else float(net[i] * ys[i]),
                           None if zc is None else float(net[i] * zc))
             for i in range(n)]
    mass, mx = w0, mx0
    my = my0
    mz = None if zc is None else w0 * zc
    for j, c in enumerate(corrections):
        line = _correction_line(c, j, with_y=my is not None, with_z=mz is not None)
        if my is not None and line.moment_y is not None:
            my += line.moment_y
        if mz is not None and line.moment_z is not None:
            mz += line.moment_z
        mass += line.mass
        mx += line.moment_x
        lines.append(line)
    if mass <= 0:
        raise MassPropertiesError("corrections", [c.label for c in corrections],
                                  f"corrections that leave more than 0 kg (they leave {mass:g} kg)")
    return WeighingResult(
        points=names, net=net, weighed_mass=w0, weighed_moment_x=mx0, weighed_moment_y=my0,
        weighed_cg_x=mx0 / w0, weighed_cg_y=None if my0 is None else my0 / w0,
        mass=mass, moment_x=mx, moment_y=my, moment_z=mz, cg_x=mx / mass,
        cg_y=None if my is None else my / mass, cg_z=None if mz is None else mz / mass,
        breakdown=tuple(lines))


def _net_reactions(readings, tares, x, y, points):
    """The weighing points' names, readings, net reactions (reading − tare, 0 or more) and
    arms, checked one per point."""
    try:
        n = int(np.asarray(readings, dtype=object).reshape(-1).size)
    except (TypeError, ValueError):  # pragma: no cover - numpy accepts any object here
        n = 0
    if np.ndim(readings) != 1 or n == 0:
        raise MassPropertiesError("readings", readings,
                                  "a non-empty list, one reading per weighing point")
    names = tuple(points) if points is not None else tuple(f"point {i + 1}" for i in range(n))
    if len(names) != n:
        raise MassPropertiesError("points", list(names), f"{n} names, one per reading")
    rd = _vector(readings, n, "readings", names)
    tr = _vector(tares, n, "tares", names)
    xs = _vector(x, n, "x", names)
    ys = None if y is None else _vector(y, n, "y", names)
    net = rd - tr
    for i in range(n):
        if net[i] < 0:
            raise MassPropertiesError(
                f"net reaction at {names[i]!r}", float(net[i]),
                f"a net reading of 0 kg or more (reading {rd[i]:g} − tare {tr[i]:g})",
                hint="Check the tare and the scale zero")
    return names, rd, net, xs, ys


def _correction_line(c: Correction, j: int, *, with_y: bool, with_z: bool) -> BreakdownLine:
    """One correction, checked, as its line of the breakdown (signed mass and moments)."""
    field = f"corrections[{j}]" + (f" ({c.label!r})" if c.label else "")
    cm = _finite(c.mass, f"{field}.mass", "a finite mass of 0 kg or more")
    if cm < 0:
        raise MassPropertiesError(f"{field}.mass", cm,
                                  "a mass of 0 kg or more (use sign=-1 to remove an item)")
    if c.sign not in (1, -1):
        raise MassPropertiesError(f"{field}.sign", c.sign, "+1 (add) or -1 (remove)")
    cx = _finite(c.x, f"{field}.x", "a finite arm in m")
    dm = c.sign * cm
    line_y = line_z = None
    if with_y:
        line_y = dm * _needed_arm(c.y, f"{field}.y", "the weighing points have one")
    if with_z:
        line_z = dm * _needed_arm(c.z, f"{field}.z", "z_cg was given")
    return BreakdownLine(c.label, dm, dm * cx, line_y, line_z)


@dataclass(frozen=True)
class PitchedCG:
    """Result of :func:`vertical_cg_from_pitch`.

    Attributes
    ----------
    z_cg : float
        Vertical CG, m, in the datum's z (``plane_z + height``).
    height : float
        Height of the CG above the plane of the reaction points, m (least-squares fit).
    heights : ndarray
        The height from each pitched weighing alone, m.
    residual_rms : float
        RMS of the fit residuals in the apparent CG shift, m (0 for one angle).
    """

    z_cg: float
    height: float
    heights: np.ndarray
    residual_rms: float


def vertical_cg_from_pitch(x_cg_level: float, x_cg_pitched, pitch_rad, *, plane_z: float = 0.0,
                           min_angle_rad: float = math.radians(2.0),
                           max_angle_rad: float = math.radians(60.0),
                           mass_level: float | None = None, mass_pitched=None,
                           mass_rtol: float = 0.005) -> PitchedCG:
    """Vertical CG from weighings with the vehicle pitched nose-up about its lateral axis.

    Derivation (rigid body, reactions vertical, reaction points fixed to the body such as jack
    pads or load cells, all in one plane parallel to the body's x–y plane). Take body axes with
    the origin on that plane: a point at body (x, z) has, after a nose-up pitch θ, the horizontal
    position ``X = x·cosθ + z·sinθ`` (aft positive). The reaction points (z = 0) sit at
    ``x_i·cosθ``, so moment balance about any lateral line gives the horizontal CG position
    ``Σ R_i x_i cosθ / W``. If the pitched readings are reduced with the *level* (body) arms,
    the apparent CG is ``x_app = Σ R_i x_i / W`` and ``x_app·cosθ = x_cg·cosθ + h·sinθ``, so

        ``x_app − x_cg = h·tanθ``  →  ``h = (x_app − x_cg) / tanθ``,

    exact under those assumptions, with h the CG height above the reaction-point plane. For
    several angles the fit is the least-squares ``h = Σ Δx_i tanθ_i / Σ tan²θ_i``. Wheels rolling
    on scales do not keep body-fixed contact points; for a wheeled vehicle use the axle-lift
    relation in :mod:`ledger.core.ground`, which accounts for the wheel radius.

    Parameters
    ----------
    x_cg_level : float
        Longitudinal CG from the level weighing, m.
    x_cg_pitched : float or array_like
        Apparent longitudinal CG from each pitched weighing, computed with the level arms (for
        example ``empty_weight_from_scales(pitched_readings, tares, level_x).weighed_cg_x``), m.
    pitch_rad : float or array_like
        Nose-up pitch of each pitched weighing, radians (nose-down is negative).
    plane_z : float
        Vertical arm (z) of the reaction-point plane, m.
    min_angle_rad, max_angle_rad : float
        Accepted magnitude of the pitch. Below the minimum the CG shift is too small against
        scale resolution to give a height (a guard chosen here, not a standard's figure).
    mass_level, mass_pitched : float, optional
        Total net mass of the level and pitched weighings; if given they must agree within
        ``mass_rtol``, else the weighings are inconsistent.

    Returns
    -------
    PitchedCG

    Raises
    ------
    InputError
        Non-finite values, angles too small or too large, mismatched lengths, or masses that do
        not agree.

    Examples
    --------
    A CG 0.8 m above the jack-pad plane, level CG 3.0 m, pitched 5° nose-up:

    >>> import math
    >>> th = math.radians(5.0)
    >>> r = vertical_cg_from_pitch(3.0, 3.0 + 0.8 * math.tan(th), th, plane_z=0.5)
    >>> round(r.height, 12), round(r.z_cg, 12)
    (0.8, 1.3)
    """
    xl = _finite(x_cg_level, "x_cg_level", "a finite CG arm in m")
    xp = np.atleast_1d(np.asarray(x_cg_pitched, dtype=float))
    th = np.atleast_1d(np.asarray(pitch_rad, dtype=float))
    if xp.ndim != 1 or th.shape != xp.shape:
        raise InputError("pitch_rad", pitch_rad,
                         f"one pitch angle per pitched weighing ({xp.size})")
    for name, arr in (("x_cg_pitched", xp), ("pitch_rad", th)):
        if not np.all(np.isfinite(arr)):
            i = int(np.argmax(~np.isfinite(arr)))
            raise InputError(f"{name}[{i}]", float(arr[i]), "a finite number")
    pz = _finite(plane_z, "plane_z", "a finite vertical arm in m")
    for i, t in enumerate(th):
        if not min_angle_rad <= abs(t) <= max_angle_rad:
            raise InputError(
                f"pitch_rad[{i}]", float(t),
                f"a pitch of {math.degrees(min_angle_rad):g}° to {math.degrees(max_angle_rad):g}° "
                f"({min_angle_rad:.4g} to {max_angle_rad:.4g} rad) either way",
                hint="Pitch the vehicle further; a small angle gives a CG shift lost in the "
                     "scale resolution")
    if mass_level is not None and mass_pitched is not None:
        ml = _finite(mass_level, "mass_level", "a finite mass in kg greater than 0")
        mp = np.atleast_1d(np.asarray(mass_pitched, dtype=float))
        for i, m in enumerate(mp):
            if not math.isfinite(m) or abs(m - ml) > mass_rtol * abs(ml):
                raise InputError(
                    f"mass_pitched[{i}]", float(m),
                    f"within {mass_rtol * 100:g} % of the level weighing's {ml:g} kg",
                    hint="Re-zero the scales and check nothing moved or was removed")
    tan = np.tan(th)
    dx = xp - xl
    h = float(dx @ tan / (tan @ tan))
    resid = dx - h * tan
    return PitchedCG(z_cg=pz + h, height=h, heights=dx / tan,
                     residual_rms=float(np.sqrt(np.mean(resid**2))))
