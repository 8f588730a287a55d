"""The terminal loading sheet: content, display units, verdict, caution, 80 columns."""

from __future__ import annotations

import io
import re
import subprocess
import sys

import pytest
from rich.cells import cell_len
from rich.console import Console

from ledger.caution import CAUTION, GROUND_CAUTION
from ledger.report.sheet_text import SheetView, render_sheet, sheet_text
from tests.report import samples

ALL = [samples.airplane_in_limits, samples.airplane_out_of_limits, samples.helicopter_lateral,
       samples.ground_vehicle, samples.airplane_moment_envelope, samples.airplane_path_leaves]
BOX = "".join(chr(c) for c in range(0x2500, 0x2580))


def flat(text: str) -> str:
    """Text without box-drawing characters, whitespace collapsed (wrapped lines rejoined)."""
    return " ".join(text.translate({ord(c): " " for c in BOX}).split())


def section(text: str, title: str) -> str:
    """The lines of one section: from its heading to the next heading or panel."""
    lines = text.splitlines()
    start = next(i for i, s in enumerate(lines) if s.startswith(f" {title} "))
    out = []
    for s in lines[start + 1:]:
        if re.match(r"^ [A-Z][A-Z ,()0-9-]+ \u2500", s) or (s and s[0] in "\u2554\u250f"):
            break
        out.append(s)
    return "\n".join(out)


def row(text: str, *first: str) -> list[str]:
    """Cells (split on blanks) of the first table row whose cells start with ``first``."""
    for s in text.splitlines():
        cells = s.split()
        if tuple(cells[:len(first)]) == first or (len(first) == 1 and s.startswith(first[0])):
            return cells
    raise AssertionError(f"no row starting with {first!r}")


@pytest.fixture(scope="module", params=ALL, ids=lambda f: f.__name__)
def rendered(request):
    doc = request.param()
    return doc, sheet_text(doc)


def test_every_sheet_shows_the_caution(rendered):
    doc, text = rendered
    assert CAUTION in flat(text)


@pytest.mark.parametrize("width", [60, 80, 100])
def test_no_line_is_wider_than_the_width(width):
    for make in ALL:
        text = sheet_text(make(), width=width)
        widest = max(cell_len(s) for s in text.splitlines())
        assert widest <= width, (make.__name__, widest)


def test_eighty_columns_by_default(rendered):
    _, text = rendered
    assert max(cell_len(s) for s in text.splitlines()) <= 80


def test_heading_names_vehicle_type_revision_entry_preparer_and_masses():
    text = sheet_text(samples.airplane_in_limits())
    f = flat(text)
    assert "LOADING SHEET KV-101" in f
    assert "KV-P4 revision 2 (airplane)" in f
    assert "ledger entry #3 of 2026-11-30" in f
    assert "R. Tanaka (invented), 2026-12-01 09:00 UTC" in f
    assert "faa-light-170lb: Crew and passengers 170 lb each" in f
    assert "not saved (draft)" in f
    assert "moment index = lb*in / 1000" in f


def test_saved_and_amended_sheet_says_so():
    doc = samples.with_changes(samples.airplane_in_limits(),
                               sheet={"id": 12, "amends": 11, "saved": True})
    assert "saved as sheet #12, amends sheet #11" in flat(sheet_text(doc))


def test_items_are_shown_in_display_units_with_moments():
    text = sheet_text(samples.airplane_out_of_limits())
    load = section(text, "LOAD BY STATION")
    # The sample stores SI (150 lb → 68.0388555 kg, 95 in → 2.413 m; NIST SP 811 exact
    # factors); the sheet converts back to the type's lb and in.
    assert row(load, "baggage") == ["baggage", "bags", "and", "tools", "150.0", "95.00",
                                    "14.25", "120.0"]
    # Zero-fuel total, by hand from the sample's figures in lb and in:
    # moments 1495×38.9 + 200×37 + 190×37 + 210×73 + 200×73 + 150×95 = 116 765.5 lb·in,
    # mass 2445 lb, CG 116 765.5 / 2445 = 47.757 in, index /1000 = 116.77.
    assert row(load, "zero-fuel") == ["zero-fuel", "total", "2445.0", "47.76", "116.77"]
    assert row(load, "empty weight")[-3:] == ["1495.0", "38.90", "58.16"]


def test_standard_masses_are_marked():
    text = sheet_text(samples.airplane_in_limits())
    load = section(text, "LOAD BY STATION")
    assert "170.0*" in row(load, "rear_left")
    assert "* standard mass (faa-light-170lb)" in load


def test_phases_table_shows_mass_limit_margin_cg_mac_index():
    text = sheet_text(samples.airplane_out_of_limits())
    phases = section(text, "PHASES")
    # Take-off: 2445 + 288 − 8.4 = 2724.6 lb against 2550 → margin −174.6 lb.
    # %MAC = (47.78 − 30.0) / 58.0 × 100 = 30.7 (sample MAC: LEMAC 30 in, length 58 in).
    assert row(phases, "Take-off") == ["Take-off", "2724.6", "2550.0", "-174.6", "47.78",
                                       "30.7", "130.19", "OUT"]
    assert row(phases, "Zero-fuel")[2:4] == ["\u2014", "\u2014"]  # no zero-fuel limit
    assert "Index: moment in lb*in / 1000" in phases


def test_margins_table_shows_forward_and_aft_margins():
    text = sheet_text(samples.airplane_in_limits())
    margins = section(text, "ENVELOPE MARGINS")
    zf = row(margins, "Zero-fuel")
    # By hand: zero-fuel CG 86 945.5 lb·in / 2045 lb = 42.516 in. At 2045 lb the forward
    # limit lies on the sloped edge: 35.0 + (39.5 − 35.0)·(2045 − 1950)/(2550 − 1950)
    # = 35.7125 in → margin +6.80 in; aft 47.30 − 42.516 = +4.78 in.
    assert zf[:6] == ["Zero-fuel", "normal", "long.", "yes", "+6.80", "+4.78"]


def test_fuel_table_and_burn_sequence():
    text = sheet_text(samples.airplane_in_limits())
    fuel = section(text, "FUEL")
    # 48 US gal at the nominal 6.0 lb/US gal (FAA-H-8083-30 ch. 4) = 288 lb; taxi 1.4 gal
    # = 8.4 lb; trip 30 gal = 180 lb; landing 16.6 gal = 99.6 lb; usable 53 − 3 = 50 gal.
    assert row(fuel, "main") == ["main", "avgas", "6.000", "50.0", "48.0", "288.0", "8.4",
                                 "180.0", "99.6"]
    assert "Burn sequence: proportional" in fuel


def test_chart_marks_the_phase_points_the_outline_and_the_path():
    text = sheet_text(samples.airplane_in_limits())
    chart = section(text, "ENVELOPE NORMAL, LONGITUDINAL")
    grid = [s for s in chart.splitlines() if "|" in s or s.lstrip()[:1].isdigit()]
    body = "\n".join(grid)
    for mark in "ZRTL":
        assert mark in body, mark
    assert "+" in body and "-" in body and "|" in body and "." in body
    assert "mass (lb)" in chart and "CG arm (in from datum, + aft)" in chart
    assert "Z Zero-fuel: 2045.0 lb, CG 42.52 in, inside" in chart


def test_out_of_limits_sheet_shows_violations_fixes_and_verdict():
    doc = samples.airplane_out_of_limits()
    text = sheet_text(doc)
    f = flat(text)
    assert "OUT OF LIMITS" in f and not re.search(r"\bIN LIMITS", f)
    viol = section(text, "LIMITS EXCEEDED (5)")
    for v in doc["violations"]:
        assert v["message"] in flat(viol)
    # the phase is named once: messages that start with it get no prefix
    assert "3. Take-off mass 2724.6 lb" in viol
    assert "5. [Trip] While fuel burns" in viol
    fixes = flat(section(text, "WAYS TO BRING THE LOAD WITHIN LIMITS"))
    assert "A) Offload 180 lb of baggage" in fixes
    assert "re-checked: within limits" in fixes
    assert "B) Move 30 lb from baggage to rear_right \u2014 re-checked: not enough on its own" \
        in fixes
    assert "5 limits exceeded: this loading must not be used as planned." in f
    # take-off is already outside: no "leaves here" mark, the points say OUTSIDE
    assert "leaves this envelope" not in text
    assert "Z Zero-fuel: 2445.0 lb, CG 47.76 in, OUTSIDE" in text
    assert "No fix is listed" not in text


def test_burn_path_that_leaves_between_take_off_and_landing_is_marked():
    doc = samples.airplane_path_leaves()
    text = sheet_text(doc)
    chart = section(text, "ENVELOPE NORMAL, LONGITUDINAL")
    assert "T Take-off: 2324.6 lb, CG 43.18 in, inside" in chart
    assert "L Landing: 2144.6 lb, CG 42.77 in, inside" in chart
    assert "! the burn path leaves this envelope at 2216.6 lb" in chart
    grid = [s for s in chart.splitlines() if "|" in s or s.lstrip()[:1].isdigit()]
    assert sum(s.count("!") for s in grid) == 1
    assert "OUT OF LIMITS" in text
    assert "[Trip] While fuel burns" in flat(text)


def test_out_of_limits_without_fixes_says_so():
    doc = samples.with_changes(samples.airplane_out_of_limits(), fixes=[],
                               fixes_note="No single change brings this load within limits.")
    text = flat(sheet_text(doc))
    assert "WAYS TO BRING THE LOAD WITHIN LIMITS No single change brings" in text
    assert "No fix is listed: change the plan." in text


def test_in_limits_sheet_verdict_and_no_violation_sections():
    text = sheet_text(samples.airplane_in_limits())
    assert re.search(r"\bIN LIMITS", text) and "OUT OF LIMITS" not in text
    assert "LIMITS EXCEEDED" not in text and "WAYS TO BRING" not in text


def test_violation_in_si_message_gets_display_figures():
    """A message not in the display unit is followed by the figures in display units."""
    doc = samples.airplane_out_of_limits()
    doc["violations"] = [{"code": "mass_limit", "phase": "takeoff",
                          "subject": "maximum take-off mass", "limit": 1156.6605435,
                          "actual": 1235.8, "excess": 79.1394565, "unit": "kg",
                          "message": "Take-off mass 1235.8 kg is over the maximum"}]
    viol = flat(section(sheet_text(doc), "LIMITS EXCEEDED (1)"))
    # 1156.6605435 kg / 0.45359237 = 2550.0 lb (NIST SP 811: 1 lb = 0.45359237 kg exactly)
    assert "limit 2550.0 lb" in viol and "excess 174.5 lb" in viol


def test_helicopter_shows_lateral_arms_and_a_lateral_chart():
    text = sheet_text(samples.helicopter_lateral())
    load = section(text, "LOAD BY STATION")
    # Arms in m to 0.1 mm (4 decimals): see ledger.units.display_decimals.
    assert row(load, "front_left")[-3:] == ["2.1000", "-0.3500", "168.0"]
    assert "Lateral" in load
    lat = section(text, "ENVELOPE NORMAL, LATERAL")
    assert "lateral CG (m, + right)" in lat
    assert "Z Zero-fuel: 1385.0 kg, lat. CG +0.0088 m, inside" in lat
    margins = section(text, "ENVELOPE MARGINS")
    assert "normal lat." in margins and "normal long." in margins
    # no reduction factor with kg·m: the column is the moment itself
    assert "Moment" in section(text, "PHASES")


def test_ground_vehicle_shows_axles_and_no_chart():
    doc = samples.ground_vehicle()
    text = sheet_text(doc)
    axles = section(text, "AXLES")
    for phase in doc["phases"]:
        front = phase["axles"][0]
        title = phase["name"].capitalize()
        assert row(axles, title, "front") == [
            title, "front", f"{front['load_kg']:.1f}", "5000.0",
            f"{5000.0 - front['load_kg']:+.1f}", f"{front['left_kg']:.1f}",
            f"{front['right_kg']:.1f}", "ok"]
    assert "Axle-group rules: US federal (Interstate) (23 CFR 658.17)" in axles
    # 20,000 lb = 9071.847 kg (23 CFR 658.17; 1 lb = 0.45359237 kg, NIST SP 811)
    assert "Advisory: Departure: single axle (rear axle): " in axles
    assert "against 9071.8 kg, within" in axles
    fuel = section(text, "FUEL")
    assert "Depart." in fuel and "Arrival" in fuel and "Landing" not in fuel
    assert GROUND_CAUTION in flat(text)
    assert "ENVELOPE NORMAL" not in text
    assert "axle loads are within the limits" in flat(text)


def test_axle_over_rating_is_marked():
    doc = samples.ground_vehicle()
    front = doc["phases"][1]["axles"][0]
    front.update(rating_kg=4000.0, margin_kg=4000.0 - front["load_kg"], in_limits=False)
    axles = section(sheet_text(doc), "AXLES")
    cells = row(axles, "Arrival", "front")
    assert cells[-1] == "OUT" and cells[4].startswith("-")
    assert row(axles, "Departure", "front")[-1] == "ok"


def test_axles_without_phases_use_the_top_level_table():
    doc = samples.ground_vehicle()
    for phase in doc["phases"]:
        phase.pop("axles")
    axles = section(sheet_text(doc), "AXLES")
    assert row(axles, "front")[0] == "front" and "Phase" not in axles


def test_moment_envelope_chart_uses_the_moment_index():
    text = sheet_text(samples.airplane_moment_envelope())
    chart = section(text, "ENVELOPE NORMAL, LONGITUDINAL")
    assert "moment index (lb*in / 1000)" in chart
    # 1495×38.9 + 180×37 + 40×95 = 68 615.5 lb·in → index 68.62 (by hand)
    assert "Z Zero-fuel: 1715.0 lb, index 68.62, inside" in chart


def test_render_to_a_given_console_and_a_wide_console_is_capped():
    buf = io.StringIO()
    console = Console(file=buf, width=132, color_system=None, record=True)
    render_sheet(samples.airplane_out_of_limits(), console=console, width=80)
    out = console.export_text()
    assert CAUTION in flat(out)
    assert max(cell_len(s.rstrip()) for s in out.splitlines()) <= 80


def test_sparse_document_renders():
    """Missing optional parts (no fuel, no polygons, no burn path) still give a sheet."""
    doc = samples.airplane_in_limits()
    for key in ("fuel", "burn", "burn_path", "envelope_polygons", "fixes", "violations",
                "standard_masses", "configuration", "sheet"):
        doc.pop(key)
    doc.pop("caution")  # the renderer falls back to the standard caution
    text = sheet_text(doc)
    assert CAUTION in flat(text)
    assert "FUEL" not in text and "ENVELOPE NORMAL" not in text


def test_sheet_view_formats_in_display_units():
    view = SheetView(samples.airplane_in_limits())
    assert view.mass(0.45359237) == "1.0"           # 1 lb exactly (NIST SP 811)
    assert view.length(0.0254) == "1.00"            # 1 in exactly (NIST SP 811)
    assert view.volume(3.785411784e-3) == "1.0"     # 1 US gal exactly (NIST SP 811)
    assert view.length(-1e-9, signed=True) == "0.00"
    assert view.signature_roles == ["Prepared by", "Checked by", "Commander"]
    assert SheetView(samples.ground_vehicle()).signature_roles[-1] == "Driver"


def test_importing_the_text_sheet_loads_no_plotting_library():
    code = ("import sys, ledger.report.sheet_text, ledger.report.sheet_pdf, "
            "ledger.report.textchart; print('matplotlib' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         check=True)
    assert out.stdout.strip() == "False"


def test_user_text_is_not_read_as_markup():
    doc = samples.airplane_out_of_limits()
    doc["items"][0]["label"] = "[bold]Kim[/]"
    doc["fixes"][0]["description"] = "Move [x] to [/y]"
    text = sheet_text(doc)
    assert "[bold]Kim[/]" in text
    assert "Move [x] to [/y]" in text


def test_violation_figures_in_each_display_dimension():
    view = SheetView(samples.airplane_in_limits())
    # 1000 lb·in = 11.521246198 kg·m (NIST SP 811 factors) → index 1.00 at /1000
    assert view.quantity(11.521246198, "kg*m") == "1.00 lb*in/1000"
    # 1 lb/in² = 0.45359237 / 0.0254² kg/m² = 703.0695796 kg/m²
    assert view.quantity(703.0695796, "kg/m2") == "1.00 lb/in2"
    assert view.quantity(0.0254, "m") == "1.00 in"
    assert view.quantity(3.785411784e-3, "m3") == "1.0 USgal"
    assert view.quantity(None, "kg") == "\u2014"
