"""The loading-sheet use cases (``ledger.services.sheets``): prepare, save, amend, show, list.

Runs on SQLite and PostgreSQL (the ``fleet`` of ``tests/store/test_sheets.py``: type TS-1, no
real aircraft; TS-101 weighed, TS-102 not). The last-minute tolerance (20 lb, 0 persons) is the
test type's own choice.
"""

from __future__ import annotations

import pytest
from sqlalchemy import text

from ledger.errors import ChainError, ConflictError, PlanError
from ledger.services import sheets
from ledger.services.sheets import QuickOptions, amend_sheet
from ledger.store import guards
from ledger.store.db import session_scope
from ledger.store.entries import install_item
from ledger.store.sheets import get_sheet, verify_sheet
from ledger.testing import assert_close
from tests.store import test_sheets as store_sheets
from tests.store.test_sheets import LB, PLAN, _count, _save

fleet = store_sheets.fleet  # the fixture: TS-1 imported, TS-101 weighed, TS-102 not

QUICK = QuickOptions(persons=("pilot=180",), cargo=("baggage=40",), fuel=("main=30 USgal",),
                     trip="20 USgal")


# --- reading the plan -----------------------------------------------------------------------------

def test_read_plan_from_a_file_with_options_over_it_or_from_options_alone(tmp_path):
    path = tmp_path / "plan.toml"
    path.write_text(PLAN, encoding="utf-8")
    plan = sheets.read_plan(str(path), QuickOptions(cargo=("baggage=55",)))
    assert plan.source == str(path)
    assert plan.raw["vehicle"] == "TS-101"
    assert [c["mass"] for c in plan.raw["cargo"] if c["station"] == "baggage"] == ["55"]
    quick = sheets.read_plan("TS-101", QUICK)
    assert (quick.source, quick.raw["vehicle"]) == ("command line", "TS-101")
    with pytest.raises(PlanError):  # a path separator makes it a file, even a missing one
        sheets.read_plan(str(tmp_path / "missing"), QUICK)


def test_who_prepares_a_sheet(tmp_path):
    plan = sheets.PlanInput({"prepared_by": "From Plan"}, "p.toml")
    assert plan.preparer("By Option", "login") == "By Option"
    assert plan.preparer(None, "login") == "From Plan"
    assert sheets.PlanInput({"prepared_by": 7}, "p.toml").preparer(None, "login") == "login"


# --- each use case in its own unit of work --------------------------------------------------------

def test_prepare_saves_only_when_asked(fleet):
    plan = sheets.read_plan("TS-101", QUICK)
    result = sheets.prepare(fleet, plan, user="login")
    assert result.saved is None and result.in_limits
    assert result.document["prepared"]["by"] == "login"
    assert _count(fleet) == 0
    result = sheets.prepare(fleet, plan, user="login", by="R. Ortega", save=True)
    assert result.saved is not None and result.document is result.saved.document
    assert result.document["sheet"]["id"] == result.saved.id
    assert result.document["sheet"]["saved"] is True
    assert result.saved.preparer == "R. Ortega"
    assert _count(fleet) == 1


def test_show_and_list_saved_sheets(fleet):
    saved = _save(fleet)
    shown = sheets.show(fleet, saved.id)
    assert shown.verified is True and shown.document["sheet"]["verified"] is True
    assert shown.saved.id == saved.id
    assert [s.id for s in sheets.list_saved(fleet)] == [saved.id]
    assert sheets.list_saved(fleet, "TS-102") == []


def test_amend_with_options_or_a_whole_plan(fleet, tmp_path):
    saved = _save(fleet)
    amended = sheets.amend(fleet, saved.id, options=QuickOptions(cargo=("baggage=55",)),
                           user="login")
    assert amended.saved.amends_id == saved.id and amended.in_limits
    assert amended.document["amendment"]["of"] == saved.id
    assert amended.saved.preparer == "login"
    assert_close(amended.check.mass_change_kg / LB, 15.0, unit="lb", rtol=1e-12)
    path = tmp_path / "new.toml"
    path.write_text(PLAN.replace("mass = 40", "mass = 50")
                    .replace("plan_format = 1", 'plan_format = 1\nprepared_by = "P. File"'),
                    encoding="utf-8")
    again = sheets.amend(fleet, amended.saved.id, plan=sheets.read_amendment_plan(str(path)),
                         options=QuickOptions(cargo=("baggage=99",)), user="login")
    assert again.saved.amends_id == amended.saved.id and again.saved.preparer == "P. File"
    items = {i["station"]: i["mass_kg"] for i in again.document["items"]}
    assert_close(items["baggage"] / LB, 50.0, unit="lb", rtol=1e-12)  # the file, not options
    with pytest.raises(ConflictError, match="an amendment needs a change"):
        sheets.amend(fleet, again.saved.id, user="login")


def _tamper_first_entry(engine) -> None:
    """Change TS-101's empty weight behind wbledger's back (the guards put back after)."""
    with engine.begin() as conn:
        guards.drop(conn, ["ledger_entries"])
        conn.execute(text("UPDATE ledger_entries SET empty_mass_kg = empty_mass_kg - 50"))
        guards.install(conn, ["ledger_entries"])


def test_no_figures_from_a_chain_that_does_not_verify(fleet):
    saved = _save(fleet)
    _tamper_first_entry(fleet)
    plan = sheets.read_plan("TS-101", QUICK)
    for attempt in (lambda: sheets.prepare(fleet, plan, user="x"),
                    lambda: sheets.prepare(fleet, plan, user="x", save=True),
                    lambda: sheets.amend(fleet, saved.id, user="x",
                                         options=QuickOptions(cargo=("baggage=45",)))):
        with pytest.raises(ChainError):
            attempt()
    assert _count(fleet) == 1
    assert sheets.show(fleet, saved.id).verified is True  # the saved sheet itself is whole


# --- amending inside a caller's unit of work (moved from tests/store/test_sheets.py) --------------

def test_amendment_within_the_tolerance_points_at_the_original(fleet):
    saved = _save(fleet)
    with session_scope(fleet) as s:
        amended, check = amend_sheet(s, saved.id, options=QuickOptions(cargo=("baggage=55",)),
                                     preparer="R. Ortega")
    assert amended.amends_id == saved.id and amended.id != saved.id
    assert check.within
    assert_close(check.mass_change_kg / LB, 15.0, unit="lb", rtol=1e-12)
    doc = amended.document
    assert doc["sheet"]["amends"] == saved.id
    assert doc["amendment"]["of"] == saved.id and doc["amendment"]["within"] is True
    items = {i["station"]: i for i in doc["items"]}
    assert_close(items["baggage"]["mass_kg"] / LB, 55.0, unit="lb", rtol=1e-12)
    with session_scope(fleet) as s:
        original = get_sheet(s, saved.id)
        assert {i["station"]: i["mass_kg"] for i in original.document["items"]}["baggage"] \
            == pytest.approx(40 * LB)
        assert verify_sheet(s, amended.id)


def test_changes_beyond_the_tolerance_need_a_new_sheet(fleet):
    saved = _save(fleet)
    before = _count(fleet)
    with pytest.raises(ConflictError) as err:
        with session_scope(fleet) as s:
            amend_sheet(s, saved.id, options=QuickOptions(cargo=("baggage=70",)),
                        preparer="R. Ortega")
    assert str(err.value) == (
        f"the change to sheet {saved.id} is beyond the last-minute tolerance of type TS-1 "
        "(20.0 lb and 0 persons): it changes 30.0 lb and 0 persons; prepare a new sheet with "
        "`wbledger sheet PLAN --save`")
    with pytest.raises(ConflictError) as err:
        with session_scope(fleet) as s:
            amend_sheet(s, saved.id, options=QuickOptions(persons=("rear=10",)),
                        preparer="R. Ortega")
    assert "it changes 10.0 lb and 1 person;" in str(err.value)
    assert _count(fleet) == before  # nothing saved


def test_amendments_add_up_against_the_first_sheet(fleet):
    first = _save(fleet)
    with session_scope(fleet) as s:
        second, _ = amend_sheet(s, first.id, options=QuickOptions(cargo=("baggage=55",)),
                                preparer="A")
    with pytest.raises(ConflictError) as err:
        with session_scope(fleet) as s:
            amend_sheet(s, first.id, options=QuickOptions(cargo=("baggage=45",)),
                        preparer="A")
    assert str(err.value) == (f"loading sheet {first.id} was already amended by sheet "
                              f"{second.id}; amend the newest one "
                              f"(`wbledger sheet amend {second.id} …`)")
    # +15 lb then +10 lb: 25 lb from the first sheet, over the 20 lb tolerance.
    with pytest.raises(ConflictError) as err:
        with session_scope(fleet) as s:
            amend_sheet(s, second.id, options=QuickOptions(cargo=("baggage=65",)),
                        preparer="A")
    assert f"the change to sheet {first.id} is beyond" in str(err.value)
    assert "it changes 25.0 lb" in str(err.value)
    with session_scope(fleet) as s:  # back to within 20 lb of the first sheet: accepted
        third, check = amend_sheet(s, second.id, options=QuickOptions(cargo=("baggage=50",)),
                                   preparer="A")
    assert third.amends_id == second.id
    assert_close(check.mass_change_kg / LB, 10.0, unit="lb", rtol=1e-12)


def test_amendment_refused_when_the_empty_weight_changed(fleet):
    saved = _save(fleet)
    with session_scope(fleet) as s:
        install_item(s, "TS-101", "radio", mass="3 lb", arm="20 in", actor="tester",
                     reason="test")
    with pytest.raises(ConflictError) as err:
        with session_scope(fleet) as s:
            amend_sheet(s, saved.id, options=QuickOptions(cargo=("baggage=45",)),
                        preparer="A")
    assert str(err.value) == (
        f"the type data or the empty weight of TS-101 changed since sheet {saved.id} (then: "
        "type revision 1, ledger entry #1; now: revision 1, entry #2); a last-minute change "
        "cannot carry that: prepare a new sheet with `wbledger sheet PLAN --save`")


def test_no_sheet_for_a_vehicle_without_empty_weight_and_bad_plans_save_nothing(fleet):
    with pytest.raises(ConflictError) as err:
        _save(fleet, PLAN.replace("TS-101", "TS-102"))
    assert "has no weighing recorded yet" in str(err.value)
    with pytest.raises(PlanError):
        _save(fleet, PLAN.replace('mass = 180', 'mass = "-180 lb"'))
    assert _count(fleet) == 0
