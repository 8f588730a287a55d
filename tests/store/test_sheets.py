"""Saved loading sheets: immutable and hashed (amending them: ``tests/services/test_sheets.py``).

Runs on SQLite and PostgreSQL (the ``engine`` fixture builds the schema through the
migrations). The test type is a fixture (no real aircraft); the last-minute tolerance
(20 lb, 0 persons) is the test's own choice. Weighing arithmetic: CG = Σ(R·x)/ΣR
(FAA-H-8083-1, weighing chapter).
"""

from __future__ import annotations

import pytest
from sqlalchemy import func, select, text

from ledger.errors import ConflictError
from ledger.services.sheets import prepare_sheet, save_prepared
from ledger.store import guards
from ledger.store.catalog import add_vehicle
from ledger.store.db import session_scope
from ledger.store.entries import record_weighing
from ledger.store.models import LoadingSheetRow
from ledger.store.sheets import get_sheet, list_sheets, verify_sheet
from ledger.testing import assert_close, import_types
from ledger.typedata.plan import read_plan_text
from tests.store.ledger_support import ts_type

LB = 0.45359237  # kg, exact (NIST SP 811)
IN = 0.0254

TYPE = ts_type("TS-1", title="Test type for saved sheets", baggage_max=120, aft_x=47.3,
               rear_seats=True)

PLAN = """plan_format = 1
vehicle = "TS-101"
[[person]]
seat = "pilot"
mass = 180
[[cargo]]
station = "baggage"
mass = 40
[fuel]
trip = "20 USgal"
[fuel.tanks]
main = "30 USgal"
"""


@pytest.fixture
def fleet(engine):
    with session_scope(engine) as s:
        import_types(s, {"ts-1.toml": TYPE})
        add_vehicle(s, "TS-101", "TS-1")
        add_vehicle(s, "TS-102", "TS-1")
        record_weighing(s, "TS-101", {"nose": "350 lb", "main": "1300 lb"}, actor="tester",
                        entry_date="2026-11-30")
    return engine


def _save(engine, plan_text=PLAN, preparer="R. Ortega"):
    with session_scope(engine) as s:
        prepared = prepare_sheet(s, read_plan_text(plan_text, "plan.toml"), source="plan.toml",
                                 preparer=preparer)
        return save_prepared(s, prepared)


def _count(engine) -> int:
    with engine.connect() as conn:
        return conn.execute(select(func.count()).select_from(LoadingSheetRow)).scalar_one()


def test_save_get_list_and_verify(fleet):
    saved = _save(fleet)
    doc = saved.document
    assert doc["sheet"]["id"] == saved.id and doc["sheet"]["saved"] is True
    assert doc["sheet"]["amends"] is None
    # The empty weight used: 1,650 lb at (350 × −6.5 + 1,300 × 58) / 1,650 in (Σ R·x / Σ R).
    assert_close(doc["empty_weight"]["mass_kg"] / LB, 1650.0, unit="lb", rtol=1e-12)
    assert_close(doc["empty_weight"]["cg_m"]["x"] / IN, (350 * -6.5 + 1300 * 58) / 1650,
                 unit="in", rtol=1e-12)
    assert doc["empty_weight"]["entry_seq"] == 1
    with session_scope(fleet) as s:
        again = get_sheet(s, saved.id)
        assert again.document == doc
        assert again.plan["plan"]["vehicle"] == "TS-101"
        assert again.plan["raw"]["person"][0]["seat"] == "pilot"
        assert (again.type_name, again.type_revision, again.entry_seq) == ("TS-1", 1, 1)
        assert again.preparer == "R. Ortega" and again.verdict == "in_limits"
        assert verify_sheet(s, saved.id)
        assert [x.id for x in list_sheets(s)] == [saved.id]
        assert list_sheets(s, "TS-102") == []
        assert len(again.content_sha256) == 64


def test_a_saved_sheet_cannot_be_changed(fleet):
    saved = _save(fleet)
    with pytest.raises(ConflictError) as err:
        with session_scope(fleet) as s:
            row = s.get(LoadingSheetRow, saved.id)
            row.preparer = "someone else"
            s.flush()
    assert str(err.value) == (f"loading sheet {saved.id} is saved and cannot be changed; make "
                              f"an amendment with `wbledger sheet amend {saved.id}`")
    with session_scope(fleet) as s:
        assert get_sheet(s, saved.id).preparer == "R. Ortega"
    # A change made behind the library's back is caught by the content hash.
    with fleet.begin() as conn:
        guards.drop(conn, ["loading_sheets"])
        conn.execute(text("UPDATE loading_sheets SET preparer = 'X' WHERE id = :i"),
                     {"i": saved.id})
    with session_scope(fleet) as s:
        assert verify_sheet(s, saved.id) is False
