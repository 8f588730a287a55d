"""``verify_fleet`` in two processes (a large fleet) finds exactly what it finds in one.

The threshold is lowered so that the small fleet of the tamper suite takes the forked path; the
reports must be equal, on clean data and after committed hand edits (so that the child, which
reads through a connection of its own, sees them too). SQLite and PostgreSQL.
"""

from __future__ import annotations

import os

import pytest
from sqlalchemy import text

from ledger.store import evidence, guards
from ledger.store.db import session_scope
from ledger.store.evidence import parallel
from tests.store.test_tamper import fleet  # noqa: F401 - the fixture

pytestmark = pytest.mark.skipif(not hasattr(os, "fork"), reason="no fork on this platform")


def _both(engine, monkeypatch, **kw) -> dict:
    reports = []
    for threshold in (10**12, 1):
        monkeypatch.setattr(parallel, "PARALLEL_FROM", threshold)
        monkeypatch.setattr("ledger.core._parallel.cores", lambda: 2)
        with session_scope(engine) as s:
            assert parallel.can_fork(s, None) == (threshold == 1)
            reports.append(evidence.verify_fleet(s, **kw).to_dict())
    assert reports[0] == reports[1]
    return reports[0]


def test_the_same_report_in_two_processes(fleet, monkeypatch):  # noqa: F811
    with session_scope(fleet) as s:
        head = evidence.verify_fleet(s).vehicles[0].ledger.head_hash
    doc = _both(fleet, monkeypatch, expect=[head, "0" * 64])
    assert doc["ok"] is False and doc["expected"] == [{"hash": head, "found": True},
                                                      {"hash": "0" * 64, "found": False}]
    with fleet.begin() as conn:
        guards.drop(conn, ["ledger_entries", "loading_sheets"])
        conn.execute(text("UPDATE ledger_entries SET actor = 'forger' WHERE seq = 2"))
        conn.execute(text("UPDATE loading_sheets SET preparer = 'forger' WHERE id = 3"))
    doc = _both(fleet, monkeypatch)
    bad = {v["registration"]: v["problem"] for v in doc["vehicles"] if not v["ok"]}
    # the entry (TS-101 is the only vehicle with an entry 2) is named before the sheet
    assert bad == {"TS-101": "entry 2: its content does not match its hash (a field was "
                             "changed after it was written)"}


def test_entries_of_a_deleted_vehicle_are_reported_in_two_processes(fleet, monkeypatch):  # noqa: F811,E501
    conn = fleet.connect()
    if fleet.dialect.name == "sqlite":
        conn.connection.driver_connection.execute("PRAGMA foreign_keys = OFF")
    else:
        conn.exec_driver_sql("SET session_replication_role = replica")
        conn.commit()
    with conn.begin():
        guards.drop(conn, ["vehicles"])
        conn.execute(text("DELETE FROM vehicles WHERE registration = 'TS-201'"))
    if fleet.dialect.name == "sqlite":
        conn.connection.driver_connection.execute("PRAGMA foreign_keys = ON")
    else:
        conn.exec_driver_sql("SET session_replication_role = DEFAULT")
        conn.commit()
    conn.close()
    doc = _both(fleet, monkeypatch)
    assert any("belong to no vehicle" in p for p in doc["problems"])
