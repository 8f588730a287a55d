"""The fixed words of the type format (kinds, categories, axes, shapes), its fluids and the
built-in standard mass sets."""

from __future__ import annotations

from dataclasses import dataclass

from ledger.units import LB as _LB
from ledger.units import US_GALLON

__all__ = [
    "CANONICAL_VERSION",
    "VEHICLE_KINDS",
    "AIRCRAFT_KINDS",
    "STATION_KINDS",
    "SEAT_KINDS",
    "OCCUPANT_CLASSES",
    "ENVELOPE_CATEGORIES",
    "ENVELOPE_AXES",
    "ENVELOPE_COORDINATES",
    "CONFIGURATION_ACTIONS",
    "SHAPE_KINDS",
    "SHAPE_AXES",
    "SHAPE_DIMENSIONS",
    "Fluid",
    "FLUIDS",
    "StandardMassSet",
    "STANDARD_MASS_SETS",
]

CANONICAL_VERSION = 1
"""Version of the canonical dict layout written by :meth:`VehicleType.to_dict`."""

VEHICLE_KINDS = ("airplane", "helicopter", "drone", "ground_vehicle")
AIRCRAFT_KINDS = ("airplane", "helicopter", "drone")
STATION_KINDS = ("crew", "passenger", "cargo", "ballast", "equipment")
SEAT_KINDS = ("crew", "passenger")
OCCUPANT_CLASSES = ("flight_crew", "cabin_crew", "adult", "child")
ENVELOPE_CATEGORIES = ("normal", "utility", "acrobatic", "commuter", "transport", "restricted")
ENVELOPE_AXES = ("longitudinal", "lateral")
ENVELOPE_COORDINATES = ("arm", "moment")
CONFIGURATION_ACTIONS = ("install", "remove")
SHAPE_KINDS = ("point", "box", "cylinder", "hollow_cylinder", "disk", "rod", "sphere")
SHAPE_AXES = ("x", "y", "z")
#: The dimensions each shape kind takes, in the order a user gives them (type files, --shape).
SHAPE_DIMENSIONS = {
    "point": (),
    "box": ("length", "width", "height"),
    "cylinder": ("radius", "length", "axis"),
    "hollow_cylinder": ("radius", "inner_radius", "length", "axis"),
    "disk": ("radius", "axis"),
    "rod": ("length", "axis"),
    "sphere": ("radius",),
}

_LB_PER_USGAL = _LB / US_GALLON  # kg/m3 per lb/USgal


@dataclass(frozen=True)
class Fluid:
    """A fluid a tank may hold, with its nominal density (used when the file gives none)."""

    name: str
    nominal_density_kg_m3: float
    is_fuel: bool
    vcf_group: str | None
    """Product group for the temperature correction (``"gasoline"``, ``"jet"``) or None."""
    source: str


FLUIDS: dict[str, Fluid] = {
    f.name: f
    for f in (
        # FAA-H-8083-30 ch. 4 "standard weights": gasoline 6.0, turbine fuel 6.7, oil 7.5,
        # water 8.35 lb/US gal (as quoted in the domain notes).
        Fluid("avgas", 6.0 * _LB_PER_USGAL, True, "gasoline", "FAA-H-8083-30 ch. 4: 6.0 lb/USgal"),
        Fluid("mogas", 6.0 * _LB_PER_USGAL, True, "gasoline", "FAA-H-8083-30 ch. 4: 6.0 lb/USgal"),
        Fluid("jet", 6.7 * _LB_PER_USGAL, True, "jet", "FAA-H-8083-30 ch. 4: 6.7 lb/USgal"),
        Fluid("oil", 7.5 * _LB_PER_USGAL, False, None, "FAA-H-8083-30 ch. 4: 7.5 lb/USgal"),
        Fluid("water", 8.35 * _LB_PER_USGAL, False, None, "FAA-H-8083-30 ch. 4: 8.35 lb/USgal"),
        # Road diesel: 0.84 kg/L at 15 degC, inside the 0.820-0.845 kg/L band of EN 590
        # (from memory; common practice). Give a measured density in the type file if known.
        Fluid("diesel", 840.0, True, None, "common practice (from memory): 0.84 kg/L"),
    )
}


@dataclass(frozen=True)
class StandardMassSet:
    """Standard masses per occupant class an operator may choose for a loading sheet."""

    name: str
    description: str
    source: str
    masses_kg: tuple[tuple[str, float], ...]
    """(occupant class, kg) pairs, in :data:`OCCUPANT_CLASSES` order."""

    def mass_for(self, occupant_class: str) -> float | None:
        """Standard mass (kg) for the class, or None if this set does not define it."""
        for cls, kg in self.masses_kg:
            if cls == occupant_class:
                return kg
        return None


STANDARD_MASS_SETS: dict[str, StandardMassSet] = {
    s.name: s
    for s in (
        StandardMassSet(
            "faa-light-170lb", "Crew and passengers 170 lb each (light aircraft)",
            "FAA-H-8083-30 ch. 4 (as quoted in the domain notes)",
            (("flight_crew", 170 * _LB), ("cabin_crew", 170 * _LB), ("adult", 170 * _LB))),
        StandardMassSet(
            "faa-ac120-27e-summer", "Average adult 190 lb, child 82 lb (summer)",
            "AC 120-27E (2005), read in a secondary source; replaced by AC 120-27F (2019)",
            (("adult", 190 * _LB), ("child", 82 * _LB))),
        StandardMassSet(
            "faa-ac120-27e-winter", "Average adult 195 lb, child 87 lb (winter)",
            "AC 120-27E (2005), read in a secondary source; replaced by AC 120-27F (2019)",
            (("adult", 195 * _LB), ("child", 87 * _LB))),
        StandardMassSet(
            "easa-crew", "Flight crew 85 kg, cabin crew 75 kg",
            "EASA NCC.POL.105 (as quoted in the domain notes)",
            (("flight_crew", 85.0), ("cabin_crew", 75.0))),
    )
}
"""Built-in standard mass sets. A type file may add its own (``[[mass_set]]``)."""


