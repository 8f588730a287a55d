"""Fixes for an out-of-limits loading: shift weight, add ballast, offload, room left at a station.

Formulas (Pilot's Handbook of Aeronautical Knowledge, FAA-H-8083-25, ch. 9; Aviation
Maintenance Technician Handbook, FAA-H-8083-30, ch. 4):

- weight shift: Δm / M = ΔCG / (arm_to − arm_from);
- adding or removing weight: Δm / (M + Δm) = ΔCG / (arm − CG_old), i.e. the new CG is
  (M·CG + Δm·arm) / (M + Δm) with Δm < 0 for a removal;
- ballast: Δm = M × (distance the CG is out of limits) / (distance from the ballast arm to the
  limit).

Every function returns the figure a loading sheet proposes ("move 65 lb from station 150 to
station 30") and does not decide for the caller; re-check the fixed state with
:func:`new_cg_after_change` / :func:`cg_after_shift` or
:func:`ledger.core.massprops.mass_properties` and the envelope functions before showing it.
Units are whatever the caller uses consistently (kg and m inside wbledger). Results are figures
computed from the recorded data, not approved data: the flight manual governs.

Impossible fixes raise :class:`ledger.errors.CorrectionError` naming the field, the value and
what would work.
"""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from ledger.core import envelope as _env
from ledger.core._common import index_text, plain
from ledger.errors import CorrectionError

__all__ = [
    "shift_mass",
    "cg_after_shift",
    "ballast_mass",
    "offload_for_mass_limit",
    "offload_for_cg_limit",
    "new_cg_after_change",
    "max_addable_mass",
    "AddableMass",
]


def _arr(value, field: str, allowed: str = "a finite number") -> np.ndarray:
    try:
        a = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise CorrectionError(field, value, allowed) from None
    if not np.all(np.isfinite(a)):
        bad = np.argmax(~np.isfinite(a).reshape(-1))
        raise CorrectionError(_at(field, a, int(bad)), float(a.reshape(-1)[bad]), allowed)
    return a


def _at(field: str, a: np.ndarray, flat: int) -> str:
    """``field`` or ``field[i, j]`` for element ``flat`` of a broadcast array."""
    if a.ndim == 0:
        return field
    return f"{field}[{index_text(np.unravel_index(flat, a.shape))}]"


def _positive_mass(value, field: str = "total_mass") -> np.ndarray:
    a = _arr(value, field, "a finite mass above 0")
    if np.any(a <= 0):
        bad = int(np.argmax((a <= 0).reshape(-1)))
        raise CorrectionError(_at(field, a, bad), float(a.reshape(-1)[bad]),
                              "a finite mass above 0")
    return a


def _first(mask: np.ndarray) -> int:
    return int(np.argmax(np.asarray(mask).reshape(-1)))


def shift_mass(total_mass, cg, target_cg, arm_from, arm_to):
    """Mass to move from ``arm_from`` to ``arm_to`` so that the CG becomes ``target_cg``.

    Δm = M × (target_cg − cg) / (arm_to − arm_from); the total mass does not change.

    Parameters
    ----------
    total_mass : float or array_like
        Total mass M, above 0.
    cg, target_cg : float or array_like
        Present and wanted CG (same axis and datum as the arms).
    arm_from, arm_to : float or array_like
        Arms of the station the mass leaves and the station it goes to.

    Returns
    -------
    float or ndarray
        The mass to move. Negative means move ``-Δm`` the other way (from ``arm_to`` to
        ``arm_from``). The caller checks that the station holds that much.

    Raises
    ------
    CorrectionError
        If ``arm_to`` equals ``arm_from`` while the CG has to move.

    Examples
    --------
    Pilot's Handbook of Aeronautical Knowledge (FAA-H-8083-25) ch. 9: 7,800 lb with the CG at
    81.5 in and the aft limit at 80.5 in; cargo moved from station 150 to station 30.

    >>> round(shift_mass(7800.0, 81.5, 80.5, 150.0, 30.0), 9)
    65.0
    >>> cg_after_shift(7800.0, 81.5, 65.0, 150.0, 30.0)
    80.5
    """
    M = _positive_mass(total_mass)
    c = _arr(cg, "cg")
    t = _arr(target_cg, "target_cg")
    a0 = _arr(arm_from, "arm_from")
    a1 = _arr(arm_to, "arm_to")
    M, c, t, a0, a1 = np.broadcast_arrays(M, c, t, a0, a1)
    span = a1 - a0
    stuck = (span == 0) & (t != c)
    if np.any(stuck):
        k = _first(stuck)
        raise CorrectionError(
            _at("arm_to", a1, k), float(a1.reshape(-1)[k]),
            f"an arm different from arm_from ({float(a0.reshape(-1)[k]):g}); moving weight "
            "within one arm does not move the CG")
    with np.errstate(divide="ignore", invalid="ignore"):
        dm = np.where(t == c, 0.0, M * (t - c) / np.where(span == 0, 1.0, span))
    return plain(dm)


def cg_after_shift(total_mass, cg, moved_mass, arm_from, arm_to):
    """CG after moving ``moved_mass`` from ``arm_from`` to ``arm_to``.

    New CG = CG + Δm·(arm_to − arm_from) / M (the total mass does not change).

    Examples
    --------
    >>> cg_after_shift(1000.0, 2.0, 10.0, 1.0, 3.0)
    2.02
    """
    M = _positive_mass(total_mass)
    c = _arr(cg, "cg")
    dm = _arr(moved_mass, "moved_mass")
    a0 = _arr(arm_from, "arm_from")
    a1 = _arr(arm_to, "arm_to")
    return plain(c + dm * (a1 - a0) / M)


def ballast_mass(total_mass, cg, limit_cg, ballast_arm):
    """Ballast to add at ``ballast_arm`` so that the CG reaches ``limit_cg``.

    Exact: the new CG is (M·CG + Δm·arm) / (M + Δm) = limit, so
    Δm = M × (limit − CG) / (arm − limit). This is the handbook's formula, ballast = M ×
    (distance out of limits) / (distance from the ballast arm to the limit) (FAA-H-8083-30,
    ch. 4). A shortcut sometimes seen divides by the distance from the ballast arm to the *old*
    CG instead; it ignores that the ballast's own mass shifts the CG and gives too little.

    Parameters
    ----------
    total_mass : float or array_like
        Mass M before ballast, above 0.
    cg : float or array_like
        Present CG.
    limit_cg : float or array_like
        The limit to reach (forward or aft).
    ballast_arm : float or array_like
        Arm of the ballast; must lie beyond the limit, on the side the CG has to move to.

    Returns
    -------
    float or ndarray
        Ballast mass, 0 or more (0 when the CG is already at the limit).

    Raises
    ------
    CorrectionError
        When the ballast arm is at the limit, between the CG and the limit, or on the CG's
        side: ballast there cannot bring the CG to the limit.

    Examples
    --------
    Numbers chosen for this example (formula FAA-H-8083-30 ch. 4): 1,800 lb with the CG at
    76.0 in, forward limit 78.0 in, ballast in the baggage area at 150 in.

    >>> ballast_mass(1800.0, 76.0, 78.0, 150.0)
    50.0
    >>> new_cg_after_change(1800.0, 76.0, 50.0, 150.0)
    78.0
    """
    M = _positive_mass(total_mass)
    c = _arr(cg, "cg")
    lim = _arr(limit_cg, "limit_cg")
    a = _arr(ballast_arm, "ballast_arm")
    M, c, lim, a = np.broadcast_arrays(M, c, lim, a)
    need = lim - c
    reach = a - lim
    wrong = (need != 0) & ~(need * reach > 0)
    if np.any(wrong):
        k = _first(wrong)
        L = float(lim.reshape(-1)[k])
        side = "greater" if need.reshape(-1)[k] > 0 else "less"
        raise CorrectionError(
            _at("ballast_arm", a, k), float(a.reshape(-1)[k]),
            f"an arm beyond the limit {L:g} on the side the CG must move to ({side} than {L:g})",
            hint=(f"Ballast at or short of the limit cannot bring the CG "
                  f"{float(c.reshape(-1)[k]):g} to {L:g}; choose a station beyond the limit"))
    with np.errstate(divide="ignore", invalid="ignore"):
        dm = np.where(need == 0, 0.0, M * need / np.where(reach == 0, 1.0, reach))
    return plain(dm)


def offload_for_mass_limit(mass, limit):
    """Mass to offload so that ``mass`` is within ``limit``: max(mass − limit, 0).

    Examples
    --------
    >>> offload_for_mass_limit(1240.0, 1200.0)
    40.0
    >>> offload_for_mass_limit([1150.0, 1240.0], 1200.0).tolist()
    [0.0, 40.0]
    """
    m = _arr(mass, "mass", "a finite mass of 0 or more")
    lim = _positive_mass(limit, "limit")
    if np.any(m < 0):
        k = _first(m < 0)
        raise CorrectionError(_at("mass", m, k), float(m.reshape(-1)[k]),
                              "a finite mass of 0 or more")
    return plain(np.maximum(m - lim, 0.0))


def offload_for_cg_limit(total_mass, cg, limit_cg, station_arm):
    """Mass to remove at ``station_arm`` so that the CG comes back to ``limit_cg``.

    Removing Δm at arm a gives (M·CG − Δm·a) / (M − Δm) = limit, so
    Δm = M × (CG − limit) / (a − limit). Removal moves the CG away from the station, so the
    station must lie beyond the CG on the far side from the limit.

    Returns
    -------
    float or ndarray
        The mass to remove (0 when the CG is at the limit); the caller checks the station holds it.

    Raises
    ------
    CorrectionError
        When the station is not beyond the CG on the far side from the limit.

    Examples
    --------
    The handbook case again (FAA-H-8083-25 ch. 9): 7,800 lb at 81.5 in, aft limit 80.5 in;
    removing cargo from station 150 instead of moving it:

    >>> round(offload_for_cg_limit(7800.0, 81.5, 80.5, 150.0), 6)
    112.230216
    >>> round(new_cg_after_change(7800.0, 81.5, -112.23021582733813, 150.0), 9)
    80.5
    """
    M = _positive_mass(total_mass)
    c = _arr(cg, "cg")
    lim = _arr(limit_cg, "limit_cg")
    a = _arr(station_arm, "station_arm")
    M, c, lim, a = np.broadcast_arrays(M, c, lim, a)
    excess = c - lim
    wrong = (excess != 0) & ~((a - c) * excess > 0)
    if np.any(wrong):
        k = _first(wrong)
        C = float(c.reshape(-1)[k])
        side = "greater" if excess.reshape(-1)[k] > 0 else "less"
        raise CorrectionError(
            _at("station_arm", a, k), float(a.reshape(-1)[k]),
            f"a station beyond the CG {C:g} on the far side from the limit "
            f"{float(lim.reshape(-1)[k]):g} ({side} than {C:g})",
            hint="Removing weight there moves the CG the wrong way or not far enough; "
                 "offload from a station further out")
    with np.errstate(divide="ignore", invalid="ignore"):
        dm = np.where(excess == 0, 0.0, M * excess / np.where(a == lim, 1.0, a - lim))
    return plain(dm)


def new_cg_after_change(total_mass, cg, delta_mass, arm):
    """CG after adding (``delta_mass`` > 0) or removing (< 0) mass at ``arm``.

    New CG = (M·CG + Δm·arm) / (M + Δm), the adding/removing-weight relation
    Δm / (M + Δm) = ΔCG / (arm − CG_old) (FAA-H-8083-25 ch. 9).

    Raises
    ------
    CorrectionError
        If the change would leave no mass (M + Δm ≤ 0).

    Examples
    --------
    FAA-H-8083-25 ch. 9: 6,860 lb at 80.0 in plus 140 lb at 150 in.

    >>> round(new_cg_after_change(6860.0, 80.0, 140.0, 150.0), 9)
    81.4
    """
    M = _positive_mass(total_mass)
    c = _arr(cg, "cg")
    dm = _arr(delta_mass, "delta_mass")
    a = _arr(arm, "arm")
    M, c, dm, a = np.broadcast_arrays(M, c, dm, a)
    after = M + dm
    if np.any(after <= 0):
        k = _first(after <= 0)
        raise CorrectionError(
            _at("delta_mass", dm, k), float(dm.reshape(-1)[k]),
            f"a change that leaves some mass (more than -{float(M.reshape(-1)[k]):g})")
    return plain((M * c + dm * a) / after)


class AddableMass(NamedTuple):
    """Result of :func:`max_addable_mass`.

    ``limited_by`` is one of ``"mass limit"``, ``"station capacity"``, ``"envelope"``,
    ``"lateral envelope"``; ``new_mass``/``new_cg`` (and ``new_cg_y`` when a lateral arm was
    given, else ``None``) describe the state with ``mass`` added, for re-checking.
    """

    mass: float
    limited_by: str
    new_mass: float
    new_cg: float
    new_cg_y: float | None


def _exit_along(prep, M: float, mom: float, a: float, T: float, kind: str, r: float) -> float:
    """Largest t in [0, T] such that the states for added mass in [0, t] are all covered.

    The state after adding t at arm ``a`` is (X, Y) = ((mom + t·a)/(M + t), M + t) in arm–mass
    coordinates (a hyperbola) or ((mom + t·a)/r, M + t) in moment–mass coordinates (a line).
    Its meeting points with each edge are solved exactly; between consecutive ones the path is
    wholly in or wholly out, so testing each piece's midpoint finds the first exit.
    """
    P = prep.P
    x1, y1 = P[:, 0], P[:, 1]
    dx, dy = np.roll(x1, -1) - x1, np.roll(y1, -1) - y1
    ts: list[float] = [0.0, T]
    for k in range(len(P)):
        if kind == "moment":
            # (mom + (y1 + s·dy − M)·a)/r = x1 + s·dx
            #   →  s·(dy·a/r − dx) = x1 − (mom + (y1 − M)·a)/r
            A, B, C = 0.0, dy[k] * a / r - dx[k], (mom + (y1[k] - M) * a) / r - x1[k]
        else:
            # (x − a)·y = mom − M·a along the path; x = x1 + s·dx, y = y1 + s·dy on the edge.
            K = mom - M * a
            A = dx[k] * dy[k]
            B = (x1[k] - a) * dy[k] + dx[k] * y1[k]
            C = (x1[k] - a) * y1[k] - K
        scale_ = max(abs(A), abs(B), abs(C), 1e-300)
        if abs(A) <= 1e-14 * scale_:
            if abs(B) <= 1e-14 * scale_:
                roots = [0.0, 1.0] if abs(C) <= 1e-12 * max(abs(mom), abs(M * a), 1.0) else []
            else:
                roots = [-C / B]
        else:
            disc = B * B - 4 * A * C
            if disc < 0:
                disc = 0.0 if disc > -1e-12 * B * B else None
            if disc is None:
                roots = []
            else:
                q = -0.5 * (B + np.copysign(np.sqrt(disc), B))   # stable quadratic roots
                roots = [q / A] + ([C / q] if q != 0 else [])
        for s in roots:
            if -1e-9 <= s <= 1 + 1e-9:
                t = y1[k] + min(max(s, 0.0), 1.0) * dy[k] - M
                if 0.0 < t < T:
                    ts.append(float(t))
    cuts = np.unique(np.asarray(ts))
    if cuts.size < 2:
        return T
    mid = 0.5 * (cuts[:-1] + cuts[1:])
    if kind == "moment":
        mx = (mom + mid * a) / r
    else:
        mx = (mom + mid * a) / (M + mid)
    ok = _env.covers(P, mx, M + mid, tol=prep.tol)
    ok = np.atleast_1d(ok)
    if ok.all():
        return T
    return float(cuts[int(np.argmin(ok))])


def max_addable_mass(total_mass, cg, arm, *, mass_limit, envelope=None, moment_envelope=False,
                     reduction=1.0, station_capacity=None, cg_y=None, arm_y=None,
                     lateral_envelope=None, tol=None) -> AddableMass:
    """Largest mass a station can take while every intermediate state stays in limits.

    Adding mass t at arm ``arm`` moves the state continuously from the present one; the
    answer is the largest t such that for every added mass in [0, t] the total stays within
    ``mass_limit`` (and ``station_capacity``) and the CG stays covered by ``envelope`` (and by
    ``lateral_envelope`` when a lateral arm is given). The path is solved exactly against each
    envelope edge (a line in moment–mass coordinates, a hyperbola in arm–mass coordinates), so
    the result is the exact meeting point up to floating-point rounding (relative ~1e-12); an
    envelope's own tolerance (``tol``, see :mod:`ledger.core.envelope`) applies to coverage.

    Parameters
    ----------
    total_mass, cg : float
        Present mass (above 0) and longitudinal CG.
    arm : float
        Longitudinal arm of the station.
    mass_limit : float
        Maximum total mass (e.g. maximum take-off or zero-fuel mass).
    envelope : array_like, shape (n, 2), optional
        Longitudinal envelope, (arm, mass) points; with ``moment_envelope=True``,
        (moment ÷ ``reduction``, mass) points.
    moment_envelope : bool
        Whether ``envelope`` is a moment–mass envelope.
    reduction : float
        Reduction factor of the envelope's moment axis (1, 100, 1000, …).
    station_capacity : float, optional
        Mass the station can still take (its limit minus what it holds).
    cg_y, arm_y : float, optional
        Lateral CG and lateral arm of the station, for ``lateral_envelope`` ((lateral arm, mass)
        points); all three together.
    tol : float, optional
        Envelope tolerance (default as in :func:`ledger.core.envelope.covers`).

    Returns
    -------
    AddableMass

    Raises
    ------
    CorrectionError
        When the present state is already over the mass limit or outside an envelope.

    Examples
    --------
    >>> env = [[2.0, 600.0], [2.6, 600.0], [2.6, 1100.0], [2.0, 1100.0]]
    >>> r = max_addable_mass(800.0, 2.4, 3.4, mass_limit=1100.0, envelope=env)
    >>> round(r.mass, 9), r.limited_by, round(r.new_cg, 9)
    (200.0, 'envelope', 2.6)
    >>> max_addable_mass(800.0, 2.4, 2.5, mass_limit=1100.0, envelope=env).limited_by
    'mass limit'
    """
    M = float(_positive_mass(total_mass))
    c = float(_arr(cg, "cg"))
    a = float(_arr(arm, "arm"))
    limit = float(_positive_mass(mass_limit, "mass_limit"))
    r = float(_positive_mass(reduction, "reduction"))
    slack = 1e-12 * limit
    if M > limit + slack:
        raise CorrectionError("total_mass", M,
                              f"at most the mass limit {limit:g} before adding",
                              hint=f"Offload {M - limit:g} first")
    T = max(limit - M, 0.0)
    limited_by = "mass limit"
    if station_capacity is not None:
        cap = float(_arr(station_capacity, "station_capacity", "a finite mass of 0 or more"))
        if cap < 0:
            raise CorrectionError("station_capacity", cap, "a finite mass of 0 or more")
        if cap < T:
            T, limited_by = cap, "station capacity"
    lateral = (cg_y, arm_y, lateral_envelope)
    if any(v is not None for v in lateral) and not all(v is not None for v in lateral):
        missing = [n for n, v in zip(("cg_y", "arm_y", "lateral_envelope"), lateral) if v is None]
        raise CorrectionError(missing[0], None,
                              "a value: cg_y, arm_y and lateral_envelope go together")
    checks = []
    if envelope is not None:
        kind = "moment" if moment_envelope else "arm"
        checks.append(("envelope", envelope, kind, c, a, r))
    if lateral_envelope is not None:
        checks.append(("lateral envelope", lateral_envelope, "arm",
                       float(_arr(cg_y, "cg_y")), float(_arr(arm_y, "arm_y")), 1.0))
    for name, poly, kind, cg0, arm0, red in checks:
        field = "lateral_envelope" if name == "lateral envelope" else "envelope"
        prep = _env.prepare_envelope(poly, tol, field=field)
        x0 = M * cg0 / red if kind == "moment" else cg0
        if not _env.covers(prep.P, x0, M, tol=prep.tol):
            raise CorrectionError(
                "cg_y" if name == "lateral envelope" else "cg", cg0,
                f"a state inside the {name} before adding (mass {M:g})",
                hint="Bring the CG within limits first (shift weight, ballast or offload)")
        t = _exit_along(prep, M, M * cg0, arm0, T, kind, red)
        if t < T * (1 - 1e-12) - 1e-300:
            T, limited_by = t, name
    new_mass = M + T
    new_cg = (M * c + T * a) / new_mass
    new_cg_y = None
    if cg_y is not None:
        new_cg_y = (M * float(cg_y) + T * float(arm_y)) / new_mass
    return AddableMass(float(T), limited_by, float(new_mass), float(new_cg), new_cg_y)
