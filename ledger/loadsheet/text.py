"""Short display texts for violation and fix messages, in the type's display units."""

from __future__ import annotations

from collections.abc import Callable

from ledger.loadsheet.document import PHASE_TITLES, phase_title
from ledger.units import DisplayUnits, display_decimals, fixed, nonzero_excess, to_unit

__all__ = ["mass_text", "length_text", "volume_text", "excess_text", "volume_decimals",
           "phase_title", "PHASE_TITLES", "VOLUME_DECIMALS"]

#: Decimals a volume shows in each display unit (messages and the renderers' columns).
VOLUME_DECIMALS = {"USgal": 1, "impgal": 1, "L": 1, "m3": 3, "ft3": 2, "in3": 0}


def volume_decimals(unit: str) -> int:
    """Decimals to show a volume in ``unit`` with (one for a unit not listed).

    Examples
    --------
    >>> volume_decimals("m3"), volume_decimals("USgal"), volume_decimals("bbl")
    (3, 1, 1)
    """
    return VOLUME_DECIMALS.get(unit, 1)


def mass_text(kg: float, du: DisplayUnits) -> str:
    """A mass for a message: whole units from 100 up, else one or two decimals.

    Examples
    --------
    >>> du = DisplayUnits("lb", "in", "USgal", 1000)
    >>> mass_text(1111.3, du), mass_text(29.48350405, du)
    ('2450 lb', '65.0 lb')
    """
    v = to_unit(kg, du.mass)
    d = 0 if abs(v) >= 100 else 1 if abs(v) >= 1 else 2
    return f"{fixed(v, d)} {du.mass}"


def length_text(m: float, du: DisplayUnits) -> str:
    """An arm or distance for a message.

    Examples
    --------
    >>> length_text(2.0447, DisplayUnits("lb", "in", "USgal", 1000))
    '80.50 in'
    """
    v = to_unit(m, du.length)
    return f"{fixed(v, display_decimals(du.length))} {du.length}"


def volume_text(m3: float, du: DisplayUnits) -> str:
    """A volume for a message.

    Examples
    --------
    >>> volume_text(0.0946352946, DisplayUnits("lb", "in", "USgal", 1000))
    '25.0 USgal'
    """
    v = to_unit(m3, du.volume)
    return f"{fixed(v, volume_decimals(du.volume))} {du.volume}"


def excess_text(show: Callable[[float, DisplayUnits], str], amount: float,
                du: DisplayUnits) -> str:
    """By how much a limit is exceeded, as ``show`` (:func:`mass_text`, :func:`length_text` or
    :func:`volume_text`) writes it, but never as zero (:func:`ledger.units.nonzero_excess`).

    Examples
    --------
    >>> du = DisplayUnits("lb", "in", "USgal", 1000)
    >>> excess_text(length_text, 0.0127, du), excess_text(length_text, 1e-7, du)
    ('0.50 in', 'less than 0.01 in')
    >>> excess_text(mass_text, 1e-6, du)
    'less than 0.01 lb'
    """
    number, _, unit = show(amount, du).rpartition(" ")
    return f"{nonzero_excess(number, amount)} {unit}"
