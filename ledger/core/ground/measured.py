"""Figures from weighing a road vehicle: corner weights, and CG height by the axle-lift method."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ledger.core._common import finite_float
from ledger.core.ground._inputs import _vec
from ledger.errors import InputError

__all__ = ["CornerWeights", "corner_weights", "AxleLiftResult", "cg_height_axle_lift"]


@dataclass(frozen=True)
class CornerWeights:
    """Result of :func:`corner_weights`. Percentages are of the total.

    The "cross weight" has two conventions in use, so both diagonals are given and named:
    ``rf_lr_pct`` = (RF + LR)/T and ``lf_rr_pct`` = (LF + RR)/T; :attr:`diagonals` maps the names
    ``"RF+LR"`` and ``"LF+RR"`` to them.
    """

    total: float
    front: float
    rear: float
    left: float
    right: float
    cg_x: float
    cg_y: float
    left_pct: float
    rear_pct: float
    rf_lr_pct: float
    lf_rr_pct: float

    @property
    def diagonals(self) -> dict[str, float]:
        """Both diagonal ("cross weight") percentages, named by their corners."""
        return {"RF+LR": self.rf_lr_pct, "LF+RR": self.lf_rr_pct}


def corner_weights(lf: float, rf: float, lr: float, rr: float, wheelbase: float,
                   track_front: float, track_rear: float,
                   front_axle_x: float = 0.0) -> CornerWeights:
    """Totals, percentages and CG from four wheel-scale readings.

    ``cg_x = front_axle_x + L·(LR + RR)/T``;
    ``cg_y = [(RF − LF)·t_f/2 + (RR − LR)·t_r/2] / T`` (positive right);
    left % = (LF + LR)/T; rear % = (LR + RR)/T; both diagonals, named.

    Parameters
    ----------
    lf, rf, lr, rr : float
        Corner loads, kg, 0 or more (left front, right front, left rear, right rear).
    wheelbase, track_front, track_rear : float
        m, greater than 0.
    front_axle_x : float
        Arm of the front axle from the datum, m.

    Returns
    -------
    CornerWeights

    Examples
    --------
    >>> c = corner_weights(400.0, 380.0, 360.0, 360.0, 2.5, 1.5, 1.5)
    >>> round(c.cg_x, 6), round(c.cg_y, 6), round(c.left_pct, 4)
    (1.2, -0.01, 50.6667)
    >>> {k: round(v, 4) for k, v in c.diagonals.items()}
    {'RF+LR': 49.3333, 'LF+RR': 50.6667}
    """
    vals = {}
    for name, v in (("lf", lf), ("rf", rf), ("lr", lr), ("rr", rr)):
        f = finite_float(v, name, "a finite corner load in kg of 0 or more")
        if f < 0:
            raise InputError(name, f, "a finite corner load in kg of 0 or more")
        vals[name] = f
    for name, v in (("wheelbase", wheelbase), ("track_front", track_front),
                    ("track_rear", track_rear)):
        f = finite_float(v, name, "a finite length in m greater than 0")
        if f <= 0:
            raise InputError(name, f, "a finite length in m greater than 0")
        vals[name] = f
    x0 = finite_float(front_axle_x, "front_axle_x", "a finite arm in m")
    LF, RF, LR, RR = vals["lf"], vals["rf"], vals["lr"], vals["rr"]
    T = LF + RF + LR + RR
    if T <= 0:
        raise InputError("lf, rf, lr, rr", [LF, RF, LR, RR], "corner loads with a total above 0")
    front, rear = LF + RF, LR + RR
    cg_y = ((RF - LF) * vals["track_front"] / 2 + (RR - LR) * vals["track_rear"] / 2) / T
    return CornerWeights(
        total=T, front=front, rear=rear, left=LF + LR, right=RF + RR,
        cg_x=x0 + vals["wheelbase"] * rear / T, cg_y=cg_y,
        left_pct=100 * (LF + LR) / T, rear_pct=100 * rear / T,
        rf_lr_pct=100 * (RF + LR) / T, lf_rr_pct=100 * (LF + RR) / T)


@dataclass(frozen=True)
class AxleLiftResult:
    """Result of :func:`cg_height_axle_lift`.

    Attributes
    ----------
    height : float
        CG height above the ground, m (least-squares fit over the angles).
    heights : ndarray
        The height from each angle alone, m.
    residual_rms : float
        RMS residual of the fit in the front-axle load, kg (0 for one angle).
    """

    height: float
    heights: np.ndarray
    residual_rms: float


def cg_height_axle_lift(total_mass: float, wheelbase: float, front_level: float, front_tilted,
                        theta_rad, wheel_radius: float, *, total_tilted=None,
                        mass_rtol: float = 0.005, min_angle_rad: float = math.radians(2.0),
                        max_angle_rad: float = math.radians(45.0)) -> AxleLiftResult:
    """CG height by the axle-lift method (ISO 10392): ``h = r + L·(W_f′ − W_f)/(W·tanθ)``.

    Geometry and derivation. The rear axle is raised so that the line through the wheel centres
    is at θ to the horizontal; the front wheels stay on the scale. L is the distance between the
    wheel centres along that line (the level wheelbase); the CG lies a distance ``a`` behind the
    front wheel centre along the line and ``h − r`` above it, perpendicular to it (h measured
    level, r the static loaded wheel radius, the same front and rear). Each wheel's contact is
    directly below its centre, so horizontally the rear contact is at ``L·cosθ`` and the CG at
    ``a·cosθ − (h − r)·sinθ`` from the front contact. Moments about the rear contact:
    ``W_f′·L·cosθ = W·(L·cosθ − a·cosθ + (h − r)·sinθ)``; with ``W_f = W·(L − a)/L`` this is
    ``W_f′ = W_f + W·(h − r)·tanθ / L``, which rearranges to the formula. It is exact for a rigid
    body (suspension blocked, fluids not moving) with rigid round wheels of equal loaded radius;
    in practice tyre deflection changes as the load shifts, which the standard asks to account
    for. To raise the front axle instead, pass the rear-axle loads as ``front_*``: the relation is
    symmetric.

    Several angles are fitted by least squares through the origin:
    ``(h − r) = (L/W)·Σ ΔW_i tanθ_i / Σ tan²θ_i``.

    Parameters
    ----------
    total_mass : float
        Mass W, kg (level weighing).
    wheelbase : float
        L, m.
    front_level : float
        Front axle load with the vehicle level, kg; between 0 and W.
    front_tilted : float or array_like
        Front axle load with the rear raised, kg, one per angle.
    theta_rad : float or array_like
        Lift angle of each measurement, rad, from ``min_angle_rad`` to ``max_angle_rad``.
    wheel_radius : float
        Static loaded wheel radius r, m.
    total_tilted : float or array_like, optional
        Total measured at each angle (front + rear); must agree with W within ``mass_rtol``.
    mass_rtol : float
        Relative tolerance for ``total_tilted``.
    min_angle_rad, max_angle_rad : float
        Accepted lift angles. Below the minimum the load change is lost in the scale resolution
        (a guard chosen here, not the standard's figure).

    Returns
    -------
    AxleLiftResult

    Raises
    ------
    InputError
        Angle too small or too large, loads outside 0…W, totals that disagree, mismatched
        lengths, or a fit that puts the CG below the ground.

    Examples
    --------
    >>> import math
    >>> th = math.radians(10.0)
    >>> W, L, Wf, r, h = 1500.0, 2.7, 850.0, 0.3, 0.55
    >>> Wf_t = Wf + W * (h - r) * math.tan(th) / L
    >>> round(cg_height_axle_lift(W, L, Wf, Wf_t, th, r).height, 12)
    0.55
    """
    W = finite_float(total_mass, "total_mass", "a finite mass in kg greater than 0")
    if W <= 0:
        raise InputError("total_mass", W, "a finite mass in kg greater than 0")
    L = finite_float(wheelbase, "wheelbase", "a finite length in m greater than 0")
    if L <= 0:
        raise InputError("wheelbase", L, "a finite length in m greater than 0")
    r = finite_float(wheel_radius, "wheel_radius", "a finite radius in m of 0 or more")
    if r < 0:
        raise InputError("wheel_radius", r, "a finite radius in m of 0 or more")
    wf = finite_float(front_level, "front_level", "a finite load in kg")
    if not 0 < wf < W:
        raise InputError("front_level", wf, f"a load between 0 and the total {W:g} kg")
    ft, th = _tilted_measurements(W, front_tilted, theta_rad, total_tilted, mass_rtol,
                                  min_angle_rad, max_angle_rad)
    tan = np.tan(th)
    dw = ft - wf
    slope = float(dw @ tan / (tan @ tan))  # ΔW per unit tanθ = W·(h − r)/L
    h = r + L * slope / W
    if h < 0:
        raise InputError("front_tilted", ft.tolist(),
                         "loads that put the CG above the ground; the fit gives "
                         f"{h:.3f} m", hint="Check which axle was raised and the sign of "
                                            "the angles")
    resid = dw - slope * tan
    return AxleLiftResult(height=h, heights=r + L * dw / (W * tan),
                          residual_rms=float(np.sqrt(np.mean(resid**2))))


def _tilted_measurements(W: float, front_tilted, theta_rad, total_tilted, mass_rtol: float,
                         min_angle_rad: float, max_angle_rad: float):
    """The tilted front loads and their lift angles as arrays, checked (loads within 0…W,
    angles within the accepted range, totals that agree with the level total)."""
    ft = np.atleast_1d(_vec(np.atleast_1d(front_tilted), "front_tilted", "finite loads in kg"))
    th = np.atleast_1d(_vec(np.atleast_1d(theta_rad), "theta_rad", "finite angles in rad"))
    if th.shape != ft.shape:
        raise InputError("theta_rad", th.tolist(), f"one angle per tilted load ({ft.size})")
    for i in range(ft.size):
        if not 0 <= ft[i] <= W:
            raise InputError(f"front_tilted[{i}]", float(ft[i]),
                             f"a load from 0 to the total {W:g} kg")
        if not min_angle_rad <= th[i] <= max_angle_rad:
            raise InputError(
                f"theta_rad[{i}]", float(th[i]),
                f"a lift angle of {math.degrees(min_angle_rad):g}° to "
                f"{math.degrees(max_angle_rad):g}° ({min_angle_rad:.4g} to {max_angle_rad:.4g} "
                f"rad)", hint="Raise the axle further; a small angle gives a load change lost "
                              "in the scale resolution")
    if total_tilted is not None:
        tt = _vec(np.atleast_1d(total_tilted), "total_tilted", "finite masses in kg", ft.size)
        for i in range(ft.size):
            if abs(tt[i] - W) > mass_rtol * W:
                raise InputError(
                    f"total_tilted[{i}]", float(tt[i]),
                    f"within {mass_rtol * 100:g} % of the level total {W:g} kg",
                    hint="Re-zero the scales and check that nothing moved or was removed")
    return ft, th
