"""Exact conversion factors the core needs, in one place (NIST SP 811, appendix B).

The core works in SI; these turn the figures of rules and tables written in other units
(pounds, inches, feet, US gallons) into SI. :mod:`ledger.units` holds the same exact
definitions for the edges of the program; the core may not import it (it imports nothing of
ours but :mod:`ledger.errors`).
"""

from __future__ import annotations

__all__ = ["LB", "INCH", "FOOT", "US_GALLON"]

#: 1 lb in kg, exact.
LB = 0.45359237
#: 1 in in m, exact.
INCH = 0.0254
#: 1 ft in m, exact.
FOOT = 0.3048
#: 1 US gallon in m³, exact (3.785411784 L).
US_GALLON = 3.785411784e-3
