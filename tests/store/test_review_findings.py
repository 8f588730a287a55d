"""Hand edits found by an independent review of the integrity work, now caught.

Each test states what the README's "Integrity: what is protected and how" promises and makes
one hand edit of the kind the tamper suite makes (guards removed first, as someone with the
file or the tables' owner can): a second type or vehicle of the same name (a UNIQUE constraint
removed), a configuration added since a checkpoint, a NULL in a hash column, an orphaned
configuration, a guard set to fire for replicas only. Each failed on the code as first
reviewed.

The fleet and plans are the tamper suite's (``tests/store/test_tamper.py``), all INVENTED.
TS-101 (type TS-1, maximum take-off mass 2,450 lb) loaded by the HEAVY plan is 10 lb over:
OUT OF LIMITS (limits inclusive, common practice). Whatever an edit does, that plan must never
come out IN LIMITS while ``verify`` and the checkpoint both pass.
"""

from __future__ import annotations

import datetime as dt
import json
import re

import pytest
from sqlalchemy import text
from sqlalchemy.orm import Session

from ledger.services.sheets import prepare_sheet
from ledger.store import checkpoint, guards
from ledger.store.chain import content_hash
from ledger.store.configs import define_configuration
from ledger.store.db import session_scope
from ledger.store.evidence import verify_fleet
from ledger.store.seal import type_revision_seal
from ledger.typedata import parse_type_text
from ledger.typedata.plan import read_plan_text
from tests.store.test_tamper import HEAVY, fleet, type_text  # noqa: F401 - fleet is a fixture


def _fk_off(conn) -> None:
    if conn.dialect.name == "sqlite":
        conn.connection.driver_connection.execute("PRAGMA foreign_keys = OFF")


def _drop_unique(conn, table: str, constraint: str) -> None:
    """Remove a UNIQUE constraint, as the tables' owner (PostgreSQL) or anyone who can write
    the file (SQLite: the table is rebuilt without it) can."""
    if conn.dialect.name != "sqlite":
        conn.exec_driver_sql(f"ALTER TABLE {table} DROP CONSTRAINT {constraint}")
        return
    sql = conn.exec_driver_sql("SELECT sql FROM sqlite_master WHERE type = 'table' AND name = ?",
                               (table,)).scalar_one()
    sql = re.sub(rf",\s*CONSTRAINT {constraint} UNIQUE \([^)]*\)", "", sql)
    sql = re.sub(rf'CREATE TABLE "?{table}"?', "CREATE TABLE rebuilt", sql, count=1)
    conn.exec_driver_sql(sql)
    conn.exec_driver_sql(f"INSERT INTO rebuilt SELECT * FROM {table}")
    conn.exec_driver_sql(f"DROP TABLE {table}")
    conn.exec_driver_sql(f"ALTER TABLE rebuilt RENAME TO {table}")


def _heavy_verdict(s) -> str:
    return prepare_sheet(s, read_plan_text(HEAVY, "p.toml"), source="p",
                         preparer="x").document["verdict"]


def test_a_vehicle_relinked_to_a_second_type_of_the_same_name(fleet):  # noqa: F811
    """README: "a vehicle's ... type link (to another type)" is caught by `verify` and a new
    sheet is refused. The vehicle's seal names its type by name only, and nothing checks that
    names are unique once the UNIQUE constraint is gone: a second 'TS-1' whose revision 1 says
    3,000 lb takes TS-101, no existing seal is recomputed, and the heavy plan is IN LIMITS."""
    conn = fleet.connect()
    _fk_off(conn)
    trans = conn.begin()
    try:
        guards.drop(conn, ["vehicle_types", "vehicles"])
        _drop_unique(conn, "vehicle_types", "uq_vehicle_types_name")
        created = dt.datetime(2026, 12, 1, tzinfo=dt.UTC)
        conn.execute(text("INSERT INTO vehicle_types (id, name, created_at) "
                          "VALUES (900, 'TS-1', :c)"), {"c": created})
        body = type_text("TS-1", 3000)
        vtype = parse_type_text(body, source="TS-1.toml")
        spec_json = json.dumps(vtype.to_dict(), sort_keys=True, allow_nan=False)
        row = dict(type_id=900, revision=1, content_sha256=vtype.content_hash(),
                   source_name="TS-1.toml", source_text=body, spec_json=spec_json,
                   imported_at=created, prev_hash="0" * 64)
        row["row_hash"] = type_revision_seal(
            type_name="TS-1", revision=1, content_sha256=row["content_sha256"],
            source_name=row["source_name"], source_text=body, spec_json=spec_json,
            imported_at=created, prev_hash=row["prev_hash"])
        conn.execute(text(f"INSERT INTO type_revisions ({', '.join(row)}) VALUES "
                          f"({', '.join(':' + k for k in row)})"), row)
        conn.execute(text("UPDATE vehicles SET type_id = 900 WHERE registration = 'TS-101'"))
        guards.install(conn, ["vehicle_types", "vehicles"])
        with Session(bind=conn) as s:
            report = verify_fleet(s)
            found = checkpoint.compare_with(s, fleet.checkpoint, report)
            caught = (not report.ok) or bool(found.problems) or bool(found.added)
            assert caught or _heavy_verdict(s) == "out_of_limits"
            assert caught, "verify and verify --against --exact both pass"
    finally:
        trans.rollback()
        conn.close()


def test_a_second_vehicle_row_with_the_same_registration(fleet):  # noqa: F811
    """A vehicle seal has no id, so a copy of TS-201's row (id 0, so that lookups by
    registration find it first) has TS-201's seal; its ledger is a copy of TS-201's plus one
    forged weighing 100 kg lighter, which is what a sheet would now be built on. `verify` passes, and the checkpoint comparison,
    keyed by registration, lists nothing added — README: "--exact fails on any addition".
    Now `verify` names the duplicate and no figures are built on either row."""
    conn = fleet.connect()
    _fk_off(conn)
    trans = conn.begin()
    try:
        guards.drop(conn, ["vehicles"])
        _drop_unique(conn, "vehicles", "uq_vehicles_registration")
        conn.execute(text("INSERT INTO vehicles (id, registration, type_id, serial, note, "
                          "created_at, row_hash) SELECT 0, registration, type_id, serial, "
                          "note, created_at, row_hash FROM vehicles "
                          "WHERE registration = 'TS-201'"))
        entry = conn.execute(text(
            "SELECT * FROM ledger_entries WHERE seq = 1 AND vehicle_id = "
            "(SELECT id FROM vehicles WHERE registration = 'TS-201' AND id <> 0)")).mappings().one()
        first = {k: v for k, v in entry.items() if k != "id"}
        if isinstance(first["recorded_at"], str):  # SQLite gives the stored text
            first["recorded_at"] = dt.datetime.fromisoformat(first["recorded_at"])
            first["entry_date"] = dt.date.fromisoformat(first["entry_date"])
        forged = dict(first, seq=2, prev_hash=first["entry_hash"], baseline_seq=2,
                      actor="forger", empty_mass_kg=first["empty_mass_kg"] - 100.0,
                      delta_mass_kg=-100.0, delta_mx_kgm=0.0, delta_my_kgm=0.0,
                      delta_mz_kgm=0.0, empty_mx_kgm=first["empty_mx_kgm"])
        forged["entry_hash"] = content_hash(forged, "TS-201")
        for row in (first, forged):
            row = dict(row, vehicle_id=0)
            conn.execute(text(f"INSERT INTO ledger_entries ({', '.join(row)}) VALUES "
                              f"({', '.join(':' + k for k in row)})"), row)
        guards.install(conn, ["vehicles"])
        with Session(bind=conn) as s:
            report = verify_fleet(s)
            assert not report.ok and "more than one vehicle is named 'TS-201'" in " ".join(
                report.problems)
            from ledger.errors import ChainError
            from ledger.store.entries import current_empty

            with pytest.raises(ChainError, match="more than one vehicle is named 'TS-201'"):
                current_empty(s, "TS-201")
    finally:
        trans.rollback()
        conn.close()


def test_a_configuration_added_since_the_checkpoint_is_listed(fleet):  # noqa: F811
    """README: "`--exact` fails on any addition". A new configuration (a plain INSERT, no
    guard in the way) can change a verdict — a vehicle's configuration replaces the type's
    of the same name — yet compare_with lists only new versions of checkpointed ones."""
    with session_scope(fleet) as s:
        define_configuration(s, "ballast-out", registration="TS-101", actor="tester",
                             items=[{"name": "ballast", "action": "remove", "mass": "30 lb",
                                     "x": "60 in"}])
    with session_scope(fleet) as s:
        found = checkpoint.compare_with(s, fleet.checkpoint, verify_fleet(s))
        assert found.added, "a new configuration of TS-101 is not listed"


def test_a_null_in_a_sheets_entry_hash_is_reported_not_raised(fleet):  # noqa: F811
    conn = fleet.connect()
    _fk_off(conn)
    trans = conn.begin()
    try:
        guards.drop(conn, ["loading_sheets"])
        if conn.dialect.name == "sqlite":
            sql = conn.exec_driver_sql("SELECT sql FROM sqlite_master WHERE name = "
                                       "'loading_sheets'").scalar_one()
            conn.exec_driver_sql(sql.replace("entry_hash VARCHAR(64) NOT NULL",
                                             "entry_hash VARCHAR(64)")
                                 .replace('"loading_sheets"', "rebuilt")
                                 .replace("TABLE loading_sheets", "TABLE rebuilt"))
            conn.exec_driver_sql("INSERT INTO rebuilt SELECT * FROM loading_sheets")
            conn.exec_driver_sql("DROP TABLE loading_sheets")
            conn.exec_driver_sql("ALTER TABLE rebuilt RENAME TO loading_sheets")
        else:
            conn.exec_driver_sql("ALTER TABLE loading_sheets ALTER COLUMN entry_hash "
                                 "DROP NOT NULL")
        conn.exec_driver_sql("UPDATE loading_sheets SET entry_hash = NULL WHERE id = 3")
        with Session(bind=conn) as s:
            report = verify_fleet(s)  # raises TypeError ('NoneType' is not subscriptable)
            assert not report.ok
    finally:
        trans.rollback()
        conn.close()


def test_an_orphaned_configuration_is_reported(fleet):  # noqa: F811
    conn = fleet.connect()
    _fk_off(conn)
    if conn.dialect.name != "sqlite":
        conn.exec_driver_sql("SET session_replication_role = replica")  # FKs off, as owner
        conn.commit()
    trans = conn.begin()
    try:
        conn.execute(text("INSERT INTO configurations (type_id, vehicle_id, name, description, "
                          "items_json, created_at, created_by, version, prev_hash, row_hash) "
                          "VALUES (NULL, 9999, 'x', NULL, '{}', :c, 'm', 1, :z, :z)"),
                     {"c": dt.datetime(2026, 12, 1, tzinfo=dt.UTC), "z": "0" * 64})
        with Session(bind=conn) as s:
            report = verify_fleet(s)
            if report.ok:
                checkpoint.take(s, database="test")  # KeyError: 9999
            assert not report.ok
    finally:
        trans.rollback()
        if conn.dialect.name != "sqlite":
            conn.exec_driver_sql("SET session_replication_role = DEFAULT")
            conn.commit()
        conn.close()


def test_a_guard_enabled_for_replicas_only_is_reported(engine):
    """README: `verify` reports a guard that is missing or disabled. ``ENABLE REPLICA``
    leaves ``tgenabled = 'R'``: the trigger stays, an ordinary session's UPDATE goes through."""
    if engine.dialect.name == "sqlite":
        pytest.skip("PostgreSQL trigger states")
    with engine.begin() as conn:
        conn.exec_driver_sql("ALTER TABLE vehicles ENABLE REPLICA TRIGGER vehicles_append_only")
        conn.exec_driver_sql("UPDATE vehicles SET note = note")  # not refused any more
        assert "vehicles" in guards.missing(conn)
