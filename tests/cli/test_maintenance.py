"""The maintenance and configuration commands through the CLI, on SQLite and PostgreSQL:
exit codes, exact error lines, nothing written on bad input, and a year of maintenance.

Numbers: TT-A1 weighed at 1715 lb (nose, 20 in) and 2572.5 lb on each main (100 in) is the
6,860 lb at 80.0 in of the PHAK (FAA-H-8083-25) ch. 9 worked example; adding 140 lb at 150 in
gives 81.4 in (same example, as quoted in the domain notes). %MAC = (CG − LEMAC)/MAC × 100 with
the test type's LEMAC 70 in and MAC 60 in.
"""

from __future__ import annotations

import json
import subprocess
import sys

import pytest
from sqlalchemy import text

from ledger.store import guards
from tests.store.ledger_support import snapshot, write_types

A_READINGS = ["--reading", "nose=1715", "--reading", "left main=2572.5 lb",
              "--reading", "right main=2572.5"]


@pytest.fixture
def ready(cli, tmp_path):
    assert cli("init").exit_code == 0
    for path in write_types(tmp_path):
        r = cli("type", "import", str(path))
        assert r.exit_code == 0, r.stderr
    for reg in ("KV-101", "KV-102"):
        assert cli("vehicle", "add", reg, "--type", "TT-A1").exit_code == 0
    return cli


@pytest.fixture
def db(ready):
    from ledger.store.db import make_engine

    eng = make_engine(ready.db_url)
    yield eng
    eng.dispose()


def ok(result):
    assert result.exit_code == 0, (result.stdout, result.stderr)
    return result.stdout


def lines(result) -> list[str]:
    return [ln.rstrip() for ln in result.stdout.splitlines()]


def test_a_year_of_maintenance(ready, db, tmp_path):
    cli = ready
    out = ok(cli("weigh", "KV-101", *A_READINGS, "--date", "2025-01-10", "--by", "W. Eigher",
                 "--scales", "Test cells 1-3 (invented)", "--level", "seat rails"))
    assert out.splitlines() == [
        "Recorded entry 1 of KV-101: weighing (baseline)",
        "  As weighed: 6860.0 lb, CG 80.00 in",
        "  Empty mass 6860.0 lb, CG 80.00 in (16.67 % MAC), moment 548.800 lb*in/1000",
        "  Lateral CG 0.00 in, vertical CG not known",
    ]
    out = ok(cli("install", "KV-101", "cargo rack", "--mass", "140", "--arm", "150 in",
                 "--reason", "cargo mod", "--ref", "WO-7", "--date", "2025-03-01", "--by", "T"))
    assert out.splitlines()[:4] == [
        "Recorded entry 2 of KV-101: install cargo rack",
        "  Change: +140.0 lb, moment +21.000 lb*in/1000",
        "  Empty mass 7000.0 lb, CG 81.40 in (19.00 % MAC), moment 569.800 lb*in/1000",
        "  Lateral CG 0.00 in, vertical CG not known",
    ]
    # the warnings are word-wrapped at 80 columns
    assert all(len(ln) <= 80 for ln in out.splitlines())
    assert " ".join(out.split()).endswith(
        "! empty mass changed by +140.0 lb since the weighing of 2025-01-10 (entry 1), more "
        "than the type's 0.5 % of maximum landing mass (37.5 lb): consider a new weighing "
        "! empty CG moved +2.33 % MAC since the weighing of 2025-01-10 (entry 1), more than the "
        "type's 0.5 % MAC: consider a new weighing")
    ok(cli("install", "KV-101", "lamp", "--mass", "2 lb", "--arm", "80", "--vert-arm", "30",
           "--lat-arm", "-5", "--shape", "cylinder,radius=2,length=6,axis=x", "--reason",
           "new lamp", "--date", "2025-06-01", "--by", "T"))
    ok(cli("remove", "KV-101", "cargo rack", "--reason", "mod removed", "--date", "2025-09-01",
           "--by", "T"))
    out = ok(cli("correct", "KV-101", "4", "--reason", "removal was on KV-102", "--date",
                 "2025-09-02", "--by", "Q. A."))
    assert out.splitlines()[0] == "Recorded entry 5 of KV-101: correction cargo rack (reverses 4)"

    hist = json.loads(ok(cli("history", "KV-101", "--json")))
    assert [e["kind"] for e in hist["entries"]] == ["weighing", "install", "install", "remove",
                                                    "correction"]
    assert hist["entries"][2]["negligible"] is True  # 2 lb at the CG of a 7,000 lb airplane
    assert hist["current"]["seq"] == 5
    assert abs(hist["current"]["cg_x_m"] / 0.0254 - (7000 * 81.4 + 160) / 7002) < 1e-9
    text_hist = lines(cli("history", "KV-101"))
    assert text_hist[0] == "History of KV-101 (type TT-A1 rev 1)"
    row2 = next(ln for ln in text_hist if ln.startswith("2  2025-03-01"))
    assert row2.split()[-7:] == ["+140.0", "+21.000", "7000.0", "569.800", "81.40", "19.00",
                                 "!"]
    row3 = next(ln for ln in text_hist if ln.startswith("3  2025-06-01"))
    assert row3.split()[-1] == "n!"  # negligible, and still beyond the reweigh tolerance
    assert all(len(ln) <= 80 for ln in text_hist)
    old = lines(cli("history", "KV-101", "--as-of", "2025-02-01"))
    assert old[0] == "History of KV-101 (type TT-A1 rev 1) as of 2025-02-01"
    assert "After entry 1 (2025-01-10) (entries after 2025-02-01 not shown: 4):" in old

    fleet = json.loads(ok(cli("vehicle", "list", "--json")))
    assert [(v["registration"], v["entries"]) for v in fleet] == [("KV-101", 5), ("KV-102", 0)]
    listing = lines(cli("vehicle", "list"))
    assert listing[0].split() == ["Vehicle", "Type", "Empty", "mass", "CG", "%MAC", "Weighed",
                                  "Entries"]
    # (7000 lb x 81.4 in + 2 lb x 80 in) / 7002 lb = 81.3996 in = 18.999 % MAC
    assert listing[2].split() == ["KV-101", "!", "TT-A1", "7002.0", "lb", "81.40", "in",
                                  "19.00", "2025-01-10", "5"]
    shown = json.loads(ok(cli("vehicle", "show", "KV-101", "--json")))
    assert [i["name"] for i in shown["installed_items"]] == ["cargo rack", "lamp"]
    assert ok(cli("vehicle", "show", "KV-101")).splitlines()[1] == (
        "Empty mass 7002.0 lb, CG 81.40 in (19.00 % MAC), moment 569.960 lb*in/1000")

    out = ok(cli("verify"))
    assert out.splitlines()[0] == "KV-101: 5 entries, chain verified"
    assert out.splitlines()[2] == "KV-102: 0 entries, chain verified"
    head = out.splitlines()[1].split()[1]
    assert ok(cli("verify", "KV-101", "--expect", head)).startswith("KV-101: 5 entries")

    csv_path = tmp_path / "kv101.csv"
    r = cli("export", "KV-101", "--format", "csv", "-o", str(csv_path))
    assert r.exit_code == 0 and r.stderr == f"Wrote the ledger of KV-101 to {csv_path} (csv).\n"
    json_text = ok(cli("export", "KV-101", "--format", "json"))
    assert json.loads(json_text)["head_hash"] == head
    # Another vehicle cannot take the file with its hashes; without them it can.
    before = snapshot(db)
    r = cli("import-history", "KV-102", str(csv_path))
    assert r.exit_code == 2 and r.stderr.startswith("Error: kv101.csv line 2: entry_hash = ")
    assert snapshot(db) == before
    stripped = tmp_path / "plain.csv"
    rows = csv_path.read_text().splitlines(keepends=True)
    import csv as csvmod
    import io

    table = list(csvmod.reader(io.StringIO("".join(rows))))
    keep = [i for i, h in enumerate(table[0]) if h not in ("prev_hash", "entry_hash")]
    buf = io.StringIO()
    csvmod.writer(buf, lineterminator="\n").writerows([[r[i] for i in keep] for r in table])
    stripped.write_text(buf.getvalue())
    out = ok(cli("import-history", "KV-102", str(stripped)))
    assert out.startswith("Imported 5 entries into KV-102 (entries 1 to 5); head ")
    assert ok(cli("verify", "KV-102")).startswith("KV-102: 5 entries, chain verified")


def test_config_commands(ready, db):
    cli = ready
    ok(cli("weigh", "KV-101", *A_READINGS, "--date", "2025-01-10"))
    ok(cli("install", "KV-101", "medical rack", "--mass", "35", "--arm", "110",
           "--reason", "medevac fit", "--date", "2025-01-11"))
    out = ok(cli("config", "define", "medevac", "--vehicle", "KV-101", "--install",
                 "stretcher=15 kg@3 m", "--remove", "medical rack", "--disable-station",
                 "cabin", "--description", "stretcher in, rack out", "--by", "E"))
    assert out.splitlines() == [
        "Configuration medevac (vehicle KV-101)",
        "  stretcher in, rack out",
        "  + stretcher: 33.1 lb at 118.11 in",
        "  - medical rack (mass and arms from the ledger)",
        "  Stations not available: cabin",
    ]
    out = ok(cli("config", "show", "medevac", "--vehicle", "KV-101"))
    assert "  - medical rack: 35.0 lb at 110.00 in" in out.splitlines()
    assert "  Change of empty mass: -1.9 lb" in out.splitlines()
    ok(cli("config", "define", "pod", "--type", "TT-A1", "--install", "pod=60@95,0,-10"))
    listing = ok(cli("config", "list", "--vehicle", "KV-101")).splitlines()
    assert listing == ["medevac (vehicle KV-101, 2 items): stretcher in, rack out",
                       "pod (type TT-A1, 1 item)",
                       "seats-out (type file TT-A1, 1 item): Cabin seats out (invented)"]
    data = json.loads(ok(cli("config", "list", "--type", "TT-A1", "--json")))
    assert [c["name"] for c in data] == ["pod", "seats-out"]
    before = snapshot(db)
    for args, message in [
        (("config", "define", "pod", "--type", "TT-A1", "--install", "pod=60@95"),
         "Error: configuration 'pod' of TT-A1 exists already; give --replace to redefine it"),
        (("config", "define", "x", "--install", "a=1@2"),
         "Error: --type/--vehicle = '': exactly one owner: --type NAME or --vehicle REG"),
        (("config", "define", "x", "--type", "TT-A1", "--install", "a=1"),
         "Error: --install = 'a=1': NAME=MASS@ARM[,LAT[,VERT]], e.g. 'stretcher=15 kg@120 in', "
         "or NAME alone for an installed item to remove"),
        (("config", "show", "nothing", "--vehicle", "KV-101"),
         "Error: no configuration of KV-101 'nothing'. Known: medevac, pod, seats-out"),
        (("config", "show", "medevac", "--vehicle", "KV-102"),
         "Error: no configuration of KV-102 'medevac'. Known: pod, seats-out"),
    ]:
        r = cli(*args)
        assert (r.exit_code, r.stderr, r.stdout) == (2, message + "\n", ""), args
    assert snapshot(db) == before


BAD = [
    (["weigh", "KV-101", "--reading", "nose=1715", "--reading", "left main=2572.5"],
     "Error: --reading = 'right main': missing; type TT-A1 is weighed at nose, left main, "
     "right main: give one --reading POINT=MASS for each"),
    (["weigh", "KV-101", "--reading", "nose:1715"],
     "Error: --reading = 'nose:1715': NAME=VALUE, e.g. nose=520 lb"),
    (["weigh", "KV-101", *A_READINGS, "--tare", "nose=2000"], None),  # negative net reading
    (["weigh", "KV-404", *A_READINGS],
     "Error: no vehicle 'KV-404'. Known vehicles: KV-101, KV-102"),
    (["weigh", "KV-102", *A_READINGS, "--date", "2999-12-31"], "future"),
    (["install", "KV-101", "radio", "--mass", "nan", "--arm", "10", "--reason", "x"], "units"),
    (["install", "KV-101", "radio", "--mass", "3", "--arm", "inf", "--reason", "x"], "units"),
    (["install", "KV-101", "radio", "--mass", "3", "--reason", "x"],
     "Error: Missing option '--arm' (see `wbledger install --help`)"),
    (["install", "KV-101", "radio", "--mass", "3", "--arm", "10"],
     "Error: Missing option '--reason' (see `wbledger install --help`)"),
    (["install", "KV-101", "radio", "--mass", "3", "--arm", "10", "--reason", " "],
     "Error: --reason = ' ': required: a non-empty text"),
    (["install", "KV-101", "radio", "--mass", "3", "--arm", "10", "--reason", "x", "--date",
      "2999-12-31"], "future"),
    (["install", "KV-404", "radio", "--mass", "3", "--arm", "10", "--reason", "x"],
     "Error: no vehicle 'KV-404'. Known vehicles: KV-101, KV-102"),
    (["remove", "KV-101", "radio", "--reason", "x"],
     "Error: item 'radio' was never installed on KV-101; installed items: none"),
    (["correct", "KV-101", "7", "--reason", "x"],
     "Error: no entry of KV-101 7. KV-101 has entries 1 to 1"),
    (["correct", "KV-101", "1", "--reason", "x"],
     "Error: entry 1 of KV-101 is a weighing: a weighing is not reversed; record a new "
     "weighing with `wbledger weigh KV-101`"),
    (["history", "KV-404"], "Error: no vehicle 'KV-404'. Known vehicles: KV-101, KV-102"),
    (["history", "KV-101", "--as-of", "01/02/2025"],
     "Error: --as-of = '01/02/2025': a date written YYYY-MM-DD, e.g. 2026-03-01"),
    (["install", "KV-102", "radio", "--mass", "3", "--arm", "10", "--reason", "x"],
     "Error: vehicle 'KV-102' has no weighing recorded yet; record one first with "
     "`wbledger weigh KV-102 --reading POINT=MASS …`"),
    (["export", "KV-101", "--format", "xml"], "Error: --format = 'xml': csv or json"),
    (["verify", "--expect", "abc"],
     "Error: --expect = 'abc': a hash: 64 hexadecimal digits (0-9, a-f) as a sheet or "
     "`wbledger verify` prints it"),
]


def _expected(args, message):
    import datetime as dt

    from ledger.errors import UnitError
    from ledger.units import parse_quantity

    if message == "future":
        return f"Error: --date = '2999-12-31': a date not after today ({dt.date.today()})"
    if message == "units":  # the wording of unit errors belongs to ledger.units
        mass = "nan" in args
        with pytest.raises(UnitError) as err:
            parse_quantity("nan" if mass else "inf", "mass" if mass else "length",
                           "lb" if mass else "in", field="--mass" if mass else "--arm")
        return f"Error: {err.value}"
    return message


def test_bad_input_is_one_line_exit_2_and_writes_nothing(ready, db):
    """Every case in BAD on one database (each writes nothing, so they share its state)."""
    ok(ready("weigh", "KV-101", *A_READINGS, "--date", "2025-01-10"))
    before = snapshot(db)
    for args, message in BAD:
        r = ready(*args)
        if message is None:  # the core's message for a negative net reaction
            assert r.stderr.startswith("Error: net reaction at 'nose' = -"), args
            assert r.stderr.endswith("Check the tare and the scale zero\n"), args
        else:
            assert r.stderr == _expected(args, message) + "\n", args
        assert (r.exit_code, r.stdout, r.stderr.count("\n")) == (2, "", 1), args
        assert snapshot(db) == before, args


def test_import_bad_row_names_line_and_field(ready, db, tmp_path):
    ok(ready("weigh", "KV-101", *A_READINGS, "--date", "2025-01-10"))
    path = tmp_path / "paper.csv"
    path.write_text("kind,entry_date,actor,reason,item,item_mass_kg,item_x_m\n"
                    "install,2025-02-01,I,fit,lamp,1.5,2.0\n"
                    "install,2025-02-02,I,fit,horn,one,2.0\n")
    before = snapshot(db)
    r = ready("import-history", "KV-101", str(path))
    assert (r.exit_code, r.stdout) == (2, "")
    assert r.stderr == ("Error: paper.csv line 3: item_mass_kg = 'one': the item's mass in kg, "
                        "0 or more\n")
    assert snapshot(db) == before
    r = ready("import-history", "KV-101", str(tmp_path / "missing.csv"))
    assert r.exit_code == 2
    assert r.stderr == f"Error: FILE = '{tmp_path / 'missing.csv'}': no such file\n"
    r = ready("import-history", "KV-101", str(tmp_path / "notes.txt"))
    assert r.stderr.startswith("Error: --format = 'txt': csv or json")


def test_verify_names_the_first_bad_entry_and_exits_3(ready, db):
    ok(ready("weigh", "KV-101", *A_READINGS, "--date", "2025-01-10"))
    ok(ready("install", "KV-101", "lamp", "--mass", "2", "--arm", "80", "--reason", "fit",
             "--date", "2025-01-11"))
    ok(ready("install", "KV-101", "horn", "--mass", "1", "--arm", "10", "--reason", "fit",
             "--date", "2025-01-11"))
    with db.begin() as conn:
        guards.drop(conn, ["ledger_entries"])
        conn.execute(text("UPDATE ledger_entries SET item_mass_kg = 0.5 WHERE seq = 2"))
    r = ready("verify")
    assert r.exit_code == 3  # issue 13 item 8
    assert " ".join(r.stdout.split()) == (
        "KV-101: NOT VERIFIED: entry 2: its content does not match its hash (a field was "
        "changed after it was written) KV-102: 0 entries, chain verified "
        "type TT-A1: 1 revision, verified type TT-D1: 1 revision, verified "
        "type TT-H1: 1 revision, verified append-only guards: NOT IN PLACE: the append-only "
        "guards of ledger_entries are missing or disabled: the database was opened for "
        "editing outside wbledger")
    assert r.stderr == ("Error: the chain of KV-101 does not verify: entry 2: its content does "
                        "not match its hash (a field was changed after it was written)\n")
    data = json.loads(ready("verify", "KV-101", "--json").stdout)
    assert data["ok"] is False and data["vehicles"][0]["bad_seq"] == 2


COMMANDS = [["weigh"], ["install"], ["remove"], ["correct"], ["history"], ["verify"],
            ["export"], ["import-history"], ["config", "define"], ["config", "list"],
            ["config", "show"]]


@pytest.mark.parametrize("command", COMMANDS, ids=" ".join)
def test_every_command_has_help(command):
    from typer.testing import CliRunner

    from ledger.cli import app

    r = CliRunner().invoke(app, [*command, "--help"])
    assert r.exit_code == 0
    assert "Usage:" in r.stdout and len(r.stdout.splitlines()) > 4


@pytest.mark.parametrize("argv", [["weigh", "--help"], ["history", "--help"],
                                  ["config", "--help"]])
def test_help_of_ledger_commands_imports_no_heavy_library(argv):
    probe = ("import runpy, sys\nsys.argv = ['wbledger', *%r]\ntry:\n"  # noqa: UP031
             "    runpy.run_module('ledger', run_name='__main__')\nexcept SystemExit:\n"
             "    pass\nprint(sorted({m.split('.')[0] for m in sys.modules} & "
             "{'sqlalchemy', 'numpy', 'alembic', 'psycopg'}))\n") % (argv,)
    out = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True,
                         check=True)
    assert out.stdout.strip().splitlines()[-1] == "[]"


def test_weigh_with_pitched_readings_records_the_cg_height(ready):
    """issue 13 item 17: `weigh` takes a nose-up set of readings and records the vertical CG
    (hand calculation and the core function are checked in tests/store/test_pitched_weighing)."""
    from tests.store.test_pitched_weighing import _pitched_readings

    pitched = [a for k, v in _pitched_readings().items() for a in ("--pitched-reading", f"{k}={v}")]
    out = ok(ready("weigh", "KV-101", *A_READINGS, *pitched, "--pitch", "10 deg",
                   "--points-z", "10 in", "--date", "2025-01-10", "--json"))
    weighing, height = (doc["entry"] for doc in json.loads(out))
    assert (weighing["seq"], weighing["kind"], height["seq"], height["kind"]) == (
        1, "weighing", 2, "cg_height")
    assert abs(height["after"]["cg_z_m"] - 40 * 0.0254) < 1e-9  # 40 in (NIST SP 811: in)
