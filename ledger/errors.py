"""The one error hierarchy of wbledger.

Every error a user can cause derives from :class:`LedgerError`. The narrow classes also inherit
the matching builtin (``ValueError``, ``LookupError``) so that library callers can catch either.
Each class keeps structured fields and builds its message in ``__str__``; the CLI prints
``Error: <message>`` on one line and exits with :attr:`LedgerError.exit_code`, one of
:class:`ExitCode` (the one table of exit codes: ``wbledger --help`` prints it).

Messages name the field and the value, say what is allowed, and where possible what to do next.
"""

from __future__ import annotations

import re
from enum import IntEnum

__all__ = [
    "ExitCode",
    "EXIT_CODE_HELP",
    "Shown",
    "mask_passwords",
    "LedgerError",
    "InputError",
    "UnitError",
    "TypeDataError",
    "PlanError",
    "EnvelopeError",
    "MassPropertiesError",
    "NotFoundError",
    "ConflictError",
    "SchemaError",
    "ChainError",
    "CorrectionError",
    "DatabaseOpenError",
    "AccessRefusedError",
    "StoredDataError",
    "EnvironmentProblem",
    "DatabaseProblem",
    "DatabaseUnavailableError",
    "ReadOnlyDatabaseError",
    "DatabaseLockedError",
    "ConcurrentWriteError",
    "UnwritableFileError",
]


class ExitCode(IntEnum):
    """What the ``wbledger`` command returns: each code means one thing (issue 13 item 8).

    70 is ``EX_SOFTWARE`` of the BSD ``sysexits.h`` convention (an internal software error);
    141 is what a shell reports for a program ended by ``SIGPIPE`` (128 + 13).
    """

    OK = 0  #: success; a check or sheet is in limits
    OUT_OF_LIMITS = 1  #: the check or sheet is out of limits
    BAD_INPUT = 2  #: bad input: an option, a file, a name; nothing was written
    DATA = 3  #: stored data does not verify or cannot be read
    ENVIRONMENT = 4  #: database unreachable, read-only or locked; a file that cannot be written
    INTERNAL = 70  #: a bug in wbledger: rerun with WBLEDGER_DEBUG=1 and report the traceback
    INTERRUPTED = 130  #: interrupted (Ctrl-C); the transaction was rolled back
    PIPE_CLOSED = 141  #: the reader closed the output early (``| head``); never 0


#: The table of :class:`ExitCode` as ``wbledger --help`` shows it (and the README).
EXIT_CODE_HELP = (
    "Exit codes: 0 success, in limits; 1 out of limits; 2 bad input (nothing written); "
    "3 stored data does not verify or cannot be read; 4 the environment (database "
    "unreachable, read-only or locked, a file that cannot be written); 70 an internal error "
    "(rerun with WBLEDGER_DEBUG=1 for the traceback, and report it); 130 interrupted; "
    "141 the reader closed the output early."
)


#: ``scheme://user:password@`` anywhere in a text (a URL that may not parse).
_PASSWORD_RE = re.compile(r"(?P<head>\b[A-Za-z][A-Za-z0-9+.\-]*://[^:/@\s]*:)[^@\s]*(?=@)")


def mask_passwords(text: str) -> str:
    """``text`` with the password of every ``scheme://user:password@…`` in it shown as ``***``
    (issue 13 item 11: a database URL's password is never printed).

    Examples
    --------
    >>> mask_passwords("no server at postgresql://ann:s3cret@db:port/x")
    'no server at postgresql://ann:***@db:port/x'
    """
    return _PASSWORD_RE.sub(r"\g<head>***", text)


class Shown:
    """A value an error message shows as written here, without quotes (``true``, a table, a
    long number abridged): :func:`_fmt` and ``repr`` both give the text."""

    def __init__(self, text: str) -> None:
        self.text = text

    def __str__(self) -> str:
        return self.text

    __repr__ = __str__


def _fmt(value: object) -> str:
    if isinstance(value, str):
        return repr(value)
    if isinstance(value, float):
        return f"{value:g}"
    return str(value)


class LedgerError(Exception):
    """Base of every error wbledger raises on purpose. ``exit_code`` is what the CLI returns."""

    exit_code: int = ExitCode.BAD_INPUT

    @property
    def message(self) -> str:
        return str(self)

    def __str__(self) -> str:
        return str(self.args[0]) if self.args else ""


class InputError(ValueError, LedgerError):
    """A value given by the user (option, file field, plan entry) is not acceptable.

    Parameters
    ----------
    field : str
        Dotted name of the field or option, e.g. ``"stations[2].max_mass"`` or ``"--mass"``.
    value : object
        The offending value as given.
    allowed : str
        What would be accepted ("a finite mass of 0 or more", "one of kg, lb").
    source : str, optional
        The file (and line) the value came from.
    hint : str, optional
        What to do next.
    """

    def __init__(
        self,
        field: str,
        value: object,
        allowed: str,
        *,
        source: str | None = None,
        hint: str | None = None,
    ) -> None:
        self.field = field
        self.value = value
        self.allowed = allowed
        self.source = source
        self.hint = hint
        super().__init__(self._build())

    def _build(self) -> str:
        where = f"{self.source}: " if self.source else ""
        text = f"{where}{self.field} = {_fmt(self.value)}: {self.allowed}"
        if self.hint:
            text += f". {self.hint}"
        return text

    def with_source(self, source: str) -> InputError:
        """Return the same error, located in ``source`` (a file name, or ``file:line``)."""
        self.source = source
        self.args = (self._build(),)
        return self

    def __str__(self) -> str:
        return self._build()


class UnitError(InputError):
    """A quantity has an unknown unit, the wrong dimension, or no number."""


class TypeDataError(InputError):
    """A vehicle type file is not valid."""


class PlanError(InputError):
    """A loading plan (file or command-line options) is not valid."""


class EnvelopeError(InputError):
    """An envelope polygon is not usable (too few points, self-crossing, zero area)."""


class MassPropertiesError(InputError):
    """Masses or arms that cannot give a mass or a CG (non-finite, negative, zero total)."""


class NotFoundError(LookupError, LedgerError):
    """A named thing (vehicle, type, item, configuration, sheet) does not exist."""

    def __init__(self, kind: str, name: object, hint: str | None = None) -> None:
        self.kind = kind
        self.name = name
        self.hint = hint
        text = f"no {kind} {_fmt(name)}"
        if hint:
            text += f". {hint}"
        super().__init__(text)


class ConflictError(LedgerError):
    """The request contradicts what is recorded (already exists, not installed, immutable)."""


class SchemaError(LedgerError):
    """The database schema does not match this version of wbledger (not initialised, behind
    or ahead): the database is not usable as it is, and a command names what mends it."""

    exit_code = ExitCode.ENVIRONMENT


class ChainError(LedgerError):
    """A ledger hash chain does not verify."""

    exit_code = ExitCode.DATA


class StoredDataError(LedgerError):
    """A value stored in the database cannot be read back (it was changed outside wbledger)."""

    exit_code = ExitCode.DATA

    def __init__(self, why: str) -> None:
        super().__init__(why)
        self.why = why

    def __str__(self) -> str:
        return (f"a value stored in the database cannot be read ({self.why}): it was changed "
                "outside wbledger; `wbledger verify` names the entry")


class CorrectionError(InputError):
    """A proposed fix cannot work (ballast on the wrong side of a limit, no room under a limit)."""


class DatabaseOpenError(InputError):
    """The database named by ``--db`` or ``$WBLEDGER_DB`` cannot be opened (no server, no file).

    The URL itself was well formed, so this is the environment's answer (exit code 4), not a
    mistake in the input."""

    exit_code = ExitCode.ENVIRONMENT


class AccessRefusedError(LedgerError):
    """The database refused a statement to this user (PostgreSQL SQLSTATE 42501): a privilege
    the user's role does not have, or an append-only guard."""

    def __init__(self, reason: str, user: str | None = None) -> None:
        self.reason = reason
        self.user = user
        super().__init__(reason)

    def __str__(self) -> str:
        who = f" to user {self.user!r}" if self.user else ""
        return (f"the database refused this{who} ({self.reason}); each role of `wbledger db "
                "roles` may do only its own part: ask the ledger's owner for the role that "
                "may do this")


class EnvironmentProblem(LedgerError):
    """The environment, not the input, stops the command: a database that cannot be reached or
    written, a lock held too long, a file that cannot be written. Nothing was changed."""

    exit_code = ExitCode.ENVIRONMENT


class DatabaseProblem(EnvironmentProblem):
    """The database stopped a command for a reason of its own; the transaction was rolled back.

    Parameters
    ----------
    database : str
        The database as shown to users (its URL without the password).
    reason : str
        The first line of the driver's message.
    """

    #: The message; each subclass says what happened and what to do next.
    template = "the database {database} refused the command ({reason}); nothing was changed"

    def __init__(self, database: str, reason: str) -> None:
        self.database = database
        self.reason = reason
        super().__init__(database, reason)

    def __str__(self) -> str:
        return self.template.format(database=self.database, reason=self.reason)


class DatabaseUnavailableError(DatabaseProblem):
    """The database failed in the middle of a command (server shut down, backend terminated,
    connection lost, disk full)."""

    template = ("the database {database} could not complete the command ({reason}); nothing "
                "was changed. Run the command again once the database is available")


class ReadOnlyDatabaseError(DatabaseProblem):
    """The database refuses writes: a read-only file, folder or file system, or a read-only
    server or transaction."""

    template = ("the database {database} is read-only ({reason}); nothing was changed. Give "
                "your user write access to the file and its folder (or use a server that "
                "accepts writes), then run the command again")


class ConcurrentWriteError(DatabaseProblem):
    """Another process recorded the same thing at the same moment (a unique key taken between
    this command's check and its write)."""

    template = ("another process wrote to the database {database} at the same moment "
                "({reason}); nothing was changed by this command. Run it again: it will see "
                "what the other one recorded")


class DatabaseLockedError(EnvironmentProblem):
    """Another process held the database lock longer than the lock timeout."""

    def __init__(self, database: str, timeout_s: float, variable: str) -> None:
        self.database = database
        self.timeout_s = timeout_s
        self.variable = variable
        super().__init__(database, timeout_s)

    def __str__(self) -> str:
        return (f"the database {self.database} stayed locked by another process for more than "
                f"{self.timeout_s:g} s; nothing was changed. Run the command again when the "
                f"other one has finished, or wait longer with {self.variable}=SECONDS")


class UnwritableFileError(InputError):
    """A file the user named cannot be written for a reason of the environment (permission
    denied, a read-only file system, a full disk), not because the name is wrong: exit code 4
    (issue 13 item 8). A missing folder or a name that is a folder stay bad input."""

    exit_code = ExitCode.ENVIRONMENT
