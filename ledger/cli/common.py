"""What every command shares: the database handle, output in text or JSON, and failing cleanly.

:func:`translate` is the one place where an exception becomes an exit code (the codes are
:class:`ledger.errors.ExitCode`).
"""

from __future__ import annotations

import json
import os
import sys
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import Any, NoReturn

import typer

from ledger.bounds import ID_MAX
from ledger.errors import ExitCode, LedgerError, mask_passwords
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
            self._engine = open_database(self.db_url, check=False, on_lock_wait=_lock_notice)
        if check:
            check_database(self._engine)
        return self._engine

    def close(self) -> None:
        """Return the engine's pooled connections when the command ends (a test or a program
        that runs many commands in one process must not keep a backend per command)."""
        if self._engine is not None:
            self._engine.dispose()
            self._engine = None


def _lock_notice() -> None:
    from ledger.services.database import LOCK_TIMEOUT_VAR, lock_timeout

    typer.echo(f"waiting for the database lock held by another process (at most "
               f"{lock_timeout():g} s; ${LOCK_TIMEOUT_VAR} sets it)…", err=True)


def state(ctx: typer.Context) -> State:
    obj = ctx.find_root().obj
    if obj is None:  # called without the root callback (library use)
        obj = ctx.find_root().obj = State()
    return obj


#: Set (to anything but empty) to see the traceback of an internal error instead of one line.
DEBUG_VAR = "WBLEDGER_DEBUG"


def fail(message: str, code: int = ExitCode.BAD_INPUT) -> NoReturn:
    """Print ``Error: message`` on stderr and exit with ``code``; a database URL's password
    in it is masked, whatever raised it."""
    typer.echo(f"Error: {mask_passwords(message)}", err=True)
    raise typer.Exit(int(code))


def pipe_closed() -> NoReturn:
    """The reader of our output went away (``wbledger … | head``): end quietly, with
    :attr:`ExitCode.PIPE_CLOSED` (never 0, so a check cut short is not read as in limits).

    As the Python documentation advises (``signal``, "Note on SIGPIPE"): point stdout at the
    null device, so that the flush at exit does not fail a second time and print "Exception
    ignored"."""
    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
    except (OSError, ValueError, AttributeError):  # no file descriptor (a test's runner)
        pass
    raise SystemExit(ExitCode.PIPE_CLOSED)


def translate(exc: BaseException) -> NoReturn:
    """Turn ``exc``, raised by a command, into its one line and exit code: an error of ours
    (:class:`LedgerError`) gives its own code, a closed pipe ends quietly, an interrupt gives
    130, and anything else is an internal error (70), with the traceback only when
    ``$WBLEDGER_DEBUG`` is set."""
    from typer._click.exceptions import ClickException

    if isinstance(exc, LedgerError):
        fail(str(exc), exc.exit_code)
    if isinstance(exc, (ClickException, typer.Exit, typer.Abort)):
        raise exc
    # rich's console ends the program with exit 1 on a closed pipe (Console.on_broken_pipe),
    # which would read as "out of limits".
    if isinstance(exc, BrokenPipeError) or (isinstance(exc, SystemExit)
                                            and isinstance(exc.__context__, BrokenPipeError)):
        pipe_closed()
    if isinstance(exc, KeyboardInterrupt):
        fail("interrupted; an unfinished transaction was rolled back", ExitCode.INTERRUPTED)
    if os.environ.get(DEBUG_VAR) or not isinstance(exc, Exception):
        raise exc
    lines = str(exc).strip().splitlines()
    what = type(exc).__name__ + (f": {lines[0]}" if lines else "")
    fail(f"internal error ({what}). This is a bug in wbledger: please report it with the "
         f"command you ran and the traceback that {DEBUG_VAR}=1 shows", ExitCode.INTERNAL)


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
