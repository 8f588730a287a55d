"""The weight-and-balance record of one vehicle, as a maintenance shop files it.

Each weighing with its scale readings, every equipment change with its reason, reference and
signatory, the running empty mass, moment and CG after each entry, and the equipment the ledger
has installed now, each item with its mass and arm (common practice; the content of the record
follows the FAA Aircraft Weight and Balance Handbook, FAA-H-8083-1, on keeping the empty-weight
record up to date).

Figures are given in the type's display units (``*_display`` fields: mass unit, length unit,
moment index) beside the SI values they come from. The record is built only on a ledger whose
evidence verifies (:func:`ledger.store.evidence.require_vehicle`): a paper copy with signature
lines must never carry figures from a chain that was changed behind wbledger's back, so an
unverified vehicle is refused (``ChainError``) exactly as a loading sheet is, rather than
printed with a warning that a signature would then cover.
"""

from __future__ import annotations

import datetime as dt
from dataclasses import asdict, dataclass
from typing import Any

from sqlalchemy.engine import Engine

from ledger.caution import CAUTION
from ledger.services.database import unit_of_work
from ledger.store.entry_reads import entries_of, installed_items
from ledger.store.heads import vehicle_key
from ledger.store.records import Entry
from ledger.store.typeinfo import type_info
from ledger.units import to_unit

__all__ = ["RecordUnits", "ScaleReading", "RecordEntry", "EquipmentItem", "MaintenanceRecord",
           "maintenance_record"]


@dataclass(frozen=True)
class RecordUnits:
    """The display units of the record: mass, length, and the moment index (the moment in
    ``moment`` divided by ``moment_divisor``)."""

    mass: str
    length: str
    moment: str
    moment_divisor: float

    @property
    def moment_label(self) -> str:
        """``lb*in/1000``, or ``kg*m`` when the divisor is 1."""
        d = self.moment_divisor
        return self.moment + (f"/{d:g}" if d != 1 else "")

    def mass_of(self, kg: float) -> float:
        return float(to_unit(kg, self.mass))

    def length_of(self, m: float) -> float:
        return float(to_unit(m, self.length))

    def index(self, kgm: float) -> float:
        return float(to_unit(kgm, self.moment)) / self.moment_divisor


@dataclass(frozen=True)
class ScaleReading:
    """One weighing point: reading, tare and net mass (display unit) and its arm."""

    point: str
    reading: float
    tare: float
    net: float
    arm: float
    lateral_arm: float


@dataclass(frozen=True)
class RecordEntry:
    """One line of the record: what was done, by whom and why, the change to the empty vehicle
    (``change_*``; for a weighing, none: it starts a new baseline) and the running state after
    it. Masses in the mass unit, arms and CG in the length unit, moments as the index."""

    seq: int
    entry_date: str
    kind: str
    item: str | None
    reverses_seq: int | None
    reason: str | None
    reference: str | None
    signatory: str
    item_mass: float | None
    item_arm: float | None
    change_mass: float
    change_moment: float
    empty_mass: float
    empty_moment: float
    cg: float
    empty_mass_kg: float
    empty_mx_kgm: float
    cg_x_m: float
    readings: tuple[ScaleReading, ...] = ()
    scales: str | None = None
    level: str | None = None
    note: str | None = None
    entry_hash: str = ""

    @property
    def added(self) -> bool | None:
        """True for mass added, False for mass removed, None for a weighing."""
        if self.kind in ("weighing", "cg_height"):
            return None
        return self.change_mass >= 0


@dataclass(frozen=True)
class EquipmentItem:
    """An item the ledger has installed and not removed since, with its mass and arms."""

    name: str
    mass: float
    arm: float
    lateral_arm: float
    moment: float
    seq: int
    entry_date: str


@dataclass(frozen=True)
class MaintenanceRecord:
    """The whole record of one vehicle, its ledger chain verified."""

    registration: str
    type_name: str
    type_revision: int
    type_title: str
    serial: str | None
    units: RecordUnits
    entries: tuple[RecordEntry, ...]
    equipment: tuple[EquipmentItem, ...]
    head_hash: str | None
    caution: str = CAUTION

    @property
    def weighings(self) -> tuple[RecordEntry, ...]:
        return tuple(e for e in self.entries if e.kind == "weighing")

    @property
    def current(self) -> RecordEntry | None:
        return self.entries[-1] if self.entries else None

    def to_dict(self) -> dict[str, Any]:
        """The JSON document of ``wbledger record --json`` (display units, SI beside)."""
        doc = asdict(self)
        doc["units"]["moment_label"] = self.units.moment_label
        doc["verified"] = True
        return doc


def _readings(entry: Entry, u: RecordUnits) -> tuple[ScaleReading, ...]:
    points = (entry.detail.get("points") or {}) if entry.kind == "weighing" else {}
    return tuple(ScaleReading(name, u.mass_of(p["reading_kg"]), u.mass_of(p["tare_kg"]),
                              u.mass_of(p["net_kg"]), u.length_of(p["x_m"]),
                              u.length_of(p.get("y_m") or 0.0))
                 for name, p in points.items())


def _line(e: Entry, u: RecordUnits) -> RecordEntry:
    detail = e.detail if e.kind == "weighing" else {}
    return RecordEntry(
        seq=e.seq, entry_date=e.entry_date.isoformat(), kind=e.kind, item=e.item,
        reverses_seq=e.reverses_seq, reason=e.reason, reference=e.reference,
        signatory=e.actor,
        item_mass=None if e.item_mass_kg is None else u.mass_of(e.item_mass_kg),
        item_arm=None if e.item_x_m is None else u.length_of(e.item_x_m),
        change_mass=0.0 if e.kind == "weighing" else u.mass_of(e.delta_mass_kg),
        change_moment=0.0 if e.kind == "weighing" else u.index(e.delta_mx_kgm),
        empty_mass=u.mass_of(e.empty_mass_kg), empty_moment=u.index(e.empty_mx_kgm),
        cg=u.length_of(e.cg_x_m), empty_mass_kg=e.empty_mass_kg, empty_mx_kgm=e.empty_mx_kgm,
        cg_x_m=e.cg_x_m, readings=_readings(e, u), scales=detail.get("scales"),
        level=detail.get("level"), note=detail.get("note"), entry_hash=e.entry_hash)


def maintenance_record(engine: Engine, registration: str, *,
                       as_of: dt.date | str | None = None) -> MaintenanceRecord:
    """The weight-and-balance record of ``registration`` (as it stood on ``as_of``, if given).

    Raises
    ------
    NotFoundError
        Unknown vehicle.
    ChainError
        The vehicle's evidence does not verify (``wbledger verify REG`` says why).
    """
    from ledger.store.catalog import get_vehicle
    from ledger.store.evidence import require_vehicle

    with unit_of_work(engine) as session:
        key = vehicle_key(session, registration)
        require_vehicle(session, key)
        vehicle = get_vehicle(session, key.registration)
        info = type_info(session, vehicle.type_id)
        du = info.vtype.units
        u = RecordUnits(du.mass, du.length, du.moment_unit, float(du.moment_divisor))
        entries = entries_of(session, key.registration, as_of=as_of)
        items = installed_items(session, key.registration, as_of=as_of)
    equipment = tuple(EquipmentItem(i.name, u.mass_of(i.mass_kg), u.length_of(i.x_m),
                                    u.length_of(i.y_m or 0.0), u.index(i.mass_kg * i.x_m),
                                    i.seq, i.entry_date.isoformat())
                      for i in sorted(items, key=lambda i: i.seq))  # in the order installed
    return MaintenanceRecord(
        registration=key.registration, type_name=info.name, type_revision=info.revision,
        type_title=info.vtype.title, serial=vehicle.serial, units=u,
        entries=tuple(_line(e, u) for e in entries), equipment=equipment,
        head_hash=entries[-1].entry_hash if entries else None)
