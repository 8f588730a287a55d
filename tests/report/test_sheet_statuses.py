"""Issue 13: what the loading sheet shows agrees with the verdict, and the plan's note.

Item 1: a plan over the maximum zero-fuel mass with its CG inside the envelope polygon. The
chart legend must not call the zero-fuel point "inside" without saying it is over, the margins
must show the mass limit exceeded (negative room), and every chart draws the maximum zero-fuel,
take-off and landing masses as lines. Item 18: the plan's ``note`` is on the sheet.
Invented test type (tests/report/common.py).
"""

from __future__ import annotations

import re
import shutil
import subprocess
import xml.etree.ElementTree as ET

import pytest

from ledger.report.sheet_pdf import write_pdf, write_svg
from ledger.report.sheet_text import sheet_text
from tests.report.common import OVER_ZF_PLAN, built

NOTE = "Ferry to base; rear seats out"
SVG_NS = "{http://www.w3.org/2000/svg}"


def _svg_text(path) -> str:
    root = ET.parse(path).getroot()
    return " ".join(" ".join("".join(t.itertext()) for t in root.iter(f"{SVG_NS}text")).split())


@pytest.fixture(scope="module")
def over_zf():
    doc = built(OVER_ZF_PLAN, note=NOTE)
    assert doc["verdict"] == "out_of_limits"
    zf = doc["phases"][0]
    assert zf["name"] == "zero_fuel" and zf["envelopes"][0]["inside"]  # CG inside the polygon
    assert zf["mass_margin_kg"] < 0  # but 50 lb over the maximum zero-fuel mass
    return doc


def test_legend_says_the_zero_fuel_point_is_over_its_limit(over_zf):
    text = sheet_text(over_zf, 100)
    lines = text.splitlines()
    at = next(i for i, s in enumerate(lines) if s.strip().startswith("Z Zero-fuel:"))
    legend = " ".join(" ".join(lines[at:at + 2]).split())  # the line and its continuation
    assert not legend.rstrip().endswith(", inside")
    assert "OVER maximum zero-fuel mass by 50.0 lb" in legend
    take_off = next(s for s in text.splitlines() if s.strip().startswith("T Take-off:"))
    assert take_off.rstrip().endswith(", inside")  # in limits: unchanged


def test_margins_show_the_mass_limit_exceeded(over_zf):
    text = sheet_text(over_zf, 100)
    rows = [s.split() for s in text.splitlines() if s.startswith("Zero-fuel ")]
    margins = next(r for r in rows if "long." in r)
    assert margins[3] == "NO"            # not in limits, although the CG is inside
    assert margins[-1] == "-50.0"        # room above: the limit exceeded by 50 lb
    assert not any(c.startswith("+") for c in margins[-1:])


def test_text_chart_draws_the_maximum_masses_as_lines(over_zf):
    text = sheet_text(over_zf, 100)
    chart = text.split("ENVELOPE NORMAL")[1].split("LIMITS EXCEEDED")[0]
    rows = [s for s in chart.splitlines() if re.match(r"^\s*[\d/]+ =+", s)]
    margins = {s.split()[0] for s in rows}
    # 1,500 lb alone; 2,400 and 2,450 lb share a row at this scale (100 lb a row)
    assert margins == {"1500", "2400/2450"}, chart
    assert ("= mass limits: max. zero-fuel 1500.0 lb, max. landing 2400.0 lb, max. take-off "
            "2450.0 lb") in " ".join(chart.split())


def test_svg_draws_the_lines_and_states_the_real_status(over_zf, tmp_path):
    text = _svg_text(write_svg(over_zf, tmp_path / "s.svg"))
    for label in ("max. zero-fuel", "max. take-off", "max. landing"):
        assert label in text
    assert "CG inside the envelope, OVER maximum zero-fuel mass by 50.0 lb" in text
    assert "Z Zero-fuel: 1550.0 lb, CG 80.97 in, inside" not in text.replace(", OVER", "|")


def test_the_plan_note_is_in_the_json_and_on_screen(over_zf):
    """Issue 13 item 18."""
    assert over_zf["note"] == NOTE
    assert re.search(rf"Note\s+{re.escape(NOTE)}", sheet_text(over_zf, 100))
    assert built(OVER_ZF_PLAN)["note"] is None


def test_the_plan_note_is_printed(over_zf, tmp_path):
    """Issue 13 item 18: PDF and SVG."""
    assert NOTE in _svg_text(write_svg(over_zf, tmp_path / "n.svg"))
    pdftotext = shutil.which("pdftotext")
    if pdftotext is None:
        pytest.skip("pdftotext (poppler-utils) is not installed; the SVG check ran")
    out = subprocess.run([pdftotext, str(write_pdf(over_zf, tmp_path / "n.pdf")), "-"],
                         capture_output=True, text=True, check=True).stdout
    assert NOTE in " ".join(out.split())
