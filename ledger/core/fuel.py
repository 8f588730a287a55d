"""Fuel and fluids: densities, volume and mass, temperature correction, tank arms, fuel burn.

Everything is SI: mass in kg, volume in m³, density in kg/m³, arms in m, temperature in °C.
Functions accept scalars or numpy arrays and return plain floats or arrays.

Sources
-------
- Nominal densities: FAA-H-8083-30 (Aviation Maintenance Technician Handbook), ch. 4,
  "standard weights": avgas 6.0 lb/US gal, turbine fuel 6.7, oil 7.5, water 8.35; converted with
  the exact NIST SP 811 (appendix B) factors 1 lb = 0.45359237 kg and 1 US gal = 3.785411784 L.
- Temperature correction: ASTM D1250 / API MPMS ch. 11.1, table 54B (generalized products,
  correction of volume to 15 °C against density at 15 °C):
  VCF = exp(−α·Δt·(1 + 0.8·α·Δt)), Δt = t − 15 °C, α = K0/ρ15² + K1/ρ15.
  The constants K0, K1, the product-class density bands and the temperature range are
  recalled, not read (from memory); the formula reproduces the Measurement Canada printed
  table 54B values for jet fuel (ρ15 = 800 kg/m³) and aviation gasoline (ρ15 = 710 kg/m³)
  to the table's last digit (see tests/core/test_fuel.py).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from ledger.errors import InputError

__all__ = [
    "LB",
    "US_GALLON",
    "NOMINAL_DENSITY_LB_PER_US_GAL",
    "NOMINAL_DENSITY",
    "VCF_PRODUCTS",
    "VCF_TEMPERATURE_RANGE",
    "nominal_density",
    "volume_to_mass",
    "mass_to_volume",
    "volume_correction_factor",
    "density_at_temperature",
    "density_at_15c",
    "tank_arm",
    "tank_moment",
    "usable_fuel",
    "CapacityCheck",
    "check_capacity",
    "Tank",
    "BurnStates",
    "burn_states",
]

#: 1 lb in kg, exact (NIST SP 811, appendix B).
LB = 0.45359237
#: 1 US gallon in m³, exact (NIST SP 811, appendix B: 3.785411784 L).
US_GALLON = 3.785411784e-3

#: Standard weights per US gallon (FAA-H-8083-30, ch. 4).
NOMINAL_DENSITY_LB_PER_US_GAL: dict[str, float] = {
    "avgas": 6.0,
    "jet": 6.7,
    "oil": 7.5,
    "water": 8.35,
}

#: The same standard weights as densities in kg/m³ (avgas ≈ 718.96, jet ≈ 802.84).
NOMINAL_DENSITY: dict[str, float] = {
    name: lb_per_gal * LB / US_GALLON for name, lb_per_gal in NOMINAL_DENSITY_LB_PER_US_GAL.items()
}

_FLUID_ALIASES = {"turbine": "jet", "jet fuel": "jet", "kerosene": "jet"}


@dataclass(frozen=True)
class _VcfProduct:
    k0: float
    k1: float
    rho15_min: float
    rho15_max: float


#: Table 54B product classes used here: constants K0 (kg²/m⁶/°C), K1 (kg/m³/°C) and the band
#: of ρ15 (kg/m³) each class covers. All from memory (ASTM D1250-80 / API MPMS 11.1, table 54B).
#: The transition zone between gasolines and jet fuels (770.5 to 787.5 kg/m³) uses a different
#: form and is not implemented: such densities are refused.
VCF_PRODUCTS: dict[str, _VcfProduct] = {
    "jet": _VcfProduct(k0=594.5418, k1=0.0, rho15_min=787.5, rho15_max=838.5),
    "gasoline": _VcfProduct(k0=346.4228, k1=0.4388, rho15_min=653.0, rho15_max=770.5),
}
_PRODUCT_ALIASES = {"avgas": "gasoline", "mogas": "gasoline", "turbine": "jet",
                    "kerosene": "jet", "jet fuel": "jet"}

#: Observed temperatures accepted by :func:`volume_correction_factor`, °C (inclusive).
#: The range of the 2004 edition of API MPMS 11.1 for refined products, from memory; the printed
#: tables the tests compare against start at −40 °C.
VCF_TEMPERATURE_RANGE = (-50.0, 150.0)


def _known(names) -> str:
    return ", ".join(repr(n) for n in names)


def _finite_array(value, field: str, allowed: str) -> np.ndarray:
    try:
        arr = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise InputError(field, value, allowed) from None
    if not np.all(np.isfinite(arr)):
        bad = arr[~np.isfinite(arr)].flat[0] if arr.ndim else float(arr)
        raise InputError(field, float(bad), allowed)
    return arr


def _out(arr: np.ndarray):
    """Plain float for a 0-d result, an array otherwise."""
    return float(arr) if np.ndim(arr) == 0 else arr


def _first_bad(arr: np.ndarray, mask: np.ndarray):
    """The first offending value and its label suffix ("" for a scalar, "[i]" for arrays)."""
    if arr.ndim == 0:
        return float(arr), ""
    idx = np.argwhere(mask)[0]
    label = "[" + ", ".join(str(int(i)) for i in idx) + "]"
    return float(arr[tuple(idx)]), label


def nominal_density(fluid: str) -> float:
    """Standard density of a fluid by name, in kg/m³.

    Parameters
    ----------
    fluid : str
        One of ``"avgas"``, ``"jet"`` (also ``"turbine"``, ``"kerosene"``), ``"oil"``,
        ``"water"``; case and surrounding spaces are ignored.

    Returns
    -------
    float
        Density in kg/m³ (FAA-H-8083-30 ch. 4 standard weights, NIST SP 811 factors). A measured
        density, when the operator has one, should be used instead.

    Raises
    ------
    InputError
        For an unknown name; the message lists the known names.

    Examples
    --------
    >>> round(nominal_density("avgas"), 3)
    718.959
    >>> round(nominal_density(" Turbine "), 2)
    802.84
    """
    key = str(fluid).strip().lower()
    key = _FLUID_ALIASES.get(key, key)
    if key not in NOMINAL_DENSITY:
        raise InputError(
            "fluid", fluid, f"one of {_known(NOMINAL_DENSITY)}",
            hint="Give a measured density instead if the fluid is not listed")
    return NOMINAL_DENSITY[key]


def _check_density(density, field: str = "density") -> np.ndarray:
    rho = _finite_array(density, field, "a finite density in kg/m³ greater than 0")
    if np.any(rho <= 0):
        bad, idx = _first_bad(rho, rho <= 0)
        raise InputError(field + idx, bad, "a finite density in kg/m³ greater than 0")
    return rho


def volume_to_mass(volume, density):
    """Mass of a fluid volume: ``m = V·ρ``.

    Parameters
    ----------
    volume : float or array_like
        Volume in m³, 0 or more.
    density : float or array_like
        Density in kg/m³, greater than 0 (broadcast against ``volume``).

    Returns
    -------
    float or ndarray
        Mass in kg.

    Examples
    --------
    >>> gal = 3.785411784e-3
    >>> round(volume_to_mass(50 * gal, nominal_density("avgas")) / 0.45359237, 6)  # lb
    300.0
    """
    vol = _finite_array(volume, "volume", "a finite volume in m³ of 0 or more")
    if np.any(vol < 0):
        bad, idx = _first_bad(vol, vol < 0)
        raise InputError("volume" + idx, bad, "a finite volume in m³ of 0 or more")
    return _out(vol * _check_density(density))


def mass_to_volume(mass, density):
    """Volume of a fluid mass: ``V = m/ρ``.

    Parameters
    ----------
    mass : float or array_like
        Mass in kg, 0 or more.
    density : float or array_like
        Density in kg/m³, greater than 0.

    Returns
    -------
    float or ndarray
        Volume in m³.

    Examples
    --------
    >>> round(mass_to_volume(802.0, 802.0), 12)
    1.0
    """
    m = _finite_array(mass, "mass", "a finite mass in kg of 0 or more")
    if np.any(m < 0):
        bad, idx = _first_bad(m, m < 0)
        raise InputError("mass" + idx, bad, "a finite mass in kg of 0 or more")
    return _out(m / _check_density(density))


def _product(product: str) -> tuple[str, _VcfProduct]:
    key = str(product).strip().lower()
    key = _PRODUCT_ALIASES.get(key, key)
    if key not in VCF_PRODUCTS:
        raise InputError("product", product,
                         f"one of {_known(VCF_PRODUCTS)} (table 54B product classes; "
                         f"'avgas' counts as gasoline)")
    return key, VCF_PRODUCTS[key]


def _check_rho15(rho15, name: str, p: _VcfProduct, field: str = "rho15",
                 slack: float = 0.0) -> np.ndarray:
    rho = _check_density(rho15, field)
    bad_mask = (rho < p.rho15_min - slack) | (rho > p.rho15_max + slack)
    if np.any(bad_mask):
        bad, idx = _first_bad(rho, bad_mask)
        raise InputError(
            field + idx, bad,
            f"a density at 15 °C from {p.rho15_min:g} to {p.rho15_max:g} kg/m³ "
            f"for table 54B {name}",
            hint="Check the product class or use a measured density at the tank temperature")
    return rho


def _check_temperature(t_c, field: str = "t_c") -> np.ndarray:
    lo, hi = VCF_TEMPERATURE_RANGE
    allowed = f"a temperature from {lo:g} to {hi:g} °C (table 54B range)"
    t = _finite_array(t_c, field, allowed)
    bad_mask = (t < lo) | (t > hi)
    if np.any(bad_mask):
        bad, idx = _first_bad(t, bad_mask)
        raise InputError(field + idx, bad, allowed)
    return t


def _vcf(rho15: np.ndarray, t: np.ndarray, p: _VcfProduct) -> np.ndarray:
    alpha = p.k0 / rho15**2 + p.k1 / rho15
    dt = t - 15.0
    return np.exp(-alpha * dt * (1.0 + 0.8 * alpha * dt))


def volume_correction_factor(rho15, t_c, product: str):
    """Table 54B volume correction factor: volume at 15 °C per unit volume at ``t_c``.

    ``VCF = exp(−α·Δt·(1 + 0.8·α·Δt))`` with ``Δt = t − 15 °C`` and ``α = K0/ρ15² + K1/ρ15``.
    VCF is 1 at 15 °C, above 1 when colder (the fluid has shrunk) and falls steadily with
    temperature. Computed without the intermediate rounding of the printed tables, so values can
    differ from them by one unit in the fourth decimal.

    Parameters
    ----------
    rho15 : float or array_like
        Density at 15 °C, kg/m³, within the product class band (:data:`VCF_PRODUCTS`):
        gasoline 653–770.5, jet 787.5–838.5 (inclusive).
    t_c : float or array_like
        Observed temperature, °C, within :data:`VCF_TEMPERATURE_RANGE` (inclusive).
    product : str
        ``"jet"`` (also ``"turbine"``, ``"kerosene"``) or ``"gasoline"`` (also ``"avgas"``).

    Returns
    -------
    float or ndarray
        The dimensionless VCF.

    Raises
    ------
    InputError
        Unknown product, density outside the class band, temperature out of range.

    Examples
    --------
    >>> round(volume_correction_factor(800.0, -40.0, "jet"), 4)
    1.0502
    >>> volume_correction_factor(800.0, 15.0, "jet")
    1.0
    """
    name, p = _product(product)
    rho = _check_rho15(rho15, name, p)
    t = _check_temperature(t_c)
    return _out(_vcf(rho, t, p))


def density_at_temperature(rho15, t_c, product: str):
    """Density at ``t_c`` from the density at 15 °C: ``ρ_t = ρ15 · VCF(ρ15, t)``.

    Mass is conserved, so ``ρ_t·V_t = ρ15·V15`` and ``V15 = VCF·V_t``.

    Parameters
    ----------
    rho15, t_c, product
        As in :func:`volume_correction_factor`.

    Returns
    -------
    float or ndarray
        Density at ``t_c`` in kg/m³.

    Examples
    --------
    >>> round(density_at_temperature(800.0, 35.0, "jet"), 2)
    785.06
    """
    name, p = _product(product)
    rho = _check_rho15(rho15, name, p)
    t = _check_temperature(t_c)
    return _out(rho * _vcf(rho, t, p))


def density_at_15c(rho_t, t_c, product: str, *, tol: float = 1e-9, max_iter: int = 60):
    """Density at 15 °C from a density observed at ``t_c`` (inverse of the table 54B relation).

    Solves ``ρ_t = ρ15 · VCF(ρ15, t)`` for ρ15 by fixed-point iteration
    ``ρ15 ← ρ_t / VCF(ρ15, t)``, starting from ``ρ_t``. VCF depends only weakly on ρ15, so the
    iteration contracts fast (a few steps to 1e-9 kg/m³). This is the exact inverse of
    :func:`density_at_temperature`, not the hydrometer table 53B (no glass-expansion term).

    Parameters
    ----------
    rho_t : float or array_like
        Observed density at ``t_c``, kg/m³.
    t_c : float or array_like
        Observed temperature, °C (range as in :func:`volume_correction_factor`).
    product : str
        ``"jet"`` or ``"gasoline"`` (aliases as in :func:`volume_correction_factor`).
    tol : float
        Convergence tolerance on ρ15, kg/m³.
    max_iter : int
        Iteration limit.

    Returns
    -------
    float or ndarray
        ρ15 in kg/m³, checked against the product class band.

    Raises
    ------
    InputError
        Bad product, density or temperature, or a ρ15 outside the product class band.

    Examples
    --------
    >>> round(density_at_15c(density_at_temperature(800.0, 35.0, "jet"), 35.0, "jet"), 9)
    800.0
    """
    name, p = _product(product)
    rho_t_arr = _check_density(rho_t, "rho_t")
    t = _check_temperature(t_c)
    rho15 = np.array(np.broadcast_to(rho_t_arr, np.broadcast(rho_t_arr, t).shape), dtype=float)
    for _ in range(max_iter):
        new = rho_t_arr / _vcf(rho15, t, p)
        if np.all(np.abs(new - rho15) <= tol):
            rho15 = new
            break
        rho15 = new
    else:  # pragma: no cover - the iteration contracts by ~1e-3 per step
        raise InputError("rho_t", rho_t, "a density whose 15 °C value can be found; "
                         "the iteration did not converge")
    # A value on a band edge may come back a rounding error outside it.
    _check_rho15(rho15, name, p, field="rho15 (from rho_t)", slack=1e-6)
    return _out(rho15)


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
    k = widths.pop()
    usable = np.maximum(masses - unusable, 0.0)

    if isinstance(sequence, str):
        if sequence != "proportional":
            raise InputError("sequence", sequence,
                             "'proportional' or a list of tank indices drained in order")
        order = None
        feeding = np.arange(n_t)
    else:
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
        feeding = np.array(order)

    burn_v = float(_finite_array(burn, "burn", "a finite fuel mass in kg of 0 or more"))
    available = float(usable[feeding].sum())
    if burn_v < 0:
        raise InputError("burn", burn_v, "a fuel mass in kg of 0 or more")
    if burn_v > available * (1 + 1e-12):
        raise InputError("burn", burn_v,
                         f"at most {available:g} kg (the usable fuel in the feeding tanks)",
                         hint="Reduce the trip fuel or add fuel")
    burn_v = min(burn_v, available)

    # Event positions along the burn, s in [0, burn].
    events: dict[str, list[float]] = {"switch": [], "breakpoint": []}
    if order is None:
        total_usable = available

        def masses_at(s: np.ndarray) -> np.ndarray:
            if total_usable == 0:
                return np.broadcast_to(masses, (s.size, n_t)).copy()
            return masses[None, :] - s[:, None] * (usable / total_usable)[None, :]

        for i, (tq, _) in enumerate(arms):
            if tq is None or usable[i] == 0:
                continue
            for b in tq:
                if masses[i] - usable[i] < b < masses[i]:
                    events["breakpoint"].append((masses[i] - b) * total_usable / usable[i])
    else:
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

    pts = [(0.0, "start"), (burn_v, "end")]
    pts += [(s, "switch") for s in events["switch"] if 0 < s < burn_v]
    pts += [(s, "breakpoint") for s in events["breakpoint"] if 0 < s < burn_v]
    pts += [(float(s), "sample") for s in np.linspace(0.0, burn_v, int(samples))[1:-1]]
    rank = {"start": 0, "end": 0, "switch": 1, "breakpoint": 2, "sample": 3}
    pts.sort(key=lambda p: (p[0], rank[p[1]]))
    burned, kind = [], []
    for s, why in pts:
        if burned and math.isclose(s, burned[-1], rel_tol=1e-12, abs_tol=1e-9):
            if rank[why] < rank[kind[-1]]:
                kind[-1] = why
            continue
        burned.append(s)
        kind.append(why)
    if burn_v == 0.0:
        burned, kind = [0.0], ["start"]
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
