"""Mass properties against handbook figures, shapely (convex hull) and invariants."""

from __future__ import annotations

import math

import numpy as np
import pytest
import shapely
from hypothesis import given, settings
from hypothesis import strategies as st

from ledger.core.massprops import (
    MassState,
    add_items,
    cg_from_percent_mac,
    mass_properties,
    moment_index,
    percent_mac,
    remove_items,
)
from ledger.errors import MassPropertiesError
from ledger.testing import assert_close

PHAK = "Pilot's Handbook of Aeronautical Knowledge, FAA-H-8083-25, ch. 9"


# --------------------------------------------------------------------------- reference figures
def test_adding_weight_handbook_example():
    # PHAK (FAA-H-8083-25) ch. 9, as quoted in the domain notes: 6,860 lb at 80.0 in plus
    # 140 lb at 150 in gives a CG of 81.4 in (by hand: 569,800 lb·in / 7,000 lb).
    r = mass_properties([6860.0, 140.0], [80.0, 150.0])
    assert_close(r.mass, 7000.0, unit="lb", what="total mass", source=PHAK)
    assert_close(r.moment.x, 569800.0, unit="lb·in", what="moment", source=PHAK)
    assert_close(r.cg.x, 81.4, unit="in", rtol=1e-12, what="CG", source=PHAK)
    assert r.cg.y is None and r.cg.z is None and r.moment.y is None


def test_running_record_add_then_remove_handbook_example():
    # Same PHAK ch. 9 figures, through the running-record helpers.
    s = add_items(6860.0, 6860.0 * 80.0, [140.0], [150.0])
    assert_close(s.mass, 7000.0, unit="lb", what="mass", source=PHAK)
    assert_close(s.cg, 81.4, unit="in", rtol=1e-12, what="CG", source=PHAK)
    back = remove_items(s.mass, s.moment, [140.0], [150.0])
    assert_close(back.mass, 6860.0, unit="lb", what="mass")
    assert_close(back.cg, 80.0, unit="in", rtol=1e-12, what="CG")


def test_moment_index_reduction_factors():
    # Moment index = moment ÷ reduction factor (100, 1,000, 10,000; FAA-H-8083-1). The moment is
    # the PHAK ch. 9 example's 569,800 lb·in.
    for factor, expected in ((100, 5698.0), (1000, 569.8), (10000, 56.98)):
        assert_close(moment_index(569800.0, factor), expected, unit="lb·in/factor", rtol=1e-12,
                     what=f"moment index /{factor}")
    np.testing.assert_allclose(moment_index([1000.0, 2500.0], 1000), [1.0, 2.5], rtol=1e-15)


def test_percent_mac_formula():
    # %MAC = (CG − LEMAC) / MAC × 100 (FAA-H-8083-1, as in the domain notes). Numbers chosen for
    # the test and checked by hand: LEMAC 2.00 m, MAC 1.60 m, CG 2.40 m -> 0.40/1.60 = 25 %.
    assert_close(percent_mac(2.40, 2.00, 1.60), 25.0, unit="%MAC", rtol=1e-12, what="CG")
    assert_close(percent_mac(2.00, 2.00, 1.60), 0.0, unit="%MAC", atol=1e-12, what="LEMAC")
    assert_close(percent_mac(3.60, 2.00, 1.60), 100.0, unit="%MAC", rtol=1e-12, what="TEMAC")
    assert_close(cg_from_percent_mac(25.0, 2.00, 1.60), 2.40, unit="m", rtol=1e-12, what="CG")
    pct = percent_mac(np.array([2.0, 2.4, 2.8]), 2.0, 1.6)
    np.testing.assert_allclose(cg_from_percent_mac(pct, 2.0, 1.6), [2.0, 2.4, 2.8], rtol=1e-14)


# --------------------------------------------------------------------------- shapes
def test_three_axes_by_hand():
    # By hand: Σm = 10; Σm·x = 2·1 + 3·2 + 5·4 = 28; Σm·y = 2·(−1) + 0 + 5·0.4 = 0;
    # Σm·z = 2·0.5 + 3·1 + 0 = 4.
    r = mass_properties([2.0, 3.0, 5.0], [1.0, 2.0, 4.0], y=[-1.0, 0.0, 0.4], z=[0.5, 1.0, 0.0])
    assert_close(r.mass, 10.0, unit="kg", what="mass")
    assert_close(np.array(r.moment), [28.0, 0.0, 4.0], unit="kg·m", atol=1e-12, what="moments")
    assert_close(np.array(r.cg), [2.8, 0.0, 0.4], unit="m", atol=1e-12, what="CG")


def test_many_cases_at_once_match_one_at_a_time():
    rng = np.random.default_rng(11)
    masses = rng.uniform(0.0, 100.0, size=(40, 7))
    x = rng.uniform(-1.0, 5.0, size=7)
    y = rng.uniform(-1.0, 1.0, size=(40, 7))        # per-case lateral arms broadcast too
    r = mass_properties(masses, x, y=y)
    assert r.mass.shape == (40,) and r.cg.x.shape == (40,) and r.cg.y.shape == (40,)
    for i in range(40):
        one = mass_properties(masses[i], x, y=y[i])
        assert_close(r.mass[i], one.mass, unit="kg", rtol=1e-13, what="mass")
        assert_close(r.cg.x[i], one.cg.x, unit="m", rtol=1e-12, what="CG x")
        assert_close(r.cg.y[i], one.cg.y, unit="m", rtol=1e-12, atol=1e-14, what="CG y")
    # Loop in plain Python as an independent check of the first case.
    m0 = masses[0].tolist()
    assert_close(r.cg.x[0], math.fsum(a * b for a, b in zip(m0, x.tolist())) / math.fsum(m0),
                 unit="m", rtol=1e-12, what="CG x")


def test_scalar_is_one_item_and_scalar_arm_broadcasts():
    r = mass_properties(5.0, 2.0)
    assert (r.mass, r.cg.x) == (5.0, 2.0)
    r = mass_properties([1.0, 3.0], 2.5)
    assert_close(r.cg.x, 2.5, unit="m", what="CG")


def test_three_axis_state_cg():
    s = add_items(10.0, [10.0, 0.0, 5.0], [2.0], [[4.0, -1.0, 0.5]])
    assert isinstance(s, MassState)
    assert_close(np.asarray(s.cg), [18.0 / 12, -2.0 / 12, 6.0 / 12], unit="m", rtol=1e-14,
                 what="CG")
    assert math.isnan(MassState(0.0, 0.0).cg)


def test_removing_everything_leaves_zero_mass():
    s = remove_items(3.0, 6.0, [1.0, 2.0], [2.0, 2.0])
    assert s.mass == 0.0 and math.isnan(s.cg)


# --------------------------------------------------------------------------- errors (exact text)
@pytest.mark.parametrize(
    "call, message",
    [
        (lambda: mass_properties([], []), "masses = []: at least one item; the item set is empty"),
        (lambda: mass_properties([1.0, -2.0], [0.0, 1.0]),
         "masses[1] = -2: a finite mass of 0 or more"),
        (lambda: mass_properties([[1.0, 1.0], [1.0, float("nan")]], [0.0, 1.0]),
         "masses[1, 1] = nan: a finite mass of 0 or more"),
        (lambda: mass_properties([float("inf"), 1.0], [0.0, 1.0]),
         "masses[0] = inf: a finite mass of 0 or more"),
        (lambda: mass_properties(["a"], [1.0]),
         "masses = ['a']: numbers (a number or an array of numbers)"),
        (lambda: mass_properties([1.0, 2.0], [0.0, float("nan")]), "x[1] = nan: a finite arm"),
        (lambda: mass_properties([1.0, 2.0], [0.0, 1.0], y=[0.0, float("inf")]),
         "y[1] = inf: a finite arm"),
        (lambda: mass_properties([1.0, 2.0], [0.0, 1.0], z=[[0.0, 0.0], [float("-inf"), 0.0]]),
         "z[1, 0] = -inf: a finite arm"),
        (lambda: mass_properties([1.0, 2.0, 3.0], [1.0, 2.0]),
         "x = an array of shape (2,): one arm per item, broadcastable against masses of "
         "shape (3,)"),
        (lambda: mass_properties([0.0, 0.0], [1.0, 2.0]),
         "sum(masses) = 0: a total mass above 0; a CG needs at least one item with mass"),
        (lambda: mass_properties([[1.0, 0.0], [0.0, 0.0]], [1.0, 2.0]),
         "sum(masses[1, :]) = 0: a total mass above 0; a CG needs at least one item with mass"),
        (lambda: mass_properties([1e308, 1e308], [1.0, 2.0]),
         "sum(masses) = inf: a finite total mass; the masses are too large"),
        (lambda: mass_properties([1e300, 1e300], [1e10, 1e10]),
         "moment about x = inf: a finite moment; masses or arms are too large"),
        (lambda: moment_index(1.0, 0), "reduction = 0: a positive reduction factor such as 100, "
                                      "1000 or 10000"),
        (lambda: percent_mac(2.0, 1.0, 0.0), "mac = 0: a positive MAC length"),
        (lambda: percent_mac(2.0, 1.0, "abc"), "mac = 'abc': a positive MAC length"),
        (lambda: remove_items(40.0, 80.0, [50.0], [2.0]),
         "masses = 50: a total removed of at most the recorded mass 40; removing them would "
         "leave a negative mass"),
        (lambda: add_items(-1.0, 0.0, [1.0], [1.0]), "state_mass = -1: a finite mass of 0 or more"),
        (lambda: add_items(1.0, float("nan"), [1.0], [1.0]), "state_moment = nan: a finite moment"),
        (lambda: add_items(1.0, 1.0, [1.0, -3.0], [1.0, 1.0]),
         "masses[1] = -3: a finite mass of 0 or more"),
        (lambda: add_items(1.0, 1.0, [1.0], [float("nan")]), "arms[0] = nan: a finite arm"),
        (lambda: add_items(1.0, 1.0, [1.0, 2.0], [1.0, 2.0, 3.0]),
         "arms = an array of shape (3,): one arm per item (and per axis) matching masses of "
         "shape (2,)"),
    ],
)
def test_error_messages(call, message):
    with pytest.raises(MassPropertiesError) as info:
        call()
    assert str(info.value) == message
    assert isinstance(info.value, ValueError)


# --------------------------------------------------------------------------- properties
# Rounded to 1e-6 so that shapely's hull is not asked about sub-normal coordinates.
finite_arm = st.floats(-50.0, 50.0, allow_nan=False).map(lambda v: round(v, 6))
item_mass = st.floats(0.0, 1000.0, allow_nan=False)


@st.composite
def loadings(draw, min_items=1, max_items=12):
    n = draw(st.integers(min_items, max_items))
    masses = draw(st.lists(item_mass, min_size=n, max_size=n))
    if sum(masses) < 1e-3:
        masses[0] = 1.0
    xs = draw(st.lists(finite_arm, min_size=n, max_size=n))
    ys = draw(st.lists(finite_arm, min_size=n, max_size=n))
    return np.array(masses), np.array(xs), np.array(ys)


def _cg_tol(m, x):
    # Rounding in Σm·x is at most ~n·eps·Σ|m·x|; relative to the CG that is about this.
    return 1e-12 * (np.abs(x).max() + 1.0) * len(m)


@settings(max_examples=100, deadline=None)
@given(loadings(), st.randoms(use_true_random=False))
def test_item_order_does_not_matter(load, rnd):
    m, x, y = load
    order = list(range(len(m)))
    rnd.shuffle(order)
    a = mass_properties(m, x, y=y)
    b = mass_properties(m[order], x[order], y=y[order])
    assert_close(b.mass, a.mass, unit="kg", rtol=1e-12, what="mass")
    assert_close(b.cg.x, a.cg.x, unit="m", atol=_cg_tol(m, x), what="CG x")
    assert_close(b.cg.y, a.cg.y, unit="m", atol=_cg_tol(m, y), what="CG y")


@settings(max_examples=100, deadline=None)
@given(loadings(), finite_arm, finite_arm, st.integers(0, 12))
def test_zero_mass_item_changes_nothing(load, x0, y0, where):
    m, x, y = load
    k = min(where, len(m))
    a = mass_properties(m, x, y=y)
    b = mass_properties(np.insert(m, k, 0.0), np.insert(x, k, x0), y=np.insert(y, k, y0))
    assert_close(b.mass, a.mass, unit="kg", rtol=1e-12, what="mass")
    assert_close(b.cg.x, a.cg.x, unit="m", atol=_cg_tol(m, x), what="CG x")
    assert_close(b.cg.y, a.cg.y, unit="m", atol=_cg_tol(m, y), what="CG y")


@settings(max_examples=100, deadline=None)
@given(loadings(), st.floats(-100.0, 100.0, allow_nan=False))
def test_moving_every_item_moves_the_cg(load, d):
    m, x, y = load
    a = mass_properties(m, x)
    b = mass_properties(m, x + d)
    assert_close(b.cg.x, a.cg.x + d, unit="m", atol=_cg_tol(m, x + d) + 1e-12 * abs(d),
                 what="CG x")


@settings(max_examples=100, deadline=None)
@given(loadings(), item_mass)
def test_adding_an_item_at_the_cg_keeps_the_cg(load, extra):
    m, x, y = load
    a = mass_properties(m, x, y=y)
    b = mass_properties(np.append(m, extra), np.append(x, a.cg.x), y=np.append(y, a.cg.y))
    assert_close(b.cg.x, a.cg.x, unit="m", atol=_cg_tol(m, x), what="CG x")
    assert_close(b.cg.y, a.cg.y, unit="m", atol=_cg_tol(m, y), what="CG y")
    s = add_items(a.mass, [a.moment.x, a.moment.y], [extra], [[a.cg.x, a.cg.y]])
    assert_close(np.asarray(s.cg), [a.cg.x, a.cg.y], unit="m",
                 atol=_cg_tol(m, np.abs(x) + np.abs(y)), what="CG (running record)")


@settings(max_examples=100, deadline=None)
@given(loadings(min_items=1))
def test_cg_lies_in_the_convex_hull_of_the_items(load):
    # Oracle: shapely's convex hull of the item positions (a point, a segment or a polygon).
    m, x, y = load
    r = mass_properties(m, x, y=y)
    hull = shapely.MultiPoint(np.column_stack([x, y])).convex_hull
    bound = 1e-9 * (np.abs([x, y]).max() + 1)
    assert shapely.distance(hull, shapely.Point(r.cg.x, r.cg.y)) <= bound


@settings(max_examples=60, deadline=None)
@given(loadings(min_items=2), st.integers(1, 11))
def test_add_then_remove_returns_the_state(load, split):
    m, x, y = load
    k = min(split, len(m) - 1)
    base = mass_properties(m[:k] + 1.0, x[:k])
    s = add_items(base.mass, base.moment.x, m[k:], x[k:])
    full = mass_properties(np.concatenate([m[:k] + 1.0, m[k:]]), x)
    assert_close(s.mass, full.mass, unit="kg", rtol=1e-12, what="mass")
    assert_close(s.cg, full.cg.x, unit="m", atol=_cg_tol(m, x), what="CG")
    back = remove_items(s.mass, s.moment, m[k:], x[k:])
    assert_close(back.mass, base.mass, unit="kg", rtol=1e-9, atol=1e-9, what="mass")
    assert_close(back.moment, base.moment.x, unit="kg·m", rtol=1e-9,
                 atol=1e-9 * float(np.abs(m * x).sum() + 1), what="moment")
