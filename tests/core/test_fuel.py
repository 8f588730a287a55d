"""Tests for ledger.core.fuel against outside references (source named beside each check)."""

from __future__ import annotations

import numpy as np
import pint
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ledger.core import fuel
from ledger.core.fuel import (
    NOMINAL_DENSITY,
    Tank,
    burn_states,
    check_capacity,
    density_at_15c,
    density_at_temperature,
    mass_to_volume,
    nominal_density,
    tank_arm,
    tank_moment,
    usable_fuel,
    volume_correction_factor,
    volume_to_mass,
)
from ledger.errors import InputError
from ledger.testing import assert_close

UREG = pint.UnitRegistry()


# --- nominal densities ------------------------------------------------------------------------

@pytest.mark.parametrize("fluid, lb_per_gal", [
    # FAA-H-8083-30 ch. 4 "standard weights" (values as listed in the project's domain notes)
    ("avgas", 6.0), ("jet", 6.7), ("oil", 7.5), ("water", 8.35)])
def test_nominal_density_matches_pint_conversion(fluid, lb_per_gal):
    # pint as the units oracle: its "gallon" is the US liquid gallon (231 in³), "lb" the
    # avoirdupois pound, both exact per NIST SP 811 appendix B.
    expected = (lb_per_gal * UREG.lb / UREG.gallon).to("kg/m**3").magnitude
    assert_close(nominal_density(fluid), expected, unit="kg/m³", rtol=1e-13, what=fluid,
                 source="FAA-H-8083-30 ch. 4; NIST SP 811 via pint")
    assert_close(NOMINAL_DENSITY[fluid], expected, unit="kg/m³", rtol=1e-13, what=fluid)


def test_nominal_density_exact_factors():
    # NIST SP 811 appendix B: 1 lb = 0.45359237 kg, 1 US gal = 3.785411784 L (exact)
    assert fuel.LB == 0.45359237
    assert fuel.US_GALLON == 3.785411784e-3
    assert_close(nominal_density("avgas"), 6.0 * 0.45359237 / 3.785411784e-3, unit="kg/m³",
                 rtol=1e-15, what="avgas")


def test_nominal_density_aliases_and_case():
    assert nominal_density(" Turbine ") == NOMINAL_DENSITY["jet"]
    assert nominal_density("AVGAS") == NOMINAL_DENSITY["avgas"]


def test_nominal_density_unknown_lists_known_names():
    with pytest.raises(InputError) as err:
        nominal_density("diesel")
    assert str(err.value) == ("fluid = 'diesel': one of 'avgas', 'jet', 'oil', 'water'. "
                              "Give a measured density instead if the fluid is not listed")


# --- volume and mass --------------------------------------------------------------------------

def test_volume_to_mass_50_us_gal_avgas_is_300_lb():
    # FAA-H-8083-30 ch. 4: 6.0 lb per US gallon, so 50 gal weigh 300 lb (arithmetic on the
    # handbook figure); pint converts the volume.
    vol = (50 * UREG.gallon).to("m**3").magnitude
    m = volume_to_mass(vol, nominal_density("avgas"))
    assert_close(m, (300 * UREG.lb).to("kg").magnitude, unit="kg", rtol=1e-12, what="mass")


def test_volume_mass_round_trip_vectorised():
    vols = np.array([0.0, 0.1, 0.25])
    rho = nominal_density("jet")
    back = mass_to_volume(volume_to_mass(vols, rho), rho)
    assert isinstance(back, np.ndarray)
    assert_close(back, vols, unit="m³", rtol=1e-14, atol=1e-18, what="volume")


@pytest.mark.parametrize("call, text", [
    (lambda: volume_to_mass(-1.0, 800.0), "volume = -1: a finite volume in m³ of 0 or more"),
    (lambda: volume_to_mass(1.0, 0.0), "density = 0: a finite density in kg/m³ greater than 0"),
    (lambda: mass_to_volume([1.0, float("nan")], 800.0),
     "mass = nan: a finite mass in kg of 0 or more"),
    (lambda: mass_to_volume([1.0, -2.0], 800.0), "mass[1] = -2: a finite mass in kg of 0 or more"),
])
def test_volume_mass_errors(call, text):
    with pytest.raises(InputError) as err:
        call()
    assert str(err.value) == text


# --- table 54B temperature correction ---------------------------------------------------------

# Measurement Canada, "Volume correction factors to 15 °C" (issued January 2016), printed
# table 54B values read in stored copies: all grades of Jet A / Jet A-1 at ρ15 = 800 kg/m³ and
# aviation gasoline (avgas 80/100) at ρ15 = 710 kg/m³. The printed tables round to 4 decimals:
# the unrounded VCF must round to the printed figure.
JET_800 = [(-40.0, 1.0502), (-39.5, 1.0498), (-35.0, 1.0457), (-30.0, 1.0412),
           (-25.0, 1.0367), (-24.1, 1.0359), (-20.0, 1.0322)]
AVGAS_710 = [(-40.0, 1.0700), (-38.6, 1.0683), (-35.0, 1.0638), (-30.0, 1.0576),
             (-25.0, 1.0513), (-24.1, 1.0502), (-20.0, 1.0450)]


@pytest.mark.parametrize("t, expected", JET_800)
def test_vcf_jet_against_printed_table_54b(t, expected):
    got = volume_correction_factor(800.0, t, "jet")
    assert round(got, 4) == expected, (got, expected)
    assert_close(got, expected, unit="", atol=0.5e-4 + 1e-12,
                 what=f"VCF jet 800 kg/m³ at {t} °C",
                 source="Measurement Canada table 54B, Jet A/A-1, 800 kg/m³")


@pytest.mark.parametrize("t, expected", AVGAS_710)
def test_vcf_avgas_against_printed_table_54b(t, expected):
    got = volume_correction_factor(710.0, t, "avgas")
    assert round(got, 4) == expected, (got, expected)
    assert_close(got, expected, unit="", atol=0.5e-4 + 1e-12,
                 what=f"VCF avgas 710 kg/m³ at {t} °C",
                 source="Measurement Canada table 54B, aviation gasoline, 710 kg/m³")


def test_vcf_vectorised_over_the_table():
    t = np.array([t for t, _ in JET_800])
    got = volume_correction_factor(800.0, t, "jet")
    assert got.shape == t.shape
    assert_close(got, [v for _, v in JET_800], unit="", atol=0.5e-4 + 1e-12, what="VCF jet")


@pytest.mark.parametrize("product, rho", [("jet", 787.5), ("jet", 838.5), ("gasoline", 653.0),
                                          ("gasoline", 770.5)])
def test_vcf_is_one_at_15c(product, rho):
    # Definition of the correction to 15 °C: Δt = 0 gives exp(0) = 1 exactly.
    assert volume_correction_factor(rho, 15.0, product) == 1.0


@settings(max_examples=100, deadline=None)
@given(rho=st.floats(787.5, 838.5), t1=st.floats(-50, 150), t2=st.floats(-50, 150))
def test_vcf_falls_with_temperature(rho, t1, t2):
    # Property of the formula for α > 0: warmer fuel has expanded, so less volume at 15 °C per
    # unit observed volume.
    lo, hi = min(t1, t2), max(t1, t2)
    a = volume_correction_factor(rho, lo, "jet")
    b = volume_correction_factor(rho, hi, "jet")
    assert a >= b
    if hi - lo > 1e-6:
        assert a > b


@settings(max_examples=100, deadline=None)
@given(rho=st.floats(653.0, 770.5), t=st.floats(-50, 150))
def test_density_at_15c_inverts_density_at_temperature(rho, t):
    rt = density_at_temperature(rho, t, "gasoline")
    assert_close(density_at_15c(rt, t, "gasoline"), rho, unit="kg/m³", rtol=1e-11,
                 what="ρ15 recovered")


def test_density_at_temperature_conserves_mass():
    # ρ_t·V_t = ρ15·V15 with V15 = VCF·V_t (definition of the volume correction factor).
    rho15, t = 805.0, 32.0
    vcf = volume_correction_factor(rho15, t, "jet")
    v_t = 2.0
    assert_close(density_at_temperature(rho15, t, "jet") * v_t, rho15 * vcf * v_t, unit="kg",
                 rtol=1e-14, what="mass")


@pytest.mark.parametrize("call, text", [
    (lambda: volume_correction_factor(800.0, -50.5, "jet"),
     "t_c = -50.5: a temperature from -50 to 150 °C (table 54B range)"),
    (lambda: volume_correction_factor(800.0, [20.0, 151.0], "jet"),
     "t_c[1] = 151: a temperature from -50 to 150 °C (table 54B range)"),
    (lambda: volume_correction_factor(780.0, 20.0, "jet"),
     "rho15 = 780: a density at 15 °C from 787.5 to 838.5 kg/m³ for table 54B jet. Check the "
     "product class or use a measured density at the tank temperature"),
    (lambda: volume_correction_factor(780.0, 20.0, "avgas"),
     "rho15 = 780: a density at 15 °C from 653 to 770.5 kg/m³ for table 54B gasoline. Check the "
     "product class or use a measured density at the tank temperature"),
    (lambda: volume_correction_factor(800.0, 20.0, "diesel"),
     "product = 'diesel': one of 'jet', 'gasoline' (table 54B product classes; 'avgas' counts "
     "as gasoline)"),
    (lambda: density_at_15c(700.0, 20.0, "jet"),
     "rho15 (from rho_t) = 704.229: a density at 15 °C from 787.5 to 838.5 kg/m³ for "
     "table 54B jet. Check the product class or use a measured density at the tank temperature"),
])
def test_vcf_refuses_out_of_range(call, text):
    with pytest.raises(InputError) as err:
        call()
    assert str(err.value) == text


# --- tank arm tables --------------------------------------------------------------------------

def test_tank_arm_interpolates_linearly_and_hits_rows():
    q = [0.0, 40.0, 100.0]
    x = [2.10, 2.30, 2.36]
    assert tank_arm(q, x, 40.0) == 2.30
    # Linear interpolation by hand: 2.30 + (70 − 40)/(100 − 40)·(2.36 − 2.30) = 2.33
    assert_close(tank_arm(q, x, 70.0), 2.33, unit="m", rtol=1e-14, what="arm")
    got = tank_arm(q, x, np.array([0.0, 20.0, 100.0]))
    assert_close(got, [2.10, 2.20, 2.36], unit="m", rtol=1e-14, what="arms")


def test_tank_arm_three_axes():
    got = tank_arm([0.0, 10.0], [[1.0, -0.5, 0.2], [1.2, -0.5, 0.4]], [5.0, 10.0])
    assert got.shape == (2, 3)
    assert_close(got, [[1.1, -0.5, 0.3], [1.2, -0.5, 0.4]], unit="m", rtol=1e-14, what="arm")


def test_tank_arm_table_must_increase_naming_the_row():
    with pytest.raises(InputError) as err:
        tank_arm([0.0, 50.0, 50.0, 80.0], [1.0, 1.1, 1.2, 1.3], 10.0)
    assert str(err.value) == ("table_q[2] = 50: a quantity greater than row 1 (50); the arm "
                              "table must be strictly increasing in quantity")


@pytest.mark.parametrize("q", [-0.1, 100.5])
def test_tank_arm_outside_table_is_an_error(q):
    with pytest.raises(InputError) as err:
        tank_arm([0.0, 100.0], [1.0, 1.2], q)
    assert str(err.value) == (f"quantity = {q:g}: a quantity from 0 to 100 (the arm table's "
                              f"range). Extend the tank's arm table to cover this quantity")


def test_tank_arm_row_count_mismatch():
    with pytest.raises(InputError, match="3 rows of arms"):
        tank_arm([0.0, 1.0, 2.0], [1.0, 2.0], 0.5)


def test_tank_moment_is_mass_times_arm():
    table_m, table_x = [0.0, 100.0, 200.0], [2.0, 2.2, 2.3]
    for m in (0.0, 37.0, 100.0, 163.0, 200.0):
        assert_close(tank_moment(table_m, table_x, m), m * tank_arm(table_m, table_x, m),
                     unit="kg·m", rtol=1e-15, what="moment")


# --- capacity and usable fuel -----------------------------------------------------------------

def test_check_capacity_full_tank_is_within_limits():
    c = check_capacity(200.0, 200.0, unusable=6.0)
    assert (c.usable, c.usable_capacity, c.room) == (194.0, 194.0, 0.0)


def test_check_capacity_over():
    with pytest.raises(InputError) as err:
        check_capacity(200.5, 200.0, field="tanks['left'].fuel")
    assert str(err.value) == ("tanks['left'].fuel = 200.5: at most the tank capacity 200. "
                              "Reduce the fuel by 0.5")


def test_check_capacity_unusable_above_capacity():
    with pytest.raises(InputError, match=r"unusable = 250: from 0 to the tank capacity 200"):
        check_capacity(10.0, 200.0, unusable=250.0)


def test_usable_fuel_never_negative():
    assert_close(usable_fuel([0.0, 3.0, 10.0], 4.0), [0.0, 0.0, 6.0], unit="kg", what="usable")


# --- fuel burn --------------------------------------------------------------------------------

def _two_tanks():
    left = Tank(mass=100.0, unusable=5.0, arm=2.0, name="left")
    aft = Tank(mass=50.0, table_mass=[0.0, 25.0, 50.0], table_arm=[3.0, 3.2, 3.3], name="aft")
    return left, aft


def test_burn_tank_order_has_breakpoints_and_switches():
    left, aft = _two_tanks()
    s = burn_states([left, aft], 120.0, [1, 0], samples=13)  # 10 kg sample spacing
    by_kind = {k: s.burned[[i for i, kk in enumerate(s.kind) if kk == k]].tolist()
               for k in set(s.kind)}
    assert by_kind["start"] == [0.0] and by_kind["end"] == [120.0]
    assert by_kind["switch"] == [50.0]          # the aft tank runs dry (no unusable) at 50 kg
    assert by_kind["breakpoint"] == [25.0]      # the aft table row at 25 kg
    assert np.all(np.diff(s.burned) > 0)
    assert np.max(np.diff(s.burned)) <= 10.0 + 1e-12
    # Hand computation at the breakpoint: left 100 kg × 2.0 m + aft 25 kg × 3.2 m = 280 kg·m.
    i = s.burned.tolist().index(25.0)
    assert_close(s.fuel_moment[i, 0], 280.0, unit="kg·m", rtol=1e-14, what="moment")
    # At the end: aft empty, left 100 − 70 = 30 kg at 2.0 m.
    assert_close(s.tank_mass[-1], [30.0, 0.0], unit="kg", atol=1e-12, what="tank masses")
    assert_close(s.fuel_moment[-1, 0], 60.0, unit="kg·m", rtol=1e-14, what="moment")


def test_burn_proportional_drains_to_unusable_together():
    left, aft = _two_tanks()
    usable = 95.0 + 50.0
    s = burn_states([left, aft], usable, "proportional", samples=5)
    assert_close(s.tank_mass[-1], [5.0, 0.0], unit="kg", atol=1e-12, what="tank masses")
    # Each tank burns in proportion to its usable fuel: at every state the fraction used is
    # the same in both tanks.
    frac_left = (100.0 - s.tank_mass[:, 0]) / 95.0
    frac_aft = (50.0 - s.tank_mass[:, 1]) / 50.0
    assert_close(frac_left, frac_aft, unit="", atol=1e-12, what="fraction burned")
    # The aft table row at 25 kg is reached when half the usable fuel is burned.
    assert "breakpoint" in s.kind
    assert_close(s.burned[s.kind.index("breakpoint")], usable / 2, unit="kg", rtol=1e-14,
                 what="breakpoint")


def test_burn_more_than_usable_is_an_error():
    left, aft = _two_tanks()
    with pytest.raises(InputError) as err:
        burn_states([left, aft], 96.0, [0])
    assert str(err.value) == ("burn = 96: at most 95 kg (the usable fuel in the feeding tanks). "
                              "Reduce the trip fuel or add fuel")
    # Exactly the usable fuel is allowed (the limit is inclusive).
    s = burn_states([left, aft], 95.0, [0])
    assert_close(s.tank_mass[-1], [5.0, 50.0], unit="kg", atol=1e-12, what="tank masses")


def test_burn_rejects_bad_sequence_and_tanks():
    left, aft = _two_tanks()
    with pytest.raises(InputError, match=r"sequence = 2: a tank index from 0 to 1"):
        burn_states([left, aft], 10.0, [2])
    with pytest.raises(InputError, match="each tank index at most once"):
        burn_states([left, aft], 10.0, [0, 0])
    with pytest.raises(InputError, match="all give x only, or all give"):
        burn_states([left, Tank(mass=10.0, arm=(1.0, 0.0, 0.5))], 5.0)
    with pytest.raises(InputError, match=r"tanks\[0\] \('x'\)\.mass = 60: at most the tank "
                                         r"capacity 50"):
        burn_states([Tank(mass=60.0, arm=1.0, capacity=50.0, name="x")], 5.0)
    with pytest.raises(InputError, match="rows covering the fuel from 0 to 60 kg"):
        burn_states([Tank(mass=60.0, table_mass=[0.0, 50.0], table_arm=[1.0, 1.1])], 5.0)


@settings(max_examples=60, deadline=None)
@given(m1=st.floats(10.0, 500.0), m2=st.floats(10.0, 500.0), u1=st.floats(0.0, 5.0),
       frac=st.floats(0.0, 1.0), proportional=st.booleans())
def test_burn_states_are_consistent(m1, m2, u1, frac, proportional):
    # Invariants: fuel mass = start − burned; each state's moment equals the tank-by-tank sum
    # m·arm(m) recomputed with tank_moment; no tank goes below its unusable fuel.
    t1 = Tank(mass=m1, unusable=u1, table_mass=[0.0, 100.0, 300.0, 500.0],
              table_arm=[[2.0, -1.0, 0.3], [2.1, -1.0, 0.35], [2.3, -1.0, 0.4], [2.4, -1.0, 0.45]])
    t2 = Tank(mass=m2, arm=(3.0, 1.0, 0.5))
    usable = (m1 - u1) + m2
    burn = frac * usable
    s = burn_states([t1, t2], burn, "proportional" if proportional else [0, 1])
    assert_close(s.fuel_mass, m1 + m2 - s.burned, unit="kg", rtol=1e-12, atol=1e-9,
                 what="fuel mass")
    assert np.all(s.tank_mass[:, 0] >= u1 - 1e-9)
    expected = (tank_moment(t1.table_mass, t1.table_arm, s.tank_mass[:, 0])
                + s.tank_mass[:, 1:2] * np.array([3.0, 1.0, 0.5]))
    assert_close(s.fuel_moment, expected, unit="kg·m", rtol=1e-12, atol=1e-9, what="moment")
    # Every table row strictly inside the tank's path appears as a state.
    lo, hi = s.tank_mass[-1, 0], m1
    for b in t1.table_mass:
        if lo + 1e-6 < b < hi - 1e-6:
            assert np.min(np.abs(s.tank_mass[:, 0] - b)) < 1e-9
