"""``wbledger corners``, ``wbledger cg-height`` and ``wbledger axle-rules …``: road vehicles.

Thin adapters: parse the options (quantities with units; bare numbers take the vehicle type's
display units, and need a unit when no vehicle is named), fetch the type and the empty state
from the store, call :mod:`ledger.analysis.ground`, render with :mod:`ledger.report.ground`.
"""

from __future__ import annotations

import re

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


_NUMBER = re.compile(r"^\s*[+\-\u2212]?(?:\d+\.?\d*|\.\d+)(?:[eE][+\-]?\d+)?\s*(.*?)\s*$")


def _typed_unit(text: str | None, dimension: str) -> str | None:
    """The unit a user typed after the number, canonical, or None for a bare number."""
    if text is None:
        return None
    m = _NUMBER.match(str(text))
    if not m or not m.group(1):
        return None
    from ledger.units import canonical_unit

    try:
        return canonical_unit(m.group(1), dimension)
    except Exception:  # noqa: BLE001 - the parser reports it with the field name
        return None


def _q(text: str | None, dimension: str, default_unit: str | None, field: str, *,
       positive: bool = False):
    """Parse an option; a load (mass) must be 0 or more, a ``positive`` one above 0.

    The sign is checked here so that the message shows the option as typed, with its unit.
    """
    if text is None:
        return None
    from ledger.errors import InputError
    from ledger.units import parse_quantity

    value = parse_quantity(text, dimension, default_unit, field=field)
    if positive and not value > 0:
        raise InputError(field, text, f"a {dimension} greater than 0")
    if dimension == "mass" and value < 0:
        raise InputError(field, text, "a mass of 0 or more")
    return value


def _vehicle_type(ctx: typer.Context, registration: str):
    from ledger.store.catalog import get_vehicle, vehicle_type
    from ledger.store.db import session_scope

    with session_scope(common.state(ctx).engine()) as session:
        row, vtype = vehicle_type(session, get_vehicle(session, registration))
        return row.revision, vtype


def corners(
    ctx: typer.Context,
    registration: str = typer.Argument(
        None, metavar="[REG]", help="A registered vehicle: its type gives the wheelbase, "
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
    from ledger.analysis.ground import corner_weights_document, type_geometry
    from ledger.report.ground import render_corners
    from ledger.units import DisplayUnits

    vtype = None
    if registration is not None:
        _, vtype = _vehicle_type(ctx, registration)
    mu = vtype.units.mass if vtype is not None else None
    lu = vtype.units.length if vtype is not None else None
    loads = [_q(v, "mass", mu, name) for v, name in
             ((lf, "--lf"), (rf, "--rf"), (lr, "--lr"), (rr, "--rr"))]
    geo = type_geometry(vtype,
                        wheelbase_m=_q(wheelbase, "length", lu, "--wheelbase", positive=True),
                        track_front_m=_q(track, "length", lu, "--track", positive=True),
                        track_rear_m=_q(rear_track, "length", lu, "--rear-track",
                                         positive=True))
    doc = corner_weights_document(*loads, geo, vtype=vtype, registration=registration)
    if vtype is None:  # show what the user typed
        du = DisplayUnits(_typed_unit(lf, "mass") or "kg",
                          _typed_unit(wheelbase or track, "length") or "m", "L")
        doc["units"] = du.to_dict()
    common.emit(doc, render_corners, as_json)


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
    reason: str = typer.Option(None, "--reason", help="Why (shown in the history)."),
    reference: str = typer.Option(None, "--ref", help="Work order or report number."),
    by: str = common.BY_OPTION,
    as_json: bool = common.JSON_OPTION,
) -> None:
    """CG height from an axle-lift weighing (ISO 10392 method), stored with the vehicle."""
    from ledger.analysis import MISSING
    from ledger.analysis.ground import angles_from_lift, cg_height_document
    from ledger.errors import InputError
    from ledger.report.ground import render_cg_height
    from ledger.store.db import session_scope
    from ledger.store.entries import current_empty, record_cg_height

    revision, vtype = _vehicle_type(ctx, registration)
    mu, lu = vtype.units.mass, vtype.units.length
    if front_tilted and rear_tilted:
        raise InputError("--rear-tilted", rear_tilted[0],
                         "not together with --front-tilted: raise one axle per weighing")
    if not front_tilted and not rear_tilted:
        raise InputError("--front-tilted", MISSING, "the grounded axle's load at each angle: "
                         "--front-tilted (rear raised) or --rear-tilted (front raised)")
    raised = "rear" if front_tilted else "front"
    grounded = "front" if raised == "rear" else "rear"
    level_text = front_level if grounded == "front" else rear_level
    if level_text is None:
        raise InputError(f"--{grounded}-level", MISSING,
                         f"the {grounded} axle load with the vehicle level")
    level = _q(level_text, "mass", mu, f"--{grounded}-level")
    if total is not None:
        w = _q(total, "mass", mu, "--total")
    else:
        other = rear_level if grounded == "front" else front_level
        if other is None:
            raise InputError("--total", MISSING, "the total mass level: give --total, or both "
                             "--front-level and --rear-level")
        w = level + _q(other, "mass", mu, f"--{'rear' if grounded == 'front' else 'front'}"
                                          "-level")
    tilted_text = front_tilted or rear_tilted
    tilted = [_q(t, "mass", mu, f"--{grounded}-tilted") for t in tilted_text]
    if wheelbase is not None:
        wb = _q(wheelbase, "length", lu, "--wheelbase", positive=True)
    elif len(vtype.axles) == 2:
        wb = vtype.axles[1].x_m - vtype.axles[0].x_m
    else:
        raise InputError("--wheelbase", MISSING,
                         f"the distance between the raised and the grounded axle; type "
                         f"{vtype.name} has {len(vtype.axles)} axles")
    if angle and lift:
        raise InputError("--lift", lift[0], "not together with --angle: give one of them")
    if lift:
        angles = angles_from_lift([_q(x, "length", lu, "--lift") for x in lift], wb)
        source = "from the lift heights: θ = asin(lift / wheelbase)"
    else:
        angles = [_q(a, "angle", "deg", "--angle") for a in (angle or [])]
        source = "given"
    tt = [_q(t, "mass", mu, "--total-tilted") for t in total_tilted] if total_tilted else None
    r = _q(wheel_radius, "length", lu, "--wheel-radius", positive=True)
    dh = _q(datum_height, "length", lu, "--datum-height")
    if dh is None and not dry_run:
        raise InputError("--datum-height", MISSING,
                         "the height of the type's datum (z = 0) above the ground, to store "
                         "the vertical arm", hint=f"The type's datum: {vtype.datum}. Or use "
                         "--dry-run to compute without storing")
    engine = common.state(ctx).engine()
    with session_scope(engine) as session:
        empty = current_empty(session, registration)
        doc = cg_height_document(total_kg=w, wheelbase_m=wb, wheel_radius_m=r, level_kg=level,
                                 tilted_kg=tilted, angles_deg=angles, raised=raised,
                                 total_tilted_kg=tt, datum_height_m=dh,
                                 empty_mass_kg=empty.mass_kg, vtype=vtype,
                                 registration=registration, angle_source=source)
        doc["vehicle"]["type_revision"] = revision
        if dry_run:
            doc["stored"] = False
        else:
            keep = {k: doc[k] for k in ("method", "raised_axle", "inputs", "readings",
                                        "height_m", "residual_rms_kg", "height_spread_m")}
            entry = record_cg_height(session, registration, doc["z_m"],
                                     actor=common.actor(by), entry_date=entry_date,
                                     reason=reason, reference=reference,
                                     detail={"axle_lift": keep})
            doc["stored"] = {"registration": registration, "seq": entry.seq,
                             "entry_date": entry.entry_date.isoformat()}
    common.emit(doc, render_cg_height, as_json)


@rules_app.command("list")
def rules_list(as_json: bool = common.JSON_OPTION) -> None:
    """List the axle rule sets found (built in, $WBLEDGER_RULES, the user's rules folder)."""
    from ledger.report.ground import render_rule_list
    from ledger.rules import list_rule_sets, rule_dirs

    rows = [{"name": r.name, "title": r.title, "jurisdiction": r.jurisdiction,
             "path": r.path, "builtin": r.builtin} for r in list_rule_sets()]
    if as_json:
        common.emit({"rule_sets": rows, "folders": [str(p) for p, _ in rule_dirs()]},
                    render_rule_list, True)
    else:
        render_rule_list(rows)


@rules_app.command("show")
def rules_show(
    name: str = typer.Argument(..., help="Rule set name (see `axle-rules list`) or a .toml "
                               "file."),
    table: bool = typer.Option(False, "--table", help="Add the bridge-formula table."),
    max_length: int = typer.Option(60, "--max-length", metavar="FT", min=4, max=200,
                                   help="Longest spread in the table, ft."),
    as_json: bool = common.JSON_OPTION,
) -> None:
    """Show a rule set's limits and definitions (and, with --table, the bridge table)."""
    from ledger.analysis.ground import rule_set_document
    from ledger.report.ground import render_rule_set
    from ledger.rules import load_rule_set

    doc = rule_set_document(load_rule_set(name),
                            lengths_ft=list(range(4, max_length + 1)) if table else None)
    common.emit(doc, render_rule_set, as_json)
