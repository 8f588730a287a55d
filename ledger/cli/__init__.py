"""The ``wbledger`` command line: thin adapters over the library.

Each command parses its arguments, makes one call into ``ledger.store`` / ``ledger.typedata`` /
``ledger.core``, and renders the result with ``ledger.report``. Errors are translated once, here
(through :func:`ledger.cli.common.translate`): a :class:`ledger.errors.LedgerError` becomes
``Error: …`` on stderr and its exit code (:class:`ledger.errors.ExitCode`, listed in ``--help``),
anything else one line with code 70, and a closed pipe ends quietly. Heavy libraries
(SQLAlchemy, numpy) are imported inside the commands, so that ``wbledger --help`` starts
quickly.
"""

from __future__ import annotations

import sys

import typer
from typer.core import TyperGroup

from ledger.cli import common
from ledger.errors import EXIT_CODE_HELP

__all__ = ["app", "main"]


def _usage_line(exc) -> None:
    """A command-line usage mistake (missing option, not a number) as one line, exit 2."""
    from typer._click.exceptions import NoArgsIsHelpError

    if isinstance(exc, NoArgsIsHelpError):  # a bare group: its help is the answer
        raise exc
    message = _bad_value(exc) or " ".join(exc.format_message().split()).rstrip(".")
    where = ""
    if exc.ctx is not None:  # named as the user types it, whatever the runner called the root
        path = ["wbledger", *exc.ctx.command_path.split()[1:]]
        where = f" (see `{' '.join(path)} --help`)"
    common.fail(f"{message}{where}", exc.exit_code)


def _bad_value(exc) -> str | None:
    """``FIELD = VALUE: what is wrong`` for a value typer could not convert (an id past the
    database's integer range, a word for a number), as every other bad input is named; None
    for other usage errors."""
    errors = getattr(exc.__cause__, "errors", None)  # pydantic's ValidationError
    param = getattr(exc, "param", None)
    if param is None or not callable(errors) or not errors():
        return None
    first = errors()[0]
    field = (param.opts[-1] if param.param_type_name == "option"
             else str(getattr(param, "display_name_raw", None) or param.name).upper())
    value = first.get("input")
    shown = repr(value) if isinstance(value, str) else str(value)
    text = str(first.get("msg", "not accepted"))
    return f"{field} = {shown}: {text[:1].lower()}{text[1:]}"


class _LedgerGroup(TyperGroup):
    """Top-level group: turns LedgerError and usage errors into one line on stderr."""

    def make_context(self, info_name, args, parent=None, **extra):
        from typer._click.exceptions import UsageError

        try:
            return super().make_context(info_name, args, parent=parent, **extra)
        except UsageError as exc:
            _usage_line(exc)
        except BaseException as exc:  # noqa: BLE001 - `--help | head`: each gets its exit code
            common.translate(exc)

    def invoke(self, ctx):
        from typer._click.exceptions import UsageError

        try:
            return super().invoke(ctx)
        except UsageError as exc:
            _usage_line(exc)
        except BaseException as exc:  # noqa: BLE001 - each gets its exit code
            common.translate(exc)


app = typer.Typer(
    cls=_LedgerGroup,
    no_args_is_help=True,
    add_completion=True,  # --install-completion / --show-completion (bash, zsh, fish, pwsh)
    pretty_exceptions_enable=False,
    help="A weight-and-balance ledger for aircraft and road vehicles: empty-weight history, "
    "loading sheets checked against the CG envelope, fixes, and loaded inertia.",
    epilog=EXIT_CODE_HELP + "\n\nShell completion: run `wbledger --install-completion` once "
    "(bash, zsh, fish or PowerShell) and open a new shell; `wbledger --show-completion` prints "
    "the script instead.",
)


# --- wbledger --version (issue 13 item 13) -------------------------------------------------------

def _version(value: bool) -> None:
    """Print the installed distribution's version (its metadata, not an import of the package)."""
    if value:
        from importlib.metadata import PackageNotFoundError, version

        try:
            text = version("wbledger")
        except PackageNotFoundError:  # a checkout on sys.path, never installed
            text = "(version unknown: not installed; `pip install -e .` records it)"
        typer.echo(f"wbledger {text}")
        raise typer.Exit(0)


VERSION_OPTION = typer.Option(False, "--version", is_eager=True, callback=_version,
                              help="Print the version of wbledger and exit.")
# --------------------------------------------------------------------------------------------------


@app.callback()
def _root(
    ctx: typer.Context,
    db: str = typer.Option(
        None,
        "--db",
        metavar="URL",
        help="Database URL (SQLAlchemy form). Default: $WBLEDGER_DB, else a SQLite file in "
        "your user data directory.",
    ),
    _show_version: bool = VERSION_OPTION,
) -> None:
    ctx.obj = common.State(db_url=db)
    ctx.call_on_close(ctx.obj.close)


def _register() -> None:
    from ledger.cli import dbcmds, record, types, vehicles

    for module in (dbcmds, types, vehicles, record):
        module.register(app)
    # Groups added by later modules register themselves the same way.
    import importlib

    for name in common.OPTIONAL_MODULES:
        try:
            module = importlib.import_module(f"ledger.cli.{name}")
        except ModuleNotFoundError as exc:
            if exc.name != f"ledger.cli.{name}":
                raise
            continue
        module.register(app)


_register()


def main() -> None:
    """Entry point of the ``wbledger`` console script and ``python -m ledger``."""
    try:
        try:
            app(prog_name="wbledger")
        finally:
            # Output to a pipe is buffered: a reader that went away (`| head`) shows here,
            # not in the command, and must end as quietly as it does there.
            sys.stdout.flush()
    except BrokenPipeError:
        common.pipe_closed()
    sys.exit(0)
