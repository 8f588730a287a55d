"""Configurations: named groups of removable items switched together (seats out, stretcher in,
cargo pod), applied by a loading sheet or an inertia report on top of the empty vehicle.

A configuration belongs to a type or to one vehicle. A type's configurations come from its
type file (``[[configuration]]``) and from the database (``wbledger config define --type``);
a vehicle adds its own (``--vehicle``), and a vehicle configuration with the same name as one
of its type's replaces it for that vehicle. A database configuration may not take the name of
one in the type file.

Each item is *installed* (added to the empty vehicle) or *removed* (it is part of the vehicle
as weighed and is taken out). A removed item may be named without a mass: its mass, arms and
shape are then taken from the vehicle's ledger when the configuration is applied, so it must be
installed there (``wbledger install``).
"""

from __future__ import annotations

import datetime as dt
import itertools
import json
import math
import re
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from typing import Any

from sqlalchemy import select
from sqlalchemy.orm import Session

from ledger.bounds import NAME_MAX, TEXT_MAX, check_text, item_field
from ledger.errors import ChainError, ConflictError, InputError, NotFoundError
from ledger.store.chain import GENESIS_HASH, canonical_json
from ledger.store.models import ConfigurationRow, VehicleRow, VehicleTypeRow
from ledger.store.roles import recorder
from ledger.store.seal import configuration_seal

__all__ = [
    "ConfigItemView",
    "ConfigurationView",
    "parse_item_spec",
    "define_configuration",
    "list_configurations",
    "get_configuration",
    "configuration_items",
    "configuration_document",
]

ACTIONS = ("install", "remove")


@dataclass(frozen=True)
class ConfigItemView:
    """One item of a configuration, SI. ``mass_kg`` is the item's own mass (0 or more); the
    change to the vehicle is :attr:`signed_mass_kg`. A removed item still to be looked up in the
    ledger has ``mass_kg`` None (``from_ledger`` True) until resolved."""

    name: str
    action: str
    mass_kg: float | None
    x_m: float | None
    y_m: float | None
    z_m: float | None
    shape: dict | None = None
    from_ledger: bool = False

    @property
    def sign(self) -> int:
        return 1 if self.action == "install" else -1

    @property
    def signed_mass_kg(self) -> float | None:
        return None if self.mass_kg is None else self.sign * self.mass_kg

    def to_dict(self) -> dict:
        return {"name": self.name, "action": self.action, "mass_kg": self.mass_kg,
                "x_m": self.x_m, "y_m": self.y_m, "z_m": self.z_m, "shape": self.shape,
                "from_ledger": self.from_ledger}


@dataclass(frozen=True)
class ConfigurationView:
    """A configuration as defined (or, from :func:`configuration_items`, resolved for one
    vehicle). ``source`` is ``"type file"``, ``"type"`` or ``"vehicle"``."""

    name: str
    source: str
    owner: str
    description: str
    items: tuple[ConfigItemView, ...]
    disables_stations: tuple[str, ...] = ()
    created_by: str | None = None
    created_at: dt.datetime | None = None
    resolved_for: str | None = field(default=None)

    @property
    def mass_change_kg(self) -> float | None:
        """Signed change of empty mass, or None while an item is unresolved."""
        masses = [i.signed_mass_kg for i in self.items]
        return None if any(m is None for m in masses) else math.fsum(masses)

    def moments_change_kgm(self) -> tuple[float, float, float | None] | None:
        """Signed change of (Σm·x, Σm·y, Σm·z or None if an item has no vertical arm)."""
        if self.mass_change_kg is None:
            return None
        mx = math.fsum(i.signed_mass_kg * i.x_m for i in self.items)
        my = math.fsum(i.signed_mass_kg * (i.y_m or 0.0) for i in self.items)
        if any(i.z_m is None for i in self.items):
            return (mx, my, None)
        return (mx, my, math.fsum(i.signed_mass_kg * i.z_m for i in self.items))

    def to_dict(self) -> dict:
        mom = self.moments_change_kgm()
        return {"name": self.name, "source": self.source, "owner": self.owner,
                "description": self.description,
                "items": [i.to_dict() for i in self.items],
                "disables_stations": list(self.disables_stations),
                "mass_change_kg": self.mass_change_kg,
                "mx_change_kgm": None if mom is None else mom[0],
                "my_change_kgm": None if mom is None else mom[1],
                "mz_change_kgm": None if mom is None else mom[2],
                "created_by": self.created_by,
                "created_at": None if self.created_at is None else _iso(self.created_at),
                "resolved_for": self.resolved_for}


def _iso(value: dt.datetime) -> str:
    if value.tzinfo is None:
        value = value.replace(tzinfo=dt.UTC)
    return value.astimezone(dt.UTC).isoformat()


_SPEC = re.compile(r"^\s*(?P<name>[^=@]+?)\s*(?:=\s*(?P<mass>[^@]+?)\s*@\s*(?P<arms>.+?))?\s*$")


def parse_item_spec(text: str, *, field: str = "--install") -> dict:
    """Split ``"NAME=MASS@X[,Y[,Z]]"`` (or a bare ``"NAME"``) into its parts, as text.

    Examples
    --------
    >>> parse_item_spec("stretcher=15 kg@3.1 m,0.2 m")
    {'name': 'stretcher', 'mass': '15 kg', 'x': '3.1 m', 'y': '0.2 m', 'z': None}
    >>> parse_item_spec("seat 3")
    {'name': 'seat 3', 'mass': None, 'x': None, 'y': None, 'z': None}
    >>> parse_item_spec("pod=40 kg")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    ledger.errors.InputError: --install = 'pod=40 kg': NAME=MASS@ARM[,LAT[,VERT]], e.g. ...
    """
    m = _SPEC.match(text or "")
    if not m or ("=" in text and m.group("mass") is None):
        raise InputError(field, text, "NAME=MASS@ARM[,LAT[,VERT]], e.g. 'stretcher=15 kg@120 "
                         "in', or NAME alone for an installed item to remove")
    arms = [a.strip() for a in m.group("arms").split(",")] if m.group("arms") else []
    if len(arms) > 3 or any(not a for a in arms):
        raise InputError(field, text, "at most three arms after '@': ARM[,LAT[,VERT]]")
    arms += [None] * (3 - len(arms))
    return {"name": m.group("name").strip(), "mass": m.group("mass"), "x": arms[0],
            "y": arms[1], "z": arms[2]}


def _in_force(session: Session, owner_filter, owner_kind: str,
              owner: str) -> dict[str, ConfigurationRow]:
    """The version in force (the newest) of each configuration of one owner, by name, once
    every configuration's chain of versions verifies.

    Raises
    ------
    ChainError
        A version was changed, removed or inserted outside wbledger.
    """
    from ledger.store.evidence import check_configuration_chain

    rows = session.scalars(select(ConfigurationRow).where(owner_filter)
                           .order_by(ConfigurationRow.name, ConfigurationRow.version)).all()
    out: dict[str, ConfigurationRow] = {}
    for name, group in itertools.groupby(rows, key=lambda r: r.name):
        group = list(group)
        why = check_configuration_chain(group, owner_kind, owner)
        if why:
            raise ChainError(f"the configurations of {owner} do not verify, so none is used: "
                             f"{why}. See `wbledger verify`")
        out[name] = group[-1]
    return out


def _type_row(session: Session, type_name: str) -> VehicleTypeRow:
    from ledger.store.catalog import type_revision

    type_revision(session, type_name)  # NotFoundError with the known types as a hint
    return session.scalar(select(VehicleTypeRow).where(VehicleTypeRow.name == type_name))


def _vtype_by_type_id(session: Session, type_id: int):
    from ledger.store.typeinfo import type_info

    return type_info(session, type_id).vtype


def _from_type_file(cfg, type_name: str) -> ConfigurationView:
    items = tuple(ConfigItemView(i.name, cfg.action, i.mass_kg, i.x_m, i.y_m, i.z_m,
                                 _shape_dict(i.shape)) for i in cfg.items)
    return ConfigurationView(cfg.name, "type file", type_name, cfg.description, items,
                             tuple(cfg.disables_stations))


def _shape_dict(shape) -> dict | None:
    if shape is None:
        return None
    import dataclasses

    return {k: v for k, v in dataclasses.asdict(shape).items() if v is not None}


def _from_row(row: ConfigurationRow, source: str, owner: str) -> ConfigurationView:
    data = json.loads(row.items_json)
    items = tuple(ConfigItemView(i["name"], i["action"], i.get("mass_kg"), i.get("x_m"),
                                 i.get("y_m"), i.get("z_m"), i.get("shape"),
                                 bool(i.get("from_ledger"))) for i in data.get("items", []))
    return ConfigurationView(row.name, source, owner, row.description or "", items,
                             tuple(data.get("disables_stations", [])), row.created_by,
                             row.created_at)


def _items_in_si(items: Sequence[Mapping[str, Any]], units) -> list[dict]:
    """The items of a configuration as stored: names checked, each once; masses and arms in SI
    (a bare number takes the type's display ``units``); a removed item without a mass is left
    to the ledger (``from_ledger``)."""
    from ledger.typedata.readings import parse_length, parse_mass, parse_shape, parse_text

    out_items = []
    seen = set()
    for j, raw in enumerate(items):
        action = raw.get("action")
        if action not in ACTIONS:
            raise InputError(f"{item_field('items', j)}.action", action, "install or remove")
        flag = f"--{action}"
        iname = parse_text(raw.get("name"), f"{flag} name", required=True)
        if iname in seen:
            raise InputError(flag, iname, "each item once per configuration")
        seen.add(iname)
        if raw.get("mass") is None:
            if action == "install":
                raise InputError(flag, iname, "NAME=MASS@ARM: an installed item needs its "
                                 "mass and arm")
            out_items.append({"name": iname, "action": action, "from_ledger": True})
            continue
        if raw.get("x") is None:
            raise InputError(flag, iname, "NAME=MASS@ARM: the arm is missing")
        item = {"name": iname, "action": action,
                "mass_kg": parse_mass(raw["mass"], units, f"{flag} {iname} mass"),
                "x_m": parse_length(raw["x"], units, f"{flag} {iname} arm"),
                "y_m": 0.0 if raw.get("y") is None else parse_length(raw["y"], units,
                                                                 f"{flag} {iname} lateral arm"),
                "z_m": None if raw.get("z") is None else parse_length(raw["z"], units,
                                                                  f"{flag} {iname} vertical arm"),
                "from_ledger": False}
        shape = parse_shape(raw.get("shape"), units, field=f"{flag} {iname} shape")
        if shape:
            item["shape"] = shape
        out_items.append(item)
    return out_items


def _check_removals(session: Session, items: Sequence[Mapping[str, Any]],
                    registration: str | None, type_id: int, owner: str) -> None:
    """Refuse a bare ``--remove NAME`` (mass and arms from the ledger) of an item the ledger
    does not show installed: on the vehicle, or (a type's configuration) on any vehicle of the
    type. Found here, not when the configuration is first applied (issue 13 item 9)."""
    from ledger.store.entries import installed_items

    bare = [it["name"] for it in items if it.get("from_ledger")]
    if not bare:
        return
    if registration is not None:
        regs, where = [owner], f"on {owner}"
    else:
        regs = list(session.scalars(select(VehicleRow.registration)
                                    .where(VehicleRow.type_id == type_id)
                                    .order_by(VehicleRow.registration)))
        where = f"on a vehicle of type {owner}"
    on = sorted({i.name for reg in regs for i in installed_items(session, reg)})
    for name in bare:
        if name not in on:
            known = ", ".join(repr(n) for n in on) or "none"
            raise InputError("--remove", name,
                             f"an item installed {where} by its ledger (installed: {known}); "
                             "record it with `wbledger install` first, or give "
                             "NAME=MASS@ARM for an item the ledger does not hold")


def define_configuration(session: Session, name: str, *, actor: str,
                         type_name: str | None = None, registration: str | None = None,
                         items: Sequence[Mapping[str, Any]] = (),
                         description: str | None = None,
                         disables_stations: Sequence[str] = (),
                         replace: bool = False) -> ConfigurationView:
    """Define (or with ``replace`` redefine) a configuration of a type or of one vehicle.

    Parameters
    ----------
    items : sequence of mappings
        ``{"name", "action": "install"|"remove", "mass", "x", "y"?, "z"?, "shape"?}``; values
        are SI numbers or user strings (a bare number takes the type's display unit). A
        ``remove`` item may leave out mass and arms: they come from the ledger when applied.
    disables_stations : sequence of str
        Stations of the type that cannot be loaded in this configuration.

    Raises
    ------
    InputError
        Neither or both owners, a bad name, an item without mass or arm, a duplicate item,
        an unknown station.
    ConflictError
        The name exists already (without ``replace``) or is one of the type file's.
    """
    from ledger.typedata.readings import parse_text

    cname = parse_text(name, "NAME", required=True, max_len=NAME_MAX)
    check_text("--by", actor, TEXT_MAX)
    if description is not None:
        check_text("--description", description)
    if (type_name is None) == (registration is None):
        raise InputError("--type/--vehicle", type_name or registration or "",
                         "exactly one owner: --type NAME or --vehicle REG")
    if registration is not None:
        from ledger.store.catalog import get_vehicle

        vehicle = get_vehicle(session, registration)
        owner_type_id, owner = vehicle.type_id, vehicle.registration
        owner_filter = ConfigurationRow.vehicle_id == vehicle.id
    else:
        trow = _type_row(session, type_name)
        owner_type_id, owner = trow.id, trow.name
        owner_filter = ConfigurationRow.type_id == trow.id
    vtype = _vtype_by_type_id(session, owner_type_id)
    if registration is None and any(c.name == cname for c in vtype.configurations):
        raise ConflictError(f"type {owner} has a configuration {cname!r} in its type file; "
                            "choose another name (or change the type file)")
    if not items and not disables_stations:
        raise InputError("--install/--remove", "", "at least one item or --disable-station")
    out_items = _items_in_si(items, vtype.units)
    _check_removals(session, out_items, registration, owner_type_id, owner)
    stations = [s.name for s in vtype.stations]
    for s in disables_stations:
        if s not in stations:
            raise InputError("--disable-station", s, "a station of the type: "
                             + (", ".join(stations) or "none"))
    text = canonical_json({"items": out_items, "disables_stations": list(disables_stations)})
    owner_kind = "vehicle" if registration else "type"
    actor = recorder(session.connection(), actor)
    current = _in_force(session, owner_filter, owner_kind, owner).get(cname)
    now = dt.datetime.now(dt.UTC)
    if current is not None and not replace:
        raise ConflictError(f"configuration {cname!r} of {owner} exists already; give "
                            "--replace to redefine it")
    # A redefinition is a new version; the one it replaces stays, as everything stored does.
    version = 1 if current is None else current.version + 1
    prev_hash = GENESIS_HASH if current is None else current.row_hash
    row = ConfigurationRow(name=cname, items_json=text, description=description,
                           created_at=now, created_by=actor,
                           type_id=None if registration else owner_type_id,
                           vehicle_id=vehicle.id if registration else None,
                           version=version, prev_hash=prev_hash,
                           row_hash=configuration_seal(
                               owner_kind=owner_kind, owner=owner, name=cname, version=version,
                               description=description, items_json=text, created_at=now,
                               created_by=actor, prev_hash=prev_hash))
    session.add(row)
    session.flush()
    return _from_row(row, "vehicle" if registration else "type", owner)


def list_configurations(session: Session, *, type_name: str | None = None,
                        registration: str | None = None) -> list[ConfigurationView]:
    """Configurations that apply to a vehicle (its type's and its own; its own replace the
    type's of the same name), or those of a type, or (neither given) every one."""
    if registration is not None:
        from ledger.store.catalog import get_vehicle

        vehicle = get_vehicle(session, registration)
        tname = session.scalar(select(VehicleTypeRow.name)
                               .where(VehicleTypeRow.id == vehicle.type_id))
        found = {c.name: c for c in list_configurations(session, type_name=tname)}
        for row in _in_force(session, ConfigurationRow.vehicle_id == vehicle.id, "vehicle",
                             vehicle.registration).values():
            found[row.name] = _from_row(row, "vehicle", vehicle.registration)
        return sorted(found.values(), key=lambda c: c.name)
    if type_name is not None:
        trow = _type_row(session, type_name)
        vtype = _vtype_by_type_id(session, trow.id)
        out = [_from_type_file(c, trow.name) for c in vtype.configurations]
        out += [_from_row(r, "type", trow.name) for r in _in_force(
            session, ConfigurationRow.type_id == trow.id, "type", trow.name).values()]
        return sorted(out, key=lambda c: c.name)
    out = []
    for tname in session.scalars(select(VehicleTypeRow.name).order_by(VehicleTypeRow.name)):
        out += list_configurations(session, type_name=tname)
    owners = session.execute(select(VehicleRow.id, VehicleRow.registration)
                             .where(VehicleRow.id.in_(select(ConfigurationRow.vehicle_id)))
                             .order_by(VehicleRow.registration)).all()
    for vid, reg in owners:
        out += [_from_row(r, "vehicle", reg) for r in _in_force(
            session, ConfigurationRow.vehicle_id == vid, "vehicle", reg).values()]
    return out


def get_configuration(session: Session, name: str, *, type_name: str | None = None,
                      registration: str | None = None) -> ConfigurationView:
    """One configuration of a vehicle (including its type's) or of a type."""
    if (type_name is None) == (registration is None):
        raise InputError("--type/--vehicle", type_name or registration or "",
                         "exactly one of --type NAME or --vehicle REG")
    found = list_configurations(session, type_name=type_name, registration=registration)
    for c in found:
        if c.name == name:
            return c
    folded = [c for c in found if c.name.casefold() == name.casefold()]
    if len(folded) == 1:
        return folded[0]
    known = ", ".join(c.name for c in found) or "none"
    raise NotFoundError(f"configuration of {registration or type_name}", name,
                        f"Known: {known}")


def configuration_items(session: Session, registration: str, name: str, *,
                        as_of: dt.date | str | None = None) -> ConfigurationView:
    """The configuration ``name`` of a vehicle with every item resolved: removed items named
    without a mass take the mass, arms and shape the ledger recorded when they were installed.

    Apply the result on top of :func:`ledger.store.entries.current_empty`: add each item's
    :attr:`ConfigItemView.signed_mass_kg` at its arms.

    Raises
    ------
    NotFoundError
        Unknown vehicle or configuration.
    ConflictError
        A removed item that is not installed on the vehicle.
    """
    from ledger.store.entry_reads import installed_items

    cfg = get_configuration(session, name, registration=registration)
    if not any(i.from_ledger for i in cfg.items):
        return ConfigurationView(cfg.name, cfg.source, cfg.owner, cfg.description, cfg.items,
                                 cfg.disables_stations, cfg.created_by, cfg.created_at,
                                 registration)
    on = {i.name: i for i in installed_items(session, registration, as_of=as_of)}
    items = []
    for it in cfg.items:
        if not it.from_ledger:
            items.append(it)
            continue
        inst = on.get(it.name)
        if inst is None:
            known = ", ".join(repr(n) for n in sorted(on)) or "none"
            raise ConflictError(f"configuration {cfg.name!r} removes {it.name!r}, which is not "
                                f"installed on {registration} by its ledger (installed: "
                                f"{known}); record it with `wbledger install` or give its mass "
                                "and arm in the configuration")
        items.append(ConfigItemView(it.name, "remove", inst.mass_kg, inst.x_m, inst.y_m,
                                    inst.z_m, inst.shape, True))
    return ConfigurationView(cfg.name, cfg.source, cfg.owner, cfg.description, tuple(items),
                             cfg.disables_stations, cfg.created_by, cfg.created_at,
                             registration)


def configuration_document(session: Session, view: ConfigurationView) -> dict:
    """``view.to_dict()`` plus the owner type's display units (``units``) for rendering."""
    from ledger.store.typeinfo import type_info

    if view.source == "vehicle":
        type_id = session.scalar(select(VehicleRow.type_id)
                                 .where(VehicleRow.registration == view.owner))
    else:
        type_id = session.scalar(select(VehicleTypeRow.id)
                                 .where(VehicleTypeRow.name == view.owner))
    units = type_info(session, type_id).vtype.units
    return {**view.to_dict(), "units": {"mass": units.mass, "length": units.length}}
