"""The SQLite driver-level statements of an append (ledger.store.sqlite_path.sqlite_insert and the
vehicle/head/item query) against SQLAlchemy's own Core statements: the same stored text, the
same values read back through the ORM, and chains that verify.

Types and entries are invented test data (tests/store/ledger_support.py).
"""

from __future__ import annotations

import datetime as dt

import pytest
from sqlalchemy import select, text

from ledger.errors import NotFoundError
from ledger.store import entries, heads
from ledger.store.chain import verify_vehicle
from ledger.store.db import make_engine, session_scope, upgrade
from ledger.store.models import LedgerEntryRow
from tests.store.ledger_support import setup_fleet, weigh_a

D1 = dt.date(2025, 3, 1)


@pytest.fixture
def sqlite_fleet(sqlite_url):
    eng = make_engine(sqlite_url)
    upgrade(eng)
    setup_fleet(eng, {"KV-101": "TT-A1", "KV-102": "TT-A1"})
    yield eng
    eng.dispose()


def _stored(eng, reg):
    """Every column of a vehicle's entries as SQLite stores them (text, not converted)."""
    with eng.connect() as c:
        rows = c.exec_driver_sql(
            "SELECT e.* FROM ledger_entries e JOIN vehicles v ON v.id = e.vehicle_id "
            "WHERE v.registration = ? ORDER BY e.seq", (reg,)).mappings().all()
    return [{k: v for k, v in r.items() if k not in ("id", "vehicle_id")} for r in rows]


def test_driver_insert_stores_what_core_insert_stores(sqlite_fleet):
    eng = sqlite_fleet
    weigh_a(eng, "KV-101")
    with session_scope(eng) as s:
        e = entries.install_item(s, "KV-101", "rack", mass="140 lb", arm="150 in",
                                 lat_arm="2.5 in", actor="T. Ech", reason="test",
                                 entry_date=D1, reference="WO-1")
    with session_scope(eng) as s:
        entries.remove_item(s, "KV-101", "rack", actor="T. Ech", reason="test", entry_date=D1)
    # The same rows inserted into KV-102 through SQLAlchemy Core (its own bind processing).
    mine = _stored(eng, "KV-101")
    with session_scope(eng) as s:
        vid = s.execute(text("SELECT id FROM vehicles WHERE registration = 'KV-102'")).scalar()
        orm_rows = s.execute(select(LedgerEntryRow).where(LedgerEntryRow.vehicle_id != vid)
                             .order_by(LedgerEntryRow.seq)).scalars().all()
        cols = [c.name for c in LedgerEntryRow.__table__.columns if c.name not in ("id",)]
        for r in orm_rows:
            values = {c: getattr(r, c) for c in cols}
            values["vehicle_id"] = vid
            s.connection().execute(heads.INSERT, values)
    assert _stored(eng, "KV-102") == mine
    # Read back through the ORM, the driver-inserted entry has the values install returned.
    with session_scope(eng) as s:
        row = s.execute(select(LedgerEntryRow).where(LedgerEntryRow.seq == e.seq,
                                                     LedgerEntryRow.item == "rack")
                        .limit(1)).scalar_one()
        assert row.entry_date == e.entry_date == D1
        assert row.recorded_at.replace(tzinfo=dt.UTC) == e.recorded_at
        assert (row.item_mass_kg, row.item_x_m, row.item_y_m) == (
            e.item_mass_kg, e.item_x_m, e.item_y_m)
        assert row.entry_hash == e.entry_hash
    with session_scope(eng) as s:
        assert verify_vehicle(s, "KV-101").ok


def test_driver_query_reads_what_the_core_query_reads(sqlite_fleet):
    eng = sqlite_fleet
    weigh_a(eng, "KV-101")
    with session_scope(eng) as s:
        entries.install_item(s, "KV-101", "rack", mass=10.0, arm=3.0, vert_arm=0.5,
                             actor="T. Ech", reason="test", entry_date=D1)
    for item in ("rack", "never installed"):
        with session_scope(eng) as s:
            vehicle, head, state = heads.locked_item_state(s, "KV-101", item)
            core = s.connection().execute(heads.VEHICLE_HEAD_ITEM,
                                          {"reg": "KV-101", "item": item}).first()
            assert tuple(vehicle) == tuple(core[:3])
            assert head == tuple(core[3:12])
            assert isinstance(head[1], dt.date)                    # entry_date converted
            assert state == (tuple(core[12:]) if core[12] is not None else None)
    # A vehicle with no entries yet, and one that does not exist.
    with session_scope(eng) as s:
        vehicle, head, state = heads.locked_item_state(s, "KV-102", "rack")
        assert vehicle.registration == "KV-102" and head is None and state is None
    with pytest.raises(NotFoundError), session_scope(eng) as s:
        heads.locked_item_state(s, "KV-999", "rack")
