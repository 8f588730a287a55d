"""The prepared sweep kernel and loading-case sweeps, against shapely (inclusive containment) as
the reference library and against the exact, unprepared ``assess`` and ``mass_properties``.

Envelopes and loadings here are invented test shapes (not a real type; not for operation).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import shapely
from hypothesis import given, settings
from hypothesis import strategies as st

from ledger.core import envelope
from ledger.core._jit import kernels
from ledger.core.envelope import assess, covers, prepare_sweep
from ledger.core.massprops import mass_properties
from ledger.core.sweep import sweep_cases
from ledger.errors import EnvelopeError, InputError, MassPropertiesError

# Invented arm–mass envelope (mm, kg) with a notch in the aft limit; integer vertices, so points
# exactly on every edge are representable.
NOTCHED_MM = np.array([
    (2050.0, 550.0), (2550.0, 550.0), (2550.0, 900.0), (2450.0, 1000.0),
    (2580.0, 1100.0), (2300.0, 1100.0), (2150.0, 950.0), (2050.0, 800.0),
])
# A notch from the top: between masses 1 and 3 a horizontal line crosses the boundary four
# times (two intervals in limits).
VNOTCH = np.array([(0.0, 0.0), (4.0, 0.0), (4.0, 3.0), (3.0, 3.0), (2.0, 1.0), (1.0, 3.0),
                   (0.0, 3.0)])
# Steps: horizontal edges at intermediate masses (2 and 4), not only at the top and bottom.
STEPS = np.array([(0.0, 0.0), (6.0, 0.0), (6.0, 2.0), (5.0, 2.0), (5.0, 4.0), (3.0, 4.0),
                  (3.0, 6.0), (1.0, 6.0), (1.0, 4.0), (0.0, 4.0)])
# A comb: three intervals at mid mass, with its teeth's tips on one level.
COMB = np.array([(0.0, 0.0), (7.0, 0.0), (7.0, 4.0), (6.0, 4.0), (5.5, 1.0), (5.0, 4.0),
                 (4.0, 4.0), (3.5, 1.0), (3.0, 4.0), (2.0, 4.0), (1.5, 1.0), (1.0, 4.0),
                 (0.0, 4.0)])
SHAPES = {"notched_mm": NOTCHED_MM, "vnotch": VNOTCH, "steps": STEPS, "comb": COMB}


@pytest.fixture(autouse=True, params=["compiled", "numpy"])
def kernel(request, monkeypatch):
    """Every test here runs on the compiled kernels (numba, installed by ``make test``) and on
    the numpy kernels, which must give the same results."""
    monkeypatch.setenv("WBLEDGER_JIT", "1" if request.param == "compiled" else "0")
    kernels.cache_clear()
    assert (kernels() is not None) == (request.param == "compiled")
    yield request.param
    kernels.cache_clear()


def _boundary_points(P: np.ndarray, per_edge: int) -> np.ndarray:
    """Vertices and points exactly on each edge (integer multiples of the reduced direction)."""
    pts = [P]
    n = len(P)
    for k in range(n):
        a, b = P[k], P[(k + 1) % n]
        d = b - a
        scale = 2.0                      # half-integer steps are exact for these shapes too
        g = math.gcd(int(abs(d[0]) * scale), int(abs(d[1]) * scale))
        idx = np.linspace(0, g, min(per_edge, g + 1)).round()
        pts.append(a + idx[:, None] * (d / g))
    return np.concatenate(pts)


def _sample(P: np.ndarray, rng, n: int = 20_000):
    """Random points over the bounding box and a margin, points on edges and vertices, and
    points exactly at every vertex mass level (across the whole width)."""
    lo, hi = P.min(axis=0), P.max(axis=0)
    pad = 0.15 * (hi - lo)
    x = rng.uniform(lo[0] - pad[0], hi[0] + pad[0], n)
    y = rng.uniform(lo[1] - pad[1], hi[1] + pad[1], n)
    b = _boundary_points(P, 60)
    levels = np.unique(P[:, 1])
    lx = rng.uniform(lo[0] - pad[0], hi[0] + pad[0], 200 * len(levels))
    ly = np.repeat(levels, 200)
    # The vertex x values at every level too (vertices of other levels projected across).
    gx, gy = np.meshgrid(np.unique(P[:, 0]), levels)
    return (np.concatenate([x, b[:, 0], lx, gx.ravel()]),
            np.concatenate([y, b[:, 1], ly, gy.ravel()]), len(b))


def _exact(P, x, y, tol=None):
    """The unprepared scan's verdicts and margins, whatever the number of points (from
    65,536 points on, ``assess`` itself goes through the prepared table)."""
    return envelope.scan_points(envelope.prepare_envelope(P, tol), np.asarray(x, dtype=float),
                                np.asarray(y, dtype=float), want_margin=True)


def _same_margins(a, b):
    a, b = np.asarray(a), np.asarray(b)
    fa, fb = np.isfinite(a), np.isfinite(b)
    np.testing.assert_array_equal(fa, fb)
    np.testing.assert_array_equal(a[~fa], b[~fb])              # ±inf on both sides
    np.testing.assert_allclose(a[fa], b[fb], rtol=0, atol=1e-9)


# --------------------------------------------------------------------------- prepared envelope
@pytest.mark.parametrize("name", sorted(SHAPES))
def test_prepared_verdicts_match_shapely_and_margins_match_assess(name):
    P = SHAPES[name]
    x, y, nb = _sample(P, np.random.default_rng(7))
    r = prepare_sweep(P).assess(x, y)
    # Reference: shapely.intersects_xy is inclusive (a boundary point intersects the polygon);
    # no sampled point lies within the default tolerance (1e-9 of the box) without being on it.
    ref = shapely.intersects_xy(shapely.Polygon(P), x, y)
    np.testing.assert_array_equal(r.inside, ref)
    assert r.inside[20_000:20_000 + nb].all()       # points on edges and vertices
    exact = assess(P, x, y)
    np.testing.assert_array_equal(r.inside, exact.inside)
    np.testing.assert_array_equal(r.margin, exact.margin)     # bit for bit


@pytest.mark.filterwarnings("ignore::RuntimeWarning")
@pytest.mark.parametrize("name", sorted(SHAPES))
def test_covers_and_assess_of_many_points_match_the_scan_and_shapely(name):
    # From envelope.TABLE_MIN_POINTS points on, covers and assess use the prepared table (with the
    # compiled kernel, on the cores this process may use): the same verdicts and margins as
    # the scan, boundary and non-finite points included. On the numpy kernels they keep to
    # the scan, and this test checks the scan against shapely.
    P = SHAPES[name]
    x, y, nb = _sample(P, np.random.default_rng(23), n=envelope.TABLE_MIN_POINTS)
    odd_x = [np.nan, 1.0, np.inf, -np.inf, 1.0, 1.0, 1e300]
    odd_y = [1.0, np.nan, 1.0, 1.0, np.inf, -np.inf, 1.0]
    x, y = np.concatenate([x, odd_x]), np.concatenate([y, odd_y])
    inside = covers(P, x, y)
    r = assess(P, x, y)
    exact_inside, exact_margin = _exact(P, x, y)
    np.testing.assert_array_equal(inside, exact_inside)
    np.testing.assert_array_equal(r.inside, exact_inside)
    # The margins bit for bit (NaN and ±inf alike): a result must not depend on how many
    # points were given.
    np.testing.assert_array_equal(r.margin, exact_margin)
    np.testing.assert_array_equal(assess(P, x[:1000], y[:1000]).margin, r.margin[:1000])
    # shapely.intersects_xy is inclusive (boundary points intersect); it covers no
    # non-finite point either.
    np.testing.assert_array_equal(inside, shapely.intersects_xy(shapely.Polygon(P), x, y))
    n0 = envelope.TABLE_MIN_POINTS
    assert inside[n0:n0 + nb].all() and not inside[-7:].any()
    # The other way in: one (n, 2) array of points.
    np.testing.assert_array_equal(covers(P, np.column_stack([x, y])), exact_inside)


@pytest.mark.parametrize("tol", [0.0, 1e-6, 0.05])
def test_prepared_matches_assess_for_any_tolerance(tol):
    rng = np.random.default_rng(11)
    for P in SHAPES.values():
        x, y, _ = _sample(P, rng, 5_000)
        # Points just off the boundary, inside and outside the slack.
        b = _boundary_points(P, 20)
        jitter = rng.choice([-2, -1, -0.5, 0.5, 1, 2], size=b.shape) * max(tol, 1e-12)
        x = np.concatenate([x, b[:, 0] + jitter[:, 0]])
        y = np.concatenate([y, b[:, 1] + jitter[:, 1]])
        r = prepare_sweep(P, tol=tol).assess(x, y)
        exact = assess(P, x, y, tol=tol)
        np.testing.assert_array_equal(r.inside, exact.inside)
        np.testing.assert_array_equal(r.margin, exact.margin)     # bit for bit


def test_prepared_hand_worked_points():
    # Hand-worked on VNOTCH: at mass 2 the line crosses x = 0, 1.5, 2.5 and 4.
    env = prepare_sweep(VNOTCH)
    r = env.assess([1.0, 2.0, 3.0, 4.0, 4.5, 2.0, 1.0], [2.0, 2.0, 2.0, 3.0, 2.0, 0.5, 5.0])
    assert r.inside.tolist() == [True, False, True, True, False, True, False]
    assert [round(v, 12) for v in r.margin.tolist()] == [0.5, -0.5, 0.5, 0.0, -0.5, 2.0, -math.inf]
    # Scalars in, scalars out, as assess.
    one = env.assess(3.5, 1.0)
    assert one == assess(VNOTCH, 3.5, 1.0)
    assert isinstance(one.inside, bool) and isinstance(one.margin, float)


# The exact scan (shared with assess) warns on NaN and infinite coordinates; the results matter.
@pytest.mark.filterwarnings("ignore::RuntimeWarning")
def test_prepared_odd_inputs_match_assess():
    x = np.array([np.nan, 1.0, np.inf, -np.inf, 1.0, 1.0, 1e300, 2.0])
    y = np.array([1.0, np.nan, 1.0, 1.0, np.inf, -np.inf, 1.0, -1e300])
    for P in SHAPES.values():
        r = prepare_sweep(P).assess(x, y)
        exact = assess(P, x, y)
        np.testing.assert_array_equal(r.inside, exact.inside)
        np.testing.assert_array_equal(r.margin, exact.margin)    # NaN and ±inf included
    empty = prepare_sweep(VNOTCH).assess([], [])
    assert empty.inside.shape == (0,) and empty.margin.shape == (0,)


def test_prepare_sweep_bad_input():
    with pytest.raises(EnvelopeError, match="a simple polygon"):
        prepare_sweep([[0, 0], [1, 1], [1, 0], [0, 1]])
    with pytest.raises(InputError) as err:
        prepare_sweep(VNOTCH, tol=-1)
    assert str(err.value) == "tol = -1: a finite tolerance of 0 or more (in the polygon's units)"


@settings(max_examples=60, deadline=None)
@given(st.integers(0, 10_000), st.integers(3, 11), st.sampled_from([None, 8]))
def test_prepared_property_random_polygons(seed, n, snap):
    """Random simple (star-shaped, often non-convex) polygons, optionally with vertices on an
    1/8 grid (shared mass levels, horizontal edges): same verdicts as shapely, same margins as
    assess."""
    rng = np.random.default_rng(seed)
    ang = np.sort(rng.uniform(0.0, 2 * np.pi, n))
    rad = rng.uniform(0.3, 1.0, n)
    P = np.column_stack([rad * np.cos(ang), rad * np.sin(ang)])
    if snap:
        P = np.round(P * snap) / snap
    poly = shapely.Polygon(P)
    if not poly.is_valid or len(np.unique(P, axis=0)) != len(P) or poly.area == 0:
        return
    x = rng.uniform(-1.2, 1.2, 3000)
    y = rng.uniform(-1.2, 1.2, 3000)
    # Vertices, edge midpoints and points at every vertex level.
    mid = 0.5 * (P + np.roll(P, -1, axis=0))
    ly = np.repeat(np.unique(P[:, 1]), 50)
    x = np.concatenate([x, P[:, 0], mid[:, 0], rng.uniform(-1.2, 1.2, ly.size)])
    y = np.concatenate([y, P[:, 1], mid[:, 1], ly])
    r = prepare_sweep(P).assess(x, y)
    exact = assess(P, x, y)
    np.testing.assert_array_equal(r.inside, exact.inside)
    np.testing.assert_array_equal(r.margin, exact.margin)     # bit for bit
    # Reference: shapely.intersects_xy (inclusive) on the random points and the vertices (edge
    # midpoints are rounded, so they are compared with assess only).
    k = 3000 + len(P)
    np.testing.assert_array_equal(r.inside[:k], shapely.intersects_xy(poly, x[:k], y[:k]))


# --------------------------------------------------------------------------- sweeps
ARMS_MM = np.array([2230.0, 2050.0, 2050.0, 2900.0, 2900.0, 3550.0])


def _cases(rng, n):
    lo = np.array([560.0, 60.0, 0.0, 0.0, 0.0, 0.0])
    hi = np.array([560.0, 110.0, 300.0, 200.0, 200.0, 150.0])
    return rng.uniform(lo, hi, size=(n, len(lo)))


def test_sweep_hand_worked_cg():
    # Pilot's Handbook of Aeronautical Knowledge (FAA-H-8083-25) ch. 9 example as quoted in the
    # mass_properties docstring (not re-read from the handbook): 6,860 lb at 80.0 in and 140 lb
    # at 150 in give 7,000 lb at 81.4 in. The envelope is an invented box around it.
    env = [[78.0, 6000.0], [84.0, 6000.0], [84.0, 7500.0], [78.0, 7500.0]]
    r = sweep_cases([[6860.0, 140.0], [6860.0, 0.0]], [80.0, 150.0], env)
    assert r.mass.tolist() == [7000.0, 6860.0]
    assert round(float(r.cg[0]), 9) == 81.4 and r.cg[1] == 80.0
    assert r.inside.tolist() == [True, True]
    assert [round(v, 9) for v in r.margin.tolist()] == [2.6, 2.0]


@pytest.mark.parametrize("threads", [None, 1, 2])
def test_sweep_matches_mass_properties_and_assess(threads):
    rng = np.random.default_rng(5)
    m = _cases(rng, 70_001)                  # several chunks and a ragged last one
    r = sweep_cases(m, ARMS_MM, NOTCHED_MM, threads=threads)
    mp = mass_properties(m, ARMS_MM)
    exact_inside, exact_margin = _exact(NOTCHED_MM, mp.cg.x, mp.mass)
    # Sums of non-negative terms in another order: within (n - 1)·u of each other, u = eps/2
    # (Higham, Accuracy and Stability of Numerical Algorithms, §4.2; from memory); the CG adds
    # one division's rounding.
    bound = len(ARMS_MM) * np.finfo(float).eps
    np.testing.assert_allclose(r.mass, mp.mass, rtol=bound)
    np.testing.assert_allclose(r.cg, mp.cg.x, rtol=2 * bound)
    np.testing.assert_array_equal(r.inside, exact_inside)
    _same_margins(r.margin, exact_margin)
    # And shapely as the reference for the verdicts.
    np.testing.assert_array_equal(
        r.inside, shapely.intersects_xy(shapely.Polygon(NOTCHED_MM), r.cg, r.mass))
    assert 0 < r.inside.sum() < len(m)       # the sample has cases on both sides


def test_sweep_cases_on_the_boundary_are_in_limits():
    # Two items at 2000 and 3000 mm loaded so that the CG lands on each edge point and vertex
    # (to rounding, far below the default tolerance of 1e-9 of the envelope's box).
    b = _boundary_points(NOTCHED_MM, 30)
    x, y = b[:, 0], b[:, 1]
    aft = y * (x - 2000.0) / 1000.0
    m = np.column_stack([y - aft, aft])
    r = sweep_cases(m, [2000.0, 3000.0], NOTCHED_MM)
    np.testing.assert_allclose(r.cg, x, rtol=1e-13)
    assert r.inside.all()
    exact = assess(NOTCHED_MM, r.cg, r.mass)
    np.testing.assert_array_equal(r.inside, exact.inside)
    _same_margins(r.margin, exact.margin)
    # Arms given per case (shape (cases, items)) take the general path, with the same results.
    per_case = sweep_cases(m, np.broadcast_to([2000.0, 3000.0], m.shape), NOTCHED_MM)
    np.testing.assert_array_equal(per_case.inside, r.inside)
    _same_margins(per_case.margin, r.margin)


def test_sweep_shapes():
    rng = np.random.default_rng(3)
    m = _cases(rng, 24).reshape(2, 3, 4, 6)
    r = sweep_cases(m, ARMS_MM, NOTCHED_MM)
    assert r.mass.shape == r.cg.shape == r.inside.shape == r.margin.shape == (2, 3, 4)
    flat = sweep_cases(m.reshape(-1, 6), ARMS_MM, NOTCHED_MM)
    np.testing.assert_array_equal(r.margin.ravel(), flat.margin)
    none = sweep_cases(np.empty((0, 6)), ARMS_MM, NOTCHED_MM)
    assert none.mass.shape == (0,)


@pytest.mark.parametrize("bad, where",
                         [(-1.0, (40_000, 2)), (np.nan, (3, 1)), (np.inf, (9_000, 4))])
def test_sweep_bad_mass_same_error_as_mass_properties(bad, where):
    m = _cases(np.random.default_rng(1), 50_000)
    m[where] = bad
    with pytest.raises(MassPropertiesError) as ref:
        mass_properties(m, ARMS_MM)
    with pytest.raises(MassPropertiesError) as err:
        sweep_cases(m, ARMS_MM, NOTCHED_MM)
    assert str(err.value) == str(ref.value)


def test_sweep_zero_total_and_bad_arms():
    m = _cases(np.random.default_rng(2), 100)
    m[17] = 0.0
    with pytest.raises(MassPropertiesError) as err:
        sweep_cases(m, ARMS_MM, NOTCHED_MM)
    assert str(err.value).startswith("sum(masses[17, :]) = 0")
    arms = ARMS_MM.copy()
    arms[3] = np.inf
    with pytest.raises(MassPropertiesError) as err:
        sweep_cases(_cases(np.random.default_rng(2), 10), arms, NOTCHED_MM)
    assert str(err.value).startswith("x[3] = inf")
    with pytest.raises(MassPropertiesError):
        sweep_cases(_cases(np.random.default_rng(2), 10), ARMS_MM[:4], NOTCHED_MM)
    with pytest.raises(InputError) as err:
        sweep_cases(m[:5] + 1, ARMS_MM, NOTCHED_MM, threads=0)
    assert str(err.value) == "threads = 0: a whole number of threads, 1 or more"


def test_compiled_and_numpy_kernels_agree(monkeypatch):
    """The two kernels side by side on the same cases: identical verdicts and points left to
    the exact scan, margins and CGs equal to rounding, the same errors."""
    rng = np.random.default_rng(11)
    m = _cases(rng, 100_003)
    m[::997, 2] = 0.0                               # some empty seats
    x, y, _ = _sample(VNOTCH, rng)
    results = {}
    for flag in ("1", "0"):
        monkeypatch.setenv("WBLEDGER_JIT", flag)
        kernels.cache_clear()
        assert (kernels() is None) == (flag == "0")
        results[flag] = (sweep_cases(m, ARMS_MM, NOTCHED_MM), prepare_sweep(VNOTCH).assess(x, y))
    (c, ca), (n, na) = results["1"], results["0"]
    np.testing.assert_array_equal(c.inside, n.inside)
    bound = len(ARMS_MM) * np.finfo(float).eps
    np.testing.assert_allclose(c.mass, n.mass, rtol=bound)
    np.testing.assert_allclose(c.cg, n.cg, rtol=2 * bound)
    _same_margins(c.margin, n.margin)
    np.testing.assert_array_equal(ca.inside, na.inside)
    np.testing.assert_array_equal(ca.margin, na.margin)     # bit for bit


@pytest.mark.parametrize("x, y", [(np.nan, 800.0), (2300.0, np.nan), (np.inf, 800.0),
                                  (2300.0, -np.inf), (2300.0, np.inf), (2300.0, 1e300)])
def test_prepared_non_finite_and_huge_points(x, y):
    # Non-finite points are not covered (as covers); a huge mass is outside every band. Both
    # kernels must stay inside their tables for such input.
    r = prepare_sweep(NOTCHED_MM).assess([x, 2300.0], [y, 800.0])
    exact = assess(NOTCHED_MM, [x, 2300.0], [y, 800.0])
    assert r.inside.tolist() == exact.inside.tolist() == [False, True]
    np.testing.assert_array_equal(r.margin, exact.margin)     # bit for bit
