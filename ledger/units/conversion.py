"""The unit table: exact factors (NIST SP 811, appendix B), spellings, and conversions."""

from __future__ import annotations

import math
import re

from ledger.errors import Shown, UnitError

__all__ = ["LB", "INCH", "FOOT", "US_GALLON", "IMPERIAL_GALLON", "LBF", "SI_UNITS", "DIMENSIONS",
           "EXAMPLES", "describe_units", "units_of", "dimension_of", "canonical_unit",
           "from_unit", "to_unit"]

# --- exact definitions (NIST SP 811, appendix B) ------------------------------------------
#: 1 lb in kg, exact.
LB = 0.45359237
#: 1 in in m, exact.
INCH = 0.0254
#: 1 ft in m, exact.
FOOT = 0.3048
#: 1 US gallon in m³, exact.
US_GALLON = 3.785411784e-3
#: 1 imperial gallon in m³, exact.
IMPERIAL_GALLON = 4.54609e-3
#: 1 lbf in N, exact (lb × standard gravity 9.80665 m/s²).
LBF = 4.4482216152605
_SLUG = LBF / FOOT  # kg: 1 slug = 1 lbf·s²/ft

_MASS = {"kg": 1.0, "g": 1e-3, "t": 1e3, "lb": LB, "slug": _SLUG}
_LENGTH = {"m": 1.0, "cm": 1e-2, "mm": 1e-3, "in": INCH, "ft": FOOT}
_VOLUME = {"m3": 1.0, "L": 1e-3, "USgal": US_GALLON, "impgal": IMPERIAL_GALLON,
           "ft3": FOOT ** 3, "in3": INCH ** 3}
_FORCE = {"N": 1.0, "kN": 1e3, "lbf": LBF}
_ANGLE = {"deg": 1.0, "rad": 180.0 / math.pi}
# temperature: value_si = (value + offset) * factor, internal unit degC
_TEMPERATURE = {"degC": (1.0, 0.0), "degF": (5.0 / 9.0, -32.0), "K": (1.0, -273.15)}

SI_UNITS: dict[str, str] = {
    "mass": "kg",
    "length": "m",
    "volume": "m3",
    "density": "kg/m3",
    "moment": "kg*m",
    "inertia": "kg*m2",
    "area": "m2",
    "area_density": "kg/m2",
    "force": "N",
    "temperature": "degC",
    "angle": "deg",
}
"""Internal unit of each dimension (what every ``parse_*`` function returns)."""

DIMENSIONS: tuple[str, ...] = tuple(SI_UNITS)

_WORD = {
    "mass": "mass",
    "length": "length",
    "volume": "volume",
    "density": "density",
    "moment": "moment",
    "inertia": "moment of inertia",
    "area": "area",
    "area_density": "mass per area",
    "force": "force",
    "temperature": "temperature",
    "angle": "angle",
}

EXAMPLES: dict[str, str] = {
    "mass": "82 kg",
    "length": "47.5 in",
    "volume": "30 USgal",
    "density": "0.80 kg/L",
    "moment": "1200 lb*in",
    "inertia": "1500 kg*m2",
    "area": "2.4 m2",
    "area_density": "500 kg/m2",
    "force": "800 N",
    "temperature": "15 degC",
    "angle": "3.5 deg",
}
"""A typical written quantity of each dimension, used in messages and help text."""


def _build_table() -> dict[str, tuple[str, float, float]]:
    """Unit -> (dimension, factor, offset); value_si = (value + offset) * factor."""
    table: dict[str, tuple[str, float, float]] = {}

    def put(unit: str, dim: str, factor: float, offset: float = 0.0) -> None:
        assert unit not in table, unit
        table[unit] = (dim, factor, offset)

    for u, f in _MASS.items():
        put(u, "mass", f)
    for u, f in _LENGTH.items():
        put(u, "length", f)
    for u, f in _VOLUME.items():
        put(u, "volume", f)
    for u, f in _FORCE.items():
        put(u, "force", f)
    for u, f in _ANGLE.items():
        put(u, "angle", f)
    for u, (f, o) in _TEMPERATURE.items():
        put(u, "temperature", f, o)
    for lu, lf in _LENGTH.items():
        put(f"{lu}2", "area", lf * lf)
    for mu, mf in _MASS.items():
        for lu, lf in _LENGTH.items():
            put(f"{mu}*{lu}", "moment", mf * lf)
            put(f"{mu}*{lu}2", "inertia", mf * lf * lf)
            put(f"{mu}/{lu}2", "area_density", mf / (lf * lf))
        for vu, vf in _VOLUME.items():
            put(f"{mu}/{vu}", "density", mf / vf)
    return table


_TABLE = _build_table()

_ALIASES = {"lbs": "lb", "l": "L", "°C": "degC", "°F": "degF", "°": "deg"}


def _listing(dimension: str) -> str:
    """The accepted units of ``dimension``, as one clause for an error message."""
    m = ", ".join(_MASS)
    ln = ", ".join(_LENGTH)
    v = ", ".join(_VOLUME)
    simple = {"mass": m, "length": ln, "volume": v, "force": ", ".join(_FORCE),
              "angle": ", ".join(_ANGLE), "temperature": ", ".join(_TEMPERATURE)}
    if dimension in simple:
        return simple[dimension]
    if dimension == "area":
        return f"length2 such as m2, ft2 (lengths: {ln})"
    if dimension == "moment":
        return f"mass*length such as kg*m, kg*mm, lb*in (masses: {m}; lengths: {ln})"
    if dimension == "inertia":
        return f"mass*length2 such as kg*m2, slug*ft2 (masses: {m}; lengths: {ln})"
    if dimension == "density":
        return f"mass/volume such as kg/L, lb/USgal (masses: {m}; volumes: {v})"
    if dimension == "area_density":
        return f"mass/length2 such as kg/m2, lb/ft2 (masses: {m}; lengths: {ln})"
    raise KeyError(dimension)


def _units_clause(dimension: str) -> str:
    """'mass units: kg, g, t, lb, slug' -- the end of most unit error messages."""
    label = "mass-per-area" if dimension == "area_density" else _WORD[dimension]
    return f"{label} units: {_listing(dimension)}"


def _Raw(value: object) -> Shown:
    """A value shown in an error message as it is (no quotes): None, a list, a table; a
    boolean as TOML and JSON spell it."""
    text = ("true" if value else "false") if isinstance(value, bool) else repr(value)
    return Shown(text if len(text) <= 60 else text[:57] + "...")


def describe_units(dimension: str) -> str:
    """The accepted units of a dimension as a short phrase for messages and help text.

    Examples
    --------
    >>> describe_units("mass")
    'kg, g, t, lb, slug'
    >>> print(describe_units("density"))  # doctest: +NORMALIZE_WHITESPACE
    mass/volume such as kg/L, lb/USgal (masses: kg, g, t, lb, slug;
    volumes: m3, L, USgal, impgal, ft3, in3)
    """
    _check_dimension(dimension)
    return _listing(dimension)


def _check_dimension(dimension: str) -> None:
    if dimension not in SI_UNITS:
        raise ValueError(f"unknown dimension {dimension!r}; one of {', '.join(DIMENSIONS)}")


def _normalise_spelling(unit: str) -> str:
    u = unit.strip()
    u = u.replace("·", "*").replace("⋅", "*").replace("^2", "2").replace("^3", "3")
    u = u.replace("²", "2").replace("³", "3")
    u = re.sub(r"\s*([*/])\s*", r"\1", u)
    if u in _ALIASES:
        return _ALIASES[u]
    # aliases inside compound units: "lbs*in", "kg/l"
    parts = re.split(r"([*/])", u)
    return "".join(_ALIASES.get(p, p) if p not in "*/" else p for p in parts)


def units_of(dimension: str) -> tuple[str, ...]:
    """All canonical unit spellings of a dimension.

    Examples
    --------
    >>> units_of("mass")
    ('kg', 'g', 't', 'lb', 'slug')
    >>> units_of("volume")
    ('m3', 'L', 'USgal', 'impgal', 'ft3', 'in3')
    """
    _check_dimension(dimension)
    return tuple(u for u, (d, _, _) in _TABLE.items() if d == dimension)


def dimension_of(unit: str) -> str | None:
    """The dimension of a unit spelling, or None if it is not a unit wbledger knows.

    Examples
    --------
    >>> dimension_of("lb*in")
    'moment'
    >>> dimension_of("lb·in²")
    'inertia'
    >>> dimension_of("furlong") is None
    True
    """
    entry = _TABLE.get(_normalise_spelling(unit))
    return entry[0] if entry else None


_GALLONS = ("gal", "gallon", "gallons", "gals")
_GALLON_HINT = "Write USgal (3.785411784 L) or impgal (4.54609 L)"


def _unit_problem(unit: str, dimensions: tuple[str, ...]) -> tuple[str, str | None]:
    """Explain why ``unit`` is not a unit of any of ``dimensions``: (allowed text, hint)."""
    words = " or ".join(_WORD[d] for d in dimensions)
    clause = "; ".join(_units_clause(d) for d in dimensions)
    if unit in _GALLONS:
        if "volume" in dimensions:
            return f"'{unit}' is ambiguous; {clause}", _GALLON_HINT
        return f"'{unit}' is a unit of volume, not of {words}; {clause}", None
    other = _TABLE.get(unit)
    if other is not None:
        return f"'{unit}' is a unit of {_WORD[other[0]]}, not of {words}; {clause}", None
    joined = re.sub(r"[.\s-]+", "*", unit)
    hint = None
    if joined != unit and _TABLE.get(joined, ("",))[0] in dimensions:
        hint = f"Write '{joined}'"
    return f"unknown unit '{unit}'; {clause}", hint


def canonical_unit(unit: str, dimension: str | None = None, *, field: str = "unit") -> str:
    """Return the canonical spelling of ``unit``, checking its dimension if one is given.

    Raises
    ------
    UnitError
        If the unit is unknown or of another dimension.

    Examples
    --------
    >>> canonical_unit("lbs")
    'lb'
    >>> canonical_unit("kg·m²", "inertia")
    'kg*m2'
    >>> canonical_unit("in", "mass", field="units.mass")  # doctest: +NORMALIZE_WHITESPACE
    Traceback (most recent call last):
    ...
    ledger.errors.UnitError: units.mass = 'in': 'in' is a unit of length, not of mass;
    mass units: kg, g, t, lb, slug
    """
    if not isinstance(unit, str):
        want = f"a {_WORD[dimension]} unit as a string; {_units_clause(dimension)}" \
            if dimension else "a unit name as a string"
        raise UnitError(field, _Raw(unit), f"expected {want}")
    u = _normalise_spelling(unit)
    entry = _TABLE.get(u)
    if dimension is not None:
        _check_dimension(dimension)
        if entry is None or entry[0] != dimension:
            allowed, hint = _unit_problem(u, (dimension,))
            raise UnitError(field, unit, allowed, hint=hint)
    elif entry is None:
        raise UnitError(field, unit, "not a unit wbledger knows; see the units table in "
                        "demo_fleet/FORMAT.md")
    return u


def from_unit(value, unit: str, dimension: str | None = None):
    """Convert ``value`` given in ``unit`` to the internal unit (works on numpy arrays too).

    Examples
    --------
    >>> round(from_unit(2550, "lb"), 9)
    1156.6605435
    >>> from_unit(59, "degF")
    15.0
    """
    u = canonical_unit(unit, dimension)
    _, factor, offset = _TABLE[u]
    return (value + offset) * factor


def to_unit(value_si, unit: str, dimension: str | None = None):
    """Convert ``value_si`` (internal unit) to ``unit`` (works on numpy arrays too).

    Examples
    --------
    >>> to_unit(1.2065, "in")
    47.5
    >>> to_unit(15.0, "degF")
    59.0
    """
    u = canonical_unit(unit, dimension)
    _, factor, offset = _TABLE[u]
    return value_si / factor - offset


