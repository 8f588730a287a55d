"""What a user types for the ledger, read into SI: dates, texts, quantities and item shapes.

Quantities are numbers in SI (kg, m) or strings as a user types them ("12 lb", "47.5 in",
"30 USgal"), in which a bare number takes the display unit given (the vehicle type's). Every
refusal is an :class:`~ledger.errors.InputError` naming the option or field and what it takes.
"""

from __future__ import annotations

import datetime as dt
import math
from collections.abc import Mapping
from typing import Any

from ledger.bounds import TEXT_MAX, check_text
from ledger.errors import InputError
from ledger.typedata.model import SHAPE_DIMENSIONS
from ledger.units import parse_quantity

__all__ = [
    "parse_date",
    "parse_text",
    "parse_amount",
    "parse_mass",
    "parse_length",
    "parse_shape",
    "match_name",
]


def parse_date(value: dt.date | str | None, *, field: str = "--date",
               today: dt.date | None = None) -> dt.date:
    """A date as given (``YYYY-MM-DD`` text or a date); ``None`` is today. Not after today.

    Examples
    --------
    >>> import datetime as dt
    >>> parse_date("2026-03-01", today=dt.date(2026, 12, 1))
    datetime.date(2026, 3, 1)
    >>> parse_date("2027-01-01", today=dt.date(2026, 12, 1))
    Traceback (most recent call last):
    ...
    ledger.errors.InputError: --date = '2027-01-01': a date not after today (2026-12-01)
    >>> parse_date("1/3/2026")
    Traceback (most recent call last):
    ...
    ledger.errors.InputError: --date = '1/3/2026': a date written YYYY-MM-DD, e.g. 2026-03-01
    """
    today = today or dt.date.today()
    if value is None:
        return today
    if isinstance(value, dt.datetime):
        value = value.date()
    if isinstance(value, str):
        text = value.strip()
        try:
            if len(text) != 10:
                raise ValueError
            parsed = dt.date.fromisoformat(text)
        except ValueError:
            raise InputError(field, value, "a date written YYYY-MM-DD, e.g. 2026-03-01") from None
    elif isinstance(value, dt.date):
        parsed = value
    else:
        raise InputError(field, value, "a date written YYYY-MM-DD, e.g. 2026-03-01")
    if parsed > today:
        raise InputError(field, parsed.isoformat(), f"a date not after today ({today})")
    return parsed


def parse_text(value, field: str, *, required: bool = False,
               max_len: int = TEXT_MAX) -> str | None:
    """``value`` stripped, or None when empty; no NUL and at most ``max_len`` characters
    (:func:`ledger.bounds.check_text`)."""
    if value is None or (isinstance(value, str) and not value.strip()):
        if required:
            raise InputError(field, value or "", "required: a non-empty text")
        return None
    return check_text(field, str(value).strip(), max_len)


def parse_amount(value, dimension: str, default_unit: str | None, field: str, *,
                 nonnegative: bool = False, positive: bool = False) -> float:
    """A ``dimension`` in SI from a number (SI already) or a user's text (``default_unit``
    when bare)."""
    if value is None:
        raise InputError(field, "", f"required: a {dimension}")
    if isinstance(value, str):
        v = parse_quantity(value, dimension, default_unit, field=field)
    elif isinstance(value, bool) or not isinstance(value, (int, float)):
        raise InputError(field, value, f"a finite {dimension}")
    else:
        v = float(value)
        if not math.isfinite(v):
            raise InputError(field, v, f"a finite {dimension}")
    if positive and v <= 0:
        raise InputError(field, value, f"a {dimension} greater than 0")
    if nonnegative and v < 0:
        raise InputError(field, value, f"a {dimension} of 0 or more")
    return v + 0.0


def parse_mass(value, units, field: str) -> float:
    """A mass of 0 or more, bare numbers in ``units.mass`` (``units`` a type's display units)."""
    return parse_amount(value, "mass", units.mass if units else None, field, nonnegative=True)


def parse_length(value, units, field: str) -> float:
    """A length (an arm), bare numbers in ``units.length``."""
    return parse_amount(value, "length", units.length if units else None, field)


def parse_shape(spec, units=None, *, field: str = "--shape") -> dict | None:
    """An item's shape for its own inertia: ``"KIND,KEY=VALUE,…"`` text or a dict.

    Kinds and keys as in type files: ``box,length=…,width=…,height=…``;
    ``cylinder,radius=…,length=…,axis=x``; ``hollow_cylinder,radius=…,inner_radius=…,
    length=…,axis=…``; ``disk,radius=…,axis=…``; ``rod,length=…,axis=…``; ``sphere,radius=…``;
    ``point``. Lengths take the type's display unit when bare. Returns the SI dict stored in
    the entry's detail (``{"kind": "box", "length_m": …}``), or None.

    Examples
    --------
    >>> parse_shape("box,length=0.5 m,width=0.4 m,height=20 cm")
    {'kind': 'box', 'length_m': 0.5, 'width_m': 0.4, 'height_m': 0.2}
    >>> parse_shape("cone,radius=1 m")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    ledger.errors.InputError: --shape = 'cone': one of point, box, cylinder, hollow_cylinder, ...
    """
    if spec is None or spec == "":
        return None
    if isinstance(spec, dict):
        raw = dict(spec)
        kind = raw.pop("kind", None)
    else:
        parts = [p.strip() for p in str(spec).split(",")]
        kind, raw = parts[0], {}
        for p in parts[1:]:
            key, sep, val = p.partition("=")
            if not sep:
                raise InputError(field, spec, "KIND,KEY=VALUE,… e.g. box,length=20 in,"
                                 "width=12 in,height=8 in")
            raw[key.strip()] = val.strip()
    if kind not in SHAPE_DIMENSIONS:
        raise InputError(field, kind, "one of " + ", ".join(SHAPE_DIMENSIONS))
    dims = SHAPE_DIMENSIONS[kind]
    out: dict[str, Any] = {"kind": kind}
    for key in raw:
        base = key[:-2] if key.endswith("_m") else key
        if base not in dims:
            raise InputError(f"{field} {key}", raw[key],
                             f"not a dimension of a {kind}; it takes "
                             + (", ".join(dims) or "none"))
    for d in dims:
        value = raw.get(d, raw.get(f"{d}_m"))
        if value is None:
            raise InputError(f"{field} {d}", "(missing)",
                             f"required for a {kind}: " + ", ".join(dims))
        if d == "axis":
            if value not in ("x", "y", "z"):
                raise InputError(f"{field} axis", value, "x, y or z")
            out["axis"] = value
        else:
            out[f"{d}_m"] = parse_amount(value, "length", units.length if units else None,
                                      f"{field} {d}", positive=True)
    if kind == "hollow_cylinder" and out["inner_radius_m"] >= out["radius_m"]:
        raise InputError(f"{field} inner_radius", raw.get("inner_radius"),
                         "less than the radius")
    return out


def match_name(name: str, choices: Mapping[str, Any]) -> str | None:
    """``name`` as one of ``choices``: itself, or the one choice equal to it ignoring case and
    surrounding spaces; None otherwise."""
    if name in choices:
        return name
    folded = [c for c in choices if c.casefold() == name.strip().casefold()]
    return folded[0] if len(folded) == 1 else None
