"""``wbledger init`` and ``wbledger db …``: create and upgrade the database schema."""

from __future__ import annotations

import typer

from ledger.cli import common

db_app = typer.Typer(help="Database schema: status, upgrades and roles.", no_args_is_help=True)


def register(app: typer.Typer) -> None:
    app.command("init")(init)
    app.add_typer(db_app, name="db")


def _report(before, after, backup) -> None:
    if before == after:
        typer.echo(f"Schema already at {after}; nothing to do.")
    else:
        typer.echo(f"Schema {before or 'empty'} -> {after}.")
    if backup:
        typer.echo(f"Backup of the previous file: {backup}")


def init(ctx: typer.Context) -> None:
    """Create the ledger database (or bring an existing one up to date)."""
    from ledger.store.db import init_db

    engine = common.state(ctx).engine(check=False)
    before, after, backup = init_db(engine)
    typer.echo(f"Database: {engine.url.render_as_string(hide_password=True)}")
    _report(before, after, backup)


@db_app.command("upgrade")
def upgrade(ctx: typer.Context) -> None:
    """Upgrade the schema to this version of wbledger (a SQLite file is backed up first)."""
    from ledger.store.db import upgrade as do_upgrade

    engine = common.state(ctx).engine(check=False)
    _report(*do_upgrade(engine))


@db_app.command("status")
def status(ctx: typer.Context, as_json: bool = common.JSON_OPTION) -> None:
    """Show the database URL, its schema revision and the one this wbledger needs."""
    from ledger.store.db import current_revision, head_revision

    engine = common.state(ctx).engine(check=False)
    with engine.connect() as conn:
        current = current_revision(conn)
    data = {
        "url": engine.url.render_as_string(hide_password=True),
        "schema_revision": current,
        "required_revision": head_revision(),
        "up_to_date": current == head_revision(),
    }

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
    from ledger.store.roles import ROLE_GRANTS, create_roles, roles_sql

    if dry_run:
        for stmt in roles_sql(prefix):
            typer.echo(stmt + ";")
        return
    engine = common.state(ctx).engine()
    with engine.begin() as conn:
        names = create_roles(conn, prefix)
    for role, name in names.items():
        inserts, _ = ROLE_GRANTS[role]
        may = ("read" + (f"; add rows to {', '.join(inserts)}" if inserts else ""))
        typer.echo(f"{name}: {may}")
    typer.echo("No role owns a table: grant one to each person's login, e.g. "
               f"GRANT {names['loadmaster']} TO alice;")
