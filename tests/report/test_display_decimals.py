"""Display precision of masses and lengths: enough digits for a small vehicle as well.

A 3.1 kg drone printed as "3.1 kg, CG 2 mm" hides the 5 g and 0.2 mm a weighing resolves.
The rule (common practice: show at least four significant figures of the vehicle's mass, and
the CG to 0.1 mm or 0.01 in; one number of decimals per column) lives in
ledger.units.display_decimals and is used by the ledger, the loading sheet and the messages.
"""

from __future__ import annotations

import pytest

from ledger.loadsheet.text import length_text
from ledger.report.ledger import fmt_length, fmt_mass
from ledger.report.sheet_text import SheetView
from ledger.units import DisplayUnits, display_decimals, from_unit


@pytest.mark.parametrize("unit, scale_kg, decimals", [
    ("kg", 3.1, 3),            # 3.100 kg: four significant figures (common practice)
    ("kg", 0.055, 5),          # 0.05500 kg
    ("kg", 3519.2, 1),         # a truck keeps the usual one decimal
    ("lb", 736.17, 1),         # 1623.0 lb (1 lb = 0.45359237 kg, NIST SP 811)
    ("lb", 1.0, 3),            # 2.205 lb
    ("kg", None, 1),           # no scale: the unit's usual decimals
    ("kg", 0.0, 1),
])
def test_mass_decimals_give_four_significant_figures(unit, scale_kg, decimals):
    assert display_decimals(unit, scale_kg) == decimals


@pytest.mark.parametrize("unit, decimals", [("mm", 1), ("cm", 2), ("m", 4), ("in", 2)])
def test_lengths_resolve_a_tenth_of_a_millimetre_or_a_hundredth_of_an_inch(unit, decimals):
    # Resolution 0.1 mm (metric) or 0.01 in (imperial), common practice; 1 in = 25.4 mm exactly
    # (NIST SP 811), so 0.01 in is 0.254 mm.
    assert display_decimals(unit) == decimals
    step = 10.0 ** -decimals
    resolution_m = from_unit(step, unit, "length")
    assert resolution_m <= (0.0001 if unit != "in" else 0.000254) * (1 + 1e-12)


def test_small_drone_empty_weight_reads_to_the_gram_and_a_tenth_of_a_millimetre():
    # Four readings 0.765 + 0.770 + 0.780 + 0.785 kg = 3.100 kg; CG 5.7 kg*mm / 3.1 kg =
    # 1.84 mm (CG = sum(R*x)/sum(R), FAA-H-8083-1 weighing chapter).
    mass, cg = 3.1, 0.0057 / 3.1
    assert fmt_mass(mass, "kg", scale=mass) == "3.100 kg"
    assert fmt_length(cg, "mm") == "1.8 mm"
    # A change on the same vehicle keeps the vehicle's decimals (one column, one format).
    assert fmt_mass(0.055, "kg", signed=True, scale=mass) == "+0.055 kg"
    # An airplane is unchanged: 1623.0 lb, CG 39.20 in.
    assert fmt_mass(from_unit(1623.0, "lb", "mass"), "lb",
                    scale=from_unit(1623.0, "lb", "mass")) == "1623.0 lb"
    assert fmt_length(from_unit(39.2, "in", "length"), "in") == "39.20 in"


def test_sheet_columns_and_messages_use_the_same_precision():
    doc = {"units": {"mass": "kg", "length": "mm", "volume": "L", "moment_reduction": 1},
           "empty_weight": {"mass_kg": 3.1}, "phases": []}
    view = SheetView(doc)
    assert view.mass(5.69) == "5.690"
    assert view.length(-0.010281195) == "-10.3"
    assert length_text(-0.010281195, DisplayUnits("kg", "mm", "L", 1)) == "-10.3 mm"
    truck = SheetView({**doc, "units": {**doc["units"], "length": "m"},
                       "empty_weight": {"mass_kg": 3519.2}})
    assert truck.mass(6785.0) == "6785.0"
    assert truck.length(2.34439941) == "2.3444"
