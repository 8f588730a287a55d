"""The one error hierarchy of wbledger.

Every error a user can cause derives from :class:`LedgerError`. The narrow classes also inherit
the matching builtin (``ValueError``, ``LookupError``) so that library callers can catch either.
Each class keeps structured fields and builds its message in ``__str__``; the CLI prints
``Error: <message>`` on one line and exits with :attr:`LedgerError.exit_code`.

Messages name the field and the value, say what is allowed, and where possible what to do next.
"""

from __future__ import annotations

__all__ = [
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
]


def _fmt(value: object) -> str:
    if isinstance(value, str):
        return repr(value)
    if isinstance(value, float):
        return f"{value:g}"
    return str(value)


class LedgerError(Exception):
    """Base of every error wbledger raises on purpose. ``exit_code`` is what the CLI returns."""

    exit_code = 2

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
    """The database schema does not match this version of wbledger."""


class ChainError(LedgerError):
    """A ledger hash chain does not verify."""

    exit_code = 1


class StoredDataError(LedgerError):
    """A value stored in the database cannot be read back (it was changed outside wbledger)."""

    exit_code = 1

    def __init__(self, why: str) -> None:
        super().__init__(why)
        self.why = why

    def __str__(self) -> str:
        return (f"a value stored in the database cannot be read ({self.why}): it was changed "
                "outside wbledger; `wbledger verify` names the entry")


class CorrectionError(InputError):
    """A proposed fix cannot work (ballast on the wrong side of a limit, no room under a limit)."""


class DatabaseOpenError(InputError):
    """The database named by ``--db`` or ``$WBLEDGER_DB`` cannot be opened (no server, no file)."""


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
