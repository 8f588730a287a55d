"""``wbledger inertia REG``: mass, CG and inertia of the loaded vehicle about its CG.

A thin adapter: it reads the empty state, the installed items and the configuration from the
store and the plan from its file, asks :mod:`ledger.loadsheet.build` for the fuel at the chosen
phase, builds the report with :func:`ledger.analysis.inertia.inertia_document` and renders it
with :mod:`ledger.report.inertia` (terminal, ``--json``, ``--csv FILE``).
"""

from __future__ import annotations

from pathlib import Path

import typer

from ledger.cli import common
from ledger.files import INPUT_LIMIT

HELP = (
    "Loaded inertia about the loaded CG in body axes (x forward, y right, z down).\n\n"
    "Mass, CG, Ixx, Iyy, Izz, the products of inertia (positive-product convention, "
    "Ixy = Σ m·x·y), principal moments and axes, radii of gyration, the source of the empty "
    "vehicle's own inertia (measured, or an ESTIMATE from radii of gyration) and each item's "
    "share of each moment, with the caution. --json prints the document; --csv FILE writes "
    "the figures for simulation tools.")


def register(app: typer.Typer) -> None:
    app.command("inertia", help=HELP)(inertia)


def inertia(
    ctx: typer.Context,
    registration: str = typer.Argument(..., metavar="REG", help="The vehicle."),
    config: str = typer.Option(None, "--config", metavar="NAME",
                               help="Configuration to apply (default: the plan's, if any)."),
    plan: Path = typer.Option(None, "--plan", metavar="FILE",
                              help="Loading plan (TOML): persons, cargo and fuel are added."),
    phase: str = typer.Option(
        None, "--phase", metavar="PHASE",
        help="Fuel state with --plan: zero_fuel, ramp, takeoff (default) or landing for an "
        "aircraft; departure (default) or arrival for a ground vehicle."),
    assume_z: str = typer.Option(
        None, "--assume-z", metavar="LENGTH",
        help="Vertical arm for every item (and the empty vehicle) with none recorded; the "
        "report lists them. Without it such items are refused."),
    as_of: str = typer.Option(None, "--as-of", metavar="YYYY-MM-DD",
                              help="Use the ledger as it stood on this date."),
    csv_file: Path = typer.Option(None, "--csv", metavar="FILE",
                                  help="Also write the figures as CSV for simulation tools."),
    csv_layout: str = typer.Option("long", "--csv-layout", metavar="LAYOUT",
                                   help="long: one row per quantity; wide: one header row "
                                   "and one value row."),
    max_size: str = common.max_size_option(INPUT_LIMIT),
    as_json: bool = common.JSON_OPTION,
) -> None:
    """Loaded inertia about the loaded CG in body axes (x forward, y right, z down)."""
    from ledger.analysis.inertia import (
        default_phase,
        inertia_document,
        phase_tank_masses,
        plan_mass_items,
    )
    from ledger.errors import InputError
    from ledger.report.inertia import CSV_LAYOUTS, render_inertia, write_inertia_csv
    from ledger.store.catalog import get_vehicle, vehicle_type
    from ledger.store.configs import configuration_items
    from ledger.store.db import session_scope
    from ledger.store.entries import current_empty, installed_items
    from ledger.typedata.plan import parse_plan, plan_vehicle, read_plan_file
    from ledger.units import parse_length

    limit = common.size_limit(max_size)
    if csv_layout not in CSV_LAYOUTS:
        raise InputError("--csv-layout", csv_layout, "one of " + ", ".join(CSV_LAYOUTS))
    if phase is not None and plan is None:
        raise InputError("--phase", phase, "only with --plan (the phase picks its fuel)")
    with session_scope(common.state(ctx).engine()) as session:
        vehicle = get_vehicle(session, registration)
        row, vtype = vehicle_type(session, vehicle)
        empty = current_empty(session, registration, as_of=as_of)
        installed = installed_items(session, registration, as_of=as_of)
        parsed = None
        if plan is not None:
            raw = read_plan_file(plan, max_size=limit)
            named = plan_vehicle(raw, str(plan))
            if named != registration:
                raise InputError("vehicle", named, f"the vehicle of the command, "
                                 f"{registration!r}", source=str(plan))
            parsed = parse_plan(raw, vtype, source=str(plan))
            if config is not None and parsed.configuration not in (None, config):
                raise InputError("--config", config, f"the plan's configuration "
                                 f"{parsed.configuration!r}, or no --config")
        name = config or (parsed.configuration if parsed is not None else None)
        cfg = configuration_items(session, registration, name, as_of=as_of) if name else None
    z = None if assume_z is None else parse_length(assume_z, vtype.units.length,
                                                   field="--assume-z")
    loads, sheet_phase = [], None
    if parsed is not None:
        from ledger.loadsheet.build import build_sheet

        use = phase or default_phase(vtype)
        sheet = build_sheet(vtype, empty, parsed,
                            configuration_items=None if cfg is None else cfg.items,
                            type_revision=row.revision, registration=registration,
                            with_fixes=False, samples=2)
        loads = plan_mass_items(parsed, vtype,
                                tank_masses=phase_tank_masses(sheet, use, vtype))
        sheet_phase = next((p for p in sheet["phases"] if p["name"] == use), None)
    doc = inertia_document(
        vtype, empty.mass_kg, empty.cg_m, installed=installed, configuration=cfg,
        loads=loads, assume_z_m=z,
        vehicle={"registration": registration, "type": vtype.name,
                 "type_revision": row.revision, "kind": vtype.kind, "title": vtype.title},
        condition={"configuration": name, "plan": None if plan is None else str(plan),
                   "phase": (phase or default_phase(vtype))
                   if parsed is not None and parsed.tanks else None,
                   "empty_entry_seq": empty.seq,
                   "empty_entry_date": empty.entry_date.isoformat(),
                   "sheet_phase_mass_kg": None if sheet_phase is None
                   else sheet_phase["mass_kg"]})
    if csv_file is not None:
        write_inertia_csv(doc, csv_file, csv_layout)
    common.emit(doc, render_inertia, as_json)
    if csv_file is not None and not as_json:
        typer.echo(f"CSV ({csv_layout}) written to {csv_file}")
