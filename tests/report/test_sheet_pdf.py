"""The printed loading sheet: PDF and SVG with the caution, the content, signature lines.

Text is read back from the PDF with ``pdftotext`` (poppler-utils) when it is installed, and
always from the SVG (matplotlib keeps text as text with ``svg.fonttype = 'none'``).
"""

from __future__ import annotations

import re
import shutil
import subprocess
import xml.etree.ElementTree as ET

import pytest

from ledger.caution import CAUTION, CAUTION_SHORT, GROUND_CAUTION
from ledger.errors import InputError
from ledger.report.sheet_pdf import write_pdf, write_svg
from tests.report import samples

SVG_NS = "{http://www.w3.org/2000/svg}"
PDFTOTEXT = shutil.which("pdftotext")
PDFINFO = shutil.which("pdfinfo")
needs_poppler = pytest.mark.skipif(PDFTOTEXT is None, reason="pdftotext (poppler-utils) is not "
                                   "installed; the SVG tests still check the text")


def flat(text: str) -> str:
    return " ".join(text.split())


def pdf_text(path) -> str:
    out = subprocess.run([PDFTOTEXT, str(path), "-"], capture_output=True, text=True,
                         check=True)
    return flat(out.stdout)


def svg_text(path) -> str:
    root = ET.parse(path).getroot()  # raises if the SVG is not well-formed XML
    assert root.tag == f"{SVG_NS}svg"
    return flat(" ".join("".join(t.itertext()) for t in root.iter(f"{SVG_NS}text")))


@pytest.fixture(scope="module")
def out_of_limits(tmp_path_factory):
    d = tmp_path_factory.mktemp("sheet")
    doc = samples.airplane_out_of_limits()
    doc["sheet"] = {"id": 7, "amends": None, "saved": True}  # saved: signature lines
    return doc, write_pdf(doc, d / "oo.pdf"), write_svg(doc, d / "oo.svg")


@pytest.fixture(scope="module")
def ground(tmp_path_factory):
    d = tmp_path_factory.mktemp("ground")
    doc = samples.ground_vehicle()
    doc["sheet"] = {"id": 8, "amends": None, "saved": True}  # saved: signature lines
    return doc, write_pdf(doc, d / "g.pdf", paper="Letter"), write_svg(doc, d / "g.svg")


def test_pdf_is_a_pdf(out_of_limits):
    _, pdf, _ = out_of_limits
    data = pdf.read_bytes()
    assert data.startswith(b"%PDF-")
    assert data.rstrip().endswith(b"%%EOF")
    assert b"CreationDate" not in data  # no date: the same document gives the same bytes


def test_pdf_is_deterministic(out_of_limits, tmp_path):
    doc, pdf, svg = out_of_limits
    again = write_pdf(doc, tmp_path / "again.pdf")
    assert again.read_bytes() == pdf.read_bytes()
    again_svg = write_svg(doc, tmp_path / "again.svg")
    assert again_svg.read_bytes() == svg.read_bytes()


@needs_poppler
def test_pdf_text_has_caution_signatures_verdict_and_violations(out_of_limits):
    doc, pdf, _ = out_of_limits
    text = pdf_text(pdf)
    assert CAUTION in text
    assert CAUTION_SHORT in text  # footer of every page
    for label in ("Prepared by", "Checked by", "Commander", "Date", "name and signature"):
        assert label in text, label
    assert "OUT OF LIMITS" in text
    for v in doc["violations"]:
        assert v["message"] in text
    for f in doc["fixes"]:
        assert f["description"] in text
    assert "Loading sheet KV-101" in text
    assert "KV-P4 revision 2" in text


@needs_poppler
def test_pdf_pages_are_numbered_and_carry_the_caution(out_of_limits):
    _, pdf, _ = out_of_limits
    out = subprocess.run([PDFTOTEXT, str(pdf), "-"], capture_output=True, text=True,
                         check=True).stdout
    pages = out.split("\f")
    pages = [p for p in pages if p.strip()]
    n = len(pages)
    assert n >= 1
    for i, page in enumerate(pages, 1):
        assert f"page {i} of {n}" in page
        assert CAUTION_SHORT in flat(page)


@pytest.mark.skipif(PDFINFO is None, reason="pdfinfo (poppler-utils) is not installed")
def test_paper_sizes(out_of_limits, ground):
    def size(path):
        info = subprocess.run([PDFINFO, str(path)], capture_output=True, text=True,
                              check=True).stdout
        m = re.search(r"Page size:\s+([\d.]+) x ([\d.]+) pts", info)
        return float(m.group(1)), float(m.group(2))

    # A4 is 210 × 297 mm = 595.3 × 841.9 pt (ISO 216); we use 8.27 × 11.69 in.
    w, h = size(out_of_limits[1])
    assert w == pytest.approx(595.3, abs=0.5) and h == pytest.approx(841.9, abs=0.5)
    # Letter is 8.5 × 11 in = 612 × 792 pt.
    assert size(ground[1]) == (612.0, 792.0)


def test_svg_is_xml_with_the_caution_and_signature_lines(out_of_limits):
    doc, _, svg = out_of_limits
    text = svg_text(svg)
    assert CAUTION in text
    for label in ("Prepared by", "Checked by", "Commander", "Date"):
        assert label in text
    assert "OUT OF LIMITS" in text
    assert doc["violations"][2]["message"] in text
    # the chart: phase letters and axis label are text in the SVG
    assert "CG arm (in from datum, + aft)" in text
    assert "Z Zero-fuel: 2445.0 lb, CG 47.76 in, OUTSIDE" in text


def test_svg_has_the_paper_width(out_of_limits):
    root = ET.parse(out_of_limits[2]).getroot()
    assert root.get("width") == "595.44pt"  # 8.27 in × 72


def test_ground_vehicle_sheet_has_driver_axles_and_ground_caution(ground):
    _, pdf, svg = ground
    text = svg_text(svg)
    assert "Driver" in text and "Commander" not in text
    assert "Axles" in text and GROUND_CAUTION in text and CAUTION in text
    if PDFTOTEXT:
        assert "Driver" in pdf_text(pdf) and GROUND_CAUTION in pdf_text(pdf)


def test_helicopter_sheet_draws_both_envelopes(tmp_path):
    svg = write_svg(samples.helicopter_lateral(), tmp_path / "h.svg")
    text = svg_text(svg)
    assert "Envelope normal, longitudinal" in text and "Envelope normal, lateral" in text
    assert "lateral CG (m, + right)" in text
    assert CAUTION in text


def test_unknown_paper_is_refused(tmp_path):
    with pytest.raises(InputError, match="paper = 'A5': one of A4, Letter"):
        write_pdf(samples.airplane_in_limits(), tmp_path / "x.pdf", paper="A5")
    assert not (tmp_path / "x.pdf").exists()


def test_burn_path_exit_is_drawn_and_named(tmp_path):
    svg = write_svg(samples.airplane_path_leaves(), tmp_path / "p.svg")
    text = svg_text(svg)
    assert "leaves envelope" in text  # the chart legend entry of the exit marker
    assert "the burn path leaves this envelope at 2216.6 lb" in text
