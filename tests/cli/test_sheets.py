"""``wbledger sheet`` and ``wbledger check`` through the command line, on SQLite and PostgreSQL.

Exit codes: 0 in limits, 1 out of limits, 2 bad input (and then nothing is written). The test
type and plans are fixtures (no real aircraft).
"""

from __future__ import annotations

import json

import pytest
from sqlalchemy import func, select

from ledger.store.db import make_engine
from ledger.store.models import LoadingSheetRow
from tests.store.test_sheets import PLAN, TYPE


@pytest.fixture
def ready(cli, tmp_path):
    type_file = tmp_path / "ts-1.toml"
    type_file.write_text(TYPE, encoding="utf-8")
    for args in (("init",), ("type", "import", type_file), ("vehicle", "add", "TS-101",
                                                           "--type", "TS-1"),
                 ("weigh", "TS-101", "--reading", "nose=350 lb", "--reading", "main=1300 lb",
                  "--by", "tester", "--date", "2026-11-30")):
        r = cli(*args)
        assert r.exit_code == 0, r.stdout + r.stderr
    (tmp_path / "ok.toml").write_text(PLAN, encoding="utf-8")
    # 95 lb more in the baggage: the CG goes aft of 47.3 in (and the station over 120 lb).
    (tmp_path / "aft.toml").write_text(PLAN.replace("mass = 40", "mass = 135"),
                                       encoding="utf-8")
    (tmp_path / "bad.toml").write_text(PLAN.replace('seat = "pilot"', 'seat = "co-pilot"'),
                                       encoding="utf-8")
    return cli, tmp_path


def _saved_count(db_url) -> int:
    eng = make_engine(db_url)
    try:
        with eng.connect() as conn:
            return conn.execute(select(func.count()).select_from(LoadingSheetRow)).scalar_one()
    finally:
        eng.dispose()


def test_check_exit_codes(ready):
    cli, d = ready
    r = cli("check", d / "ok.toml")
    assert r.exit_code == 0, r.stderr
    lines = r.stdout.splitlines()
    assert lines[0] == "TS-101: IN LIMITS"
    # The caution closes the output, wrapped to 80 columns like every line.
    from ledger.caution import CAUTION

    assert " ".join(lines[-4:]).endswith(CAUTION) or " ".join(lines).endswith(CAUTION)
    assert all(len(line) <= 80 for line in lines)
    r = cli("check", d / "aft.toml")
    assert r.exit_code == 1
    assert r.stdout.splitlines()[0] == "TS-101: OUT OF LIMITS"
    assert "  - Station 'baggage' holds 135 lb, over its limit 120 lb by 15.0 lb" in r.stdout
    assert "  fix: " in r.stdout
    r = cli("check", d / "bad.toml")
    assert r.exit_code == 2
    assert r.stdout == ""
    assert r.stderr == (f"Error: {d / 'bad.toml'}: person[1].seat = 'co-pilot': unknown seat; "
                        "type TS-1 has: pilot, rear\n")
    # The quick form, no file: the same plan from options.
    r = cli("check", "TS-101", "--person", "pilot=180", "--cargo", "baggage=40",
            "--fuel", "main=30 USgal", "--trip", "20 USgal")
    assert r.exit_code == 0, r.stderr
    r = cli("check", "TS-101", "--person", "pilot=180", "--fuel", "main=45 USgal")
    assert r.exit_code == 2
    assert r.stderr == ("Error: --fuel = 'main=45 USgal': at most the usable capacity of tank "
                        "'main', 39 USgal (capacity 40 USgal less 1 USgal unusable, which the "
                        "empty weight includes). Reduce the fuel by 6 USgal\n")
    r = cli("check", "TS-101", "--json", "--person", "pilot=180")
    assert r.exit_code == 0
    assert json.loads(r.stdout)["verdict"] == "in_limits"
    r = cli("check", "NO-SUCH", "--person", "pilot=180")
    assert r.exit_code == 2 and r.stderr.startswith("Error: no vehicle 'NO-SUCH'")


def test_sheet_in_the_terminal_fits_80_columns_and_carries_the_caution(ready):
    cli, d = ready
    r = cli("sheet", d / "aft.toml")
    assert r.exit_code == 1
    lines = r.stdout.splitlines()
    assert max(len(line) for line in lines) <= 80
    text = " ".join(" ".join(line.strip("┃║ ").split()) for line in lines)
    assert "CAUTION: these figures are computed from the data recorded in this ledger" in text
    assert "OUT OF LIMITS" in text and "TS-101" in text
    r = cli("sheet", d / "ok.toml", "--width", "100")
    assert r.exit_code == 0
    assert max(len(line) for line in r.stdout.splitlines()) <= 100


def test_save_show_list_json_and_pdf(ready):
    cli, d = ready
    r = cli("sheet", d / "ok.toml", "--save", "--json", "--by", "R. Ortega",
            "--pdf", d / "sheet.pdf")
    assert r.exit_code == 0, r.stderr
    doc = json.loads(r.stdout)
    assert doc["schema"] == "wbledger.sheet/1"
    assert doc["sheet"]["saved"] is True and doc["prepared"]["by"] == "R. Ortega"
    sid = doc["sheet"]["id"]
    assert (d / "sheet.pdf").read_bytes()[:5] == b"%PDF-"
    r = cli("sheet", "show", str(sid), "--json")
    assert r.exit_code == 0
    shown = json.loads(r.stdout)
    assert shown["sheet"].pop("verified") is True
    assert shown == doc
    r = cli("sheet", "list")
    assert r.exit_code == 0
    assert f"{sid:>5}" in r.stdout and "TS-101" in r.stdout and "in limits" in r.stdout
    r = cli("sheet", "show", "999")
    assert r.exit_code == 2
    assert r.stderr == ("Error: no loading sheet 999. List saved sheets with "
                        "`wbledger sheet list`\n")


def test_bad_input_writes_nothing(ready):
    cli, d = ready
    r = cli("sheet", d / "bad.toml", "--save")
    assert r.exit_code == 2 and r.stdout == ""
    assert r.stderr.startswith("Error: ") and "\n" not in r.stderr.rstrip("\n")
    assert _saved_count(cli.db_url) == 0


def test_amend_within_and_beyond_the_tolerance(ready):
    cli, d = ready
    r = cli("sheet", d / "ok.toml", "--save", "--json")
    sid = json.loads(r.stdout)["sheet"]["id"]
    r = cli("sheet", "amend", str(sid), "--cargo", "baggage=55", "--json")
    assert r.exit_code == 0, r.stderr
    amended = json.loads(r.stdout)
    assert amended["sheet"]["amends"] == sid
    r = cli("sheet", "amend", str(amended["sheet"]["id"]), "--cargo", "baggage=75")
    assert r.exit_code == 2
    assert r.stderr == (f"Error: the change to sheet {sid} is beyond the last-minute tolerance "
                        "of type TS-1 (20.0 lb and 0 persons): it changes 35.0 lb and 0 "
                        "persons; prepare a new sheet with `wbledger sheet PLAN --save`\n")
    assert _saved_count(cli.db_url) == 2


def test_configuration_items_are_rows_of_the_load_table_and_add_up(ready):
    # A vehicle configuration (invented): a ferry tank in, a rear seat out. The rows of the
    # load table must add up to the zero-fuel total (common practice for a loading sheet).
    cli, d = ready
    r = cli("config", "define", "ferry", "--vehicle", "TS-101", "--install",
            "ferry tank=20 lb@60 in", "--remove", "rear seat=15 lb@73 in")
    assert r.exit_code == 0, r.stderr
    r = cli("sheet", "prepare", "TS-101", "--configuration", "ferry", "--person", "pilot=180")
    assert r.exit_code == 0, r.stderr
    lines = r.stdout.split(" LOAD BY STATION ")[1].split(" STATION LIMITS ")[0].splitlines()
    rows = {line.split("  ")[0]: line.split() for line in lines if line[:1].isalpha()}
    assert rows["ferry tank"][2:4] == ["config", "20.0"]
    assert rows["rear seat"][2:6] == ["removed", "(config)", "-15.0", "73.00"]
    masses = [float(rows[k][n]) for k, n in (("empty weight", 4), ("ferry tank", 3),
                                             ("rear seat", 4), ("pilot", 1))]
    total = float(rows["zero-fuel"][2])
    assert abs(sum(masses) - total) < 0.05 + 1e-9, (masses, total)
