"""What every command shares: the database handle, output in text or JSON, and failing cleanly."""

from __future__ import annotations

import json
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import Any, NoReturn

import typer

from ledger.bounds import ID_MAX
from ledger.files import format_size, parse_size

#: Command modules that register themselves when present (one module per group of commands).
OPTIONAL_MODULES = ("maintenance", "integrity", "configs", "sheets", "inertia", "ground", "demo")


@dataclass
class State:
    """Per-invocation state carried in ``ctx.obj``."""

    db_url: str | None = None
    _engine: Any = field(default=None, repr=False)

    def engine(self, *, check: bool = True):
        """The engine for this invocation; refuses an uninitialised or outdated schema."""
        from ledger.services.database import check_database, open_database

        if self._engine is None:
            self._engine = open_database(self.db_url, check=False)
        if check:
            check_database(self._engine)
        return self._engine


def state(ctx: typer.Context) -> State:
    obj = ctx.find_root().obj
    if obj is None:  # called without the root callback (library use)
        obj = ctx.find_root().obj = State()
    return obj


def fail(message: str, code: int = 2) -> NoReturn:
    """Print ``Error: message`` on stderr and exit with ``code``."""
    typer.echo(f"Error: {message}", err=True)
    raise typer.Exit(code)


def console():
    """A rich console for terminal output (imported only when a command prints)."""
    from rich.console import Console

    return Console(highlight=False, soft_wrap=False)


def emit(data: Any, render: Callable[[Any], None], as_json: bool) -> None:
    """Print ``data`` as JSON (``--json``) or through ``render`` for the terminal."""
    if as_json:
        typer.echo(json.dumps(data, indent=2, ensure_ascii=False, allow_nan=False))
    else:
        render(data)


JSON_OPTION = typer.Option(False, "--json",
                           help="Print JSON (explicit unit names) instead of text.")


def actor(by: str | None) -> str:
    """Who records an entry: ``--by``, else ``$WBLEDGER_USER``, else the login name."""
    import getpass
    import os

    name = by or os.environ.get("WBLEDGER_USER")
    if not name:
        try:
            name = getpass.getuser()
        except Exception:  # noqa: BLE001 - no login name in some containers
            name = "unknown"
    return name


BY_OPTION = typer.Option(None, "--by", metavar="NAME",
                         help="Who records this (default: $WBLEDGER_USER or login). On "
                         "PostgreSQL, unless you own the ledger's tables, it is always your "
                         "database user.")


def max_size_option(default: int) -> Any:
    """``--max-size SIZE`` for a command that reads a file the user names; ``default`` is the
    limit in bytes without it (:data:`ledger.files.INPUT_LIMIT` or ``HISTORY_LIMIT``)."""
    return typer.Option(None, "--max-size", metavar="SIZE",
                        help=f"Largest input file read, in bytes or with KiB, MiB or GiB "
                             f"(default {format_size(default)}).")


def size_limit(max_size: str | None) -> int | None:
    """The byte limit ``--max-size`` gives, or None for the command's default."""
    return None if max_size is None else parse_size(max_size)


#: Entry numbers, sheet ids and revisions given on the command line: 1 to the largest value of
#: an ``integer`` column of PostgreSQL (:data:`ledger.bounds.ID_MAX`), so that none reaches the
#: database driver out of range.
ID_RANGE = {"min": 1, "max": ID_MAX}
