"""Reading a TOML table of a type file: typed getters, typo protection, located errors."""

from __future__ import annotations

import difflib
import math

from ledger.bounds import item_field
from ledger.errors import TypeDataError
from ledger.typedata._messages import _MISSING, _listing, _show, _typename

_NAME_MAX = 60


def _err(field: str, value, allowed: str, hint: str | None = None) -> TypeDataError:
    return TypeDataError(field, _show(value), allowed, hint=hint)



class _Table:
    """A TOML table being read: its dotted path, and typo protection on its keys."""

    def __init__(self, data: dict, path: str, allowed: tuple[str, ...]) -> None:
        self.data = data
        self.path = path
        for key, value in data.items():
            if key not in allowed:
                close = difflib.get_close_matches(key, allowed, n=1, cutoff=0.6)
                raise _err(self.field(key), value,
                           f"unknown key; allowed here: {_listing(allowed)}",
                           hint=f"Did you mean '{close[0]}'?" if close else None)

    def field(self, key: str) -> str:
        return f"{self.path}.{key}" if self.path else key

    def has(self, key: str) -> bool:
        return key in self.data

    def get(self, key: str, default=None):
        return self.data.get(key, default)

    def require(self, key: str, what: str):
        if key not in self.data:
            raise TypeDataError(self.field(key), _MISSING, f"required: {what}")
        return self.data[key]

    def sub(self, key: str, allowed: tuple[str, ...], *, required: bool = False,
            what: str | None = None) -> _Table | None:
        if key not in self.data:
            if required:
                raise TypeDataError(self.field(key), _MISSING,
                                    f"required: {what or f'a table [{self.field(key)}]'}")
            return None
        value = self.data[key]
        if not isinstance(value, dict):
            raise _err(self.field(key), value,
                       f"expected a table [{self.field(key)}], got {_typename(value)}")
        return _Table(value, self.field(key), allowed)

    def string(self, key: str, *, required: bool = False, what: str = "a string",
               default: str | None = None, choices: tuple[str, ...] | None = None) -> str | None:
        if key not in self.data:
            if required:
                raise TypeDataError(self.field(key), _MISSING, f"required: {what}")
            return default
        value = self.data[key]
        if not isinstance(value, str):
            raise _err(self.field(key), value, f"expected {what}, got {_typename(value)}")
        if choices is not None and value not in choices:
            close = difflib.get_close_matches(value, choices, n=1, cutoff=0.6)
            raise _err(self.field(key), value, f"expected one of {_listing(choices)}",
                       hint=f"Did you mean '{close[0]}'?" if close else None)
        return value

    def name(self, key: str = "name", *, what: str = "a name") -> str:
        value = self.string(key, required=True, what=what)
        if not value or value != value.strip() or len(value) > _NAME_MAX:
            raise _err(self.field(key), value, f"expected a name of 1-{_NAME_MAX} characters "
                       "without leading or trailing spaces")
        return value

    def number(self, key: str, *, required: bool = False, what: str = "a number",
               default: float | None = None, minimum: float | None = None,
               above: float | None = None, below: float | None = None) -> float | None:
        if key not in self.data:
            if required:
                raise TypeDataError(self.field(key), _MISSING, f"required: {what}")
            return default
        value = self.data[key]
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise _err(self.field(key), value, f"expected {what}, got {_typename(value)}")
        if not math.isfinite(value):
            raise _err(self.field(key), value, f"expected {what} (finite)")
        value = float(value)
        if (minimum is not None and value < minimum) or (above is not None and value <= above) \
                or (below is not None and value >= below):
            raise _err(self.field(key), self.data[key], f"expected {what}")
        return value

    def integer(self, key: str, *, default: int, minimum: int, what: str) -> int:
        if key not in self.data:
            return default
        value = self.data[key]
        if isinstance(value, bool) or not isinstance(value, int) or value < minimum:
            raise _err(self.field(key), value, f"expected {what}")
        return value

    def array(self, key: str, *, what: str, required: bool = False) -> list | None:
        if key not in self.data:
            if required:
                raise TypeDataError(self.field(key), _MISSING, f"required: {what}")
            return None
        value = self.data[key]
        if not isinstance(value, list):
            raise _err(self.field(key), value, f"expected {what}, got {_typename(value)}")
        return value


def _tables(data: dict, key: str, path: str | None = None) -> list[dict]:
    """An array of tables (``[[key]]``); [] if absent."""
    where = path or key
    value = data.get(key, [])
    if not isinstance(value, list) or not all(isinstance(v, dict) for v in value):
        got = _typename(value) if not isinstance(value, list) else "an array of other values"
        raise _err(where, value, f"expected an array of tables [[{where}]], got {got}")
    return value


def _named_path(base: str, index: int, raw: dict) -> str:
    """``station['pilot']`` when the entry has a usable name, else ``station[3]`` (the third,
    counted from 1 by :func:`ledger.bounds.item_field`)."""
    name = raw.get("name")
    if isinstance(name, str) and name and name == name.strip() and len(name) <= _NAME_MAX:
        return f"{base}[{name!r}]"
    return item_field(base, index)
