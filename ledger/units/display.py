"""Display units of a vehicle type, and how many decimals a figure shows."""

from __future__ import annotations

import math
from dataclasses import dataclass

from ledger.errors import UnitError
from ledger.units.conversion import canonical_unit, from_unit, to_unit

__all__ = ["DisplayUnits", "counted", "display_decimals", "fixed", "format_quantity",
           "nonzero_excess"]


def fixed(value: float, decimals: int, signed: bool = False) -> str:
    """``value`` with ``decimals`` decimals, as every report prints a figure.

    No thousands separator, so any printed figure can be typed back as input (the parser
    refuses "2,398 lb"); never ``-0.0``, and no sign on a zero. The one home of number
    formatting for reports: messages, tables, loading sheets.

    Examples
    --------
    >>> fixed(2398.04, 0), fixed(-0.04, 1), fixed(12.5, 1, signed=True), fixed(0.0, 2, True)
    ('2398', '0.0', '+12.5', '0.00')
    """
    text = f"{value:+.{decimals}f}" if signed else f"{value:.{decimals}f}"
    if float(text) == 0.0:
        text = text.lstrip("+-")
    return text


def counted(n: int, singular: str, plural: str | None = None) -> str:
    """``n`` and the noun that agrees with it (``plural`` defaults to ``singular + "s"``).

    >>> counted(1, "entry", "entries"), counted(2, "entry", "entries"), counted(0, "type")
    ('1 entry', '2 entries', '0 types')
    """
    return f"{n} {singular if n == 1 else (plural or singular + 's')}"


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
    return f"{fixed(to_unit(value_si, u), digits)} {u}"


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
    >>> DisplayUnits("kg", "m", "L", 0)  # doctest: +NORMALIZE_WHITESPACE
    Traceback (most recent call last):
    ...
    ledger.errors.UnitError: units.moment_divisor = 0: a moment divisor must be a finite number
    greater than 0, such as 1, 100 or 1000
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
