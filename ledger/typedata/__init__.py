"""Vehicle type data: the TOML type-file format and the parsed, validated model.

Public names::

    from ledger.typedata import (load_type_file, read_type_file, parse_type, parse_type_text,
                                 VehicleType)

The format is described in ``demo_fleet/FORMAT.md``. Importing this package does not load
numpy; parsing a file imports :mod:`ledger.core.envelope` to check the envelope polygons.
"""

from ledger.typedata.model import (
    CANONICAL_VERSION,
    CONFIGURATION_ACTIONS,
    ENVELOPE_AXES,
    ENVELOPE_CATEGORIES,
    ENVELOPE_COORDINATES,
    FLUIDS,
    OCCUPANT_CLASSES,
    SHAPE_KINDS,
    STANDARD_MASS_SETS,
    STATION_KINDS,
    VEHICLE_KINDS,
    Axle,
    AxleGroup,
    ConfigItem,
    Configuration,
    Envelope,
    Extent,
    Fluid,
    GyrationInertia,
    Mac,
    MeasuredInertia,
    ReactionPoint,
    Shape,
    StandardMassSet,
    Station,
    Tank,
    TankArmPoint,
    Tolerances,
    VehicleType,
    WeightLimits,
)
from ledger.typedata.parse import (
    FORMAT_VERSION,
    load_type_file,
    parse_type,
    parse_type_text,
    read_type_file,
)
from ledger.units import DisplayUnits

__all__ = [
    "CANONICAL_VERSION",
    "CONFIGURATION_ACTIONS",
    "ENVELOPE_AXES",
    "ENVELOPE_CATEGORIES",
    "ENVELOPE_COORDINATES",
    "FLUIDS",
    "FORMAT_VERSION",
    "OCCUPANT_CLASSES",
    "SHAPE_KINDS",
    "STANDARD_MASS_SETS",
    "STATION_KINDS",
    "VEHICLE_KINDS",
    "Axle",
    "AxleGroup",
    "ConfigItem",
    "Configuration",
    "DisplayUnits",
    "Envelope",
    "Extent",
    "Fluid",
    "GyrationInertia",
    "Mac",
    "MeasuredInertia",
    "ReactionPoint",
    "Shape",
    "StandardMassSet",
    "Station",
    "Tank",
    "TankArmPoint",
    "Tolerances",
    "VehicleType",
    "WeightLimits",
    "load_type_file",
    "parse_type",
    "parse_type_text",
    "read_type_file",
]
