"""Envelope polygons against shapely as the reference library (containment, validity, distance,
sections), plus hand-worked boundary and path cases."""

from __future__ import annotations

import math

import numpy as np
import pytest
import shapely
from hypothesis import given, settings
from hypothesis import strategies as st

from ledger.core.envelope import (
    assess,
    covers,
    default_tolerance,
    margins,
    path_inside,
    validate_polygon,
)
from ledger.errors import EnvelopeError, InputError
from ledger.testing import assert_close

# An invented arm–mass envelope (m, kg) with a notch in the aft limit: not convex.
NOTCHED = np.array([
    (2.05, 550.0), (2.55, 550.0), (2.55, 900.0), (2.45, 1000.0),
    (2.58, 1100.0), (2.30, 1100.0), (2.15, 950.0), (2.05, 800.0),
])
# A notch from the top, in round numbers for hand-worked cases.
VNOTCH = np.array([(0.0, 0.0), (4.0, 0.0), (4.0, 3.0), (3.0, 3.0), (2.0, 1.0), (1.0, 3.0),
                   (0.0, 3.0)])


def _star(rng, n, snap=None):
    """A random simple (star-shaped) polygon, often non-convex; optionally snapped to a grid."""
    ang = np.sort(rng.uniform(0.0, 2 * np.pi, n))
    r = rng.uniform(0.3, 1.0, n)
    P = np.column_stack([r * np.cos(ang), r * np.sin(ang)])
    if snap:
        P = np.round(P * snap) / snap
    return P


def _star_polygons(seed, count):
    rng = np.random.default_rng(seed)
    out = []
    while len(out) < count:
        P = _star(rng, int(rng.integers(3, 12)), snap=8 if len(out) % 2 else None)
        if shapely.Polygon(P).is_valid and len(np.unique(P, axis=0)) == len(P):
            out.append(P)
    return out


# --------------------------------------------------------------------------- validate_polygon
def test_orientation_and_closing_point():
    ccw = [[0, 0], [2, 0], [2, 1], [0, 1]]
    np.testing.assert_array_equal(validate_polygon(ccw + [[0, 0]]), np.array(ccw, dtype=float))
    np.testing.assert_array_equal(validate_polygon(ccw[::-1]), np.array(ccw[::-1], dtype=float))
    assert validate_polygon(NOTCHED).shape == (8, 2)


@pytest.mark.parametrize(
    "points, message",
    [
        ([[1, 2, 3]], "envelope = [[1, 2, 3]]: a list of [x, y] points (at least 3); got an array "
                      "of shape (1, 3)"),
        ([["a", 1]], "envelope = [['a', 1]]: a list of [x, y] points (at least 3)"),
        ([[0, 0], [1, float("nan")], [1, 1]],
         "envelope[1] = (1, nan): a point with finite coordinates (no NaN or infinity)"),
        ([[0, 0], [1, 1], [0, 0]],
         "envelope = [(0, 0), (1, 1), (0, 0)]: at least 3 distinct points; got 2 (a closing point "
         "equal to the first is not counted)"),
        ([[0, 0], [1, 0], [1, 1], [1, 0], [0, 1]],
         "envelope[3] = (1, 0): a point different from envelope[1]; a vertex may appear only once "
         "(only a closing point may repeat the first)"),
        ([[0, 0], [1, 1], [2, 2]],
         "envelope = [(0, 0), (1, 1), (2, 2)]: points that enclose an area; these all lie on one "
         "line"),
        ([[0, 5], [1, 5], [3, 5]],
         "envelope = [(0, 5), (1, 5), (3, 5)]: points that enclose an area; these all lie on one "
         "line"),
        ([[0, 0], [1, 1], [1, 0], [0, 1]],
         "envelope = [(0, 0), (1, 1), (1, 0), (0, 1)]: a simple polygon; edge 0 (0, 0)-(1, 1) and "
         "edge 2 (1, 0)-(0, 1) cross at (0.5, 0.5). List the points in order round the boundary"),
        ([[0, 0], [4, 0], [4, 4], [3, 4], [2, 0], [1, 4], [0, 4]],
         "envelope = [(0, 0), (4, 0), (4, 4), (3, 4), (2, 0), (1, 4), (0, 4)]: a simple polygon; "
         "edge 0 (0, 0)-(4, 0) and edge 3 (3, 4)-(2, 0) touch at (2, 0). List the points in order "
         "round the boundary"),
        ([[0, 0], [2, 0], [1, 0], [1, 1]],
         "envelope = [(0, 0), (2, 0), (1, 0), (1, 1)]: a simple polygon; edge 0 (0, 0)-(2, 0) and "
         "edge 1 (2, 0)-(1, 0) overlap (the boundary folds back at (2, 0)). List the points in "
         "order round the boundary"),
        ([[0, 0], [2, 0], [2, 1], [4, 1], [3, 0], [1, 0], [1, -1], [0, -1]],
         "envelope = [(0, 0), (2, 0), (2, 1), (4, 1), (3, 0), (1, 0), (1, -1), (0, -1)]: a simple "
         "polygon; edge 0 (0, 0)-(2, 0) and edge 4 (3, 0)-(1, 0) overlap. List the points in order "
         "round the boundary"),
    ],
)
def test_validation_errors(points, message):
    with pytest.raises(EnvelopeError) as info:
        validate_polygon(points)
    assert str(info.value) == message
    # The invalid rings are invalid for shapely too (reference library), where it can build them.
    try:
        coords = np.asarray(points, dtype=float)
        if not np.isfinite(coords).all():
            return
        ring = shapely.Polygon(coords)
    except (ValueError, TypeError, shapely.errors.GEOSException):
        return
    if len(np.unique(np.asarray(points, dtype=float), axis=0)) == len(points):
        assert not (ring.is_valid and ring.area > 0)


def test_field_name_is_used_in_the_message():
    with pytest.raises(EnvelopeError) as info:
        validate_polygon([[0, 0], [1, 1]], field="envelopes.normal.points")
    assert str(info.value) == ("envelopes.normal.points = [(0, 0), (1, 1)]: at least 3 distinct "
                               "points; got 2 (a closing point equal to the first is not counted)")
    assert info.value.field == "envelopes.normal.points"


def test_validity_agrees_with_shapely_on_random_rings():
    # Reference: shapely.is_valid (GEOS) on random rings of 3-8 points, many self-crossing and,
    # on the integer grid, many touching or overlapping. shapely accepts repeated points, which
    # validate_polygon rejects by design, so those rings are skipped.
    rng = np.random.default_rng(7)
    seen = {True: 0, False: 0}
    for trial in range(1500):
        n = int(rng.integers(3, 9))
        P = rng.integers(0, 5, (n, 2)).astype(float) if trial % 2 else rng.random((n, 2))
        if len(np.unique(P, axis=0)) < n:
            continue
        poly = shapely.Polygon(P)
        expected = bool(poly.is_valid and poly.area > 0)
        try:
            validate_polygon(P)
            ours = True
        except EnvelopeError:
            ours = False
        assert ours == expected, P.tolist()
        seen[ours] += 1
    assert seen[True] > 200 and seen[False] > 200


# --------------------------------------------------------------------------- covers
def test_covers_matches_shapely_on_random_and_boundary_points():
    # Reference: shapely.intersects_xy, which is inclusive (boundary points intersect).
    rng = np.random.default_rng(3)
    for P in _star_polygons(3, 60) + [NOTCHED, VNOTCH]:
        poly = shapely.Polygon(P)
        lo, hi = P.min(axis=0), P.max(axis=0)
        span = hi - lo
        x = rng.uniform(lo[0] - 0.1 * span[0], hi[0] + 0.1 * span[0], 4000)
        y = rng.uniform(lo[1] - 0.1 * span[1], hi[1] + 0.1 * span[1], 4000)
        n = len(P)
        Q = np.roll(P, -1, axis=0)
        x[:n], y[:n] = P[:, 0], P[:, 1]                                   # vertices
        x[n:2 * n], y[n:2 * n] = (P[:, 0] + Q[:, 0]) / 2, (P[:, 1] + Q[:, 1]) / 2  # edge midpoints
        ours = covers(P, x, y)
        ref = shapely.intersects_xy(poly, x, y)
        differ = np.flatnonzero(ours != ref)
        if differ.size:
            # Only points within the stated tolerance of the boundary may differ (shapely is
            # exact; edge midpoints are rounded to the nearest float).
            d = shapely.distance(poly.boundary, shapely.points(x[differ], y[differ]))
            assert np.all(d <= default_tolerance(P)), (P.tolist(), differ[:5], d[:5])
        assert ours[:n].all(), "every vertex is in limits"


def test_points_exactly_on_edges_and_vertices_are_in_limits():
    # Points exactly representable on edges: axis-aligned edges and the 45° slope of the notch.
    env = VNOTCH
    px = [0.0, 4.0, 2.0, 1.5, 2.5, 0.0, 4.0, 3.5, 2.0, 1.25]
    py = [0.0, 3.0, 0.0, 2.0, 2.0, 1.7, 0.25, 3.0, 1.0, 2.5]
    assert covers(env, px, py).all()
    assert shapely.intersects_xy(shapely.Polygon(env), px, py).all()   # reference agrees
    # A hair outside (1e-7 of the polygon's size, well above the 3e-9 default tolerance) is out.
    hair = 1e-7 * 3.0
    qx = [-hair, 4.0 + hair, 2.0, 1.5 + hair, 2.5 - hair, 2.0, 3.5]
    qy = [1.0, 1.0, -hair, 2.0, 2.0, 1.0 + hair, 3.0 + hair]
    assert not covers(env, qx, qy).any()
    assert not shapely.intersects_xy(shapely.Polygon(env), qx, qy).any()


def test_cg_on_envelope_edge_and_vertex_arm_mass():
    env = NOTCHED
    # On the vertical aft limit, on the horizontal max-mass edge, at the reflex vertex.
    assert covers(env, 2.55, 700.0) and covers(env, 2.40, 1100.0) and covers(env, 2.45, 1000.0)
    assert not covers(env, 2.55 + 1e-6, 700.0)
    assert not covers(env, 2.40, 1100.0 + 1e-3)
    assert not covers(env, 2.45 + 1e-6, 1000.0)


def test_tolerance_is_absolute_in_polygon_units():
    tri = [[0.0, 0.0], [1.0, 0.0], [0.0, 1.0]]
    assert default_tolerance(tri) == 1e-9
    assert covers(tri, 0.5, -5e-10)              # within the default 1e-9
    assert not covers(tri, 0.5, -5e-10, tol=0)
    assert covers(tri, 0.5, -0.01, tol=0.02)
    assert not covers(tri, 0.5, -0.03, tol=0.02)
    assert covers(tri, 1.0 + 0.015, 0.0, tol=0.02)   # near a vertex: Euclidean distance


def test_shapes_scalars_and_non_finite_points():
    env = NOTCHED
    assert covers(env, 2.3, 800.0) is True
    pts = np.array([[[2.3, 800.0], [3.0, 800.0]], [[2.3, 2000.0], [2.1, 600.0]]])
    np.testing.assert_array_equal(covers(env, pts), [[True, False], [False, True]])
    np.testing.assert_array_equal(covers(env, [2.3, 2.2], 800.0), [True, True])
    np.testing.assert_array_equal(covers(env, [np.nan, np.inf, 2.3], [800.0, 800.0, np.nan]),
                                  [False, False, False])


def test_covers_many_points_in_chunks_matches_shapely():
    # More points than one scan chunk, so chunk edges are exercised.
    rng = np.random.default_rng(5)
    x = rng.uniform(2.0, 2.65, 100_003)
    y = rng.uniform(500.0, 1150.0, 100_003)
    np.testing.assert_array_equal(covers(NOTCHED, x, y),
                                  shapely.intersects_xy(shapely.Polygon(NOTCHED), x, y))


@pytest.mark.parametrize(
    "call, message",
    [
        (lambda: covers([[0, 0], [1, 0], [0, 1]], 0.1, 0.1, tol=-1.0),
         "tol = -1: a finite tolerance of 0 or more (in the polygon's units)"),
        (lambda: covers([[0, 0], [1, 0], [0, 1]], 0.1, 0.1, tol="x"),
         "tol = 'x': a finite tolerance of 0 or more (in the polygon's units)"),
        (lambda: covers([[0, 0], [1, 0], [0, 1]], [[1, 2, 3]]),
         "px = [[1, 2, 3]]: an array of (x, y) points with last axis of length 2"),
        (lambda: covers([[0, 0], [1, 0], [0, 1]], [1, 2], [1, 2, 3]),
         "px, py = [1, 2]: numbers or arrays of numbers of matching shapes"),
        (lambda: margins([[0, 0], [1, 0], [0, 1]], 0.1, 0.1, scale=(1, 0)),
         "scale = (1, 0): two positive numbers (x divisor, y divisor)"),
        (lambda: path_inside([[0, 0], [1, 0], [0, 1]], [], []), "path = []: at least one point"),
        (lambda: path_inside([[0, 0], [1, 0], [0, 1]], [0.1, np.nan], [0.1, 0.1]),
         "path[1] = (nan, 0.1): a point with finite coordinates"),
    ],
)
def test_input_errors(call, message):
    with pytest.raises(InputError) as info:
        call()
    assert str(info.value) == message


def test_invalid_polygon_raises_from_every_function():
    bad = [[0, 0], [1, 1], [1, 0], [0, 1]]
    for call in (lambda: covers(bad, 0, 0), lambda: assess(bad, 0, 0), lambda: margins(bad, 0, 0),
                 lambda: path_inside(bad, [0], [0])):
        with pytest.raises(EnvelopeError, match="cross at"):
            call()


# --------------------------------------------------------------------------- margins
def _shapely_section(poly, level, u, axis):
    """Reference section: shapely intersection of the polygon with a long line, merged, and
    the component containing (or nearest to) u."""
    big = 1e6
    line = (shapely.LineString([(-big, level), (big, level)]) if axis == 0
            else shapely.LineString([(level, -big), (level, big)]))
    inter = shapely.intersection(poly, line)
    parts = [g for g in getattr(inter, "geoms", [inter]) if not g.is_empty]
    ivs = sorted((np.asarray(g.coords)[:, axis].min(), np.asarray(g.coords)[:, axis].max())
                 for g in parts)
    merged = []
    for lo, hi in ivs:
        if merged and lo <= merged[-1][1] + 1e-12:
            merged[-1] = (merged[-1][0], max(merged[-1][1], hi))
        else:
            merged.append((lo, hi))
    if not merged:
        return (math.nan, math.nan)
    dist = [max(lo - u, 0) + max(u - hi, 0) for lo, hi in merged]
    return merged[int(np.argmin(dist))]


def test_margins_match_shapely_sections_and_distances():
    rng = np.random.default_rng(9)
    for P in _star_polygons(9, 25) + [NOTCHED]:
        poly = shapely.Polygon(P)
        lo, hi = P.min(axis=0), P.max(axis=0)
        cx = rng.uniform(lo[0], hi[0], 30)
        cy = rng.uniform(lo[1], hi[1], 30)
        # Some points exactly at vertex levels (horizontal edges, vertices on the line).
        cy[:8] = P[rng.integers(0, len(P), 8), 1]
        cx[8:12] = P[rng.integers(0, len(P), 4), 0]
        r = margins(P, cx, cy, scale=(1.0, 1.0))
        for i in range(cx.size):
            flo, fhi = _shapely_section(poly, cy[i], cx[i], axis=0)
            mlo, mhi = _shapely_section(poly, cx[i], cy[i], axis=1)
            if math.isnan(flo):
                assert math.isnan(r.fwd_limit[i])
            else:
                assert_close([r.fwd_limit[i], r.aft_limit[i]], [flo, fhi], unit="m",
                             atol=1e-9, what="section at mass (shapely)")
            if math.isnan(mlo):
                assert math.isnan(r.min_mass[i])
            else:
                assert_close([r.min_mass[i], r.max_mass[i]], [mlo, mhi], unit="kg",
                             atol=1e-9 * (hi[1] - lo[1] + 1), what="section at CG (shapely)")
            # Nearest edge: shapely distance to each edge as a LineString.
            edges = [shapely.LineString([P[k], P[(k + 1) % len(P)]]) for k in range(len(P))]
            d = shapely.distance(shapely.Point(cx[i], cy[i]), edges)
            assert_close(r.edge_distance[i], d.min(), unit="polygon units", atol=1e-12,
                         what="distance to nearest edge (shapely)")
            assert d[r.edge[i]] <= d.min() + 1e-12
        np.testing.assert_array_equal(r.inside, shapely.intersects_xy(poly, cx, cy))


def test_default_scale_measures_distance_as_fraction_of_envelope_size():
    # Reference: shapely distance in coordinates divided by the bounding-box sides.
    P = NOTCHED
    size = P.max(axis=0) - P.min(axis=0)
    scaled = shapely.Polygon(P / size)
    r = margins(P, 2.50, 700.0)
    point = shapely.Point(2.50 / size[0], 700.0 / size[1])
    assert_close(r.edge_distance, shapely.distance(scaled.boundary, point),
                 unit="fraction", atol=1e-12, what="scaled distance")
    assert r.edge == 1   # the aft limit (2.55, 550)-(2.55, 900), 0.05 m away, not the mass limit


def test_margins_hand_worked_notched_envelope():
    # By hand, at 1000 kg: the forward limit is on edge (2.30, 1100)-(2.15, 950), at
    # x = 2.15 + 0.15 × 50/150 = 2.20 m; the aft limit is the reflex vertex (2.45, 1000).
    r = margins(NOTCHED, 2.40, 1000.0)
    assert r.inside
    assert_close([r.fwd_limit, r.aft_limit], [2.20, 2.45], unit="m", atol=1e-12, what="limits")
    assert_close([r.to_fwd, r.to_aft], [0.20, 0.05], unit="m", atol=1e-12, what="margins")
    # At CG 2.40 m: min 550 kg (bottom edge); max where the line x = 2.40 meets the upper edges:
    # edge (2.45, 1000)-(2.58, 1100) is aft of 2.45, so the top edge at 1100 kg.
    assert_close([r.min_mass, r.max_mass], [550.0, 1100.0], unit="kg", atol=1e-9,
                 what="mass limits")
    assert_close([r.to_min_mass, r.to_max_mass], [450.0, 100.0], unit="kg", atol=1e-9,
                 what="margins")


def test_margins_on_the_max_mass_edge_and_outside():
    # CG exactly at the maximum mass: on the top edge, the limits are that edge's ends.
    r = margins(NOTCHED, 2.40, 1100.0)
    assert r.inside and r.to_max_mass == 0.0
    assert_close([r.fwd_limit, r.aft_limit], [2.30, 2.58], unit="m", atol=1e-12, what="top edge")
    # Aft of the aft limit at 700 kg by 0.05 m: to_aft is -0.05, to_fwd is the full width.
    r = margins(NOTCHED, 2.60, 700.0)
    assert not r.inside
    assert_close([r.to_fwd, r.to_aft], [0.55, -0.05], unit="m", atol=1e-12, what="margins")
    # Above the envelope: no CG limits at that mass.
    r = margins(NOTCHED, 2.40, 1200.0)
    assert math.isnan(r.fwd_limit) and math.isnan(r.to_aft)
    assert_close(r.to_max_mass, -100.0, unit="kg", atol=1e-9, what="over max mass")


def test_margins_in_the_notch_gap_use_the_nearest_part():
    # VNOTCH at height 2.5: parts [0, 1.25] and [2.75, 4]; x = 1.5 is in the gap, 0.25 from 1.25.
    r = margins(VNOTCH, 1.5, 2.5)
    assert not r.inside
    assert_close([r.fwd_limit, r.aft_limit, r.to_aft], [0.0, 1.25, -0.25], unit="m", atol=1e-12,
                 what="nearest part")


def test_percent_mac_of_margins():
    # Limits 2.20/2.45 m and margins 0.20/0.05 m (hand-worked above) with LEMAC 2.0, MAC 1.0:
    # (2.20 − 2.0)/1.0 × 100 = 20 %, 45 %; margins 20 % and 5 % of MAC.
    pm = margins(NOTCHED, 2.40, 1000.0).percent_mac(lemac=2.0, mac=1.0)
    assert_close(list(pm), [20.0, 45.0, 20.0, 5.0], unit="%MAC", atol=1e-9, what="%MAC")


def test_assess_matches_margins_and_covers():
    rng = np.random.default_rng(4)
    for P in _star_polygons(4, 30) + [NOTCHED, VNOTCH]:
        lo, hi = P.min(axis=0), P.max(axis=0)
        span = hi - lo
        x = rng.uniform(lo[0] - 0.2 * span[0], hi[0] + 0.2 * span[0], 3000)
        y = rng.uniform(lo[1] - 0.2 * span[1], hi[1] + 0.2 * span[1], 3000)
        y[:50] = P[rng.integers(0, len(P), 50), 1]        # at vertex levels
        x[:len(P)], y[:len(P)] = P[:, 0], P[:, 1]          # the vertices themselves
        a = assess(P, x, y)
        np.testing.assert_array_equal(a.inside, covers(P, x, y))
        r = margins(P, x, y)
        expected = np.minimum(r.to_fwd, r.to_aft)
        ok = np.where(np.isnan(expected), np.isneginf(a.margin),
                      np.isclose(a.margin, expected, rtol=0, atol=1e-9 * span.max()))
        assert ok.all(), np.flatnonzero(~ok)[:5]
        assert np.all((a.margin >= 0) == a.inside)


def test_assess_hand_worked():
    a = assess(NOTCHED, [2.40, 2.60, 2.40, 2.40], [1000.0, 700.0, 1200.0, 1100.0])
    assert a.inside.tolist() == [True, False, False, True]
    assert_close(a.margin[:2], [0.05, -0.05], unit="m", atol=1e-12, what="margin")
    assert a.margin[2] == -math.inf
    assert_close(a.margin[3], 0.10, unit="m", atol=1e-12, what="margin on the top edge")


# --------------------------------------------------------------------------- path_inside
def test_path_through_a_notch_leaves_between_inside_end_points():
    # VNOTCH: both ends (0.5, 2.5) and (3.5, 2.5) are inside; the straight path crosses the
    # notch, whose left edge (1, 3)-(2, 1) is at x = 1.25 for y = 2.5 (by hand).
    assert covers(VNOTCH, 0.5, 2.5) and covers(VNOTCH, 3.5, 2.5)
    r = path_inside(VNOTCH, [0.5, 3.5], [2.5, 2.5])
    assert not r.inside and r.segment == 0
    assert_close(r.first_exit, [1.25, 2.5], unit="", atol=1e-12, what="first exit")
    # Reference: shapely says the segment is not covered.
    assert not shapely.covers(shapely.Polygon(VNOTCH), shapely.LineString([(0.5, 2.5), (3.5, 2.5)]))


def test_fuel_burn_path_in_the_notched_envelope():
    # Ramp -> take-off -> landing, invented: the take-off -> landing leg leaves through the notch
    # in the aft limit. Segment 1 from (2.50, 1060) to (2.50, 900): the edge (2.45, 1000)-(2.58,
    # 1100) is at x = 2.50 for mass 1000 + 100 × 0.05/0.13 = 1038.4615... kg (by hand).
    xs, ys = [2.40, 2.50, 2.50], [1080.0, 1060.0, 900.0]
    assert covers(NOTCHED, xs, ys).all()
    r = path_inside(NOTCHED, xs, ys)
    assert not r.inside and r.segment == 1
    assert_close(r.first_exit, [2.50, 1000.0 + 100.0 * 0.05 / 0.13], unit="", rtol=1e-12,
                 what="first exit")
    assert not shapely.covers(shapely.Polygon(NOTCHED), shapely.LineString(list(zip(xs, ys))))


def test_paths_inside_along_edges_and_through_vertices():
    # Along the bottom edge, round the reflex vertex of the notch, and a single point.
    assert path_inside(VNOTCH, [0.0, 4.0], [0.0, 0.0]).inside
    assert path_inside(VNOTCH, [0.5, 2.0, 3.5], [2.5, 1.0, 2.5]).inside          # touches (2, 1)
    assert path_inside(VNOTCH, [0.5, 2.0, 3.5], [2.5, 0.5, 2.5]).inside
    assert path_inside(VNOTCH, [1.0], [1.0]) == (True, None, None)
    # Starting outside: the exit is the start point.
    assert path_inside(VNOTCH, [5.0, 1.0], [1.0, 1.0]) == (False, (5.0, 1.0), 0)
    # Along the notch edge (collinear with it), then out over the top.
    r = path_inside(VNOTCH, [1.0, 2.0, 2.0], [3.0, 1.0, 2.0])
    assert not r.inside and r.segment == 1 and r.first_exit == (2.0, 1.0)


def test_path_inside_agrees_with_shapely_covers():
    # Reference: shapely.covers(polygon, LineString) for random polylines.
    rng = np.random.default_rng(12)
    for P in _star_polygons(12, 20) + [NOTCHED, VNOTCH]:
        poly = shapely.Polygon(P)
        lo, hi = P.min(axis=0), P.max(axis=0)
        for _ in range(10):
            k = int(rng.integers(2, 5))
            xs = rng.uniform(lo[0], hi[0], k)
            ys = rng.uniform(lo[1], hi[1], k)
            r = path_inside(P, xs, ys)
            assert r.inside == shapely.covers(poly, shapely.LineString(np.column_stack([xs, ys])))
            if not r.inside:
                # The exit point is on the boundary or is the (outside) start point.
                d = shapely.distance(poly.boundary, shapely.Point(r.first_exit))
                assert d <= 1e-9 * (hi - lo).max() or r.first_exit == (xs[0], ys[0])


@settings(max_examples=60, deadline=None)
@given(st.integers(0, 10_000), st.integers(3, 11))
def test_covers_property_random_star_polygons(seed, n):
    rng = np.random.default_rng(seed)
    P = _star(rng, n, snap=4 if seed % 2 else None)
    poly = shapely.Polygon(P)
    if not poly.is_valid or len(np.unique(P, axis=0)) < n:
        return
    x = rng.uniform(-1.1, 1.1, 300)
    y = rng.uniform(-1.1, 1.1, 300)
    ours = covers(P, x, y)
    ref = shapely.intersects_xy(poly, x, y)
    d = shapely.distance(poly.boundary, shapely.points(x, y))
    assert np.all((ours == ref) | (d <= default_tolerance(P)))
