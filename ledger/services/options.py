"""Quantities as the user typed them in a command's options, parsed with the option's name.

A bare number takes the vehicle type's display unit (``default_unit``); with no vehicle named a
unit is needed. Errors name the option as typed (``--wheelbase = '0 m': a length greater than
0``).
"""

from __future__ import annotations

import re
from typing import overload

from ledger.errors import InputError
from ledger.units import canonical_unit, parse_quantity

__all__ = ["quantity_option", "typed_unit"]

_NUMBER = re.compile(r"^\s*[+\-\u2212]?(?:\d+\.?\d*|\.\d+)(?:[eE][+\-]?\d+)?\s*(.*?)\s*$")


def typed_unit(text: str | None, dimension: str) -> str | None:
    """The unit a user typed after the number, canonical, or None for a bare number.

    Examples
    --------
    >>> typed_unit("400 lb", "mass"), typed_unit("400", "mass"), typed_unit(None, "mass")
    ('lb', None, None)
    """
    if text is None:
        return None
    m = _NUMBER.match(str(text))
    if not m or not m.group(1):
        return None
    try:
        return canonical_unit(m.group(1), dimension)
    except Exception:  # noqa: BLE001 - the parser reports it with the field name
        return None


@overload
def quantity_option(text: str, dimension: str, default_unit: str | None, field: str, *,
                    positive: bool = False) -> float: ...
@overload
def quantity_option(text: None, dimension: str, default_unit: str | None, field: str, *,
                    positive: bool = False) -> None: ...
@overload
def quantity_option(text: str | None, dimension: str, default_unit: str | None, field: str, *,
                    positive: bool = False) -> float | None: ...
def quantity_option(text: str | None, dimension: str, default_unit: str | None, field: str, *,
                    positive: bool = False) -> float | None:
    """An option's quantity in SI, or None when the option was not given.

    A load (mass) must be 0 or more, a ``positive`` quantity above 0. The sign is checked here
    so that the message shows the option as typed, with its unit.

    Examples
    --------
    >>> quantity_option("2 lb", "mass", "kg", "--lf")
    0.90718474
    >>> quantity_option(None, "length", "m", "--track") is None
    True
    """
    if text is None:
        return None
    value = parse_quantity(text, dimension, default_unit, field=field)
    if positive and not value > 0:
        raise InputError(field, text, f"a {dimension} greater than 0")
    if dimension == "mass" and value < 0:
        raise InputError(field, text, "a mass of 0 or more")
    return value
