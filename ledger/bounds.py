"""What wbledger accepts from outside, checked before anything reaches the database driver.

A value from a file or an option is refused here, as one line ``FIELD = VALUE: what is
allowed`` (an :class:`~ledger.errors.InputError`), when it could otherwise end as a traceback
from the parser or the driver, or be stored silently by one database and refused by the other:

- **Nesting**: a TOML or JSON document nested more than :data:`MAX_DEPTH` levels (the parsers
  recurse, and a deep enough document exhausts Python's stack).
- **Numbers**: every number in a document is at most :data:`MAX_NUMBER` in size (a NaN or an
  infinity is refused by the field that reads it, or by the canonical JSON of a ledger entry).
  No quantity wbledger handles comes near it in any unit, the products and sums built from such
  numbers stay finite, and whole numbers stay far inside the 64-bit range of SQLite integers and
  PostgreSQL ``bigint``. An entry number or an id given on the command line is at most
  :data:`ID_MAX`, the largest value of PostgreSQL's ``integer`` columns.
- **Text**: no NUL character anywhere (PostgreSQL refuses it in text columns; SQLite stores
  it), and a text stored in a column of limited size is at most that size (PostgreSQL refuses a
  longer one, SQLite stores it). The sizes are those of ``ledger/store/models.py``;
  ``tests/test_bounds.py`` holds the two to each other.

This module imports only :mod:`ledger.errors`, so the command line and the type-file parser can
use it without loading the database layer.
"""

from __future__ import annotations

import contextlib
import gc
import json
import math
import tomllib
from collections.abc import Iterator
from typing import Any

from ledger.errors import InputError
from ledger.errors import Shown as _Shown

__all__ = [
    "item_field",
    "counted_from_one",
    "ID_MAX",
    "MAX_DEPTH",
    "MAX_NUMBER",
    "NAME_MAX",
    "SOURCE_NAME_MAX",
    "TEXT_MAX",
    "NUMBER_RULE",
    "check_document",
    "check_text",
    "in_range",
    "load_json",
    "load_toml",
    "shown",
]

#: Deepest nesting of tables/objects and arrays accepted in a TOML or JSON document.
MAX_DEPTH = 64
#: Largest size of a number in a document (type file, plan, rule set, history).
MAX_NUMBER = 1e15
#: Largest entry number, sheet id or revision: PostgreSQL ``integer`` (32-bit signed).
ID_MAX = 2**31 - 1
#: ``String(200)`` columns: who recorded or prepared something, references, item names.
TEXT_MAX = 200
#: ``String(120)`` columns: type and configuration names, vehicle serial numbers.
NAME_MAX = 120
#: ``type_revisions.source_name``: the path of an imported type file as given.
SOURCE_NAME_MAX = 500

#: What :func:`in_range` allows, as an error message states it.
NUMBER_RULE = f"a number from {-MAX_NUMBER:g} to {MAX_NUMBER:g}"

_SHOWN = 40
_DEEP = f"at most {MAX_DEPTH} levels of nesting"


def shown(value: object) -> object:
    """``value`` as an error message shows it: a long text cut to its first 40 characters.

    Examples
    --------
    >>> shown("x" * 50)
    'xxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxx…'
    >>> shown(3), shown(10**30)
    (3, (a whole number of about 31 digits))
    """
    if isinstance(value, str) and len(value) > _SHOWN:
        return value[:_SHOWN] + "…"
    if isinstance(value, int) and value.bit_length() > 64:
        digits = int(value.bit_length() * math.log10(2)) + 1
        return _Shown(f"(a whole number of about {digits} digits)")
    return value


def in_range(value: float) -> bool:
    """True when ``value`` (an int or a float) is a number wbledger takes from a file: finite
    and at most :data:`MAX_NUMBER` in size.

    Examples
    --------
    >>> in_range(2450.0), in_range(-1e15), in_range(float("nan")), in_range(10**30)
    (True, True, False, False)
    """
    return -MAX_NUMBER <= value <= MAX_NUMBER  # NaN fails every comparison


def check_text(field: str, value: str, max_len: int | None = None, *,
               source: str | None = None) -> str:
    """Return ``value`` if it has no NUL character and at most ``max_len`` characters.

    Raises
    ------
    InputError
        ``FIELD = VALUE: text without NUL characters`` or ``…: at most N characters``.

    Examples
    --------
    >>> check_text("--by", "A. Mechanic", 200)
    'A. Mechanic'
    >>> check_text("--reason", "fitted\\x00", 4000)
    Traceback (most recent call last):
    ...
    ledger.errors.InputError: --reason = 'fitted\\x00': text without NUL characters
    """
    if "\x00" in value:
        raise InputError(field, shown(value), "text without NUL characters", source=source)
    if max_len is not None and len(value) > max_len:
        raise InputError(field, shown(value), f"at most {max_len} characters", source=source)
    return value


def item_field(base: str, index: int) -> str:
    """The field of element ``index`` (0-based, as Python counts) of the list ``base``, as every
    message shows it: counted from 1, the way people count (issue 13 item 9).

    Examples
    --------
    >>> item_field("person", 0)
    'person[1]'
    """
    return f"{base}[{index + 1}]"


def counted_from_one(exc: InputError, base: str) -> InputError:
    """``exc`` (raised by a core function, which counts list elements from 0 as Python does)
    with every ``base[N]`` in its field and its text renumbered by :func:`item_field`.

    Examples
    --------
    >>> str(counted_from_one(InputError("p[0]", 1, "not p[2]"), "p"))
    'p[1] = 1: not p[3]'
    """
    import re

    pattern = re.compile(re.escape(base) + r"\[(\d+)\]")

    def renumber(text: str) -> str:
        return pattern.sub(lambda m: item_field(base, int(m.group(1))), text)

    exc.field, exc.allowed = renumber(exc.field), renumber(exc.allowed)
    if exc.hint:
        exc.hint = renumber(exc.hint)
    exc.args = (exc._build(),)
    return exc


def _path_of(where: Any, root: str) -> str:
    """``entries[3].detail.note`` from nested (parent, key) pairs; ``root`` names the top."""
    keys = []
    while where is not None:
        where, key = where
        keys.append(key)
    keys.pop()  # the document's own place in the list the walk starts from
    path = root
    for key in reversed(keys):
        path = item_field(path, key) if isinstance(key, int) else \
            f"{path}.{key}" if path else str(key)
    return path or "document"


def check_document(data: Any, *, source: str | None = None, root: str = "") -> Any:
    """Return ``data`` (a parsed TOML or JSON document) if it keeps within this module's bounds.

    Walks the document without recursion: nesting at most :data:`MAX_DEPTH` levels, every
    number at most :data:`MAX_NUMBER` in size, no NUL character in a key or a text. A NaN or an
    infinity is left to the field that reads it, which refuses it in its own terms.
    The error names the first offending place by its path (``entries[3].detail.note``).

    Raises
    ------
    InputError
        The first value out of bounds, located in ``source``.

    Examples
    --------
    >>> check_document({"mass": [1, 2.5], "name": "pilot"})
    {'mass': [1, 2.5], 'name': 'pilot'}
    >>> check_document({"cargo": [{"mass": 1e300}]}, source="plan.toml")
    Traceback (most recent call last):
    ...
    ledger.errors.InputError: plan.toml: cargo[1].mass = 1e+300: a number from -1e+15 to 1e+15
    """
    # Containers wait on a stack with their depth and where they are, (parent's where, key),
    # turned into a path only for an error. The loop tests each value inline (in_range, written
    # out), so that a history of 100,000 entries is walked in about the time JSON takes to
    # parse it. The walk starts from a list holding the document, so a document that is a
    # single text or number is checked too.
    stack: list[tuple[Any, int, Any]] = [([data], 0, None)]
    while stack:
        value, depth, where = stack.pop()
        if value.__class__ is dict:
            if "\x00" in "".join(map(str, value)):
                key = next(k for k in value if "\x00" in str(k))
                raise InputError(f"a key in {_path_of(where, root)}", shown(key),
                                 "a key without NUL characters", source=source)
            pairs: Any = value.items()
        else:
            pairs = enumerate(value)
        for key, item in pairs:
            cls = item.__class__
            if cls is str:
                if "\x00" in item:
                    raise InputError(_path_of((where, key), root), shown(item),
                                     "text without NUL characters", source=source)
            elif cls is dict or cls is list:
                if depth >= MAX_DEPTH:
                    raise InputError(shown(_path_of((where, key), root)),
                                     _Shown(f"(nested {depth + 1} levels deep)"), _DEEP,
                                     source=source)
                stack.append((item, depth + 1, (where, key)))
            elif cls is float:
                # NaN and infinity are left to the field that reads the value: each refuses
                # them naming what it should be ("a mass must be a finite number").
                if not -MAX_NUMBER <= item <= MAX_NUMBER and item - item == 0.0:
                    raise InputError(_path_of((where, key), root), item, NUMBER_RULE,
                                     source=source)
            elif cls is int and not -MAX_NUMBER <= item <= MAX_NUMBER:
                raise InputError(_path_of((where, key), root), shown(item), NUMBER_RULE,
                                 source=source)
    return data


def _too_deep_or_long(exc: Exception, source: str | None, root: str = "") -> InputError:
    """The error for a parser that gave up on nesting or on a number's digits."""
    if isinstance(exc, RecursionError):
        return InputError(root or "document", _Shown("(nested too deep to read)"), _DEEP,
                          source=source)
    return InputError(root or "document", _Shown("(a whole number too long to read)"),
                      NUMBER_RULE, source=source)


@contextlib.contextmanager
def _no_collection() -> Iterator[None]:
    """No garbage collection while a parser recurses: a collection started at its deepest point
    would run other objects' finalizers with no stack left, and each failure would reach stderr
    as "Exception ignored in sys.unraisablehook" around the one-line error."""
    enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if enabled:
            gc.enable()


def load_json(text: str, *, source: str | None = None, root: str = "") -> Any:
    """Parse JSON text and :func:`check_document` it; ``root`` names the document in errors
    (``"detail_json"`` for JSON held in a field of a file).

    A syntax error is raised as :class:`json.JSONDecodeError` for the caller to locate; nesting
    the parser cannot follow, or a whole number with more digits than Python converts, as an
    :class:`InputError`.
    """
    try:
        with _no_collection():
            data = json.loads(text)
    except json.JSONDecodeError:
        raise
    except (RecursionError, ValueError) as exc:
        raise _too_deep_or_long(exc, source, root) from None
    return check_document(data, source=source, root=root)


def load_toml(text: str, *, source: str | None = None) -> dict:
    """Parse TOML text and :func:`check_document` it.

    A syntax error is raised as :class:`tomllib.TOMLDecodeError` for the caller to locate, as
    :func:`tomllib.loads` raises it; nesting the parser cannot follow, or a whole number with
    more digits than Python converts, as an :class:`InputError`.
    """
    try:
        with _no_collection():
            data = tomllib.loads(text)
    except tomllib.TOMLDecodeError:
        raise
    except (RecursionError, ValueError) as exc:
        raise _too_deep_or_long(exc, source) from None
    return check_document(data, source=source)
