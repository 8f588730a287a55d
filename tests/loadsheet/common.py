"""Small vehicle types built in the tests, and helpers shared by the loading-sheet tests.

The types are test fixtures (no real aircraft): each test that checks a figure says which
published example or formula the figure comes from.
"""

from __future__ import annotations

from ledger.loadsheet import EmptyWeight, build_sheet
from ledger.typedata import parse_type_text
from ledger.typedata.plan import parse_plan, read_plan_text

LB = 0.45359237   # kg, exact (NIST SP 811, appendix B)
IN = 0.0254       # m, exact (NIST SP 811, appendix B)
USGAL = 3.785411784e-3  # m3, exact (NIST SP 811, appendix B)


def lb_in_type(*, name: str = "TEST-LBIN", limits: str = "max_takeoff = 8000",
               stations: str = "", tanks: str = "", envelopes: str = "", extra: str = "",
               kind: str = "airplane") -> str:
    """TOML text of a test type in lb and in (moment index lb*in / 1000)."""
    return f"""
format_version = 1
[vehicle]
name = "{name}"
title = "Test type {name}"
kind = "{kind}"
[units]
mass = "lb"
length = "in"
volume = "USgal"
moment_divisor = 1000
[datum]
description = "test datum"
[limits]
{limits}
{stations}
{tanks}
{envelopes}
{extra}
"""


def station(name: str, kind: str, x: float, *, max_mass: float | None = None,
            y: float | None = None, extra: str = "") -> str:
    text = f'\n[[station]]\nname = "{name}"\nkind = "{kind}"\nx = {x}\n'
    if y is not None:
        text += f"y = {y}\n"
    if max_mass is not None:
        text += f"max_mass = {max_mass}\n"
    return text + extra


def envelope(points, *, name: str = "normal", category: str = "normal",
             axis: str = "longitudinal") -> str:
    pts = ", ".join(f"[{a}, {b}]" for a, b in points)
    return (f'\n[[envelope]]\nname = "{name}"\ncategory = "{category}"\naxis = "{axis}"\n'
            f"points = [{pts}]\n")


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
