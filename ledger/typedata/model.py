"""The parsed vehicle type: a frozen dataclass tree, every figure in internal (SI) units.

Parsing (:mod:`ledger.typedata.parse`) checks everything a type file says and builds a
:class:`VehicleType`. The classes here hold the result and do not validate again: build them
through the parser, or through :meth:`VehicleType.from_dict` from a dict that
:meth:`VehicleType.to_dict` produced.

Units: every attribute name ends in its unit (``x_m``, ``max_mass_kg``, ``ixx_kg_m2``,
``density_kg_m3``) except where the unit depends on a tank's ``basis`` (``Tank.capacity``,
``Tank.unusable``, ``TankArmPoint.quantity``: m³ when ``basis == "volume"``, kg when
``basis == "mass"``). Display units are in :class:`ledger.units.DisplayUnits`.

Axes (see the domain notes): x positive aft of the datum, y positive right (seen from behind),
z positive up. ``z_m`` is ``None`` where the type file gives no vertical arm; code that needs
it (inertia) must say so to the user rather than assume 0.
"""

from __future__ import annotations

import dataclasses
import hashlib
import json
import math
import types
import typing
from dataclasses import dataclass, field

from ledger.errors import NotFoundError, TypeDataError
from ledger.units import LB as _LB
from ledger.units import US_GALLON, DisplayUnits

__all__ = [
    "CANONICAL_VERSION",
    "CONFIGURATION_ACTIONS",
    "ENVELOPE_AXES",
    "ENVELOPE_CATEGORIES",
    "ENVELOPE_COORDINATES",
    "FLUIDS",
    "OCCUPANT_CLASSES",
    "SHAPE_DIMENSIONS",
    "SHAPE_KINDS",
    "STANDARD_MASS_SETS",
    "STATION_KINDS",
    "VEHICLE_KINDS",
    "Axle",
    "AxleGroup",
    "ConfigItem",
    "Configuration",
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


@dataclass(frozen=True)
class Mac:
    """Mean aerodynamic chord: leading edge arm and length.

    Examples
    --------
    >>> round(Mac(lemac_m=6.10, length_m=1.90).percent_mac(6.575), 9)
    25.0
    """

    lemac_m: float
    length_m: float

    def percent_mac(self, x_m: float) -> float:
        """CG as %MAC: (x − LEMAC) / MAC × 100."""
        return (x_m - self.lemac_m) / self.length_m * 100.0

    def x_at_percent(self, percent: float) -> float:
        """Arm (m) of a CG at ``percent`` %MAC."""
        return self.lemac_m + percent / 100.0 * self.length_m


@dataclass(frozen=True)
class WeightLimits:
    """Mass limits (kg); None where the type does not have that limit.

    Aircraft (airplane, helicopter, drone) always have ``max_takeoff_kg``; ground vehicles
    always have ``gross_rating_kg`` and none of the flight limits.
    """

    max_ramp_kg: float | None = None
    max_takeoff_kg: float | None = None
    max_landing_kg: float | None = None
    max_zero_fuel_kg: float | None = None
    min_flight_kg: float | None = None
    gross_rating_kg: float | None = None

    def largest_maximum(self) -> tuple[float, str] | None:
        """The largest maximum mass the type states (kg) and its name, or None if it states
        none: the maximum ramp mass where given, else the maximum take-off mass; the gross
        vehicle rating for a ground vehicle.

        Examples
        --------
        >>> WeightLimits(max_takeoff_kg=1111.0, max_landing_kg=1100.0).largest_maximum()
        (1111.0, 'maximum take-off mass')
        """
        named = ((self.max_ramp_kg, "maximum ramp mass"),
                 (self.max_takeoff_kg, "maximum take-off mass"),
                 (self.max_landing_kg, "maximum landing mass"),
                 (self.max_zero_fuel_kg, "maximum zero-fuel mass"),
                 (self.gross_rating_kg, "gross vehicle rating"))
        given = [(kg, name) for kg, name in named if kg is not None]
        return max(given, key=lambda g: g[0]) if given else None


@dataclass(frozen=True)
class Extent:
    """Fore-and-aft extent of a compartment or load area, with an optional floor limit."""

    x_min_m: float
    x_max_m: float
    floor_area_m2: float | None = None
    floor_load_limit_kg_m2: float | None = None


@dataclass(frozen=True)
class Station:
    """A place that takes load: a seat, a cargo compartment or load area, a ballast point.

    ``persons`` is the number of people a seat station takes (0 for other kinds);
    ``occupant_class`` picks the standard mass used when a sheet uses standard masses.
    """

    name: str
    kind: str
    x_m: float
    y_m: float = 0.0
    z_m: float | None = None
    max_mass_kg: float | None = None
    persons: int = 0
    occupant_class: str | None = None
    extent: Extent | None = None
    note: str = ""

    @property
    def is_seat(self) -> bool:
        return self.kind in SEAT_KINDS


@dataclass(frozen=True)
class TankArmPoint:
    """One row of a tank arm table: arms of the fuel's CG at a total quantity in the tank.

    ``quantity`` is in m³ or kg according to the tank's ``basis``.
    """

    quantity: float
    x_m: float
    y_m: float
    z_m: float | None


@dataclass(frozen=True)
class Tank:
    """A tank. Quantities count the whole contents, unusable included.

    The basic empty weight holds the unusable contents (at ``arms_at(unusable)``), so a loading
    sheet adds contents − unusable, with moment m(q)·arm(q) − m(u)·arm(u).

    ``basis`` says whether ``capacity``, ``unusable`` and the arm-table quantities are volumes
    (m³) or masses (kg). ``x_m``, ``y_m``, ``z_m`` are the arms of the full tank (for a tank
    with an arm table, the table's value at capacity); use :meth:`arms_at` for a part-full tank.

    Examples
    --------
    >>> t = Tank("main", "avgas", "volume", 0.1, 0.005, 720.0, False, 1.2, 0.0, None,
    ...          (TankArmPoint(0.0, 1.0, 0.0, None), TankArmPoint(0.1, 1.2, 0.0, None)))
    >>> t.arms_at(0.05)
    (1.1, 0.0, None)
    >>> round(t.usable_kg(), 6)
    68.4
    """

    name: str
    fluid: str
    basis: str
    capacity: float
    unusable: float
    density_kg_m3: float
    density_from_file: bool
    x_m: float
    y_m: float
    z_m: float | None
    arm_table: tuple[TankArmPoint, ...] = ()
    note: str = ""

    @property
    def quantity_unit(self) -> str:
        """Internal unit of ``capacity``, ``unusable`` and table quantities: m3 or kg."""
        return "m3" if self.basis == "volume" else "kg"

    @property
    def is_fuel(self) -> bool:
        return FLUIDS[self.fluid].is_fuel

    def mass_of(self, quantity: float, density_kg_m3: float | None = None) -> float:
        """Mass (kg) of ``quantity`` (basis units) at the given or the tank's density."""
        if self.basis == "mass":
            return quantity
        return quantity * (self.density_kg_m3 if density_kg_m3 is None else density_kg_m3)

    def quantity_of(self, mass_kg: float, density_kg_m3: float | None = None) -> float:
        """Quantity (basis units) holding ``mass_kg`` at the given or the tank's density."""
        if self.basis == "mass":
            return mass_kg
        return mass_kg / (self.density_kg_m3 if density_kg_m3 is None else density_kg_m3)

    def capacity_kg(self, density_kg_m3: float | None = None) -> float:
        return self.mass_of(self.capacity, density_kg_m3)

    def unusable_kg(self, density_kg_m3: float | None = None) -> float:
        return self.mass_of(self.unusable, density_kg_m3)

    def usable_kg(self, density_kg_m3: float | None = None) -> float:
        return self.mass_of(self.capacity - self.unusable, density_kg_m3)

    def arms_at(self, quantity: float) -> tuple[float, float, float | None]:
        """Arms (x, y, z) in m of the contents at ``quantity`` (basis units).

        Linear between table rows; outside the table the end row's arms are used (the parser
        makes the table cover unusable … capacity, so this only happens beyond capacity).
        """
        rows = self.arm_table
        if not rows:
            return (self.x_m, self.y_m, self.z_m)
        if quantity <= rows[0].quantity:
            r = rows[0]
            return (r.x_m, r.y_m, r.z_m)
        for a, b in zip(rows, rows[1:]):
            if quantity <= b.quantity:
                f = (quantity - a.quantity) / (b.quantity - a.quantity)
                z = None if a.z_m is None else a.z_m + f * (b.z_m - a.z_m)
                return (a.x_m + f * (b.x_m - a.x_m), a.y_m + f * (b.y_m - a.y_m), z)
        r = rows[-1]
        return (r.x_m, r.y_m, r.z_m)


@dataclass(frozen=True)
class Envelope:
    """A CG envelope polygon. Limits are inclusive (a CG on an edge is in limits).

    ``points`` are (cg, mass_kg) pairs in file order: cg is an arm in m when
    ``coordinates == "arm"`` or a moment in kg·m when ``"moment"``; for ``axis == "lateral"``
    the arm is the lateral arm y.
    """

    name: str
    category: str
    axis: str
    coordinates: str
    points: tuple[tuple[float, float], ...]
    note: str = ""


@dataclass(frozen=True)
class ReactionPoint:
    """A point the vehicle rests on when weighed (wheel, jack pad, axle)."""

    name: str
    x_m: float
    y_m: float = 0.0


@dataclass(frozen=True)
class MeasuredInertia:
    """Measured empty-vehicle inertia about the empty CG, in body axes (x fwd, y right, z down).

    Products use the positive-product convention: ``ixz_kg_m2`` = Σ m·x·z (the tensor's
    off-diagonal term is its negative).
    """

    ixx_kg_m2: float
    iyy_kg_m2: float
    izz_kg_m2: float
    ixz_kg_m2: float = 0.0
    ixy_kg_m2: float = 0.0
    iyz_kg_m2: float = 0.0
    note: str = ""
    basis: str = field(default="measured", init=False)


@dataclass(frozen=True)
class GyrationInertia:
    """Nondimensional radii of gyration (Raymer §16.7): Ixx = b²·M·Rx²/4, Iyy = L²·M·Ry²/4,
    Izz = ((b+L)/2)²·M·Rz²/4, with b = ``span_m`` and L = ``length_m``."""

    rx: float
    ry: float
    rz: float
    span_m: float
    length_m: float
    note: str = ""
    basis: str = field(default="gyration", init=False)


@dataclass(frozen=True)
class Axle:
    """An axle of a ground vehicle; ``group`` is the axle group it belongs to, if any."""

    name: str
    x_m: float
    rating_kg: float
    track_m: float | None = None
    group: str | None = None


@dataclass(frozen=True)
class AxleGroup:
    """Axles that share load (a tandem); ``load_share`` sums to 1, in ``axles`` order."""

    name: str
    axles: tuple[str, ...]
    load_share: tuple[float, ...]
    rating_kg: float | None = None


@dataclass(frozen=True)
class Shape:
    """Shape of an item for its own inertia about its centroid.

    Dimensions used per kind: box ``length_m`` (along x), ``width_m`` (y), ``height_m`` (z);
    cylinder ``radius_m``, ``length_m``, ``axis``; hollow_cylinder ``radius_m``,
    ``inner_radius_m``, ``length_m``, ``axis``; disk ``radius_m``, ``axis``; rod ``length_m``,
    ``axis``; sphere ``radius_m``; point none. Unused dimensions are None.
    """

    kind: str
    length_m: float | None = None
    width_m: float | None = None
    height_m: float | None = None
    radius_m: float | None = None
    inner_radius_m: float | None = None
    axis: str | None = None


@dataclass(frozen=True)
class ConfigItem:
    """A removable item: its mass, arms and optional shape."""

    name: str
    mass_kg: float
    x_m: float
    y_m: float = 0.0
    z_m: float | None = None
    shape: Shape | None = None


@dataclass(frozen=True)
class Configuration:
    """A named group of items installed or removed together.

    ``action == "install"``: the items are added to the empty vehicle when the configuration is
    chosen. ``"remove"``: the items are part of the vehicle as weighed and are taken out.
    ``disables_stations`` are stations that cannot be loaded in this configuration.
    """

    name: str
    action: str
    description: str
    items: tuple[ConfigItem, ...] = ()
    disables_stations: tuple[str, ...] = ()

    @property
    def mass_change_kg(self) -> float:
        """Signed change of empty mass when the configuration is chosen."""
        total = math.fsum(i.mass_kg for i in self.items)
        return total if self.action == "install" else -total


@dataclass(frozen=True)
class Tolerances:
    """Tolerances for loading sheets and for empty-weight drift since the last weighing.

    ``last_minute_*``: a finished loading sheet may be amended by at most this much mass and
    this many persons; beyond, a new sheet is needed (0 = any change needs a new sheet).
    ``reweigh_*``: recorded changes since the last weighing beyond any of these suggest a new
    weighing; None = not checked. The mass percentage is of
    :attr:`VehicleType.reference_mass_kg`.
    """

    last_minute_mass_kg: float = 0.0
    last_minute_persons: int = 0
    reweigh_mass_percent: float | None = None
    reweigh_cg_percent_mac: float | None = None
    reweigh_cg_shift_m: float | None = None


@dataclass(frozen=True)
class VehicleType:
    """One vehicle type, as parsed from a type file. See ``demo_fleet/FORMAT.md``."""

    name: str
    title: str
    kind: str
    units: DisplayUnits
    datum: str
    limits: WeightLimits
    note: str = ""
    mac: Mac | None = None
    stations: tuple[Station, ...] = ()
    tanks: tuple[Tank, ...] = ()
    envelopes: tuple[Envelope, ...] = ()
    reaction_points: tuple[ReactionPoint, ...] = ()
    inertia: MeasuredInertia | GyrationInertia | None = None
    axles: tuple[Axle, ...] = ()
    axle_groups: tuple[AxleGroup, ...] = ()
    configurations: tuple[Configuration, ...] = ()
    tolerances: Tolerances = Tolerances()
    mass_sets: tuple[StandardMassSet, ...] = ()

    # --- lookups ---------------------------------------------------------------------------
    @property
    def is_aircraft(self) -> bool:
        return self.kind in AIRCRAFT_KINDS

    @property
    def reference_mass_kg(self) -> float:
        """Mass the reweigh percentage refers to: maximum landing mass, else maximum take-off
        mass, else the gross vehicle rating."""
        lim = self.limits
        for v in (lim.max_landing_kg, lim.max_takeoff_kg, lim.gross_rating_kg):
            if v is not None:
                return v
        raise ValueError(f"type {self.name} has no mass limit")  # the parser prevents this

    def _find(self, kind: str, items, name: str):
        for it in items:
            if it.name == name:
                return it
        folded = [it for it in items if it.name.casefold() == name.casefold()]
        if len(folded) == 1:
            return folded[0]
        known = ", ".join(it.name for it in items) or "none"
        raise NotFoundError(kind, name, f"{kind}s of type {self.name}: {known}")

    def station(self, name: str) -> Station:
        """The station called ``name`` (exact, else case-insensitive); NotFoundError if none."""
        return self._find("station", self.stations, name)

    def tank(self, name: str) -> Tank:
        return self._find("tank", self.tanks, name)

    def envelope(self, name: str) -> Envelope:
        return self._find("envelope", self.envelopes, name)

    def axle(self, name: str) -> Axle:
        return self._find("axle", self.axles, name)

    def configuration(self, name: str) -> Configuration:
        return self._find("configuration", self.configurations, name)

    def reaction_point(self, name: str) -> ReactionPoint:
        return self._find("reaction point", self.reaction_points, name)

    def envelopes_for(self, axis: str = "longitudinal",
                      category: str | None = None) -> tuple[Envelope, ...]:
        """Envelopes of one axis, optionally of one category, in file order."""
        return tuple(e for e in self.envelopes
                     if e.axis == axis and (category is None or e.category == category))

    def mass_set(self, name: str) -> StandardMassSet:
        """A standard mass set: the type's own first, then the built-in ones."""
        for s in self.mass_sets:
            if s.name == name:
                return s
        if name in STANDARD_MASS_SETS:
            return STANDARD_MASS_SETS[name]
        known = ", ".join([s.name for s in self.mass_sets] + list(STANDARD_MASS_SETS))
        raise NotFoundError("standard mass set", name, f"available: {known}")

    def weighing_points(self) -> tuple[ReactionPoint, ...]:
        """Reaction points for a weighing; a ground vehicle without any uses one per axle."""
        if self.reaction_points:
            return self.reaction_points
        return tuple(ReactionPoint(a.name, a.x_m, 0.0) for a in self.axles)

    # --- canonical form --------------------------------------------------------------------
    def to_dict(self) -> dict:
        """JSON-able canonical dict, SI values, keys named with their units.

        ``VehicleType.from_dict(t.to_dict()) == t``, also after a JSON round trip.
        """
        d = _to_jsonable(self)
        return {"canonical_version": CANONICAL_VERSION, **d}

    @classmethod
    def from_dict(cls, data: dict) -> VehicleType:
        """Rebuild a type from :meth:`to_dict` output (e.g. the JSON a store saved)."""
        if not isinstance(data, dict):
            raise TypeDataError("stored type", type(data).__name__, "expected a dict")
        version = data.get("canonical_version")
        if version != CANONICAL_VERSION:
            raise TypeDataError("stored type.canonical_version", version,
                                f"expected {CANONICAL_VERSION}; this wbledger cannot read it")
        body = {k: v for k, v in data.items() if k != "canonical_version"}
        return _from_jsonable(cls, body, "stored type")

    def canonical_json(self) -> str:
        """The canonical dict as compact JSON with sorted keys (what the hash covers)."""
        return json.dumps(self.to_dict(), sort_keys=True, separators=(",", ":"),
                          ensure_ascii=False, allow_nan=False)

    def content_hash(self) -> str:
        """SHA-256 (hex) of :meth:`canonical_json`: equal for equal content, whatever the
        file's layout, comments, key order or unit spellings."""
        return hashlib.sha256(self.canonical_json().encode("utf-8")).hexdigest()


# --- generic conversion to and from the canonical dict ------------------------------------

def _to_jsonable(obj):
    if isinstance(obj, DisplayUnits):
        return obj.to_dict()
    if dataclasses.is_dataclass(obj):
        return {f.name: _to_jsonable(getattr(obj, f.name)) for f in dataclasses.fields(obj)}
    if isinstance(obj, (tuple, list)):
        return [_to_jsonable(v) for v in obj]
    if isinstance(obj, float):
        if not math.isfinite(obj):
            raise ValueError("non-finite value in a vehicle type")
        return obj
    if obj is None or isinstance(obj, (str, int)):
        return obj
    raise TypeError(f"cannot convert {type(obj).__name__}")


_HINTS: dict[type, dict] = {}


def _hints(cls) -> dict:
    if cls not in _HINTS:
        _HINTS[cls] = typing.get_type_hints(cls)
    return _HINTS[cls]


class _Missing:
    def __str__(self) -> str:
        return "(missing)"


def _bad(where: str, value, what: str):
    if not isinstance(value, (str, int, float, _Missing)) or isinstance(value, bool):
        value = type(value).__name__
    return TypeDataError(where, value, f"expected {what} in the stored type")


def _from_jsonable(tp, value, where: str):
    origin = typing.get_origin(tp)
    if origin in (typing.Union, types.UnionType):
        args = typing.get_args(tp)
        if value is None:
            if type(None) in args:
                return None
            raise _bad(where, value, "a value")
        choices = [a for a in args if a is not type(None)]
        if len(choices) == 1:
            return _from_jsonable(choices[0], value, where)
        # a union of dataclasses told apart by their "basis" field
        if isinstance(value, dict):
            for c in choices:
                f = {x.name: x for x in dataclasses.fields(c)}.get("basis")
                if f is not None and f.default == value.get("basis"):
                    return _from_jsonable(c, value, where)
        raise _bad(where, value, "one of " + ", ".join(c.__name__ for c in choices))
    if origin is tuple:
        args = typing.get_args(tp)
        if not isinstance(value, (list, tuple)):
            raise _bad(where, value, "a list")
        if len(args) == 2 and args[1] is Ellipsis:
            return tuple(_from_jsonable(args[0], v, f"{where}[{i}]") for i, v in enumerate(value))
        if len(args) != len(value):
            raise _bad(where, value, f"a list of {len(args)}")
        return tuple(_from_jsonable(a, v, f"{where}[{i}]")
                     for i, (a, v) in enumerate(zip(args, value)))
    if tp is DisplayUnits:
        if not isinstance(value, dict) or set(value) != {"mass", "length", "volume",
                                                         "moment_divisor"}:
            raise _bad(where, value, "display units")
        return DisplayUnits.from_dict(value)
    if dataclasses.is_dataclass(tp):
        if not isinstance(value, dict):
            raise _bad(where, value, f"a {tp.__name__} dict")
        hints = _hints(tp)
        fields = dataclasses.fields(tp)
        names = {f.name for f in fields}
        extra = set(value) - names
        if extra:
            raise _bad(f"{where}.{sorted(extra)[0]}", value[sorted(extra)[0]], "no such key")
        kwargs = {}
        for f in fields:
            if f.name not in value:
                if f.default is dataclasses.MISSING and f.default_factory is dataclasses.MISSING:
                    raise _bad(f"{where}.{f.name}", _Missing(), "a value")
                continue
            v = _from_jsonable(hints[f.name], value[f.name], f"{where}.{f.name}")
            if not f.init:
                if v != f.default:
                    raise _bad(f"{where}.{f.name}", v, repr(f.default))
                continue
            kwargs[f.name] = v
        return tp(**kwargs)
    if tp is float:
        if isinstance(value, bool) or not isinstance(value, (int, float)) \
                or not math.isfinite(value):
            raise _bad(where, value, "a finite number")
        return float(value)
    if tp is int:
        if isinstance(value, bool) or not isinstance(value, int):
            raise _bad(where, value, "an integer")
        return value
    if tp is bool:
        if not isinstance(value, bool):
            raise _bad(where, value, "true or false")
        return value
    if tp is str:
        if not isinstance(value, str):
            raise _bad(where, value, "a string")
        return value
    raise TypeError(f"unsupported type {tp!r}")  # a programming error in this module
