"""Tests for ledger.core.weighing against outside references (source named beside each check)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ledger.core.weighing import Correction, empty_weight_from_scales, vertical_cg_from_pitch
from ledger.errors import InputError, MassPropertiesError
from ledger.testing import assert_close

LB = 0.45359237   # NIST SP 811 appendix B, exact
IN = 0.0254       # NIST SP 811 appendix B, exact


# --- empty weight from scale readings ---------------------------------------------------------

def test_faa_nosewheel_example_datum_forward():
    # FAA-H-8083-1, weighing chapter, "datum forward of the airplane, nose-wheel landing gear":
    # CG = D − F·L/W with D = 128 in, F = 340 lb, L = 78 in, W = 2,006 lb gives 114.8 in
    # (figures from memory). The mains carry 2,006 − 340 = 1,666 lb, split here as 833/833.
    x = np.array([128.0 - 78.0, 128.0, 128.0]) * IN
    readings = np.array([340.0, 833.0, 833.0]) * LB
    r = empty_weight_from_scales(readings, 0.0, x, points=["nose", "left main", "right main"])
    assert_close(r.weighed_mass / LB, 2006.0, unit="lb", rtol=1e-12, what="weight")
    assert_close(r.weighed_cg_x / IN, 114.8, unit="in", atol=0.05, what="CG",
                 source="FAA-H-8083-1 weighing chapter example (from memory)")


@settings(max_examples=100, deadline=None)
@given(D=st.floats(20.0, 200.0), L=st.floats(20.0, 150.0), F=st.floats(50.0, 800.0),
       mains=st.floats(500.0, 5000.0))
def test_agrees_with_faa_cg_formulas(D, L, F, mains):
    # FAA-H-8083-1, weighing chapter, the four empty-weight CG formulas (from memory):
    # nose wheel, datum forward of the main wheels at D: CG = D − F·L/W;
    # nose wheel, datum aft of the main wheels (mains at −D): CG = −(D + F·L/W);
    # tail wheel, datum forward of the mains at D, tail wheel L aft: CG = D + R·L/W;
    # tail wheel, datum aft of the mains (mains at −D): CG = −D + R·L/W.
    W = F + mains
    r = empty_weight_from_scales([F, mains / 2, mains / 2], 0.0, [D - L, D, D])
    assert_close(r.cg_x, D - F * L / W, unit="in", rtol=1e-12, atol=1e-9, what="CG nose, fwd")
    r = empty_weight_from_scales([F, mains / 2, mains / 2], 0.0, [-D - L, -D, -D])
    assert_close(r.cg_x, -(D + F * L / W), unit="in", rtol=1e-12, atol=1e-9,
                 what="CG nose, aft")
    r = empty_weight_from_scales([F, mains / 2, mains / 2], 0.0, [D + L, D, D])
    assert_close(r.cg_x, D + F * L / W, unit="in", rtol=1e-12, atol=1e-9, what="CG tail, fwd")
    r = empty_weight_from_scales([F, mains / 2, mains / 2], 0.0, [-D + L, -D, -D])
    assert_close(r.cg_x, -D + F * L / W, unit="in", rtol=1e-12, atol=1e-9,
                 what="CG tail, aft")


def test_tare_is_subtracted_per_point_and_broadcast():
    r1 = empty_weight_from_scales([510.0, 620.0, 618.0], [10.0, 20.0, 18.0], [1.0, 3.0, 3.0])
    r2 = empty_weight_from_scales([500.0, 600.0, 600.0], 0.0, [1.0, 3.0, 3.0])
    assert_close(r1.net, [500.0, 600.0, 600.0], unit="kg", rtol=1e-14, what="net")
    assert r1.cg_x == r2.cg_x
    r3 = empty_weight_from_scales([505.0, 605.0, 605.0], 5.0, [1.0, 3.0, 3.0])
    assert_close(r3.net, [500.0, 600.0, 600.0], unit="kg", rtol=1e-14, what="net")


def test_added_item_faa_example():
    # Pilot's Handbook of Aeronautical Knowledge (FAA-H-8083-25), weight and balance chapter:
    # 6,860 lb at CG 80.0 in plus 140 lb at 150 in gives a CG of 81.4 in (rounded to 0.1 in).
    # As a weighing: two points whose CG is 80.0 in, then the item as an added correction.
    readings = np.array([3430.0, 3430.0]) * LB
    x = np.array([60.0, 100.0]) * IN
    r = empty_weight_from_scales(readings, 0.0, x,
                                 corrections=[Correction.add("item", 140 * LB, 150 * IN)])
    assert_close(r.weighed_cg_x / IN, 80.0, unit="in", rtol=1e-12, what="as-weighed CG")
    assert_close(r.mass / LB, 7000.0, unit="lb", rtol=1e-12, what="weight")
    assert_close(r.cg_x / IN, 81.4, unit="in", atol=0.05, what="CG",
                 source="FAA-H-8083-25 weight and balance chapter")


def test_weight_shift_faa_example():
    # Pilot's Handbook of Aeronautical Knowledge (FAA-H-8083-25), weight-shift example:
    # 7,800 lb at CG 81.5 in, aft limit 80.5 in; moving 65 lb of cargo from station 150 to
    # station 30 brings the CG to the limit. As corrections: remove at 150, add at 30.
    readings = np.array([3900.0, 3900.0]) * LB
    x = np.array([61.5, 101.5]) * IN
    r = empty_weight_from_scales(readings, 0.0, x, corrections=[
        Correction.remove("cargo (from)", 65 * LB, 150 * IN),
        Correction.add("cargo (to)", 65 * LB, 30 * IN)])
    assert_close(r.mass / LB, 7800.0, unit="lb", rtol=1e-12, what="weight unchanged")
    assert_close(r.cg_x / IN, 80.5, unit="in", atol=0.005, what="CG",
                 source="FAA-H-8083-25 weight-shift example")


def test_remove_usable_fuel_keep_unusable():
    # FAA-H-8083-1 weighing chapter: weighed with fuel, remove the usable fuel at the tank arm;
    # the unusable fuel stays in the empty weight. Hand computation:
    # as weighed 1,000 kg at 2.9 m (moment 2,900 kg·m); usable fuel 120 kg at 2.5 m removed:
    # 880 kg, moment 2,900 − 300 = 2,600 kg·m, CG 2.954545… m; drained oil 7 kg at 1.2 m added:
    # 887 kg, 2,608.4 kg·m.
    x = [1.0, 3.5, 3.5]
    # Net readings chosen so that the as-weighed CG is 2.9 m: nose 240 kg, mains 380 each.
    r = empty_weight_from_scales([240.0, 380.0, 380.0], 0.0, x, corrections=[
        Correction.remove("usable fuel", 120.0, 2.5),
        Correction.add("engine oil drained for weighing", 7.0, 1.2)])
    assert_close(r.weighed_cg_x, 2.9, unit="m", rtol=1e-14, what="as-weighed CG")
    assert_close(r.mass, 887.0, unit="kg", rtol=1e-14, what="mass")
    assert_close(r.moment_x, 2608.4, unit="kg·m", rtol=1e-14, what="moment")
    assert_close(r.cg_x, 2608.4 / 887.0, unit="m", rtol=1e-14, what="CG")
    labels = [line.label for line in r.breakdown]
    assert labels == ["net at point 1", "net at point 2", "net at point 3", "usable fuel",
                      "engine oil drained for weighing"]
    assert r.breakdown[3].mass == -120.0 and r.breakdown[4].mass == 7.0
    assert_close(sum(line.mass for line in r.breakdown), r.mass, unit="kg", rtol=1e-14,
                 what="breakdown total")


def test_lateral_cg_and_missing_lateral_arm():
    # Helicopter practice (FAA-H-8083-1, helicopter chapter): lateral CG = Σ(R·y)/ΣR, y right.
    r = empty_weight_from_scales([300.0, 350.0, 350.0], 0.0, [1.0, 3.0, 3.0],
                                 y=[0.0, -1.0, 1.1])
    assert_close(r.weighed_cg_y, (350.0 * -1.0 + 350.0 * 1.1) / 1000.0, unit="m", rtol=1e-14,
                 what="lateral CG")
    with pytest.raises(MassPropertiesError) as err:
        empty_weight_from_scales([300.0, 350.0, 350.0], 0.0, [1.0, 3.0, 3.0], y=[0.0, -1.0, 1.0],
                                 corrections=[Correction.remove("fuel", 10.0, 2.0)])
    assert str(err.value) == ("corrections[0] ('fuel').y = None: an arm in m, since the "
                              "weighing points have one")


def test_negative_net_names_the_point():
    with pytest.raises(MassPropertiesError) as err:
        empty_weight_from_scales([300.0, 12.0, 350.0], [0.0, 15.0, 0.0], [1.0, 3.0, 3.0],
                                 points=["nose", "left main", "right main"])
    assert str(err.value) == ("net reaction at 'left main' = -3: a net reading of 0 kg or more "
                              "(reading 12 − tare 15). Check the tare and the scale zero")


def test_non_finite_reading_names_the_point():
    with pytest.raises(MassPropertiesError) as err:
        empty_weight_from_scales([300.0, float("nan"), 350.0], 0.0, [1.0, 3.0, 3.0],
                                 points=["nose", "left main", "right main"])
    assert str(err.value) == "readings['left main'] = nan: a finite number"


def test_mismatched_lengths_and_empty_total():
    with pytest.raises(MassPropertiesError, match="3 values, one per weighing point"):
        empty_weight_from_scales([1.0, 2.0, 3.0], 0.0, [1.0, 2.0])
    with pytest.raises(MassPropertiesError, match="total is greater than 0 kg"):
        empty_weight_from_scales([5.0, 5.0], 5.0, [1.0, 2.0])
    with pytest.raises(MassPropertiesError, match="leave more than 0 kg"):
        empty_weight_from_scales([5.0, 5.0], 0.0, [1.0, 2.0],
                                 corrections=[Correction.remove("all", 10.0, 1.5)])


corrections_st = st.lists(
    st.builds(Correction, label=st.text(max_size=5), mass=st.floats(0.0, 50.0),
              x=st.floats(-5.0, 10.0), y=st.floats(-2.0, 2.0), sign=st.sampled_from([1, -1])),
    max_size=6)


@settings(max_examples=100, deadline=None)
@given(corrs=corrections_st, seed=st.integers(0, 2**32 - 1))
def test_correction_order_does_not_matter(corrs, seed):
    # Mass and moments are sums, so the order of the corrections cannot change them.
    readings, x, y = [400.0, 700.0, 710.0], [1.0, 3.2, 3.2], [0.0, -1.2, 1.2]
    a = empty_weight_from_scales(readings, 0.0, x, y, corrections=corrs)
    shuffled = list(corrs)
    np.random.default_rng(seed).shuffle(shuffled)
    b = empty_weight_from_scales(readings, 0.0, x, y, corrections=shuffled)
    assert_close(b.mass, a.mass, unit="kg", rtol=1e-12, what="mass")
    assert_close(b.cg_x, a.cg_x, unit="m", rtol=1e-10, atol=1e-12, what="CG x")
    assert_close(b.cg_y, a.cg_y, unit="m", rtol=1e-10, atol=1e-12, what="CG y")


@settings(max_examples=50, deadline=None)
@given(m=st.floats(0.0, 200.0), cx=st.floats(-3.0, 8.0), cy=st.floats(-2.0, 2.0))
def test_remove_then_add_the_same_item_restores_the_weighing(m, cx, cy):
    readings, x, y = [400.0, 700.0, 710.0], [1.0, 3.2, 3.2], [0.0, -1.2, 1.2]
    r = empty_weight_from_scales(readings, 0.0, x, y, corrections=[
        Correction.remove("item", m, cx, cy), Correction.add("item", m, cx, cy)])
    assert_close(r.mass, r.weighed_mass, unit="kg", rtol=1e-12, what="mass")
    assert_close(r.cg_x, r.weighed_cg_x, unit="m", rtol=1e-12, what="CG x")
    assert_close(r.cg_y, r.weighed_cg_y, unit="m", rtol=1e-12, atol=1e-12, what="CG y")


# --- vertical CG from a pitched weighing ------------------------------------------------------

def _reactions_pitched(cg, pads, pitch, mass):
    """Vertical reactions at three body-fixed pads by statics, the body pitched nose-up.

    Independent of the module: rotate every point with a rotation matrix about the lateral axis,
    then solve force and moment balance (about the two horizontal axes) for the three vertical
    reactions. x aft, y right, z up; a nose-up pitch lifts points ahead of the origin.
    """
    c, s = math.cos(pitch), math.sin(pitch)
    rot = np.array([[c, 0.0, s], [0.0, 1.0, 0.0], [-s, 0.0, c]])
    nose_after = rot @ np.array([-1.0, 0.0, 0.0])
    assert pitch == 0 or (nose_after[2] > 0) == (pitch > 0)  # nose-up for pitch > 0
    p = (rot @ np.asarray(pads, dtype=float).T).T
    g = rot @ np.asarray(cg, dtype=float)
    a = np.vstack([np.ones(3), p[:, 0], p[:, 1]])
    return np.linalg.solve(a, mass * np.array([1.0, g[0], g[1]]))


@settings(max_examples=60, deadline=None)
@given(xc=st.floats(2.0, 4.0), yc=st.floats(-0.2, 0.2), h=st.floats(-0.5, 2.0),
       deg=st.floats(2.0, 12.0), mass=st.floats(300.0, 20000.0))
def test_pitched_weighing_recovers_height_of_a_rigid_body(xc, yc, h, deg, mass):
    # Reaction-point plane at z = 0 in body axes (jack pads), datum plane_z = 0.35 m.
    pads = [(0.8, 0.0, 0.0), (4.5, -1.6, 0.0), (4.5, 1.6, 0.0)]
    cg = (xc, yc, h)
    level = _reactions_pitched(cg, pads, 0.0, mass)
    pitched = _reactions_pitched(cg, pads, math.radians(deg), mass)
    x = [p[0] for p in pads]
    y = [p[1] for p in pads]
    lv = empty_weight_from_scales(level, 0.0, x, y)
    pt = empty_weight_from_scales(pitched, 0.0, x, y)   # reduced with the level arms
    assert_close(lv.cg_x, xc, unit="m", rtol=1e-12, what="level CG")
    res = vertical_cg_from_pitch(lv.cg_x, pt.cg_x, math.radians(deg), plane_z=0.35,
                                 mass_level=lv.mass, mass_pitched=pt.mass)
    assert_close(res.height, h, unit="m", atol=1e-9, what="CG height above the pads")
    assert_close(res.z_cg, 0.35 + h, unit="m", atol=1e-9, what="z CG")


def test_pitched_weighing_several_angles_fit_and_z_correction():
    pads = [(0.8, 0.0, 0.0), (4.5, -1.6, 0.0), (4.5, 1.6, 0.0)]
    cg, mass = (3.1, 0.02, 0.9), 5400.0
    x = [p[0] for p in pads]
    level = empty_weight_from_scales(_reactions_pitched(cg, pads, 0.0, mass), 0.0, x)
    angles = np.radians([3.0, 6.0, -4.0])  # nose-down counts too
    apparent = [empty_weight_from_scales(_reactions_pitched(cg, pads, a, mass), 0.0, x).cg_x
                for a in angles]
    res = vertical_cg_from_pitch(level.cg_x, apparent, angles)
    assert_close(res.height, 0.9, unit="m", atol=1e-9, what="fitted height")
    assert_close(res.heights, [0.9, 0.9, 0.9], unit="m", atol=1e-9, what="per-angle heights")
    assert res.residual_rms < 1e-9
    # The height then feeds the empty-weight computation as the as-weighed vertical CG.
    r = empty_weight_from_scales(_reactions_pitched(cg, pads, 0.0, mass), 0.0, x, z_cg=res.z_cg,
                                 corrections=[Correction.remove("fuel", 400.0, 3.0, z=0.4)])
    assert_close(r.cg_z, (mass * 0.9 - 400.0 * 0.4) / (mass - 400.0), unit="m", rtol=1e-9,
                 what="corrected z CG")


def test_pitched_weighing_rejects_small_angle_and_mass_mismatch():
    with pytest.raises(InputError) as err:
        vertical_cg_from_pitch(3.0, 3.01, math.radians(1.0))
    assert str(err.value).startswith("pitch_rad[0] = 0.0174533: a pitch of 2° to 60°")
    with pytest.raises(InputError) as err:
        vertical_cg_from_pitch(3.0, 3.05, math.radians(5.0), mass_level=1000.0,
                               mass_pitched=980.0)
    assert str(err.value) == ("mass_pitched[0] = 980: within 0.5 % of the level weighing's "
                              "1000 kg. Re-zero the scales and check nothing moved or was "
                              "removed")
    with pytest.raises(InputError, match="one pitch angle per pitched weighing"):
        vertical_cg_from_pitch(3.0, [3.05, 3.1], math.radians(5.0))


# --- plausible empty mass -----------------------------------------------------------------------

@pytest.mark.parametrize("mass, largest, plausible", [
    (700.0, 1114.9, True),           # a light aircraft's empty mass under its ramp mass
    (1114.9, 1114.9, True),          # the limit itself is allowed (inclusive)
    (1114.9 * (1 + 1e-12), 1114.9, False),
    (0.0, 1114.9, False),            # an empty vehicle has a mass
    (-1.0, None, False),
    (math.inf, None, False),         # no stated limit: only finite and above 0
    (math.nan, 1114.9, False),
    (1e9, None, True),
])
def test_plausible_empty_mass(mass, largest, plausible):
    # Common practice: the empty weight is a part of every loaded weight the type's limits
    # bound, so an empty mass above the largest maximum mass is a misread scale or a wrong
    # unit, not a vehicle (PLAUSIBLE_EMPTY_MULTIPLE = 1).
    from ledger.core.weighing import PLAUSIBLE_EMPTY_MULTIPLE, plausible_empty_mass

    assert PLAUSIBLE_EMPTY_MULTIPLE == 1.0
    assert plausible_empty_mass(mass, largest) is plausible
