"""Fuel density with temperature: ASTM D1250 / API MPMS 11.1, table 54B."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ledger.core.fuel._inputs import _finite_array, _first_bad, _known, _out
from ledger.core.fuel.density import _check_density
from ledger.errors import InputError

__all__ = ["VCF_PRODUCTS", "VCF_TEMPERATURE_RANGE", "volume_correction_factor",
           "density_at_temperature", "density_at_15c"]


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


