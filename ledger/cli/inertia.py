"""``wbledger inertia REG``: mass, CG and inertia of the loaded vehicle about its CG.

A thin adapter: it checks the options, asks :func:`ledger.services.inertia.inertia_report` for
the report and renders it with :mod:`ledger.report.inertia` (terminal, ``--json``,
``--csv FILE``).
"""

from __future__ import annotations

from pathlib import Path

import typer

from ledger.cli import common
from ledger.cli.conventions import examples
from ledger.files import INPUT_LIMIT

HELP = (
    "Loaded inertia about the loaded CG in body axes (x forward, y right, z down).\n\n"
    "Mass, CG, Ixx, Iyy, Izz, the products of inertia (positive-product convention, "
    "Ixy = Σ m·x·y), principal moments and axes, radii of gyration, the source of the empty "
    "vehicle's own inertia (measured, or an ESTIMATE from radii of gyration) and each item's "
    "share of each moment, with the caution. --json prints the document; --csv FILE writes "
    "the figures for simulation tools.")


def register(app: typer.Typer) -> None:
    app.command("inertia", help=HELP, epilog=examples(
        "wbledger inertia KVA-101",
        "wbledger inertia KVA-101 --plan plan.toml --phase landing --assume-z '30 in'",
        "wbledger inertia KVA-101 --configuration rear-seats-out --csv out.csv"))(inertia)


def inertia(
    ctx: typer.Context,
    registration: str = typer.Argument(..., metavar="REG", help="The vehicle."),
    config: str = typer.Option(None, "--configuration", metavar="NAME",
                               help="Configuration in use (default: the plan's, if any)."),
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
    csv_layout: str = typer.Option("long", "--csv-layout", metavar="long|wide",
                                   help="long: one row per quantity; wide: one header row "
                                   "and one value row."),
    max_size: str = common.max_size_option(INPUT_LIMIT),
    as_json: bool = common.JSON_OPTION,
) -> None:
    """Loaded inertia about the loaded CG in body axes (x forward, y right, z down)."""
    from ledger.errors import InputError
    from ledger.report.inertia import CSV_LAYOUTS, render_inertia, write_inertia_csv
    from ledger.services.inertia import inertia_report

    limit = common.size_limit(max_size)
    if csv_layout not in CSV_LAYOUTS:
        raise InputError("--csv-layout", csv_layout, "one of " + ", ".join(CSV_LAYOUTS))
    if phase is not None and plan is None:
        raise InputError("--phase", phase, "only with --plan (the phase picks its fuel)")
    report = inertia_report(common.state(ctx).engine(), registration, config=config,
                            plan=plan, phase=phase, assume_z=assume_z, as_of=as_of,
                            max_size=limit)
    if csv_file is not None:
        write_inertia_csv(report.document, csv_file, csv_layout)
    common.emit(report.document, render_inertia, as_json)
    if csv_file is not None and not as_json:
        typer.echo(f"CSV ({csv_layout}) written to {csv_file}")
