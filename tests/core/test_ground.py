"""Tests for ledger.core.ground against outside references (source named beside each check)."""

from __future__ import annotations

import math

import numpy as np
import pint
import pytest
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from ledger.core.ground import (
    FOOT,
    INCH,
    LB,
    RuleSet,
    axle_loads,
    axle_overload_fix,
    bridge_formula_lb,
    cg_height_axle_lift,
    check_axle_groups,
    check_axle_ratings,
    corner_weights,
)
from ledger.errors import InputError
from ledger.testing import assert_close

#: The US federal Interstate limits as a rule-set mapping (23 CFR 658.17; 23 U.S.C. 127): the
#: same figures the shipped rule file ledger/rules/us-federal-interstate.toml holds.
US_FEDERAL_INTERSTATE = {
    "name": "US federal, Interstate System",
    "single_axle_lb": 20000,
    "tandem_lb": 34000,
    "gross_lb": 80000,
    "bridge_formula": True,
    "single_spread_in": 40,
    "tandem_spread_in": 96,
    "tandem_pair_spread_ft": 36,
    "source": "23 CFR 658.17 (single axle, tandem, gross, bridge formula and the two-tandem "
              "exception); axle definitions as in 23 CFR 658.5",
}


def rule_set(name: str) -> RuleSet:
    assert name == "us-interstate"
    return RuleSet.from_dict(US_FEDERAL_INTERSTATE)


UREG = pint.UnitRegistry()


# --- axle loads -------------------------------------------------------------------------------

def test_two_axle_loads_by_hand():
    # Statics of a beam on two supports: W_f = W·b/L, W_r = W·a/L. W = 1,800 kg, L = 2.8 m,
    # a = 1.12 m behind the front axle → W_f = 1800·1.68/2.8 = 1,080 kg, W_r = 720 kg.
    r = axle_loads(1800.0, 1.12 + 0.5, [0.5, 3.3])
    assert_close(r.axle, [1080.0, 720.0], unit="kg", rtol=1e-13, what="axle loads")


def test_tandem_group_as_one_support():
    # Steer axle at 0 m, tandem at 5.0 and 6.3 m sharing equally: the tandem acts at 5.65 m.
    # CG at 4.0 m, 20,000 kg: front = 20000·1.65/5.65, tandem = 20000·4.0/5.65, half per axle.
    r = axle_loads(20000.0, 4.0, [0.0, 5.0, 6.3], groups=[[0], [1, 2]])
    assert_close(r.group_x, [0.0, 5.65], unit="m", rtol=1e-14, what="support positions")
    rear = 20000.0 * 4.0 / 5.65
    assert_close(r.axle, [20000.0 - rear, rear / 2, rear / 2], unit="kg", rtol=1e-13,
                 what="axle loads")
    # Unequal sharing (60/40 from the type data) moves the support to 5.52 m.
    r = axle_loads(20000.0, 4.0, [0.0, 5.0, 6.3], groups=[[0], [1, 2]], shares=[[1], [3, 2]])
    assert_close(r.group_x[1], 5.52, unit="m", rtol=1e-14, what="support position")
    assert_close(r.axle[1] / r.axle[2], 1.5, unit="", rtol=1e-13, what="share ratio")


def test_wheel_side_loads():
    # left = W_axle·(t/2 − y)/t with y positive right: 900 kg, t = 1.5 m, y = +0.05 m →
    # left 900·0.70/1.5 = 420 kg, right 480 kg.
    r = axle_loads(1500.0, 1.2, [0.0, 3.0], cg_y=0.05, track=1.5)
    assert_close(r.left, [420.0, 280.0], unit="kg", rtol=1e-13, what="left")
    assert_close(r.right, [480.0, 320.0], unit="kg", rtol=1e-13, what="right")


@settings(max_examples=100, deadline=None)
@given(w=st.floats(500.0, 40000.0), frac=st.floats(0.0, 1.0), y=st.floats(-0.3, 0.3),
       s1=st.floats(0.5, 2.0), s2=st.floats(0.5, 2.0))
def test_axle_loads_balance_forces_and_moments(w, frac, y, s1, s2):
    ax = np.array([0.0, 4.2, 5.5])
    shares = [[1.0], [s1, s2]]
    gx = (s1 * 4.2 + s2 * 5.5) / (s1 + s2)
    xc = frac * gx
    r = axle_loads(w, xc, ax, cg_y=y, track=[2.0, 1.8, 1.8], groups=[[0], [1, 2]],
                   shares=shares)
    # Equilibrium of the rigid body: Σ loads = W; Σ loads·x = W·x_cg; Σ (right − left)·t/2 = W·y.
    assert_close(r.axle.sum(), w, unit="kg", rtol=1e-12, what="Σ axle loads")
    assert_close(r.axle @ ax, w * xc, unit="kg·m", rtol=1e-10, atol=1e-8, what="Σ load·x")
    assert_close(((r.right - r.left) * np.array([1.0, 0.9, 0.9])).sum(), w * y, unit="kg·m",
                 rtol=1e-10, atol=1e-8, what="Σ load·y")
    assert np.all(r.axle >= -1e-9)


@pytest.mark.parametrize("call, text", [
    (lambda: axle_loads(1000.0, 3.5, [0.0, 3.0]),
     "cg_x = 3.5: a CG between the supports at 0 m and 3 m; outside them the vehicle would tip"),
    (lambda: axle_loads(1000.0, 1.0, [0.0, 3.0, 4.2]),
     "groups = None: two axle groups (lists of axle indices) for a vehicle with 3 axles. A rigid "
     "body on more than two independent supports is statically indeterminate; group the axles, "
     "e.g. [[0], [1, 2]] for a steer axle and a tandem"),
    (lambda: axle_loads(1000.0, 1.0, [0.0, 3.0], cg_y=0.8, track=1.5),
     "cg_y = 0.8: a lateral CG within half the narrowest track (±0.75 m)"),
    (lambda: axle_loads(1000.0, 1.0, [3.0, 0.0]),
     "axle_x[1] = 0: a position aft of axle 0 (3 m); list axles front to rear"),
])
def test_axle_load_errors(call, text):
    with pytest.raises(InputError) as err:
        call()
    assert str(err.value) == text


def test_ratings_margins_inclusive():
    c = check_axle_ratings([850.0, 600.0], [850.0, float("nan")], gross_rating=1450.0)
    assert c.margin[0] == 0.0 and not c.over[0] and math.isnan(c.margin[1])
    assert c.gross_margin == 0.0 and c.ok
    c = check_axle_ratings([850.1, 600.0], [850.0, 700.0])
    assert c.over.tolist() == [True, False] and not c.ok


# --- fixing an overloaded axle ----------------------------------------------------------------

def test_fix_front_overload_by_moving_payload_aft():
    # 1,500 kg, CG 1.2 m aft of the front axle, wheelbase 3 m: front 900 kg against 850 kg.
    # 50 kg must go to the rear: m·d = 50 kg × 3 m = 150 kg·m; a 100 kg payload moves 1.5 m aft.
    f = axle_overload_fix(1500.0, 1.2, [0.0, 3.0], [850.0, 800.0], payload_mass=100.0)
    assert f.needed and f.feasible and f.overloaded == (0,) and f.direction == "aft"
    assert_close(f.distance, 1.5, unit="m", rtol=1e-13, what="distance")
    # Independent check with the weight-shift relation (FAA-H-8083-25, weight and balance
    # chapter: Δm/M = ΔCG/(arm_to − arm_from)) and a fresh axle-load computation.
    new_cg = 1.2 + 100.0 * f.distance / 1500.0
    again = axle_loads(1500.0, new_cg, [0.0, 3.0])
    assert_close(again.axle, [850.0, 650.0], unit="kg", rtol=1e-12, what="loads after")
    assert_close(f.new_axle_load, again.axle, unit="kg", rtol=1e-12, what="reported loads")
    g = axle_overload_fix(1500.0, 1.2, [0.0, 3.0], [850.0, 800.0], move_distance=2.0)
    assert_close(g.mass, 75.0, unit="kg", rtol=1e-13, what="mass to move 2 m")


def test_fix_tandem_axle_overload_uses_share_limits():
    # Tandem axles share 3:2, the leading tandem axle is rated 9,000 kg → the group may carry
    # 9000 / 0.6 = 15,000 kg. 20,000 kg with CG 4.6 m: tandem load 20000·4.6/5.52 ≈ 16,667 kg.
    f = axle_overload_fix(20000.0, 4.6, [0.0, 5.0, 6.3], [8000.0, 9000.0, 9000.0],
                          groups=[[0], [1, 2]], shares=[[1], [3, 2]], payload_mass=2000.0)
    assert f.overloaded == (1,) and f.direction == "forward"
    again = axle_loads(20000.0, f.new_cg_x, [0.0, 5.0, 6.3], groups=[[0], [1, 2]],
                       shares=[[1], [3, 2]])
    assert_close(again.axle[1], 9000.0, unit="kg", rtol=1e-12, what="leading tandem axle")
    assert again.axle[0] <= 8000.0
    assert_close(f.distance * 2000.0 / 20000.0, f.new_cg_x - 4.6, unit="m", rtol=1e-12,
                 what="CG shift")


def test_fix_not_possible_by_moving():
    f = axle_overload_fix(1800.0, 1.5, [0.0, 3.0], [850.0, 800.0], payload_mass=100.0)
    assert not f.feasible and f.offload == pytest.approx(150.0)
    assert "offload at least 150.0 kg" in f.note
    f = axle_overload_fix(1500.0, 1.2, [0.0, 3.0], [950.0, 800.0], gross_rating=1400.0)
    assert not f.feasible and f.offload == pytest.approx(100.0)
    f = axle_overload_fix(1500.0, 1.2, [0.0, 3.0], [950.0, 800.0])
    assert not f.needed and f.moment_shift == 0.0


# --- corner weights ---------------------------------------------------------------------------

def test_corner_weights_by_hand():
    # LF 310, RF 290, LR 260, RR 240 kg: T = 1,100; left % = 570/1100; rear % = 500/1100;
    # diagonals RF+LR = 550/1100 = 50 %, LF+RR = 550/1100 = 50 %.
    c = corner_weights(310.0, 290.0, 260.0, 240.0, 2.4, 1.40, 1.38, front_axle_x=0.1)
    assert_close(c.left_pct, 100 * 570 / 1100, unit="%", rtol=1e-13, what="left %")
    assert_close(c.rear_pct, 100 * 500 / 1100, unit="%", rtol=1e-13, what="rear %")
    assert set(c.diagonals) == {"RF+LR", "LF+RR"}
    assert_close(c.diagonals["RF+LR"] + c.diagonals["LF+RR"], 100.0, unit="%", rtol=1e-13,
                 what="diagonals")
    assert_close(c.cg_x, 0.1 + 2.4 * 500 / 1100, unit="m", rtol=1e-13, what="CG x")
    # y positive right: (RF − LF)·t_f/2 + (RR − LR)·t_r/2 = −20·0.70 − 20·0.69 = −27.8 kg·m.
    assert_close(c.cg_y, -27.8 / 1100, unit="m", rtol=1e-12, what="CG y")
    c = corner_weights(300.0, 250.0, 250.0, 300.0, 2.4, 1.4, 1.4)
    assert c.rf_lr_pct == pytest.approx(100 * 500 / 1100) and \
        c.lf_rr_pct == pytest.approx(100 * 600 / 1100)


@settings(max_examples=100, deadline=None)
@given(w=st.floats(600.0, 4000.0), frac=st.floats(0.05, 0.95), y=st.floats(-0.2, 0.2),
       L=st.floats(2.0, 3.5), tf=st.floats(1.2, 1.8), tr=st.floats(1.2, 1.8),
       x0=st.floats(-1.0, 1.0))
def test_corner_weights_round_trip_with_axle_loads(w, frac, y, L, tf, tr, x0):
    xc = x0 + frac * L
    a = axle_loads(w, xc, [x0, x0 + L], cg_y=y, track=[tf, tr])
    c = corner_weights(a.left[0], a.right[0], a.left[1], a.right[1], L, tf, tr,
                       front_axle_x=x0)
    assert_close(c.total, w, unit="kg", rtol=1e-12, what="total")
    assert_close(c.cg_x, xc, unit="m", rtol=1e-10, atol=1e-10, what="CG x")
    assert_close(c.cg_y, y, unit="m", atol=1e-10, what="CG y")
    assert_close(c.rear_pct, 100 * a.axle[1] / w, unit="%", rtol=1e-10, what="rear %")


# --- CG height from axle lift (ISO 10392) ------------------------------------------------------

def _front_load_after_lift(w, L, a, h, r, theta):
    """Front reaction of a rigid vehicle with the rear axle raised by θ, by statics.

    Independent of the module: place the wheel centres and the CG in body axes (origin at the
    front wheel centre, x along the wheel-centre line, z perpendicular), rotate the body with a
    rotation matrix, drop each contact vertically below its wheel centre, and solve the two
    equilibrium equations for the two vertical reactions.
    """
    c, s = math.cos(theta), math.sin(theta)
    rot = np.array([[c, -s], [s, c]])            # raises points aft of the front wheel
    front, rear, cg = rot @ [0.0, 0.0], rot @ [L, 0.0], rot @ [a, h - r]
    assert theta == 0 or rear[1] > front[1]
    mat = np.array([[1.0, 1.0], [front[0], rear[0]]])
    return np.linalg.solve(mat, [w, w * cg[0]])[0]


@settings(max_examples=100, deadline=None)
@given(w=st.floats(800.0, 40000.0), L=st.floats(2.0, 6.0), frac=st.floats(0.2, 0.8),
       h=st.floats(0.35, 2.5), r=st.floats(0.25, 0.55), deg=st.floats(3.0, 30.0))
def test_axle_lift_formula_is_exact_for_a_rigid_body(w, L, frac, h, r, deg):
    a = frac * L
    th = math.radians(deg)
    wf = _front_load_after_lift(w, L, a, h, r, 0.0)
    wf_t = _front_load_after_lift(w, L, a, h, r, th)
    assume(0 < wf_t < w)  # otherwise the body would tip over the front wheels
    assert_close(wf, w * (L - a) / L, unit="kg", rtol=1e-12, what="level front load")
    res = cg_height_axle_lift(w, L, wf, wf_t, th, r, total_tilted=w)
    assert_close(res.height, h, unit="m", atol=1e-9, what="CG height",
                 source="ISO 10392 relation vs exact statics")


def test_axle_lift_several_angles_least_squares():
    w, L, a, h, r = 2200.0, 2.9, 1.25, 0.62, 0.31
    angles = np.radians([5.0, 10.0, 15.0, 20.0])
    wf = _front_load_after_lift(w, L, a, h, r, 0.0)
    wf_t = np.array([_front_load_after_lift(w, L, a, h, r, t) for t in angles])
    res = cg_height_axle_lift(w, L, wf, wf_t, angles, r)
    assert_close(res.height, h, unit="m", atol=1e-9, what="fit")
    assert res.residual_rms < 1e-8
    # Scale noise of ±2 kg: the fit stays close and the residual shows the scatter.
    noisy = wf_t + np.array([2.0, -2.0, 1.0, -1.0])
    res = cg_height_axle_lift(w, L, wf, noisy, angles, r)
    assert abs(res.height - h) < 0.02 and res.residual_rms > 0.5


@pytest.mark.parametrize("kwargs, text", [
    (dict(theta_rad=math.radians(1.0)),
     "theta_rad[0] = 0.0174533: a lift angle of 2° to 45° (0.03491 to 0.7854 rad). Raise the "
     "axle further; a small angle gives a load change lost in the scale resolution"),
    (dict(front_tilted=2500.0), "front_tilted[0] = 2500: a load from 0 to the total 2000 kg"),
    (dict(total_tilted=1950.0),
     "total_tilted[0] = 1950: within 0.5 % of the level total 2000 kg. Re-zero the scales and "
     "check that nothing moved or was removed"),
    (dict(front_tilted=[1300.0, 1310.0]), "theta_rad = [0.17453292519943295]: one angle per "
                                          "tilted load (2)"),
])
def test_axle_lift_errors(kwargs, text):
    args = dict(total_mass=2000.0, wheelbase=2.8, front_level=1100.0, front_tilted=1150.0,
                theta_rad=math.radians(10.0), wheel_radius=0.3)
    args.update(kwargs)
    with pytest.raises(InputError) as err:
        cg_height_axle_lift(**args)
    assert str(err.value) == text


def test_axle_lift_cg_below_ground_is_inconsistent():
    # A front load that *drops* a lot when the rear is raised puts the CG below the ground:
    # the wrong axle was raised or the angle sign is wrong.
    with pytest.raises(InputError, match="put the CG above the ground"):
        cg_height_axle_lift(2000.0, 2.8, 1100.0, 1000.0, math.radians(10.0), 0.3)


# --- bridge formula and axle-group rules ------------------------------------------------------

@pytest.mark.parametrize("L, N, expected, source", [
    (8, 2, 38000.0, "computed: 500·(16 + 24 + 36)"),
    (4, 2, 34000.0, "FHWA bridge table, 4 ft, 2 axles (from memory)"),
    (9, 2, 39000.0, "FHWA bridge table (from memory)"),
    (10, 2, 40000.0, "FHWA bridge table (from memory)"),
    (9, 3, 42500.0, "FHWA bridge table, 42,750 printed as 42,500 (from memory)"),
    (11, 3, 44000.0, "FHWA bridge table, 44,250 printed as 44,000 (from memory)"),
    (14, 4, 51500.0, "FHWA bridge table, 51,333 to nearest 500 (from memory)"),
    (36, 4, 66000.0, "FHWA: 'only 66,000 to 67,500 pounds on tandems spaced 36 to 38 feet'"),
    (38, 4, 67500.0, "FHWA: 'only 66,000 to 67,500 pounds on tandems spaced 36 to 38 feet'"),
    (51, 5, 80000.0, "FHWA bridge table, 5 axles reach 80,000 lb at 51 ft (from memory)"),
])
def test_bridge_formula_values(L, N, expected, source):
    assert bridge_formula_lb(L, N) == expected, source


def test_us_rule_set_limits_in_kg():
    # 23 CFR 658.17: 20,000 lb single axle, 34,000 lb tandem, 80,000 lb gross (pint converts).
    us = rule_set("us-interstate")
    for got, lb in ((us.single_axle_max, 20000), (us.tandem_max, 34000), (us.gross_max, 80000)):
        assert_close(got, (lb * UREG.lb).to("kg").magnitude, unit="kg", rtol=1e-14,
                     what="limit", source="23 CFR 658.17")
    # Axle definitions: 40 in (single) and 96 in (tandem) between centres.
    assert_close(us.single_spread, (40 * UREG.inch).to("m").magnitude, unit="m", rtol=1e-14,
                 what="single spread")
    assert_close(us.tandem_spread, 96 * INCH, unit="m", rtol=1e-14, what="tandem spread")
    assert_close(us.tandem_pair_spread, 36 * FOOT, unit="m", rtol=1e-14, what="pair spread")
    assert us.bridge_formula


def test_rule_set_from_dict_errors_and_new_sets_as_data():
    with pytest.raises(InputError) as err:
        RuleSet.from_dict({**US_FEDERAL_INTERSTATE, "steer_lb": 12000})
    assert str(err.value).startswith("rule set.steer_lb = 12000: no such key; known keys are ")
    with pytest.raises(InputError) as err:
        RuleSet.from_dict({"name": "x", "single_axle_kg": 1, "tandem_kg": 2,
                           "single_spread_m": 1, "tandem_spread_m": 2})
    assert str(err.value) == "x.gross = None: a mass with one of the suffixes _kg, _lb"
    with pytest.raises(InputError, match="one unit suffix only"):
        RuleSet.from_dict({**US_FEDERAL_INTERSTATE, "gross_kg": 36000})
    invented = RuleSet.from_dict({"name": "example metric set (invented)", "single_axle_kg": 10000,
                                  "tandem_kg": 18000, "gross_kg": 40000, "single_spread_m": 1.0,
                                  "tandem_spread_m": 2.5})
    f = check_axle_groups(invented, [0.0, 4.0, 5.3], [7000.0, 9500.0, 9500.0])
    bad = [x for x in f if not x.ok]
    assert [(x.rule, x.axles) for x in bad] == [("tandem", (1, 2))]
    assert bad[0].margin == pytest.approx(-1000.0)


def _five_axle(trailer_tandem_lb=16800.0):
    x = [0.0, 5.0, 6.3, 15.5, 16.8]
    loads = np.array([12000.0, 16500.0, 16500.0, trailer_tandem_lb, trailer_tandem_lb]) * LB
    return x, loads


def test_five_axle_combination_within_us_limits():
    x, loads = _five_axle()
    f = check_axle_groups(rule_set("us-interstate"), x, loads)
    assert all(item.ok for item in f)
    kinds = [item.rule for item in f]
    assert kinds.count("single axle") == 5 and kinds.count("tandem") == 2
    assert kinds.count("gross") == 1
    # Groups spread more than 96 in: (1,2), (1,3), (1,4), (1,5), (2,4), (2,5), (3,4), (3,5).
    assert kinds.count("bridge formula") == 8
    outer = [item for item in f if item.rule == "bridge formula" and item.axles == (0, 1, 2, 3, 4)]
    # L = 16.8 m = 55.1 ft → 55 ft, N = 5: 500·(68.75 + 96) = 82,375 → 82,500 lb.
    assert outer[0].detail == "L = 55 ft, N = 5"
    assert_close(outer[0].limit, 82500 * LB, unit="kg", rtol=1e-14, what="bridge limit")
    assert all("not a legal determination" in item.advisory for item in f)


def test_tandem_and_gross_over_and_inclusive_gross():
    x, loads = _five_axle(trailer_tandem_lb=17500.0)
    f = check_axle_groups(rule_set("us-interstate"), x, loads)
    over = [(item.rule, item.axles) for item in f if not item.ok]
    assert over == [("tandem", (3, 4))]
    gross = [item for item in f if item.rule == "gross"][0]
    assert gross.ok and gross.margin == pytest.approx(0.0, abs=1e-9)   # 80,000 lb exactly


def test_two_consecutive_tandems_exception():
    # 23 U.S.C. 127 / 23 CFR 658.17 (read as quoted): two consecutive sets of tandem axles may
    # carry 34,000 lb each if the first and last axles of the tandems are 36 ft or more apart;
    # the bridge formula alone would give 66,000 lb at 36 ft.
    x = [0.0, 4.9, 4.9 + 1.3, 4.9 + 36 * FOOT - 1.3, 4.9 + 36 * FOOT]
    loads = np.array([11900.0, 17000.0, 17000.0, 17000.0, 17000.0]) * LB
    f = check_axle_groups(rule_set("us-interstate"), x, loads)
    pair = [item for item in f if item.axles == (1, 2, 3, 4)][0]
    assert pair.ok and "two consecutive tandems" in pair.detail
    assert_close(pair.limit, 68000 * LB, unit="kg", rtol=1e-14, what="limit")
    no_exception = RuleSet.from_dict({k: v for k, v in US_FEDERAL_INTERSTATE.items()
                                      if k != "tandem_pair_spread_ft"})
    f = check_axle_groups(no_exception, x, loads)
    pair = [item for item in f if item.axles == (1, 2, 3, 4)][0]
    assert not pair.ok
    assert_close(pair.margin, -2000 * LB, unit="kg", rtol=1e-12, what="margin")


def test_single_axle_rules():
    us = rule_set("us-interstate")
    # One axle of a tandem above 20,000 lb is over even with the tandem within 34,000 lb
    # (23 CFR 658.17: "any one axle, including any one axle of a group of axles", from memory).
    f = check_axle_groups(us, [0.0, 5.0, 6.3], np.array([10000.0, 21000.0, 12000.0]) * LB)
    assert [(i.rule, i.axles) for i in f if not i.ok] == [("single axle", (1,))]
    # Axles whose centres are within 40 in count as one axle load (axle-load definition with
    # two transverse planes 40 in apart, read in stored state codes).
    f = check_axle_groups(us, [0.0, 5.0, 5.0 + 36 * INCH],
                          np.array([10000.0, 11000.0, 11000.0]) * LB)
    singles = [i for i in f if i.rule == "single axle"]
    assert [s.axles for s in singles] == [(0,), (1, 2)]
    assert not singles[1].ok
    assert not any(i.rule == "tandem" for i in f)


def test_tridem_gives_overlapping_tandems_and_the_bridge_formula():
    # Three axles 4.5 ft apart: each consecutive pair is a tandem (spread more than 40 in and at
    # most 96 in, 23 CFR 658.5 definition); the 9 ft group falls to the bridge formula
    # (N = 3, L = 9 ft → 42,750 → 42,500 lb, FHWA bridge table from memory).
    us = rule_set("us-interstate")
    x = [0.0, 6.0, 6.0 + 4.5 * FOOT, 6.0 + 9 * FOOT]
    loads = np.array([10000.0, 14500.0, 14500.0, 14500.0]) * LB  # 43,500 lb on the three
    f = check_axle_groups(us, x, loads)
    assert [i.axles for i in f if i.rule == "tandem"] == [(1, 2), (2, 3)]
    tri = [i for i in f if i.axles == (1, 2, 3)][0]
    assert tri.rule == "bridge formula" and tri.detail == "L = 9 ft, N = 3"
    assert_close(tri.limit, 42500 * LB, unit="kg", rtol=1e-14, what="bridge limit")
    assert [(i.rule, i.axles) for i in f if not i.ok] == [("bridge formula", (1, 2, 3))]


def test_check_axle_groups_input_errors():
    us = rule_set("us-interstate")
    with pytest.raises(InputError, match=r"axle_x\[2\] = 4: a position aft of axle 1"):
        check_axle_groups(us, [0.0, 5.0, 4.0], [1.0, 1.0, 1.0])
    with pytest.raises(InputError, match=r"axle_load\[0\] = -1: a load in kg of 0 or more"):
        check_axle_groups(us, [0.0, 5.0], [-1.0, 1.0])
