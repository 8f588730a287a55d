"""Numbers of a sheet document in its display units: the formatting every renderer shares.

:class:`DisplayFormat` reads the document's ``units`` once and chooses the decimals of each
column (masses with enough digits for a small vehicle, lengths to 0.1 mm or 0.01 in, volumes
as :func:`ledger.loadsheet.text.volume_decimals` says, moment indexes by their size), so that
the terminal sheet and the printed one show the same figures.
"""

from __future__ import annotations

import math
from typing import Any

from ledger.loadsheet.text import volume_decimals
from ledger.units import DisplayUnits, display_decimals, fixed, to_unit

__all__ = ["DASH", "DisplayFormat", "fixed", "number"]

DASH = "\u2014"


def number(v: Any) -> float | None:
    """A finite float, or None (None, booleans, text and NaN are not figures)."""
    if v is None or isinstance(v, bool):
        return None
    try:
        f = float(v)
    except (TypeError, ValueError):
        return None
    return f if math.isfinite(f) else None


class DisplayFormat:
    """The figures of a ``wbledger.sheet/1`` document as text in its display units.

    Parameters
    ----------
    doc : dict
        A ``wbledger.sheet/1`` document (docs/sheet-document.md).
    """

    def __init__(self, doc: dict):
        self.doc = doc
        u = doc.get("units") or {}
        divisor = u.get("moment_reduction", u.get("moment_divisor", 1)) or 1
        self.du = DisplayUnits(u.get("mass", "kg"), u.get("length", "m"),
                               u.get("volume", "L"), float(divisor))
        self.mass_unit = self.du.mass
        self.length_unit = self.du.length
        self.volume_unit = self.du.volume
        empty = number((doc.get("empty_weight") or {}).get("mass_kg"))
        self._md = display_decimals(self.mass_unit, empty)
        self._ld = display_decimals(self.length_unit)
        self._vd = volume_decimals(self.volume_unit)
        biggest = max([abs(number(p.get("moment_index")) or 0.0)
                       for p in doc.get("phases") or []] + [0.0])
        self._id = 2 if biggest < 1000 else 1 if biggest < 100000 else 0

    @property
    def mass_decimals(self) -> int:
        """Decimals of a mass in the display unit (as :meth:`mass` shows it)."""
        return self._md

    def mass(self, kg, signed: bool = False) -> str:
        """A mass in the display unit, without the unit (the column header carries it)."""
        v = number(kg)
        return DASH if v is None else fixed(to_unit(v, self.mass_unit), self._md, signed)

    def length(self, m, signed: bool = False) -> str:
        """An arm or distance in the display unit, without the unit."""
        v = number(m)
        return DASH if v is None else fixed(to_unit(v, self.length_unit), self._ld, signed)

    def volume(self, m3) -> str:
        """A volume in the display unit, without the unit."""
        v = number(m3)
        return DASH if v is None else fixed(to_unit(v, self.volume_unit), self._vd)

    def density(self, kg_m3) -> str:
        """A density in display mass per display volume, without the unit."""
        v = number(kg_m3)
        if v is None:
            return DASH
        d = to_unit(v, self.du.density_unit)
        return fixed(d, 3 if abs(d) < 10 else 1 if abs(d) < 1000 else 0)

    def index(self, moment_kgm) -> str:
        """A moment as a moment index (display moment ÷ reduction factor)."""
        v = number(moment_kgm)
        return DASH if v is None else fixed(self.du.moment_index(v), self._id)

    def index_value(self, value) -> str:
        """A moment index already reduced (as the document's ``moment_index``)."""
        v = number(value)
        return DASH if v is None else fixed(v, self._id)

    @staticmethod
    def percent(value, signed: bool = False) -> str:
        """A percentage (of MAC), one decimal."""
        v = number(value)
        return DASH if v is None else fixed(v, 1, signed)

    def with_unit(self, text: str, unit: str) -> str:
        return text if text == DASH else f"{text} {unit}"

    @property
    def moment_header(self) -> str:
        d = self.du.moment_divisor
        unit = self.du.moment_unit
        return f"Moment\n{unit}" if d == 1 else f"Moment\n{unit}/{d:g}"

    @property
    def index_header(self) -> str:
        d = self.du.moment_divisor
        return "Moment" if d == 1 else "Index"

    def quantity(self, value, unit: str | None) -> str:
        """A violation amount: SI with its unit name → display text with the display unit."""
        v = number(value)
        if v is None:
            return DASH
        if unit in ("kg", None):
            return f"{self.mass(v)} {self.mass_unit}"
        if unit == "m":
            return f"{self.length(v)} {self.length_unit}"
        if unit == "m3":
            return f"{self.volume(v)} {self.volume_unit}"
        if unit in ("kgm", "kg*m", "kg_m"):
            d = self.du.moment_divisor
            return f"{self.index(v)} {self.du.moment_unit}" + (f"/{d:g}" if d != 1 else "")
        if unit in ("kg/m2", "kg_m2"):
            return f"{self.area_density(v)} {self.mass_unit}/{self.length_unit}2"
        if unit in ("%MAC", "percent_mac", "%"):
            return f"{self.percent(v)} %MAC"
        return f"{v:g} {unit}"

    def area_density(self, kg_m2) -> str:
        """A floor loading in display mass per display length squared."""
        v = number(kg_m2)
        if v is None:
            return DASH
        d = to_unit(v, f"{self.mass_unit}/{self.length_unit}2")
        return fixed(d, 2 if abs(d) < 10 else 1 if abs(d) < 1000 else 0)
