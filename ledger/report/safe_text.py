"""Stored and user-given text on the screen as text (issue 13 item 10).

Item names, registrations, notes, reasons, type and station names are whatever someone typed or a
type file held. On the terminal they must read as what they are: ``[bold red]x[/]`` is eleven
characters, not red text, and an escape sequence (``\\x1b[31m``, or the single-byte CSI
``\\x9b``) must not reach the terminal, where it could recolour, move the cursor or rewrite what
the sheet said. So, at the report boundary (the data is stored exactly as given):

- :func:`plain` makes a text harmless for any output: every C0 and C1 control character,
  DEL, and the Unicode controls that reorder a line (bidirectional embeddings, overrides and
  isolates) is replaced by its visible escape (``\\x1b``, ``\\u202e``); a tab becomes a space;
  ordinary spaces and every printable character are kept.
- :func:`clean` applies :func:`plain` to every string of a JSON-like document, so that a
  renderer cleans its whole input in one line.
- :func:`text_console` is the console a report prints on: it reads no rich markup and no emoji
  codes (``:warning:``) in what it prints, so a bracket in a name needs no escaping.

The ``--json`` output is left as stored: JSON escapes C0 controls itself and is data, not a
screen.
"""

from __future__ import annotations

import re
from typing import Any, TypeVar

__all__ = ["plain", "clean", "text_console"]

T = TypeVar("T")

#: C0 (including newline and carriage return: a name must not start a line of its own), DEL,
#: C1, the Arabic letter mark and the bidirectional marks, embeddings, overrides and isolates.
_CONTROLS = re.compile("[\x00-\x1f\x7f-\x9f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]")


_NAMED = {"\t": " ", "\n": "\\n", "\r": "\\r"}


def _visible(match: re.Match[str]) -> str:
    char = match.group()
    if char in _NAMED:
        return _NAMED[char]
    code = ord(char)
    return f"\\x{code:02x}" if code < 0x100 else f"\\u{code:04x}"


def plain(text: str) -> str:
    r"""``text`` with every control character replaced by its visible escape.

    Examples
    --------
    >>> plain("fuel pump\x1b[31m red")
    'fuel pump\\x1b[31m red'
    >>> plain("[bold red]x[/] and\ttab")
    '[bold red]x[/] and tab'
    >>> plain("line\nbreak\u202e")
    'line\\nbreak\\u202e'
    """
    return _CONTROLS.sub(_visible, text) if _CONTROLS.search(text) else text


def clean(value: T) -> T:
    """``value`` (a JSON-like document) with :func:`plain` applied to every string in it.

    Dictionary keys are cleaned too; numbers, booleans and None are returned as they are.

    Examples
    --------
    >>> clean({"items": [{"name": "a\x1b[2J", "mass_kg": 1.5}], "note": None})
    {'items': [{'name': 'a\\\\x1b[2J', 'mass_kg': 1.5}], 'note': None}
    """
    if isinstance(value, str):
        return plain(value)  # type: ignore[return-value]
    if isinstance(value, dict):
        return {clean(k): clean(v) for k, v in value.items()}  # type: ignore[return-value]
    if isinstance(value, list):
        return [clean(v) for v in value]  # type: ignore[return-value]
    if isinstance(value, tuple):
        items = [clean(v) for v in value]
        made = getattr(value, "_make", tuple)  # a named tuple keeps its type
        return made(items)  # type: ignore[no-any-return]
    return value


def text_console(**options: Any):
    """A rich console for a report: no markup, emoji codes or highlighting read in its text.

    ``options`` go to :class:`rich.console.Console` (``width``, ``file``).
    """
    from rich.console import Console

    settings: dict[str, Any] = {"highlight": False, "soft_wrap": False, **options}
    return Console(markup=False, emoji=False, **settings)
