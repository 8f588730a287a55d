"""Tests of the type-file parser: one bad file per mistake with its exact message, and the
behaviour of valid files (defaults, units, canonical form and content hash)."""

from __future__ import annotations

import json
import random
import re
import subprocess
import sys
import tomllib
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ledger.errors import EnvelopeError, NotFoundError, TypeDataError, UnitError
from ledger.typedata import (
    STANDARD_MASS_SETS,
    VehicleType,
    load_type_file,
    parse_type,
    parse_type_text,
)
from ledger.typedata.model import SHAPE_DIMENSIONS

HERE = Path(__file__).resolve().parent
BAD = HERE / "bad"

# Each bad file holds exactly one mistake (its first line says which). The message is what the
# user sees after "Error: " -- the file, the field, the value as written and what is allowed.
BAD_FILES = [
    ('ambiguous_gallon', UnitError,
     "tank['main'].capacity = '20 gal': 'gal' is ambiguous; volume units: m3, L, USgal, impgal, "
     "ft3, in3; mass units: kg, g, t, lb, slug. Write USgal (3.785411784 L) or impgal (4.54609 L)"),
    ('area_without_unit', UnitError,
     "station['baggage'].floor_area = 6: a unit is required; area units: length2 such as m2, ft2 "
     "(lengths: m, cm, mm, in, ft)"),
    ('arm_outside_x_range', TypeDataError,
     "station['baggage'].x = 95: expected an arm within x_range (82 in to 94 in)"),
    ('arm_table_ragged', TypeDataError,
     "tank['main'].arm_table[2].y = (missing): expected y in every row of arm_table or in none"),
    ('arm_table_short', TypeDataError,
     "tank['main'].arm_table[2].quantity = 15: expected at least the capacity (20 USgal); the "
     "table must cover the tank from unusable to capacity"),
    ('arm_table_unsorted', TypeDataError,
     "tank['main'].arm_table[3].quantity = 8: expected more than the row before (12 USgal); rows "
     "must be in strictly increasing quantity"),
    ('axle_group_unknown_axle', TypeDataError,
     "axle_group['rear tandem'].axles[2] = 'rear 3': expected one of the axles: front, rear 1, "
     "rear 2"),
    ('axles_on_airplane', TypeDataError,
     "axle = {'name': 'main', 'x': 58.0, 'rating': 2000}: allowed only for kind ground_vehicle; an "
     "airplane is weighed on its [[reaction_point]]s"),
    ('bad_kind', TypeDataError,
     "vehicle.kind = 'aeroplane': expected one of airplane, helicopter, drone, ground_vehicle. Did "
     "you mean 'airplane'?"),
    ('bad_type_name', TypeDataError,
     "vehicle.name = 'TEST A1': expected 1-40 letters, digits, '.', '_' or '-', starting with a "
     "letter or digit"),
    ('bool_mass', TypeDataError,
     "station['baggage'].max_mass = true: expected the maximum mass of a cargo station: a number "
     "or a string such as '82 kg', got a boolean"),
    ('cargo_without_max_mass', TypeDataError,
     "station['baggage'].max_mass = (missing): required: the maximum mass of a cargo station"),
    ('density_without_unit', UnitError,
     "tank['main'].density = 6: a unit is required; density units: mass/volume such as kg/L, "
     "lb/USgal (masses: kg, g, t, lb, slug; volumes: m3, L, USgal, impgal, ft3, in3)"),
    ('disables_unknown_station', TypeDataError,
     "configuration['seats-out'].disables_stations[1] = 'rear left': expected a station name: "
     "pilot, baggage"),
    ('display_unit_wrong', UnitError,
     "units.mass = 'in': 'in' is a unit of length, not of mass; mass units: kg, g, t, lb, slug"),
    ('duplicate_station', TypeDataError,
     "station[2].name = 'Pilot': already used by station[1]; station and tank names must differ "
     "(ignoring case)"),
    ('duplicate_toml_key', TypeDataError,
     "line 25 = 'x = 38.0': not valid TOML: Cannot overwrite a value (column 9)"),
    ('empty_file', TypeDataError,
     'format_version = (missing): required: format_version = 1 at the top of the file'),
    ('envelope_crossing', EnvelopeError,
     "envelope['normal'].points = [(35, 1200), (47, 2000), (35, 2000), (47, 1200)]: a simple "
     "polygon; edge 0 (35, 1200)-(47, 2000) and edge 2 (35, 2000)-(47, 1200) cross at (41, 1600). "
     "List the points in order round the boundary"),
    ('envelope_point_unit', UnitError,
     "envelope['normal'].points[4][2] = '1200 in': 'in' is a unit of length, not of mass; mass "
     "units: kg, g, t, lb, slug"),
    ('envelope_two_points', EnvelopeError,
     "envelope['normal'].points = [(35, 1200), (47, 2000)]: at least 3 distinct points; got 2 (a "
     "closing point equal to the first is not counted)"),
    ('floor_limit_without_area', TypeDataError,
     "station['baggage'].floor_load_limit = '50 lb/ft2': needs station['baggage'].floor_area, the "
     "loaded floor area"),
    ('ground_limit_on_airplane', TypeDataError,
     'limits.gross_rating = 2000: allowed only for kind ground_vehicle; an airplane uses max_ramp, '
     'max_takeoff, max_landing, max_zero_fuel, min_flight'),
    ('ground_one_axle', TypeDataError,
     'axle = (1 given): a ground vehicle needs at least two [[axle]] tables'),
    ('ground_takeoff_limit', TypeDataError,
     'limits.max_takeoff = 7500: not for a ground vehicle; use gross_rating and the axle ratings'),
    ('helicopter_no_lateral', TypeDataError,
     'envelope[*].axis = [\'longitudinal\']: a helicopter needs at least one [[envelope]] with '
     'axis = "lateral" as well as a longitudinal one'),
    ('inertia_mixed_keys', TypeDataError,
     'inertia.rx = 0.25: unknown key for basis = "measured"; allowed here: basis, ixx, iyy, izz, '
     'ixz, ixy, iyz, note'),
    ('inertia_triangle', TypeDataError,
     "inertia.izz = '3500 kg*m2': expected at most ixx + iyy (3000 kg*m2); no body has a larger "
     "one"),
    ('inertia_without_unit', UnitError,
     'inertia.ixx = 1200: a unit is required; moment of inertia units: mass*length2 such as kg*m2, '
     'slug*ft2 (masses: kg, g, t, lb, slug; lengths: m, cm, mm, in, ft)'),
    ('landing_above_takeoff', TypeDataError,
     'limits.max_landing = 2100: expected at most max_takeoff (2000 lb)'),
    ('load_share_sum', TypeDataError,
     "axle_group['rear tandem'].load_share = [0.5, 0.6]: expected ratios that sum to 1 (these sum "
     "to 1.1)"),
    ('mass_set_builtin_name', TypeDataError,
     "mass_set['easa-crew'].name = 'easa-crew': the name of a built-in set; choose another name "
     "(built-in: faa-light-170lb, faa-ac120-27e-summer, faa-ac120-27e-winter, easa-crew)"),
    ('missing_format_version', TypeDataError,
     'format_version = (missing): required: format_version = 1 at the top of the file'),
    ('missing_name', TypeDataError,
     'vehicle.name = (missing): required: a type name, e.g. "KV-P4"'),
    ('missing_takeoff', TypeDataError,
     'limits.max_takeoff = (missing): required: the maximum take-off mass of an airplane'),
    ('missing_volume_unit', TypeDataError,
     'units.volume = (missing): required: a volume unit (m3, L, USgal, impgal, ft3, in3) when '
     'there are tanks'),
    ('negative_mass', TypeDataError,
     "station['baggage'].max_mass = -100: expected the maximum mass of a cargo station greater "
     "than 0"),
    ('no_longitudinal_envelope', TypeDataError,
     'envelope[*].axis = [\'lateral\']: an airplane needs at least one [[envelope]] with axis = '
     '"longitudinal"'),
    ('nonfinite_mass', UnitError,
     'limits.max_takeoff = nan: not a finite number; a mass must be a finite number'),
    ('percent_mac_without_mac', TypeDataError,
     'tolerances.reweigh_cg_percent_mac = 0.5: needs a [mac] table; without one use '
     'reweigh_cg_shift (a length)'),
    ('persons_on_cargo', TypeDataError,
     "station['baggage'].persons = 2: allowed only on crew and passenger stations"),
    ('point_not_pair', TypeDataError,
     "envelope['normal'].points[3] = [47.0, 2000, 5]: expected a point [cg, mass]"),
    ('shape_bad_radius', TypeDataError,
     "configuration['pod'].item['pod'].shape.inner_radius = 9: expected less than the radius "
     "(8 in)"),
    ('station_not_table', TypeDataError,
     "station = 'pilot': expected an array of tables [[station]], got a string"),
    ('station_tank_same_name', TypeDataError,
     "tank[1].name = 'baggage': already used by station[2]; station and tank names must differ "
     "(ignoring case)"),
    ('syntax_error', TypeDataError,
     "line 18 = 'max_takeoff 2000': not valid TOML: Expected '=' after a key in a key/value pair "
     "(column 13)"),
    ('tank_arms_twice', TypeDataError,
     "tank['main'].x = 48: give the arms either as x, y, z or in arm_table, not both"),
    ('thousands_separator', UnitError,
     "limits.max_takeoff = '2,000 lb': commas are not accepted; write a mass without thousands "
     "separators and with '.' for decimals, e.g. '82 kg'. Write '2000 lb'"),
    ('unknown_category', TypeDataError,
     "envelope['normal'].category = 'normall': expected one of normal, utility, acrobatic, "
     "commuter, transport, restricted. Did you mean 'normal'?"),
    ('unknown_fluid', TypeDataError,
     "tank['main'].fluid = 'kerosene': expected one of avgas, mogas, jet, oil, water, diesel"),
    ('unknown_occupant', TypeDataError,
     "station['pilot'].occupant = 'pilot': expected one of flight_crew, cabin_crew, adult, child"),
    ('unknown_station_key', TypeDataError,
     "station['baggage'].max_mas = 100: unknown key; allowed here: name, kind, x, y, z, max_mass, "
     "persons, occupant, x_range, floor_area, floor_load_limit, note. Did you mean 'max_mass'?"),
    ('unknown_top_key', TypeDataError,
     "staton = [{'name': 'baggage', 'kind': 'cargo', 'x': 95.0, 'max_mas...: unknown key; allowed "
     "here: format_version, vehicle, units, datum, mac, limits, station, tank, envelope, "
     "reaction_point, inertia, axle, axle_group, configuration, tolerances, mass_set. Did you mean "
     "'station'?"),
    ('unknown_unit', UnitError,
     "station['baggage'].max_mass = '100 lbz': unknown unit 'lbz'; mass units: kg, g, t, lb, slug"),
    ('unusable_exceeds_capacity', TypeDataError,
     "tank['main'].unusable = 25: expected less than the capacity (20 USgal)"),
    ('unusable_wrong_dimension', UnitError,
     "tank['main'].unusable = '6 lb': 'lb' is a unit of mass, not of volume; volume units: m3, L, "
     "USgal, impgal, ft3, in3"),
    ('vehicle_not_table', TypeDataError,
     "vehicle = 'TEST-A1': expected a table [vehicle], got a string"),
    ('wrong_dimension', UnitError,
     "tank['main'].x = '48 lb': 'lb' is a unit of mass, not of length; length units: m, cm, mm, "
     "in, ft"),
    ('wrong_format_version', TypeDataError,
     'format_version = 2: expected 1; this wbledger reads format_version 1'),
]


@pytest.mark.parametrize("stem, error, message", BAD_FILES, ids=[c[0] for c in BAD_FILES])
def test_bad_file(stem, error, message):
    path = BAD / f"{stem}.toml"
    with pytest.raises(error) as info:
        load_type_file(path)
    assert str(info.value) == f"{path}: {message}"
    assert info.value.source == str(path)
    assert info.value.exit_code == 2
    assert "\n" not in str(info.value)


def test_every_bad_file_is_in_the_table():
    on_disk = sorted(p.stem for p in BAD.glob("*.toml"))
    assert on_disk == sorted(c[0] for c in BAD_FILES)
    assert len(on_disk) >= 24


def test_bad_files_say_what_they_break():
    for p in BAD.glob("*.toml"):
        first = p.read_text(encoding="utf-8").splitlines()[0]
        assert first.startswith("# Bad type file: "), p.name


# --- a small valid type, varied in the tests below ---------------------------------------------
GOOD = """
format_version = 1

[vehicle]
name = "TEST-A1"
title = "Test airplane (invented)"
kind = "airplane"

[units]
mass = "lb"
length = "in"
volume = "USgal"
moment_divisor = 1000

[datum]
description = "Firewall front face (invented)"

[limits]
max_takeoff = 2000
max_landing = "1950 lb"

[[station]]
name = "pilot"
kind = "crew"
x = 37.0

[[station]]
name = "rear bench"
kind = "passenger"
x = 70.0
persons = 2
occupant = "child"

[[station]]
name = "baggage"
kind = "cargo"
x = "2.413 m"
max_mass = "45 kg"

[[tank]]
name = "main"
fluid = "avgas"
capacity = 20
unusable = 1
arm_table = [
  { quantity = 0, x = 46.0, z = 40.0 },
  { quantity = 10, x = 47.0, z = 41.0 },
  { quantity = 20, x = 49.0, z = 42.0 },
]
y = -12.0

[[envelope]]
name = "normal"
category = "normal"
axis = "longitudinal"
points = [[35.0, 1200], [35.0, 2000], [47.0, 2000], [47.0, 1200]]
"""


def good(**changes) -> dict:
    data = tomllib.loads(GOOD)
    for dotted, value in changes.items():
        *path, last = dotted.split("__")
        node = data
        for p in path:
            node = node[int(p)] if p.isdigit() else node[p]
        node[last] = value
    return data


def test_good_file_parses_to_si():
    t = parse_type_text(GOOD, source="good.toml")
    assert (t.name, t.kind, t.title) == ("TEST-A1", "airplane", "Test airplane (invented)")
    assert t.units.mass == "lb" and t.units.moment_unit == "lb*in"
    # exact definitions, NIST SP 811 appendix B: 1 lb = 0.45359237 kg, 1 in = 0.0254 m
    assert t.limits.max_takeoff_kg == pytest.approx(2000 * 0.45359237, rel=1e-15)
    assert t.limits.max_landing_kg == pytest.approx(1950 * 0.45359237, rel=1e-15)
    assert t.limits.max_ramp_kg is None and t.limits.gross_rating_kg is None
    pilot = t.station("pilot")
    assert pilot.x_m == pytest.approx(37 * 0.0254) and pilot.y_m == 0.0 and pilot.z_m is None
    assert (pilot.persons, pilot.occupant_class, pilot.is_seat) == (1, "flight_crew", True)
    bench = t.station("rear bench")
    assert (bench.persons, bench.occupant_class) == (2, "child")
    bag = t.station("baggage")
    assert (bag.persons, bag.occupant_class, bag.max_mass_kg) == (0, None, 45.0)
    assert bag.x_m == pytest.approx(2.413)
    assert t.datum == "Firewall front face (invented)"
    assert t.mac is None and t.inertia is None and t.axles == () and t.configurations == ()
    assert t.tolerances.last_minute_mass_kg == 0.0 and t.tolerances.reweigh_mass_percent is None


def test_tank_arm_table_and_nominal_density():
    t = parse_type_text(GOOD, source="good.toml")
    tank = t.tank("main")
    assert tank.basis == "volume" and tank.quantity_unit == "m3"
    gal = 3.785411784e-3  # m3, NIST SP 811 appendix B (exact)
    assert tank.capacity == pytest.approx(20 * gal) and tank.unusable == pytest.approx(gal)
    # nominal avgas 6.0 lb/USgal (FAA-H-8083-30 ch. 4 standard weights)
    assert tank.density_kg_m3 == pytest.approx(6.0 * 0.45359237 / gal, rel=1e-15)
    assert tank.density_from_file is False and tank.is_fuel
    assert tank.usable_kg() == pytest.approx(19 * 6.0 * 0.45359237, rel=1e-12)
    assert tank.capacity_kg(800.0) == pytest.approx(20 * gal * 800.0)
    # y given once for the tank applies to every row; z comes from the rows
    x, y, z = tank.arms_at(5 * gal)
    assert (x / 0.0254, y / 0.0254, z / 0.0254) == pytest.approx((46.5, -12.0, 40.5))
    x, y, z = tank.arms_at(15 * gal)
    assert x / 0.0254 == pytest.approx(48.0)
    # the full-tank arms are the last row; beyond capacity the last row is used
    assert tank.x_m == pytest.approx(49 * 0.0254) and tank.arms_at(1.0)[0] == tank.x_m
    assert tank.mass_of(tank.quantity_of(50.0)) == pytest.approx(50.0)


def test_tank_by_mass_and_measured_density():
    data = good(tank__0__capacity="60 kg", tank__0__unusable="2 kg", tank__0__density="0.72 kg/L")
    del data["tank"][0]["arm_table"]
    data["tank"][0]["x"] = 48.0
    t = parse_type(data, source="x.toml")
    tank = t.tank("main")
    assert (tank.basis, tank.capacity, tank.unusable) == ("mass", 60.0, 2.0)
    assert tank.density_kg_m3 == pytest.approx(720.0) and tank.density_from_file
    assert tank.usable_kg() == 58.0 and tank.arm_table == ()
    assert tank.arms_at(10.0) == (tank.x_m, tank.y_m, tank.z_m)


def test_envelope_closing_point_does_not_change_the_type():
    a = parse_type(good(), source="a.toml")
    closed = good()
    closed["envelope"][0]["points"] = closed["envelope"][0]["points"] + [[35.0, 1200]]
    b = parse_type(closed, source="b.toml")
    assert a == b and a.content_hash() == b.content_hash()
    assert len(b.envelope("normal").points) == 4


def test_moment_envelope_bare_numbers_are_indices():
    data = good()
    env = data["envelope"][0]
    env["coordinates"] = "moment"
    env["points"] = [[42.0, 1200], [70.0, 2000], [94.0, 2000], ["56400 lb*in", 1200]]
    t = parse_type(data, source="m.toml")
    pts = t.envelope("normal").points
    lbin = 0.45359237 * 0.0254  # kg*m per lb*in, NIST SP 811 appendix B
    assert pts[0][0] == pytest.approx(42.0 * 1000 * lbin, rel=1e-15)   # index x divisor 1000
    assert pts[3][0] == pytest.approx(56400 * lbin, rel=1e-15)         # explicit unit: as is
    assert t.envelope("normal").coordinates == "moment"


def test_hash_ignores_layout_comments_and_spelling():
    a = parse_type_text(GOOD, source="a.toml")
    b_text = ("# a comment\n" + GOOD).replace("max_takeoff = 2000", "max_takeoff = \"2000 lbs\"")
    b_text = b_text.replace('mass = "lb"', 'mass = "lbs"')
    b = parse_type_text(b_text, source="b.toml")
    assert a == b and a.content_hash() == b.content_hash()
    c = parse_type_text(GOOD.replace("max_takeoff = 2000", "max_takeoff = 2001"), source="c")
    assert c.content_hash() != a.content_hash()


@settings(max_examples=60, deadline=None)
@given(seed=st.integers(0, 2**32 - 1))
def test_key_order_does_not_matter(seed):
    rnd = random.Random(seed)

    def shuffle(node):
        if isinstance(node, dict):
            items = list(node.items())
            rnd.shuffle(items)
            return {k: shuffle(v) for k, v in items}
        if isinstance(node, list):
            return [shuffle(v) for v in node]
        return node

    base = parse_type(good(), source="a.toml")
    other = parse_type(shuffle(good()), source="b.toml")
    assert other == base and other.content_hash() == base.content_hash()


def test_to_dict_round_trip_and_json():
    t = parse_type_text(GOOD, source="good.toml")
    d = t.to_dict()
    assert d["canonical_version"] == 1
    assert json.loads(json.dumps(d)) == d  # plain JSON types only
    assert VehicleType.from_dict(d) == t
    assert VehicleType.from_dict(json.loads(t.canonical_json())) == t
    assert d["limits"]["max_takeoff_kg"] == pytest.approx(907.18474)
    assert d["stations"][0]["x_m"] == pytest.approx(0.9398)
    assert d["units"] == {"mass": "lb", "length": "in", "volume": "USgal",
                          "moment_divisor": 1000.0}


@pytest.mark.parametrize("mutate, message", [
    (lambda d: d.update(canonical_version=2),
     "stored type.canonical_version = 2: expected 1; this wbledger cannot read it"),
    (lambda d: d["limits"].update(max_takeoff_kg="heavy"),
     "stored type.limits.max_takeoff_kg = 'heavy': expected a finite number in the stored type"),
    (lambda d: d["stations"][0].update(colour="red"),
     "stored type.stations[1].colour = 'red': expected no such key in the stored type"),
    (lambda d: d.pop("datum"),
     "stored type.datum = (missing): expected a value in the stored type"),
])
def test_from_dict_rejects_damaged_data(mutate, message):
    d = parse_type_text(GOOD, source="good.toml").to_dict()
    mutate(d)
    with pytest.raises(TypeDataError) as info:
        VehicleType.from_dict(d)
    assert str(info.value) == message


def test_lookups_and_not_found():
    t = parse_type_text(GOOD, source="good.toml")
    assert t.station("PILOT").name == "pilot"  # case-insensitive fallback
    with pytest.raises(NotFoundError) as info:
        t.station("co-pilot")
    assert str(info.value) == ("no station 'co-pilot'. stations of type TEST-A1: pilot, "
                               "rear bench, baggage")
    with pytest.raises(NotFoundError):
        t.tank("aux")
    assert t.envelopes_for("longitudinal") == t.envelopes
    assert t.envelopes_for("lateral") == ()
    assert t.envelopes_for("longitudinal", "utility") == ()
    assert t.reference_mass_kg == t.limits.max_landing_kg


def test_standard_mass_sets():
    # FAA-H-8083-30 ch. 4: crew and passengers 170 lb each
    light = STANDARD_MASS_SETS["faa-light-170lb"]
    assert light.mass_for("adult") == pytest.approx(170 * 0.45359237)
    assert light.mass_for("child") is None
    # EASA NCC.POL.105: flight crew 85 kg, cabin crew 75 kg
    easa = STANDARD_MASS_SETS["easa-crew"]
    assert (easa.mass_for("flight_crew"), easa.mass_for("cabin_crew")) == (85.0, 75.0)
    data = good()
    data["mass_set"] = [{"name": "ours", "adult": "80 kg", "child": 30}]
    t = parse_type(data, source="x.toml")
    ours = t.mass_set("ours")
    assert ours.masses_kg == (("adult", 80.0), ("child", pytest.approx(30 * 0.45359237)))
    assert t.mass_set("easa-crew") is easa
    with pytest.raises(NotFoundError, match="no standard mass set 'nope'. available: ours, "):
        t.mass_set("nope")


def test_ground_vehicle_axle_groups():
    text = (BAD / "load_share_sum.toml").read_text(encoding="utf-8").replace(
        "load_share = [0.5, 0.6]", "load_share = [0.45, 0.55]\nrating = \"7.5 t\"")
    t = parse_type_text(text, source="truck.toml")
    group = t.axle_groups[0]
    assert (group.name, group.axles, group.load_share, group.rating_kg) == \
        ("rear tandem", ("rear 1", "rear 2"), (0.45, 0.55), 7500.0)
    assert [a.group for a in t.axles] == [None, "rear tandem", "rear tandem"]
    assert t.reference_mass_kg == 7500.0
    # a ground vehicle without reaction points is weighed axle by axle
    assert [(p.name, p.x_m) for p in t.weighing_points()] == \
        [("front", 0.0), ("rear 1", 3.6), ("rear 2", 4.9)]
    equal = parse_type_text(text.replace("load_share = [0.45, 0.55]\n", ""), source="t2")
    assert equal.axle_groups[0].load_share == (0.5, 0.5)


def test_configuration_and_shape():
    data = good()
    data["configuration"] = [{
        "name": "pod", "action": "install", "description": "belly pod",
        "item": [{"name": "pod", "mass": 40, "x": 50.0, "z": "-0.3 m",
                  "shape": {"kind": "cylinder", "radius": 8, "length": "1.5 m", "axis": "x"}}],
    }, {"name": "bench-out", "action": "remove", "disables_stations": ["rear bench"],
        "item": [{"name": "bench", "mass": "12 kg", "x": 70.0}]}]
    t = parse_type(data, source="x.toml")
    pod = t.configuration("pod")
    assert pod.mass_change_kg == pytest.approx(40 * 0.45359237)
    item = pod.items[0]
    assert item.z_m == -0.3 and item.y_m == 0.0
    assert (item.shape.kind, item.shape.axis, item.shape.length_m) == ("cylinder", "x", 1.5)
    assert item.shape.radius_m == pytest.approx(8 * 0.0254) and item.shape.width_m is None
    out = t.configuration("bench-out")
    assert out.mass_change_kg == -12.0 and out.disables_stations == ("rear bench",)
    assert VehicleType.from_dict(t.to_dict()) == t


def test_inertia_forms():
    data = good()
    data["inertia"] = {"basis": "measured", "ixx": "1200 kg*m2", "iyy": "1 slug*ft2",
                       "izz": "1300 kg*m2", "ixz": "-40 kg*m2"}
    with pytest.raises(TypeDataError, match=r"inertia.izz = '1300 kg\*m2': expected at most"):
        parse_type(data, source="x.toml")
    data["inertia"].update(iyy="1800 kg*m2")
    m = parse_type(data, source="x.toml").inertia
    assert (m.basis, m.ixx_kg_m2, m.iyy_kg_m2, m.ixz_kg_m2, m.ixy_kg_m2) == \
        ("measured", 1200.0, 1800.0, -40.0, 0.0)
    data["inertia"] = {"basis": "gyration", "rx": 0.25, "ry": 0.38, "rz": 0.39,
                       "span": "36 ft", "length": "27 ft"}
    t = parse_type(data, source="x.toml")
    g = t.inertia
    assert (g.basis, g.rx, g.span_m) == ("gyration", 0.25, pytest.approx(36 * 0.3048))
    assert VehicleType.from_dict(t.to_dict()) == t


def test_parse_type_needs_a_table():
    with pytest.raises(TypeDataError) as info:
        parse_type([1, 2], source="x.toml")
    assert str(info.value) == "x.toml: (document) = [1, 2]: expected a TOML table"


def test_missing_and_unreadable_files(tmp_path):
    with pytest.raises(TypeDataError) as info:
        load_type_file(tmp_path / "nope.toml")
    assert str(info.value) == f"file = '{tmp_path / 'nope.toml'}': no such file"
    binary = tmp_path / "binary.toml"
    binary.write_bytes(b"format_version = 1\n\xff\xfe")
    with pytest.raises(TypeDataError) as info:
        load_type_file(binary)
    assert str(info.value) == (f"file = '{binary}': not UTF-8 text (byte 19); save the file "
                               "as UTF-8")


def test_syntax_error_at_end_of_document():
    with pytest.raises(TypeDataError) as info:
        parse_type_text('format_version = 1\n[vehicle\n', source="t.toml")
    assert str(info.value).startswith("t.toml: line 2 = '[vehicle': not valid TOML: ")


def test_importing_typedata_does_not_load_numpy():
    code = ("import sys, ledger.typedata; "
            "print(sorted(m for m in ('numpy', 'sqlalchemy', 'ledger.core.envelope') "
            "if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         check=True, cwd=HERE.parents[1])
    assert out.stdout.strip() == "[]"


# --- the reference page demo_fleet/FORMAT.md ---------------------------------------------------
FORMAT_MD = (HERE.parents[1] / "demo_fleet" / "FORMAT.md").read_text(encoding="utf-8")


def test_format_page_example_parses():
    blocks = re.findall(r"```toml\n(.*?)```", FORMAT_MD, re.S)
    assert len(blocks) == 1
    t = parse_type_text(blocks[0], source="FORMAT.md")
    assert t.name == "EX-1" and t.station("baggage").extent.floor_area_m2 == \
        pytest.approx(4.1 * 0.3048 ** 2)


def test_format_page_documents_every_key():
    from ledger.typedata import type_keys as P

    keys = set(P.TOP_KEYS + P.VEHICLE_KEYS + P.UNITS_KEYS + P.DATUM_KEYS + P.MAC_KEYS
               + P.LIMIT_KEYS + P.STATION_KEYS + P.TANK_KEYS + P.ARM_ROW_KEYS
               + P.ENVELOPE_KEYS + P.REACTION_KEYS + P.AXLE_KEYS + P.AXLE_GROUP_KEYS
               + P.TOLERANCE_KEYS + P.CONFIG_KEYS + P.ITEM_KEYS + P.MASS_SET_KEYS)
    keys |= {k for ks in P.INERTIA_KEYS.values() for k in ks}
    keys |= {k for ks in SHAPE_DIMENSIONS.values() for k in ks}
    missing = sorted(k for k in keys if f"`{k}`" not in FORMAT_MD)
    assert missing == []


def test_format_page_error_examples_are_real(tmp_path):
    lines = re.findall(r"^my-type\.toml: (.*)$", FORMAT_MD, re.M)
    assert len(lines) == 4
    produced = []
    for stem in ("unknown_unit", "unusable_exceeds_capacity", "unknown_station_key",
                 "syntax_error"):
        path = tmp_path / "my-type.toml"
        path.write_text((BAD / f"{stem}.toml").read_text(encoding="utf-8"), encoding="utf-8")
        with pytest.raises((TypeDataError, UnitError)) as info:
            load_type_file(path)
        produced.append(str(info.value).split(": ", 1)[1])
    assert produced == lines
