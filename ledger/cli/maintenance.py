"""Maintenance commands: ``weigh``, ``install``, ``remove``, ``correct``, ``history``,
``export`` and ``import-history``.

Each command parses its options, makes one call into a service (:mod:`ledger.services.weighing`,
:mod:`ledger.services.equipment`, :mod:`ledger.services.history`), and renders the result with
:mod:`ledger.report.ledger`. Quantities are typed with
their unit ("520 lb", "47.5 in"); a bare number takes the vehicle type's display unit.
"""

from __future__ import annotations

from pathlib import Path

import typer

from ledger.cli import common
from ledger.cli.conventions import examples
from ledger.files import HISTORY_LIMIT

DATE_OPTION = typer.Option(None, "--date", metavar="YYYY-MM-DD",
                           help="Date of the work (default today; not in the future).")
REASON_HELP = "Why (kept in the ledger)."
REASON_REQUIRED = typer.Option(..., "--reason", metavar="TEXT", help=REASON_HELP)
REF_OPTION = typer.Option(None, "--ref", metavar="TEXT",
                          help="Work order or other reference.")
REG_ARG = typer.Argument(..., metavar="REG", help="Registration or fleet id.")

WEIGH_EXAMPLES = examples(
    "wbledger weigh KVA-101 --reading nose=480lb --tare nose=3lb \\\n"
    "  --reading 'left main=572lb' --reading 'right main=576.5lb' \\\n"
    "  --fuel 'left wing=2 USgal' --scales 'platform S/N 0000' --ref WO-0400")
INSTALL_EXAMPLES = examples(
    "wbledger install KVA-101 ELT --mass '3.5 lb' --arm '130 in' \\\n"
    "  --reason 'ELT replaced' --ref WO-0417")
REMOVE_EXAMPLES = examples(
    "wbledger remove KVA-101 ELT --reason 'sent for repair' --ref WO-0420")


def register(app: typer.Typer) -> None:
    app.command("weigh", epilog=WEIGH_EXAMPLES)(weigh)
    app.command("install", epilog=INSTALL_EXAMPLES)(install)
    app.command("remove", epilog=REMOVE_EXAMPLES)(remove)
    app.command("correct", epilog=examples(
        "wbledger correct KVA-101 4 --reason 'fitted to KVA-102, not KVA-101'"))(correct)
    app.command("history", epilog=examples(
        "wbledger history KVA-101", "wbledger history KVA-101 --as-of 2025-06-30"))(history)
    app.command("export")(export)
    app.command("import-history")(import_history)


def _pairs(values: list[str] | None, option: str, example: str) -> dict[str, str]:
    """``["nose=520 lb", …]`` → ``{"nose": "520 lb", …}``."""
    from ledger.errors import InputError

    out: dict[str, str] = {}
    for text in values or []:
        key, sep, value = text.partition("=")
        if not sep or not key.strip() or not value.strip():
            raise InputError(option, text, f"NAME=VALUE, e.g. {example}")
        if key.strip() in out:
            raise InputError(option, key.strip(), "given twice; once per name")
        out[key.strip()] = value.strip()
    return out


def _recorded(ctx: typer.Context, as_json: bool, call) -> None:
    """Run ``call(engine)`` (a service that appends an entry) and show the entry it made."""
    from ledger.report.ledger import render_entry

    recorded = call(common.state(ctx).engine())
    if recorded.more:  # a pitched weighing: the weighing, then its CG height
        common.emit([recorded.document, *recorded.more],
                    lambda docs: [render_entry(d) for d in docs], as_json)
    else:
        common.emit(recorded.document, render_entry, as_json)


def weigh(ctx: typer.Context, registration: str = REG_ARG,
          reading: list[str] = typer.Option(None, "--reading", metavar="POINT=MASS",
                                            help="Scale reading at a weighing point; one per "
                                                 "point the type defines."),
          tare: list[str] = typer.Option(None, "--tare", metavar="POINT=MASS",
                                         help="Tare at a point (chocks, blocks)."),
          fuel: list[str] = typer.Option(None, "--fuel", metavar="TANK=QTY",
                                         help="Fuel in a tank as weighed (volume or mass); "
                                              "usable fuel is removed, unusable kept. A tank "
                                              "not named holds its unusable fuel."),
          adjust: list[str] = typer.Option(None, "--adjust", metavar="LABEL=MASS@ARM[,LAT[,VERT]]",
                                           help="Other correction to the as-weighed state: a "
                                                "positive mass is added (oil drained), a "
                                                "negative one removed."),
          entry_date: str = DATE_OPTION,
          scales: str = typer.Option(None, "--scales", metavar="TEXT",
                                     help="Scales used (make, serial, calibration)."),
          level: str = typer.Option(None, "--level", metavar="TEXT",
                                    help="How the vehicle was levelled."),
          note: str = typer.Option(None, "--note", metavar="TEXT", help="Anything else."),
          reason: str = typer.Option(None, "--reason", metavar="TEXT", help=REASON_HELP),
          reference: str = REF_OPTION,
          pitched_reading: list[str] = typer.Option(
              None, "--pitched-reading", metavar="POINT=MASS",
              help="Reading with the vehicle pitched nose-up, one per point: the vertical CG "
                   "is recorded as a CG-height entry after the weighing."),
          pitch: str = typer.Option(None, "--pitch", metavar="ANGLE",
                                    help="Nose-up pitch of the pitched readings (e.g. 8 deg)."),
          points_z: str = typer.Option(None, "--points-z", metavar="LENGTH",
                                       help="Vertical arm of the weighing points (jack pads) "
                                            "for the pitched readings."),
          by: str = common.BY_OPTION, as_json: bool = common.JSON_OPTION) -> None:
    """Record a weighing: the empty mass and CG from the scale readings start a new baseline."""
    from ledger.services import weighing

    readings = _pairs(reading, "--reading", "nose=520 lb")
    tares = _pairs(tare, "--tare", "nose=4 lb")
    fuels = _pairs(fuel, "--fuel", "'left wing=10 USgal'")
    adjustments = weighing.parse_adjustments(adjust)
    pitched = weighing.pitched_weighing(
        _pairs(pitched_reading, "--pitched-reading", "nose=505 lb"), pitch, points_z)
    _recorded(ctx, as_json, lambda engine: weighing.weigh(
        engine, registration, readings, tares=tares, fuel=fuels, adjustments=adjustments,
        actor=common.actor(by), entry_date=entry_date, scales=scales, level=level, note=note,
        reason=reason, reference=reference, pitched=pitched))


def install(ctx: typer.Context, registration: str = REG_ARG,
            item: str = typer.Argument(..., metavar="ITEM", help="Name of the item."),
            mass: str = typer.Option(..., "--mass", metavar="MASS", help="Its mass."),
            arm: str = typer.Option(..., "--arm", metavar="LENGTH",
                                    help="Its longitudinal arm (station)."),
            lat_arm: str = typer.Option(None, "--lat-arm", metavar="LENGTH",
                                        help="Lateral arm, + right (default 0)."),
            vert_arm: str = typer.Option(None, "--vert-arm", metavar="LENGTH",
                                         help="Vertical arm (default: not known)."),
            shape: str = typer.Option(None, "--shape", metavar="KIND,KEY=VALUE,…",
                                      help="Shape for inertia, e.g. box,length=20,width=12,"
                                           "height=8."),
            reason: str = REASON_REQUIRED,
            reference: str = REF_OPTION, entry_date: str = DATE_OPTION,
            by: str = common.BY_OPTION, as_json: bool = common.JSON_OPTION) -> None:
    """Record the installation of an item (adds its mass at its arms)."""
    from ledger.services import equipment

    _recorded(ctx, as_json, lambda engine: equipment.install(
        engine, registration, item, mass=mass, arm=arm, lat_arm=lat_arm, vert_arm=vert_arm,
        shape=shape, actor=common.actor(by), reason=reason, reference=reference,
        entry_date=entry_date))


def remove(ctx: typer.Context, registration: str = REG_ARG,
           item: str = typer.Argument(..., metavar="ITEM", help="Name of an installed item."),
           mass: str = typer.Option(None, "--mass", metavar="MASS",
                                    help="Its mass, if not the one recorded at installation."),
           arm: str = typer.Option(None, "--arm", metavar="LENGTH", help="Its arm, likewise."),
           lat_arm: str = typer.Option(None, "--lat-arm", metavar="LENGTH",
                                       help="Its lateral arm, likewise."),
           vert_arm: str = typer.Option(None, "--vert-arm", metavar="LENGTH",
                                        help="Its vertical arm, likewise."),
           reason: str = REASON_REQUIRED,
           reference: str = REF_OPTION, entry_date: str = DATE_OPTION,
           by: str = common.BY_OPTION, as_json: bool = common.JSON_OPTION) -> None:
    """Record the removal of an installed item (with its recorded mass and arms)."""
    from ledger.services import equipment

    _recorded(ctx, as_json, lambda engine: equipment.remove(
        engine, registration, item, mass=mass, arm=arm, lat_arm=lat_arm, vert_arm=vert_arm,
        actor=common.actor(by), reason=reason, reference=reference, entry_date=entry_date))


def correct(ctx: typer.Context, registration: str = REG_ARG,
            seq: int = typer.Argument(..., metavar="SEQ", help="Entry to reverse.",
                                      **common.ID_RANGE),
            reason: str = typer.Option(..., "--reason", metavar="TEXT",
                                       help="Why it is reversed."),
            reference: str = REF_OPTION, entry_date: str = DATE_OPTION,
            by: str = common.BY_OPTION, as_json: bool = common.JSON_OPTION) -> None:
    """Reverse an installation or removal with a new entry that says why."""
    from ledger.services import equipment

    _recorded(ctx, as_json, lambda engine: equipment.correct(
        engine, registration, seq, reason=reason, actor=common.actor(by), reference=reference,
        entry_date=entry_date))


def history(ctx: typer.Context, registration: str = REG_ARG,
            as_of: str = typer.Option(None, "--as-of", metavar="YYYY-MM-DD",
                                      help="Show the record as it stood on this date."),
            as_json: bool = common.JSON_OPTION) -> None:
    """The running record: per entry the change, then empty mass, moment, CG and %MAC."""
    from ledger.report.ledger import render_history
    from ledger.services.history import running_record

    data = running_record(common.state(ctx).engine(), registration, as_of=as_of)
    common.emit(data, render_history, as_json)


def export(ctx: typer.Context, registration: str = REG_ARG,
           fmt: str = typer.Option("csv", "--format", metavar="csv|json",
                                   help="File format."),
           output: Path = typer.Option(None, "-o", "--output", metavar="FILE",
                                       help="Write to FILE (default: standard output)."),
           units: str = typer.Option("si", "--units", metavar="si|display",
                                     help="si: every stored column exactly, for import "
                                          "(default); display: the type's units at the "
                                          "precision people read, not for import.")) -> None:
    """Export a vehicle's whole ledger, exactly (values, dates and hashes), or in display
    units."""
    from ledger.files import check_output_path, write_output
    from ledger.services.history import export as export_history

    if output is not None:
        check_output_path(output, "--output")
    text = export_history(common.state(ctx).engine(), registration, fmt, units=units)
    if output is None:
        typer.echo(text, nl=False)
    else:
        write_output(output, text, "--output")
        typer.echo(f"Wrote the ledger of {registration} to {output} ({fmt}).", err=True)


def import_history(ctx: typer.Context, registration: str = REG_ARG,
                   file: Path = typer.Argument(..., metavar="FILE",
                                               help="A CSV or JSON history."),
                   fmt: str = typer.Option(None, "--format", metavar="csv|json",
                                           help="File format (default: from the file name)."),
                   max_size: str = common.max_size_option(HISTORY_LIMIT),
                   as_json: bool = common.JSON_OPTION) -> None:
    """Append the entries of a history file to a vehicle's ledger, all or nothing."""
    from ledger.errors import InputError
    from ledger.files import read_input_text
    from ledger.report.ledger import render_import
    from ledger.services.history import import_file

    limit = common.size_limit(max_size)
    fmt = fmt or file.suffix.lower().lstrip(".")
    if fmt not in ("csv", "json"):
        raise InputError("--format", fmt, "csv or json (give --format when the file name "
                         "does not end in .csv or .json)")
    text = read_input_text(file, field="FILE", what=f"a history file ({fmt.upper()})",
                           limit=HISTORY_LIMIT if limit is None else limit)
    summary = import_file(common.state(ctx).engine(), registration, text, fmt,
                          source=file.name)
    common.emit(summary.to_dict(), render_import, as_json)
