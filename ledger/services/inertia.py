"""The loaded-inertia report of one vehicle (``wbledger inertia``).

Reads the empty state, the installed items and the configuration from the store and the plan
from its file, takes the plan's fuel at the chosen phase from the loading sheet
(:func:`ledger.loadsheet.build.build_sheet`, so that both agree), and builds the
``wbledger.inertia/1`` document with :func:`ledger.analysis.inertia.inertia_document`. The
document carries the caution; :mod:`ledger.report.inertia` renders it.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any, cast

from sqlalchemy.engine import Engine

from ledger.analysis.inertia import (
    InertiaDocument,
    MassItem,
    default_phase,
    inertia_document,
    phase_tank_masses,
    plan_mass_items,
)
from ledger.errors import InputError
from ledger.loadsheet.build import build_sheet
from ledger.services.database import unit_of_work
from ledger.store.catalog import get_vehicle, vehicle_type
from ledger.store.configs import configuration_items
from ledger.store.entries import EmptyState, current_empty, installed_items
from ledger.typedata import VehicleType
from ledger.typedata.plan import Plan, parse_plan, plan_vehicle, read_plan_file
from ledger.units import parse_length

__all__ = ["InertiaReport", "inertia_report"]


@dataclass(frozen=True)
class InertiaReport:
    """The loaded inertia of one vehicle: the ``wbledger.inertia/1`` document, with its caution.

    ``document`` is what ``--json`` prints and the renderers read.
    """

    document: InertiaDocument

    @property
    def caution(self) -> str:
        return self.document["caution"]


def inertia_report(engine: Engine, registration: str, *, config: str | None = None,
                   plan: Path | None = None, phase: str | None = None,
                   assume_z: str | None = None, as_of: str | None = None,
                   max_size: int | None = None) -> InertiaReport:
    """Mass, CG and inertia of ``registration`` loaded as ``plan`` (or empty), about its CG.

    Parameters
    ----------
    engine : Engine
        The ledger's database (:func:`ledger.services.database.open_database`).
    registration : str
        The vehicle.
    config : str, optional
        Configuration to apply; by default the plan's, if any.
    plan : Path, optional
        Loading plan file (TOML): its persons, cargo and fuel are added.
    phase : str, optional
        Fuel state with a plan (default: take-off for an aircraft, departure for a ground
        vehicle).
    assume_z : str, optional
        Vertical arm, as the user typed it, for every item without one (listed in the report).
    as_of : str, optional
        Use the ledger as it stood on this date (``YYYY-MM-DD``).
    max_size : int, optional
        Largest plan file read, bytes.

    Raises
    ------
    LedgerError
        Unknown vehicle or configuration, a plan for another vehicle or configuration, bad
        input, or figures the inertia builder refuses.
    """
    with unit_of_work(engine) as session:
        vehicle = get_vehicle(session, registration)
        row, parsed_type = vehicle_type(session, vehicle)
        vtype = cast(VehicleType, parsed_type)
        empty = current_empty(session, registration, as_of=as_of)
        installed = installed_items(session, registration, as_of=as_of)
        parsed = None if plan is None else _read_plan(plan, registration, vtype, config,
                                                      max_size)
        name = config or (parsed.configuration if parsed is not None else None)
        cfg = configuration_items(session, registration, name, as_of=as_of) if name else None
    z = None if assume_z is None else parse_length(assume_z, vtype.units.length,
                                                   field="--assume-z")
    loads: list[MassItem] = []
    sheet_phase = None
    if parsed is not None:
        use = phase or default_phase(vtype)
        sheet = build_sheet(vtype, empty, parsed,
                            configuration_items=None if cfg is None else cfg.items,
                            type_revision=row.revision, registration=registration,
                            with_fixes=False, samples=2)
        loads = plan_mass_items(parsed, vtype, tank_masses=phase_tank_masses(sheet, use, vtype))
        sheet_phase = next((p for p in sheet["phases"] if p["name"] == use), None)
    doc = inertia_document(
        vtype, empty.mass_kg, empty.cg_m, installed=installed, configuration=cfg,
        loads=loads, assume_z_m=z,
        vehicle={"registration": registration, "type": vtype.name,
                 "type_revision": row.revision, "kind": vtype.kind, "title": vtype.title},
        condition=_condition(name, plan, phase, vtype, parsed, empty, sheet_phase))
    return InertiaReport(doc)


def _read_plan(path: Path, registration: str, vtype: VehicleType, config: str | None,
               max_size: int | None) -> Plan:
    """The plan file, checked to be for this vehicle and this configuration."""
    raw = read_plan_file(path, max_size=max_size)
    named = plan_vehicle(raw, str(path))
    if named != registration:
        raise InputError("vehicle", named, f"the vehicle of the command, {registration!r}",
                         source=str(path))
    parsed = parse_plan(raw, vtype, source=str(path))
    if config is not None and parsed.configuration not in (None, config):
        raise InputError("--configuration", config, f"the plan's configuration "
                         f"{parsed.configuration!r}, or no --configuration")
    return parsed


def _condition(name: str | None, plan: Path | None, phase: str | None, vtype: VehicleType,
               parsed: Plan | None, empty: EmptyState, sheet_phase: Mapping[str, Any] | None
               ) -> dict[str, Any]:
    """The ``condition`` section: what was loaded, at which phase, on which empty weight."""
    return {"configuration": name, "plan": None if plan is None else str(plan),
            "phase": (phase or default_phase(vtype))
            if parsed is not None and parsed.tanks else None,
            "empty_entry_seq": empty.seq,
            "empty_entry_date": empty.entry_date.isoformat(),
            "sheet_phase_mass_kg": None if sheet_phase is None else sheet_phase["mass_kg"]}

