"""What to move, and how far, to bring an overloaded axle within its rating."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ledger.core._common import finite_float
from ledger.core.ground.axles import AxleLoads, _groups_and_fractions, axle_loads
from ledger.errors import InputError

__all__ = ["AxleFix", "axle_overload_fix"]


@dataclass(frozen=True)
class AxleFix:
    """Result of :func:`axle_overload_fix`.

    Attributes
    ----------
    needed : bool
        False when every support is within its limit (nothing to do).
    feasible : bool
        Whether moving mass alone can bring the supports within limits.
    overloaded : tuple of int
        Indices (0 front, 1 rear) of the supports over their limit.
    moment_shift : float
        Required change of moment, kg·m, positive aft: move a mass m by d with ``m·d`` equal
        to it.
    direction : str or None
        ``"aft"`` or ``"forward"``.
    distance : float or None
        How far the given payload mass must move, m (signed, positive aft).
    mass : float or None
        How much mass must move by the given distance, kg.
    offload : float
        When not feasible: the least mass to take off, kg (it must then also sit so that both
        supports are within limits).
    new_cg_x : float
        CG after the move, m.
    new_group_load, new_axle_load : ndarray
        Loads after the move, kg.
    note : str
        One line saying what to do.
    """

    needed: bool
    feasible: bool
    overloaded: tuple[int, ...]
    moment_shift: float
    direction: str | None
    distance: float | None
    mass: float | None
    offload: float
    new_cg_x: float
    new_group_load: np.ndarray
    new_axle_load: np.ndarray
    note: str


def axle_overload_fix(total_mass: float, cg_x: float, axle_x, ratings, *,
                      payload_mass: float | None = None, move_distance: float | None = None,
                      groups=None, shares=None, gross_rating: float | None = None) -> AxleFix:
    """How far to move a payload (or how much to move) to bring an overloaded axle within rating.

    Moving a mass m by d (positive aft) moves the CG by ``m·d/W`` and moves ``m·d/L`` of load
    from the front support to the rear one (L the distance between the supports). A group's
    limit is the smallest ``rating_i / share_i`` over its rated axles. Moving mass cannot fix an
    excess over the gross rating or over the sum of the support limits; then the answer is to
    offload.

    Parameters
    ----------
    total_mass, cg_x, axle_x, groups, shares
        As in :func:`axle_loads`.
    ratings : array_like, shape (n,)
        Axle ratings, kg (``nan`` where none).
    payload_mass : float, optional
        The mass to move, kg: the answer is the distance.
    move_distance : float, optional
        How far a mass can be moved, m (magnitude): the answer is the mass.
    gross_rating : float, optional
        Gross vehicle weight rating, kg.

    Returns
    -------
    AxleFix

    Examples
    --------
    1500 kg with CG 1.2 m behind the front axle, wheelbase 3 m, front rated 850 kg:

    >>> f = axle_overload_fix(1500.0, 1.2, [0.0, 3.0], [850.0, 800.0], payload_mass=100.0)
    >>> f.direction, round(f.distance, 6), f.new_axle_load.round(6).tolist()
    ('aft', 1.5, [850.0, 650.0])
    """
    base = axle_loads(total_mass, cg_x, axle_x, groups=groups, shares=shares)
    n = base.axle.size
    fracs, limits = _group_limits(base, ratings, shares)
    w = base.total
    gl = base.group_load
    span = float(base.group_x[1] - base.group_x[0])
    tol = 1e-9 * w
    over = tuple(i for i in range(2) if gl[i] > limits[i] + tol)
    if payload_mass is not None and move_distance is not None:
        raise InputError("move_distance", move_distance,
                         "nothing when payload_mass is given (give one of the two)")

    if gross_rating is not None:
        gross = finite_float(gross_rating, "gross_rating",
                             "a finite rating in kg greater than 0")
        if w > gross + tol:
            return AxleFix(needed=True, feasible=False, overloaded=over, moment_shift=0.0,
                           direction=None, distance=None, mass=None, offload=w - gross,
                           new_cg_x=float(cg_x), new_group_load=gl, new_axle_load=base.axle,
                           note=f"over the gross rating by {w - gross:.1f} kg: offload; moving "
                                f"mass does not help")
    if not over:
        return AxleFix(needed=False, feasible=True, overloaded=(), moment_shift=0.0,
                       direction=None, distance=0.0 if payload_mass is not None else None,
                       mass=0.0 if move_distance is not None else None, offload=0.0,
                       new_cg_x=float(cg_x), new_group_load=gl, new_axle_load=base.axle,
                       note="every axle is within its rating")
    if len(over) == 2 or limits.sum() < w - tol:
        excess = w - float(limits.sum())
        return AxleFix(needed=True, feasible=False, overloaded=over, moment_shift=0.0,
                       direction=None, distance=None, mass=None, offload=max(excess, 0.0),
                       new_cg_x=float(cg_x), new_group_load=gl, new_axle_load=base.axle,
                       note=f"the axle limits together carry {float(limits.sum()):.1f} kg, "
                            f"less than {w:.1f} kg: offload at least {max(excess, 0):.1f} kg")
    j = over[0]
    delta = float(gl[j] - limits[j])
    shift = (-delta if j == 1 else delta) * span  # change of rear load × span = m·d
    new_gl = gl + np.array([-shift / span, shift / span])
    new_axle = np.zeros(n)
    for gi, g in enumerate(base.groups):
        new_axle[list(g)] = new_gl[gi] * fracs[list(g)]
    direction = "aft" if shift > 0 else "forward"
    distance, mass, what = _what_to_move(shift, direction, payload_mass, move_distance)
    side = "front" if j == 0 else "rear"
    return AxleFix(needed=True, feasible=True, overloaded=over, moment_shift=shift,
                   direction=direction, distance=distance, mass=mass, offload=0.0,
                   new_cg_x=float(cg_x) + shift / w, new_group_load=new_gl,
                   new_axle_load=new_axle,
                   note=f"{side} axle group over its limit by {delta:.1f} kg: {what}")


def _group_limits(base: AxleLoads, ratings, shares) -> tuple[np.ndarray, np.ndarray]:
    """Each axle's share of its group's load, and each group's limit: the smallest
    ``rating_i / share_i`` over its rated axles (``inf`` when none is rated)."""
    n = base.axle.size
    try:
        rt = np.asarray(ratings, dtype=float)
    except (TypeError, ValueError):
        raise InputError("ratings", ratings, "ratings in kg (nan where none)") from None
    if rt.shape != (n,):
        raise InputError("ratings", ratings, f"{n} ratings in kg, one per axle (nan where none)")
    _, fracs = _groups_and_fractions(n, base.groups, shares)
    limits = np.full(2, np.inf)
    for gi, g in enumerate(base.groups):
        for i in g:
            if not math.isnan(rt[i]):
                if not math.isfinite(rt[i]) or rt[i] <= 0:
                    raise InputError(f"ratings[{i}]", float(rt[i]),
                                     "a rating in kg greater than 0, or nan")
                limits[gi] = min(limits[gi], rt[i] / fracs[i])
    return fracs, limits


def _what_to_move(shift: float, direction: str, payload_mass, move_distance):
    """The distance to move the given payload, or the mass to move the given distance, for a
    moment ``shift`` (kg·m); and the words that say it."""
    distance = mass = None
    what = f"move {abs(shift):.1f} kg·m of moment {direction}"
    if payload_mass is not None:
        pm = finite_float(payload_mass, "payload_mass", "a finite mass in kg greater than 0")
        if pm <= 0:
            raise InputError("payload_mass", pm, "a finite mass in kg greater than 0")
        distance = shift / pm
        what = f"move the {pm:g} kg payload {abs(distance):.3f} m {direction}"
    elif move_distance is not None:
        md = finite_float(move_distance, "move_distance", "a finite distance in m greater than 0")
        if md <= 0:
            raise InputError("move_distance", md, "a finite distance in m greater than 0")
        mass = abs(shift) / md
        what = f"move {mass:.1f} kg by {md:g} m {direction}"
    return distance, mass, what
