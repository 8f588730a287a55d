"""The keys each table of a vehicle type file accepts (``demo_fleet/FORMAT.md`` documents each).

A key not listed for its table is refused, with the nearest listed key as a hint.
"""

from __future__ import annotations

from ledger.typedata.model import OCCUPANT_CLASSES

TOP_KEYS = ("format_version", "vehicle", "units", "datum", "mac", "limits", "station", "tank",
             "envelope", "reaction_point", "inertia", "axle", "axle_group", "configuration",
             "tolerances", "mass_set")
VEHICLE_KEYS = ("name", "title", "kind", "note")
UNITS_KEYS = ("mass", "length", "volume", "moment_divisor")
DATUM_KEYS = ("description",)
MAC_KEYS = ("lemac", "length")
AIR_LIMITS = ("max_ramp", "max_takeoff", "max_landing", "max_zero_fuel", "min_flight")
LIMIT_KEYS = AIR_LIMITS + ("gross_rating",)
STATION_KEYS = ("name", "kind", "x", "y", "z", "max_mass", "persons", "occupant", "x_range",
                 "floor_area", "floor_load_limit", "note")
TANK_KEYS = ("name", "fluid", "capacity", "unusable", "density", "x", "y", "z", "arm_table",
              "note")
ARM_ROW_KEYS = ("quantity", "x", "y", "z")
ENVELOPE_KEYS = ("name", "category", "axis", "coordinates", "points", "note")
REACTION_KEYS = ("name", "x", "y")
INERTIA_KEYS = {
    "measured": ("basis", "ixx", "iyy", "izz", "ixz", "ixy", "iyz", "note"),
    "gyration": ("basis", "rx", "ry", "rz", "span", "length", "note"),
}
AXLE_KEYS = ("name", "x", "rating", "track")
AXLE_GROUP_KEYS = ("name", "axles", "load_share", "rating")
TOLERANCE_KEYS = ("last_minute_mass", "last_minute_persons", "reweigh_mass_percent",
                   "reweigh_cg_percent_mac", "reweigh_cg_shift")
CONFIG_KEYS = ("name", "action", "description", "disables_stations", "item")
ITEM_KEYS = ("name", "mass", "x", "y", "z", "shape")
MASS_SET_KEYS = ("name", "description", "source") + OCCUPANT_CLASSES
