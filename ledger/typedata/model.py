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

import hashlib
import json
from dataclasses import dataclass

from ledger.errors import NotFoundError, TypeDataError
from ledger.typedata._canonical import _from_jsonable, _to_jsonable
from ledger.typedata.parts import (
    Axle,
    AxleGroup,
    ConfigItem,
    Configuration,
    Envelope,
    Extent,
    GyrationInertia,
    Mac,
    MeasuredInertia,
    ReactionPoint,
    Shape,
    Station,
    Tank,
    TankArmPoint,
    Tolerances,
    WeightLimits,
)
from ledger.typedata.vocabulary import (
    AIRCRAFT_KINDS,
    CANONICAL_VERSION,
    CONFIGURATION_ACTIONS,
    ENVELOPE_AXES,
    ENVELOPE_CATEGORIES,
    ENVELOPE_COORDINATES,
    FLUIDS,
    OCCUPANT_CLASSES,
    SEAT_KINDS,
    SHAPE_AXES,
    SHAPE_DIMENSIONS,
    SHAPE_KINDS,
    STANDARD_MASS_SETS,
    STATION_KINDS,
    VEHICLE_KINDS,
    Fluid,
    StandardMassSet,
)
from ledger.units import DisplayUnits

__all__ = [
    "AIRCRAFT_KINDS",
    "CANONICAL_VERSION",
    "CONFIGURATION_ACTIONS",
    "ENVELOPE_AXES",
    "ENVELOPE_CATEGORIES",
    "ENVELOPE_COORDINATES",
    "FLUIDS",
    "OCCUPANT_CLASSES",
    "SEAT_KINDS",
    "SHAPE_AXES",
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

