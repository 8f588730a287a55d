"""Checking a raw plan against its vehicle's type: seats, stations, masses, fuel."""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from pathlib import Path
from typing import Any

from ledger import units as U
from ledger.bounds import TEXT_MAX, item_field, shown
from ledger.errors import InputError, NotFoundError, PlanError
from ledger.typedata._messages import _MISSING, _show
from ledger.typedata.plan._fuel import _FuelChecker, _q
from ledger.typedata.plan.model import ACTUAL, CargoLoad, Person, Plan
from ledger.typedata.plan.raw import (
    _CARGO_KEYS,
    _CLASSES,
    _OPTION,
    _PERSON_KEYS,
    _TOP_KEYS,
    plan_vehicle,
    read_plan_file,
)


class _Checker(_FuelChecker):
    """Checks a raw plan against a vehicle type, section by section."""

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
        return PlanError(field, _show(value, limit=None), allowed, hint=hint, source=self.source)

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
            path = item_field("person", i)
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
            path = item_field("cargo", i)
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

