"""Mass properties of a set of items: total mass, first moments and centre of gravity.

Conventions (see the domain notes): SI inside (kg, m, kg·m); the arm ``x`` is positive aft of the
datum, ``y`` positive right, ``z`` positive up. Moment = mass × arm; CG = Σ(m·arm) / Σm per axis
(FAA-H-8083-1, Weight and Balance Handbook).

Every function takes scalars or numpy arrays. Item sets are laid out along the **last** axis, so
``masses`` of shape ``(n_cases, n_items)`` evaluates many loading cases in one call; arms
broadcast against the masses (one arm per item shared by all cases, or one per case and item).

Bad input raises :class:`ledger.errors.MassPropertiesError` naming the field, the item index,
the value and what is allowed.
"""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from ledger.core._common import index_text, plain
from ledger.errors import MassPropertiesError
from ledger.errors import Shown as _Shown

__all__ = [
    "Vector3",
    "MassProperties",
    "MassState",
    "mass_properties",
    "moment_index",
    "percent_mac",
    "cg_from_percent_mac",
    "add_items",
    "remove_items",
]


class Vector3(NamedTuple):
    """Three per-axis values (x, y, z). An axis that was not given is ``None``."""

    x: float | np.ndarray | None
    y: float | np.ndarray | None
    z: float | np.ndarray | None


class MassProperties(NamedTuple):
    """Result of :func:`mass_properties`.

    Attributes
    ----------
    mass : float or ndarray
        Total mass per loading case, shape ``masses.shape[:-1]`` (a float for one case).
    moment : Vector3
        First moments Σ m·x, Σ m·y, Σ m·z; ``None`` for an axis whose arms were not given.
    cg : Vector3
        Centre of gravity per axis (moment ÷ mass); ``None`` for an axis not given.
    """

    mass: float | np.ndarray
    moment: Vector3
    cg: Vector3


class MassState(NamedTuple):
    """A running (mass, moment) state, e.g. an empty weight kept by a ledger.

    ``moment`` has the shape of ``mass`` (one axis) or one more trailing axis (several axes).
    """

    mass: float | np.ndarray
    moment: float | np.ndarray

    @property
    def cg(self) -> float | np.ndarray:
        """CG = moment ÷ mass (per axis); NaN where the mass is 0 (no CG exists)."""
        mass = np.asarray(self.mass, dtype=float)
        moment = np.asarray(self.moment, dtype=float)
        if moment.ndim == mass.ndim + 1:
            mass = mass[..., None]
        with np.errstate(divide="ignore", invalid="ignore"):
            cg = np.where(mass > 0, moment / np.where(mass > 0, mass, 1.0), np.nan)
        return plain(cg)


def _as_float_array(value, field: str) -> np.ndarray:
    try:
        return np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise MassPropertiesError(field, value,
                                  "numbers (a number or an array of numbers)") from None


def _check_masses(m: np.ndarray, field: str = "masses", *, infinite: bool = True) -> None:
    """Raise for the first negative or non-finite mass. ``min`` catches NaN (it propagates);
    with ``infinite=False`` the caller checks for +inf itself (e.g. through the totals)."""
    if m.size == 0:
        return
    low = m.min()
    if low >= 0.0 and (not infinite or np.isfinite(m.max())):
        return
    bad = ~(np.isfinite(m) & (m >= 0.0))
    idx = np.unravel_index(int(np.argmax(bad)), m.shape)
    raise MassPropertiesError(f"{field}[{index_text(idx)}]", float(m[idx]),
                              "a finite mass of 0 or more")


def _check_finite(a: np.ndarray, field: str, allowed: str) -> None:
    if a.size == 0 or np.isfinite(a).all():
        return
    idx = np.unravel_index(int(np.argmax(~np.isfinite(a))), a.shape)
    text = index_text(idx)
    raise MassPropertiesError(f"{field}[{text}]" if text else field, float(a[idx]), allowed)


def mass_properties(masses, x, y=None, z=None) -> MassProperties:
    """Total mass, first moments and CG of items, for one or many loading cases.

    Parameters
    ----------
    masses : array_like, shape (..., n_items)
        Item masses (kg), 0 or more and finite. The last axis runs over the items; leading axes
        are loading cases. A scalar is one item.
    x : array_like
        Longitudinal arms (m, positive aft of the datum), broadcastable against ``masses``,
        e.g. shape ``(n_items,)`` for arms shared by every case.
    y, z : array_like, optional
        Lateral (positive right) and vertical (positive up) arms, same rules as ``x``.

    Returns
    -------
    MassProperties
        ``mass`` of shape ``(...)``; ``moment`` and ``cg`` as :class:`Vector3` (``None`` for an
        axis not given). One case gives plain floats.

    Raises
    ------
    MassPropertiesError
        For an empty item set, a negative or non-finite mass, a non-finite arm, arms whose
        shape does not broadcast against the masses, or a total mass of 0 (no CG exists).

    Examples
    --------
    Pilot's Handbook of Aeronautical Knowledge (FAA-H-8083-25) ch. 9: 6,860 lb at 80.0 in plus
    140 lb at 150 in.

    >>> r = mass_properties([6860.0, 140.0], [80.0, 150.0])
    >>> r.mass, round(r.cg.x, 6)
    (7000.0, 81.4)
    >>> r.cg.y is None
    True

    Two loading cases of three items at once:

    >>> r = mass_properties([[1.0, 1.0, 0.0], [1.0, 0.0, 3.0]], [0.0, 2.0, 4.0])
    >>> r.mass.tolist(), r.cg.x.tolist()
    ([2.0, 4.0], [1.0, 3.0])
    """
    m = _as_float_array(masses, "masses")
    if m.ndim == 0:
        m = m[None]
    if m.shape[-1] == 0:
        raise MassPropertiesError("masses", _Shown("[]"),
                                  "at least one item; the item set is empty")
    _check_masses(m, infinite=False)
    arms = _checked_arms(m, x, y, z)
    total, moments_given = _totals(m, [a for a in arms if a is not None])
    _check_totals(m, total, moments_given, arms)
    moments: list = []
    cgs: list = []
    it = iter(moments_given)
    for arm in arms:
        if arm is None:
            moments.append(None)
            cgs.append(None)
        else:
            moment = next(it)
            moments.append(plain(moment))
            cgs.append(plain(moment / total))
    return MassProperties(plain(total), Vector3(*moments), Vector3(*cgs))


def _checked_arms(m: np.ndarray, x, y, z) -> list[np.ndarray | None]:
    """The arms per axis as float arrays (None where not given), each checked finite and
    broadcastable against the masses, one per item."""
    arms: list[np.ndarray | None] = []
    for field, value in (("x", x), ("y", y), ("z", z)):
        if value is None:
            arms.append(None)
            continue
        a = _as_float_array(value, field)
        if a.ndim == 0:
            a = np.broadcast_to(a, m.shape[-1:])
        try:
            np.broadcast_shapes(a.shape, m.shape)
        except ValueError:
            raise MassPropertiesError(
                field, _Shown(f"an array of shape {a.shape}"),
                f"one arm per item, broadcastable against masses of shape {m.shape}") from None
        if a.shape[-1] != m.shape[-1] and a.shape[-1] != 1:
            raise MassPropertiesError(field, _Shown(f"an array of shape {a.shape}"),
                                      f"one arm per item ({m.shape[-1]} items)")
        _check_finite(a, field, "a finite arm")
        arms.append(a)
    return arms


def _totals(m: np.ndarray, shared: list[np.ndarray]) -> tuple[np.ndarray, list[np.ndarray]]:
    """Total mass and one moment per given axis, per loading case."""
    # Overflow and inf·0 show up as non-finite sums, reported below with the field named.
    with np.errstate(over="ignore", invalid="ignore"):
        if all(a.ndim == 1 for a in shared):
            # One arm per item for all cases: a single (axes × items) @ (items × cases) product,
            # which gives contiguous rows (mass, then one moment per axis) and runs faster in
            # BLAS than (cases × items) @ (items × axes).
            n = m.shape[-1]
            rows = np.vstack([np.ones(n)] + [np.broadcast_to(a, (n,)) for a in shared])
            prod = rows @ m.reshape(-1, n).T
            total = prod[0].reshape(m.shape[:-1])
            moments_given = [prod[k + 1].reshape(m.shape[:-1]) for k in range(len(shared))]
        else:
            total = m @ np.ones(m.shape[-1])
            moments_given = [np.einsum("...i,...i->...", m, a) for a in shared]
    return total, moments_given


def _check_totals(m: np.ndarray, total: np.ndarray, moments_given: list[np.ndarray],
                  arms: list[np.ndarray | None]) -> None:
    """Raise for a total mass that is not above 0 and finite, or a non-finite moment."""
    # Fast screens first (one reduction each); the precise search runs only on failure.
    if not (np.min(total) > 0.0 and np.isfinite(np.max(total))):
        if not np.all(np.isfinite(total)):
            _check_masses(m)  # an infinite mass (a NaN would have been caught above)
            raise MassPropertiesError("sum(masses)", float("inf"),
                                      "a finite total mass; the masses are too large")
        idx = np.unravel_index(int(np.argmax(~(total > 0.0))), total.shape)
        where = f"masses[{index_text(idx)}, :]" if idx else "masses"
        raise MassPropertiesError(f"sum({where})", float(total[idx]),
                                  "a total mass above 0; a CG needs at least one item with mass")
    for k, mo in enumerate(moments_given):
        with np.errstate(over="ignore", invalid="ignore"):
            screen = np.isfinite(np.sum(mo))   # may overflow for huge but finite moments
        if not screen and not np.all(np.isfinite(mo)):
            name = ("x", "y", "z")[[i for i, a in enumerate(arms) if a is not None][k]]
            raise MassPropertiesError(f"moment about {name}", float(mo[~np.isfinite(mo)].flat[0]),
                                      "a finite moment; masses or arms are too large")


def moment_index(moment, reduction):
    """Moment index: moment ÷ reduction factor.

    Parameters
    ----------
    moment : float or array_like
        Moment (mass × arm) in the display units of the type data.
    reduction : float
        Reduction factor, positive; the trade uses 100, 1,000 or 10,000 (FAA-H-8083-1).

    Returns
    -------
    float or ndarray

    Examples
    --------
    >>> moment_index(569800.0, 1000)
    569.8
    """
    r = float(reduction) if np.ndim(reduction) == 0 else reduction
    if not (np.isfinite(r) and r > 0):
        raise MassPropertiesError("reduction", r,
                                  "a positive reduction factor such as 100, 1000 or 10000")
    return plain(np.asarray(moment, dtype=float) / r)


def _check_mac(mac) -> float:
    try:
        value = float(mac)
    except (TypeError, ValueError):
        raise MassPropertiesError("mac", mac, "a positive MAC length") from None
    if not (np.isfinite(value) and value > 0):
        raise MassPropertiesError("mac", value, "a positive MAC length")
    return value


def percent_mac(cg_x, lemac, mac):
    """CG position in per cent of the mean aerodynamic chord: (CG − LEMAC) ÷ MAC × 100.

    Parameters
    ----------
    cg_x : float or array_like
        Longitudinal CG, same length unit and datum as ``lemac``.
    lemac : float
        Arm of the leading edge of the MAC.
    mac : float
        Length of the MAC, positive.

    Examples
    --------
    >>> percent_mac(2.75, 2.0, 1.5)
    50.0
    >>> percent_mac([2.0, 3.5], 2.0, 1.5).tolist()
    [0.0, 100.0]
    """
    mac_value = _check_mac(mac)
    return plain((np.asarray(cg_x, dtype=float) - float(lemac)) / mac_value * 100.0)


def cg_from_percent_mac(pct, lemac, mac):
    """Inverse of :func:`percent_mac`: arm = LEMAC + %MAC ÷ 100 × MAC.

    Examples
    --------
    >>> cg_from_percent_mac(50.0, 2.0, 1.5)
    2.75
    """
    mac_value = _check_mac(mac)
    return plain(float(lemac) + np.asarray(pct, dtype=float) / 100.0 * mac_value)


def _state_change(state_mass, state_moment, masses, arms, sign: float) -> MassState:
    M = _as_float_array(state_mass, "state_mass")
    if M.ndim == 0:
        if not (np.isfinite(M) and M >= 0):
            raise MassPropertiesError("state_mass", float(M), "a finite mass of 0 or more")
    else:
        _check_masses(M, "state_mass")
    mom = _as_float_array(state_moment, "state_moment")
    _check_finite(mom, "state_moment", "a finite moment")
    multi = mom.ndim == M.ndim + 1
    m = _as_float_array(masses, "masses")
    if m.ndim == 0:
        m = m[None]
    _check_masses(m)
    a = _as_float_array(arms, "arms")
    _check_finite(a, "arms", "a finite arm")
    try:
        if multi:
            dmom = np.einsum("...i,...ik->...k", m, np.broadcast_to(a, m.shape + mom.shape[-1:]))
        else:
            dmom = np.einsum("...i,...i->...", m, np.broadcast_to(a, m.shape))
    except ValueError:
        raise MassPropertiesError(
            "arms", _Shown(f"an array of shape {a.shape}"),
            f"one arm per item (and per axis) matching masses of shape {m.shape}") from None
    dm = m.sum(axis=-1)
    new_mass = M + sign * dm
    if sign < 0:
        # Rounding may leave -1e-13 kg after removing everything that was recorded.
        slack = 1e-12 * np.maximum(M, 1.0)
        short = new_mass < -slack
        if np.any(short):
            i = np.unravel_index(int(np.argmax(short)), np.shape(short)) if np.ndim(short) else ()
            raise MassPropertiesError(
                "masses", float(np.asarray(dm)[i]),
                f"a total removed of at most the recorded mass {float(np.asarray(M)[i]):g}; "
                "removing them would leave a negative mass")
        new_mass = np.where(new_mass < 0, 0.0, new_mass)
    return MassState(plain(new_mass), plain(mom + sign * dmom))


def add_items(state_mass, state_moment, masses, arms) -> MassState:
    """Add items to a (mass, moment) state, e.g. an installation in a running record.

    Parameters
    ----------
    state_mass : float or array_like
        Current mass (kg), 0 or more.
    state_moment : float or array_like
        Current moment (kg·m). Same shape as ``state_mass`` for one axis, or with one more
        trailing axis of length k for k axes (e.g. ``(3,)`` for x, y, z).
    masses : array_like, shape (..., n_items)
        Masses of the items added (0 or more).
    arms : array_like
        Arms of the items: shape of ``masses`` for one axis, ``masses.shape + (k,)`` for k axes.

    Returns
    -------
    MassState
        The new ``mass`` and ``moment``; ``.cg`` gives the new CG.

    Examples
    --------
    >>> s = add_items(6860.0, 6860.0 * 80.0, [140.0], [150.0])
    >>> s.mass, round(s.cg, 6)
    (7000.0, 81.4)
    >>> s = add_items(10.0, [10.0, 0.0, 5.0], [2.0], [[4.0, -1.0, 0.5]])
    >>> s.mass, s.moment.tolist()
    (12.0, [18.0, -2.0, 6.0])
    """
    return _state_change(state_mass, state_moment, masses, arms, +1.0)


def remove_items(state_mass, state_moment, masses, arms) -> MassState:
    """Remove items from a (mass, moment) state (the inverse of :func:`add_items`).

    Raises :class:`MassPropertiesError` when more mass would be removed than the state holds.

    Examples
    --------
    >>> s = remove_items(7000.0, 569800.0, [140.0], [150.0])
    >>> s.mass, s.cg
    (6860.0, 80.0)
    """
    return _state_change(state_mass, state_moment, masses, arms, -1.0)
