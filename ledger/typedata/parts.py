"""The parts of a parsed vehicle type: limits, stations, tanks, envelopes, axles, inertia,
configurations and tolerances (frozen dataclasses, SI; see :mod:`ledger.typedata.model`)."""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from ledger.typedata.vocabulary import FLUIDS, SEAT_KINDS

__all__ = [
    "Mac",
    "WeightLimits",
    "Extent",
    "Station",
    "TankArmPoint",
    "Tank",
    "Envelope",
    "ReactionPoint",
    "MeasuredInertia",
    "GyrationInertia",
    "Axle",
    "AxleGroup",
    "Shape",
    "ConfigItem",
    "Configuration",
    "Tolerances",
]


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


