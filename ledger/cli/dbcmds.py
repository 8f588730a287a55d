"""``wbledger init`` and ``wbledger db …``: create and upgrade the database schema."""

from __future__ import annotations

import typer

from ledger.cli import common

db_app = typer.Typer(help="Database schema: status, upgrades and roles.", no_args_is_help=True)


def register(app: typer.Typer) -> None:
    app.command("init")(init)
    app.add_typer(db_app, name="db")


def _report(change) -> None:
    if not change.changed:
        typer.echo(f"Schema already at {change.after}; nothing to do.")
    else:
        typer.echo(f"Schema {change.before or 'empty'} -> {change.after}.")
    if change.backup:
        typer.echo(f"Backup of the previous file: {change.backup}")


def init(ctx: typer.Context) -> None:
    """Create the ledger database (or bring an existing one up to date)."""
    from ledger.services.database import init_database

    change = init_database(common.state(ctx).engine(check=False))
    typer.echo(f"Database: {change.url}")
    _report(change)


@db_app.command("upgrade")
def upgrade(ctx: typer.Context) -> None:
    """Upgrade the schema to this version of wbledger (a SQLite file is backed up first)."""
    from ledger.services.database import upgrade_database

    _report(upgrade_database(common.state(ctx).engine(check=False)))


@db_app.command("status")
def status(ctx: typer.Context, as_json: bool = common.JSON_OPTION) -> None:
    """Show the database URL, its schema revision and the one this wbledger needs."""
    from ledger.services.database import database_status

    data = database_status(common.state(ctx).engine(check=False)).to_dict()

    def render(d):
        typer.echo(f"Database:  {d['url']}")
        typer.echo(f"Schema:    {d['schema_revision'] or 'none (run wbledger init)'}")
        typer.echo(f"Needed:    {d['required_revision']}")

    common.emit(data, render, as_json)


@db_app.command("roles")
def roles(ctx: typer.Context,
          prefix: str = typer.Option("wbledger", "--prefix", metavar="NAME",
                                     help="Role names are NAME_auditor, NAME_loadmaster, "
                                          "NAME_maintenance and NAME_weight_engineer."),
          dry_run: bool = typer.Option(False, "--dry-run",
                                       help="Print the SQL instead of running it.")) -> None:
    """Create the PostgreSQL group roles (auditor, loadmaster, maintenance, weight engineer),
    each granted only what it needs; run as the tables' owner, then grant a role to each
    person's login (GRANT wbledger_loadmaster TO alice)."""
    from ledger.services.database import create_roles, roles_sql

    if dry_run:
        for stmt in roles_sql(prefix):
            typer.echo(stmt + ";")
        return
    made = create_roles(common.state(ctx).engine(), prefix)
    for r in made:
        may = ("read" + (f"; add rows to {', '.join(r.inserts)}" if r.inserts else ""))
        typer.echo(f"{r.name}: {may}")
    loadmaster = next(r.name for r in made if r.role == "loadmaster")
    typer.echo("No role owns a table: grant one to each person's login, e.g. "
               f"GRANT {loadmaster} TO alice;")
