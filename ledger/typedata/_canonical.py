"""Generic conversion of the type's dataclass tree to and from its canonical JSON-able dict."""

from __future__ import annotations

import dataclasses
import math
import types
import typing

from ledger.bounds import item_field
from ledger.errors import TypeDataError
from ledger.units import DisplayUnits


def _to_jsonable(obj):
    if isinstance(obj, DisplayUnits):
        return obj.to_dict()
    if dataclasses.is_dataclass(obj):
        return {f.name: _to_jsonable(getattr(obj, f.name)) for f in dataclasses.fields(obj)}
    if isinstance(obj, (tuple, list)):
        return [_to_jsonable(v) for v in obj]
    if isinstance(obj, float):
        if not math.isfinite(obj):
            raise ValueError("non-finite value in a vehicle type")
        return obj
    if obj is None or isinstance(obj, (str, int)):
        return obj
    raise TypeError(f"cannot convert {type(obj).__name__}")


_HINTS: dict[type, dict] = {}


def _hints(cls) -> dict:
    if cls not in _HINTS:
        _HINTS[cls] = typing.get_type_hints(cls)
    return _HINTS[cls]


class _Missing:
    def __str__(self) -> str:
        return "(missing)"


def _bad(where: str, value, what: str):
    if not isinstance(value, (str, int, float, _Missing)) or isinstance(value, bool):
        value = type(value).__name__
    return TypeDataError(where, value, f"expected {what} in the stored type")


def _from_jsonable(tp, value, where: str):
    origin = typing.get_origin(tp)
    if origin in (typing.Union, types.UnionType):
        args = typing.get_args(tp)
        if value is None:
            if type(None) in args:
                return None
            raise _bad(where, value, "a value")
        choices = [a for a in args if a is not type(None)]
        if len(choices) == 1:
            return _from_jsonable(choices[0], value, where)
        # a union of dataclasses told apart by their "basis" field
        if isinstance(value, dict):
            for c in choices:
                f = {x.name: x for x in dataclasses.fields(c)}.get("basis")
                if f is not None and f.default == value.get("basis"):
                    return _from_jsonable(c, value, where)
        raise _bad(where, value, "one of " + ", ".join(c.__name__ for c in choices))
    if origin is tuple:
        args = typing.get_args(tp)
        if not isinstance(value, (list, tuple)):
            raise _bad(where, value, "a list")
        if len(args) == 2 and args[1] is Ellipsis:
            return tuple(_from_jsonable(args[0], v, item_field(where, i))
                         for i, v in enumerate(value))
        if len(args) != len(value):
            raise _bad(where, value, f"a list of {len(args)}")
        return tuple(_from_jsonable(a, v, item_field(where, i))
                     for i, (a, v) in enumerate(zip(args, value)))
    if tp is DisplayUnits:
        if not isinstance(value, dict) or set(value) != {"mass", "length", "volume",
                                                         "moment_divisor"}:
            raise _bad(where, value, "display units")
        return DisplayUnits.from_dict(value)
    if dataclasses.is_dataclass(tp):
        if not isinstance(value, dict):
            raise _bad(where, value, f"a {tp.__name__} dict")
        hints = _hints(tp)
        fields = dataclasses.fields(tp)
        names = {f.name for f in fields}
        extra = set(value) - names
        if extra:
            raise _bad(f"{where}.{sorted(extra)[0]}", value[sorted(extra)[0]], "no such key")
        kwargs = {}
        for f in fields:
            if f.name not in value:
                if f.default is dataclasses.MISSING and f.default_factory is dataclasses.MISSING:
                    raise _bad(f"{where}.{f.name}", _Missing(), "a value")
                continue
            v = _from_jsonable(hints[f.name], value[f.name], f"{where}.{f.name}")
            if not f.init:
                if v != f.default:
                    raise _bad(f"{where}.{f.name}", v, repr(f.default))
                continue
            kwargs[f.name] = v
        return tp(**kwargs)
    if tp is float:
        if isinstance(value, bool) or not isinstance(value, (int, float)) \
                or not math.isfinite(value):
            raise _bad(where, value, "a finite number")
        return float(value)
    if tp is int:
        if isinstance(value, bool) or not isinstance(value, int):
            raise _bad(where, value, "an integer")
        return value
    if tp is bool:
        if not isinstance(value, bool):
            raise _bad(where, value, "true or false")
        return value
    if tp is str:
        if not isinstance(value, str):
            raise _bad(where, value, "a string")
        return value
    raise TypeError(f"unsupported type {tp!r}")  # a programming error in this module
