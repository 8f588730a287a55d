"""``wbledger inertia``: the command end to end, on SQLite and PostgreSQL.

The figures are checked against the parallel-axis build-up written out here (SAWE practice, as
in the domain notes) with the box formula of the standard tables (Beer & Johnston: Ixx =
m(b² + c²)/12 and cyclic), and the fuel against the loading sheet of the same plan. The type,
vehicle and plan are invented for the test.
"""

from __future__ import annotations

import csv
import json

import pytest

from ledger.testing import assert_close

TYPE = """
format_version = 1
[vehicle]
name = "TI-2"
title = "invented two-seat airplane for the inertia CLI tests"
kind = "airplane"
[units]
mass = "kg"
length = "m"
volume = "L"
[datum]
description = "invented"
[limits]
max_takeoff = 1100
max_ramp = 1105
[[station]]
name = "left seat"
kind = "crew"
x = 2.0
y = -0.3
z = 0.9
[[station]]
name = "right seat"
kind = "crew"
x = 2.0
y = 0.3
z = 0.9
[[station]]
name = "baggage"
kind = "cargo"
x = 3.0
z = 0.7
max_mass = 50
[[tank]]
name = "main"
fluid = "avgas"
capacity = 150
unusable = 5
x = 2.2
z = 1.3
[[reaction_point]]
name = "nose"
x = 0.5
[[reaction_point]]
name = "left main"
x = 2.6
y = -1.0
[[reaction_point]]
name = "right main"
x = 2.6
y = 1.0
[[envelope]]
name = "normal"
category = "normal"
axis = "longitudinal"
points = [[1.8, 500], [1.8, 1105], [2.6, 1105], [2.6, 500]]
[inertia]
basis = "measured"
ixx = "900 kg*m2"
iyy = "1100 kg*m2"
izz = "1800 kg*m2"
ixz = "15 kg*m2"
[[configuration]]
name = "pod"
action = "install"
description = "invented cargo pod"
[[configuration.item]]
name = "pod"
mass = 30
x = 2.5
z = 0.2
shape = { kind = "box", length = 1.6, width = 0.5, height = 0.4 }
"""

PLAN = """
plan_format = 1
vehicle = "KV-I1"
[[person]]
seat = "left seat"
mass = 80
[[cargo]]
station = "baggage"
mass = 20
[fuel]
tanks = { main = "100 L" }
taxi = "3 kg"
trip = "40 kg"
"""

REG = "KV-I1"
READINGS = {"nose": 210.0, "left main": 250.0, "right main": 240.0}  # invented, kg
Z_EMPTY = 0.85  # invented vertical CG, m


@pytest.fixture
def fleet(cli, tmp_path):
    """A database with the type, one vehicle, its weighing and (unless told) its vertical CG."""
    from ledger.store.db import make_engine, session_scope
    from ledger.store.entries import record_cg_height, record_weighing

    f = tmp_path / "ti-2.toml"
    f.write_text(TYPE, encoding="utf-8")
    assert cli("init").exit_code == 0
    assert cli("type", "import", str(f)).exit_code == 0
    assert cli("vehicle", "add", REG, "--type", "TI-2").exit_code == 0
    eng = make_engine(cli.db_url)
    try:
        with session_scope(eng) as s:
            record_weighing(s, REG, READINGS, actor="test")

        def set_z():
            with session_scope(eng) as s:
                record_cg_height(s, REG, Z_EMPTY, actor="test")
    finally:
        eng.dispose()
    cli.set_z = set_z
    plan = tmp_path / "plan.toml"
    plan.write_text(PLAN, encoding="utf-8")
    cli.plan = plan
    return cli


def _empty():
    m = sum(READINGS.values())
    x = (READINGS["nose"] * 0.5 + (READINGS["left main"] + READINGS["right main"]) * 2.6) / m
    y = (READINGS["right main"] - READINGS["left main"]) * 1.0 / m
    return m, x, y


def test_inertia_of_the_empty_vehicle_with_a_configuration(fleet):
    fleet.set_z()
    r = fleet("inertia", REG, "--configuration", "pod", "--json")
    assert r.exit_code == 0, r.stderr
    doc = json.loads(r.stdout)
    m0, x0, y0 = _empty()
    # Parallel-axis build-up about the combined CG (SAWE practice) of the empty vehicle with its
    # measured tensor and a 30 kg box (Beer & Johnston box formula).
    mp, xp, yp, zp = 30.0, 2.5, 0.0, 0.2
    M = m0 + mp
    cg = ((m0 * x0 + mp * xp) / M, (m0 * y0 + mp * yp) / M, (m0 * Z_EMPTY + mp * zp) / M)
    box = {"Ixx": mp * (0.5**2 + 0.4**2) / 12, "Iyy": mp * (1.6**2 + 0.4**2) / 12,
           "Izz": mp * (1.6**2 + 0.5**2) / 12}
    pts = [(m0, (x0, y0, Z_EMPTY)), (mp, (xp, yp, zp))]

    def steiner(a, b):
        return sum(m * ((p[a] - cg[a]) ** 2 + (p[b] - cg[b]) ** 2) for m, p in pts)

    expected = {"Ixx": 900.0 + box["Ixx"] + steiner(1, 2),
                "Iyy": 1100.0 + box["Iyy"] + steiner(0, 2),
                "Izz": 1800.0 + box["Izz"] + steiner(0, 1)}
    src = "parallel-axis build-up (SAWE practice), box per Beer & Johnston"
    assert_close(doc["mass_kg"], M, unit="kg", rtol=1e-12, what="mass")
    assert_close([doc["cg_m"][a] for a in "xyz"], cg, unit="m", atol=1e-12, what="CG")
    for k, v in expected.items():
        assert_close(doc["moments_kgm2"][k], v, unit="kg*m2", rtol=1e-12, what=k, source=src)
    # Ixz in body axes: the measured 15 plus Σ m·x_b·z_b, with x_b = −(x − x_cg) and
    # z_b = −(z − z_cg), so the two sign changes cancel (domain notes, axes and signs).
    ixz = 15.0 + sum(m * (p[0] - cg[0]) * (p[2] - cg[2]) for m, p in pts)
    assert_close(doc["products_kgm2"]["Ixz"], ixz, unit="kg*m2", rtol=1e-12, what="Ixz",
                 source=src)
    assert doc["empty_inertia"]["basis"] == "measured"
    assert doc["condition"]["configuration"] == "pod"
    assert [i["name"] for i in doc["items"]] == ["empty vehicle (rest)", "pod"]


@pytest.mark.parametrize("phase", ["takeoff", "landing"])
def test_inertia_with_a_plan_takes_the_sheet_fuel(fleet, phase):
    fleet.set_z()
    r = fleet("inertia", REG, "--plan", fleet.plan, "--phase", phase, "--json")
    assert r.exit_code == 0, r.stderr
    doc = json.loads(r.stdout)
    src = "the loading sheet of the same plan"
    assert_close(doc["mass_kg"], doc["condition"]["sheet_phase_mass_kg"], unit="kg",
                 rtol=1e-12, what="mass", source=src)
    m0, _, _ = _empty()
    fuel = 0.1 * 720.0 - 3.0 - (40.0 if phase == "landing" else 0.0)  # avgas 6.0 lb/USgal
    assert_close(doc["mass_kg"], m0 + 80.0 + 20.0 + fuel, unit="kg", rtol=1e-3,
                 what="mass", source="FAA-H-8083-30 ch. 4, avgas 6.0 lb/USgal (≈ 719 kg/m³)")
    assert doc["condition"]["phase"] == phase
    assert {i["group"] for i in doc["items"]} == {"empty vehicle", "person", "cargo", "fuel"}


def test_terminal_report_and_csv(fleet, tmp_path):
    fleet.set_z()
    out = tmp_path / "ti.csv"
    r = fleet("inertia", REG, "--plan", fleet.plan, "--csv", out)
    assert r.exit_code == 0, r.stderr
    text = r.stdout
    flat = " ".join("".join(" " if "\u2500" <= c <= "\u257f" else c for c in text).split())
    assert "x forward, y right, z down" in flat
    assert "CAUTION: these figures are computed from the data recorded in this ledger" in flat
    assert text.rstrip().endswith(f"CSV (long) written to {out}")
    rows = list(csv.reader(out.open(encoding="utf-8")))
    assert rows[0] == ["quantity", "value", "unit", "axes", "note"]
    got = {q[0]: q for q in rows[1:]}
    assert got["registration"][1] == REG and got["Ixx"][2] == "kg*m2"
    doc = json.loads(fleet("inertia", REG, "--plan", fleet.plan, "--json").stdout)
    assert float(got["Izz"][1]) == doc["moments_kgm2"]["Izz"]
    wide = tmp_path / "wide.csv"
    r = fleet("inertia", REG, "--csv", wide, "--csv-layout", "wide", "--json")
    assert r.exit_code == 0 and json.loads(r.stdout)["schema"] == "wbledger.inertia/1"
    assert len(list(csv.reader(wide.open(encoding="utf-8")))) == 2


def test_missing_vertical_cg_is_one_line_and_writes_nothing(fleet, tmp_path):
    out = tmp_path / "never.csv"
    r = fleet("inertia", REG, "--csv", out)
    assert r.exit_code == 2
    assert r.stderr == (
        "Error: empty vehicle z = (missing): the vertical CG of the empty vehicle, which "
        "inertia needs (Ixx, Iyy and Ixz depend on it). Record it with `wbledger cg-height "
        "REG …` (road vehicles) or a weighing that gives it, or pass --assume-z LENGTH to take "
        "one height (the report says so)\n")
    assert not out.exists()
    r = fleet("inertia", REG, "--assume-z", "0.8", "--json")
    assert r.exit_code == 0
    doc = json.loads(r.stdout)
    assert doc["items"][0]["z_assumed"] is True and doc["warnings"]


@pytest.mark.parametrize("args,message", [
    (["NOPE"], "Error: no vehicle 'NOPE'. Known vehicles: KV-I1\n"),
    ([REG, "--csv-layout", "tall"], "Error: --csv-layout = 'tall': one of long, wide\n"),
    ([REG, "--phase", "landing"],
     "Error: --phase = 'landing': only with --plan (the phase picks its fuel)\n"),
    ([REG, "--configuration", "nothing"], None),
])
def test_bad_input_exits_2_with_one_line(fleet, args, message):
    fleet.set_z()
    r = fleet("inertia", *args)
    assert r.exit_code == 2
    assert r.stderr.startswith("Error: ") and r.stderr.count("\n") == 1
    if message is not None:
        assert r.stderr == message
    assert r.stdout == ""


def test_a_plan_for_another_vehicle_is_refused(fleet, tmp_path):
    fleet.set_z()
    other = tmp_path / "other.toml"
    other.write_text(PLAN.replace(REG, "KV-ZZ"), encoding="utf-8")
    r = fleet("inertia", REG, "--plan", other)
    assert r.exit_code == 2
    assert r.stderr == (f"Error: {other}: vehicle = 'KV-ZZ': the vehicle of the command, "
                        f"'{REG}'\n")


def test_help_states_the_axes(cli):
    r = cli("inertia", "--help")
    assert r.exit_code == 0
    assert "x forward, y right, z down" in " ".join(r.stdout.split())
