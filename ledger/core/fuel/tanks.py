"""Tank arms and moments from arm tables, usable fuel, and the capacity check."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ledger.core.fuel._inputs import _finite_array, _first_bad, _out
from ledger.errors import InputError

__all__ = ["tank_arm", "tank_moment", "usable_fuel", "CapacityCheck", "check_capacity"]


def _check_table(table_q, table_arm, q_field: str = "table_q",
                 arm_field: str = "table_x") -> tuple[np.ndarray, np.ndarray]:
    tq = _finite_array(table_q, q_field, "finite quantities")
    if tq.ndim != 1 or tq.size < 2:
        raise InputError(q_field, table_q, "a list of at least 2 quantities")
    ta = _finite_array(table_arm, arm_field, "finite arms in m")
    if ta.ndim not in (1, 2) or ta.shape[0] != tq.size:
        raise InputError(arm_field, table_arm,
                         f"{tq.size} rows of arms (one per quantity row), each an arm "
                         f"or an (x, y, z) triple")
    steps = np.diff(tq)
    if np.any(steps <= 0):
        i = int(np.argmax(steps <= 0)) + 1
        raise InputError(
            f"{q_field}[{i}]", float(tq[i]),
            f"a quantity greater than row {i - 1} ({tq[i - 1]:g}); the arm table must be "
            f"strictly increasing in quantity")
    return tq, ta


def _interp_arm(tq: np.ndarray, ta: np.ndarray, q: np.ndarray) -> np.ndarray:
    if ta.ndim == 1:
        return np.interp(q, tq, ta)
    return np.stack([np.interp(q, tq, ta[:, k]) for k in range(ta.shape[1])], axis=-1)


def tank_arm(table_q, table_x, q):
    """Arm of the fuel in a tank at quantity ``q``, by linear interpolation in a table.

    Parameters
    ----------
    table_q : array_like, shape (n,)
        Quantities at the table rows (mass in kg or volume in m³, as long as ``q`` uses the same
        measure), strictly increasing, n ≥ 2.
    table_x : array_like, shape (n,) or (n, k)
        The arm at each row (m): one axis, or k axes per row such as (x, y, z).
    q : float or array_like
        Quantities to look up, within ``[table_q[0], table_q[-1]]`` (inclusive). Outside that
        range the table says nothing, so it is an error rather than an extrapolation.

    Returns
    -------
    float or ndarray
        Arm(s): shape of ``q`` for a 1-column table, ``q.shape + (k,)`` otherwise.

    Raises
    ------
    InputError
        A table not strictly increasing (naming the row), mismatched rows, or ``q`` outside the
        table.

    Examples
    --------
    >>> tank_arm([0.0, 100.0, 200.0], [2.0, 2.2, 2.3], 150.0)
    2.25
    >>> tank_arm([0.0, 100.0], [[2.0, 1.0, 0.5], [2.2, 1.0, 0.7]], [0.0, 50.0]).round(6)
    array([[2. , 1. , 0.5],
           [2.1, 1. , 0.6]])
    """
    tq, ta = _check_table(table_q, table_x)
    qq = _finite_array(q, "quantity", "a finite quantity")
    bad_mask = (qq < tq[0]) | (qq > tq[-1])
    if np.any(bad_mask):
        bad, idx = _first_bad(qq, bad_mask)
        raise InputError("quantity" + idx, bad,
                         f"a quantity from {tq[0]:g} to {tq[-1]:g} (the arm table's range)",
                         hint="Extend the tank's arm table to cover this quantity")
    return _out(_interp_arm(tq, ta, qq))


def tank_moment(table_mass, table_arm, mass):
    """Moment of the fuel in a tank whose arm table is keyed by fuel mass: ``m · arm(m)``.

    Parameters
    ----------
    table_mass : array_like, shape (n,)
        Fuel mass at each row, kg, strictly increasing.
    table_arm : array_like, shape (n,) or (n, k)
        Arm(s) at each row, m.
    mass : float or array_like
        Fuel mass, kg, within the table.

    Returns
    -------
    float or ndarray
        Moment(s) in kg·m, shaped as in :func:`tank_arm`.

    Examples
    --------
    >>> tank_moment([0.0, 100.0, 200.0], [2.0, 2.2, 2.3], 150.0)
    337.5
    """
    arm = np.asarray(tank_arm(table_mass, table_arm, mass), dtype=float)
    m = np.asarray(mass, dtype=float)
    if arm.ndim > m.ndim:
        m = m[..., None]
    return _out(m * arm)


def usable_fuel(quantity, unusable):
    """Usable part of a fuel quantity: ``max(quantity − unusable, 0)``.

    Parameters
    ----------
    quantity : float or array_like
        Fuel on board in the tank (kg or m³), including the unusable fuel.
    unusable : float or array_like
        Unusable fuel of the tank (same measure), 0 or more.

    Returns
    -------
    float or ndarray

    Examples
    --------
    >>> usable_fuel([10.0, 3.0], 4.0)
    array([6., 0.])
    """
    q = _finite_array(quantity, "quantity", "a finite quantity of 0 or more")
    u = _finite_array(unusable, "unusable", "a finite unusable quantity of 0 or more")
    if np.any(q < 0):
        bad, idx = _first_bad(q, q < 0)
        raise InputError("quantity" + idx, bad, "a finite quantity of 0 or more")
    if np.any(u < 0):
        bad, idx = _first_bad(u, u < 0)
        raise InputError("unusable" + idx, bad, "a finite unusable quantity of 0 or more")
    return _out(np.maximum(q - u, 0.0))


@dataclass(frozen=True)
class CapacityCheck:
    """Result of :func:`check_capacity` (all in the measure the caller used, kg or m³).

    Attributes
    ----------
    quantity : float
        Total fuel in the tank, unusable included.
    capacity : float
        Total capacity of the tank, unusable included.
    unusable : float
        Unusable fuel (stays in the tank; part of the basic empty weight as the type data says).
    usable : float
        ``max(quantity − unusable, 0)``.
    usable_capacity : float
        ``capacity − unusable``.
    room : float
        ``capacity − quantity``: what can still be added (0 when full).
    """

    quantity: float
    capacity: float
    unusable: float
    usable: float
    usable_capacity: float
    room: float


def check_capacity(quantity: float, capacity: float, unusable: float = 0.0, *,
                   field: str = "quantity") -> CapacityCheck:
    """Check a tank quantity against its capacity and split it into usable and unusable.

    A full tank (``quantity == capacity``) is accepted: the limit is inclusive.

    Parameters
    ----------
    quantity : float
        Fuel in the tank, unusable included, 0 or more.
    capacity : float
        Total tank capacity (same measure), greater than 0.
    unusable : float, optional
        Unusable fuel (same measure), from 0 to ``capacity``.
    field : str, optional
        Field name for error messages (e.g. ``"tanks['left main'].fuel"``).

    Returns
    -------
    CapacityCheck

    Raises
    ------
    InputError
        Quantity above capacity, negative or non-finite values, unusable above capacity.

    Examples
    --------
    >>> c = check_capacity(150.0, 200.0, unusable=5.0)
    >>> c.usable, c.usable_capacity, c.room
    (145.0, 195.0, 50.0)
    >>> check_capacity(210.0, 200.0, field="left tank")
    Traceback (most recent call last):
    ...
    ledger.errors.InputError: left tank = 210: at most the tank capacity 200. Reduce the fuel by 10
    """
    q = float(_finite_array(quantity, field, "a finite quantity of 0 or more"))
    cap = float(_finite_array(capacity, "capacity", "a finite capacity greater than 0"))
    unu = float(_finite_array(unusable, "unusable", "a finite unusable quantity of 0 or more"))
    if cap <= 0:
        raise InputError("capacity", cap, "a finite capacity greater than 0")
    if unu < 0 or unu > cap:
        raise InputError("unusable", unu, f"from 0 to the tank capacity {cap:g}")
    if q < 0:
        raise InputError(field, q, "a finite quantity of 0 or more")
    if q > cap:
        raise InputError(field, q, f"at most the tank capacity {cap:g}",
                         hint=f"Reduce the fuel by {q - cap:g}")
    return CapacityCheck(quantity=q, capacity=cap, unusable=unu, usable=max(q - unu, 0.0),
                         usable_capacity=cap - unu, room=cap - q)


