"""Read vehicle type files (TOML) into a validated :class:`~ledger.typedata.model.VehicleType`.

The format is described key by key in ``demo_fleet/FORMAT.md``. Every problem is reported as
one line naming the file, the field (a dotted path such as ``station['pilot'].max_mass``), the
value as written and what would be accepted: :class:`~ledger.errors.TypeDataError`,
:class:`~ledger.errors.UnitError` or :class:`~ledger.errors.EnvelopeError`, each located with
``.with_source(file)``.

Importing this module loads neither numpy nor the core: envelope polygons are checked by
:func:`ledger.core.envelope.validate_polygon`, imported when a file is parsed.
"""

from __future__ import annotations

import difflib
import math
import os
import re
import tomllib

from ledger import units as U
from ledger.bounds import SOURCE_NAME_MAX, load_toml, shown
from ledger.errors import InputError, TypeDataError
from ledger.files import INPUT_LIMIT, read_input_text
from ledger.typedata.model import (
    AIRCRAFT_KINDS,
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
    StandardMassSet,
    Station,
    Tank,
    TankArmPoint,
    Tolerances,
    VehicleType,
    WeightLimits,
)

__all__ = ["FORMAT_VERSION", "load_type_file", "parse_type", "parse_type_text", "read_type_file"]

FORMAT_VERSION = 1
"""The ``format_version`` this parser reads."""

_TYPE_NAME_RE = re.compile(r"^[A-Za-z0-9][A-Za-z0-9._-]{0,39}\Z")
_TYPE_NAME_RULE = "expected 1-40 letters, digits, '.', '_' or '-', starting with a letter or digit"
_NAME_MAX = 60

_TOP_KEYS = ("format_version", "vehicle", "units", "datum", "mac", "limits", "station", "tank",
             "envelope", "reaction_point", "inertia", "axle", "axle_group", "configuration",
             "tolerances", "mass_set")
_VEHICLE_KEYS = ("name", "title", "kind", "note")
_UNITS_KEYS = ("mass", "length", "volume", "moment_divisor")
_DATUM_KEYS = ("description",)
_MAC_KEYS = ("lemac", "length")
_AIR_LIMITS = ("max_ramp", "max_takeoff", "max_landing", "max_zero_fuel", "min_flight")
_LIMIT_KEYS = _AIR_LIMITS + ("gross_rating",)
_STATION_KEYS = ("name", "kind", "x", "y", "z", "max_mass", "persons", "occupant", "x_range",
                 "floor_area", "floor_load_limit", "note")
_TANK_KEYS = ("name", "fluid", "capacity", "unusable", "density", "x", "y", "z", "arm_table",
              "note")
_ARM_ROW_KEYS = ("quantity", "x", "y", "z")
_ENVELOPE_KEYS = ("name", "category", "axis", "coordinates", "points", "note")
_REACTION_KEYS = ("name", "x", "y")
_INERTIA_KEYS = {
    "measured": ("basis", "ixx", "iyy", "izz", "ixz", "ixy", "iyz", "note"),
    "gyration": ("basis", "rx", "ry", "rz", "span", "length", "note"),
}
_AXLE_KEYS = ("name", "x", "rating", "track")
_AXLE_GROUP_KEYS = ("name", "axles", "load_share", "rating")
_TOLERANCE_KEYS = ("last_minute_mass", "last_minute_persons", "reweigh_mass_percent",
                   "reweigh_cg_percent_mac", "reweigh_cg_shift")
_CONFIG_KEYS = ("name", "action", "description", "disables_stations", "item")
_ITEM_KEYS = ("name", "mass", "x", "y", "z", "shape")
_MASS_SET_KEYS = ("name", "description", "source") + OCCUPANT_CLASSES


class _Shown:
    """A value shown in an error message as written here (no quotes)."""

    def __init__(self, text: str) -> None:
        self.text = text

    def __str__(self) -> str:
        return self.text


_MISSING = _Shown("(missing)")


def _show(value):
    """A value as an error message shows it: scalars as they are, containers abridged."""
    if isinstance(value, _Shown):
        return value
    if isinstance(value, bool):
        return _Shown("true" if value else "false")
    if isinstance(value, (str, int, float)):
        return value
    text = repr(value)
    return _Shown(text if len(text) <= 60 else text[:57] + "...")


def _typename(value) -> str:
    if isinstance(value, bool):
        return "a boolean"
    if isinstance(value, str):
        return "a string"
    if isinstance(value, int):
        return "an integer"
    if isinstance(value, float):
        return "a number"
    if isinstance(value, dict):
        return "a table"
    if isinstance(value, list):
        return "an array"
    return "a date/time"


def _err(field: str, value, allowed: str, hint: str | None = None) -> TypeDataError:
    return TypeDataError(field, _show(value), allowed, hint=hint)


def _disp(value_si: float, unit: str) -> str:
    """A figure in a display unit for a message: '2450 lb', '1156.66 kg'."""
    v = round(U.to_unit(value_si, unit), 6) + 0.0
    return f"{v:.10g} {unit}"


def _listing(words) -> str:
    return ", ".join(words)


def _a(word: str) -> str:
    """'an airplane', 'a helicopter'."""
    return f"an {word}" if word[:1] in "aeiou" else f"a {word}"


class _Table:
    """A TOML table being read: its dotted path, and typo protection on its keys."""

    def __init__(self, data: dict, path: str, allowed: tuple[str, ...]) -> None:
        self.data = data
        self.path = path
        for key, value in data.items():
            if key not in allowed:
                close = difflib.get_close_matches(key, allowed, n=1, cutoff=0.6)
                raise _err(self.field(key), value,
                           f"unknown key; allowed here: {_listing(allowed)}",
                           hint=f"Did you mean '{close[0]}'?" if close else None)

    def field(self, key: str) -> str:
        return f"{self.path}.{key}" if self.path else key

    def has(self, key: str) -> bool:
        return key in self.data

    def get(self, key: str, default=None):
        return self.data.get(key, default)

    def require(self, key: str, what: str):
        if key not in self.data:
            raise TypeDataError(self.field(key), _MISSING, f"required: {what}")
        return self.data[key]

    def sub(self, key: str, allowed: tuple[str, ...], *, required: bool = False,
            what: str | None = None) -> _Table | None:
        if key not in self.data:
            if required:
                raise TypeDataError(self.field(key), _MISSING,
                                    f"required: {what or f'a table [{self.field(key)}]'}")
            return None
        value = self.data[key]
        if not isinstance(value, dict):
            raise _err(self.field(key), value,
                       f"expected a table [{self.field(key)}], got {_typename(value)}")
        return _Table(value, self.field(key), allowed)

    def string(self, key: str, *, required: bool = False, what: str = "a string",
               default: str | None = None, choices: tuple[str, ...] | None = None) -> str | None:
        if key not in self.data:
            if required:
                raise TypeDataError(self.field(key), _MISSING, f"required: {what}")
            return default
        value = self.data[key]
        if not isinstance(value, str):
            raise _err(self.field(key), value, f"expected {what}, got {_typename(value)}")
        if choices is not None and value not in choices:
            close = difflib.get_close_matches(value, choices, n=1, cutoff=0.6)
            raise _err(self.field(key), value, f"expected one of {_listing(choices)}",
                       hint=f"Did you mean '{close[0]}'?" if close else None)
        return value

    def name(self, key: str = "name", *, what: str = "a name") -> str:
        value = self.string(key, required=True, what=what)
        if not value or value != value.strip() or len(value) > _NAME_MAX:
            raise _err(self.field(key), value, f"expected a name of 1-{_NAME_MAX} characters "
                       "without leading or trailing spaces")
        return value

    def number(self, key: str, *, required: bool = False, what: str = "a number",
               default: float | None = None, minimum: float | None = None,
               above: float | None = None, below: float | None = None) -> float | None:
        if key not in self.data:
            if required:
                raise TypeDataError(self.field(key), _MISSING, f"required: {what}")
            return default
        value = self.data[key]
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise _err(self.field(key), value, f"expected {what}, got {_typename(value)}")
        if not math.isfinite(value):
            raise _err(self.field(key), value, f"expected {what} (finite)")
        value = float(value)
        if (minimum is not None and value < minimum) or (above is not None and value <= above) \
                or (below is not None and value >= below):
            raise _err(self.field(key), self.data[key], f"expected {what}")
        return value

    def integer(self, key: str, *, default: int, minimum: int, what: str) -> int:
        if key not in self.data:
            return default
        value = self.data[key]
        if isinstance(value, bool) or not isinstance(value, int) or value < minimum:
            raise _err(self.field(key), value, f"expected {what}")
        return value

    def array(self, key: str, *, what: str, required: bool = False) -> list | None:
        if key not in self.data:
            if required:
                raise TypeDataError(self.field(key), _MISSING, f"required: {what}")
            return None
        value = self.data[key]
        if not isinstance(value, list):
            raise _err(self.field(key), value, f"expected {what}, got {_typename(value)}")
        return value


def _tables(data: dict, key: str, path: str | None = None) -> list[dict]:
    """An array of tables (``[[key]]``); [] if absent."""
    where = path or key
    value = data.get(key, [])
    if not isinstance(value, list) or not all(isinstance(v, dict) for v in value):
        got = _typename(value) if not isinstance(value, list) else "an array of other values"
        raise _err(where, value, f"expected an array of tables [[{where}]], got {got}")
    return value


def _named_path(base: str, index: int, raw: dict) -> str:
    """``station['pilot']`` when the entry has a usable name, else ``station[3]``."""
    name = raw.get("name")
    if isinstance(name, str) and name and name == name.strip() and len(name) <= _NAME_MAX:
        return f"{base}[{name!r}]"
    return f"{base}[{index}]"


class _Reader:
    def __init__(self, data: dict) -> None:
        self.data = data
        self.units: U.DisplayUnits | None = None
        self.kind = ""

    # --- quantities ---------------------------------------------------------------------------
    def _qty(self, tbl: _Table, key: str, dimension: str, default_unit: str | None, *,
             required: bool = False, what: str, minimum: float | None = None,
             positive: bool = False, value=None, field: str | None = None) -> float | None:
        if value is None:
            if not tbl.has(key):
                if required:
                    raise TypeDataError(tbl.field(key), _MISSING, f"required: {what}")
                return None
            value = tbl.get(key)
        f = field or tbl.field(key)
        if isinstance(value, (bool, list, dict)) or not isinstance(value, (int, float, str)):
            raise _err(f, value, f"expected {what}: a number or a string such as "
                       f"'{U.EXAMPLES[dimension]}', got {_typename(value)}")
        q = U.parse_quantity(value, dimension, default_unit, field=f)
        if positive and q <= 0:
            raise _err(f, value, f"expected {what} greater than 0")
        if minimum is not None and q < minimum:
            raise _err(f, value, f"expected {what} of 0 or more")
        return q

    def mass(self, tbl, key, *, required=False, positive=False, nonnegative=True,
             what="a mass", value=None, field=None):
        return self._qty(tbl, key, "mass", self.units.mass, required=required, what=what,
                         positive=positive, minimum=0.0 if nonnegative else None,
                         value=value, field=field)

    def length(self, tbl, key, *, required=False, positive=False, what="a length",
               value=None, field=None):
        return self._qty(tbl, key, "length", self.units.length, required=required, what=what,
                         positive=positive, value=value, field=field)

    # --- sections -----------------------------------------------------------------------------
    def parse(self) -> VehicleType:
        top = _Table(self.data, "", _TOP_KEYS)
        version = top.require("format_version", f"format_version = {FORMAT_VERSION} at the top "
                              "of the file")
        if isinstance(version, bool) or version != FORMAT_VERSION:
            raise _err("format_version", version, f"expected {FORMAT_VERSION}; this wbledger "
                       f"reads format_version {FORMAT_VERSION}")

        veh = top.sub("vehicle", _VEHICLE_KEYS, required=True,
                      what="a [vehicle] table with name, title and kind")
        name = veh.string("name", required=True, what="a type name, e.g. \"KV-P4\"")
        if not _TYPE_NAME_RE.match(name):
            raise _err("vehicle.name", name, _TYPE_NAME_RULE)
        title = veh.string("title", required=True, what="a title (one line)")
        self.kind = veh.string("kind", required=True, what=f"one of {_listing(VEHICLE_KINDS)}",
                               choices=VEHICLE_KINDS)
        note = veh.string("note", default="")

        self.units = self._units(top)
        datum_t = top.sub("datum", _DATUM_KEYS, required=True,
                          what="a [datum] table with a description of the datum")
        datum = datum_t.string("description", required=True,
                               what="a description of the datum (where x = 0 is)")
        mac = self._mac(top)
        limits = self._limits(top)
        stations = self._stations()
        tanks = self._tanks()
        self._unique_names("station", stations, "tank", tanks)
        envelopes = self._envelopes()
        reaction_points = self._reaction_points()
        inertia = self._inertia(top)
        axles, groups = self._axles()
        configurations = self._configurations(stations)
        tolerances = self._tolerances(top, mac)
        mass_sets = self._mass_sets()
        return VehicleType(
            name=name, title=title, kind=self.kind, units=self.units, datum=datum,
            limits=limits, note=note, mac=mac, stations=tuple(stations), tanks=tuple(tanks),
            envelopes=tuple(envelopes), reaction_points=tuple(reaction_points), inertia=inertia,
            axles=tuple(axles), axle_groups=tuple(groups),
            configurations=tuple(configurations), tolerances=tolerances,
            mass_sets=tuple(mass_sets))

    def _units(self, top: _Table) -> U.DisplayUnits:
        t = top.sub("units", _UNITS_KEYS, required=True,
                    what="a [units] table with the display mass and length units")
        mass = t.string("mass", required=True, what=f"a mass unit ({U.describe_units('mass')})")
        length = t.string("length", required=True,
                          what=f"a length unit ({U.describe_units('length')})")
        has_tanks = bool(self.data.get("tank"))
        volume = t.string("volume", required=has_tanks,
                          what=f"a volume unit ({U.describe_units('volume')}) when there are tanks",
                          default="L")
        divisor = t.get("moment_divisor", 1.0)
        return U.DisplayUnits(mass, length, volume, divisor)

    def _mac(self, top: _Table) -> Mac | None:
        t = top.sub("mac", _MAC_KEYS)
        if t is None:
            return None
        lemac = self.length(t, "lemac", required=True, what="the arm of the MAC leading edge")
        length = self.length(t, "length", required=True, positive=True,
                             what="the MAC length")
        return Mac(lemac, length)

    def _limits(self, top: _Table) -> WeightLimits:
        aircraft = self.kind in AIRCRAFT_KINDS
        t = top.sub("limits", _LIMIT_KEYS, required=True, what="a [limits] table (max_takeoff "
                    "for aircraft, gross_rating for ground vehicles)")
        if aircraft and t.has("gross_rating"):
            raise _err("limits.gross_rating", t.get("gross_rating"),
                       f"allowed only for kind ground_vehicle; {_a(self.kind)} uses "
                       f"{_listing(_AIR_LIMITS)}")
        if not aircraft:
            for k in _AIR_LIMITS:
                if t.has(k):
                    raise _err(f"limits.{k}", t.get(k), "not for a ground vehicle; use "
                               "gross_rating and the axle ratings")
        v = {k: self.mass(t, k, positive=True, what="a mass") for k in _LIMIT_KEYS}
        if aircraft and v["max_takeoff"] is None:
            raise TypeDataError("limits.max_takeoff", _MISSING,
                                f"required: the maximum take-off mass of {_a(self.kind)}")
        if not aircraft and v["gross_rating"] is None:
            raise TypeDataError("limits.gross_rating", _MISSING,
                                "required: the gross vehicle mass rating")
        mu = self.units.mass

        def at_most(key, other):
            if v[key] is not None and v[other] is not None and v[key] > v[other]:
                raise _err(f"limits.{key}", t.get(key),
                           f"expected at most {other} ({_disp(v[other], mu)})")

        at_most("max_takeoff", "max_ramp")
        at_most("max_landing", "max_takeoff")
        at_most("max_zero_fuel", "max_takeoff")
        if v["min_flight"] is not None and v["min_flight"] >= v["max_takeoff"]:
            raise _err("limits.min_flight", t.get("min_flight"),
                       f"expected less than max_takeoff ({_disp(v['max_takeoff'], mu)})")
        return WeightLimits(max_ramp_kg=v["max_ramp"], max_takeoff_kg=v["max_takeoff"],
                            max_landing_kg=v["max_landing"], max_zero_fuel_kg=v["max_zero_fuel"],
                            min_flight_kg=v["min_flight"], gross_rating_kg=v["gross_rating"])

    def _stations(self) -> list[Station]:
        out = []
        for i, raw in enumerate(_tables(self.data, "station")):
            path = _named_path("station", i, raw)
            t = _Table(raw, path, _STATION_KEYS)
            name = t.name()
            kind = t.string("kind", required=True, what=f"one of {_listing(STATION_KINDS)}",
                            choices=STATION_KINDS)
            x = self.length(t, "x", required=True, what="the arm x")
            y = self.length(t, "y") or 0.0
            z = self.length(t, "z")
            max_mass = self.mass(t, "max_mass", positive=True,
                                 what=f"the maximum mass of {_a(kind)} station",
                                 required=kind in ("cargo", "ballast"))
            seat = kind in SEAT_KINDS
            for key in ("persons", "occupant"):
                if t.has(key) and not seat:
                    raise _err(t.field(key), t.get(key), "allowed only on crew and passenger "
                               "stations")
            for key in ("x_range", "floor_area", "floor_load_limit"):
                if t.has(key) and kind != "cargo":
                    raise _err(t.field(key), t.get(key), "allowed only on cargo stations")
            persons = t.integer("persons", default=1 if seat else 0, minimum=1,
                                what="a whole number of persons, 1 or more")
            occupant = None
            if seat:
                occupant = t.string("occupant", choices=OCCUPANT_CLASSES,
                                    what=f"one of {_listing(OCCUPANT_CLASSES)}",
                                    default="flight_crew" if kind == "crew" else "adult")
            extent = self._extent(t, x) if kind == "cargo" else None
            out.append(Station(name=name, kind=kind, x_m=x, y_m=y, z_m=z,
                               max_mass_kg=max_mass, persons=persons, occupant_class=occupant,
                               extent=extent, note=t.string("note", default="")))
        return out

    def _extent(self, t: _Table, x: float) -> Extent | None:
        rng = t.array("x_range", what="[forward, aft] arms")
        area = self._qty(t, "floor_area", "area", None, positive=True, what="an area")
        limit = self._qty(t, "floor_load_limit", "area_density", None, positive=True,
                          what="a mass per area")
        if limit is not None and area is None:
            raise _err(t.field("floor_load_limit"), t.get("floor_load_limit"),
                       f"needs {t.field('floor_area')}, the loaded floor area")
        if rng is None:
            if area is not None:
                raise _err(t.field("floor_area"), t.get("floor_area"),
                           f"needs {t.field('x_range')}, the compartment's [forward, aft] arms")
            return None
        if len(rng) != 2:
            raise _err(t.field("x_range"), rng, "expected [forward, aft]: two arms")
        fwd = self.length(t, "", value=rng[0], field=f"{t.field('x_range')}[0]")
        aft = self.length(t, "", value=rng[1], field=f"{t.field('x_range')}[1]")
        if aft <= fwd:
            raise _err(f"{t.field('x_range')}[1]", rng[1],
                       f"expected an arm aft of the forward end ({_disp(fwd, self.units.length)})")
        if not fwd <= x <= aft:
            raise _err(t.field("x"), t.get("x"), f"expected an arm within x_range "
                       f"({_disp(fwd, self.units.length)} to {_disp(aft, self.units.length)})")
        return Extent(fwd, aft, area, limit)

    def _tanks(self) -> list[Tank]:
        out = []
        du = self.units
        for i, raw in enumerate(_tables(self.data, "tank")):
            path = _named_path("tank", i, raw)
            t = _Table(raw, path, _TANK_KEYS)
            name = t.name()
            fluid = t.string("fluid", required=True, what=f"one of {_listing(FLUIDS)}",
                             choices=tuple(FLUIDS))
            cap_raw = t.require("capacity", "the tank capacity, a volume or a mass")
            capacity, dim = U.parse_quantity_of(cap_raw, ("volume", "mass"), du.volume,
                                                field=t.field("capacity"))
            if capacity <= 0:
                raise _err(t.field("capacity"), cap_raw, f"expected a {dim} greater than 0")
            dunit = du.volume if dim == "volume" else du.mass
            unusable = 0.0
            if t.has("unusable"):
                unusable = self._qty(t, "unusable", dim, dunit, what=f"a {dim}",
                                     minimum=0.0)
                if unusable >= capacity:
                    raise _err(t.field("unusable"), t.get("unusable"),
                               f"expected less than the capacity ({_disp(capacity, dunit)})")
            density = self._qty(t, "density", "density", None, positive=True,
                                what="a density")
            from_file = density is not None
            if density is None:
                density = FLUIDS[fluid].nominal_density_kg_m3
            table = self._arm_table(t, dim, dunit, capacity, unusable)
            if table:
                if t.has("x"):
                    raise _err(t.field("x"), t.get("x"), "give the arms either as x, y, z or "
                               "in arm_table, not both")
                x, y, z = table[-1].x_m, table[-1].y_m, table[-1].z_m
            else:
                x = self.length(t, "x", required=True,
                                what="the arm x (or an arm_table)")
                y = self.length(t, "y") or 0.0
                z = self.length(t, "z")
            out.append(Tank(name=name, fluid=fluid, basis=dim, capacity=capacity,
                            unusable=unusable, density_kg_m3=density,
                            density_from_file=from_file, x_m=x, y_m=y, z_m=z,
                            arm_table=table, note=t.string("note", default="")))
        return out

    def _arm_table(self, t: _Table, dim: str, dunit: str, capacity: float,
                   unusable: float) -> tuple[TankArmPoint, ...]:
        rows = t.array("arm_table", what="an array of rows {quantity, x, y, z}")
        if rows is None:
            return ()
        base = t.field("arm_table")
        if len(rows) < 2:
            raise _err(base, rows, "expected at least two rows {quantity, x, y, z}")
        lu = self.units.length
        out = []
        axes_in_rows = None
        for j, row in enumerate(rows):
            where = f"{base}[{j}]"
            if not isinstance(row, dict):
                raise _err(where, row, f"expected a row {{quantity = ..., x = ...}}, got "
                           f"{_typename(row)}")
            r = _Table(row, where, _ARM_ROW_KEYS)
            q = self._qty(r, "quantity", dim, dunit, required=True, minimum=0.0,
                          what=f"a {dim}")
            x = self.length(r, "x", required=True, what="the arm x")
            axes = tuple(k for k in ("y", "z") if r.has(k))
            if axes_in_rows is None:
                axes_in_rows = axes
                for k in axes:
                    if t.has(k):
                        raise _err(t.field(k), t.get(k), f"given in arm_table too; give {k} "
                                   "in every row or once for the tank, not both")
            elif axes != axes_in_rows:
                missing = sorted(set(axes_in_rows) ^ set(axes))[0]
                raise _err(r.field(missing), r.get(missing, _MISSING),
                           f"expected {missing} in every row of arm_table or in none")
            y = self.length(r, "y") if "y" in axes else (self.length(t, "y") or 0.0)
            z = self.length(r, "z") if "z" in axes else self.length(t, "z")
            if out and q <= out[-1].quantity:
                raise _err(r.field("quantity"), r.get("quantity"),
                           f"expected more than the row before ({_disp(out[-1].quantity, dunit)})"
                           "; rows must be in strictly increasing quantity")
            out.append(TankArmPoint(q, x, y, z))
        if out[0].quantity > unusable:
            raise _err(f"{base}[0].quantity", rows[0]["quantity"],
                       f"expected at most the unusable quantity ({_disp(unusable, dunit)}); "
                       "the table must cover the tank from unusable to capacity")
        if out[-1].quantity < capacity:
            raise _err(f"{base}[{len(rows) - 1}].quantity", rows[-1]["quantity"],
                       f"expected at least the capacity ({_disp(capacity, dunit)}); "
                       "the table must cover the tank from unusable to capacity")
        del lu
        return tuple(out)

    def _unique_names(self, kind_a: str, items_a: list, kind_b: str, items_b: list) -> None:
        seen: dict[str, str] = {}
        for kind, items in ((kind_a, items_a), (kind_b, items_b)):
            for i, it in enumerate(items):
                key = it.name.casefold()
                if key in seen:
                    raise _err(f"{kind}[{i}].name", it.name,
                               f"already used by {seen[key]}; station and tank names must "
                               "differ (ignoring case)")
                seen[key] = f"{kind}[{i}]"

    def _unique(self, base: str, items: list, what: str = "names") -> None:
        seen: dict[str, int] = {}
        for i, it in enumerate(items):
            key = it.name.casefold()
            if key in seen:
                raise _err(f"{base}[{i}].name", it.name,
                           f"already used by {base}[{seen[key]}]; {what} must differ "
                           "(ignoring case)")
            seen[key] = i

    def _envelopes(self) -> list[Envelope]:
        from ledger.core.envelope import validate_polygon  # numpy only when parsing

        du = self.units
        out = []
        for i, raw in enumerate(_tables(self.data, "envelope")):
            path = _named_path("envelope", i, raw)
            t = _Table(raw, path, _ENVELOPE_KEYS)
            name = t.name()
            category = t.string("category", required=True,
                                what=f"one of {_listing(ENVELOPE_CATEGORIES)}",
                                choices=ENVELOPE_CATEGORIES)
            axis = t.string("axis", required=True, what=f"one of {_listing(ENVELOPE_AXES)}",
                            choices=ENVELOPE_AXES)
            coords = t.string("coordinates", default="arm", choices=ENVELOPE_COORDINATES,
                              what=f"one of {_listing(ENVELOPE_COORDINATES)}")
            raw_points = t.array("points", required=True,
                                 what="an array of [cg, mass] points")
            points = []  # SI
            shown = []  # the same points in display units, for the polygon check's messages
            for j, p in enumerate(raw_points):
                where = f"{t.field('points')}[{j}]"
                if not isinstance(p, list) or len(p) != 2:
                    raise _err(where, p, "expected a point [cg, mass]")
                if coords == "arm":
                    cg = self.length(t, "", value=p[0], field=f"{where}[0]")
                else:
                    cg = U.parse_moment(p[0], du.moment_unit, field=f"{where}[0]")
                    if U.is_bare_number(p[0]):  # a bare number is a moment index
                        cg *= du.moment_divisor
                m = self.mass(t, "", value=p[1], field=f"{where}[1]", positive=True)
                points.append((cg, m))
                shown.append((du.moment_index(cg) if coords == "moment" else
                               U.to_unit(cg, du.length), U.to_unit(m, du.mass)))
            # Checked in display units so that a message shows the points as written; scaling
            # each axis does not change whether edges cross. The check drops a closing point
            # equal to the first, so an open and a closed ring give the same type and hash.
            ring = validate_polygon(shown, field=t.field("points"))
            kept = tuple(points[:len(ring)])
            out.append(Envelope(name=name, category=category, axis=axis, coordinates=coords,
                                points=kept, note=t.string("note", default="")))
        self._unique("envelope", out, "envelope names")
        axes = [e.axis for e in out]
        if self.kind in AIRCRAFT_KINDS and "longitudinal" not in axes:
            raise _err("envelope[*].axis", _Shown(repr(axes)), f"{_a(self.kind)} needs at "
                       "least one [[envelope]] with axis = \"longitudinal\"")
        if self.kind == "helicopter" and "lateral" not in axes:
            raise _err("envelope[*].axis", _Shown(repr(axes)), "a helicopter needs at least one "
                       "[[envelope]] with axis = \"lateral\" as well as a longitudinal one")
        return out

    def _reaction_points(self) -> list[ReactionPoint]:
        out = []
        for i, raw in enumerate(_tables(self.data, "reaction_point")):
            t = _Table(raw, _named_path("reaction_point", i, raw), _REACTION_KEYS)
            name = t.name()
            x = self.length(t, "x", required=True, what="the arm x")
            y = self.length(t, "y") or 0.0
            out.append(ReactionPoint(name, x, y))
        self._unique("reaction_point", out, "reaction point names")
        return out

    def _inertia(self, top: _Table):
        raw = top.get("inertia")
        if raw is None:
            return None
        if not isinstance(raw, dict):
            raise _err("inertia", raw, f"expected a table [inertia], got {_typename(raw)}")
        basis = raw.get("basis")
        if basis not in _INERTIA_KEYS:
            if "basis" not in raw:
                raise TypeDataError("inertia.basis", _MISSING,
                                    "required: measured or gyration")
            raise _err("inertia.basis", basis, "expected one of measured, gyration")
        allowed = _INERTIA_KEYS[basis]
        for key, value in raw.items():
            if key not in allowed:
                raise _err(f"inertia.{key}", value, f"unknown key for basis = \"{basis}\"; "
                           f"allowed here: {_listing(allowed)}")
        t = _Table(raw, "inertia", allowed)
        note = t.string("note", default="")
        if basis == "measured":
            iu = self.units.inertia_unit
            req = {k: self._qty(t, k, "inertia", None, required=True, minimum=0.0,
                                what=f"a moment of inertia, e.g. '1500 kg*m2' or "
                                f"'1200 {iu}'") for k in ("ixx", "iyy", "izz")}
            prod = {k: self._qty(t, k, "inertia", None, what="a product of inertia") or 0.0
                    for k in ("ixz", "ixy", "iyz")}
            # Every inertia tensor obeys the triangle inequality on its diagonal
            # (Ixx = ∫(y²+z²) dm <= Iyy + Izz, and cyclic).
            for a, b, c in (("ixx", "iyy", "izz"), ("iyy", "izz", "ixx"),
                            ("izz", "ixx", "iyy")):
                if req[a] > (req[b] + req[c]) * (1 + 1e-12):
                    raise _err(f"inertia.{a}", t.get(a), f"expected at most {b} + {c} "
                               f"({_disp(req[b] + req[c], 'kg*m2')}); no body has a larger one")
            return MeasuredInertia(req["ixx"], req["iyy"], req["izz"], prod["ixz"],
                                   prod["ixy"], prod["iyz"], note)
        r = {k: t.number(k, required=True, above=0.0, below=2.0,
                         what="a nondimensional radius of gyration between 0 and 2")
             for k in ("rx", "ry", "rz")}
        span = self.length(t, "span", required=True, positive=True, what="the span")
        length = self.length(t, "length", required=True, positive=True,
                             what="the overall length")
        return GyrationInertia(r["rx"], r["ry"], r["rz"], span, length, note)

    def _axles(self) -> tuple[list[Axle], list[AxleGroup]]:
        raws = _tables(self.data, "axle")
        graws = _tables(self.data, "axle_group")
        ground = self.kind == "ground_vehicle"
        if not ground and (raws or graws):
            key = "axle" if raws else "axle_group"
            raise _err(key, (raws or graws)[0], f"allowed only for kind ground_vehicle; "
                       f"{_a(self.kind)} is weighed on its [[reaction_point]]s")
        if ground and len(raws) < 2:
            raise _err("axle", _Shown(f"({len(raws)} given)"),
                       "a ground vehicle needs at least two [[axle]] tables")
        axles = []
        for i, raw in enumerate(raws):
            t = _Table(raw, _named_path("axle", i, raw), _AXLE_KEYS)
            name = t.name()
            x = self.length(t, "x", required=True, what="the axle centreline arm x")
            rating = self.mass(t, "rating", required=True, positive=True,
                               what="the axle rating, a mass")
            track = self.length(t, "track", positive=True, what="the track width")
            for j, other in enumerate(axles):
                if other.x_m == x:
                    raise _err(t.field("x"), t.get("x"), f"expected a different arm from "
                               f"axle[{j}] ({other.name})")
            axles.append(Axle(name, x, rating, track))
        self._unique("axle", axles, "axle names")
        groups = []
        member_of: dict[str, str] = {}
        by_name = {a.name: a for a in axles}
        for i, raw in enumerate(graws):
            t = _Table(raw, _named_path("axle_group", i, raw), _AXLE_GROUP_KEYS)
            name = t.name()
            members = t.array("axles", required=True, what="an array of axle names")
            if len(members) < 2:
                raise _err(t.field("axles"), members, "expected at least two axle names")
            for j, m in enumerate(members):
                if not isinstance(m, str) or m not in by_name:
                    raise _err(f"{t.field('axles')}[{j}]", m,
                               f"expected one of the axles: {_listing(by_name)}")
                if m in member_of:
                    raise _err(f"{t.field('axles')}[{j}]", m,
                               f"already in axle group {member_of[m]!r}")
                member_of[m] = name
            shares_raw = t.array("load_share", what="an array of load-share ratios")
            if shares_raw is None:
                shares = tuple(1.0 / len(members) for _ in members)
            else:
                if len(shares_raw) != len(members):
                    raise _err(t.field("load_share"), shares_raw,
                               f"expected {len(members)} ratios, one per axle")
                for j, s in enumerate(shares_raw):
                    if isinstance(s, bool) or not isinstance(s, (int, float)) \
                            or not math.isfinite(s) or s <= 0:
                        raise _err(f"{t.field('load_share')}[{j}]", s,
                                   "expected a ratio greater than 0")
                shares = tuple(float(s) for s in shares_raw)
                if abs(math.fsum(shares) - 1.0) > 1e-6:
                    raise _err(t.field("load_share"), shares_raw, "expected ratios that sum "
                               f"to 1 (these sum to {math.fsum(shares):.10g})")
            rating = self.mass(t, "rating", positive=True, what="the group rating, a mass")
            groups.append(AxleGroup(name, tuple(members), shares, rating))
        self._unique("axle_group", groups, "axle group names")
        axles = [Axle(a.name, a.x_m, a.rating_kg, a.track_m, member_of.get(a.name))
                 for a in axles]
        return axles, groups

    def _tolerances(self, top: _Table, mac: Mac | None) -> Tolerances:
        t = top.sub("tolerances", _TOLERANCE_KEYS)
        if t is None:
            return Tolerances()
        lm = self.mass(t, "last_minute_mass", what="a mass") or 0.0
        lp = t.integer("last_minute_persons", default=0, minimum=0,
                       what="a whole number of persons, 0 or more")
        rm = t.number("reweigh_mass_percent", minimum=0.0, what="a percentage of 0 or more")
        rc = t.number("reweigh_cg_percent_mac", minimum=0.0, what="a percentage of 0 or more")
        if rc is not None and mac is None:
            raise _err("tolerances.reweigh_cg_percent_mac", t.get("reweigh_cg_percent_mac"),
                       "needs a [mac] table; without one use reweigh_cg_shift (a length)")
        rs = self.length(t, "reweigh_cg_shift", positive=True, what="a length")
        return Tolerances(lm, lp, rm, rc, rs)

    def _configurations(self, stations: list[Station]) -> list[Configuration]:
        out = []
        station_names = [s.name for s in stations]
        for i, raw in enumerate(_tables(self.data, "configuration")):
            path = _named_path("configuration", i, raw)
            t = _Table(raw, path, _CONFIG_KEYS)
            name = t.name()
            action = t.string("action", required=True, choices=CONFIGURATION_ACTIONS,
                              what=f"one of {_listing(CONFIGURATION_ACTIONS)}")
            description = t.string("description", default="")
            disabled = t.array("disables_stations", what="an array of station names") or []
            for j, s in enumerate(disabled):
                if not isinstance(s, str) or s not in station_names:
                    raise _err(f"{t.field('disables_stations')}[{j}]", s,
                               f"expected a station name: {_listing(station_names) or 'none'}")
            items = []
            for j, iraw in enumerate(_tables(raw, "item", f"{path}.item")):
                it = _Table(iraw, _named_path(f"{path}.item", j, iraw), _ITEM_KEYS)
                iname = it.name()
                mass = self.mass(it, "mass", required=True, positive=True,
                                 what="the item's mass")
                x = self.length(it, "x", required=True, what="the arm x")
                y = self.length(it, "y") or 0.0
                z = self.length(it, "z")
                shape = self._shape(it)
                items.append(ConfigItem(iname, mass, x, y, z, shape))
            self._unique(f"{path}.item", items, "item names")
            if not items and not disabled:
                raise _err(path, raw, "expected at least one [[configuration.item]] or "
                           "disables_stations")
            out.append(Configuration(name, action, description, tuple(items), tuple(disabled)))
        self._unique("configuration", out, "configuration names")
        return out

    def _shape(self, it: _Table) -> Shape | None:
        raw = it.get("shape")
        if raw is None:
            return None
        where = it.field("shape")
        if not isinstance(raw, dict):
            raise _err(where, raw, f"expected an inline table {{kind = ...}}, got "
                       f"{_typename(raw)}")
        kind = raw.get("kind")
        if kind not in SHAPE_KINDS:
            if "kind" not in raw:
                raise TypeDataError(f"{where}.kind", _MISSING,
                                    f"required: one of {_listing(SHAPE_KINDS)}")
            raise _err(f"{where}.kind", kind, f"expected one of {_listing(SHAPE_KINDS)}")
        dims = SHAPE_DIMENSIONS[kind]
        for key, value in raw.items():
            if key != "kind" and key not in dims:
                allowed = _listing(("kind",) + dims)
                raise _err(f"{where}.{key}", value,
                           f"unknown key for a {kind}; allowed here: {allowed}")
        s = _Table(raw, where, ("kind",) + dims)
        vals = {}
        for d in dims:
            if d == "axis":
                vals["axis"] = s.string("axis", required=True, choices=SHAPE_AXES,
                                        what="the axis: x, y or z")
            else:
                vals[f"{d}_m"] = self.length(s, d, required=True, positive=True,
                                             what=f"the {d.replace('_', ' ')}")
        if kind == "hollow_cylinder" and vals["inner_radius_m"] >= vals["radius_m"]:
            raise _err(f"{where}.inner_radius", raw["inner_radius"],
                       f"expected less than the radius ({_disp(vals['radius_m'], self.units.length)})")
        return Shape(kind=kind, **vals)

    def _mass_sets(self) -> list[StandardMassSet]:
        out = []
        for i, raw in enumerate(_tables(self.data, "mass_set")):
            t = _Table(raw, _named_path("mass_set", i, raw), _MASS_SET_KEYS)
            name = t.name()
            if name in STANDARD_MASS_SETS:
                raise _err(t.field("name"), name, "the name of a built-in set; choose "
                           f"another name (built-in: {_listing(STANDARD_MASS_SETS)})")
            masses = []
            for cls in OCCUPANT_CLASSES:
                m = self.mass(t, cls, positive=True, what="a mass")
                if m is not None:
                    masses.append((cls, m))
            if not masses:
                raise TypeDataError(t.field("adult"), _MISSING, "required: a mass for at "
                                    f"least one of {_listing(OCCUPANT_CLASSES)}")
            out.append(StandardMassSet(name, t.string("description", default=""),
                                       t.string("source", default="type file"),
                                       tuple(masses)))
        self._unique("mass_set", out, "mass set names")
        return out


def parse_type(data: dict, *, source: str) -> VehicleType:
    """Validate a type file already read as TOML and build the :class:`VehicleType`.

    Parameters
    ----------
    data : dict
        The TOML document (as :func:`tomllib.loads` returns it).
    source : str
        Where it came from, used to locate errors ("kv-p4.toml").

    Raises
    ------
    TypeDataError, UnitError, EnvelopeError
        The first problem found, as one line ``source: field = value: what is allowed``.
    """
    try:
        if not isinstance(data, dict):
            raise _err("(document)", data, "expected a TOML table")
        return _Reader(data).parse()
    except InputError as exc:
        raise exc.with_source(source) from None


_POSITION_RE = re.compile(r"^(.*?)\s*\(at line (\d+), column (\d+)\)\s*$")


def parse_type_text(text: str, *, source: str) -> VehicleType:
    """Parse the text of a type file (TOML). See :func:`parse_type`.

    A TOML syntax error is reported with its line and column:
    ``source: line 3 = 'the line': not valid TOML: <reason> (column 7)``. Nesting, numbers and
    texts out of the bounds of :mod:`ledger.bounds` are refused before the file is read as a
    type.
    """
    try:
        data = load_toml(text)
    except InputError as exc:
        raise exc.with_source(source) from None
    except tomllib.TOMLDecodeError as exc:
        msg = str(exc)
        m = _POSITION_RE.match(msg)
        if m:
            reason, line, col = m.group(1), int(m.group(2)), int(m.group(3))
            lines = text.splitlines()
            shown = lines[line - 1].strip() if 0 < line <= len(lines) else ""
            err = TypeDataError(f"line {line}", shown,
                                f"not valid TOML: {reason} (column {col})")
        else:
            reason = msg.replace(" (at end of document)", "")
            err = TypeDataError("end of file", "", f"not valid TOML: {reason}")
        raise err.with_source(source) from None
    return parse_type(data, source=source)


def read_type_file(path: str | os.PathLike, *,
                   max_size: int | None = None) -> tuple[VehicleType, str]:
    """Read and parse one type file; return the type and the text it was parsed from.

    The file is read once, by :func:`ledger.files.read_input_text`: a regular file of at most
    ``max_size`` bytes (default :data:`ledger.files.INPUT_LIMIT`, 1 MiB), UTF-8. Errors name
    the file as ``path`` was given; that path is kept with an imported revision, so it may have
    at most :data:`ledger.bounds.SOURCE_NAME_MAX` characters.

    Raises
    ------
    TypeDataError, UnitError, EnvelopeError, InputError
        The file cannot be read, or is not a valid type file.
    """
    source = os.fspath(path)
    if len(source) > SOURCE_NAME_MAX:
        raise TypeDataError("file", shown(source), f"a path of at most {SOURCE_NAME_MAX} "
                            "characters (it is recorded with the type revision); give a shorter "
                            "(relative) path")
    text = read_input_text(source, field="file", what="a type file",
                           limit=INPUT_LIMIT if max_size is None else max_size,
                           error=TypeDataError)
    return parse_type_text(text, source=source), text


def load_type_file(path: str | os.PathLike, *, max_size: int | None = None) -> VehicleType:
    """Read and parse one type file (see :func:`read_type_file`); return the type."""
    return read_type_file(path, max_size=max_size)[0]
