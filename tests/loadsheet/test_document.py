"""The types of ledger.loadsheet.document say exactly which keys build_sheet writes.

The document stays a plain dict (its JSON is pinned by docs/sheet-document.md); these tests
keep the TypedDicts honest: every key a built sheet has is declared, and every declared key
that is not marked NotRequired is there, down through phases, violations, fixes and axles.
The sheets are the demo fleet's invented plans: in limits, out of limits with fixes, lateral,
and a ground vehicle with axles.
"""

from __future__ import annotations

import json
import types
import typing
from pathlib import Path

import pytest

from ledger.loadsheet import EmptyWeight, build_sheet
from ledger.loadsheet.document import SheetDocument
from ledger.typedata import load_type_file
from ledger.typedata.plan import parse_plan, read_plan_file

FLEET = Path(__file__).resolve().parents[2] / "demo_fleet"


def _typed_dicts(annotation) -> list:
    """The TypedDicts an annotation holds (through lists, dicts and ``| None``)."""
    if typing.is_typeddict(annotation):
        return [annotation]
    out = []
    for arg in typing.get_args(annotation):
        out += _typed_dicts(arg)
    return out


def _check(value, td, where: str) -> int:
    """Assert ``value`` has the keys of TypedDict ``td``; recurse; count the dicts checked."""
    assert isinstance(value, dict), where
    missing = td.__required_keys__ - set(value)
    extra = set(value) - td.__required_keys__ - td.__optional_keys__
    assert not missing and not extra, f"{where} ({td.__name__}): missing {missing}, extra {extra}"
    hints = typing.get_type_hints(td)
    checked = 1
    for key, item in value.items():
        inner = _typed_dicts(hints[key])
        if not inner or item is None:
            continue
        items = item if isinstance(item, list) else [item]
        for i, one in enumerate(items):
            if isinstance(one, dict):
                checked += _check(one, inner[0], f"{where}.{key}[{i}]")
    return checked


def _demo_sheet(plan_name: str, type_file: str, empty: EmptyWeight) -> dict:
    vtype = load_type_file(FLEET / type_file)
    plan = parse_plan(read_plan_file(FLEET / "plans" / plan_name), vtype, source=plan_name)
    return build_sheet(vtype, empty, plan, prepared_by="T. Tester",
                       prepared_at="2026-12-01T09:00:00+00:00", type_revision=1,
                       registration="KVA-TEST")


def _empty(mass: float, x: float, y: float, unit: tuple[float, float],
           z: float | None = None) -> EmptyWeight:
    """The empty weight from a mass and CG in display units: ``unit`` = (kg per mass unit,
    m per length unit); the moments are mass × arm (FAA-H-8083-1)."""
    kg, m = mass * unit[0], (x * unit[1], y * unit[1])
    return EmptyWeight(kg, kg * m[0], kg * m[1], 0.0 if z is None else kg * z, z is not None,
                       seq=1)


LB_IN, KG_M = (0.45359237, 0.0254), (1.0, 1.0)  # NIST SP 811 factors


@pytest.mark.parametrize("plan_name, type_file, empty", [
    # The demo's first weighings (demo_fleet/README.md: KVA-101 with its ELT, 1540.4 lb at
    # 86.48 in); the truck also with its empty CG moved aft (x 4.2 m, 3.02 m behind the front
    # axle) until the rear axle is over its rating, to get axle violations and fixes.
    ("kva-101-local.toml", "kv-p4.toml", _empty(1540.4, 86.48, 0.05, LB_IN)),
    ("kva-101-aft-cg.toml", "kv-p4.toml", _empty(1540.4, 86.48, 0.05, LB_IN)),
    ("kva-201-charter.toml", "kv-t20.toml", _empty(3310.0, 7.3302, 0.0031, KG_M)),
    ("kva-301-lateral.toml", "kv-h2.toml", _empty(930.0, 77.97, 0.19, LB_IN)),
    ("kva-t75-delivery.toml", "kv-tr75.toml", _empty(3420.0, 2.9499, -0.0105, KG_M, z=1.087)),
    ("kva-t75-delivery.toml", "kv-tr75.toml", _empty(3420.0, 4.2, -0.0105, KG_M)),
])
def test_every_key_of_a_built_sheet_is_declared(plan_name, type_file, empty):
    doc = _demo_sheet(plan_name, type_file, empty)
    assert _check(doc, SheetDocument, "doc") > 10
    if "aft-cg" in plan_name or "lateral" in plan_name or doc["axles"] and doc["violations"]:
        assert doc["violations"] and doc["fixes"]  # the parts that are checked here too
    assert json.loads(json.dumps(doc)) == doc  # and it is still plain JSON


def test_the_optional_keys_are_the_ones_the_notes_name():
    assert SheetDocument.__optional_keys__ == {"amendment"}
    hints = typing.get_type_hints(SheetDocument)
    phase = _typed_dicts(hints["phases"])[0]
    assert phase.__optional_keys__ == {"axles", "axle_groups"}  # issue 13 item 2
    violation = _typed_dicts(hints["violations"])[0]
    assert violation.__optional_keys__ == {"envelope", "axis", "side", "first_exit", "station",
                                           "tank", "axle"}
    fix = _typed_dicts(hints["fixes"])[0]
    assert fix.__optional_keys__ == {"tanks_kg", "distance_m", "steps"}
    assert isinstance(hints["axles"], types.UnionType)


def test_an_amended_sheet_declares_its_amendment_and_differences():
    # Issue 13 item 4: amendment.differences (the changes from the sheet amended and each
    # phase before and after) is typed key for key. A small invented type, not the demo's.
    from ledger.loadsheet.amend import amendment_doc, compare_plans
    from ledger.loadsheet.document import AmendmentDoc
    from ledger.typedata.model import Tolerances
    from tests.loadsheet.common import empty_lb_in, envelope, lb_in_type, make_type, plan_of
    from tests.loadsheet.common import station as st

    vt = make_type(lb_in_type(name="TEST-AM", stations=st("hold", "cargo", 100, max_mass=500),
                              envelopes=envelope([(70, 500), (90, 500), (90, 9000),
                                                  (70, 9000)])))
    before_plan = plan_of(vt, '[[cargo]]\nstation = "hold"\nmass = 100\n')
    after_plan = plan_of(vt, '[[cargo]]\nstation = "hold"\nmass = 90\n')
    empty = empty_lb_in(1000, 80.0)
    before = build_sheet(vt, empty, before_plan, type_revision=1)
    after = build_sheet(vt, empty, after_plan, type_revision=1)
    check = compare_plans(before_plan, after_plan, Tolerances(last_minute_mass_kg=10.0))
    after["amendment"] = amendment_doc(check, of=1, first_sheet=1, before_plan=before_plan,
                                       after_plan=after_plan, before=before, after=after)
    assert _check(after, SheetDocument, "doc") > 10
    assert len(after["amendment"]["differences"]["phases"]) == 4
    assert AmendmentDoc.__optional_keys__ == {"differences"}
    assert json.loads(json.dumps(after)) == after
