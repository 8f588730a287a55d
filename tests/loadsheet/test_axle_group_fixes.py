"""Issue 13 item 2: an axle-group overload is a limit the fixes clear, and the sheet shows it.

Sources: statics of a rigid vehicle on two supports; an axle group acts as one support at its
load-weighted centre and shares its load in the type's ratios (lever rule, common practice).
Figures are of an invented test truck, not a demo type.
"""

from __future__ import annotations

from ledger.loadsheet import EmptyWeight
from ledger.loadsheet.fix_options import FixFinder
from ledger.report.sheet_text import sheet_text
from ledger.testing import assert_close
from tests.loadsheet.common import make_type, plan_of, sheet

TANDEM = """
format_version = 1
[vehicle]
name = "TEST-TANDEM"
title = "test tandem truck (invented)"
kind = "ground_vehicle"
[units]
mass = "kg"
length = "m"
[datum]
description = "front axle centreline"
[limits]
gross_rating = 20000
[[axle]]
name = "front"
x = 0.0
rating = 7000
[[axle]]
name = "rear 1"
x = 4.0
rating = 6500
[[axle]]
name = "rear 2"
x = 5.3
rating = 6500
[[axle_group]]
name = "tandem"
axles = ["rear 1", "rear 2"]
rating = 11500
[[station]]
name = "box"
kind = "cargo"
x = 4.0
max_mass = 9000
x_range = [1.0, 6.0]
"""
EMPTY = EmptyWeight(8000.0, 8000.0 * 2.0, 0.0)
LOAD = '[[cargo]]\nstation = "box"\nmass = 8000\nx = 4.7\n'
SPAN = (4.0 + 5.3) / 2  # the tandem's centre, equal shares: 4.65 m behind the front axle


def _overloaded():
    vt = make_type(TANDEM)
    return vt, sheet(vt, EMPTY, LOAD)


def test_group_overload_is_fixed_by_moving_or_offloading():
    """issue 13 item 2: before the fix, "none of the changes tried" (the group was ignored)."""
    _, doc = _overloaded()
    group = (8000 * 2.0 + 8000 * 4.7) / SPAN  # lever rule: 11,526.9 kg on the tandem
    [v] = [v for v in doc["violations"] if v["phase"] == "departure"]
    assert (v["code"], v["axle"]) == ("axle", "tandem")
    assert_close(v["actual"], group, unit="kg", rtol=1e-12, source="statics (lever rule)")
    excess = group - 11500
    kinds = {f["kind"]: f for f in doc["fixes"]}
    assert set(kinds) == {"move_load", "offload_payload"}
    assert all(f["rechecked"] and f["in_limits_after"] for f in doc["fixes"])
    # Moving m = 8,000 kg forward by d takes m·d/L off the rear support: d = excess·L/m,
    # 0.0156 m, rounded up to the 0.01 m the type shows.
    assert excess * SPAN / 8000 <= 0.02 < excess * SPAN / 8000 + 0.01
    assert_close(kinds["move_load"]["distance_m"], -0.02, unit="m", rtol=1e-9)
    # Taking m off at 4.7 m (behind the tandem's centre) takes m·4.7/L off the tandem:
    # 26.6 kg, rounded up to whole kilograms.
    assert_close(kinds["offload_payload"]["mass_kg"], 27.0, unit="kg", rtol=1e-9)
    assert (8000 * 2.0 + 7973 * 4.7) / SPAN <= 11500 < (8000 * 2.0 + 7974 * 4.7) / SPAN


def test_the_effective_ratings_include_the_group_rating():
    """issue 13 item 2: each tandem axle carries half the group, so at most 11,500 / 2."""
    vt, doc = _overloaded()
    finder = FixFinder(vt, plan_of(vt, LOAD), doc, lambda plan: doc)
    assert finder.axle_limits()[3] == [7000.0, 5750.0, 5750.0]
    assert finder.axle_members("tandem") == [1, 2]
    assert finder.axle_members("front") == [0]


def test_each_phase_has_a_group_row_and_the_table_shows_it():
    """issue 13 item 2: the axle table had no group row."""
    _, doc = _overloaded()
    rows = doc["phases"][0]["axle_groups"]
    assert [(r["name"], r["axles"], r["rating_kg"], r["in_limits"]) for r in rows] == [
        ("tandem", ["rear 1", "rear 2"], 11500.0, False)]
    assert_close(rows[0]["load_kg"], sum(a["load_kg"] for a in doc["phases"][0]["axles"][1:]),
                 unit="kg", rtol=1e-12)
    text = sheet_text(doc, 80)
    line = next(ln for ln in text.splitlines() if "tandem (group)" in ln)
    assert line.split()[:3] == ["Departure", "tandem", "(group)"]
    assert line.split()[-4:] == ["-26.9", "—", "—", "OUT"]  # margin, no wheel sides
