"""The ledger's use cases through their services (weighing, equipment, history, fleet), on
SQLite and PostgreSQL: each runs in one unit of work and returns what the CLI renders.

Types and figures are invented test data (tests/store/ledger_support.py): TT-A1 weighed at
1715 lb on the nose and 2572.5 lb on each main gives 6,860 lb at 80.0 in (FAA-H-8083-25,
ch. 9, as quoted there).
"""

from __future__ import annotations

import datetime as dt

import pytest

from ledger.errors import ConflictError, InputError, NotFoundError
from ledger.services import equipment, fleet, history, weighing
from ledger.testing import assert_close
from tests.store.ledger_support import DAY0, IN, LB, READINGS_A, setup_fleet, snapshot

D1 = DAY0 + dt.timedelta(days=1)


@pytest.fixture
def fleet_db(engine):
    setup_fleet(engine, {"KV-101": "TT-A1", "KV-102": "TT-A1"})
    return engine


def _weigh(engine, reg="KV-101"):
    return weighing.weigh(engine, reg, READINGS_A, actor="W. Eigher",
                          entry_date=DAY0.isoformat())


def test_weigh_returns_the_entry_and_its_line(fleet_db):
    rec = _weigh(fleet_db)
    assert rec.entry.kind == "weighing" and rec.entry.seq == 1
    assert_close(rec.entry.empty_mass_kg, 6860 * LB, rtol=1e-12, unit="kg")
    assert_close(rec.entry.cg_x_m, 80.0 * IN, rtol=1e-12, unit="m")
    line = rec.document["entry"]
    assert rec.document["registration"] == "KV-101" and line["seq"] == 1
    assert line["after"]["empty_mass_kg"] == rec.entry.empty_mass_kg


def test_adjustments_are_parsed_before_the_database_is_opened():
    # No engine at all: a mistyped --adjust is refused on its own.
    with pytest.raises(InputError, match="--adjust"):
        weighing.parse_adjustments(["oil=5 lb"])
    assert weighing.parse_adjustments(None) == []


def test_equipment_install_remove_correct(fleet_db):
    _weigh(fleet_db)
    on = equipment.install(fleet_db, "KV-101", "rack", mass="140 lb", arm="150 in",
                           actor="I", reason="fit", entry_date=D1.isoformat())
    # 6,860 lb at 80.0 in plus 140 lb at 150 in gives 81.4 in (FAA-H-8083-25 ch. 9).
    assert_close(on.entry.cg_x_m, 81.4 * IN, rtol=1e-12, unit="m")
    off = equipment.remove(fleet_db, "KV-101", "rack", actor="R", reason="out",
                           entry_date=D1.isoformat())
    assert off.entry.delta_mass_kg == -on.entry.delta_mass_kg
    back = equipment.correct(fleet_db, "KV-101", 3, reason="stays", actor="Q")
    assert back.entry.kind == "correction" and back.entry.reverses_seq == 3
    assert back.entry.empty_mass_kg == on.entry.empty_mass_kg


def test_a_refused_change_writes_nothing(fleet_db):
    _weigh(fleet_db)
    before = snapshot(fleet_db)
    with pytest.raises(ConflictError, match="never installed"):
        equipment.remove(fleet_db, "KV-101", "rack", actor="R", reason="out")
    with pytest.raises(InputError, match="--reason"):
        equipment.install(fleet_db, "KV-101", "rack", mass=1.0, arm=1.0, actor="I",
                          reason=None)
    assert snapshot(fleet_db) == before


def test_history_read_export_and_import(fleet_db):
    _weigh(fleet_db)
    equipment.install(fleet_db, "KV-101", "rack", mass="140 lb", arm="150 in", actor="I",
                      reason="fit", entry_date=D1.isoformat())
    record = history.running_record(fleet_db, "KV-101")
    assert [e["kind"] for e in record["entries"]] == ["weighing", "install"]
    assert history.running_record(fleet_db, "KV-101", as_of=DAY0.isoformat())[
        "current"]["seq"] == 1
    for fmt in history.FORMATS:
        text = history.export(fleet_db, "KV-101", fmt)
        assert text.startswith("seq,kind" if fmt == "csv" else '{"format"')
    text = history.export(fleet_db, "KV-101", "json")
    # Into the other vehicle, the hashes (of another registration) left out.
    import json

    doc = json.loads(text)
    for e in doc["entries"]:
        e.pop("prev_hash"), e.pop("entry_hash")
    summary = history.import_file(fleet_db, "KV-102", json.dumps(doc), "json", source="h.json")
    assert (summary.imported, summary.first_seq, summary.last_seq) == (2, 1, 2)
    assert history.running_record(fleet_db, "KV-102")["current"]["empty_mass_kg"] == \
        record["current"]["empty_mass_kg"]


def test_a_refused_import_writes_nothing(fleet_db):
    before = snapshot(fleet_db)
    bad = "seq,kind,entry_date,actor\n1,install,2025-01-10,I\n"
    with pytest.raises(InputError, match="h.csv line 2"):
        history.import_file(fleet_db, "KV-101", bad, "csv", source="h.csv")
    assert snapshot(fleet_db) == before


def test_fleet_add_list_and_show(fleet_db):
    fleet.add_vehicle(fleet_db, "KV-103", "TT-A1", serial="S-3", note="spare")
    _weigh(fleet_db, "KV-103")
    docs = {d["registration"]: d for d in fleet.fleet(fleet_db)}
    assert set(docs) == {"KV-101", "KV-102", "KV-103"}
    assert docs["KV-101"]["empty"] is None and docs["KV-103"]["entries"] == 1
    shown = fleet.vehicle(fleet_db, "KV-103")
    assert (shown["serial"], shown["note"], shown["entries"]) == ("S-3", "spare", 1)
    with pytest.raises(NotFoundError):
        fleet.vehicle(fleet_db, "KV-999")
