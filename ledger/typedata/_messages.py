"""How values and figures are shown in the one-line errors of type and plan files."""

from __future__ import annotations

from ledger import units as U
from ledger.errors import Shown as _Shown

_MISSING = _Shown("(missing)")


def _show(value, limit: int | None = 60):
    """A value as an error message shows it: scalars as they are, containers as their repr,
    abridged to ``limit`` characters (plans show them whole: ``limit=None``)."""
    if isinstance(value, _Shown):
        return value
    if isinstance(value, bool):
        return _Shown("true" if value else "false")
    if isinstance(value, (str, int, float)):
        return value
    text = repr(value)
    return _Shown(text if limit is None or len(text) <= limit else text[:limit - 3] + "...")


def _typename(value) -> str:
    if isinstance(value, bool):
        return "a boolean"
    if isinstance(value, str):
        return "a string"
    if isinstance(value, int):
        return "an integer"
    if isinstance(value, float):
        return "a number"
    if isinstance(value, dict):
        return "a table"
    if isinstance(value, list):
        return "an array"
    return "a date/time"


def _disp(value_si: float, unit: str, digits: int = 10) -> str:
    """A figure in a display unit for a message, to ``digits`` significant digits: '2450 lb',
    '1156.66 kg'."""
    v = round(U.to_unit(value_si, unit), 6) + 0.0
    return f"{v:.{digits}g} {unit}"


def _listing(words) -> str:
    return ", ".join(words)


def _a(word: str) -> str:
    """'an airplane', 'a helicopter'."""
    return f"an {word}" if word[:1] in "aeiou" else f"a {word}"
