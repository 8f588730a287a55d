"""The raw plan: a plan file or the quick command-line options, before the type is known."""

from __future__ import annotations

import tomllib
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from ledger import units as U
from ledger.bounds import load_toml
from ledger.errors import InputError, PlanError
from ledger.files import INPUT_LIMIT, read_input_text
from ledger.typedata._messages import _MISSING, _show
from ledger.typedata.plan.model import BURN_PROPORTIONAL, PLAN_FORMAT

_TOP_KEYS = ("plan_format", "vehicle", "configuration", "category", "standard_masses",
             "prepared_by", "axle_rules", "note", "person", "cargo", "fuel")
_PERSON_KEYS = ("seat", "mass", "name", "class")
_CARGO_KEYS = ("station", "mass", "what", "x")
_FUEL_KEYS = ("tanks", "taxi", "trip", "burn")
_TANK_KEYS = ("quantity", "density", "temperature", "density_15c")
_OPTION = "_option"  # raw entries made from a command-line option remember it here

_CLASSES = ("flight_crew", "cabin_crew", "adult", "child")


def read_plan_text(text: str, source: str = "plan") -> dict:
    r"""Parse plan TOML text into the raw plan dict (no checks against a type yet).

    Raises
    ------
    PlanError
        Not TOML, or a plan_format other than :data:`PLAN_FORMAT`.
    InputError
        Nesting, a number or a text out of the bounds of :mod:`ledger.bounds`.

    Examples
    --------
    >>> raw = read_plan_text('plan_format = 1\nvehicle = "KV-101"\n', "p.toml")
    >>> plan_vehicle(raw, "p.toml")
    'KV-101'
    >>> twice = 'plan_format = 1\nvehicle = "A"\nvehicle = "B"'
    >>> read_plan_text(twice, "p.toml")  # doctest: +ELLIPSIS, +NORMALIZE_WHITESPACE
    Traceback (most recent call last):
    ...
    ledger.errors.PlanError: plan file = 'p.toml': not valid TOML: Cannot overwrite a value ...
    A key may appear once in a table; for several people or loads write several [[person]] or ...
    tables
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
        raise PlanError("plan_format", _show(version, limit=None),
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
        raise PlanError("vehicle", _show(reg, limit=None), "expected a registration (a string)",
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
        raise PlanError(option, _show(text, limit=None), f"expected {what}")
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

