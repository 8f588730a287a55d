"""``wbledger corners``, ``wbledger cg-height`` and ``wbledger axle-rules``, end to end.

References: corner weights by CG = Σ(R·x)/ΣR (FAA-H-8083-1, weighing chapter) and the named
diagonals (common practice); the axle-lift height (ISO 10392) on a rigid body whose axle loads
are computed here by statics; 23 CFR 658.17 for the rule set. Exact conversions from NIST
SP 811 (1 lb = 0.45359237 kg, 1 in = 0.0254 m). The truck is invented for the test.
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from typer.testing import CliRunner

from ledger.testing import assert_close

LB, IN = 0.45359237, 0.0254

TRUCK = """
format_version = 1
[vehicle]
name = "TT-2"
title = "invented two-axle truck for the CLI tests"
kind = "ground_vehicle"
[units]
mass = "kg"
length = "m"
volume = "L"
[datum]
description = "front axle centreline, z up from the ground (invented)"
[limits]
gross_rating = 7500
[[axle]]
name = "front"
x = 0.0
rating = 3200
track = 1.70
[[axle]]
name = "rear"
x = 3.8
rating = 5200
track = 1.60
[[station]]
name = "box"
kind = "cargo"
x = 3.2
z = 1.4
max_mass = 4000
[[reaction_point]]
name = "front left"
x = 0.0
y = -0.85
[[reaction_point]]
name = "front right"
x = 0.0
y = 0.85
[[reaction_point]]
name = "rear left"
x = 3.8
y = -0.80
[[reaction_point]]
name = "rear right"
x = 3.8
y = 0.80
[inertia]
basis = "measured"
ixx = "2600 kg*m2"
iyy = "11000 kg*m2"
izz = "11500 kg*m2"
"""

REG = "KV-TT1"
CORNERS = {"front left": 1100.0, "front right": 1060.0, "rear left": 760.0,
           "rear right": 780.0}  # invented, kg
W = sum(CORNERS.values())
A = (CORNERS["rear left"] + CORNERS["rear right"]) * 3.8 / W  # CG behind the front axle
R_WHEEL = 0.40
H = 1.12  # the invented truck's true CG height above the ground


def statics_front_load(theta_deg: float) -> float:
    """Front axle load with the rear raised by θ: a rigid body turned about the front wheel
    centre, contacts below the wheel centres; R_f + R_r = W and moments about the origin."""
    t = math.radians(theta_deg)
    rot = np.array([[math.cos(t), -math.sin(t)], [math.sin(t), math.cos(t)]])
    pivot = np.array([0.0, R_WHEEL])
    xr = (pivot + rot @ (np.array([3.8, R_WHEEL]) - pivot))[0]
    xg = (pivot + rot @ (np.array([A, H]) - pivot))[0]
    rf, _ = np.linalg.solve([[1.0, 1.0], [0.0, xr]], [W, W * xg])
    return float(rf)


@pytest.fixture
def truck(cli, tmp_path):
    from ledger.store.db import make_engine, session_scope
    from ledger.store.entries import record_weighing

    f = tmp_path / "tt-2.toml"
    f.write_text(TRUCK, encoding="utf-8")
    assert cli("init").exit_code == 0
    assert cli("type", "import", str(f)).exit_code == 0
    assert cli("vehicle", "add", REG, "--type", "TT-2").exit_code == 0
    eng = make_engine(cli.db_url)
    try:
        with session_scope(eng) as s:
            record_weighing(s, REG, CORNERS, actor="test")
    finally:
        eng.dispose()

    def entries():
        from ledger.store.entries import entries_of

        e = make_engine(cli.db_url)
        try:
            with session_scope(e) as s:
                return entries_of(s, REG)
        finally:
            e.dispose()

    cli.entries = entries
    return cli


def _lift_args(angles=(8.0, 12.0, 16.0)):
    level_front = CORNERS["front left"] + CORNERS["front right"]
    args = ["--front-level", f"{level_front} kg",
            "--rear-level", f"{CORNERS['rear left'] + CORNERS['rear right']} kg",
            "--wheel-radius", f"{R_WHEEL} m"]
    for a in angles:
        args += ["--front-tilted", f"{statics_front_load(a):.9f}", "--angle", f"{a} deg"]
    return args


# --- corners --------------------------------------------------------------------------------------

def test_corners_of_a_registered_truck_take_its_geometry(truck):
    r = truck("corners", REG, "--lf", "1100", "--rf", "1060", "--lr", "760", "--rr", "780",
              "--json")
    assert r.exit_code == 0, r.stderr
    d = json.loads(r.stdout)
    assert d["geometry_m"] == {"wheelbase_m": 3.8, "track_front_m": 1.7, "track_rear_m": 1.6,
                               "front_axle_x_m": 0.0}
    # CG = Σ(R·x)/ΣR over the wheel positions (FAA-H-8083-1)
    y = (1060 * 0.85 - 1100 * 0.85 + 780 * 0.8 - 760 * 0.8) / W
    assert_close(d["cg_m"]["x"], A, unit="m", rtol=1e-14, what="CG x", source="FAA-H-8083-1")
    assert_close(d["cg_m"]["y"], y, unit="m", rtol=1e-12, what="CG y", source="FAA-H-8083-1")
    assert_close(d["diagonals_percent"]["RF+LR"], 100 * (1060 + 760) / W, unit="%",
                 rtol=1e-14, what="RF+LR")
    text = truck("corners", REG, "--lf", "1100", "--rf", "1060", "--lr", "760", "--rr",
                 "780").stdout
    assert "diagonal RF+LR" in text and "diagonal LF+RR" in text
    assert max(len(line) for line in text.splitlines()) <= 80


def test_corners_without_a_vehicle_take_units_and_need_them(truck):
    r = truck("corners", "--lf", "2425 lb", "--rf", "2337 lb", "--lr", "1675 lb",
              "--rr", "1720 lb", "--wheelbase", "150 in", "--track", "67 in", "--json")
    assert r.exit_code == 0, r.stderr
    d = json.loads(r.stdout)
    T = 2425 + 2337 + 1675 + 1720
    assert_close(d["total_kg"], T * LB, unit="kg", rtol=1e-14, what="total",
                 source="NIST SP 811: 1 lb = 0.45359237 kg")
    assert_close(d["cg_m"]["x"], 150 * IN * (1675 + 1720) / T, unit="m", rtol=1e-13,
                 what="CG x", source="FAA-H-8083-1; 1 in = 0.0254 m")
    assert d["units"]["mass"] == "lb" and d["units"]["length"] == "in"
    r = truck("corners", "--lf", "2425", "--rf", "2337", "--lr", "1675", "--rr", "1720",
              "--wheelbase", "150 in", "--track", "67 in")
    assert r.exit_code == 2
    assert r.stderr == ("Error: --lf = '2425': a unit is required; mass units: kg, g, t, lb, "
                        "slug\n")
    r = truck("corners", "--lf", "1 kg", "--rf", "1 kg", "--lr", "1 kg", "--rr", "1 kg")
    assert r.exit_code == 2
    assert r.stderr == "Error: --wheelbase = (missing): a length, e.g. '3.9 m'\n"


# --- cg-height -----------------------------------------------------------------------------------

def test_cg_height_is_stored_as_the_vertical_cg(truck):
    before = len(truck.entries())
    r = truck("cg-height", REG, *_lift_args(), "--datum-height", "0 m", "--by", "tester",
              "--json")
    assert r.exit_code == 0, r.stderr
    d = json.loads(r.stdout)
    src = "rigid-body statics (ISO 10392 geometry)"
    assert_close(d["height_m"], H, unit="m", rtol=1e-9, what="CG height", source=src)
    entries = truck.entries()
    assert len(entries) == before + 1
    last = entries[-1]
    assert last.kind == "cg_height" and last.actor == "tester"
    assert_close(last.cg_z_m, H, unit="m", rtol=1e-9, what="stored vertical CG", source=src)
    assert last.detail["axle_lift"]["raised_axle"] == "rear"
    assert d["stored"]["seq"] == last.seq
    # the inertia report now has its vertical CG without --assume-z
    r = truck("inertia", REG, "--json")
    assert r.exit_code == 0, r.stderr
    assert_close(json.loads(r.stdout)["cg_m"]["z"], H, unit="m", rtol=1e-9, what="CG z")


def test_cg_height_from_lift_heights_with_the_front_raised(truck):
    # Raise the front by Δh: θ = asin(Δh / L); the rear axle stays on the scales. By symmetry
    # of the statics, the rear axle gains W·(h − r)·tanθ / L.
    args = ["--front-level", "2160 kg", "--rear-level", "1540 kg", "--wheel-radius", "0.40",
            "--datum-height", "0"]
    for lift in (0.5, 0.8):
        t = math.asin(lift / 3.8)
        args += ["--rear-tilted", f"{1540 + W * (H - R_WHEEL) * math.tan(t) / 3.8:.9f}",
                 "--lift", f"{lift} m"]
    r = truck("cg-height", REG, *args, "--dry-run", "--json")
    assert r.exit_code == 0, r.stderr
    d = json.loads(r.stdout)
    assert d["raised_axle"] == "front" and d["stored"] is False
    assert_close(d["height_m"], H, unit="m", rtol=1e-9, what="height (front raised)",
                 source="ISO 10392 relation, front raised")


def test_cg_height_dry_run_and_bad_input_write_nothing(truck):
    before = len(truck.entries())
    r = truck("cg-height", REG, *_lift_args(), "--dry-run")
    assert r.exit_code == 0 and "Not stored (--dry-run)." in r.stdout
    r = truck("cg-height", REG, *_lift_args(angles=(1.0,)), "--datum-height", "0")
    assert r.exit_code == 2
    assert r.stderr == ("Error: --angle[1] = 1: a lift angle of 2° to 45°. Raise the axle "
                        "further; a small angle gives a load change lost in the scale "
                        "resolution\n")
    r = truck("cg-height", REG, *_lift_args())
    assert r.exit_code == 2
    assert r.stderr == ("Error: --datum-height = (missing): the height of the type's datum "
                        "(z = 0) above the ground, to store the vertical arm. The type's datum: "
                        "front axle centreline, z up from the ground (invented). Or use "
                        "--dry-run to compute without storing\n")
    r = truck("cg-height", REG, *_lift_args(), "--rear-tilted", "1500", "--datum-height", "0")
    assert r.exit_code == 2
    assert r.stderr == ("Error: --rear-tilted = '1500': not together with --front-tilted: "
                        "raise one axle per weighing\n")
    r = truck("cg-height", REG, "--front-level", "2160", "--rear-level", "1540",
              "--front-tilted", "2200", "--front-tilted", "2250", "--angle", "10",
              "--wheel-radius", "0.4", "--datum-height", "0")
    assert r.exit_code == 2
    assert r.stderr == ("Error: --angle = [10.0]: one angle (or lift) per --front-tilted "
                        "load: 2 load(s), 1 angle(s)\n")
    assert len(truck.entries()) == before


# --- axle-rules (no database needed) -------------------------------------------------------------

@pytest.fixture
def run(monkeypatch, tmp_path):
    from ledger.cli import app

    monkeypatch.setenv("XDG_CONFIG_HOME", str(tmp_path / "config"))  # no user rule sets
    monkeypatch.delenv("WBLEDGER_RULES", raising=False)
    runner = CliRunner()
    return lambda *a: runner.invoke(app, [str(x) for x in a], catch_exceptions=False)


def test_axle_rules_list_and_show(run, tmp_path, monkeypatch):
    r = run("axle-rules", "list", "--json")
    assert r.exit_code == 0
    assert [x["name"] for x in json.loads(r.stdout)["rule_sets"]] == ["us-federal-interstate"]
    text = run("axle-rules", "list").stdout
    assert "us-federal-interstate" in text and "never as a legal determination" in \
        " ".join(text.split())
    r = run("axle-rules", "show", "us-federal-interstate", "--table", "--json")
    d = json.loads(r.stdout)
    row51 = next(x for x in d["bridge_table"]["rows"] if x["length_ft"] == 51)
    assert row51["max_lb"][d["bridge_table"]["axles"].index(5)] == 80000.0  # FHWA table
    assert_close(d["limits_kg"]["tandem"], 34000 * LB, unit="kg", rtol=1e-15,
                 what="tandem", source="23 CFR 658.17(d)")
    text = run("axle-rules", "show", "us-federal-interstate", "--table").stdout
    assert max(len(line) for line in text.splitlines()) <= 80
    assert "23 CFR 658.17" in text
    folder = tmp_path / "more"
    folder.mkdir()
    from ledger.rules import builtin_rules_dir

    shipped = (builtin_rules_dir() / "us-federal-interstate.toml").read_text(encoding="utf-8")
    (folder / "invented-region.toml").write_text(shipped.replace('"80000 lb"', '"40 t"'),
                                                 encoding="utf-8")
    monkeypatch.setenv("WBLEDGER_RULES", str(folder))
    names = [x["name"] for x in json.loads(run("axle-rules", "list", "--json").stdout)
             ["rule_sets"]]
    assert names == ["invented-region", "us-federal-interstate"]
    d = json.loads(run("axle-rules", "show", "invented-region", "--json").stdout)
    assert d["limits_kg"]["gross"] == 40000.0


def test_axle_rules_unknown_name(run):
    r = run("axle-rules", "show", "atlantis")
    assert r.exit_code == 2
    assert r.stderr == ("Error: no axle rule set 'atlantis'. Known rule sets: "
                        "us-federal-interstate (see `wbledger axle-rules list`)\n")


@pytest.mark.parametrize("command", [["corners"], ["cg-height"], ["axle-rules", "list"],
                                     ["axle-rules", "show"], ["inertia"]])
def test_every_command_has_help(run, command):
    r = run(*command, "--help")
    assert r.exit_code == 0 and len(r.stdout) > 200
