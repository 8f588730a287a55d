"""Quantities as users type them ('82 kg', '180 lb', '30 USgal'), parsed into SI."""

from __future__ import annotations

import math
import re

from ledger.errors import UnitError
from ledger.units.conversion import (
    _TABLE,
    _WORD,
    EXAMPLES,
    _check_dimension,
    _normalise_spelling,
    _Raw,
    _unit_problem,
    _units_clause,
    canonical_unit,
)

_NUMBER = r"[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"
_QUANTITY_RE = re.compile(rf"^\s*({_NUMBER})\s*(.*?)\s*$")
_NONFINITE_RE = re.compile(r"^\s*[+-]?(nan|inf|infinity)\b", re.IGNORECASE)
_GROUPED_RE = re.compile(r"^\s*([+-]?\d{1,3}(?:,\d{3})+(?:\.\d+)?)(\s*\S.*)?$")


def _shown(value: object) -> object:
    return value if isinstance(value, (int, float, str)) and not isinstance(value, bool) \
        else _Raw(value)


def _split(value: object, dimension: str, field: str) -> tuple[float, str | None]:
    """Split a user value into (number, unit or None for a bare number)."""
    word = _WORD[dimension]
    if isinstance(value, bool) or not isinstance(value, (int, float, str)):
        raise UnitError(field, _shown(value), f"expected a {word}: a number, or a string "
                        f"such as '{EXAMPLES[dimension]}'")
    finite = (f"not a finite number; {'an' if word[:1] in 'aeiou' else 'a'} {word} must be a "
              "finite number")
    if isinstance(value, (int, float)):
        number = float(value)
        if not math.isfinite(number):
            raise UnitError(field, value, finite)
        return number, None
    text = value.replace("\u2212", "-")
    if _NONFINITE_RE.match(text):
        raise UnitError(field, value, finite)
    if "," in text:
        g = _GROUPED_RE.match(text)
        hint = f"Write '{g.group(1).replace(',', '')}{g.group(2) or ''}'" if g else None
        raise UnitError(field, value, f"commas are not accepted; write a {word} without "
                        f"thousands separators and with '.' for decimals, e.g. "
                        f"'{EXAMPLES[dimension]}'", hint=hint)
    m = _QUANTITY_RE.match(text)
    if not m:
        raise UnitError(field, value, f"no number; write a {word} as a number and a unit, "
                        f"e.g. '{EXAMPLES[dimension]}'; {_units_clause(dimension)}")
    number = float(m.group(1))
    if not math.isfinite(number):  # e.g. "1e999 kg"
        raise UnitError(field, value, finite)
    unit = m.group(2)
    return number, (unit if unit else None)


def is_bare_number(value: object) -> bool:
    """True if ``value`` is a number without a unit (an int, a float or a numeric string).

    Examples
    --------
    >>> is_bare_number(85.5), is_bare_number("85.5"), is_bare_number("85.5 lb*in")
    (True, True, False)
    >>> is_bare_number(True)
    False
    """
    if isinstance(value, bool):
        return False
    if isinstance(value, (int, float)):
        return True
    if isinstance(value, str):
        m = _QUANTITY_RE.match(value.replace("\u2212", "-"))
        return bool(m) and not m.group(2)
    return False


def parse_quantity(value: object, dimension: str, default_unit: str | None = None, *,
                   field: str = "value") -> float:
    """Parse a user quantity and return it in the internal unit of ``dimension``.

    Parameters
    ----------
    value : int, float or str
        ``82``, ``82.5``, ``"82"``, ``"82 kg"``, ``"180lb"``, ``"-3.5 in"``.
    dimension : str
        One of :data:`DIMENSIONS`.
    default_unit : str, optional
        Unit of a bare number. If None, a unit is required.
    field : str
        Name of the field or option, used in error messages.

    Returns
    -------
    float
        The value in :data:`SI_UNITS` ``[dimension]``.

    Raises
    ------
    UnitError
        Unknown unit, unit of another dimension, ambiguous ``gal``, a non-finite number,
        a comma, no number, or a bare number when no default unit is given.

    Examples
    --------
    >>> parse_quantity("180 lb", "mass")
    81.6466266
    >>> parse_quantity(47.5, "length", "in")
    1.2065
    >>> parse_quantity("3 in", "mass", "kg",
    ...                field="cargo.max_mass")  # doctest: +NORMALIZE_WHITESPACE
    Traceback (most recent call last):
    ...
    ledger.errors.UnitError: cargo.max_mass = '3 in': 'in' is a unit of length, not of mass; mass
    units: kg, g, t, lb, slug
    """
    return parse_quantity_of(value, (dimension,), default_unit, field=field)[0]


def parse_quantity_of(value: object, dimensions: tuple[str, ...], default_unit: str | None,
                      *, field: str = "value") -> tuple[float, str]:
    """Parse a quantity that may be of one of several dimensions (a tank in L or in kg).

    A bare number takes ``default_unit`` and so its dimension.

    Returns
    -------
    (float, str)
        The value in the internal unit, and the dimension it turned out to be.

    Examples
    --------
    >>> parse_quantity_of("30 USgal", ("volume", "mass"), "L")
    (0.11356235352, 'volume')
    >>> parse_quantity_of("120 kg", ("volume", "mass"), "L")
    (120.0, 'mass')
    >>> parse_quantity_of("2 m", ("volume", "mass"), "L",
    ...                   field="tank.capacity")  # doctest: +NORMALIZE_WHITESPACE
    Traceback (most recent call last):
    ...
    ledger.errors.UnitError: tank.capacity = '2 m': 'm' is a unit of length, not of volume or mass;
    volume units: m3, L, USgal, impgal, ft3, in3; mass units: kg, g, t, lb, slug
    """
    if isinstance(dimensions, str):
        dimensions = (dimensions,)
    for d in dimensions:
        _check_dimension(d)
    number, unit = _split(value, dimensions[0], field)
    if unit is None:
        if default_unit is None:
            raise UnitError(field, value, "a unit is required; "
                            + "; ".join(_units_clause(d) for d in dimensions))
        unit = canonical_unit(default_unit, field=field)
    u = _normalise_spelling(unit)
    entry = _TABLE.get(u)
    if entry is None or entry[0] not in dimensions:
        allowed, hint = _unit_problem(u, tuple(dimensions))
        raise UnitError(field, value, allowed, hint=hint)
    dim, factor, offset = entry
    result = (number + offset) * factor
    if not math.isfinite(result):  # overflow in the conversion itself
        raise UnitError(field, value, f"not a finite number; a {_WORD[dim]} must be a "
                        "finite number")
    return result + 0.0, dim  # + 0.0 turns -0.0 into 0.0


def parse_mass(value: object, default_unit: str | None = None, *, field: str = "mass") -> float:
    """Parse a mass; return kg.

    Examples
    --------
    >>> parse_mass("82 kg")
    82.0
    >>> parse_mass(170, "lb")
    77.1107029
    >>> parse_mass("82 kgs", field="pilot")
    Traceback (most recent call last):
    ...
    ledger.errors.UnitError: pilot = '82 kgs': unknown unit 'kgs'; mass units: kg, g, t, lb, slug
    """
    return parse_quantity(value, "mass", default_unit, field=field)


def parse_length(value: object, default_unit: str | None = None, *,
                 field: str = "length") -> float:
    """Parse a length (arm, span, distance); return m.

    Examples
    --------
    >>> round(parse_length("-3.5 in"), 12)
    -0.0889
    >>> parse_length("1.2 m")
    1.2
    """
    return parse_quantity(value, "length", default_unit, field=field)


def parse_volume(value: object, default_unit: str | None = None, *,
                 field: str = "volume") -> float:
    """Parse a volume; return m³.

    Examples
    --------
    >>> parse_volume("25 L")
    0.025
    >>> parse_volume("30 gal")  # doctest: +NORMALIZE_WHITESPACE
    Traceback (most recent call last):
    ...
    ledger.errors.UnitError: volume = '30 gal': 'gal' is ambiguous; volume units: m3, L, USgal,
    impgal, ft3, in3. Write USgal (3.785411784 L) or impgal (4.54609 L)
    """
    return parse_quantity(value, "volume", default_unit, field=field)


def parse_density(value: object, default_unit: str | None = None, *,
                  field: str = "density") -> float:
    """Parse a density; return kg/m³.

    Examples
    --------
    >>> round(parse_density("6.0 lb/USgal"), 6)
    718.958564
    >>> parse_density("0.8 kg/L")
    800.0
    """
    return parse_quantity(value, "density", default_unit, field=field)


def parse_moment(value: object, default_unit: str | None = None, *,
                 field: str = "moment") -> float:
    """Parse a moment (mass × arm); return kg·m.

    Examples
    --------
    >>> round(parse_moment("1000 lb*in"), 9)
    11.521246198
    >>> parse_moment("1000 lb in")  # doctest: +NORMALIZE_WHITESPACE
    Traceback (most recent call last):
    ...
    ledger.errors.UnitError: moment = '1000 lb in': unknown unit 'lb in'; moment units: mass*length
    such as kg*m, kg*mm, lb*in (masses: kg, g, t, lb, slug; lengths: m, cm, mm, in, ft). Write
    'lb*in'
    """
    return parse_quantity(value, "moment", default_unit, field=field)


def parse_inertia(value: object, default_unit: str | None = None, *,
                  field: str = "inertia") -> float:
    """Parse a moment (or product) of inertia; return kg·m².

    Examples
    --------
    >>> round(parse_inertia("1 slug*ft2"), 9)
    1.355817948
    """
    return parse_quantity(value, "inertia", default_unit, field=field)


def parse_area(value: object, default_unit: str | None = None, *, field: str = "area") -> float:
    """Parse an area; return m².

    Examples
    --------
    >>> round(parse_area("1 ft2"), 8)
    0.09290304
    """
    return parse_quantity(value, "area", default_unit, field=field)


def parse_area_density(value: object, default_unit: str | None = None, *,
                       field: str = "floor loading") -> float:
    """Parse a mass per area (floor-loading limit); return kg/m².

    Examples
    --------
    >>> round(parse_area_density("100 lb/ft2"), 6)
    488.242764
    """
    return parse_quantity(value, "area_density", default_unit, field=field)


def parse_force(value: object, default_unit: str | None = None, *,
                field: str = "force") -> float:
    """Parse a force (e.g. a scale reading in lbf or N); return N.

    Examples
    --------
    >>> parse_force("1 lbf")
    4.4482216152605
    """
    return parse_quantity(value, "force", default_unit, field=field)


def parse_temperature(value: object, default_unit: str | None = None, *,
                      field: str = "temperature") -> float:
    """Parse an absolute temperature; return °C.

    Examples
    --------
    >>> parse_temperature("59 degF")
    15.0
    >>> parse_temperature("288.15 K")
    15.0
    >>> parse_temperature("15 °C")
    15.0
    """
    return parse_quantity(value, "temperature", default_unit, field=field)


def parse_angle(value: object, default_unit: str | None = None, *,
                field: str = "angle") -> float:
    """Parse an angle; return degrees.

    Examples
    --------
    >>> parse_angle("3.5°")
    3.5
    """
    return parse_quantity(value, "angle", default_unit, field=field)


