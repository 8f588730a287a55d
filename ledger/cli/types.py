"""``wbledger type …``: import, list and show vehicle types."""

from __future__ import annotations

from pathlib import Path

import typer

from ledger.cli import common
from ledger.files import INPUT_LIMIT

type_app = typer.Typer(help="Vehicle types: import type files and look at their revisions.",
                       no_args_is_help=True)


def register(app: typer.Typer) -> None:
    app.add_typer(type_app, name="type")


@type_app.command("import")
def import_(ctx: typer.Context,
            files: list[Path] = typer.Argument(..., help="Type files (TOML) to import."),
            max_size: str = common.max_size_option(INPUT_LIMIT),
            as_json: bool = common.JSON_OPTION) -> None:
    """Import type files; a changed file becomes a new revision of its type."""
    from ledger.store.catalog import import_type
    from ledger.store.db import session_scope
    from ledger.typedata import read_type_file

    limit = common.size_limit(max_size)
    # Every file read once and valid before anything is written; the text kept is the one parsed.
    parsed = [(f, *read_type_file(f, max_size=limit)) for f in files]
    engine = common.state(ctx).engine()
    with session_scope(engine) as session:
        results = [import_type(session, vt, str(f), text) for f, vt, text in parsed]
    data = [{"file": str(f), "type": r.name, "revision": r.revision, "new_revision": r.created,
             "content_sha256": r.content_sha256} for (f, _, _), r in zip(parsed, results)]

    def render(rows):
        for row in rows:
            state = "imported as" if row["new_revision"] else "unchanged, already"
            typer.echo(f"{row['file']}: type {row['type']} {state} revision {row['revision']}")

    common.emit(data, render, as_json)


@type_app.command("list")
def list_(ctx: typer.Context, as_json: bool = common.JSON_OPTION) -> None:
    """List the imported types with their newest revision."""
    from ledger.report.catalog import render_type_list
    from ledger.store.catalog import list_types
    from ledger.store.db import session_scope

    with session_scope(common.state(ctx).engine()) as session:
        data = list_types(session)
    common.emit(data, render_type_list, as_json)


@type_app.command("show")
def show(ctx: typer.Context, name: str = typer.Argument(..., help="Type name."),
         revision: int = typer.Option(None, "--revision", help="Revision (default: newest).",
                                      **common.ID_RANGE),
         as_json: bool = common.JSON_OPTION) -> None:
    """Show a type: limits, stations, tanks and envelopes, in its display units."""
    from ledger.report.catalog import render_type, type_document
    from ledger.store.catalog import load_type, type_revision
    from ledger.store.db import session_scope

    with session_scope(common.state(ctx).engine()) as session:
        row = type_revision(session, name, revision)
        data = type_document(load_type(session, row), revision=row.revision,
                             imported_at=row.imported_at.isoformat(),
                             content_sha256=row.content_sha256)
    common.emit(data, render_type, as_json)
