"""Migration 0003 (seals and guards) on a database written by the previous release.

``data/demo-0002.sqlite3`` is what ``wbledger demo`` of the previous release (schema 0002) left,
plus a saved sheet, an amendment, a sheet of a second vehicle and a vehicle configuration
redefined with ``--replace``: every kind of row the migration must seal. On PostgreSQL the same
rows are copied into a database at schema 0002 first.
"""

from __future__ import annotations

import shutil
import sqlite3
from pathlib import Path

import pytest
from sqlalchemy import MetaData, insert, text

from ledger.store import guards
from ledger.store.db import make_engine, session_scope, upgrade
from ledger.store.evidence import verify_fleet

OLD = Path(__file__).parent / "data" / "demo-0002.sqlite3"
TABLES = ("vehicle_types", "type_revisions", "vehicles", "ledger_entries", "configurations",
          "loading_sheets")


def _old_heads() -> dict[str, str]:
    con = sqlite3.connect(OLD)
    try:
        return dict(con.execute(
            "SELECT v.registration, e.entry_hash FROM ledger_entries e JOIN vehicles v "
            "ON v.id = e.vehicle_id WHERE e.seq = (SELECT max(seq) FROM ledger_entries e2 "
            "WHERE e2.vehicle_id = e.vehicle_id)").fetchall())
    finally:
        con.close()


def _database_at_0002(db_url: str, tmp_path) -> str:
    if db_url.startswith("sqlite"):
        path = tmp_path / "old.sqlite3"
        shutil.copy(OLD, path)
        return f"sqlite:///{path}"
    eng = make_engine(db_url)
    upgrade(eng, "0002")
    meta = MetaData()
    meta.reflect(eng)
    src = sqlite3.connect(OLD)
    src.row_factory = sqlite3.Row
    try:
        with eng.begin() as conn:
            for t in TABLES:
                rows = [dict(r) for r in src.execute(f"SELECT * FROM {t} ORDER BY id")]
                if rows:
                    conn.execute(insert(meta.tables[t]), rows)
                conn.exec_driver_sql(f"SELECT setval(pg_get_serial_sequence('{t}', 'id'), "
                                     f"(SELECT coalesce(max(id), 1) FROM {t}))")
    finally:
        src.close()
        eng.dispose()
    return db_url


def test_upgrade_seals_what_is_there_and_everything_verifies(db_url, tmp_path):
    url = _database_at_0002(db_url, tmp_path)
    eng = make_engine(url)
    try:
        before, after, backup = upgrade(eng)
        assert (before, after) == ("0002", "0003")
        assert (backup is not None) == url.startswith("sqlite")
        with session_scope(eng) as s:
            report = verify_fleet(s)
            assert report.ok, report.problems
            heads = {v.registration: v.ledger.head_hash for v in report.vehicles}
            # The ledger chains are untouched: the heads printed before still verify.
            assert heads == _old_heads()
            assert {v.registration: v.sheets for v in report.vehicles if v.sheets} == {
                "KVA-101": 3, "KVA-201": 1}
            assert verify_fleet(s, expect=list(heads.values())).ok
            # The redefined configuration became version 1 of a chain of its own.
            versions = s.execute(text("SELECT name, version FROM configurations")).all()
            assert [tuple(r) for r in versions] == [("stretcher", 1)]
        with eng.connect() as conn:
            assert guards.missing(conn) == []
        for t in TABLES:
            with pytest.raises(Exception, match="append-only"):
                with eng.begin() as conn:
                    conn.execute(text(f"DELETE FROM {t}"))
    finally:
        eng.dispose()


def test_a_sheet_saved_after_the_upgrade_chains_onto_the_old_ones(db_url, tmp_path):
    from ledger.services.sheets import prepare_sheet, save_prepared
    from ledger.typedata.plan import read_plan_file
    from tests.conftest import DEMO_FLEET

    url = _database_at_0002(db_url, tmp_path)
    eng = make_engine(url)
    try:
        upgrade(eng)
        raw = read_plan_file(DEMO_FLEET / "plans" / "kva-101-local.toml")
        with session_scope(eng) as s:
            old_head = verify_fleet(s, "KVA-101").vehicles[0].sheet_head_hash
            saved = save_prepared(s, prepare_sheet(s, raw, source="plan", preparer="R. Ortega"))
            prev = s.execute(text("SELECT prev_hash FROM loading_sheets WHERE id = :i"),
                             {"i": saved.id}).scalar_one()
        assert prev == old_head
        with session_scope(eng) as s:
            report = verify_fleet(s, "KVA-101")
            assert report.ok and report.vehicles[0].sheets == 4
            assert report.vehicles[0].sheet_head_hash == saved.document["sheet"]["sheet_hash"]
    finally:
        eng.dispose()


def test_the_old_file_is_still_the_old_schema():
    # The fixture must stay what the previous release wrote (a test of the test).
    con = sqlite3.connect(OLD)
    try:
        assert con.execute("SELECT version_num FROM alembic_version").fetchone() == ("0002",)
        cols = [r[1] for r in con.execute("PRAGMA table_info(loading_sheets)")]
        assert "row_hash" not in cols
    finally:
        con.close()
