"""Loading plans: the TOML plan file and the quick command-line form, parsed against a type.

A plan says who and what goes where and how much fuel: people per seat (actual masses, or the
standard masses of a set the operator names), cargo, equipment or ballast per station, fuel per
tank (volume or mass; density given, from the type data, nominal, or from the fuel temperature
by table 54B), taxi fuel, trip fuel and the burn sequence. The file format is described in
``docs/plan-format.md``.

Reading a plan takes two steps, because bare numbers take the display units of the vehicle's
type and names must be checked against the type's stations and tanks:

1. :func:`read_plan_file` / :func:`read_plan_text` / :func:`plan_from_options` give the *raw*
   plan (a dict in the file's own layout) and :func:`plan_vehicle` its registration;
2. :func:`parse_plan` checks the raw plan against a :class:`~ledger.typedata.model.VehicleType`
   and returns a frozen :class:`Plan` in SI.

:func:`merge_options` applies quick options over a raw plan (a file plus a few changes, or a
saved sheet plus a last-minute change).

Every problem is one :class:`~ledger.errors.PlanError` (exit code 2) naming the file or option,
the field, the value and what is allowed. A load that is possible but over a limit (cargo over
a compartment limit, mass over the take-off limit) is *not* an input error: the sheet shows it
as a violation with its fixes.

Fuel quantities in a plan are **usable** fuel: the unusable fuel is part of the empty weight
(FAA-H-8083-1, weighing chapter: the empty weight keeps the unusable fuel), so a tank takes at
most its capacity less its unusable fuel.
"""

from __future__ import annotations

import math
import tomllib
from collections.abc import Mapping, Sequence
from dataclasses import asdict, dataclass, replace
from pathlib import Path
from typing import Any

from ledger import units as U
from ledger.bounds import TEXT_MAX, load_toml, shown
from ledger.errors import InputError, NotFoundError, PlanError
from ledger.files import INPUT_LIMIT, read_input_text

__all__ = [
    "PLAN_FORMAT",
    "ACTUAL",
    "BURN_PROPORTIONAL",
    "BURN_TANK_ORDER",
    "Person",
    "CargoLoad",
    "TankLoad",
    "Plan",
    "QuickOptions",
    "read_plan_file",
    "read_plan_text",
    "plan_vehicle",
    "plan_from_options",
    "merge_options",
    "parse_plan",
    "load_plan",
]

PLAN_FORMAT = 1
"""The ``plan_format`` this parser reads."""

ACTUAL = "actual"
"""``standard_masses`` value for a plan that gives every person's actual mass."""

BURN_PROPORTIONAL = "proportional"
BURN_TANK_ORDER = "tank order"

_TOP_KEYS = ("plan_format", "vehicle", "configuration", "category", "standard_masses",
             "prepared_by", "axle_rules", "note", "person", "cargo", "fuel")
_PERSON_KEYS = ("seat", "mass", "name", "class")
_CARGO_KEYS = ("station", "mass", "what", "x")
_FUEL_KEYS = ("tanks", "taxi", "trip", "burn")
_TANK_KEYS = ("quantity", "density", "temperature", "density_15c")
_OPTION = "_option"  # raw entries made from a command-line option remember it here

_CLASSES = ("flight_crew", "cabin_crew", "adult", "child")


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


# --- reading the raw plan ---------------------------------------------------------------------

def _show(value):
    if isinstance(value, _Shown):
        return value
    if isinstance(value, (str, int, float)) and not isinstance(value, bool):
        return value
    return _Shown(repr(value) if not isinstance(value, bool) else str(value).lower())


class _Shown:
    def __init__(self, text: str) -> None:
        self.text = text

    def __str__(self) -> str:
        return self.text


_MISSING = _Shown("(missing)")


def read_plan_text(text: str, source: str = "plan") -> dict:
    """Parse plan TOML text into the raw plan dict (no checks against a type yet).

    Raises
    ------
    PlanError
        Not TOML, or a plan_format other than :data:`PLAN_FORMAT`.
    InputError
        Nesting, a number or a text out of the bounds of :mod:`ledger.bounds`.

    Examples
    --------
    >>> raw = read_plan_text('plan_format = 1\\nvehicle = "KV-101"\\n', "p.toml")
    >>> plan_vehicle(raw, "p.toml")
    'KV-101'
    >>> read_plan_text('plan_format = 1\\nvehicle = "A"\\nvehicle = "B"', "p.toml")
    Traceback (most recent call last):
    ...
    ledger.errors.PlanError: plan file = 'p.toml': not valid TOML: Cannot overwrite a value (at end of document). A key may appear once in a table; for several people or loads write several [[person]] or [[cargo]] tables
    """
    try:
        data = load_toml(text, source=source)
    except tomllib.TOMLDecodeError as exc:
        # The hint helps with a repeated key (two persons written as one table), not otherwise.
        repeated = str(exc).startswith(("Cannot overwrite", "Cannot declare"))
        raise PlanError("plan file", source, f"not valid TOML: {exc}",
                        hint="A key may appear once in a table; for several people or loads "
                             "write several [[person]] or [[cargo]] tables" if repeated
                        else None) from None
    version = data.get("plan_format", _MISSING)
    if version is _MISSING:
        raise PlanError("plan_format", _MISSING,
                        f"required: plan_format = {PLAN_FORMAT} at the top of the plan",
                        source=source)
    if isinstance(version, bool) or version != PLAN_FORMAT:
        raise PlanError("plan_format", _show(version),
                        f"expected {PLAN_FORMAT}; this wbledger reads plan_format "
                        f"{PLAN_FORMAT}", source=source)
    return data


def read_plan_file(path: str | Path, *, max_size: int | None = None) -> dict:
    """Read a plan file into the raw plan dict.

    The file is read by :func:`ledger.files.read_input_text`: a regular file of at most
    ``max_size`` bytes (default :data:`ledger.files.INPUT_LIMIT`, 1 MiB), UTF-8.

    Raises
    ------
    PlanError
        The file cannot be read, is not UTF-8 TOML, or has the wrong plan_format.
    """
    text = read_input_text(path, field="plan file", what="a plan file (TOML)",
                           limit=INPUT_LIMIT if max_size is None else max_size, error=PlanError)
    return read_plan_text(text, str(path))


def plan_vehicle(raw: Mapping[str, Any], source: str = "plan") -> str:
    """The registration a raw plan names."""
    reg = raw.get("vehicle", _MISSING)
    if reg is _MISSING:
        raise PlanError("vehicle", _MISSING, "required: the registration of the vehicle",
                        source=source)
    if not isinstance(reg, str) or not reg.strip():
        raise PlanError("vehicle", _show(reg), "expected a registration (a string)",
                        source=source)
    return reg.strip()


@dataclass(frozen=True)
class QuickOptions:
    """Plan changes from the command line (all optional).

    Each entry is the option's text as typed: ``persons`` ``"SEAT=MASS"`` or ``"SEAT=CLASS"``
    (``CLASS`` one of flight_crew, cabin_crew, adult, child, or ``standard`` for the seat's
    own class); ``cargo`` ``"STATION=MASS"``; ``fuel`` ``"TANK=QUANTITY"``, optionally
    ``"TANK=QUANTITY@DENSITY"`` or ``"TANK=QUANTITY@TEMPERATURE"``; ``vacate`` seat names.
    ``burn`` is ``proportional`` or tank names separated by commas (tank order).
    """

    persons: tuple[str, ...] = ()
    cargo: tuple[str, ...] = ()
    fuel: tuple[str, ...] = ()
    vacate: tuple[str, ...] = ()
    taxi: str | None = None
    trip: str | None = None
    burn: str | None = None
    configuration: str | None = None
    category: str | None = None
    standard_masses: str | None = None
    axle_rules: str | None = None

    @property
    def empty(self) -> bool:
        return self == QuickOptions()


def _split_option(option: str, text: str, what: str) -> tuple[str, str]:
    if not isinstance(text, str) or "=" not in text:
        raise PlanError(option, _show(text), f"expected {what}")
    name, _, value = text.partition("=")
    name, value = name.strip(), value.strip()
    if not name or not value:
        raise PlanError(option, text, f"expected {what}")
    return name, value


def _person_entry(text: str) -> dict:
    seat, value = _split_option("--person", text, "SEAT=MASS or SEAT=CLASS, e.g. "
                                "'pilot=82 kg' or 'row 2 left=adult'")
    entry: dict[str, Any] = {"seat": seat, _OPTION: ["--person", text]}
    low = value.lower()
    if low in _CLASSES:
        entry["class"] = low
    elif low != "standard":
        entry["mass"] = value
    return entry


def _tank_entry(text: str) -> tuple[str, Any]:
    tank, value = _split_option("--fuel", text, "TANK=QUANTITY[@DENSITY or @TEMPERATURE], "
                                "e.g. 'main=30 USgal' or 'main=30 USgal@25 degC'")
    qty, at, extra = value.partition("@")
    entry: dict[str, Any] = {"quantity": qty.strip(), _OPTION: ["--fuel", text]}
    if at:
        extra = extra.strip()
        try:
            U.parse_density(extra, field="--fuel")
            entry["density"] = extra
        except InputError:
            try:
                U.parse_temperature(extra, field="--fuel")
            except InputError:
                raise PlanError("--fuel", text, "after '@' a density such as '6.1 lb/USgal' "
                                "or a temperature such as '25 degC'") from None
            entry["temperature"] = extra
    return tank, entry


def plan_from_options(vehicle: str, options: QuickOptions, *,
                      prepared_by: str | None = None) -> dict:
    """The raw plan of a quick command-line check (``wbledger check REG --person …``)."""
    raw: dict[str, Any] = {"plan_format": PLAN_FORMAT, "vehicle": vehicle}
    if prepared_by:
        raw["prepared_by"] = prepared_by
    return merge_options(raw, options)


def merge_options(raw: Mapping[str, Any], options: QuickOptions) -> dict:
    """Apply quick options over a raw plan; returns a new raw plan.

    Seats named by ``persons`` or ``vacate`` lose the people the plan had there (repeating
    ``--person`` for one seat fills a multi-person seat); stations named by ``cargo`` get
    exactly the cargo given (``STATION=0`` unloads it); tanks named by ``fuel`` are replaced;
    the other options replace the plan's value.
    """
    out = {k: (list(v) if isinstance(v, list) else dict(v) if isinstance(v, dict) else v)
           for k, v in raw.items()}
    new_people = [_person_entry(t) for t in options.persons]
    seats = {e["seat"].casefold() for e in new_people} | {s.casefold() for s in options.vacate}
    if new_people or options.vacate:
        kept = [p for p in _list(out.get("person", []))
                if not (isinstance(p, dict) and isinstance(p.get("seat"), str)
                        and p["seat"].casefold() in seats)]
        out["person"] = kept + new_people
    new_cargo = []
    for text in options.cargo:
        station, value = _split_option("--cargo", text, "STATION=MASS, e.g. "
                                       "'aft baggage=20 kg'")
        new_cargo.append({"station": station, "mass": value, _OPTION: ["--cargo", text]})
    if new_cargo:
        names = {c["station"].casefold() for c in new_cargo}
        kept = [c for c in _list(out.get("cargo", []))
                if not (isinstance(c, dict) and isinstance(c.get("station"), str)
                        and c["station"].casefold() in names)]
        out["cargo"] = kept + new_cargo
    if options.fuel or options.taxi is not None or options.trip is not None \
            or options.burn is not None:
        fuel = dict(out.get("fuel", {})) if isinstance(out.get("fuel"), dict) else {}
        if options.fuel:
            tanks = dict(fuel.get("tanks", {})) if isinstance(fuel.get("tanks"), dict) else {}
            for text in options.fuel:
                name, entry = _tank_entry(text)
                for k in [k for k in tanks if k.casefold() == name.casefold()]:
                    del tanks[k]
                tanks[name] = entry
            fuel["tanks"] = tanks
        for key, value, opt in (("taxi", options.taxi, "--taxi"), ("trip", options.trip, "--trip")):
            if value is not None:
                fuel[key] = {"_value": value, _OPTION: [opt, value]}
        if options.burn is not None:
            b = options.burn.strip()
            fuel["burn"] = (BURN_PROPORTIONAL if b.lower() == BURN_PROPORTIONAL
                            else {"_value": [s.strip() for s in b.split(",")],
                                  _OPTION: ["--burn", options.burn]})
        out["fuel"] = fuel
    for key, value in (("configuration", options.configuration),
                       ("category", options.category),
                       ("standard_masses", options.standard_masses),
                       ("axle_rules", options.axle_rules)):
        if value is not None:
            out[key] = value
    return out


def _list(value) -> list:
    return list(value) if isinstance(value, list) else []


# --- checking the raw plan against the type ---------------------------------------------------

def _q(value_si: float, unit: str) -> str:
    """A figure in a display unit for a message: '26 USgal', '1156.66 kg'."""
    v = round(U.to_unit(value_si, unit), 6) + 0.0
    return f"{v:.6g} {unit}"


class _Checker:
    def __init__(self, raw: Mapping[str, Any], vtype, source: str,
                 disabled_stations: Sequence[str] | None = None) -> None:
        self.disabled = None if disabled_stations is None else tuple(disabled_stations)
        self.raw = raw
        self.t = vtype
        self.du = vtype.units
        self.source = source

    # --- errors ----------------------------------------------------------------------------
    def err(self, field: str, value, allowed: str, hint: str | None = None,
            entry: Mapping | None = None) -> PlanError:
        """A PlanError located in the file, or naming the command-line option it came from."""
        opt = entry.get(_OPTION) if isinstance(entry, Mapping) else None
        if opt:
            return PlanError(opt[0], opt[1], allowed, hint=hint)
        return PlanError(field, _show(value), allowed, hint=hint, source=self.source)

    def _unit(self, exc: InputError, field: str, entry: Mapping | None) -> PlanError:
        return self.err(field, exc.value, exc.allowed, exc.hint, entry)

    def keys(self, table: Mapping, path: str, allowed: tuple[str, ...]) -> None:
        for key, value in table.items():
            if key == _OPTION:
                continue
            if key not in allowed:
                import difflib

                close = difflib.get_close_matches(key, allowed, n=1, cutoff=0.6)
                raise self.err(f"{path}.{key}" if path else key, value,
                               f"unknown key; allowed here: {', '.join(allowed)}",
                               hint=f"Did you mean '{close[0]}'?" if close else None)

    def string(self, key: str, default: str | None = None) -> str | None:
        value = self.raw.get(key, None)
        if value is None:
            return default
        if not isinstance(value, str) or not value.strip():
            raise self.err(key, value, "expected a non-empty string")
        return value.strip()

    def tables(self, key: str) -> list[Mapping]:
        value = self.raw.get(key, [])
        if not isinstance(value, list) or not all(isinstance(v, dict) for v in value):
            raise self.err(key, value, f"expected an array of tables [[{key}]]")
        return value

    # --- quantities ------------------------------------------------------------------------
    def mass(self, value, field: str, entry: Mapping | None, *, positive: bool = False) -> float:
        try:
            kg = U.parse_mass(value, self.du.mass, field=field)
        except InputError as exc:
            raise self._unit(exc, field, entry) from None
        if kg < 0 or (positive and kg == 0):
            raise self.err(field, value, "expected a mass greater than 0" if positive
                           else "expected a mass of 0 or more", entry=entry)
        return kg

    # --- sections --------------------------------------------------------------------------
    def parse(self) -> Plan:
        self.keys(self.raw, "", _TOP_KEYS)
        vehicle = plan_vehicle(self.raw, self.source)
        configuration = self.configuration()
        category = self.category()
        mass_set_name = self.string("standard_masses", ACTUAL)
        mass_set = None
        if mass_set_name != ACTUAL:
            try:
                mass_set = self.t.mass_set(mass_set_name)
            except NotFoundError as exc:
                raise self.err("standard_masses", mass_set_name,
                               f"expected '{ACTUAL}' or a standard mass set; {exc.hint}") \
                    from None
        axle_rules = self.string("axle_rules")
        if axle_rules is not None and self.t.kind != "ground_vehicle":
            raise self.err("axle_rules", axle_rules, "allowed only for ground vehicles")
        persons = self.persons(mass_set, configuration)
        cargo = self.cargo(configuration)
        tanks, taxi, trip, seq, order = self.fuel()
        prepared_by = self.string("prepared_by")
        if prepared_by is not None and len(prepared_by) > TEXT_MAX:  # the sheet's preparer
            raise self.err("prepared_by", shown(prepared_by), f"at most {TEXT_MAX} characters")
        note = self.raw.get("note", "")
        if not isinstance(note, str):
            raise self.err("note", note, "expected a string")
        return Plan(vehicle=vehicle, persons=tuple(persons), cargo=tuple(cargo),
                    tanks=tuple(tanks), taxi_fuel_kg=taxi, trip_fuel_kg=trip,
                    burn_sequence=seq, burn_order=tuple(order), configuration=configuration,
                    category=category, standard_masses=mass_set_name,
                    prepared_by=prepared_by, axle_rules=axle_rules, note=note,
                    source=self.source)

    def configuration(self) -> str | None:
        # A configuration of the vehicle itself (recorded in the ledger) is resolved by the
        # caller; here a name the type knows is put in its canonical spelling.
        name = self.string("configuration")
        if name is None:
            return None
        for c in self.t.configurations:
            if c.name.casefold() == name.casefold():
                return c.name
        return name

    def _disabled(self, configuration: str | None) -> tuple[str, ...]:
        if self.disabled is not None:
            return self.disabled
        for c in self.t.configurations:
            if c.name == configuration:
                return c.disables_stations
        return ()

    def category(self) -> str | None:
        cats = []
        for e in self.t.envelopes:
            if e.category not in cats:
                cats.append(e.category)
        name = self.string("category")
        if name is None:
            if not cats:
                return None
            return "normal" if "normal" in cats else cats[0]
        if name not in cats:
            known = ", ".join(cats) or "none (this type has no envelope)"
            raise self.err("category", name, f"expected an envelope category of type "
                           f"{self.t.name}: {known}")
        return name

    def station(self, name, field: str, entry: Mapping, *, seat: bool,
                configuration: str | None):
        if not isinstance(name, str) or not name.strip():
            raise self.err(field, _MISSING if name is None else name,
                           "required: the name of a " + ("seat" if seat else "station"),
                           entry=entry)
        seats = [s.name for s in self.t.stations if s.is_seat]
        others = [s.name for s in self.t.stations if not s.is_seat]
        try:
            st = self.t.station(name.strip())
        except NotFoundError:
            known = ", ".join(seats if seat else others) or "none"
            what = "seat" if seat else "cargo, equipment or ballast station"
            raise self.err(field, name, f"unknown {what}; type {self.t.name} has: {known}",
                           entry=entry) from None
        if seat and not st.is_seat:
            raise self.err(field, name, f"a seat; '{st.name}' is a {st.kind} station, so put "
                           f"it under [[cargo]]. Seats of type {self.t.name}: "
                           f"{', '.join(seats) or 'none'}", entry=entry)
        if not seat and st.is_seat:
            raise self.err(field, name, f"a cargo, equipment or ballast station; '{st.name}' "
                           f"is a seat, so put a person there under [[person]]. Stations: "
                           f"{', '.join(others) or 'none'}", entry=entry)
        if st.name in self._disabled(configuration):
            raise self.err(field, name, f"a station in use: configuration '{configuration}' "
                           f"takes '{st.name}' out of use", entry=entry)
        return st

    def persons(self, mass_set, configuration) -> list[Person]:
        out: list[Person] = []
        where: dict[str, list[str]] = {}
        for i, raw in enumerate(self.tables("person")):
            path = f"person[{i}]"
            self.keys(raw, path, _PERSON_KEYS)
            st = self.station(raw.get("seat"), f"{path}.seat", raw, seat=True,
                              configuration=configuration)
            taken = where.setdefault(st.name, [])
            if len(taken) >= st.persons:
                already = " and ".join(taken)
                raise self.err(f"{path}.seat", raw.get("seat"),
                               f"a free seat: '{st.name}' takes {st.persons} "
                               f"{'person' if st.persons == 1 else 'persons'} and {already} "
                               f"{'is' if len(taken) == 1 else 'are'} already there",
                               hint=("Two people cannot share one seat; put one in another "
                                     "seat") if st.persons == 1 else
                               "Put the others in another seat",
                               entry=raw)
            name = raw.get("name", "")
            if not isinstance(name, str):
                raise self.err(f"{path}.name", name, "expected a string", entry=raw)
            cls = raw.get("class")
            if cls is not None and cls not in _CLASSES:
                raise self.err(f"{path}.class", cls, f"expected one of {', '.join(_CLASSES)}",
                               entry=raw)
            if "mass" in raw:
                if cls is not None:
                    raise self.err(f"{path}.class", cls, "only for a standard mass; this "
                                   "person has an actual mass", entry=raw)
                kg = self.mass(raw["mass"], f"{path}.mass", raw, positive=True)
                out.append(Person(st.name, kg, name, ACTUAL, None))
            else:
                cls = cls or st.occupant_class
                if mass_set is None:
                    raise self.err(f"{path}.mass", _MISSING,
                                   "required: the person's actual mass, since "
                                   "standard_masses is 'actual'",
                                   hint="Or name a standard mass set with standard_masses",
                                   entry=raw)
                kg = mass_set.mass_for(cls)
                if kg is None:
                    raise self.err(f"{path}.mass", _MISSING,
                                   f"required: standard mass set '{mass_set.name}' has no "
                                   f"mass for {cls}; give this person's actual mass",
                                   entry=raw)
                out.append(Person(st.name, kg, name, "standard", cls))
            taken.append(f"{path}" if not raw.get(_OPTION) else "another person")
        return out

    def cargo(self, configuration) -> list[CargoLoad]:
        out: list[CargoLoad] = []
        for i, raw in enumerate(self.tables("cargo")):
            path = f"cargo[{i}]"
            self.keys(raw, path, _CARGO_KEYS)
            st = self.station(raw.get("station"), f"{path}.station", raw, seat=False,
                              configuration=configuration)
            if "mass" not in raw:
                raise self.err(f"{path}.mass", _MISSING, "required: the mass", entry=raw)
            kg = self.mass(raw["mass"], f"{path}.mass", raw)
            what = raw.get("what", "")
            if not isinstance(what, str):
                raise self.err(f"{path}.what", what, "expected a string", entry=raw)
            x = None
            if "x" in raw:
                f = f"{path}.x"
                if st.extent is None:
                    raise self.err(f, raw["x"], f"no arm here: station '{st.name}' has no "
                                   "fore-and-aft extent (x_range) to place a load in",
                                   entry=raw)
                try:
                    x = U.parse_length(raw["x"], self.du.length, field=f)
                except InputError as exc:
                    raise self._unit(exc, f, entry=raw) from None
                lo, hi = st.extent.x_min_m, st.extent.x_max_m
                if not lo - 1e-12 <= x <= hi + 1e-12:
                    raise self.err(f, raw["x"], f"an arm within station '{st.name}', from "
                                   f"{_q(lo, self.du.length)} to {_q(hi, self.du.length)}",
                                   entry=raw)
            if kg > 0:
                out.append(CargoLoad(st.name, kg, what, x))
        return out

    def fuel(self):
        fuel = self.raw.get("fuel", {})
        if not isinstance(fuel, dict):
            raise self.err("fuel", fuel, "expected a table [fuel]")
        self.keys(fuel, "fuel", _FUEL_KEYS)
        tanks_raw = fuel.get("tanks", {})
        if not isinstance(tanks_raw, dict):
            raise self.err("fuel.tanks", tanks_raw,
                           "expected a table [fuel.tanks] of TANK = QUANTITY")
        loads: list[TankLoad] = []
        for name, spec in tanks_raw.items():
            loads.append(self.tank(name, spec))
        seen: dict[str, str] = {}
        for tl in loads:
            if tl.tank in seen:
                raise self.err(f"fuel.tanks[{tl.tank!r}]", tl.tank,
                               "each tank once (two spellings name the same tank)")
            seen[tl.tank] = tl.tank
        order_tanks = [t for t in self.t.tanks if t.is_fuel]
        seq, order = self.burn(fuel.get("burn", BURN_PROPORTIONAL), loads, order_tanks)
        feeding = [tl for tl in loads if tl.tank in order]
        usable = math.fsum(tl.mass_kg for tl in feeding)
        vol = math.fsum(tl.volume_m3 for tl in feeding)
        density = usable / vol if vol > 0 else None
        taxi = self.burn_mass(fuel, "taxi", density)
        trip = self.burn_mass(fuel, "trip", density)
        fed = "the feeding tanks" if seq == BURN_TANK_ORDER else "the fuel tanks"
        unit = self.du.volume if density is not None and self._volume_basis() else self.du.mass

        def show(kg):
            return _q(kg / density, unit) if unit == self.du.volume else _q(kg, unit)

        if trip > usable * (1 + 1e-12):
            raise self.err("fuel.trip", self._raw_value(fuel.get("trip")),
                           f"at most the usable fuel on board in {fed}, {show(usable)}",
                           hint="Add fuel or reduce the trip fuel", entry=fuel.get("trip"))
        if taxi + trip > usable * (1 + 1e-12):
            raise self.err("fuel.taxi", self._raw_value(fuel.get("taxi")),
                           f"taxi and trip fuel together ({show(taxi + trip)}) at most the "
                           f"usable fuel on board in {fed}, {show(usable)}",
                           hint="Add fuel or reduce the taxi or trip fuel",
                           entry=fuel.get("taxi"))
        return loads, taxi, trip, seq, order

    def _volume_basis(self) -> bool:
        return any(t.basis == "volume" for t in self.t.tanks)

    @staticmethod
    def _raw_value(v):
        if isinstance(v, dict) and "_value" in v:
            return v["_value"]
        return v

    def burn_mass(self, fuel: Mapping, key: str, density: float | None) -> float:
        entry = fuel.get(key)
        if entry is None:
            return 0.0
        value = self._raw_value(entry)
        field = f"fuel.{key}"
        default = self.du.volume if self._volume_basis() else self.du.mass
        try:
            q, dim = U.parse_quantity_of(value, ("volume", "mass"), default, field=field)
        except InputError as exc:
            raise self._unit(exc, field, entry) from None
        if q < 0:
            raise self.err(field, value, f"expected a {dim} of 0 or more", entry=entry)
        if dim == "mass":
            return q
        if density is None:
            if q == 0:
                return 0.0
            raise self.err(field, value, "a fuel quantity needs fuel on board in the tanks "
                           "that feed", entry=entry)
        return q * density

    def tank(self, name, spec) -> TankLoad:
        entry = spec if isinstance(spec, dict) else None
        path = f"fuel.tanks[{name!r}]"
        try:
            tank = self.t.tank(name)
        except NotFoundError:
            known = ", ".join(t.name for t in self.t.tanks) or "none"
            raise self.err("fuel.tanks", name, f"unknown tank; type {self.t.name} has: {known}",
                           entry=entry) from None
        path = f"fuel.tanks[{tank.name!r}]"
        if isinstance(spec, dict):
            self.keys(spec, path, _TANK_KEYS)
            if "quantity" not in spec:
                raise self.err(f"{path}.quantity", _MISSING, "required: the usable fuel "
                               "loaded, a volume or a mass", entry=entry)
            qty_raw = spec["quantity"]
        else:
            qty_raw, spec = spec, {}
        qfield = f"{path}.quantity" if entry is not None else path
        default = self.du.volume if tank.basis == "volume" else self.du.mass
        try:
            qty, dim = U.parse_quantity_of(qty_raw, ("volume", "mass"), default, field=qfield)
        except InputError as exc:
            raise self._unit(exc, qfield, entry) from None
        if qty < 0:
            raise self.err(qfield, qty_raw, f"expected a {dim} of 0 or more", entry=entry)
        density, source, temp, rho15 = self.density(tank, spec, path, entry)
        if dim == "mass":
            mass, volume = qty, qty / density
        else:
            mass, volume = qty * density, qty
        # Capacity in the tank's own basis; the unusable fuel is in the empty weight already.
        if tank.basis == "volume":
            room = tank.capacity - tank.unusable
            loaded, unit = volume, self.du.volume
        else:
            room = tank.capacity - tank.unusable
            loaded, unit = mass, self.du.mass
        if loaded > room * (1 + 1e-12):
            extra = (f" (capacity {_q(tank.capacity, unit)} less {_q(tank.unusable, unit)} "
                     f"unusable, which the empty weight includes)" if tank.unusable else "")
            raise self.err(qfield, qty_raw,
                           f"at most the usable capacity of tank '{tank.name}', "
                           f"{_q(room, unit)}{extra}",
                           hint=f"Reduce the fuel by {_q(loaded - room, unit)}", entry=entry)
        return TankLoad(tank.name, mass, volume, density, source, temp, rho15)

    def density(self, tank, spec: Mapping, path: str, entry):
        if "density" in spec and "temperature" in spec:
            raise self.err(f"{path}.temperature", spec["temperature"],
                           "either density or temperature, not both", entry=entry)
        if "density_15c" in spec and "temperature" not in spec:
            raise self.err(f"{path}.density_15c", spec["density_15c"],
                           "only with temperature (the density at 15 °C is corrected to it)",
                           entry=entry)
        if "density" in spec:
            f = f"{path}.density"
            try:
                rho = U.parse_density(spec["density"], self.du.density_unit, field=f)
            except InputError as exc:
                raise self._unit(exc, f, entry) from None
            if rho <= 0:
                raise self.err(f, spec["density"], "expected a density greater than 0",
                               entry=entry)
            return rho, "given", None, None
        if "temperature" in spec:
            from ledger.core.fuel import density_at_temperature
            from ledger.typedata.model import FLUIDS

            f = f"{path}.temperature"
            try:
                t_c = U.parse_temperature(spec["temperature"], "degC", field=f)
            except InputError as exc:
                raise self._unit(exc, f, entry) from None
            group = FLUIDS[tank.fluid].vcf_group
            if group is None:
                raise self.err(f, spec["temperature"], f"a density instead: no temperature "
                               f"correction is known for {tank.fluid}", entry=entry)
            rho15 = tank.density_kg_m3
            if "density_15c" in spec:
                f15 = f"{path}.density_15c"
                try:
                    rho15 = U.parse_density(spec["density_15c"], self.du.density_unit,
                                            field=f15)
                except InputError as exc:
                    raise self._unit(exc, f15, entry) from None
            try:
                rho = float(density_at_temperature(rho15, t_c, group))
            except InputError as exc:
                bad = spec["temperature"] if exc.field.startswith("t_c") else \
                    spec.get("density_15c", _q(rho15, "kg/m3"))
                raise self.err(f if exc.field.startswith("t_c") else f"{path}.density_15c",
                               bad, exc.allowed, exc.hint, entry) from None
            return rho, "temperature", t_c, rho15
        return tank.density_kg_m3, ("type" if tank.density_from_file else "nominal"), None, None

    def burn(self, value, loads: Sequence[TankLoad], fuel_tanks) -> tuple[str, list[str]]:
        with_fuel = [tl.tank for tl in loads if tl.mass_kg > 0
                     and any(t.name == tl.tank for t in fuel_tanks)]
        entry = value if isinstance(value, dict) else None
        value = self._raw_value(value)
        if value == BURN_PROPORTIONAL:
            return BURN_PROPORTIONAL, with_fuel
        if isinstance(value, str) or not isinstance(value, list) or not value:
            raise self.err("fuel.burn", value, "expected 'proportional' or a list of tanks "
                           "drained in order, e.g. [\"left\", \"right\"]", entry=entry)
        order: list[str] = []
        names = [t.name for t in fuel_tanks]
        for i, name in enumerate(value):
            f = f"fuel.burn[{i}]"
            match = [t.name for t in fuel_tanks
                     if isinstance(name, str) and t.name.casefold() == name.strip().casefold()]
            if not match:
                raise self.err(f, name, f"a fuel tank of type {self.t.name}: "
                               f"{', '.join(names) or 'none'}", entry=entry)
            if match[0] in order:
                raise self.err(f, name, "each tank once in the burn order", entry=entry)
            order.append(match[0])
        return BURN_TANK_ORDER, order


def parse_plan(raw: Mapping[str, Any], vtype, *, source: str = "plan",
               disabled_stations: Sequence[str] | None = None) -> Plan:
    """Check a raw plan against ``vtype`` and return it in SI.

    Parameters
    ----------
    raw : mapping
        From :func:`read_plan_file`, :func:`read_plan_text`, :func:`plan_from_options` or
        :func:`merge_options`.
    vtype : VehicleType
        The type of the vehicle the plan names. Bare numbers take its display units.
    source : str
        The file name (or ``"command line"``), shown in error messages.
    disabled_stations : sequence of str, optional
        Stations the plan's configuration takes out of use, when the configuration is one
        recorded for the vehicle rather than in the type file (default: looked up in the type).

    Returns
    -------
    Plan

    Raises
    ------
    PlanError
        Unknown seat, station or tank; two people in one seat; fuel over a tank's usable
        capacity; trip fuel above the usable fuel that feeds; taxi and trip fuel above it; a
        non-finite or negative mass; an unknown standard mass set or envelope category.
    """
    return _Checker(raw, vtype, source, disabled_stations).parse()


def load_plan(path: str | Path, vtype, *, max_size: int | None = None) -> Plan:
    """Read and check a plan file in one call (the file must name a vehicle of ``vtype``)."""
    return parse_plan(read_plan_file(path, max_size=max_size), vtype, source=str(path))

