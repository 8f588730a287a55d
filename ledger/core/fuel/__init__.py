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

Modules
-------
:mod:`~ledger.core.fuel.density`
    Nominal densities, volume and mass.
:mod:`~ledger.core.fuel.temperature`
    Density with temperature (table 54B).
:mod:`~ledger.core.fuel.tanks`
    Tank arms and moments, usable fuel, capacity.
:mod:`~ledger.core.fuel.burn`
    States along a fuel burn.
"""

from __future__ import annotations

from ledger.core.factors import LB, US_GALLON
from ledger.core.fuel.burn import BurnStates, Tank, burn_states
from ledger.core.fuel.density import (
    NOMINAL_DENSITY,
    NOMINAL_DENSITY_LB_PER_US_GAL,
    mass_to_volume,
    nominal_density,
    volume_to_mass,
)
from ledger.core.fuel.tanks import (
    CapacityCheck,
    check_capacity,
    tank_arm,
    tank_moment,
    usable_fuel,
)
from ledger.core.fuel.temperature import (
    VCF_PRODUCTS,
    VCF_TEMPERATURE_RANGE,
    density_at_15c,
    density_at_temperature,
    volume_correction_factor,
)

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
