"""Road vehicles: axle and wheel loads, ratings, corner weights, CG height, axle-group rules.

SI throughout: masses (loads) in kg, lengths in m, angles in radians. x is positive aft of the
datum the type data names (for example the front axle centreline), y positive right, z up.

Sources
-------
- Axle loads of a rigid vehicle on two supports: statics (``W_f = W·b/L``, ``W_r = W·a/L``);
  common practice for axle groups (load-sharing ratios from the type data).
- CG height by the axle-lift method: ISO 10392 (the relation is derived and shown exact under
  its geometry in :func:`cg_height_axle_lift`).
- US federal limits, Interstate: 23 CFR 658.17 and 23 U.S.C. 127 (20,000 lb single axle,
  34,000 lb tandem, 80,000 lb gross, the bridge formula ``W = 500·[L·N/(N − 1) + 12N + 36]`` to
  the nearest 500 lb, and the two-consecutive-tandems exception at 36 ft or more; read as
  quoted in stored state and municipal codes); axle definitions (40 in and 96 in planes) as in
  23 CFR 658.5 (read in stored secondary text). Rounding ties of the bridge formula to the lower
  500 lb follows the FHWA bridge table as recalled (from memory).

These checks are advisory: they compare recorded figures with a selected rule set. Local
regulations, permits and the manufacturer's ratings govern.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field

import numpy as np

from ledger.errors import InputError

__all__ = [
    "LB",
    "INCH",
    "FOOT",
    "ADVISORY",
    "AxleLoads",
    "axle_loads",
    "RatingCheck",
    "check_axle_ratings",
    "AxleFix",
    "axle_overload_fix",
    "CornerWeights",
    "corner_weights",
    "AxleLiftResult",
    "cg_height_axle_lift",
    "bridge_formula_lb",
    "RuleSet",
    "Finding",
    "check_axle_groups",
]

#: Exact conversion factors (NIST SP 811, appendix B).
LB = 0.45359237
INCH = 0.0254
FOOT = 0.3048

ADVISORY = ("Advisory only: figures from the recorded data checked against the selected rule "
            "set; this is not a legal determination. Local regulations, permits and the "
            "manufacturer's ratings govern; a qualified person verifies before operation.")


def _num(value, field: str, allowed: str) -> float:
    try:
        v = float(value)
    except (TypeError, ValueError):
        raise InputError(field, value, allowed) from None
    if not math.isfinite(v):
        raise InputError(field, v, allowed)
    return v


def _vec(value, field: str, allowed: str, n: int | None = None) -> np.ndarray:
    try:
        arr = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise InputError(field, value, allowed) from None
    if n is not None and arr.ndim == 0:
        arr = np.full(n, float(arr))
    if arr.ndim != 1 or (n is not None and arr.size != n) or arr.size == 0:
        want = f"{n} values" if n is not None else "a non-empty list"
        raise InputError(field, value, f"{want}: {allowed}")
    bad = ~np.isfinite(arr)
    if np.any(bad):
        i = int(np.argmax(bad))
        raise InputError(f"{field}[{i}]", float(arr[i]), allowed)
    return arr


def _axle_positions(axle_x) -> np.ndarray:
    """Axle positions as an array, checked finite and strictly increasing (front to rear)."""
    ax = _vec(axle_x, "axle_x", "finite axle positions in m")
    steps = np.diff(ax)
    if np.any(steps <= 0):
        i = int(np.argmax(steps <= 0)) + 1
        raise InputError(f"axle_x[{i}]", float(ax[i]),
                         f"a position aft of axle {i - 1} ({ax[i - 1]:g} m); list axles front "
                         f"to rear")
    return ax


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
    w = _num(total_mass, "total_mass", "a finite mass in kg greater than 0")
    if w <= 0:
        raise InputError("total_mass", w, "a finite mass in kg greater than 0")
    xc = _num(cg_x, "cg_x", "a finite CG arm in m")
    yc = _num(cg_y, "cg_y", "a finite lateral CG in m")
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
    tot = float(load.sum()) if total is None else _num(total, "total", "a finite mass in kg")
    gm = None
    gover = False
    if gross_rating is not None:
        g = _num(gross_rating, "gross_rating", "a finite rating in kg greater than 0")
        if g <= 0:
            raise InputError("gross_rating", g, "a finite rating in kg greater than 0")
        gm = g - tot
        gover = gm < 0
    return RatingCheck(margin=margin, over=over, gross_margin=gm, gross_over=gover,
                       ok=not (bool(over.any()) or gover))


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
    w = base.total
    gl = base.group_load
    span = float(base.group_x[1] - base.group_x[0])
    tol = 1e-9 * w
    over = tuple(i for i in range(2) if gl[i] > limits[i] + tol)
    if payload_mass is not None and move_distance is not None:
        raise InputError("move_distance", move_distance,
                         "nothing when payload_mass is given (give one of the two)")

    if gross_rating is not None:
        g = _num(gross_rating, "gross_rating", "a finite rating in kg greater than 0")
        if w > g + tol:
            return AxleFix(needed=True, feasible=False, overloaded=over, moment_shift=0.0,
                           direction=None, distance=None, mass=None, offload=w - g,
                           new_cg_x=float(cg_x), new_group_load=gl, new_axle_load=base.axle,
                           note=f"over the gross rating by {w - g:.1f} kg: offload; moving "
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
    distance = mass = None
    what = f"move {abs(shift):.1f} kg·m of moment {direction}"
    if payload_mass is not None:
        pm = _num(payload_mass, "payload_mass", "a finite mass in kg greater than 0")
        if pm <= 0:
            raise InputError("payload_mass", pm, "a finite mass in kg greater than 0")
        distance = shift / pm
        what = f"move the {pm:g} kg payload {abs(distance):.3f} m {direction}"
    elif move_distance is not None:
        md = _num(move_distance, "move_distance", "a finite distance in m greater than 0")
        if md <= 0:
            raise InputError("move_distance", md, "a finite distance in m greater than 0")
        mass = abs(shift) / md
        what = f"move {mass:.1f} kg by {md:g} m {direction}"
    side = "front" if j == 0 else "rear"
    return AxleFix(needed=True, feasible=True, overloaded=over, moment_shift=shift,
                   direction=direction, distance=distance, mass=mass, offload=0.0,
                   new_cg_x=float(cg_x) + shift / w, new_group_load=new_gl,
                   new_axle_load=new_axle,
                   note=f"{side} axle group over its limit by {delta:.1f} kg: {what}")


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
        f = _num(v, name, "a finite corner load in kg of 0 or more")
        if f < 0:
            raise InputError(name, f, "a finite corner load in kg of 0 or more")
        vals[name] = f
    for name, v in (("wheelbase", wheelbase), ("track_front", track_front),
                    ("track_rear", track_rear)):
        f = _num(v, name, "a finite length in m greater than 0")
        if f <= 0:
            raise InputError(name, f, "a finite length in m greater than 0")
        vals[name] = f
    x0 = _num(front_axle_x, "front_axle_x", "a finite arm in m")
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
    W = _num(total_mass, "total_mass", "a finite mass in kg greater than 0")
    if W <= 0:
        raise InputError("total_mass", W, "a finite mass in kg greater than 0")
    L = _num(wheelbase, "wheelbase", "a finite length in m greater than 0")
    if L <= 0:
        raise InputError("wheelbase", L, "a finite length in m greater than 0")
    r = _num(wheel_radius, "wheel_radius", "a finite radius in m of 0 or more")
    if r < 0:
        raise InputError("wheel_radius", r, "a finite radius in m of 0 or more")
    wf = _num(front_level, "front_level", "a finite load in kg")
    if not 0 < wf < W:
        raise InputError("front_level", wf, f"a load between 0 and the total {W:g} kg")
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


def bridge_formula_lb(length_ft: float, n_axles: int) -> float:
    """US bridge formula, ``W = 500·[L·N/(N − 1) + 12N + 36]`` lb, to the nearest 500 lb.

    An exact half (for example 44,250 lb) goes to the lower 500 lb, as the FHWA bridge table
    prints it (from memory).

    Parameters
    ----------
    length_ft : float
        Distance between the outer axles of the group, ft (measured to the nearest foot).
    n_axles : int
        Number of axles in the group, 2 or more.

    Returns
    -------
    float
        Maximum load on the group, lb.

    Examples
    --------
    >>> bridge_formula_lb(8, 2), bridge_formula_lb(36, 4), bridge_formula_lb(38, 4)
    (38000.0, 66000.0, 67500.0)
    """
    L = _num(length_ft, "length_ft", "a finite length in ft of 0 or more")
    if L < 0:
        raise InputError("length_ft", L, "a finite length in ft of 0 or more")
    try:
        N = int(n_axles)
    except (TypeError, ValueError):
        raise InputError("n_axles", n_axles, "an integer of 2 or more") from None
    if N < 2 or N != n_axles:
        raise InputError("n_axles", n_axles, "an integer of 2 or more")
    units = L * N / (N - 1) + 12 * N + 36  # in 500 lb
    return 500.0 * math.ceil(round(units - 0.5, 9))


_MASS_UNITS = {"kg": 1.0, "lb": LB}
_LENGTH_UNITS = {"m": 1.0, "in": INCH, "ft": FOOT}
_MASS_KEYS = ("single_axle", "tandem", "gross")
_LENGTH_KEYS = ("single_spread", "tandem_spread", "tandem_pair_spread")


@dataclass(frozen=True)
class RuleSet:
    """Axle-group weight rules, as data (limits in kg, spreads in m).

    Attributes
    ----------
    name : str
    single_axle_max : float
        Limit on one axle (all axles within ``single_spread``), kg.
    tandem_max : float
        Limit on a tandem (consecutive axles spread more than ``single_spread`` and at most
        ``tandem_spread``), kg.
    gross_max : float
        Limit on the whole vehicle or combination, kg.
    bridge_formula : bool
        Whether the US bridge formula applies to groups spread more than ``tandem_spread``.
    single_spread, tandem_spread : float
        Spreads defining a single axle and a tandem, m.
    tandem_pair_spread : float or None
        Two consecutive tandems at least this far apart (outer axles) may carry
        ``tandem_max`` each even above the bridge formula, m; None for no such exception.
    source : str
        Where the figures come from.
    """

    name: str
    single_axle_max: float
    tandem_max: float
    gross_max: float
    bridge_formula: bool
    single_spread: float
    tandem_spread: float
    tandem_pair_spread: float | None = None
    source: str = ""

    @classmethod
    def from_dict(cls, data: Mapping[str, object]) -> RuleSet:
        """Build a rule set from a mapping (the rule-set files of :mod:`ledger.rules` give one).

        Keys: ``name``; ``single_axle``, ``tandem``, ``gross`` each with a unit suffix ``_kg`` or
        ``_lb``; ``single_spread``, ``tandem_spread`` and optionally ``tandem_pair_spread`` with
        ``_m``, ``_in`` or ``_ft``; optional ``bridge_formula`` (bool) and ``source``.

        Examples
        --------
        >>> rs = RuleSet.from_dict({"name": "example", "single_axle_kg": 10000,
        ...                         "tandem_kg": 18000, "gross_kg": 40000,
        ...                         "single_spread_m": 1.0, "tandem_spread_m": 2.5})
        >>> rs.tandem_max, rs.bridge_formula
        (18000.0, False)
        """
        if not isinstance(data, Mapping):
            raise InputError("rule set", data, "a table of keys and values")
        known = {"name", "bridge_formula", "source"}
        known |= {f"{k}_{u}" for k in _MASS_KEYS for u in _MASS_UNITS}
        known |= {f"{k}_{u}" for k in _LENGTH_KEYS for u in _LENGTH_UNITS}
        for key in data:
            if key not in known:
                raise InputError(f"rule set.{key}", data[key],
                                 "no such key; known keys are " + ", ".join(sorted(known)))
        name = data.get("name")
        if not isinstance(name, str) or not name.strip():
            raise InputError("rule set.name", name, "a non-empty name")

        def pick(base: str, units: dict[str, float], required: bool, what: str):
            given = [u for u in units if f"{base}_{u}" in data]
            if len(given) > 1:
                raise InputError(f"{name}.{base}", [f"{base}_{u}" for u in given],
                                 "one unit suffix only")
            if not given:
                if required:
                    raise InputError(f"{name}.{base}", None,
                                     f"a {what} with one of the suffixes " +
                                     ", ".join("_" + u for u in units))
                return None
            key = f"{base}_{given[0]}"
            v = _num(data[key], f"{name}.{key}", f"a finite {what} greater than 0")
            if v <= 0:
                raise InputError(f"{name}.{key}", v, f"a finite {what} greater than 0")
            return v * units[given[0]]

        masses = {k: pick(k, _MASS_UNITS, True, "mass") for k in _MASS_KEYS}
        single = pick("single_spread", _LENGTH_UNITS, True, "length")
        tandem = pick("tandem_spread", _LENGTH_UNITS, True, "length")
        pair = pick("tandem_pair_spread", _LENGTH_UNITS, False, "length")
        if tandem <= single:
            raise InputError(f"{name}.tandem_spread", tandem,
                             f"a spread longer than the single-axle spread {single:g} m")
        bridge = data.get("bridge_formula", False)
        if not isinstance(bridge, bool):
            raise InputError(f"{name}.bridge_formula", bridge, "true or false")
        return cls(name=name.strip(), single_axle_max=masses["single_axle"],
                   tandem_max=masses["tandem"], gross_max=masses["gross"],
                   bridge_formula=bridge, single_spread=single, tandem_spread=tandem,
                   tandem_pair_spread=pair, source=str(data.get("source", "")))


@dataclass(frozen=True)
class Finding:
    """One advisory finding of :func:`check_axle_groups`.

    ``margin = limit − load`` (kg); ``ok`` when the load is at most the limit (inclusive).
    ``axles`` are the 0-based indices (front first) the rule applies to; :attr:`text` numbers
    axles from 1 as a driver would.
    """

    rule: str
    axles: tuple[int, ...]
    load: float
    limit: float
    margin: float
    ok: bool
    detail: str = ""
    advisory: str = field(default=ADVISORY, repr=False)

    @property
    def text(self) -> str:
        who = ("axle " if len(self.axles) == 1 else "axles ") + \
              ", ".join(str(i + 1) for i in self.axles)
        state = "within" if self.ok else f"over by {-self.margin:.0f} kg"
        extra = f" ({self.detail})" if self.detail else ""
        return (f"{self.rule}, {who}{extra}: {self.load:.0f} kg against {self.limit:.0f} kg, "
                f"{state}")


def _partition(x: np.ndarray, spread: float, start_units: list[list[int]]) -> list[list[int]]:
    """Greedy front-to-rear grouping of consecutive units whose outer axles are within spread."""
    out: list[list[int]] = []
    i = 0
    while i < len(start_units):
        group = list(start_units[i])
        j = i + 1
        while j < len(start_units) and x[start_units[j][-1]] - x[group[0]] <= spread + 1e-9:
            group += start_units[j]
            j += 1
        out.append(group)
        i = j
    return out


def _tandem_windows(x: np.ndarray, units: list[list[int]], single: float,
                    tandem: float) -> list[list[int]]:
    """Every maximal run of consecutive units spread more than ``single``, at most ``tandem``.

    Runs may overlap (three axles 4.5 ft apart give two tandems, axles 1–2 and 2–3); checking
    the maximal runs covers every shorter run, since loads are not negative.
    """
    out: list[list[int]] = []
    last_end = -1
    for i in range(len(units)):
        j = i
        while j + 1 < len(units) and x[units[j + 1][-1]] - x[units[i][0]] <= tandem + 1e-9:
            j += 1
        if j > last_end:
            run = [a for u in units[i:j + 1] for a in u]
            if x[run[-1]] - x[run[0]] > single + 1e-9:
                out.append(run)
            last_end = j
    return out


def check_axle_groups(rules: RuleSet, axle_x, axle_load) -> tuple[Finding, ...]:
    """Check axle loads against a rule set: single axles, tandems, gross, bridge formula.

    Axles within ``single_spread`` of each other count as one single axle (grouped front to
    rear); every longest run of consecutive single axles whose outer axles are more than
    ``single_spread`` and at most ``tandem_spread`` apart is a tandem (runs may overlap).
    Every single axle is checked against the single-axle limit (including one inside a
    tandem), every tandem against the tandem limit, the sum against the gross limit, and, if the
    rule set uses it, every group of two or more consecutive axles spread more than
    ``tandem_spread`` against the bridge formula with L rounded to the nearest foot (two
    consecutive tandems at least ``tandem_pair_spread`` apart may carry the tandem limit each).
    Grandfather rights, permits and state rules are not modelled.

    Parameters
    ----------
    rules : RuleSet
    axle_x : array_like, shape (n,)
        Axle positions, m, strictly increasing (front first).
    axle_load : array_like, shape (n,)
        Axle loads, kg.

    Returns
    -------
    tuple of Finding
        All findings, the ones within limits too; filter on ``ok``. Advisory only.

    Examples
    --------
    A five-axle tractor-semitrailer (steer, drive tandem, trailer tandem):

    >>> x = [0.0, 5.0, 6.3, 15.5, 16.8]
    >>> lb = 0.45359237
    >>> loads = [12000 * lb, 16500 * lb, 16500 * lb, 17500 * lb, 17500 * lb]
    >>> us = RuleSet.from_dict({"name": "US federal", "single_axle_lb": 20000,
    ...     "tandem_lb": 34000, "gross_lb": 80000, "bridge_formula": True,
    ...     "single_spread_in": 40, "tandem_spread_in": 96, "tandem_pair_spread_ft": 36})
    >>> for f in check_axle_groups(us, x, loads):
    ...     if not f.ok:
    ...         print(f.text)
    tandem, axles 4, 5: 15876 kg against 15422 kg, over by 454 kg
    """
    ax = _axle_positions(axle_x)
    n = ax.size
    ld = _vec(axle_load, "axle_load", "finite loads in kg of 0 or more", n)
    if np.any(ld < 0):
        i = int(np.argmax(ld < 0))
        raise InputError(f"axle_load[{i}]", float(ld[i]), "a load in kg of 0 or more")
    findings: list[Finding] = []

    def add(rule: str, idx: Sequence[int], limit: float, detail: str = "") -> None:
        load = float(ld[list(idx)].sum())
        margin = limit - load
        findings.append(Finding(rule=rule, axles=tuple(int(i) for i in idx), load=load,
                                limit=limit, margin=margin, ok=margin >= -1e-9 * limit,
                                detail=detail))

    singles = _partition(ax, rules.single_spread, [[i] for i in range(n)])
    for unit in singles:
        add("single axle", unit, rules.single_axle_max)
    tandems = _tandem_windows(ax, singles, rules.single_spread, rules.tandem_spread)
    for g in tandems:
        add("tandem", g, rules.tandem_max)
    add("gross", range(n), rules.gross_max)
    if rules.bridge_formula:
        tandem_sets = [tuple(g) for g in tandems]
        for i in range(n):
            for j in range(i + 1, n):
                spread = ax[j] - ax[i]
                if spread <= rules.tandem_spread + 1e-9:
                    continue  # a single axle or tandem: those limits govern
                L_ft = math.floor(spread / FOOT + 0.5)
                N = j - i + 1
                limit = bridge_formula_lb(L_ft, N) * LB
                detail = f"L = {L_ft} ft, N = {N}"
                idx = tuple(range(i, j + 1))
                if rules.tandem_pair_spread is not None and spread >= rules.tandem_pair_spread:
                    for a in range(len(tandem_sets) - 1):
                        if tandem_sets[a] + tandem_sets[a + 1] == idx:
                            if 2 * rules.tandem_max > limit:
                                limit = 2 * rules.tandem_max
                                detail += ", two consecutive tandems"
                add("bridge formula", idx, limit, detail)
    return tuple(findings)
