"""The loading-sheet document, plan → document, against handbook examples and independent checks.

Sources:
- PHAK: Pilot's Handbook of Aeronautical Knowledge (FAA-H-8083-25), ch. 9, weight and balance:
  the weight-addition example (6,860 lb at 80.0 in + 140 lb at 150 in → 81.4 in) and the
  weight-shift example (7,800 lb, CG 81.5 in, aft limit 80.5 in, cargo moved from station 150
  to station 30: 65 lb). The shift example was read as quoted in a secondary source (a forum
  thread quoting the handbook); the addition example as quoted in the domain notes.
- FAA-H-8083-30 ch. 4: ballast = M × (distance out of limits) / (distance from ballast arm to
  the limit); avgas 6.0 lb/US gal.
- Statics of a rigid vehicle on two axles: W_f = W·b/L, W_r = W·a/L (domain notes).
- 23 CFR 658.17: 20,000 lb single axle (advisory rule set).
Independent re-checks use exact fractions in lb and in, or shapely as the polygon oracle.
"""

from __future__ import annotations

import math
from fractions import Fraction as Fr

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from shapely.geometry import LineString, Point, Polygon

from ledger.errors import PlanError
from ledger.loadsheet import EmptyWeight, build_sheet, compare_plans
from ledger.testing import assert_close
from ledger.typedata.model import Tolerances
from tests.loadsheet.common import (
    IN,
    LB,
    empty_lb_in,
    envelope,
    lb_in_type,
    make_type,
    plan_of,
    sheet,
    station,
)

# --- the handbook examples ----------------------------------------------------------------------


def add_type(aft_limit: float):
    return make_type(lb_in_type(
        name="TEST-ADD",
        stations=station("station 150", "cargo", 150, max_mass=500),
        envelopes=envelope([(70, 5000), (70, 8000), (aft_limit, 8000), (aft_limit, 5000)])))


def test_weight_addition_example_through_the_whole_path():
    # PHAK ch. 9: 6,860 lb at 80.0 in plus 140 lb at 150 in gives 7,000 lb at 81.4 in.
    vt = add_type(aft_limit=82.0)
    doc = sheet(vt, empty_lb_in(6860, 80.0), '[[cargo]]\nstation = "station 150"\nmass = 140\n')
    for phase in doc["phases"]:  # no fuel: every phase is the same state
        assert_close(phase["mass_kg"] / LB, 7000.0, unit="lb", rtol=1e-12, source="PHAK ch. 9")
        assert_close(phase["cg_m"]["x"] / IN, 81.4, unit="in", rtol=1e-12,
                     source="PHAK ch. 9")
        # moment index = 7,000 lb × 81.4 in / 1,000 = 569.8 (reduction factor from the type)
        assert_close(phase["moment_index"], 569.8, unit="lb*in/1000", rtol=1e-12)
    assert doc["verdict"] == "in_limits"
    assert doc["violations"] == [] and doc["fixes"] == []
    assert doc["schema"] == "wbledger.sheet/1"
    assert doc["caution"].startswith("CAUTION:")


def test_cg_exactly_on_the_aft_limit_is_in_limits():
    # Limits are inclusive (domain notes): 81.4 in is on the aft limit 81.4 in.
    doc = sheet(add_type(aft_limit=81.4), empty_lb_in(6860, 80.0),
                '[[cargo]]\nstation = "station 150"\nmass = 140\n')
    assert doc["verdict"] == "in_limits"
    env = doc["phases"][0]["envelopes"][0]
    assert env["inside"] is True
    assert_close(env["aft_margin_m"], 0.0, unit="m", atol=1e-9)


def test_cg_just_beyond_the_aft_limit_is_out_by_the_amount():
    doc = sheet(add_type(aft_limit=81.39), empty_lb_in(6860, 80.0),
                '[[cargo]]\nstation = "station 150"\nmass = 140\n')
    assert doc["verdict"] == "out_of_limits"
    v = [v for v in doc["violations"] if v["phase"] == "takeoff"][0]
    assert v["code"] == "envelope" and v["side"] == "aft"
    assert_close(v["excess"] / IN, 0.01, unit="in", rtol=1e-9)
    assert v["message"] == ("Take-off CG 81.40 in is aft of the normal envelope's limit "
                            "81.39 in at 7000 lb by 0.01 in")


def test_an_excess_too_small_to_show_is_never_written_as_zero():
    # 81.4 in against an aft limit of 81.398 in: out by 0.002 in, below the 0.01 in shown.
    doc = sheet(add_type(aft_limit=81.398), empty_lb_in(6860, 80.0),
                '[[cargo]]\nstation = "station 150"\nmass = 140\n')
    assert doc["verdict"] == "out_of_limits"
    v = [v for v in doc["violations"] if v["phase"] == "takeoff"][0]
    assert_close(v["excess"] / IN, 0.002, unit="in", rtol=1e-9)
    assert v["message"] == ("Take-off CG 81.40 in is aft of the normal envelope's limit "
                            "81.40 in at 7000 lb by less than 0.01 in")


def shift_type(ballast: bool = False):
    stations = (station("forward cargo", "cargo", 30, max_mass=1000)
                + station("aft cargo", "cargo", 150, max_mass=1000))
    if ballast:
        stations += station("nose ballast", "ballast", 10, max_mass=200)
    return make_type(lb_in_type(
        name="TEST-SHIFT", stations=stations,
        envelopes=envelope([(70, 5000), (70, 8000), (80.5, 8000), (80.5, 5000)])))


# 7,800 lb at 81.5 in with 300 lb of it in the aft cargo at 150 in: the empty 7,500 lb sits at
# (7,800 × 81.5 − 300 × 150) / 7,500 = 78.76 in.
SHIFT_PLAN = '[[cargo]]\nstation = "aft cargo"\nmass = 300\n'
SHIFT_EMPTY = (7500, Fr(7800 * 815, 10 * 7500) - Fr(300 * 150, 7500))


def _exact_cg(changes: dict[float, Fr]) -> tuple[Fr, Fr]:
    """Mass (lb) and CG (in) by exact fractions: the empty weight plus {arm: mass} changes."""
    m0, x0 = Fr(SHIFT_EMPTY[0]), Fr(SHIFT_EMPTY[1])
    mass = m0 + sum(changes.values())
    moment = m0 * x0 + sum(Fr(a) * m for a, m in changes.items())
    return mass, moment / mass


def test_weight_shift_example_and_its_fix():
    vt = shift_type()
    empty = empty_lb_in(SHIFT_EMPTY[0], float(SHIFT_EMPTY[1]))
    doc = sheet(vt, empty, SHIFT_PLAN)
    ph = doc["phases"][0]
    assert_close(ph["mass_kg"] / LB, 7800.0, unit="lb", rtol=1e-12, source="PHAK ch. 9")
    assert_close(ph["cg_m"]["x"] / IN, 81.5, unit="in", rtol=1e-12, source="PHAK ch. 9")
    assert doc["verdict"] == "out_of_limits"
    v = doc["violations"][0]
    assert (v["code"], v["side"]) == ("envelope", "aft")
    assert_close(v["excess"] / IN, 1.0, unit="in", rtol=1e-9)  # 81.5 − 80.5

    shifts = [f for f in doc["fixes"] if f["kind"] == "shift"]
    assert len(shifts) == 1
    fix = shifts[0]
    assert (fix["from_station"], fix["to_station"]) == ("aft cargo", "forward cargo")
    # PHAK ch. 9: 1.0 in × 7,800 lb / 120 in = 65 lb.
    assert_close(fix["mass_kg"] / LB, 65.0, unit="lb", rtol=1e-12, source="PHAK ch. 9")
    assert fix["description"] == "Move 65.0 lb of cargo from 'aft cargo' to 'forward cargo'"
    assert fix["rechecked"] and fix["in_limits_after"]
    # Independent re-check: exact arithmetic in lb and in puts the CG on the aft limit.
    m = Fr(65)
    mass, cg = _exact_cg({150: Fr(300) - m, 30: m})
    assert mass == 7800 and cg == Fr(805, 10)
    assert "re-checked" in doc["fixes_note"]


def test_offload_and_ballast_fixes_are_sized_and_really_inside():
    vt = shift_type(ballast=True)
    empty = empty_lb_in(SHIFT_EMPTY[0], float(SHIFT_EMPTY[1]))
    doc = sheet(vt, empty, SHIFT_PLAN)
    by_kind = {f["kind"]: f for f in doc["fixes"]}
    assert set(by_kind) == {"shift", "ballast", "offload_payload"}
    # Offload at station 150: Δm = M·(CG − limit)/(150 − limit) = 7,800 × 1.0 / 69.5 = 112.23 lb,
    # rounded up to the display resolution of 1 lb (formula: PHAK ch. 9 add/remove weight).
    off = by_kind["offload_payload"]
    assert_close(off["mass_kg"] / LB, 113.0, unit="lb", rtol=1e-12)
    mass, cg = _exact_cg({150: Fr(300) - Fr(113)})
    assert cg <= Fr(805, 10) and 5000 <= mass <= 8000
    # Ballast at 10 in: 7,800 × 1.0 / 70.5 = 110.64 lb → 111 lb (FAA-H-8083-30 ch. 4).
    bal = by_kind["ballast"]
    assert bal["to_station"] == "nose ballast"
    assert_close(bal["mass_kg"] / LB, 111.0, unit="lb", rtol=1e-12)
    mass, cg = _exact_cg({150: Fr(300), 10: Fr(111)})
    assert cg <= Fr(805, 10) and mass <= 8000
    # One pound less is not enough: the sizing is the smallest whole pound that works.
    _, cg_short = _exact_cg({150: Fr(300), 10: Fr(110)})
    assert cg_short > Fr(805, 10)


# --- the fuel-burn path against a non-convex envelope -------------------------------------------

NOTCH = [(40, 1500), (40, 2300), (50, 2300), (50, 2000), (45, 2000), (45, 1800), (50, 1800),
         (50, 1500)]


def notch_type():
    return make_type(lb_in_type(
        name="TEST-NOTCH", limits="max_takeoff = 2300",
        stations=station("cabin", "cargo", 48, max_mass=500),
        tanks='\n[[tank]]\nname = "main"\nfluid = "avgas"\ncapacity = "700 lb"\nx = 48\n',
        envelopes=envelope(NOTCH)))


NOTCH_PLAN = """
[[cargo]]
station = "cabin"
mass = 150
[fuel]
taxi = "10 lb"
trip = "600 lb"
[fuel.tanks]
main = "660 lb"
"""


def test_burn_path_that_leaves_a_non_convex_envelope_and_comes_back():
    vt = notch_type()
    doc = sheet(vt, empty_lb_in(1400, 48.0), NOTCH_PLAN)
    names = {p["name"]: p for p in doc["phases"]}
    assert_close(names["takeoff"]["mass_kg"] / LB, 2200.0, unit="lb", rtol=1e-12)
    assert_close(names["landing"]["mass_kg"] / LB, 1600.0, unit="lb", rtol=1e-12)
    # Both ends (and the zero-fuel point) are in limits ...
    for name in ("zero_fuel", "takeoff", "landing"):
        assert names[name]["envelopes"][0]["inside"] is True
    # ... as shapely agrees, while the straight path between them is not covered.
    poly = Polygon(NOTCH)
    assert poly.covers(Point(48, 2200)) and poly.covers(Point(48, 1600))
    assert not poly.covers(LineString([(48, 2200), (48, 1600)]))
    assert doc["verdict"] == "out_of_limits"
    [v] = doc["violations"]
    assert v["code"] == "burn_path"
    env = doc["burn_path"]["envelopes"][0]
    assert env["inside"] is False
    # The first exit: where the path (burning down from 2,200 lb) meets the notch, by shapely.
    crossing = LineString([(48, 2200), (48, 1600)]).intersection(poly.boundary)
    first = max(crossing.geoms, key=lambda p: p.y)
    exit_pt = env["first_exit"]
    assert_close(exit_pt["mass_kg"] / LB, first.y, unit="lb", rtol=1e-9)
    assert_close(exit_pt["cg_x_m"] / IN, first.x, unit="in", rtol=1e-9)
    assert_close(exit_pt["fuel_burned_kg"] / LB, 200.0, unit="lb", rtol=1e-9)
    assert v["message"] == ("While fuel burns from take-off to landing the CG leaves the normal "
                            "envelope at 2000 lb, CG 48.00 in, after 200 lb of trip fuel, "
                            "although take-off and landing are in limits")


def test_burn_path_inside_a_convex_envelope_passes():
    vt = make_type(lb_in_type(
        name="TEST-BOX", limits="max_takeoff = 2300",
        stations=station("cabin", "cargo", 48, max_mass=500),
        tanks='\n[[tank]]\nname = "main"\nfluid = "avgas"\ncapacity = "700 lb"\nx = 48\n',
        envelopes=envelope([(40, 1500), (40, 2300), (50, 2300), (50, 1500)])))
    doc = sheet(vt, empty_lb_in(1400, 48.0), NOTCH_PLAN)
    assert doc["verdict"] == "in_limits"
    assert doc["burn_path"]["envelopes"][0] == {"name": "normal", "axis": "longitudinal",
                                                "category": "normal", "inside": True,
                                                "first_exit": None}


def test_tank_order_burn_path_follows_the_tanks():
    # Two tanks at different arms, drained one after the other: while the aft tank feeds the
    # CG moves forward, then the forward tank feeds and it moves aft (statics, Σm·x / Σm).
    vt = make_type(lb_in_type(
        name="TEST-ORDER", limits="max_takeoff = 2300",
        tanks=('\n[[tank]]\nname = "fwd"\nfluid = "avgas"\ncapacity = "300 lb"\nx = 30\n'
               '\n[[tank]]\nname = "aft"\nfluid = "avgas"\ncapacity = "300 lb"\nx = 60\n'),
        envelopes=envelope([(40, 1000), (40, 2300), (50, 2300), (50, 1000)])))
    doc = sheet(vt, empty_lb_in(1500, 45.0),
                '[fuel]\ntrip = "300 lb"\nburn = ["aft", "fwd"]\n'
                '[fuel.tanks]\nfwd = "200 lb"\naft = "200 lb"\n')
    pts = doc["burn_path"]["points"]
    masses = [p["mass_kg"] / LB for p in pts]
    cgs = [p["cg_x_m"] / IN for p in pts]
    switch = next(i for i, p in enumerate(pts) if p["kind"] == "switch")
    assert_close(masses[switch], 1700.0, unit="lb", rtol=1e-12)  # the aft tank is empty
    # CG at the switch: (1500·45 + 200·30) / 1700 (statics)
    assert_close(cgs[switch], (1500 * 45 + 200 * 30) / 1700, unit="in", rtol=1e-12)
    assert all(b <= a + 1e-9 for a, b in zip(cgs[:switch + 1], cgs[1:switch + 1]))
    assert all(b >= a - 1e-9 for a, b in zip(cgs[switch:], cgs[switch + 1:]))
    fuel = {f["tank"]: f for f in doc["fuel"]}
    assert_close(fuel["aft"]["trip_mass_kg"] / LB, 200.0, unit="lb", rtol=1e-12)
    assert_close(fuel["fwd"]["trip_mass_kg"] / LB, 100.0, unit="lb", rtol=1e-12)


# --- every phase's mass limit in turn -----------------------------------------------------------

PHASE_TYPE = lb_in_type(
    name="TEST-PHASES",
    limits="max_zero_fuel = 2200\nmax_ramp = 2500\nmax_takeoff = 2480\nmax_landing = 2400",
    stations=station("cabin", "cargo", 45, max_mass=2000),
    tanks='\n[[tank]]\nname = "main"\nfluid = "avgas"\ncapacity = "1000 lb"\nx = 45\n',
    envelopes=envelope([(30, 1000), (30, 2600), (60, 2600), (60, 1000)]))
LIMITS = {"zero_fuel": 2200, "ramp": 2500, "takeoff": 2480, "landing": 2400}


def phase_body(cargo, fuel, taxi, trip):
    return (f'[[cargo]]\nstation = "cabin"\nmass = {cargo}\n[fuel]\ntaxi = "{taxi} lb"\n'
            f'trip = "{trip} lb"\n[fuel.tanks]\nmain = "{fuel} lb"\n')


# (cargo, fuel, taxi, trip) on a 1,500 lb empty weight; each case is 10 lb over one limit only.
PHASE_CASES = {
    "zero_fuel": (710, 100, 10, 50),   # ZF 2,210; ramp 2,310; TO 2,300; LDG 2,250
    "ramp": (690, 320, 40, 100),       # ZF 2,190; ramp 2,510; TO 2,470; LDG 2,370
    "takeoff": (690, 305, 5, 100),     # ZF 2,190; ramp 2,495; TO 2,490; LDG 2,390
    "landing": (690, 260, 10, 30),     # ZF 2,190; ramp 2,450; TO 2,440; LDG 2,410
}


def _phase_masses(cargo, fuel, taxi, trip) -> dict:
    zf = 1500 + cargo
    return {"zero_fuel": zf, "ramp": zf + fuel, "takeoff": zf + fuel - taxi,
            "landing": zf + fuel - taxi - trip}


@pytest.mark.parametrize("phase", list(PHASE_CASES))
def test_each_phase_mass_limit_in_turn_with_fixes_that_work(phase):
    vt = make_type(PHASE_TYPE)
    cargo, fuel, taxi, trip = PHASE_CASES[phase]
    doc = sheet(vt, empty_lb_in(1500, 45.0), phase_body(*PHASE_CASES[phase]))
    assert doc["verdict"] == "out_of_limits"
    [v] = doc["violations"]
    assert (v["code"], v["phase"]) == ("mass_limit", phase)
    assert_close(v["limit"] / LB, LIMITS[phase], unit="lb", rtol=1e-12)
    assert_close(v["excess"] / LB, 10.0, unit="lb", rtol=1e-9)
    for p in doc["phases"]:
        assert p["in_limits"] is (p["name"] != phase)
    assert doc["fixes"], doc["fixes_note"]
    kinds = {f["kind"] for f in doc["fixes"]}
    # Fuel cannot lower the zero-fuel mass; for the other phases less fuel is an option.
    assert ("offload_fuel" in kinds) is (phase != "zero_fuel")
    assert "offload_payload" in kinds
    for f in doc["fixes"]:
        # Independent re-check of each fix, by plain arithmetic on the plan's figures.
        m = round(f["mass_kg"] / LB, 6)
        if f["kind"] == "offload_payload":
            masses = _phase_masses(cargo - m, fuel, taxi, trip)
        else:
            assert f["kind"] == "offload_fuel"
            assert fuel - m >= taxi + trip
            masses = _phase_masses(cargo, fuel - m, taxi, trip)
        assert all(masses[k] <= LIMITS[k] + 1e-9 for k in LIMITS), (f, masses)


def test_every_phase_exactly_at_its_limit_is_in_limits():
    vt = make_type(PHASE_TYPE)
    doc = sheet(vt, empty_lb_in(1500, 45.0), phase_body(700, 300, 20, 80))
    assert _phase_masses(700, 300, 20, 80) == LIMITS
    assert doc["verdict"] == "in_limits", doc["violations"]
    for p in doc["phases"]:
        assert_close(p["mass_margin_kg"], 0.0, unit="kg", atol=1e-9)


# --- stations, lateral envelopes ----------------------------------------------------------------

def test_cargo_over_a_compartment_limit_is_a_verdict_with_fixes():
    vt = shift_type()
    empty = empty_lb_in(6000, 75.0)
    doc = sheet(vt, empty, '[[cargo]]\nstation = "aft cargo"\nmass = 1010\n')
    assert doc["verdict"] == "out_of_limits"
    [v] = [v for v in doc["violations"] if v["code"] == "station_limit"]
    assert v["station"] == "aft cargo"
    assert_close(v["excess"] / LB, 10.0, unit="lb", rtol=1e-9)
    assert v["message"] == "Station 'aft cargo' holds 1010 lb, over its limit 1000 lb by 10.0 lb"
    for f in doc["fixes"]:
        assert f["kind"] in ("shift", "offload_payload")
        moved = f["mass_kg"] / LB
        assert 1010 - moved <= 1000 + 1e-9
        # Independent CG re-check against the envelope with shapely.
        arm_to = {"forward cargo": 30, None: None}[f["to_station"]]
        mass = 6000 + 1010 - (0 if arm_to else moved)
        moment = 6000 * 75 + (1010 - moved) * 150 + (moved * arm_to if arm_to else 0)
        env = Polygon([(70, 5000), (70, 8000), (80.5, 8000), (80.5, 5000)])
        assert env.buffer(1e-9).covers(Point(moment / mass, mass))


def test_lateral_envelope_is_checked_with_a_shift_to_the_other_side():
    vt = make_type(lb_in_type(
        name="TEST-LAT", kind="helicopter", limits="max_takeoff = 1600",
        stations=(station("left bin", "cargo", 100, y=-20, max_mass=100)
                  + station("right bin", "cargo", 100, y=20, max_mass=100)),
        envelopes=(envelope([(95, 1000), (95, 1600), (105, 1600), (105, 1000)])
                   + envelope([(-2, 1000), (-2, 1600), (2, 1600), (2, 1000)], name="lateral",
                              axis="lateral"))))
    doc = sheet(vt, empty_lb_in(1200, 100.0), '[[cargo]]\nstation = "right bin"\nmass = 100\n')
    # Lateral CG = 100 × 20 / 1,300 = 1.538 in: within ±2 in.
    assert doc["verdict"] == "in_limits"
    assert_close(doc["phases"][0]["cg_m"]["y"] / IN, 2000 / 1300, unit="in", rtol=1e-12)
    doc = sheet(vt, empty_lb_in(1200, 100.0, y_in=1.0),
                '[[cargo]]\nstation = "right bin"\nmass = 100\n')
    # (1,200 × 1 + 100 × 20) / 1,300 = 2.46 in: right of the 2 in limit.
    [v] = [v for v in doc["violations"] if v["phase"] == "takeoff"]
    assert (v["axis"], v["side"]) == ("lateral", "right")
    assert_close(v["excess"] / IN, 3200 / 1300 - 2, unit="in", rtol=1e-9)
    [f] = [f for f in doc["fixes"] if f["kind"] == "shift"]
    assert (f["from_station"], f["to_station"]) == ("right bin", "left bin")
    m = f["mass_kg"] / LB
    # Independent re-check: lateral CG after moving m from +20 in to −20 in.
    y = (1200 * 1 + (100 - m) * 20 - m * 20) / 1300
    assert -2 <= y <= 2 + 1e-9
    assert (1200 * 1 + (100 - (m - 1)) * 20 - (m - 1) * 20) / 1300 > 2  # whole-pound minimum


# --- ground vehicles ----------------------------------------------------------------------------

def truck_type(rear_rating: float = 5000):
    return make_type(f"""
format_version = 1
[vehicle]
name = "TEST-TRUCK"
title = "test two-axle truck"
kind = "ground_vehicle"
[units]
mass = "kg"
length = "m"
volume = "L"
[datum]
description = "front axle centreline"
[limits]
gross_rating = 12000
[[axle]]
name = "front"
x = 0.0
rating = 4000
track = 2.0
[[axle]]
name = "rear"
x = 4.0
rating = {rear_rating}
track = 1.8
[[station]]
name = "driver"
kind = "crew"
x = -0.3
y = -0.5
[[station]]
name = "box"
kind = "cargo"
x = 3.5
max_mass = 6000
x_range = [1.0, 6.0]
""")


def test_axle_loads_per_axle_and_wheel_side_by_statics():
    vt = truck_type()
    doc = sheet(vt, EmptyWeight(4000.0, 4000.0 * 1.6, 0.0),
                '[[cargo]]\nstation = "box"\nmass = 2000\nx = 3.0\n'
                '[[person]]\nseat = "driver"\nmass = 80\n')
    W = 6080.0
    mx = 4000 * 1.6 + 2000 * 3.0 + 80 * -0.3
    my = 80 * -0.5
    a = mx / W  # CG behind the front axle; L = 4 m
    rear, front = W * a / 4.0, W * (4.0 - a) / 4.0  # W_r = W·a/L, W_f = W·b/L
    axles = {r["name"]: r for r in doc["axles"]}
    assert_close(axles["front"]["load_kg"], front, unit="kg", rtol=1e-12, source="statics")
    assert_close(axles["rear"]["load_kg"], rear, unit="kg", rtol=1e-12, source="statics")
    y = my / W
    assert_close(axles["front"]["left_kg"], front * (1.0 - y) / 2.0, unit="kg", rtol=1e-12)
    assert_close(axles["rear"]["right_kg"], rear * (0.9 + y) / 1.8, unit="kg", rtol=1e-12)
    assert [p["name"] for p in doc["phases"]] == ["departure", "arrival"]
    assert doc["verdict"] == "in_limits"
    assert doc["ground_caution"].startswith("Axle-group rules are shown as an advisory")


def test_axle_overload_is_fixed_by_moving_the_load_forward():
    vt = truck_type()
    doc = sheet(vt, EmptyWeight(4000.0, 4000.0 * 1.6, 0.0),
                '[[cargo]]\nstation = "box"\nmass = 3000\nx = 5.5\n')
    # rear = (4,000 × 1.6 + 3,000 × 5.5) / 4 = 5,725 kg against 5,000 kg.
    [v] = [v for v in doc["violations"] if v["phase"] == "departure"]
    assert (v["code"], v["axle"]) == ("axle", "rear")
    assert_close(v["excess"], 725.0, unit="kg", rtol=1e-12, source="statics")
    move = [f for f in doc["fixes"] if f["kind"] == "move_load"][0]
    # 725 kg off the rear axle: 3,000 kg × d / 4 m = 725 kg → d = 0.967 m, rounded up to 0.97 m.
    assert_close(move["distance_m"], -0.97, unit="m", rtol=1e-9)
    new_rear = (4000 * 1.6 + 3000 * (5.5 - 0.97)) / 4.0
    assert new_rear <= 5000 and 1.0 <= 5.5 - 0.97 <= 6.0
    # Lengths in m are shown to 0.1 mm, the same as the sheet's arm column.
    assert move["description"] == "Move the load in 'box' 0.9700 m forward (its CG to 4.5300 m)"


def test_axle_group_rules_are_advisory_only():
    # 23 CFR 658.17: 20,000 lb on a single axle (the shipped "us-federal-interstate" rule set).
    vt = truck_type(rear_rating=10000)
    doc = sheet(vt, EmptyWeight(5000.0, 5000.0 * 2.0, 0.0),
                'axle_rules = "us-federal-interstate"\n'
                '[[cargo]]\nstation = "box"\nmass = 6000\nx = 4.5\n')
    rear = (5000 * 2.0 + 6000 * 4.5) / 4.0  # 9,250 kg: within the 10,000 kg rating
    assert rear > 20000 * LB
    over = [r for r in doc["axle_rules"] if not r["ok"]]
    assert [r["rule"] for r in over] == ["single axle"]
    assert_close(over[0]["load_kg"], rear, unit="kg", rtol=1e-12)
    assert_close(over[0]["limit_kg"], 20000 * LB, unit="kg", rtol=1e-12,
                 source="23 CFR 658.17")
    assert doc["verdict"] == "in_limits"  # advisory: never part of the verdict
    assert doc["axle_rule_set"]["caution"].startswith("Axle-group rules are shown")


# --- inputs the builder refuses, and last-minute changes ----------------------------------------

def test_an_unknown_configuration_is_refused():
    vt = shift_type()
    plan = plan_of(vt, 'configuration = "no such"\n')
    with pytest.raises(PlanError) as err:
        build_sheet(vt, empty_lb_in(6000, 75.0), plan)
    assert str(err.value) == ("configuration = 'no such': a configuration of type TEST-SHIFT: "
                              "none")


def test_compare_plans_measures_mass_and_persons_against_the_tolerance():
    vt = make_type(lb_in_type(name="TEST-LMC",
                              stations=(station("seat 1", "passenger", 80)
                                        + station("seat 2", "passenger", 80)
                                        + station("hold", "cargo", 120, max_mass=500)),
                              envelopes=envelope([(70, 1000), (70, 8000), (90, 8000),
                                                  (90, 1000)])))
    base = plan_of(vt, '[[person]]\nseat = "seat 1"\nmass = 180\n'
                       '[[cargo]]\nstation = "hold"\nmass = 100\n')
    more_cargo = plan_of(vt, '[[person]]\nseat = "seat 1"\nmass = 180\n'
                             '[[cargo]]\nstation = "hold"\nmass = 115\n')
    extra_pax = plan_of(vt, '[[person]]\nseat = "seat 1"\nmass = 180\n'
                            '[[person]]\nseat = "seat 2"\nmass = 10\n'
                            '[[cargo]]\nstation = "hold"\nmass = 100\n')
    tol = Tolerances(last_minute_mass_kg=20 * LB, last_minute_persons=0)
    r = compare_plans(base, more_cargo, tol)
    assert r.within and r.person_change == 0
    assert_close(r.mass_change_kg / LB, 15.0, unit="lb", rtol=1e-12)
    r = compare_plans(base, extra_pax, tol)
    assert not r.within and r.person_change == 1  # 10 lb, but persons tolerance is 0
    assert compare_plans(base, extra_pax, Tolerances(20 * LB, 1)).within
    moved = plan_of(vt, '[[person]]\nseat = "seat 2"\nmass = 180\n'
                        '[[cargo]]\nstation = "hold"\nmass = 100\n')
    r = compare_plans(base, moved, Tolerances(400 * LB, 5))
    assert r.person_change == 2 and math.isclose(r.mass_change_kg / LB, 360.0)


# --- invariants (property tests) ----------------------------------------------------------------

_BIG = make_type(lb_in_type(
    name="TEST-PROP", limits="max_takeoff = 20000",
    stations="".join(station(f"s{i}", "cargo", 20 + 15 * i, y=(-1) ** i * 5, max_mass=5000)
                     for i in range(6)),
    envelopes=envelope([(0, 100), (0, 20000), (200, 20000), (200, 100)])))


@settings(max_examples=40, deadline=None)
@given(st.lists(st.tuples(st.integers(0, 5), st.floats(0.5, 400)), min_size=1, max_size=8),
       st.randoms(use_true_random=False))
def test_item_order_and_zero_mass_items_do_not_change_the_sheet(loads, rnd):
    # Statics: CG = Σm·x / Σm does not depend on the order of the items (common practice).
    def body(items):
        return "".join(f'[[cargo]]\nstation = "s{i}"\nmass = {m!r}\n' for i, m in items)

    empty = empty_lb_in(3000, 70.0)
    a = sheet(_BIG, empty, body(loads), with_fixes=False)
    shuffled = list(loads)
    rnd.shuffle(shuffled)
    b = sheet(_BIG, empty, body(shuffled + [(0, 0.0)]), with_fixes=False)
    for pa, pb in zip(a["phases"], b["phases"]):
        assert_close(pb["mass_kg"], pa["mass_kg"], unit="kg", rtol=1e-12)
        assert_close(pb["cg_m"]["x"], pa["cg_m"]["x"], unit="m", rtol=1e-12)
        assert_close(pb["cg_m"]["y"], pa["cg_m"]["y"], unit="m", atol=1e-12)
    # And the CG agrees with a direct Σm·x / Σm in lb and in.
    mass = 3000 + sum(m for _, m in loads)
    cg = (3000 * 70.0 + sum(m * (20 + 15 * i) for i, m in loads)) / mass
    assert_close(a["phases"][0]["cg_m"]["x"] / IN, cg, unit="in", rtol=1e-12)
