"""Units: parse what users type, keep SI inside, convert back for display.

wbledger stores and computes in one set of internal units and converts only at the edges
(type files, plan files, command-line options, reports):

==============  ==============  ====================================================
dimension       internal unit   accepted spellings
==============  ==============  ====================================================
mass            kg              kg, g, t (tonne), lb, slug
length          m               m, cm, mm, in, ft
volume          m3              m3, L, USgal, impgal, ft3, in3
density         kg/m3           any mass unit / volume unit: kg/L, lb/USgal, kg/m3, ...
moment          kg*m            any mass unit * length unit: kg*m, kg*mm, lb*in, ...
inertia         kg*m2           any mass unit * length unit + "2": kg*m2, slug*ft2, ...
area            m2              any length unit + "2": m2, ft2, in2, ...
area_density    kg/m2           any mass unit / area unit: kg/m2, lb/ft2, ...
force           N               N, kN, lbf
temperature     degC            degC, degF, K   (absolute temperatures, not differences)
angle           deg             deg, rad
==============  ==============  ====================================================

Spelling rules (chosen so that a unit is never ambiguous):

* Units are case-sensitive (``mm`` is not ``Mm``). ``l`` is accepted for ``L`` and ``lbs``
  for ``lb``.
* Compound units join with ``*`` and ``/``; the middle dot ``·`` (or ``⋅``) is read as ``*``,
  ``²``/``^2`` as ``2`` and ``³``/``^3`` as ``3``; ``°C``, ``°F``, ``°`` are read as ``degC``,
  ``degF``, ``deg``. ``lb.in`` or ``lb in`` are refused with a hint to write ``lb*in``, because
  a dot also marks decimals.
* ``gal`` alone is refused: write ``USgal`` (3.785411784 L) or ``impgal`` (4.54609 L).
* Numbers use ``.`` for decimals and no thousands separators: ``"2,550 lb"`` is refused,
  because ``2,550`` means 2.55 in much of the world. (In TOML, write ``2_550`` as a bare
  number if you want grouping.) A space between number and unit is optional; a leading
  ``+``, ``-`` or ``−`` (U+2212) sign is accepted.
* A bare number (int, float, or a string holding only a number) takes the caller's default
  unit — in a type file the display unit the file declares. Booleans are not numbers.

Conversion factors are the exact definitions of NIST SP 811 (2008), appendix B:
1 lb = 0.45359237 kg, 1 in = 0.0254 m, 1 ft = 0.3048 m, 1 US gal = 3.785411784 L,
1 imperial gal = 4.54609 L, 1 lbf = 4.4482216152605 N; 1 slug = 1 lbf·s²/ft (derived).

This module is pure Python and imports nothing heavy, so the command line starts fast.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from ledger.errors import UnitError

__all__ = [
    "DIMENSIONS",
    "EXAMPLES",
    "SI_UNITS",
    "DisplayUnits",
    "canonical_unit",
    "describe_units",
    "dimension_of",
    "display_decimals",
    "nonzero_excess",
    "format_quantity",
    "from_unit",
    "is_bare_number",
    "parse_angle",
    "parse_area",
    "parse_area_density",
    "parse_density",
    "parse_force",
    "parse_inertia",
    "parse_length",
    "parse_mass",
    "parse_moment",
    "parse_quantity",
    "parse_quantity_of",
    "parse_temperature",
    "parse_volume",
    "to_unit",
    "units_of",
]

# --- exact definitions (NIST SP 811, appendix B) ------------------------------------------
_LB = 0.45359237  # kg, exact
_IN = 0.0254  # m, exact
_FT = 0.3048  # m, exact
_US_GAL = 3.785411784e-3  # m3, exact
_IMP_GAL = 4.54609e-3  # m3, exact
_LBF = 4.4482216152605  # N, exact (lb × standard gravity 9.80665 m/s²)
_SLUG = _LBF / _FT  # kg: 1 slug = 1 lbf·s²/ft

_MASS = {"kg": 1.0, "g": 1e-3, "t": 1e3, "lb": _LB, "slug": _SLUG}
_LENGTH = {"m": 1.0, "cm": 1e-2, "mm": 1e-3, "in": _IN, "ft": _FT}
_VOLUME = {"m3": 1.0, "L": 1e-3, "USgal": _US_GAL, "impgal": _IMP_GAL,
           "ft3": _FT ** 3, "in3": _IN ** 3}
_FORCE = {"N": 1.0, "kN": 1e3, "lbf": _LBF}
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


def describe_units(dimension: str) -> str:
    """The accepted units of a dimension as a short phrase for messages and help text.

    Examples
    --------
    >>> describe_units("mass")
    'kg, g, t, lb, slug'
    >>> describe_units("density")
    'mass/volume such as kg/L, lb/USgal (masses: kg, g, t, lb, slug; volumes: m3, L, USgal, impgal, ft3, in3)'
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
    >>> canonical_unit("in", "mass", field="units.mass")
    Traceback (most recent call last):
    ...
    ledger.errors.UnitError: units.mass = 'in': 'in' is a unit of length, not of mass; mass units: kg, g, t, lb, slug
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


_NUMBER = r"[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"
_QUANTITY_RE = re.compile(rf"^\s*({_NUMBER})\s*(.*?)\s*$")
_NONFINITE_RE = re.compile(r"^\s*[+-]?(nan|inf|infinity)\b", re.IGNORECASE)
_GROUPED_RE = re.compile(r"^\s*([+-]?\d{1,3}(?:,\d{3})+(?:\.\d+)?)(\s*\S.*)?$")


class _Raw:
    """A value shown in an error message as it is (no quotes): None, a list, a table."""

    def __init__(self, value: object) -> None:
        text = repr(value)
        self.text = text if len(text) <= 60 else text[:57] + "..."

    def __str__(self) -> str:
        return self.text


def _shown(value: object) -> object:
    return value if isinstance(value, (int, float, str)) and not isinstance(value, bool) \
        else _Raw(value)


def _split(value: object, dimension: str, field: str) -> tuple[float, str | None]:
    """Split a user value into (number, unit or None for a bare number)."""
    word = _WORD[dimension]
    if isinstance(value, bool) or not isinstance(value, (int, float, str)):
        raise UnitError(field, _shown(value), f"expected a {word}: a number, or a string "
                        f"such as '{EXAMPLES[dimension]}'")
    finite = f"not a finite number; a {word} must be a finite number"
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
    >>> parse_quantity("3 in", "mass", "kg", field="cargo.max_mass")
    Traceback (most recent call last):
    ...
    ledger.errors.UnitError: cargo.max_mass = '3 in': 'in' is a unit of length, not of mass; mass units: kg, g, t, lb, slug
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
    >>> parse_quantity_of("2 m", ("volume", "mass"), "L", field="tank.capacity")
    Traceback (most recent call last):
    ...
    ledger.errors.UnitError: tank.capacity = '2 m': 'm' is a unit of length, not of volume or mass; volume units: m3, L, USgal, impgal, ft3, in3; mass units: kg, g, t, lb, slug
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
    >>> parse_volume("30 gal")
    Traceback (most recent call last):
    ...
    ledger.errors.UnitError: volume = '30 gal': 'gal' is ambiguous; volume units: m3, L, USgal, impgal, ft3, in3. Write USgal (3.785411784 L) or impgal (4.54609 L)
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
    >>> parse_moment("1000 lb in")
    Traceback (most recent call last):
    ...
    ledger.errors.UnitError: moment = '1000 lb in': unknown unit 'lb in'; moment units: mass*length such as kg*m, kg*mm, lb*in (masses: kg, g, t, lb, slug; lengths: m, cm, mm, in, ft). Write 'lb*in'
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


def format_quantity(value_si: float, unit: str, digits: int = 1) -> str:
    """Format an internal-unit value in ``unit`` with ``digits`` decimals.

    The result parses back with :func:`parse_quantity` (no thousands separators).

    Examples
    --------
    >>> format_quantity(81.6466266, "lb", 1)
    '180.0 lb'
    >>> format_quantity(-0.00001, "m", 2)
    '0.00 m'
    >>> format_quantity(11.521246198, "lb*in", 0)
    '1000 lb*in'
    """
    u = canonical_unit(unit)
    v = to_unit(value_si, u)
    text = f"{v:.{digits}f}"
    if float(text) == 0.0:
        text = text.lstrip("-")
    return f"{text} {u}"


# Decimals a display unit shows. Masses: the unit's usual decimals, more for a small vehicle
# (see display_decimals). Lengths (arms, CGs): to 0.1 mm in metric units and 0.01 in in
# imperial ones (ft to 0.0001 ft, about 0.001 in), whatever the size of the vehicle.
_MASS_DECIMALS = {"kg": 1, "lb": 1, "g": 0, "t": 3, "slug": 2}
_LENGTH_DECIMALS = {"m": 4, "cm": 2, "mm": 1, "in": 2, "ft": 4}
_MASS_SIG_FIGS = 4
_MAX_DECIMALS = 6


def nonzero_excess(number: str, amount: float) -> str:
    """``number``, the display of a positive excess ``amount``, or where it shows as zero,
    "less than" its last digit: a message never says a limit is exceeded by 0.00.

    Examples
    --------
    >>> nonzero_excess("0.00", 0.001), nonzero_excess("0", 0.2), nonzero_excess("1.25", 1.25)
    ('less than 0.01', 'less than 1', '1.25')
    """
    if not (amount > 0 and float(number.replace(",", "")) == 0.0):
        return number
    decimals = len(number.partition(".")[2])
    return "less than " + (f"0.{'0' * (decimals - 1)}1" if decimals else "1")


def display_decimals(unit: str, scale_si: float | None = None) -> int:
    """How many decimals to show a mass or a length in ``unit`` with.

    A length gets a fixed resolution: 0.1 mm in metric units, 0.01 in in imperial ones. A mass
    gets the unit's usual decimals (one for kg and lb), and more when ``scale_si`` (a typical
    mass of the vehicle, in kg: its empty mass) would otherwise show fewer than four
    significant figures, so that a 3.1 kg drone reads "3.100 kg", not "3.1 kg"; every mass of
    that vehicle then shows the same decimals (common practice: a column of one table keeps
    one number of decimals). Other units: one decimal.

    Examples
    --------
    >>> display_decimals("lb", 736.2), display_decimals("kg", 3.1), display_decimals("kg")
    (1, 3, 1)
    >>> display_decimals("g", 0.055), display_decimals("kg", 0.0)
    (2, 1)
    >>> display_decimals("mm"), display_decimals("m"), display_decimals("in")
    (1, 4, 2)
    """
    u = canonical_unit(unit)
    if u in _LENGTH_DECIMALS:
        return _LENGTH_DECIMALS[u]
    base = _MASS_DECIMALS.get(u, 1)
    if u not in _MASS_DECIMALS or scale_si is None:
        return base
    v = abs(to_unit(float(scale_si), u))
    if not math.isfinite(v) or v == 0.0:
        return base
    need = _MASS_SIG_FIGS - 1 - math.floor(math.log10(v))
    return int(min(max(base, need), _MAX_DECIMALS))


@dataclass(frozen=True)
class DisplayUnits:
    """The units a vehicle type shows and reads bare numbers in.

    Parameters
    ----------
    mass : str
        Display mass unit ("lb", "kg").
    length : str
        Display length unit ("in", "m", "mm").
    volume : str
        Display volume unit ("USgal", "L").
    moment_divisor : float
        Reduction factor: a moment index is the moment in ``moment_unit`` divided by it
        (1, 100, 1000, 10000).

    Examples
    --------
    >>> du = DisplayUnits("lb", "in", "USgal", 1000.0)
    >>> du.moment_unit, du.density_unit, du.inertia_unit
    ('lb*in', 'lb/USgal', 'lb*in2')
    >>> round(du.moment_index(from_unit(85000, "lb*in")), 6)
    85.0
    >>> DisplayUnits("kg", "m", "L", 0)
    Traceback (most recent call last):
    ...
    ledger.errors.UnitError: units.moment_divisor = 0: a moment divisor must be a finite number greater than 0, such as 1, 100 or 1000
    """

    mass: str = "kg"
    length: str = "m"
    volume: str = "L"
    moment_divisor: float = 1.0

    def __post_init__(self) -> None:
        object.__setattr__(self, "mass", canonical_unit(self.mass, "mass", field="units.mass"))
        object.__setattr__(self, "length",
                           canonical_unit(self.length, "length", field="units.length"))
        object.__setattr__(self, "volume",
                           canonical_unit(self.volume, "volume", field="units.volume"))
        d = self.moment_divisor
        if isinstance(d, bool) or not isinstance(d, (int, float)) or not math.isfinite(d) \
                or d <= 0:
            raise UnitError("units.moment_divisor", d, "a moment divisor must be a finite "
                            "number greater than 0, such as 1, 100 or 1000")
        object.__setattr__(self, "moment_divisor", float(d))

    @property
    def moment_unit(self) -> str:
        """Display moment unit: mass*length."""
        return f"{self.mass}*{self.length}"

    @property
    def inertia_unit(self) -> str:
        """Display inertia unit: mass*length2."""
        return f"{self.mass}*{self.length}2"

    @property
    def density_unit(self) -> str:
        """Display density unit: mass/volume."""
        return f"{self.mass}/{self.volume}"

    @property
    def area_unit(self) -> str:
        """Display area unit: length2."""
        return f"{self.length}2"

    def moment_index(self, moment_si):
        """Moment index: moment (kg·m) in the display moment unit ÷ the divisor."""
        return to_unit(moment_si, self.moment_unit) / self.moment_divisor

    def from_moment_index(self, index):
        """Moment (kg·m) from a moment index in display units."""
        return from_unit(index * self.moment_divisor, self.moment_unit)

    def to_dict(self) -> dict:
        """JSON-able form."""
        return {"mass": self.mass, "length": self.length, "volume": self.volume,
                "moment_divisor": self.moment_divisor}

    @classmethod
    def from_dict(cls, d: dict) -> DisplayUnits:
        """Inverse of :meth:`to_dict`."""
        return cls(d["mass"], d["length"], d["volume"], d["moment_divisor"])
