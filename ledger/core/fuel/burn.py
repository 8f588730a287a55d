"""Fuel mass and moment along a burn, proportional or tank by tank."""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from ledger.core.fuel._inputs import _finite_array
from ledger.core.fuel.tanks import _check_table, _interp_arm, check_capacity
from ledger.errors import InputError

__all__ = ["Tank", "BurnStates", "burn_states"]


@dataclass(frozen=True)
class Tank:
    """A fuel tank for :func:`burn_states`.

    Give either a fixed ``arm`` or an arm table (``table_mass`` with ``table_arm``). All tanks of
    one call must give the same number of axes (1 for x only, or 3 for x, y, z).

    Attributes
    ----------
    mass : float
        Fuel in the tank now, kg, unusable included.
    unusable : float
        Unusable fuel, kg; the burn never goes below it.
    arm : float or tuple of float, optional
        Fixed arm: x, or (x, y, z), m.
    table_mass : sequence of float, optional
        Fuel masses (kg) of the arm-table rows, strictly increasing; must cover the fuel from
        ``unusable`` to ``mass``.
    table_arm : sequence, optional
        Arm per row: x, or (x, y, z), m.
    capacity : float, optional
        Tank capacity, kg, checked against ``mass``.
    name : str
        Shown in error messages.
    """

    mass: float
    unusable: float = 0.0
    arm: float | tuple[float, ...] | None = None
    table_mass: Sequence[float] | None = None
    table_arm: Sequence | None = None
    capacity: float | None = None
    name: str = ""


@dataclass(frozen=True)
class BurnStates:
    """States along a fuel burn (from :func:`burn_states`).

    Attributes
    ----------
    burned : ndarray, shape (n,)
        Fuel burned since the start, kg, increasing from 0 to the burn.
    tank_mass : ndarray, shape (n, T)
        Fuel in each tank, kg.
    fuel_mass : ndarray, shape (n,)
        Total fuel in all tanks, kg.
    fuel_moment : ndarray, shape (n, k)
        Moment of all the fuel per axis (k = 1: x; k = 3: x, y, z), kg·m.
    kind : tuple of str
        Why each state is there: ``"start"``, ``"end"``, ``"switch"`` (a tank ran down to its
        unusable fuel in tank order), ``"breakpoint"`` (a tank passed an arm-table row) or
        ``"sample"`` (dense sample in between).
    """

    burned: np.ndarray
    tank_mass: np.ndarray
    fuel_mass: np.ndarray
    fuel_moment: np.ndarray
    kind: tuple[str, ...]


def _tank_arms(tank: Tank, i: int):
    """Return (table_mass, table_arm 2-D) for a tank; a fixed arm becomes a 2-row table."""
    label = f"tanks[{i}]" + (f" ({tank.name!r})" if tank.name else "")
    has_fixed = tank.arm is not None
    has_table = tank.table_mass is not None or tank.table_arm is not None
    if has_fixed == has_table:
        raise InputError(f"{label}.arm", tank.arm,
                         "either a fixed arm or an arm table (table_mass with table_arm)")
    if has_fixed:
        arm = _finite_array(tank.arm, f"{label}.arm", "a finite arm in m, or (x, y, z)")
        arm = np.atleast_1d(arm)
        if arm.ndim != 1 or arm.size not in (1, 3):
            raise InputError(f"{label}.arm", tank.arm, "an arm x, or a triple (x, y, z), in m")
        return None, arm
    if tank.table_mass is None or tank.table_arm is None:
        raise InputError(f"{label}.table_arm", tank.table_arm,
                         "both table_mass and table_arm for an arm table")
    tq, ta = _check_table(tank.table_mass, tank.table_arm,
                          q_field=f"{label}.table_mass", arm_field=f"{label}.table_arm")
    ta = ta[:, None] if ta.ndim == 1 else ta
    if ta.shape[1] not in (1, 3):
        raise InputError(f"{label}.table_arm", tank.table_arm,
                         "rows of one arm x, or of (x, y, z)")
    return tq, ta


def burn_states(tanks: Sequence[Tank], burn: float, sequence="proportional", *,
                samples: int = 41) -> BurnStates:
    """Fuel mass and moment along a burn, for checking a CG path against an envelope.

    Because a tank's arm may vary with its quantity, the moment is piecewise quadratic in the
    burned mass between arm-table rows; an envelope need not be convex. So the result holds every
    arm-table breakpoint crossed, every tank switch, the start and the end, plus ``samples``
    evenly spaced states in between. Add the zero-fuel mass and moment to get the vehicle's CG
    path.

    Parameters
    ----------
    tanks : sequence of Tank
        The tanks with their current fuel.
    burn : float
        Fuel to burn, kg, 0 or more; at most the usable fuel of the tanks that feed.
    sequence : "proportional" or sequence of int
        ``"proportional"``: every tank feeds at once, each in proportion to its usable fuel, so
        all reach their unusable fuel together. A list of tank indices: those tanks are drained
        one after the other, each down to its unusable fuel; tanks not listed do not feed.
    samples : int
        Number of evenly spaced states from start to end (at least 2).

    Returns
    -------
    BurnStates

    Raises
    ------
    InputError
        Bad tanks (negative or non-finite fuel, fuel above capacity, a table that does not
        cover the fuel), a bad sequence, or a burn above the usable fuel.

    Examples
    --------
    >>> left = Tank(mass=100.0, unusable=5.0, arm=2.0)
    >>> aft = Tank(mass=50.0, table_mass=[0.0, 25.0, 50.0], table_arm=[3.0, 3.2, 3.3])
    >>> s = burn_states([left, aft], 120.0, [1, 0], samples=2)
    >>> s.burned.tolist(), s.kind
    ([0.0, 25.0, 50.0, 120.0], ('start', 'breakpoint', 'switch', 'end'))
    >>> s.fuel_moment[:, 0].round(3).tolist()
    [365.0, 280.0, 200.0, 60.0]
    """
    if not isinstance(tanks, (list, tuple)) or len(tanks) == 0:
        raise InputError("tanks", tanks, "a non-empty list of tanks")
    if not isinstance(samples, (int, np.integer)) or samples < 2:
        raise InputError("samples", samples, "an integer of 2 or more")
    masses, unusable, arms, k = _checked_tanks(tanks)
    usable = np.maximum(masses - unusable, 0.0)
    order, feeding = _feeding_order(sequence, len(tanks))
    available = float(usable[feeding].sum())
    burn_v = _checked_burn(burn, available)
    if order is None:
        masses_at, events = _proportional(masses, usable, arms, available)
    else:
        masses_at, events = _tank_order(order, masses, usable, arms, burn_v)
    burned, kind = _burn_points(burn_v, events, samples)
    s_arr = np.array(burned)
    tm = masses_at(s_arr)
    moment = np.zeros((s_arr.size, k))
    for i, (tq, ta) in enumerate(arms):
        if tq is None:
            moment += tm[:, i:i + 1] * ta[None, :]
        else:
            moment += tm[:, i:i + 1] * _interp_arm(tq, ta, tm[:, i])
    return BurnStates(burned=s_arr, tank_mass=tm, fuel_mass=tm.sum(axis=1), fuel_moment=moment,
                      kind=tuple(kind))


def _checked_tanks(tanks: Sequence[Tank]):
    """Each tank's fuel and unusable fuel (kg) and (table_mass, table_arm), checked; and the
    number of axes the arms give (1 or 3, the same for all)."""
    n_t = len(tanks)
    masses = np.empty(n_t)
    unusable = np.empty(n_t)
    arms = []
    for i, tank in enumerate(tanks):
        label = f"tanks[{i}]" + (f" ({tank.name!r})" if tank.name else "")
        m = float(_finite_array(tank.mass, f"{label}.mass", "a finite fuel mass in kg"))
        u = float(_finite_array(tank.unusable, f"{label}.unusable",
                                "a finite unusable fuel mass in kg"))
        if m < 0:
            raise InputError(f"{label}.mass", m, "a fuel mass of 0 kg or more")
        if u < 0:
            raise InputError(f"{label}.unusable", u, "an unusable fuel mass of 0 kg or more")
        if tank.capacity is not None:
            check_capacity(m, tank.capacity, min(u, float(tank.capacity)),
                           field=f"{label}.mass")
        tq, ta = _tank_arms(tank, i)
        if tq is not None:
            low = min(u, m)
            if low < tq[0] or m > tq[-1]:
                raise InputError(
                    f"{label}.table_mass", tank.table_mass,
                    f"rows covering the fuel from {low:g} to {m:g} kg",
                    hint="Extend the tank's arm table")
        masses[i], unusable[i] = m, u
        arms.append((tq, ta))
    widths = {(a.shape[-1] if a.ndim else 1) for _, a in arms}
    if len(widths) != 1:
        raise InputError("tanks", [t.name or i for i, t in enumerate(tanks)],
                         "tanks that all give x only, or all give (x, y, z)")
    return masses, unusable, arms, widths.pop()


def _feeding_order(sequence, n_t: int) -> tuple[list[int] | None, np.ndarray]:
    """The tank order (None for proportional feeding) and the indices of the feeding tanks."""
    if isinstance(sequence, str):
        if sequence != "proportional":
            raise InputError("sequence", sequence,
                             "'proportional' or a list of tank indices drained in order")
        return None, np.arange(n_t)
    try:
        order = [int(j) for j in sequence]
    except (TypeError, ValueError):
        raise InputError("sequence", sequence,
                         "'proportional' or a list of tank indices drained in order") from None
    if not order:
        raise InputError("sequence", sequence, "at least one tank index")
    for j in order:
        if not 0 <= j < n_t:
            raise InputError("sequence", j, f"a tank index from 0 to {n_t - 1}")
    if len(set(order)) != len(order):
        raise InputError("sequence", list(sequence), "each tank index at most once")
    return order, np.array(order)


def _checked_burn(burn, available: float) -> float:
    """The burn in kg, checked against the usable fuel ``available`` in the feeding tanks."""
    burn_v = float(_finite_array(burn, "burn", "a finite fuel mass in kg of 0 or more"))
    if burn_v < 0:
        raise InputError("burn", burn_v, "a fuel mass in kg of 0 or more")
    if burn_v > available * (1 + 1e-12):
        raise InputError("burn", burn_v,
                         f"at most {available:g} kg (the usable fuel in the feeding tanks)",
                         hint="Reduce the trip fuel or add fuel")
    return min(burn_v, available)


def _proportional(masses: np.ndarray, usable: np.ndarray, arms: list, total_usable: float):
    """Every tank feeds in proportion to its usable fuel (``total_usable`` in all): the tank
    masses as a function of the burn, and the burns at which a tank passes an arm-table row."""
    n_t = masses.size

    def masses_at(s: np.ndarray) -> np.ndarray:
        if total_usable == 0:
            return np.broadcast_to(masses, (s.size, n_t)).copy()
        return masses[None, :] - s[:, None] * (usable / total_usable)[None, :]

    events: dict[str, list[float]] = {"switch": [], "breakpoint": []}
    for i, (tq, _) in enumerate(arms):
        if tq is None or usable[i] == 0:
            continue
        for b in tq:
            if masses[i] - usable[i] < b < masses[i]:
                events["breakpoint"].append((masses[i] - b) * total_usable / usable[i])
    return masses_at, events


def _tank_order(order: list[int], masses: np.ndarray, usable: np.ndarray, arms: list,
                burn_v: float):
    """Tanks drained one after the other: the tank masses as a function of the burn, and the
    burns at which a tank runs down (switch) or passes an arm-table row (breakpoint)."""
    n_t = masses.size
    events: dict[str, list[float]] = {"switch": [], "breakpoint": []}
    starts = {}
    cum = 0.0
    for j in order:
        starts[j] = cum
        cum += usable[j]
        if 0 < cum < burn_v:
            events["switch"].append(cum)

    def masses_at(s: np.ndarray) -> np.ndarray:
        out = np.broadcast_to(masses, (s.size, n_t)).copy()
        for j in order:
            drawn = np.clip(s - starts[j], 0.0, usable[j])
            out[:, j] = masses[j] - drawn
        return out

    for j in order:
        tq, _ = arms[j]
        if tq is None:
            continue
        for b in tq:
            if masses[j] - usable[j] < b < masses[j]:
                events["breakpoint"].append(starts[j] + masses[j] - b)
    return masses_at, events


def _burn_points(burn_v: float, events: dict[str, list[float]],
                 samples: int) -> tuple[list[float], list[str]]:
    """The burns at which states are given, in order, each with why it is there (events that
    coincide keep the most telling reason)."""
    pts = [(0.0, "start"), (burn_v, "end")]
    pts += [(s, "switch") for s in events["switch"] if 0 < s < burn_v]
    pts += [(s, "breakpoint") for s in events["breakpoint"] if 0 < s < burn_v]
    pts += [(float(s), "sample") for s in np.linspace(0.0, burn_v, int(samples))[1:-1]]
    rank = {"start": 0, "end": 0, "switch": 1, "breakpoint": 2, "sample": 3}
    pts.sort(key=lambda p: (p[0], rank[p[1]]))
    burned: list[float] = []
    kind: list[str] = []
    for s, why in pts:
        if burned and math.isclose(s, burned[-1], rel_tol=1e-12, abs_tol=1e-9):
            if rank[why] < rank[kind[-1]]:
                kind[-1] = why
            continue
        burned.append(s)
        kind.append(why)
    if burn_v == 0.0:
        burned, kind = [0.0], ["start"]
    return burned, kind
