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

Modules: :mod:`~ledger.units.conversion` (the unit table and conversions, with the exact
factors), :mod:`~ledger.units.parsing` (quantities as users type them) and
:mod:`~ledger.units.display` (display units and decimals).
"""

from __future__ import annotations

from ledger.units.conversion import (
    DIMENSIONS,
    EXAMPLES,
    FOOT,
    IMPERIAL_GALLON,
    INCH,
    LB,
    LBF,
    SI_UNITS,
    US_GALLON,
    canonical_unit,
    describe_units,
    dimension_of,
    from_unit,
    to_unit,
    units_of,
)
from ledger.units.display import (
    DisplayUnits,
    display_decimals,
    fixed,
    format_quantity,
    nonzero_excess,
)
from ledger.units.parsing import (
    is_bare_number,
    parse_angle,
    parse_area,
    parse_area_density,
    parse_density,
    parse_force,
    parse_inertia,
    parse_length,
    parse_mass,
    parse_moment,
    parse_quantity,
    parse_quantity_of,
    parse_temperature,
    parse_volume,
)

__all__ = [
    "DIMENSIONS",
    "LB",
    "INCH",
    "FOOT",
    "US_GALLON",
    "IMPERIAL_GALLON",
    "LBF",
    "EXAMPLES",
    "SI_UNITS",
    "DisplayUnits",
    "canonical_unit",
    "describe_units",
    "dimension_of",
    "display_decimals",
    "fixed",
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
