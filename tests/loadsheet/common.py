"""Helpers shared by the loading-sheet tests; the small test types are built with
:mod:`ledger.testing` (``lb_in_type``, ``station``, ``envelope``).
"""

from __future__ import annotations

from ledger.loadsheet import EmptyWeight, build_sheet
from ledger.testing import envelope, lb_in_type, station  # noqa: F401 - shared with the suite
from ledger.typedata import parse_type_text
from ledger.typedata.plan import parse_plan, read_plan_text

LB = 0.45359237   # kg, exact (NIST SP 811, appendix B)
IN = 0.0254       # m, exact (NIST SP 811, appendix B)
USGAL = 3.785411784e-3  # m3, exact (NIST SP 811, appendix B)


def make_type(text: str):
    return parse_type_text(text, source="test type")


def empty_lb_in(mass_lb: float, cg_in: float, y_in: float = 0.0) -> EmptyWeight:
    m = mass_lb * LB
    return EmptyWeight(mass_kg=m, mx_kgm=m * cg_in * IN, my_kgm=m * y_in * IN, seq=1,
                       entry_date="2026-11-30", entry_id=1)


def plan_of(vtype, toml_body: str, vehicle: str = "T-1"):
    raw = read_plan_text(f'plan_format = 1\nvehicle = "{vehicle}"\n' + toml_body, "plan.toml")
    return parse_plan(raw, vtype, source="plan.toml")


def sheet(vtype, empty, body: str, **kw) -> dict:
    return build_sheet(vtype, empty, plan_of(vtype, body), type_revision=1, **kw)
