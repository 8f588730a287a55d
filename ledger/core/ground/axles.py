"""Axle and wheel loads of a rigid vehicle, and the check against the axle ratings."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ledger.core._common import finite_float
from ledger.core.ground._inputs import _axle_positions, _vec
from ledger.errors import InputError

__all__ = ["AxleLoads", "axle_loads", "RatingCheck", "check_axle_ratings"]


@dataclass(frozen=True)
class AxleLoads:
    """Result of :func:`axle_loads`.

    Attributes
    ----------
    total : float
        Total mass, kg.
    axle : ndarray, shape (n,)
        Load on each axle, kg.
    groups : tuple of tuple of int
        The two supports (axle groups), front first.
    group_load : ndarray, shape (2,)
        Load on each support, kg.
    group_x : ndarray, shape (2,)
        Load-weighted centre of each support, m.
    left, right : ndarray, shape (n,), or None
        Load on each side of each axle, kg (when a track was given).
    """

    total: float
    axle: np.ndarray
    groups: tuple[tuple[int, ...], ...]
    group_load: np.ndarray
    group_x: np.ndarray
    left: np.ndarray | None
    right: np.ndarray | None


def _groups_and_fractions(n: int, groups, shares):
    if groups is None:
        if n != 2:
            raise InputError(
                "groups", None,
                f"two axle groups (lists of axle indices) for a vehicle with {n} axles",
                hint="A rigid body on more than two independent supports is statically "
                     "indeterminate; group the axles, e.g. [[0], [1, 2]] for a steer axle and "
                     "a tandem")
        groups = [[0], [1]]
    try:
        gs = [tuple(int(i) for i in g) for g in groups]
    except (TypeError, ValueError):
        raise InputError("groups", groups, "lists of axle indices") from None
    if len(gs) != 2:
        raise InputError("groups", groups,
                         "exactly two axle groups (front and rear supports); more supports "
                         "make a rigid body statically indeterminate")
    flat = [i for g in gs for i in g]
    if sorted(flat) != list(range(n)) or any(len(g) == 0 for g in gs):
        raise InputError("groups", groups, f"every axle index 0 to {n - 1} in exactly one group")
    if shares is None:
        shares = [[1.0] * len(g) for g in gs]
    if len(shares) != 2:
        raise InputError("shares", shares, "one list of load-sharing ratios per group")
    fracs = np.zeros(n)
    for gi, (g, s) in enumerate(zip(gs, shares)):
        s_arr = _vec(s, f"shares[{gi}]", "load-sharing ratios greater than 0", len(g))
        if np.any(s_arr <= 0):
            raise InputError(f"shares[{gi}]", s_arr.tolist(), "ratios greater than 0")
        fracs[list(g)] = s_arr / s_arr.sum()
    return tuple(gs), fracs


def axle_loads(total_mass: float, cg_x: float, axle_x, *, cg_y: float = 0.0, track=None,
               groups=None, shares=None) -> AxleLoads:
    """Axle and wheel-side loads of a rigid vehicle from its mass and CG.

    With two axles at ``x_f < x_r`` (wheelbase ``L = x_r − x_f``, ``a = x_cg − x_f``,
    ``b = x_r − x_cg``): ``W_f = W·b/L`` and ``W_r = W·a/L``. With more axles, the axles form two
    groups (supports); inside a group the axles share the group load in the given ratios (as the
    type data says, for example equal for a tandem with an equalising suspension), so each group
    acts as one support at its load-weighted centre ``Σ s_i x_i / Σ s_i`` and the vehicle stays
    statically determinate. Per side, with track ``t`` and lateral CG ``y`` (positive right):
    ``left = W_axle·(t/2 − y)/t``, ``right = W_axle·(t/2 + y)/t``; this takes the same lateral
    CG for every axle.

    Parameters
    ----------
    total_mass : float
        Mass, kg, greater than 0.
    cg_x : float
        Longitudinal CG, m; must lie between the two supports (inclusive), or the vehicle would
        tip.
    axle_x : array_like, shape (n,)
        Axle positions, m, strictly increasing (front first), n ≥ 2.
    cg_y : float
        Lateral CG, m, positive right.
    track : float or array_like, shape (n,), optional
        Track width per axle (or one for all), m. Gives ``left`` and ``right``.
    groups : sequence of two sequences of int, optional
        Axle indices of the front and rear supports (needed for more than two axles).
    shares : sequence of two sequences of float, optional
        Load-sharing ratios inside each group (default equal).

    Returns
    -------
    AxleLoads

    Raises
    ------
    InputError
        Bad numbers, axles not increasing, bad groups, CG outside the supports or outside the
        track.

    Examples
    --------
    >>> r = axle_loads(1500.0, 1.2, [0.0, 3.0], cg_y=0.05, track=1.5)
    >>> r.axle.round(9).tolist(), r.left.round(9).tolist(), r.right.round(9).tolist()
    ([900.0, 600.0], [420.0, 280.0], [480.0, 320.0])
    """
    w = finite_float(total_mass, "total_mass", "a finite mass in kg greater than 0")
    if w <= 0:
        raise InputError("total_mass", w, "a finite mass in kg greater than 0")
    xc = finite_float(cg_x, "cg_x", "a finite CG arm in m")
    yc = finite_float(cg_y, "cg_y", "a finite lateral CG in m")
    ax = _axle_positions(axle_x)
    n = ax.size
    if n < 2:
        raise InputError("axle_x", ax.tolist(), "at least two axle positions")
    gs, fracs = _groups_and_fractions(n, groups, shares)
    gx = np.array([float(fracs[list(g)] @ ax[list(g)]) for g in gs])
    if not gx[0] < gx[1]:
        raise InputError("groups", [list(g) for g in gs],
                         "the front group ahead of the rear group")
    span = gx[1] - gx[0]
    slack = 1e-12 * max(span, abs(gx[0]), abs(gx[1]))  # a CG on a support, up to rounding
    if not gx[0] - slack <= xc <= gx[1] + slack:
        raise InputError("cg_x", xc,
                         f"a CG between the supports at {gx[0]:g} m and {gx[1]:g} m; outside "
                         f"them the vehicle would tip")
    xc = min(max(xc, gx[0]), gx[1])
    gl = np.array([w * (gx[1] - xc) / span, w * (xc - gx[0]) / span])
    axle = np.zeros(n)
    for gi, g in enumerate(gs):
        axle[list(g)] = gl[gi] * fracs[list(g)]
    left = right = None
    if track is not None:
        t = _vec(track, "track", "track widths in m greater than 0", n)
        if np.any(t <= 0):
            i = int(np.argmax(t <= 0))
            raise InputError(f"track[{i}]", float(t[i]), "a track width in m greater than 0")
        if np.any(abs(yc) > t / 2):
            raise InputError("cg_y", yc,
                             f"a lateral CG within half the narrowest track "
                             f"(±{float(t.min()) / 2:g} m)")
        left = axle * (t / 2 - yc) / t
        right = axle * (t / 2 + yc) / t
    return AxleLoads(total=w, axle=axle, groups=gs, group_load=gl, group_x=gx, left=left,
                     right=right)


@dataclass(frozen=True)
class RatingCheck:
    """Result of :func:`check_axle_ratings`. Margins are ``rating − load`` (kg, negative when
    over); an axle exactly at its rating is within it. ``nan`` where no rating was given."""

    margin: np.ndarray
    over: np.ndarray
    gross_margin: float | None
    gross_over: bool
    ok: bool


def check_axle_ratings(axle_load, ratings, gross_rating: float | None = None,
                       total: float | None = None) -> RatingCheck:
    """Compare axle loads with the axle ratings and the total with a gross rating.

    Parameters
    ----------
    axle_load : array_like, shape (n,)
        Axle loads, kg (e.g. ``axle_loads(...).axle``).
    ratings : array_like, shape (n,)
        Axle ratings, kg; ``nan`` for an axle without one.
    gross_rating : float, optional
        Gross vehicle weight rating, kg.
    total : float, optional
        Total mass, kg (default: the sum of the axle loads).

    Returns
    -------
    RatingCheck

    Examples
    --------
    >>> c = check_axle_ratings([900.0, 600.0], [850.0, 800.0], gross_rating=1600.0)
    >>> c.margin.tolist(), c.over.tolist(), c.gross_margin, c.ok
    ([-50.0, 200.0], [True, False], 100.0, False)
    """
    load = _vec(axle_load, "axle_load", "finite loads in kg")
    n = load.size
    try:
        rt = np.asarray(ratings, dtype=float)
    except (TypeError, ValueError):
        raise InputError("ratings", ratings, "ratings in kg (nan where none)") from None
    if rt.ndim == 0:
        rt = np.full(n, float(rt))
    if rt.shape != (n,):
        raise InputError("ratings", ratings, f"{n} ratings in kg, one per axle (nan where none)")
    for i in range(n):
        if not math.isnan(rt[i]) and (not math.isfinite(rt[i]) or rt[i] <= 0):
            raise InputError(f"ratings[{i}]", float(rt[i]), "a rating in kg greater than 0, or nan")
    margin = rt - load
    over = np.where(np.isnan(margin), False, margin < 0)
    tot = (float(load.sum()) if total is None
           else finite_float(total, "total", "a finite mass in kg"))
    gm = None
    gover = False
    if gross_rating is not None:
        g = finite_float(gross_rating, "gross_rating", "a finite rating in kg greater than 0")
        if g <= 0:
            raise InputError("gross_rating", g, "a finite rating in kg greater than 0")
        gm = g - tot
        gover = gm < 0
    return RatingCheck(margin=margin, over=over, gross_margin=gm, gross_over=gover,
                       ok=not (bool(over.any()) or gover))


