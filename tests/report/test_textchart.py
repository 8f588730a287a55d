"""The terminal envelope chart: outline, labelled points (on an edge, a vertex, inside,
outside), the burn path, and the width limit."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ledger.report.textchart import envelope_chart, nice_ticks, plot_grid

SQUARE = [(0.0, 0.0), (10.0, 0.0), (10.0, 10.0), (0.0, 10.0)]
POINTS = [(10.0, 5.0, "E"),   # exactly on the right edge
          (0.0, 0.0, "V"),    # exactly on a vertex
          (5.0, 5.0, "I"),    # inside
          (15.0, 5.0, "O")]   # outside, to the right


@pytest.fixture
def square():
    return plot_grid([SQUARE], POINTS, width=41, height=21)


def test_every_label_is_drawn_once_where_its_point_is(square):
    text = "\n".join(square.lines())
    for x, y, label in POINTS:
        assert text.count(label) == 1, label
        assert square.labels[label] == square.cell(x, y), label


def test_point_on_an_edge_replaces_the_edge_character(square):
    r, c = square.labels["E"]
    right = square.col(10.0)
    assert c == right
    # the same column above and below is the vertical edge
    assert square.cells[r - 1][c] == "|" and square.cells[r + 1][c] == "|"


def test_point_on_a_vertex_shows_and_the_edges_run_from_it(square):
    r, c = square.labels["V"]
    assert (r, c) == square.cell(0.0, 0.0)
    assert (r, c) == (square.row(0.0), square.col(0.0))
    assert square.cells[r][c] == "V"
    assert square.cells[r][c + 1] == "-"      # bottom edge going right
    assert square.cells[r - 1][c] == "|"      # left edge going up


def test_inside_and_outside_points_sit_on_the_right_side_of_the_outline(square):
    left, right = square.col(0.0), square.col(10.0)
    top, bottom = square.row(10.0), square.row(0.0)
    ri, ci = square.labels["I"]
    assert left < ci < right and top < ri < bottom
    ro, co = square.labels["O"]
    assert co > right and top < ro < bottom
    # nothing but blanks between the right edge and the outside point
    assert set(square.cells[ro][right + 1:co]) == {" "}


def test_outline_is_drawn_with_vertices_and_edges(square):
    top = square.row(10.0)
    left, right = square.col(0.0), square.col(10.0)
    row = "".join(square.cells[top][left:right + 1])
    assert row == "+" + "-" * (right - left - 1) + "+"
    assert {square.cells[r][left] for r in range(top + 1, square.row(0.0))} == {"|"}


def test_two_points_in_one_cell_both_show():
    g = plot_grid([SQUARE], [(5, 5, "R"), (5.001, 5.001, "T")], width=30, height=12)
    text = "\n".join(g.lines())
    assert "R" in text and "T" in text
    assert g.labels["R"] == g.cell(5, 5)
    (rr, cr), (rt, ct) = g.labels["R"], g.labels["T"]
    assert max(abs(rr - rt), abs(cr - ct)) == 1  # moved to a neighbouring cell


def test_path_is_drawn_under_the_points():
    path = [(2.0, 8.0), (8.0, 2.0)]
    g = plot_grid([SQUARE], [(2.0, 8.0, "T"), (8.0, 2.0, "L")], path, width=41, height=21)
    dots = sum(row.count(".") for row in g.lines())
    # a diagonal from column of x=2 to x=8 covers every cell in between, minus the 2 labels
    assert dots == max(abs(g.col(8) - g.col(2)), abs(g.row(2) - g.row(8))) + 1 - 2
    assert g.cells[g.row(2.0)][g.col(8.0)] == "L"


def test_non_convex_outline_leaves_the_notch_empty():
    # a C shape, opening to the right; (7, 5) is in the notch, outside the envelope
    c_shape = [(0, 0), (10, 0), (10, 3), (4, 3), (4, 7), (10, 7), (10, 10), (0, 10)]
    g = plot_grid([c_shape], [(7.0, 5.0, "X")], width=41, height=21)
    r, c = g.labels["X"]
    assert g.cells[r][c] == "X"
    # between the inner edge at x=4 and the point: blank (the notch)
    assert set(g.cells[r][g.col(4.0) + 1:c]) == {" "}
    assert g.cells[r][g.col(4.0)] == "|"


def test_envelope_chart_has_axes_labels_and_fits_the_width():
    lines = envelope_chart([SQUARE], POINTS, [], width=60, height=12, x_label="CG (in)",
                           y_label="mass (lb)")
    assert lines[0] == "mass (lb)"
    assert lines[-1].strip() == "CG (in)"
    assert all(len(s) <= 60 for s in lines)
    body = "\n".join(lines)
    for _, _, label in POINTS:
        assert label in body
    # the x axis line and tick labels: 0 and 15 are in the range (outside point at 15)
    assert lines[-3].lstrip().startswith("+") and set(lines[-3].strip()) <= {"+", "-"}
    ticks = lines[-2].split()
    assert "0" in ticks and "15" in ticks


def test_tick_text_uses_the_decimals_the_step_needs():
    # x from 0 to 17 on a 100-column chart: 8 ticks wanted over ~19 units → step 2.5
    lines = envelope_chart([[(0.0, 1500), (17.0, 1500), (17.0, 2550), (0.0, 2550)]],
                           width=100, height=10)
    ticks = lines[-1].split()
    assert ticks[:3] == ["0.0", "2.5", "5.0"] and "12.5" in ticks


def test_nice_ticks():
    assert nice_ticks(0, 10, 5) == [0.0, 2.0, 4.0, 6.0, 8.0, 10.0]
    assert nice_ticks(-0.1, 0.1, 4) == [-0.1, -0.05, 0.0, 0.05, 0.1]
    assert nice_ticks(3.0, 3.0) == [3.0]


def test_bad_input_is_refused():
    with pytest.raises(ValueError, match="not finite"):
        plot_grid([SQUARE], [(math.nan, 1.0, "Z")])
    with pytest.raises(ValueError, match="too small"):
        plot_grid([SQUARE], width=4, height=2)
    with pytest.raises(ValueError, match="too small"):
        envelope_chart([SQUARE], width=20)


def test_empty_input_still_draws_axes():
    lines = envelope_chart([], [], [], width=40, height=5)
    assert all(len(s) <= 40 for s in lines) and len(lines) == 5 + 2


coord = st.floats(-1e4, 1e4, allow_nan=False, allow_infinity=False)


@settings(max_examples=60, deadline=None)
@given(poly=st.lists(st.tuples(coord, coord), min_size=3, max_size=8),
       pts=st.lists(st.tuples(coord, coord), min_size=1, max_size=4),
       width=st.integers(30, 100), height=st.integers(4, 20))
def test_any_chart_fits_its_width_and_shows_every_point(poly, pts, width, height):
    labels = "ZRTL"
    points = [(x, y, labels[i]) for i, (x, y) in enumerate(pts)]
    lines = envelope_chart([poly], points, pts, width=width, height=height)
    assert max(len(s) for s in lines) <= width
    body = "\n".join(lines)
    for _, _, label in points:
        assert label in body


def test_a_subnormal_span_gets_one_tick_not_an_error():
    # Hypothesis found it: a span of 5e-324 made the tick step's log10 fail.
    assert nice_ticks(0.0, 5e-324, 4) == [0.0]
    lines = envelope_chart([[(0, 0)] * 3], [(0.0, 5e-324, "Z")], [(0.0, 5e-324)], width=30,
                           height=4)
    assert lines and all(len(line) <= 30 for line in lines)
