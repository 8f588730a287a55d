"""``wbledger sheet …`` and ``wbledger check``: loading sheets, saved sheets, quick checks.

::

    wbledger sheet PLAN.toml [--save] [--json] [--pdf FILE] [--svg FILE] [--width N]
    wbledger sheet REG --person pilot=82kg --fuel "main=30 USgal" --trip "20 USgal" …
    wbledger sheet amend ID --cargo "baggage=25 lb" [--save is implied]
    wbledger sheet show ID [--json] [--pdf FILE] [--svg FILE]
    wbledger sheet list [REG] [--json]
    wbledger check (PLAN.toml | REG …) [--json]      exit 0 in limits, 1 out, 2 bad input

Each command makes its call into :mod:`ledger.services.sheets` or :mod:`ledger.services.check`
and renders the result with :mod:`ledger.report`. The first argument of ``sheet`` and ``check``
is a plan file (a path that exists or ends in ``.toml``) or a registration; quick options add
to or change the plan (``docs/plan-format.md``).
A sheet out of limits is printed with its fixes and exits with code 1; bad input exits with
code 2 and writes nothing.
"""

from __future__ import annotations

from pathlib import Path

import typer
from typer.core import TyperGroup

from ledger.cli import common
from ledger.cli.conventions import examples
from ledger.files import INPUT_LIMIT

__all__ = ["register", "sheet_app"]


class _SheetGroup(TyperGroup):
    """``wbledger sheet PLAN …`` runs ``wbledger sheet prepare PLAN …``."""

    def parse_args(self, ctx, args):
        if args and args[0] not in self.commands and args[0] not in ("--help", "-h"):
            args = ["prepare", *args]
        return super().parse_args(ctx, args)


sheet_app = typer.Typer(
    cls=_SheetGroup, no_args_is_help=True,
    help="Loading sheets: prepare one from a plan (`wbledger sheet PLAN`), save, amend for a "
         "last-minute change, show and list saved sheets.")


def register(app: typer.Typer) -> None:
    app.add_typer(sheet_app, name="sheet")
    app.command("check", epilog=CHECK_EXAMPLES)(check)


# --- shared options ----------------------------------------------------------------------------

PLAN_ARG = typer.Argument(..., metavar="PLAN|REG",
                          help="A plan file (TOML), or a registration for a quick plan given "
                               "by the options.")
PERSON = typer.Option([], "--person", metavar="SEAT=MASS",
                      help="A person: SEAT=MASS ('pilot=82 kg'), or SEAT=CLASS for a standard "
                           "mass (adult, child, flight_crew, cabin_crew, standard). Repeat for "
                           "several people; a seat named here replaces the plan's.")
VACATE = typer.Option([], "--vacate", metavar="SEAT", help="Empty a seat of the plan.")
CARGO = typer.Option([], "--cargo", metavar="STATION=MASS",
                     help="Cargo at a station ('baggage=40 lb'); replaces the plan's cargo "
                          "there (0 unloads it).")
FUEL = typer.Option([], "--fuel", metavar="TANK=QTY[@DENSITY|@TEMP]",
                    help="Usable fuel in a tank ('main=30 USgal'), optionally with a density "
                         "('@6.1 lb/USgal') or the fuel temperature ('@25 degC').")
TAXI = typer.Option(None, "--taxi", metavar="QTY", help="Taxi fuel (volume or mass).")
TRIP = typer.Option(None, "--trip", metavar="QTY", help="Trip fuel (volume or mass).")
BURN = typer.Option(None, "--burn", metavar="proportional|TANK,…",
                    help="'proportional', or tanks in the order they are drained "
                         "('left,right').")
CONFIG = typer.Option(None, "--configuration", metavar="NAME", help="Configuration in use.")
CATEGORY = typer.Option(None, "--category", metavar="NAME",
                        help="Envelope category (default: normal, else the type's first).")
MASSES = typer.Option(None, "--standard-masses", metavar="SET",
                      help="Standard-mass set for people given without a mass "
                           "(default: actual masses).")
AXLE_RULES = typer.Option(None, "--axle-rules", metavar="NAME",
                          help="Ground vehicles: axle-group rule set shown as an advisory "
                               "(see `wbledger axle-rules list`).")
WIDTH = typer.Option(80, "--width", metavar="N", min=60, max=240,
                     help="Width of the terminal sheet, in columns.")
MAX_SIZE = common.max_size_option(INPUT_LIMIT)
PDF = typer.Option(None, "--pdf", metavar="FILE", help="Also write the sheet as a PDF to sign.")
SVG = typer.Option(None, "--svg", metavar="FILE", help="Also write the sheet as SVG.")


def _options(person, vacate, cargo, fuel, taxi, trip, burn, configuration, category, masses,
             axle_rules):
    from ledger.services.sheets import QuickOptions

    return QuickOptions(persons=tuple(person), cargo=tuple(cargo), fuel=tuple(fuel),
                        vacate=tuple(vacate), taxi=taxi, trip=trip, burn=burn,
                        configuration=configuration, category=category,
                        standard_masses=masses, axle_rules=axle_rules)


def _check_outputs(pdf: Path | None, svg: Path | None) -> None:
    """Refuse unwritable --pdf / --svg paths before anything is computed or saved."""
    from ledger.files import check_output_path

    for path, option in ((pdf, "--pdf"), (svg, "--svg")):
        if path is not None:
            check_output_path(path, option)


def _outputs(doc: dict, as_json: bool, width: int, pdf: Path | None, svg: Path | None) -> None:
    if as_json:
        common.emit(doc, lambda d: None, True)
    else:
        from ledger.report.sheet_text import render_sheet

        render_sheet(doc, console=None, width=width)
    if pdf is not None:
        from ledger.report.sheet_pdf import write_pdf

        written = write_pdf(doc, pdf)
        typer.echo(f"Wrote PDF: {written or pdf}", err=True)
    if svg is not None:
        from ledger.report.sheet_pdf import write_svg

        written = write_svg(doc, svg)
        typer.echo(f"Wrote SVG: {written or svg}", err=True)


def _exit_for(doc: dict) -> None:
    if doc.get("verdict") != "in_limits":
        raise typer.Exit(1)


PREPARE_EXAMPLES = examples(
    "wbledger sheet plan.toml",
    "wbledger sheet prepare plan.toml --save --pdf sheet.pdf",
    "wbledger sheet KVA-101 --person pilot=82kg --cargo 'baggage=40 lb' \\\n"
    "  --fuel 'left wing=20 USgal' --trip '12 USgal'",
    "wbledger sheet plan.toml --configuration rear-seats-out --json")
CHECK_EXAMPLES = examples(
    "wbledger check plan.toml && echo in limits",
    "wbledger check KVA-101 --person pilot=82kg --fuel 'left wing=20 USgal'")


# --- commands -----------------------------------------------------------------------------------

@sheet_app.command("prepare", epilog=PREPARE_EXAMPLES)
def prepare(ctx: typer.Context, target: str = PLAN_ARG,
            person: list[str] = PERSON, vacate: list[str] = VACATE, cargo: list[str] = CARGO,
            fuel: list[str] = FUEL, taxi: str = TAXI, trip: str = TRIP, burn: str = BURN,
            configuration: str = CONFIG, category: str = CATEGORY, masses: str = MASSES,
            axle_rules: str = AXLE_RULES, by: str = common.BY_OPTION,
            save: bool = typer.Option(False, "--save",
                                      help="Save the sheet (immutable; amend it later)."),
            as_json: bool = common.JSON_OPTION, pdf: Path = PDF, svg: Path = SVG,
            width: int = WIDTH, max_size: str = MAX_SIZE) -> None:
    """Prepare a loading sheet: every phase, the fuel-burn path, margins and fixes.

    `wbledger sheet PLAN` is the same command. Exit code 1 when out of limits.
    """
    from ledger.services import sheets

    _check_outputs(pdf, svg)
    options = _options(person, vacate, cargo, fuel, taxi, trip, burn, configuration,
                       category, masses, axle_rules)
    plan = sheets.read_plan(target, options, max_size=common.size_limit(max_size))
    doc = sheets.prepare(common.state(ctx).engine(), plan, by=by, user=common.actor(None),
                         save=save).document
    _outputs(doc, as_json, width, pdf, svg)
    if save and not as_json:
        typer.echo(f"Saved as sheet {doc['sheet']['id']}.", err=True)
    _exit_for(doc)


@sheet_app.command("amend", epilog=examples(
    "wbledger sheet amend 12 --cargo 'baggage=25 lb'",
    "wbledger sheet amend 12 --plan plan-late.toml --pdf amended.pdf"))
def amend(ctx: typer.Context,
          sheet_id: int = typer.Argument(..., metavar="ID", help="The saved sheet to amend.",
                                         **common.ID_RANGE),
          plan_file: Path = typer.Option(None, "--plan", metavar="FILE",
                                         help="A whole new plan instead of option changes."),
          person: list[str] = PERSON, vacate: list[str] = VACATE, cargo: list[str] = CARGO,
          fuel: list[str] = FUEL, taxi: str = TAXI, trip: str = TRIP,
          by: str = common.BY_OPTION, as_json: bool = common.JSON_OPTION, pdf: Path = PDF,
          svg: Path = SVG, width: int = WIDTH, max_size: str = MAX_SIZE) -> None:
    """Amend a saved sheet for a last-minute change within the type's tolerance.

    The amended sheet is saved and points at the original; a change beyond the tolerance
    needs a new sheet (`wbledger sheet PLAN --save`).
    """
    from ledger.services import sheets

    _check_outputs(pdf, svg)
    limit = common.size_limit(max_size)
    options = _options(person, vacate, cargo, fuel, taxi, trip, None, None, None, None, None)
    plan = None if plan_file is None else sheets.read_amendment_plan(plan_file, max_size=limit)
    amended = sheets.amend(common.state(ctx).engine(), sheet_id, options=options, plan=plan,
                           by=by, user=common.actor(None))
    doc = amended.document
    _outputs(doc, as_json, width, pdf, svg)
    if not as_json:
        typer.echo(f"Saved as sheet {amended.saved.id}, amending sheet {sheet_id}.", err=True)
    _exit_for(doc)


@sheet_app.command("show", epilog=examples(
    "wbledger sheet show 12", "wbledger sheet show 12 --pdf sheet-12.pdf"))
def show(ctx: typer.Context,
         sheet_id: int = typer.Argument(..., metavar="ID", help="A saved sheet.",
                                        **common.ID_RANGE),
         as_json: bool = common.JSON_OPTION, pdf: Path = PDF, svg: Path = SVG,
         width: int = WIDTH) -> None:
    """Show a saved sheet as it was saved (its content hash is verified)."""
    from ledger.services import sheets

    _check_outputs(pdf, svg)
    shown = sheets.show(common.state(ctx).engine(), sheet_id)
    if not shown.verified:  # nothing is shown from a document that does not verify
        common.fail(f"sheet {sheet_id} does not match its content hash; it was changed "
                    "outside wbledger", common.ExitCode.DATA)
    if shown.ledger_problem:  # nor from a sheet whose vehicle's ledger no longer verifies
        common.fail(shown.ledger_problem, common.ExitCode.DATA)
    _outputs(shown.document, as_json, width, pdf, svg)


@sheet_app.command("list", epilog=examples(
    "wbledger sheet list", "wbledger sheet list KVA-101 --limit 5"))
def list_(ctx: typer.Context,
          registration: str = typer.Argument(None, metavar="REG",
                                             help="Only this vehicle's sheets."),
          limit: int = typer.Option(50, "--limit", metavar="N", help="At most this many.",
                                    **common.ID_RANGE),
          as_json: bool = common.JSON_OPTION) -> None:
    """List saved sheets, newest first."""
    from ledger.services import sheets

    rows = sheets.summaries(common.state(ctx).engine(), registration, limit=limit)

    def render(rows):
        from ledger.report.safe_text import clean

        if not rows:
            typer.echo("No saved sheets.")
        for r in clean(rows):
            amends = f", amends {r['amends']}" if r["amends"] else ""
            verdict = ("NOT VERIFIED" if not r["verified"]
                       else "in limits" if r["verdict"] == "in_limits" else "OUT OF LIMITS")
            typer.echo(f"{r['id']:>5}  {r['created_at'][:16]}  {r['registration']:<10} "
                       f"{verdict:<13} by {r['preparer']}{amends}")

    common.emit(rows, render, as_json)


def check(ctx: typer.Context, target: str = PLAN_ARG,
          person: list[str] = PERSON, vacate: list[str] = VACATE, cargo: list[str] = CARGO,
          fuel: list[str] = FUEL, taxi: str = TAXI, trip: str = TRIP, burn: str = BURN,
          configuration: str = CONFIG, category: str = CATEGORY, masses: str = MASSES,
          axle_rules: str = AXLE_RULES, by: str = common.BY_OPTION,
          as_json: bool = common.JSON_OPTION, max_size: str = MAX_SIZE) -> None:
    """Check a plan without the sheet: exit 0 in limits, 1 out of limits, 2 bad input."""
    from ledger.services import check as checking
    from ledger.services.sheets import read_plan

    options = _options(person, vacate, cargo, fuel, taxi, trip, burn, configuration,
                       category, masses, axle_rules)
    plan = read_plan(target, options, max_size=common.size_limit(max_size))
    doc = checking.check(common.state(ctx).engine(), plan, by=by,
                         user=common.actor(None)).document

    def render(d):
        from ledger.report.sheet_text import check_lines

        for line in check_lines(d):
            typer.echo(line)

    common.emit(doc, render, as_json)
    _exit_for(doc)
