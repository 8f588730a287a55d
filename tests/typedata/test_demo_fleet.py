"""The demo fleet (Kestrel Valley Air & Freight, invented): every type file loads, says it is
invented, has the features the demo relies on, survives the canonical round trip, and is
coherent -- the README's first-weighing readings give a plausible empty vehicle, a typical load
is in limits and an overloaded one is not.

The loading arithmetic here is deliberately plain (CG = Σ m·x / Σ m, FAA-H-8083-1) and the
envelope test uses shapely's ``covers`` (boundary counts as inside) as an independent oracle.
"""

from __future__ import annotations

import json
import re
from pathlib import Path

import pytest
from shapely.geometry import Point, Polygon

from ledger.typedata import VehicleType, load_type_file
from ledger.units import from_unit, to_unit

ROOT = Path(__file__).resolve().parents[2]
FLEET = ROOT / "demo_fleet"
FILES = sorted(FLEET.glob("*.toml"))
README = (FLEET / "README.md").read_text(encoding="utf-8")


@pytest.fixture(scope="module")
def fleet() -> dict[str, VehicleType]:
    return {t.name: t for t in (load_type_file(p) for p in FILES)}


def test_the_fleet_is_complete(fleet):
    assert sorted(fleet) == ["KV-D7", "KV-H2", "KV-P4", "KV-T20", "KV-TR75"]
    assert sorted(t.kind for t in fleet.values()) == \
        ["airplane", "airplane", "drone", "ground_vehicle", "helicopter"]


@pytest.mark.parametrize("path", FILES, ids=[p.name for p in FILES])
def test_each_file_says_it_is_invented(path):
    text = path.read_text(encoding="utf-8")
    assert "Kestrel Valley Air & Freight (invented)" in text
    assert "NOT FOR OPERATIONAL USE" in text
    # issue 13 item 22: the header says that the type, the operator and every figure are
    # invented and match no real type
    header = " ".join(line.lstrip("# ") for line in text.splitlines()[:6])
    assert "The type and the operator are INVENTED" in header
    assert "every figure" in header and "match no real" in header
    t = load_type_file(path)
    assert "(invented)" in t.title
    assert t.note == "Invented demo type. Not for operational use."


@pytest.mark.parametrize("path", FILES, ids=[p.name for p in FILES])
def test_round_trip_and_stable_hash(path):
    t = load_type_file(path)
    d = t.to_dict()
    assert VehicleType.from_dict(d) == t
    again = VehicleType.from_dict(json.loads(json.dumps(d, sort_keys=True)))
    assert again == t and again.content_hash() == t.content_hash()
    assert load_type_file(path).content_hash() == t.content_hash()
    assert re.fullmatch(r"[0-9a-f]{64}", t.content_hash())


def test_hashes_differ_between_types(fleet):
    assert len({t.content_hash() for t in fleet.values()}) == len(fleet)


def test_piston_single(fleet):
    t = fleet["KV-P4"]
    assert (t.units.mass, t.units.length, t.units.volume, t.units.moment_divisor) == \
        ("lb", "in", "USgal", 1000.0)
    assert [e.category for e in t.envelopes] == ["normal", "utility"]
    assert {tk.fluid for tk in t.tanks} == {"avgas"}
    assert [p.name for p in t.reaction_points] == ["nose", "left main", "right main"]
    normal = Polygon(t.envelope("normal").points)
    assert normal.area < normal.convex_hull.area  # the forward limit has a dent
    assert t.envelope("utility").points[2][1] == pytest.approx(1985 * 0.45359237)  # NIST SP 811
    assert t.configuration("rear-seats-out").disables_stations == ("rear left", "rear right")
    assert t.tolerances.reweigh_cg_shift_m == pytest.approx(0.4 * 0.0254)


def test_twin_turboprop(fleet):
    t = fleet["KV-T20"]
    assert (t.units.mass, t.units.length) == ("kg", "m")
    assert t.mac.lemac_m == 6.84 and t.mac.length_m == 1.87
    assert t.limits.max_zero_fuel_kg == 4560.0
    cargo = [s for s in t.stations if s.kind == "cargo"]
    assert len(cargo) == 3 and all(s.extent and s.extent.floor_load_limit_kg_m2 for s in cargo)
    wings = [t.tank("left wing"), t.tank("right wing")]
    assert all(w.fluid == "jet" and len(w.arm_table) >= 3 for w in wings)
    xs = {w.arms_at(w.quantity_of(m))[0] for w in wings for m in (100.0, 400.0, 800.0)}
    assert len(xs) > 1  # the arm changes with quantity
    # forward limit at the low-mass corner: (7.062 - 6.84) / 1.87 x 100 = 11.87 %MAC
    env = t.envelope("normal")
    assert t.mac.percent_mac(env.points[0][0]) == pytest.approx(0.222 / 1.87 * 100, abs=1e-9)
    assert t.tolerances.reweigh_cg_percent_mac == 0.4
    assert t.mass_set("kestrel-2024-survey").mass_for("adult") == 81.0


def test_helicopter_has_lateral_envelope(fleet):
    t = fleet["KV-H2"]
    assert t.kind == "helicopter"
    assert len(t.envelopes_for("lateral")) == 1 and len(t.envelopes_for("longitudinal")) == 1
    assert t.inertia.basis == "measured" and t.inertia.ixz_kg_m2 == 38.0


def test_drone(fleet):
    t = fleet["KV-D7"]
    assert t.units.length == "mm" and t.tanks == ()
    env = t.envelope("longitudinal")
    assert env.coordinates == "moment"
    # -14 mm at 2.2 kg written as the moment index -14 x 2.2 = -30.8 kg*mm
    assert env.points[0] == (pytest.approx(-14 * 2.2 * 1e-3), 2.2)
    assert t.station("battery bay").kind == "equipment"
    assert t.inertia.izz_kg_m2 == 0.137


def test_truck(fleet):
    t = fleet["KV-TR75"]
    assert t.kind == "ground_vehicle" and t.limits.gross_rating_kg == 7280.0
    assert [(a.name, a.x_m, a.rating_kg) for a in t.axles] == \
        [("front", 1.18, 2950.0), ("rear", 5.30, 5050.0)]
    box = t.station("cargo box")
    # a 5.20 m x 2.14 m floor: 11.128 m2
    assert (box.extent.x_min_m, box.extent.x_max_m, box.extent.floor_area_m2) == \
        (2.43, 7.63, pytest.approx(5.20 * 2.14))
    assert t.tank("diesel").fluid == "diesel" and t.tank("diesel").density_kg_m3 == 840.0
    assert t.envelopes == ()


# --- coherence with the README -----------------------------------------------------------------
def _readme_marks() -> dict[str, str]:
    return dict(re.findall(r"^\| (KVA-\w+)\s*\| (KV-\w+)\s*\|", README, re.M))


def _readme_readings() -> dict[str, list[tuple[str, float, float, str]]]:
    rows: dict[str, list] = {}
    for mark, point, reading, tare, unit in re.findall(
            r"^\| (KVA-\w+) \| ([a-z ]+?)\s*\|\s*([\d.]+)\s*\|\s*([\d.]+)\s*\| (\w+)\s*\|$",
            README, re.M):
        rows.setdefault(mark, []).append((point, float(reading), float(tare), unit))
    return rows


def _readme_results() -> dict[str, tuple[str, str, str]]:
    return {m: (w, x, y) for m, w, x, y in re.findall(
        r"^\| (KVA-\w+) \| ([\d.]+ \w+)\s*\| ([−\d.]+ \w+)\s*\| ([−\d.]+ \w+)\s*\|$",
        README, re.M)}


def _weigh(t: VehicleType, rows) -> tuple[float, float, float]:
    """Empty mass and CG from scale readings (FAA-H-8083-1: net = reading − tare,
    CG = Σ R·x / Σ R)."""
    m = mx = my = 0.0
    for point, reading, tare, unit in rows:
        rp = t.reaction_point(point)
        net = from_unit(reading - tare, unit)
        m += net
        mx += net * rp.x_m
        my += net * rp.y_m
    return m, mx / m, my / m


@pytest.fixture(scope="module")
def empties(fleet):
    marks = _readme_marks()
    out = {}
    for mark, rows in _readme_readings().items():
        t = fleet[marks[mark]]
        m, x, y = _weigh(t, rows)
        if mark == "KVA-T75":
            # weighed with a full tank: remove the usable fuel, keep the unusable
            # (FAA-H-8083-1 weighing chapter)
            tank = t.tank("diesel")
            fuel = tank.usable_kg()
            m, x, y = m - fuel, (m * x - fuel * tank.x_m) / (m - fuel), \
                (m * y - fuel * tank.y_m) / (m - fuel)
        out[marks[mark]] = (m, x, y)
    return out


def test_readme_names_one_vehicle_per_type_and_valid_points(fleet):
    marks = _readme_marks()
    assert sorted(marks.values()) == sorted(fleet)
    readings = _readme_readings()
    assert sorted(readings) == sorted(marks)
    for mark, rows in readings.items():
        t = fleet[marks[mark]]
        assert sorted(r[0] for r in rows) == sorted(p.name for p in t.reaction_points)


def test_readme_results_match_the_readings(fleet, empties):
    marks = _readme_marks()
    results = _readme_results()
    assert sorted(results) == sorted(marks)
    for mark, (w, x, y) in results.items():
        t = fleet[marks[mark]]
        m, cx, cy = empties[t.name]
        for text, si, _dim in ((w, m, "mass"), (x, cx, "length"), (y, cy, "length")):
            number, unit = text.replace("−", "-").split()
            decimals = len(number.split(".")[1]) if "." in number else 0
            assert to_unit(si, unit) == pytest.approx(float(number), abs=0.5 * 10 ** -decimals
                                                      + 1e-9), (mark, text)


def _fuel(t: VehicleType, tank_name: str, contents: float):
    """Fuel load above the unusable fuel (which the empty weight already holds): mass and
    moments m(q)·arm(q) − m(u)·arm(u), with ``contents`` in the display volume unit."""
    tank = t.tank(tank_name)
    q = from_unit(contents, t.units.volume)
    mq, mu = tank.mass_of(q), tank.mass_of(tank.unusable)
    (xq, yq, _), (xu, yu, _) = tank.arms_at(q), tank.arms_at(tank.unusable)
    m = mq - mu
    return (m, (mq * xq - mu * xu) / m, (mq * yq - mu * yu) / m)


def _seat(t, name, mass, unit):
    s = t.station(name)
    return (from_unit(mass, unit), s.x_m, s.y_m)


def _total(items):
    m = sum(i[0] for i in items)
    return m, sum(i[0] * i[1] for i in items) / m, sum(i[0] * i[2] for i in items) / m


def _in_envelopes(t, m, x, y) -> dict[str, bool]:
    out = {}
    for e in t.envelopes:
        c = x if e.axis == "longitudinal" else y
        if e.coordinates == "moment":
            c *= m
        out[e.name] = Polygon(e.points).covers(Point(c, m))  # oracle: shapely
    return out


def test_p4_loads(fleet, empties):
    t = fleet["KV-P4"]
    empty = empties["KV-P4"]
    typical = [empty, _seat(t, "pilot", 176, "lb"), _seat(t, "front passenger", 158, "lb"),
               _seat(t, "rear left", 149, "lb"), _seat(t, "baggage", 38, "lb"),
               _fuel(t, "left wing", 18.5), _fuel(t, "right wing", 18.5)]
    m, x, y = _total(typical)
    assert m <= t.limits.max_ramp_kg and _in_envelopes(t, m, x, y)["normal"]
    over = [empty] + [_seat(t, s, 190, "lb") for s in
                      ("pilot", "front passenger", "rear left", "rear right")] + \
        [_seat(t, "baggage", 95, "lb"), _fuel(t, "left wing", 24.8), _fuel(t, "right wing", 24.8)]
    assert _total(over)[0] > t.limits.max_takeoff_kg
    aft = [empty, _seat(t, "pilot", 172, "lb"), _seat(t, "rear left", 206, "lb"),
           _seat(t, "rear right", 198, "lb"), _seat(t, "baggage", 95, "lb"),
           _fuel(t, "left wing", 5), _fuel(t, "right wing", 5)]
    m, x, y = _total(aft)
    assert m <= t.limits.max_takeoff_kg and not _in_envelopes(t, m, x, y)["normal"]
    assert x > max(p[0] for p in t.envelope("normal").points)  # out at the aft side


def test_t20_loads(fleet, empties):
    t = fleet["KV-T20"]
    zf = [empties["KV-T20"], _seat(t, "captain", 88, "kg"), _seat(t, "first officer", 88, "kg")] \
        + [_seat(t, s, 81, "kg") for s in ("1A", "1C", "2A", "2C", "3A", "3C")] \
        + [_seat(t, "aft cabin", 165, "kg"), _seat(t, "nose locker", 65, "kg")]
    m, x, y = _total(zf)
    assert m <= t.limits.max_zero_fuel_kg and _in_envelopes(t, m, x, y)["normal"]
    ramp = zf + [_fuel(t, "left wing", 680), _fuel(t, "right wing", 680)]
    m, x, y = _total(ramp)
    assert m <= t.limits.max_ramp_kg and _in_envelopes(t, m, x, y)["normal"]
    assert 10 < t.mac.percent_mac(x) < 30
    landing = zf + [_fuel(t, "left wing", 260), _fuel(t, "right wing", 260)]
    m, x, y = _total(landing)
    assert m <= t.limits.max_landing_kg and _in_envelopes(t, m, x, y)["normal"]
    full = [empties["KV-T20"], _seat(t, "captain", 88, "kg"), _seat(t, "first officer", 88, "kg")] \
        + [_seat(t, s.name, 81, "kg") for s in t.stations if s.kind == "passenger"] \
        + [_seat(t, s.name, s.max_mass_kg, "kg") for s in t.stations if s.kind == "cargo"]
    assert _total(full)[0] > t.limits.max_zero_fuel_kg
    assert _total(full + [_fuel(t, "left wing", 1000), _fuel(t, "right wing", 1000)])[0] > \
        t.limits.max_takeoff_kg


def test_h2_loads(fleet, empties):
    t = fleet["KV-H2"]
    empty = empties["KV-H2"]
    typical = [empty, _seat(t, "pilot", 180, "lb"), _seat(t, "passenger", 170, "lb"),
               _seat(t, "baggage left", 10, "lb"), _fuel(t, "main", 15), _fuel(t, "auxiliary", 5)]
    m, x, y = _total(typical)
    assert t.limits.min_flight_kg <= m <= t.limits.max_takeoff_kg
    assert _in_envelopes(t, m, x, y) == {"longitudinal": True, "lateral": True}
    right = [empty, _seat(t, "pilot", 250, "lb"), _fuel(t, "auxiliary", 9.6),
             _seat(t, "baggage right", 45, "lb")]
    m, x, y = _total(right)
    assert _in_envelopes(t, m, x, y) == {"longitudinal": True, "lateral": False}
    over = [empty, _seat(t, "pilot", 230, "lb"), _seat(t, "passenger", 230, "lb"),
            _seat(t, "baggage left", 45, "lb"), _seat(t, "baggage right", 45, "lb"),
            _fuel(t, "main", 17.4), _fuel(t, "auxiliary", 9.6)]
    assert _total(over)[0] > t.limits.max_takeoff_kg


def test_d7_loads(fleet, empties):
    t = fleet["KV-D7"]
    empty = empties["KV-D7"]
    typical = [empty, _seat(t, "battery bay", 1.30, "kg"), _seat(t, "payload", 0.85, "kg"),
               _seat(t, "gimbal", 0.55, "kg")]
    m, x, y = _total(typical)
    assert m <= t.limits.max_takeoff_kg
    assert _in_envelopes(t, m, x, y) == {"longitudinal": True, "lateral": True}
    heaviest = [empty] + [_seat(t, s.name, s.max_mass_kg, "kg") for s in t.stations]
    assert _total(heaviest)[0] > t.limits.max_takeoff_kg


def test_tr75_loads(fleet, empties):
    t = fleet["KV-TR75"]
    front, rear = t.axle("front"), t.axle("rear")
    wheelbase = rear.x_m - front.x_m

    def axle_loads(items):
        # W_r = W·a/L, W_f = W − W_r (a: CG aft of the front axle, L: wheelbase)
        m, x, _ = _total(items)
        w_rear = m * (x - front.x_m) / wheelbase
        return m, m - w_rear, w_rear

    base = [empties["KV-TR75"], _seat(t, "driver", 85, "kg"), _seat(t, "cab passenger", 80, "kg")]
    m, wf, wr = axle_loads(base + [_seat(t, "cargo box", 2900, "kg"), _fuel(t, "diesel", 110)])
    assert m <= t.limits.gross_rating_kg and wf <= front.rating_kg and wr <= rear.rating_kg
    box = t.station("cargo box")
    assert 2900 / box.extent.floor_area_m2 <= box.extent.floor_load_limit_kg_m2
    m, wf, wr = axle_loads(base + [(3850.0, 7.2, 0.0), _fuel(t, "diesel", 135)])
    assert m > t.limits.gross_rating_kg and wr > rear.rating_kg
