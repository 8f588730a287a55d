"""Tests of ledger.units against NIST SP 811 and against pint as an independent oracle."""

from __future__ import annotations

import math
import subprocess
import sys
from pathlib import Path

import pint
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ledger.errors import InputError, UnitError
from ledger.testing import assert_close
from ledger.units import (
    DIMENSIONS,
    SI_UNITS,
    DisplayUnits,
    canonical_unit,
    describe_units,
    dimension_of,
    format_quantity,
    from_unit,
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
    to_unit,
    units_of,
)

UREG = pint.UnitRegistry()

# --- NIST SP 811 (2008), appendix B ------------------------------------------------------------
# "exact": the definitions listed as exact in NIST SP 811 appendix B and quoted in the domain
# notes (1 lb = 0.45359237 kg, 1 in = 0.0254 m, 1 ft = 0.3048 m, 1 US gal = 3.785411784 L,
# 1 imp gal = 4.54609 L, 1 lbf = 4.4482216152605 N). The seven-digit factors of the B.8/B.9
# tables (slug, lb/gal, lb·ft², ...) are from memory of those tables, so they are checked to the
# seven significant digits the tables print (rtol 5e-7).
NIST_EXACT = [
    ("1 lb", "mass", 0.45359237),
    ("1 in", "length", 0.0254),
    ("1 ft", "length", 0.3048),
    ("1 USgal", "volume", 3.785411784e-3),
    ("1 impgal", "volume", 4.54609e-3),
    ("1 lbf", "force", 4.4482216152605),
    ("1 L", "volume", 1e-3),
    ("1 t", "mass", 1e3),
    ("1 g", "mass", 1e-3),
    ("1 mm", "length", 1e-3),
    ("1 cm", "length", 1e-2),
    ("1 ft2", "area", 9.290304e-2),      # B.9 "square foot 9.290 304 E-02 m2" (exact)
    ("1 in2", "area", 6.4516e-4),        # B.9 "square inch 6.4516 E-04 m2" (exact)
]
NIST_7_DIGITS = [
    ("1 slug", "mass", 1.459390e1),            # B.9 slug -> kg
    ("1 lb/USgal", "density", 1.198264e2),     # B.9 pound per gallon (U.S.) -> kg/m3
    ("1 lb/impgal", "density", 9.977633e1),    # B.9 pound per gallon (UK) -> kg/m3
    ("1 lb/ft3", "density", 1.601846e1),       # B.9 pound per cubic foot -> kg/m3
    ("1 lb/ft2", "area_density", 4.882428),    # B.9 pound per square foot -> kg/m2
    ("1 lb*ft2", "inertia", 4.214011e-2),      # B.9 pound foot squared -> kg*m2
    ("1 lb*in2", "inertia", 2.926397e-4),      # B.9 pound inch squared -> kg*m2
    ("1 ft3", "volume", 2.831685e-2),          # B.9 cubic foot -> m3
    ("1 in3", "volume", 1.638706e-5),          # B.9 cubic inch -> m3
    ("1 rad", "angle", 5.729578e1),            # B.9 degree = 1.745 329 E-02 rad, inverted
]


@pytest.mark.parametrize("text, dimension, si", NIST_EXACT, ids=[c[0] for c in NIST_EXACT])
def test_nist_exact_definitions(text, dimension, si):
    # source: NIST SP 811 appendix B (exact definitions)
    assert_close(parse_quantity(text, dimension), si, unit=SI_UNITS[dimension], rtol=1e-15,
                 what=text, source="NIST SP 811 appendix B")


@pytest.mark.parametrize("text, dimension, si", NIST_7_DIGITS, ids=[c[0] for c in NIST_7_DIGITS])
def test_nist_seven_digit_factors(text, dimension, si):
    # source: NIST SP 811 appendix B.9 (factors printed to 7 digits; recalled, see above)
    assert_close(parse_quantity(text, dimension), si, unit=SI_UNITS[dimension], rtol=5e-7,
                 what=text, source="NIST SP 811 appendix B.9")


def test_slug_is_lbf_s2_per_ft():
    # source: NIST SP 811 B.9 -- slug defined from lbf and ft: 1 slug = 1 lbf·s²/ft
    assert parse_mass("1 slug") == pytest.approx(4.4482216152605 / 0.3048, rel=1e-15)


def test_fahrenheit_celsius_kelvin():
    # source: NIST SP 811 B.9 footnote: t/°C = (t/°F − 32)/1.8; T/K = t/°C + 273.15
    assert parse_temperature("212 degF") == pytest.approx(100.0, abs=1e-12)
    assert parse_temperature("-40 degF") == pytest.approx(-40.0, abs=1e-12)
    assert parse_temperature("0 K") == pytest.approx(-273.15, abs=1e-12)
    assert to_unit(100.0, "degF") == pytest.approx(212.0, abs=1e-12)


# --- pint as an independent oracle -------------------------------------------------------------
PINT_CASES = [
    # (our unit, pint unit, pint SI unit)
    ("kg", "kilogram", "kilogram"),
    ("g", "gram", "kilogram"),
    ("t", "tonne", "kilogram"),
    ("lb", "pound", "kilogram"),
    ("slug", "slug", "kilogram"),
    ("m", "meter", "meter"),
    ("cm", "centimeter", "meter"),
    ("mm", "millimeter", "meter"),
    ("in", "inch", "meter"),
    ("ft", "foot", "meter"),
    ("m3", "meter**3", "meter**3"),
    ("L", "liter", "meter**3"),
    ("USgal", "US_liquid_gallon", "meter**3"),
    ("impgal", "imperial_gallon", "meter**3"),
    ("ft3", "foot**3", "meter**3"),
    ("in3", "inch**3", "meter**3"),
    ("N", "newton", "newton"),
    ("kN", "kilonewton", "newton"),
    ("lbf", "force_pound", "newton"),
    ("kg*m", "kilogram*meter", "kilogram*meter"),
    ("kg*mm", "kilogram*millimeter", "kilogram*meter"),
    ("lb*in", "pound*inch", "kilogram*meter"),
    ("lb*ft", "pound*foot", "kilogram*meter"),
    ("kg*m2", "kilogram*meter**2", "kilogram*meter**2"),
    ("slug*ft2", "slug*foot**2", "kilogram*meter**2"),
    ("lb*in2", "pound*inch**2", "kilogram*meter**2"),
    ("kg*mm2", "kilogram*millimeter**2", "kilogram*meter**2"),
    ("kg/L", "kilogram/liter", "kilogram/meter**3"),
    ("lb/USgal", "pound/US_liquid_gallon", "kilogram/meter**3"),
    ("lb/impgal", "pound/imperial_gallon", "kilogram/meter**3"),
    ("kg/m3", "kilogram/meter**3", "kilogram/meter**3"),
    ("m2", "meter**2", "meter**2"),
    ("ft2", "foot**2", "meter**2"),
    ("kg/m2", "kilogram/meter**2", "kilogram/meter**2"),
    ("lb/ft2", "pound/foot**2", "kilogram/meter**2"),
    ("rad", "radian", "degree"),
]


@pytest.mark.parametrize("ours, pint_unit, pint_si", PINT_CASES, ids=[c[0] for c in PINT_CASES])
@pytest.mark.parametrize("value", [1.0, -3.5, 2550.0, 0.0254])
def test_against_pint(ours, pint_unit, pint_si, value):
    # oracle: pint's own unit definitions (default registry)
    expected = UREG.Quantity(value, pint_unit).to(pint_si).magnitude
    got = parse_quantity(f"{value!r} {ours}", dimension_of(ours))
    assert_close(got, expected, unit=SI_UNITS[dimension_of(ours)], rtol=1e-12, atol=1e-300,
                 what=f"{value} {ours}", source="pint")
    assert_close(to_unit(got, ours), value, unit=ours, rtol=1e-12, atol=1e-15, what="back")


@pytest.mark.parametrize("ours, pint_unit", [("degF", "degF"), ("K", "kelvin"), ("degC", "degC")])
@pytest.mark.parametrize("value", [-40.0, 0.0, 59.0, 300.0])
def test_temperature_against_pint(ours, pint_unit, value):
    # oracle: pint offset units (absolute temperatures)
    expected = UREG.Quantity(value, pint_unit).to("degC").magnitude
    assert_close(parse_temperature(f"{value} {ours}"), expected, unit="degC", atol=1e-9,
                 what=f"{value} {ours}", source="pint")


def test_gallon_is_us_gallon_in_pint_but_ambiguous_here():
    # pint reads a bare "gallon" as the US gallon; we refuse to guess.
    assert UREG.Quantity(1, "gallon").to("liter").magnitude == pytest.approx(3.785411784)
    with pytest.raises(UnitError, match="'gal' is ambiguous"):
        parse_volume("1 gal")


# --- spellings ---------------------------------------------------------------------------------
@pytest.mark.parametrize("text, dimension, expected", [
    ("82 kg", "mass", 82.0),
    ("82kg", "mass", 82.0),
    ("  82   kg  ", "mass", 82.0),
    ("+82 kg", "mass", 82.0),
    (".5 kg", "mass", 0.5),
    ("5. kg", "mass", 5.0),
    ("1e3 g", "mass", 1.0),
    ("1.5E-3 t", "mass", 1.5),
    ("180 lbs", "mass", 180 * 0.45359237),
    ("25 l", "volume", 0.025),
    ("-3.5 in", "length", -3.5 * 0.0254),
    ("\u22123.5 in", "length", -3.5 * 0.0254),  # U+2212 minus sign
    ("10 kg·m", "moment", 10.0),
    ("10 kg * m", "moment", 10.0),
    ("2 kg·m²", "inertia", 2.0),
    ("2 kg*m^2", "inertia", 2.0),
    ("1 m³", "volume", 1.0),
    ("1 kg/l", "density", 1000.0),
    ("15 °C", "temperature", 15.0),
    ("3.5°", "angle", 3.5),
])
def test_accepted_spellings(text, dimension, expected):
    assert parse_quantity(text, dimension) == pytest.approx(expected, rel=1e-15)


@pytest.mark.parametrize("value, default, expected", [
    (82, "kg", 82.0),
    (82.5, "kg", 82.5),
    ("82", "kg", 82.0),
    (" 170 ", "lb", 170 * 0.45359237),
    (170, "lbs", 170 * 0.45359237),
    (0, "lb", 0.0),
])
def test_bare_numbers_take_default_unit(value, default, expected):
    assert parse_mass(value, default) == pytest.approx(expected, rel=1e-15)


def test_explicit_unit_beats_default():
    assert parse_mass("82 kg", "lb") == 82.0
    assert parse_length("1.2 m", "in") == 1.2


def test_negative_zero_is_normalised():
    assert math.copysign(1.0, parse_length("-0 in")) == 1.0


def test_specific_parsers_return_si():
    assert parse_volume("30 USgal") == pytest.approx(30 * 3.785411784e-3, rel=1e-15)
    assert parse_density("0.8 kg/L") == pytest.approx(800.0)
    assert parse_moment("100 kg*mm") == pytest.approx(0.1)
    assert parse_inertia("1 kg*mm2") == pytest.approx(1e-6)
    assert parse_area("1 cm2") == pytest.approx(1e-4)
    assert parse_area_density("1 kg/cm2") == pytest.approx(1e4)
    assert parse_force("1 kN") == 1000.0
    assert parse_angle("1 rad") == pytest.approx(180 / math.pi)


def test_parse_quantity_of_reports_dimension():
    assert parse_quantity_of(26.5, ("volume", "mass"), "USgal") == \
        (pytest.approx(26.5 * 3.785411784e-3), "volume")
    assert parse_quantity_of("100 lb", ("volume", "mass"), "USgal") == \
        (pytest.approx(45.359237), "mass")


def test_units_of_and_dimension_of():
    assert units_of("length") == ("m", "cm", "mm", "in", "ft")
    assert units_of("force") == ("N", "kN", "lbf")
    assert "slug*ft2" in units_of("inertia")
    assert dimension_of("lb/USgal") == "density"
    assert dimension_of("gal") is None
    for dim in DIMENSIONS:
        assert SI_UNITS[dim] in units_of(dim)
        assert from_unit(1.0, SI_UNITS[dim]) == 1.0


def test_is_bare_number():
    assert is_bare_number(3) and is_bare_number(-2.5) and is_bare_number(" 4e2 ")
    assert not is_bare_number("4 kg") and not is_bare_number(None) and not is_bare_number(False)


# --- errors: exact messages --------------------------------------------------------------------
MASS_UNITS = "mass units: kg, g, t, lb, slug"
ERROR_CASES = [
    ("82 kgs", "mass", "kg", f"f = '82 kgs': unknown unit 'kgs'; {MASS_UNITS}"),
    ("3 in", "mass", "kg", f"f = '3 in': 'in' is a unit of length, not of mass; {MASS_UNITS}"),
    ("30 gal", "volume", "L", "f = '30 gal': 'gal' is ambiguous; volume units: m3, L, USgal, "
     "impgal, ft3, in3. Write USgal (3.785411784 L) or impgal (4.54609 L)"),
    ("30 gallons", "volume", "L", "f = '30 gallons': 'gallons' is ambiguous; volume units: m3, "
     "L, USgal, impgal, ft3, in3. Write USgal (3.785411784 L) or impgal (4.54609 L)"),
    ("30 gal", "mass", "kg", f"f = '30 gal': 'gal' is a unit of volume, not of mass; {MASS_UNITS}"),
    ("nan kg", "mass", "kg", "f = 'nan kg': not a finite number; a mass must be a finite number"),
    ("inf", "mass", "kg", "f = 'inf': not a finite number; a mass must be a finite number"),
    ("-Infinity lb", "mass", "kg",
     "f = '-Infinity lb': not a finite number; a mass must be a finite number"),
    (float("nan"), "mass", "kg", "f = nan: not a finite number; a mass must be a finite number"),
    (float("inf"), "length", "m",
     "f = inf: not a finite number; a length must be a finite number"),
    ("1e999 kg", "mass", "kg",
     "f = '1e999 kg': not a finite number; a mass must be a finite number"),
    ("2,550 lb", "mass", "kg", "f = '2,550 lb': commas are not accepted; write a mass without "
     "thousands separators and with '.' for decimals, e.g. '82 kg'. Write '2550 lb'"),
    ("2,5 kg", "mass", "kg", "f = '2,5 kg': commas are not accepted; write a mass without "
     "thousands separators and with '.' for decimals, e.g. '82 kg'"),
    ("kg", "mass", "kg", "f = 'kg': no number; write a mass as a number and a unit, e.g. "
     f"'82 kg'; {MASS_UNITS}"),
    ("", "length", "m", "f = '': no number; write a length as a number and a unit, e.g. "
     "'47.5 in'; length units: m, cm, mm, in, ft"),
    ("82", "mass", None, f"f = '82': a unit is required; {MASS_UNITS}"),
    (82, "density", None, "f = 82: a unit is required; density units: mass/volume such as "
     "kg/L, lb/USgal (masses: kg, g, t, lb, slug; volumes: m3, L, USgal, impgal, ft3, in3)"),
    (True, "mass", "kg", "f = true: expected a mass: a number, or a string such as '82 kg'"),
    (None, "mass", "kg", "f = None: expected a mass: a number, or a string such as '82 kg'"),
    ([1, 2], "length", "m",
     "f = [1, 2]: expected a length: a number, or a string such as '47.5 in'"),
    ("5 lb in", "moment", "kg*m", "f = '5 lb in': unknown unit 'lb in'; moment units: "
     "mass*length such as kg*m, kg*mm, lb*in (masses: kg, g, t, lb, slug; lengths: m, cm, mm, "
     "in, ft). Write 'lb*in'"),
    ("5 lb.in", "moment", "kg*m", "f = '5 lb.in': unknown unit 'lb.in'; moment units: "
     "mass*length such as kg*m, kg*mm, lb*in (masses: kg, g, t, lb, slug; lengths: m, cm, mm, "
     "in, ft). Write 'lb*in'"),
    ("5 KG", "mass", "kg", f"f = '5 KG': unknown unit 'KG'; {MASS_UNITS}"),
    ("12 psi", "area_density", None, "f = '12 psi': unknown unit 'psi'; mass-per-area units: "
     "mass/length2 such as kg/m2, lb/ft2 (masses: kg, g, t, lb, slug; lengths: m, cm, mm, in, "
     "ft)"),
]


@pytest.mark.parametrize("value, dimension, default, message", ERROR_CASES,
                         ids=[repr(c[0]) + "-" + c[1] for c in ERROR_CASES])
def test_error_messages_exact(value, dimension, default, message):
    with pytest.raises(UnitError) as info:
        parse_quantity(value, dimension, default, field="f")
    assert str(info.value) == message
    err = info.value
    assert isinstance(err, ValueError) and isinstance(err, InputError)
    assert err.field == "f" and err.exit_code == 2


def test_error_with_source():
    with pytest.raises(UnitError) as info:
        parse_mass("82 kgs", "lb", field="station['pilot'].max_mass")
    assert str(info.value.with_source("kv-p4.toml")) == (
        f"kv-p4.toml: station['pilot'].max_mass = '82 kgs': unknown unit 'kgs'; {MASS_UNITS}")


def test_parse_quantity_of_errors():
    with pytest.raises(UnitError) as info:
        parse_quantity_of("2 m", ("volume", "mass"), "L", field="tank.capacity")
    assert str(info.value) == (
        "tank.capacity = '2 m': 'm' is a unit of length, not of volume or mass; volume units: "
        f"m3, L, USgal, impgal, ft3, in3; {MASS_UNITS}")
    with pytest.raises(UnitError) as info:
        parse_quantity_of("2 gal", ("volume", "mass"), "L", field="tank.capacity")
    assert str(info.value).endswith("Write USgal (3.785411784 L) or impgal (4.54609 L)")


def test_canonical_unit():
    assert canonical_unit("lbs") == "lb"
    assert canonical_unit("kg · m²", "inertia") == "kg*m2"
    with pytest.raises(UnitError) as info:
        canonical_unit("furlong", field="--unit")
    assert str(info.value) == ("--unit = 'furlong': not a unit wbledger knows; see the units "
                               "table in demo_fleet/FORMAT.md")
    with pytest.raises(UnitError) as info:
        canonical_unit(3, "mass", field="units.mass")
    assert str(info.value) == ("units.mass = 3: expected a mass unit as a string; "
                               f"{MASS_UNITS}")
    with pytest.raises(ValueError, match="unknown dimension 'weight'"):
        units_of("weight")


def test_describe_units():
    assert describe_units("volume") == "m3, L, USgal, impgal, ft3, in3"
    assert describe_units("moment").startswith("mass*length such as kg*m")


# --- conversion and formatting -----------------------------------------------------------------
def test_to_and_from_unit_work_on_arrays():
    import numpy as np

    arr = np.array([0.0, 1.0, 2.5])
    assert np.allclose(to_unit(from_unit(arr, "in"), "in"), arr, rtol=1e-15)
    assert np.allclose(to_unit(arr, "degF"), arr * 1.8 + 32)


def test_to_unit_dimension_check():
    with pytest.raises(UnitError, match="'in' is a unit of length, not of mass"):
        to_unit(1.0, "in", "mass")


@pytest.mark.parametrize("value_si, unit, digits, text", [
    (81.6466266, "lb", 1, "180.0 lb"),
    (1.2065, "in", 2, "47.50 in"),
    (0.11356235352, "USgal", 1, "30.0 USgal"),
    (-0.0889, "in", 1, "-3.5 in"),
    (-1e-9, "m", 3, "0.000 m"),
    (11.521246198, "lb*in", 0, "1000 lb*in"),
    (15.0, "degF", 0, "59 degF"),
    (1156.6605435, "lbs", 0, "2550 lb"),
])
def test_format_quantity(value_si, unit, digits, text):
    assert format_quantity(value_si, unit, digits) == text


@settings(max_examples=150, deadline=None)
@given(value=st.floats(min_value=-1e6, max_value=1e6, allow_nan=False),
       unit=st.sampled_from(["kg", "lb", "slug", "in", "mm", "ft", "USgal", "impgal", "L",
                             "lb*in", "kg*mm", "slug*ft2", "lb/USgal", "degF", "K", "lbf"]))
def test_round_trip_to_from_unit(value, unit):
    back = to_unit(from_unit(value, unit), unit)
    assert back == pytest.approx(value, rel=1e-12, abs=1e-9)


@settings(max_examples=150, deadline=None)
@given(value=st.floats(min_value=-1e5, max_value=1e5, allow_nan=False),
       unit=st.sampled_from(["kg", "lb", "in", "m", "mm", "USgal", "L", "lb*in", "kg*m2"]))
def test_round_trip_format_parse(value, unit):
    # formatting with 6 decimals and parsing back loses at most half a unit in the 6th decimal
    si = from_unit(value, unit)
    text = format_quantity(si, unit, 6)
    back = parse_quantity(text, dimension_of(unit))
    assert to_unit(back, unit) == pytest.approx(value, abs=5.1e-7, rel=1e-12)


# --- display units -----------------------------------------------------------------------------
def test_display_units():
    du = DisplayUnits("lbs", "in", "USgal", 1000)
    assert du.mass == "lb" and du.moment_divisor == 1000.0
    assert (du.moment_unit, du.inertia_unit, du.density_unit, du.area_unit) == \
        ("lb*in", "lb*in2", "lb/USgal", "in2")
    # FAA-H-8083-1 style moment index: 2,550 lb at 41.0 in = 104,550 lb*in -> index 104.55
    moment = parse_mass("2550 lb") * parse_length("41.0 in")
    assert du.moment_index(moment) == pytest.approx(104.55, rel=1e-12)
    assert du.from_moment_index(104.55) == pytest.approx(moment, rel=1e-12)
    assert DisplayUnits.from_dict(du.to_dict()) == du


@pytest.mark.parametrize("args, message", [
    (("in", "in", "L", 1), "units.mass = 'in': 'in' is a unit of length, not of mass; "
                           f"{MASS_UNITS}"),
    (("kg", "kg", "L", 1), "units.length = 'kg': 'kg' is a unit of mass, not of length; "
                           "length units: m, cm, mm, in, ft"),
    (("kg", "m", "gal", 1), "units.volume = 'gal': 'gal' is ambiguous; volume units: m3, L, "
                            "USgal, impgal, ft3, in3. Write USgal (3.785411784 L) or impgal "
                            "(4.54609 L)"),
    (("kg", "m", "L", -100), "units.moment_divisor = -100: a moment divisor must be a finite "
                             "number greater than 0, such as 1, 100 or 1000"),
    (("kg", "m", "L", "1000"), "units.moment_divisor = '1000': a moment divisor must be a "
                               "finite number greater than 0, such as 1, 100 or 1000"),
])
def test_display_units_errors(args, message):
    with pytest.raises(UnitError) as info:
        DisplayUnits(*args)
    assert str(info.value) == message


def test_import_is_light():
    # The CLI imports ledger.units at start-up; it must not pull in heavy libraries.
    code = ("import sys, ledger.units; "
            "print(sorted(m for m in ('numpy', 'pint', 'sqlalchemy') if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         check=True, cwd=Path(__file__).resolve().parents[1])
    assert out.stdout.strip() == "[]"
