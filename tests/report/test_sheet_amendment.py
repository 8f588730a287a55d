"""Issue 13 item 4: an amended sheet says what changed from the sheet it amends.

The JSON document's ``amendment.differences`` (docs/sheet-document.md) lists the load, fuel and
people changed and each phase's mass and CG before and after; the terminal sheet and the PDF
show them as two tables. Through the command line on the saved-sheet test type (invented,
tests/store/test_sheets.py), and on the renderer with a small built type.
"""

from __future__ import annotations

import json
import re

import pytest

from ledger.loadsheet.amend import amendment_doc, compare_plans
from ledger.report.sheet_pdf import write_svg
from ledger.report.sheet_text import sheet_text
from ledger.testing import assert_close
from ledger.typedata.model import Tolerances
from tests.loadsheet.common import LB, make_type, plan_of
from tests.report.common import OVER_ZF_PLAN, OVER_ZF_TYPE, built, saved_sheet_vehicle

AFTER_PLAN = OVER_ZF_PLAN.replace("mass = 100", "mass = 60")  # 40 lb less baggage


@pytest.fixture
def amended():
    """Sheet 4 (100 lb of baggage) amended to 60 lb, as the services assemble it."""
    vt = make_type(OVER_ZF_TYPE)
    before_plan, after_plan = plan_of(vt, OVER_ZF_PLAN), plan_of(vt, AFTER_PLAN)
    before, after = built(OVER_ZF_PLAN, sheet_id=4), built(AFTER_PLAN)
    check = compare_plans(before_plan, after_plan, Tolerances(last_minute_mass_kg=50 * LB))
    after["amendment"] = amendment_doc(check, of=4, first_sheet=4, before_plan=before_plan,
                                       after_plan=after_plan, before=before, after=after)
    after["sheet"] = {"id": 5, "amends": 4, "saved": True}
    return after


def test_differences_in_the_document(amended):
    diff = amended["amendment"]["differences"]
    assert diff["from_sheet"] == 4
    [change] = diff["changes"]
    assert (change["kind"], change["subject"]) == ("station", "baggage")
    assert_close(change["before_kg"] / LB, 100.0, unit="lb", rtol=1e-12)
    assert_close(change["after_kg"] / LB, 60.0, unit="lb", rtol=1e-12)
    zf = diff["phases"][0]
    assert zf["name"] == "zero_fuel"
    assert_close((zf["mass_before_kg"] - zf["mass_after_kg"]) / LB, 40.0, unit="lb", rtol=1e-9)
    # 40 lb off at 95 in moves the CG forward: (1550 × 80.97 − 40 × 95) / 1510 (exact sums)
    before_in = (1250 * 80 + 200 * 80 + 100 * 95) / 1550
    after_in = (1250 * 80 + 200 * 80 + 60 * 95) / 1510
    assert_close(zf["cg_before_m"]["x"] / 0.0254, before_in, unit="in", rtol=1e-9)
    assert_close(zf["cg_after_m"]["x"] / 0.0254, after_in, unit="in", rtol=1e-9)
    assert [p["name"] for p in diff["phases"]] == ["zero_fuel", "ramp", "takeoff", "landing"]


def test_differences_on_screen_and_in_print(amended, tmp_path):
    text = sheet_text(amended, 100)
    assert "CHANGES FROM SHEET #4" in text and "PHASES AGAINST SHEET #4" in text
    assert re.search(r"station\s+baggage\s+100\.0\s+60\.0\s+-40\.0", text)
    assert re.search(r"Zero-fuel\s+1550\.0\s+1510\.0\s+-40\.0\s+80\.97\s+80\.60\s+-0\.37", text)
    svg = write_svg(amended, tmp_path / "a.svg").read_text(encoding="utf-8")
    for s in ("Changes from sheet #4", "Phases against sheet #4", "baggage", "-40.0"):
        assert s in svg


def test_amend_through_the_command_line_reports_the_differences(cli, tmp_path):
    saved_sheet_vehicle(cli, tmp_path)
    first = json.loads(cli("sheet", "prepare", tmp_path / "ok.toml", "--save", "--json").stdout)
    r = cli("sheet", "amend", str(first["sheet"]["id"]), "--cargo", "baggage=55", "--json")
    assert r.exit_code == 0, r.stderr
    diff = json.loads(r.stdout)["amendment"]["differences"]
    assert diff["from_sheet"] == first["sheet"]["id"]
    assert [(c["subject"], round(c["after_kg"] / LB, 6)) for c in diff["changes"]] == \
        [("baggage", 55.0)]
    assert_close((diff["phases"][0]["mass_after_kg"] - diff["phases"][0]["mass_before_kg"])
                 / LB, 15.0, unit="lb", rtol=1e-9)
    r = cli("sheet", "amend", str(json.loads(r.stdout)["sheet"]["id"]), "--cargo",
            "baggage=50")
    assert r.exit_code == 0, r.stderr
    assert re.search(r"baggage\s+55\.0\s+50\.0\s+-5\.0", r.stdout)  # from the sheet it amends
