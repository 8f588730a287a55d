"""``wbledger corners``, ``wbledger cg-height`` and ``wbledger axle-rules …``: road vehicles.

Thin adapters: each passes the options as typed (quantities with units; bare numbers take the
vehicle type's display units, and need a unit when no vehicle is named) to one service call
(:mod:`ledger.services.ground`, :mod:`ledger.services.cg_height`) and renders the result with
:mod:`ledger.report.ground`.
"""

from __future__ import annotations

import typer

from ledger.cli import common

rules_app = typer.Typer(help="Axle-group rule sets for the advisory axle check (data files).",
                        no_args_is_help=True)


CORNERS_HELP = (
    "Corner weights from four wheel-scale readings.\n\n"
    "Total, CG x and y, left %, rear % and both diagonal percentages, named RF+LR and LF+RR "
    "(the 'cross weight' is quoted either way). With REG the wheelbase, tracks and display "
    "units come from the vehicle's type; without it give them, with units.")
CG_HEIGHT_HELP = (
    "CG height from an axle-lift weighing (ISO 10392 method), stored with the vehicle.\n\n"
    "Weigh level (--front-level and --rear-level, or --total), then raise one axle to several "
    "angles and read the other: --front-tilted with --angle (or --lift) once per angle when "
    "the rear is raised, --rear-tilted when the front is. The least-squares height and its "
    "residual are recorded as the vertical CG of the empty vehicle (a ledger entry of kind "
    "cg_height), unless --dry-run.")


def register(app: typer.Typer) -> None:
    app.command("corners", help=CORNERS_HELP)(corners)
    app.command("cg-height", help=CG_HEIGHT_HELP)(cg_height)
    app.add_typer(rules_app, name="axle-rules")


def corners(
    ctx: typer.Context,
    registration: str = typer.Argument(
        None, metavar="REG", help="A registered vehicle: its type gives the wheelbase, "
        "tracks and display units (bare numbers take them)."),
    lf: str = typer.Option(..., "--lf", metavar="MASS", help="Left front wheel load."),
    rf: str = typer.Option(..., "--rf", metavar="MASS", help="Right front wheel load."),
    lr: str = typer.Option(..., "--lr", metavar="MASS", help="Left rear wheel load."),
    rr: str = typer.Option(..., "--rr", metavar="MASS", help="Right rear wheel load."),
    wheelbase: str = typer.Option(None, "--wheelbase", metavar="LENGTH",
                                  help="Wheelbase (default: from the vehicle's type)."),
    track: str = typer.Option(None, "--track", metavar="LENGTH",
                              help="Front track, and the rear one unless --rear-track "
                              "(default: from the type)."),
    rear_track: str = typer.Option(None, "--rear-track", metavar="LENGTH",
                                   help="Rear track if it differs from the front."),
    as_json: bool = common.JSON_OPTION,
) -> None:
    """Corner weights from four wheel-scale readings."""
    from ledger.report.ground import render_corners
    from ledger.services.ground import corner_weights

    engine = common.state(ctx).engine() if registration is not None else None
    result = corner_weights(engine, registration, lf=lf, rf=rf, lr=lr, rr=rr,
                            wheelbase=wheelbase, track=track, rear_track=rear_track)
    common.emit(result.document, render_corners, as_json)


def cg_height(
    ctx: typer.Context,
    registration: str = typer.Argument(..., metavar="REG", help="The vehicle weighed."),
    front_level: str = typer.Option(None, "--front-level", metavar="MASS",
                                    help="Front axle load, vehicle level."),
    rear_level: str = typer.Option(None, "--rear-level", metavar="MASS",
                                   help="Rear axle load, vehicle level."),
    total: str = typer.Option(None, "--total", metavar="MASS",
                              help="Total mass, level (default: --front-level + "
                              "--rear-level)."),
    front_tilted: list[str] = typer.Option(
        None, "--front-tilted", metavar="MASS",
        help="Front axle load with the REAR axle raised; repeat, one per --angle or --lift."),
    rear_tilted: list[str] = typer.Option(
        None, "--rear-tilted", metavar="MASS",
        help="Rear axle load with the FRONT axle raised; repeat, one per --angle or --lift."),
    angle: list[str] = typer.Option(None, "--angle", metavar="ANGLE",
                                    help="Lift angle of each tilted reading, e.g. '12 deg'."),
    lift: list[str] = typer.Option(None, "--lift", metavar="LENGTH",
                                   help="Instead of --angle: how far the raised axle's wheel "
                                   "centres were lifted (θ = asin(lift / wheelbase))."),
    total_tilted: list[str] = typer.Option(
        None, "--total-tilted", metavar="MASS",
        help="Optional: both axles' total at each angle, checked against the level total."),
    wheel_radius: str = typer.Option(..., "--wheel-radius", metavar="LENGTH",
                                     help="Static loaded wheel radius."),
    datum_height: str = typer.Option(
        None, "--datum-height", metavar="LENGTH",
        help="Height of the type's datum (z = 0) above the ground, vehicle level; gives the "
        "vertical arm that is stored (0 for a datum on the ground). Required unless "
        "--dry-run."),
    wheelbase: str = typer.Option(None, "--wheelbase", metavar="LENGTH",
                                  help="Default: from the type (two axles)."),
    dry_run: bool = typer.Option(False, "--dry-run", help="Compute and show; store nothing."),
    entry_date: str = typer.Option(None, "--date", metavar="YYYY-MM-DD",
                                   help="Date of the weighing (default today)."),
    reason: str = typer.Option(None, "--reason", metavar="TEXT",
                               help="Why (shown in the history)."),
    reference: str = typer.Option(None, "--ref", metavar="TEXT",
                                  help="Work order or report number."),
    by: str = common.BY_OPTION,
    as_json: bool = common.JSON_OPTION,
) -> None:
    """CG height from an axle-lift weighing (ISO 10392 method), stored with the vehicle."""
    from ledger.report.ground import render_cg_height
    from ledger.services.cg_height import AxleLiftReadings, measure_cg_height

    readings = AxleLiftReadings(
        wheel_radius=wheel_radius, front_level=front_level, rear_level=rear_level,
        total=total, front_tilted=front_tilted or (), rear_tilted=rear_tilted or (),
        angle=angle or (), lift=lift or (), total_tilted=total_tilted or (),
        datum_height=datum_height, wheelbase=wheelbase)
    result = measure_cg_height(common.state(ctx).engine(), registration, readings,
                               actor=common.actor(by), dry_run=dry_run, entry_date=entry_date,
                               reason=reason, reference=reference)
    common.emit(result.document, render_cg_height, as_json)


@rules_app.command("list")
def rules_list(as_json: bool = common.JSON_OPTION) -> None:
    """List the axle rule sets found (built in, $WBLEDGER_RULES, the user's rules folder)."""
    from ledger.report.ground import render_rule_list
    from ledger.services.ground import axle_rule_sets

    found = axle_rule_sets()
    if as_json:
        common.emit({"rule_sets": found.rows, "folders": found.folders}, render_rule_list, True)
    else:
        render_rule_list(found.rows)


@rules_app.command("show")
def rules_show(
    name: str = typer.Argument(..., metavar="NAME|FILE",
                               help="Rule set name (see `axle-rules list`) or a .toml file."),
    table: bool = typer.Option(False, "--table", help="Add the bridge-formula table."),
    max_length: int = typer.Option(60, "--max-length", metavar="FT", min=4, max=200,
                                   help="Longest spread in the table, ft."),
    as_json: bool = common.JSON_OPTION,
) -> None:
    """Show a rule set's limits and definitions (and, with --table, the bridge table)."""
    from ledger.report.ground import render_rule_set
    from ledger.services.ground import axle_rule_set

    common.emit(axle_rule_set(name, table=table, max_length_ft=max_length), render_rule_set,
                as_json)
