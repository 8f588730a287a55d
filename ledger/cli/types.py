"""``wbledger type …``: import, list and show vehicle types."""

from __future__ import annotations

from pathlib import Path

import typer

from ledger.cli import common
from ledger.cli.conventions import examples
from ledger.files import INPUT_LIMIT

type_app = typer.Typer(help="Vehicle types: import type files and look at their revisions.",
                       no_args_is_help=True)


def register(app: typer.Typer) -> None:
    app.add_typer(type_app, name="type")


@type_app.command("import", epilog=examples(
    "wbledger type import my-type.toml", "wbledger type import types/*.toml --json"))
def import_(ctx: typer.Context,
            files: list[Path] = typer.Argument(..., metavar="FILE",
                                               help="Type files (TOML) to import."),
            max_size: str = common.max_size_option(INPUT_LIMIT),
            dry_run: bool = typer.Option(False, "--dry-run",
                                         help="Show what would change from the current "
                                              "revision and which vehicles would move onto "
                                              "the new one; write nothing."),
            as_json: bool = common.JSON_OPTION) -> None:
    """Import type files; a changed file becomes a new revision of its type, and every
    vehicle of the type moves onto it (the changes and the vehicles are listed)."""
    from ledger.report.type_changes import render_type_import
    from ledger.services.types import import_types, preview_types, read_type_files

    # Every file read once and valid before the database is opened or anything written.
    parsed = read_type_files(files, max_size=common.size_limit(max_size))
    results = (preview_types if dry_run else import_types)(common.state(ctx).engine(), parsed)
    common.emit([r.to_dict() for r in results], render_type_import, as_json)


@type_app.command("list")
def list_(ctx: typer.Context, as_json: bool = common.JSON_OPTION) -> None:
    """List the imported types with their newest revision."""
    from ledger.report.catalog import render_type_list
    from ledger.services.types import list_types

    common.emit(list_types(common.state(ctx).engine()), render_type_list, as_json)


@type_app.command("show", epilog=examples(
    "wbledger type show KV-P4", "wbledger type show KV-P4 --revision 1 --json"))
def show(ctx: typer.Context, name: str = typer.Argument(..., metavar="NAME", help="Type name."),
         revision: int = typer.Option(None, "--revision", metavar="N",
                                      help="Revision (default: newest).",
                                      **common.ID_RANGE),
         as_json: bool = common.JSON_OPTION) -> None:
    """Show a type: limits, stations, tanks and envelopes, in its display units."""
    from ledger.report.catalog import render_type
    from ledger.services.types import show_type

    shown = show_type(common.state(ctx).engine(), name, revision)
    common.emit(shown.to_dict(), lambda _doc: render_type(shown), as_json)
