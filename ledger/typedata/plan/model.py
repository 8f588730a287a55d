"""The parsed plan: people, cargo and fuel per tank, in SI, checked against the type."""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import asdict, dataclass, replace
from typing import Any

PLAN_FORMAT = 1
"""The ``plan_format`` this parser reads."""

ACTUAL = "actual"
"""``standard_masses`` value for a plan that gives every person's actual mass."""

BURN_PROPORTIONAL = "proportional"
BURN_TANK_ORDER = "tank order"


# --- the parsed plan --------------------------------------------------------------------------

@dataclass(frozen=True)
class Person:
    """A person in a seat. ``mass_source`` is ``"actual"`` or ``"standard"``."""

    seat: str
    mass_kg: float
    name: str = ""
    mass_source: str = ACTUAL
    occupant_class: str | None = None


@dataclass(frozen=True)
class CargoLoad:
    """Cargo, equipment or ballast placed at a (non-seat) station.

    ``x_m`` is the arm of this load's CG when the plan places it within the station's
    fore-and-aft extent (a compartment or load area with an ``x_range``); None means the
    station's own arm.
    """

    station: str
    mass_kg: float
    what: str = ""
    x_m: float | None = None


@dataclass(frozen=True)
class TankLoad:
    """Usable fuel (or other fluid) loaded in a tank, above its unusable quantity.

    ``density_source`` is ``"given"`` (the plan), ``"type"`` (the type file's density),
    ``"nominal"`` (the standard density of the fluid) or ``"temperature"`` (table 54B from the
    fuel temperature and the density at 15 °C).
    """

    tank: str
    mass_kg: float
    volume_m3: float
    density_kg_m3: float
    density_source: str
    temperature_c: float | None = None
    density_15c_kg_m3: float | None = None


@dataclass(frozen=True)
class Plan:
    """A loading plan checked against its type, every figure in SI.

    ``burn_order`` lists the tanks drained one after the other when ``burn_sequence`` is
    ``"tank order"``, and the feeding tanks (all fuel tanks with fuel) when it is
    ``"proportional"``. Taxi fuel is burned first, then trip fuel, in the same sequence.
    """

    vehicle: str
    persons: tuple[Person, ...] = ()
    cargo: tuple[CargoLoad, ...] = ()
    tanks: tuple[TankLoad, ...] = ()
    taxi_fuel_kg: float = 0.0
    trip_fuel_kg: float = 0.0
    burn_sequence: str = BURN_PROPORTIONAL
    burn_order: tuple[str, ...] = ()
    configuration: str | None = None
    category: str | None = None
    standard_masses: str = ACTUAL
    prepared_by: str | None = None
    axle_rules: str | None = None
    note: str = ""
    source: str = ""

    # --- totals ----------------------------------------------------------------------------
    @property
    def fuel_kg(self) -> float:
        """All usable fuel loaded (kg)."""
        return math.fsum(t.mass_kg for t in self.tanks)

    @property
    def person_count(self) -> int:
        return len(self.persons)

    def station_mass_kg(self, station: str) -> float:
        """Everything the plan puts at ``station`` (people and cargo), kg."""
        return math.fsum([p.mass_kg for p in self.persons if p.seat == station]
                         + [c.mass_kg for c in self.cargo if c.station == station])

    def tank_load(self, tank: str) -> TankLoad | None:
        for t in self.tanks:
            if t.tank == tank:
                return t
        return None

    # --- changes (used to try fixes) -------------------------------------------------------
    def with_cargo(self, station: str, delta_kg: float, what: str = "",
                   x_m: float | None = None) -> Plan:
        """A copy with ``delta_kg`` more (or, negative, less) cargo at ``station``.

        Removal takes from the last entries at that station first; it cannot remove more than
        is there.
        """
        if delta_kg >= 0:
            return replace(self, cargo=self.cargo + (CargoLoad(station, delta_kg, what, x_m),))
        need = -delta_kg
        kept: list[CargoLoad] = []
        for c in reversed(self.cargo):
            if c.station == station and need > 0:
                take = min(c.mass_kg, need)
                need -= take
                if c.mass_kg - take > 0:
                    kept.append(replace(c, mass_kg=c.mass_kg - take))
                continue
            kept.append(c)
        if need > 1e-9:
            raise ValueError(f"cannot remove {-delta_kg} kg from {station!r}")
        return replace(self, cargo=tuple(reversed(kept)))

    def with_cargo_moved(self, station: str, distance_m: float, default_x_m: float) -> Plan:
        """A copy with every load at ``station`` moved ``distance_m`` aft (negative: forward)
        within the station; a load without its own arm starts from ``default_x_m``."""
        out = []
        for c in self.cargo:
            if c.station == station:
                c = replace(c, x_m=(default_x_m if c.x_m is None else c.x_m) + distance_m)
            out.append(c)
        return replace(self, cargo=tuple(out))

    def with_tank_mass(self, tank: str, mass_kg: float) -> Plan:
        """A copy with ``mass_kg`` of usable fuel in ``tank`` (same density)."""
        out = []
        for t in self.tanks:
            if t.tank == tank:
                t = replace(t, mass_kg=mass_kg, volume_m3=mass_kg / t.density_kg_m3)
            out.append(t)
        return replace(self, tanks=tuple(out))

    # --- canonical form --------------------------------------------------------------------
    def to_dict(self) -> dict:
        """JSON-able dict (SI, keys with units); :meth:`from_dict` reads it back."""
        return asdict(self)

    @classmethod
    def from_dict(cls, data: Mapping[str, Any]) -> Plan:
        d = dict(data)
        d["persons"] = tuple(Person(**p) for p in d.get("persons", ()))
        d["cargo"] = tuple(CargoLoad(**c) for c in d.get("cargo", ()))
        d["tanks"] = tuple(TankLoad(**t) for t in d.get("tanks", ()))
        d["burn_order"] = tuple(d.get("burn_order", ()))
        return cls(**d)

