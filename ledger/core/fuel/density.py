"""Nominal densities of fuels and fluids, and volume to mass (FAA-H-8083-30, ch. 4)."""

from __future__ import annotations

import numpy as np

from ledger.core.factors import LB, US_GALLON
from ledger.core.fuel._inputs import _finite_array, _first_bad, _known, _out
from ledger.errors import InputError

__all__ = ["NOMINAL_DENSITY_LB_PER_US_GAL", "NOMINAL_DENSITY", "nominal_density", "volume_to_mass",
           "mass_to_volume"]

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


