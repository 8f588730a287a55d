"""``wbledger record``: the weight-and-balance record a maintenance shop files (issue 13 item 19).

The figures are checked against a hand calculation written out in each test: the empty moment is
the sum of mass × arm of the net scale readings, the CG is moment / mass, and each equipment
change adds or removes its mass × arm (common practice; the FAA Aircraft Weight and Balance
Handbook, FAA-H-8083-1, chapter on the empty-weight CG, for what the record holds). The type is
the invented test type TT-A1 (tests/store/ledger_support.py), not a demo type.
"""

from __future__ import annotations

import json
import shutil
import subprocess

import pytest
from sqlalchemy import text

from ledger.caution import CAUTION, CAUTION_SHORT
from ledger.errors import ChainError
from ledger.store import guards
from ledger.testing import assert_close
from tests.store.ledger_support import snapshot, write_types

FAA_H_8083_1 = "FAA-H-8083-1 ch. on empty-weight CG: moment = sum(m*x), CG = moment / mass"

# (seq, empty mass lb, moment lb*in, CG in) after each entry, by hand:
#   weighing: nose 1720 - tare 5 = 1715 lb at 20 in; mains 2572.5 lb each at 100 in
#             mass 1715 + 2 x 2572.5 = 6860 lb; moment 1715 x 20 + 5145 x 100 = 548,800 lb*in
#             CG 548,800 / 6860 = 80.00 in
#   + cargo rack 140 lb at 150 in: 7000 lb, 548,800 + 21,000 = 569,800 lb*in, CG 81.40 in
#   + lamp 2 lb at 80 in:          7002 lb, 569,800 + 160 = 569,960 lb*in, CG 81.3996 in
#   - cargo rack:                  6862 lb, 569,960 - 21,000 = 548,960 lb*in, CG 80.0000 in
BY_HAND = [(1, 6860.0, 548_800.0, 548_800.0 / 6860.0),
           (2, 7000.0, 569_800.0, 569_800.0 / 7000.0),
           (3, 7002.0, 569_960.0, 569_960.0 / 7002.0),
           (4, 6862.0, 548_960.0, 548_960.0 / 6862.0)]


@pytest.fixture
def kept(cli, tmp_path):
    """KV-101 (TT-A1) weighed, then a cargo rack and a lamp installed and the rack removed."""
    assert cli("init").exit_code == 0
    for path in write_types(tmp_path):
        assert cli("type", "import", str(path)).exit_code == 0
    assert cli("vehicle", "add", "KV-101", "--type", "TT-A1").exit_code == 0
    steps = [
        ("weigh", "KV-101", "--reading", "nose=1720", "--tare", "nose=5",
         "--reading", "left main=2572.5", "--reading", "right main=2572.5 lb",
         "--date", "2025-01-10", "--by", "W. Eigher", "--scales", "cells 1-3 (invented)",
         "--level", "seat rails", "--reason", "annual weighing", "--ref", "WO-1"),
        ("install", "KV-101", "cargo rack", "--mass", "140", "--arm", "150", "--reason",
         "cargo mod", "--ref", "WO-7", "--date", "2025-03-01", "--by", "T. Echnician"),
        ("install", "KV-101", "lamp", "--mass", "2 lb", "--arm", "80", "--lat-arm", "-5",
         "--reason", "new lamp", "--date", "2025-06-01", "--by", "T. Echnician"),
        ("remove", "KV-101", "cargo rack", "--reason", "mod removed", "--ref", "WO-9",
         "--date", "2025-09-01", "--by", "A. Mechanic"),
    ]
    for step in steps:
        r = cli(*step)
        assert r.exit_code == 0, r.stderr
    return cli


def test_record_figures_after_each_entry_match_the_hand_calculation(kept):
    """issue 13 item 19: running empty mass, moment and CG after each entry, display units."""
    r = kept("record", "KV-101", "--json")
    assert r.exit_code == 0, r.stderr
    doc = json.loads(r.stdout)
    assert doc["verified"] is True
    assert doc["units"]["moment_label"] == "lb*in/1000"
    assert [e["seq"] for e in doc["entries"]] == [seq for seq, *_ in BY_HAND]
    for e, (seq, mass, moment, cg) in zip(doc["entries"], BY_HAND):
        assert_close(e["empty_mass"], mass, unit="lb", what=f"mass after #{seq}",
                     source=FAA_H_8083_1)
        assert_close(e["empty_moment"], moment / 1000, unit="lb*in/1000",
                     what=f"moment after #{seq}", source=FAA_H_8083_1)
        assert_close(e["cg"], cg, unit="in", what=f"CG after #{seq}", source=FAA_H_8083_1)
    weighing, rack, lamp, removal = doc["entries"]
    readings = {p["point"]: [p["reading"], p["tare"], p["net"], p["arm"]]
                for p in weighing["readings"]}
    assert sorted(readings) == ["left main", "nose", "right main"]
    for point, expected in (("nose", [1720.0, 5.0, 1715.0, 20.0]),
                            ("left main", [2572.5, 0.0, 2572.5, 100.0]),
                            ("right main", [2572.5, 0.0, 2572.5, 100.0])):
        assert readings[point] == pytest.approx(expected), point
    assert (weighing["scales"], weighing["level"]) == ("cells 1-3 (invented)", "seat rails")
    assert (rack["reason"], rack["reference"], rack["signatory"]) == (
        "cargo mod", "WO-7", "T. Echnician")
    assert_close(rack["change_moment"], 140 * 150 / 1000, unit="lb*in/1000", what="rack")
    assert (removal["change_mass"], removal["signatory"]) == (pytest.approx(-140.0),
                                                              "A. Mechanic")
    # Equipment now: only the lamp, 2 lb at 80 in, -5 in lateral, moment 160 lb*in.
    assert [(i["name"], i["seq"]) for i in doc["equipment"]] == [("lamp", 3)]
    item = doc["equipment"][0]
    assert (item["mass"], item["arm"], item["lateral_arm"], item["moment"]) == pytest.approx(
        (2.0, 80.0, -5.0, 0.160))
    assert lamp["item_arm"] == pytest.approx(80.0)


def test_record_on_the_terminal_fits_80_columns_and_says_who_why_and_what(kept):
    """issue 13 item 19: the terminal record: readings, the running record with reason,
    reference and signatory, the equipment list, signature lines and the caution."""
    r = kept("record", "KV-101")
    assert r.exit_code == 0, r.stderr
    lines = [ln.rstrip() for ln in r.stdout.splitlines()]
    assert lines[0] == "Weight and balance record: KV-101"
    assert all(len(ln) <= 80 for ln in lines), max(lines, key=len)
    words = [ln.split() for ln in lines]
    assert ["nose", "20.00", "1720.0", "5.0", "1715.0"] in words
    # the running record, hand figures as above (moment index = lb*in / 1000)
    assert ["1", "2025-01-10", "weighing", "6860.0", "548.800", "80.00"] in words
    # (a long item name may fold onto a second line; the figures never do)
    rows = {w[0]: w for w in words if len(w) > 2 and w[1].startswith("2025-")}
    assert rows["2"][:3] == ["2", "2025-03-01", "install"]
    assert rows["2"][-6:] == ["+140.0", "150.00", "+21.000", "7000.0", "569.800", "81.40"]
    assert rows["3"] == ["3", "2025-06-01", "install", "lamp", "+2.0", "80.00", "+0.160",
                         "7002.0", "569.960", "81.40"]
    assert rows["4"][-6:] == ["-140.0", "150.00", "-21.000", "6862.0", "548.960", "80.00"]
    assert "#2 why: cargo mod; ref: WO-7; by: T. Echnician" in lines
    assert ["lamp", "2.0", "80.00", "-5.00", "0.160", "#3", "2025-06-01"] in words
    assert ("Empty mass now 6862.0 lb, CG 80.00 in, moment 548.960 lb*in/1000 (after entry #4"
            in r.stdout)
    assert any(ln.startswith("Entries made by:") and "Date:" in ln for ln in lines)
    assert any(ln.startswith("Checked by:") for ln in lines)
    assert CAUTION_SHORT == " ".join(" ".join(lines[-2:]).split())


@pytest.mark.skipif(shutil.which("pdftotext") is None, reason="pdftotext (poppler-utils) is "
                    "not installed")
def test_record_pdf_has_the_figures_signature_lines_and_caution(kept, tmp_path):
    """issue 13 item 19: the PDF, read back with pdftotext as the sheet tests do."""
    pdf = tmp_path / "kv101.pdf"
    r = kept("record", "KV-101", "--pdf", str(pdf))
    assert r.exit_code == 0, r.stderr
    assert r.stderr == f"Wrote PDF: {pdf}\n"
    data = pdf.read_bytes()
    assert data.startswith(b"%PDF-") and b"CreationDate" not in data
    out = subprocess.run(["pdftotext", str(pdf), "-"], capture_output=True, text=True,
                         check=True).stdout
    flat = " ".join(out.split())
    assert CAUTION in flat and CAUTION_SHORT in flat
    for words in ("Weight and balance record KV-101", "Entries made by", "Checked by",
                  "name and signature", "cargo mod", "WO-7", "T. Echnician", "A. Mechanic",
                  "1720.0", "1715.0", "7000.0", "569.800", "81.40", "6862.0", "548.960",
                  "Equipment installed through the ledger", "lamp"):
        assert words in flat, words
    again = tmp_path / "again.pdf"
    assert kept("record", "KV-101", "--pdf", str(again)).exit_code == 0
    assert again.read_bytes() == data  # no date inside: the same record, the same bytes


def test_record_is_refused_on_a_ledger_that_does_not_verify(kept, tmp_path):
    """issue 13 item 19: a record with signature lines is never built on a changed ledger; it
    is refused in one line, as `sheet` refuses (rather than printed with a warning that a
    signature would then cover), and no PDF is written."""
    from ledger.store.db import make_engine

    eng = make_engine(kept.db_url)
    try:
        with eng.begin() as conn:
            guards.drop(conn, ["ledger_entries"])
            conn.execute(text("UPDATE ledger_entries SET empty_mass_kg = empty_mass_kg - 20 "
                              "WHERE seq = 2"))
        before = snapshot(eng)
        pdf = tmp_path / "no.pdf"
        r = kept("record", "KV-101", "--pdf", str(pdf))
        assert snapshot(eng) == before
    finally:
        eng.dispose()
    assert (r.exit_code, r.stdout) == (ChainError.exit_code, "")
    assert r.stderr == (
        "Error: the ledger of KV-101 does not verify, so no sheet or report is built on it: "
        "entry 2: its content does not match its hash (a field was changed after it was "
        "written). See `wbledger verify KV-101`\n")
    assert not pdf.exists()


def test_record_of_an_unknown_vehicle_or_paper_is_one_line(kept, tmp_path):
    r = kept("record", "NOPE-1")
    assert (r.exit_code, r.stdout) == (2, "")
    assert r.stderr.startswith("Error: no vehicle 'NOPE-1'. Known vehicles: KV-101")
    r = kept("record", "KV-101", "--pdf", str(tmp_path / "r.pdf"), "--paper", "A3")
    assert (r.exit_code, r.stdout, r.stderr) == (
        2, "", "Error: --paper = 'A3': one of A4, Letter\n")
    assert not (tmp_path / "r.pdf").exists()


# --- export --units (issue 13 item 19) ------------------------------------------------------

def test_export_in_display_units_has_the_record_precision(kept):
    """issue 13 item 19: `export --units display` writes the type's units at the precision
    people read (before: only SI floats with up to 17 digits); figures as by hand above."""
    r = kept("export", "KV-101", "--units", "display")
    assert r.exit_code == 0, r.stderr
    rows = [line.split(",") for line in r.stdout.splitlines()]
    assert rows[0][8:15] == ["item_mass_lb", "item_x_in", "delta_mass_lb",
                             "delta_moment_lbin_per_1000", "empty_mass_lb",
                             "empty_moment_lbin_per_1000", "cg_x_in"]
    figures = [row[8:15] for row in rows[1:]]
    assert figures == [["", "", "", "", "6860.0", "548.800", "80.00"],
                       ["140.0", "150.00", "+140.0", "+21.000", "7000.0", "569.800", "81.40"],
                       ["2.0", "80.00", "+2.0", "+0.160", "7002.0", "569.960", "81.40"],
                       ["140.0", "150.00", "-140.0", "-21.000", "6862.0", "548.960", "80.00"]]
    assert [row[5:8] for row in rows[1:3]] == [["annual weighing", "WO-1", "W. Eigher"],
                                               ["cargo mod", "WO-7", "T. Echnician"]]
    doc = json.loads(kept("export", "KV-101", "--units", "display", "--format", "json").stdout)
    assert doc["units"] == {"mass": "lb", "length": "in", "moment": "lb*in/1000"}
    assert [(e["empty_mass_lb"], e["empty_moment_lbin_per_1000"], e["cg_x_in"])
            for e in doc["entries"]] == [(6860.0, 548.8, 80.0), (7000.0, 569.8, 81.4),
                                         (7002.0, 569.96, 81.4), (6862.0, 548.96, 80.0)]


def test_default_export_stays_exact_and_imports_back(kept, tmp_path):
    """issue 13 item 19: the default export is still the lossless SI form: imported into a new
    ledger it reproduces every value and hash, and exporting again gives the same text. A
    display export is refused by import (it is for reading), nothing written."""
    for fmt in ("json", "csv"):
        exact = kept("export", "KV-101", "--format", fmt).stdout
        assert kept("export", "KV-101", "--format", fmt, "--units", "si").stdout == exact
        copy = f"sqlite:///{tmp_path / f'copy-{fmt}.sqlite3'}"
        assert kept("--db", copy, "init").exit_code == 0
        for path in write_types(tmp_path):
            assert kept("--db", copy, "type", "import", str(path)).exit_code == 0
        assert kept("--db", copy, "vehicle", "add", "KV-101", "--type", "TT-A1").exit_code == 0
        file = tmp_path / f"kv101.{fmt}"
        file.write_text(exact, encoding="utf-8")
        r = kept("--db", copy, "import-history", "KV-101", str(file))
        assert r.exit_code == 0, r.stderr
        assert kept("--db", copy, "export", "KV-101", "--format", fmt).stdout == exact
    display = tmp_path / "display.csv"
    display.write_text(kept("export", "KV-101", "--units", "display").stdout, encoding="utf-8")
    from ledger.store.db import make_engine

    eng = make_engine(kept.db_url)
    try:
        assert kept("vehicle", "add", "KV-102", "--type", "TT-A1").exit_code == 0
        before = snapshot(eng)
        r = kept("import-history", "KV-102", str(display))
        assert (r.exit_code, r.stdout) == (2, "")
        assert r.stderr.startswith("Error: display.csv")
        assert snapshot(eng) == before
    finally:
        eng.dispose()


def test_export_units_is_checked(kept):
    r = kept("export", "KV-101", "--units", "imperial")
    assert (r.exit_code, r.stdout, r.stderr) == (
        2, "", "Error: --units = 'imperial': si or display\n")
