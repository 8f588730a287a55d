"""Schema migrations and the database settings, on SQLite and PostgreSQL."""

from __future__ import annotations

import sqlite3

import pytest
from alembic import command
from alembic.autogenerate import compare_metadata
from alembic.runtime.migration import MigrationContext
from sqlalchemy import inspect, select, text

from ledger.errors import SchemaError
from ledger.store.db import (
    alembic_config,
    check_schema,
    current_revision,
    downgrade,
    head_revision,
    make_engine,
    upgrade,
)
from ledger.store.models import Base, VehicleTypeRow

TABLES = {"vehicle_types", "type_revisions", "vehicles", "ledger_entries", "configurations",
          "loading_sheets", "alembic_version"}


def test_upgrade_downgrade_upgrade(db_url):
    eng = make_engine(db_url)
    try:
        upgrade(eng)
        assert TABLES <= set(inspect(eng).get_table_names())
        downgrade(eng, "base")
        assert set(inspect(eng).get_table_names()) <= {"alembic_version"}
        with eng.connect() as conn:
            assert current_revision(conn) is None
        upgrade(eng)
        with eng.connect() as conn:
            assert current_revision(conn) == head_revision()
        check_schema(eng)  # does not raise
    finally:
        eng.dispose()


def test_models_and_migrations_agree(engine):
    # Alembic's own comparison (what `alembic check` runs): no difference may remain.
    with engine.connect() as conn:
        diff = compare_metadata(MigrationContext.configure(conn, opts={"compare_type": True}),
                                Base.metadata)
    assert diff == []
    with engine.connect() as conn:
        command.check(alembic_config(conn))


def test_a_database_at_head_has_every_guard_and_they_go_down_and_up(db_url):
    from ledger.store import guards

    eng = make_engine(db_url)
    try:
        upgrade(eng)
        with eng.connect() as conn:
            assert guards.missing(conn) == []
        downgrade(eng, "0002")  # the guards go with migration 0003 ...
        with eng.connect() as conn:
            assert guards.missing(conn) == list(guards.GUARDED_TABLES)
        upgrade(eng)  # ... and come back with it
        with eng.connect() as conn:
            assert guards.missing(conn) == []
            guards.drop(conn, ["vehicles"])
            assert guards.missing(conn) == ["vehicles"]
            conn.rollback()
    finally:
        eng.dispose()


def test_uninitialised_database_is_refused(sqlite_url):
    eng = make_engine(sqlite_url)
    with pytest.raises(SchemaError) as err:
        check_schema(eng)
    assert "has no wbledger schema; run `wbledger init` first" in str(err.value)


def test_newer_schema_is_refused(sqlite_url):
    eng = make_engine(sqlite_url)
    upgrade(eng)
    with eng.begin() as conn:
        conn.execute(text("UPDATE alembic_version SET version_num = '9999future'"))
    with pytest.raises(SchemaError) as err:
        check_schema(eng)
    assert "is at schema 9999future, newer than this wbledger knows" in str(err.value)
    eng.dispose()


def test_older_schema_is_refused_then_upgraded_with_a_backup(tmp_path):
    path = tmp_path / "ledger.sqlite3"
    eng = make_engine(f"sqlite:///{path}")
    upgrade(eng, "0001")  # a file written by an older wbledger: only the first migration
    with eng.begin() as conn:
        conn.execute(text("INSERT INTO vehicle_types (name, created_at) "
                          "VALUES ('OLD-1', '2026-01-01 00:00:00')"))
    with pytest.raises(SchemaError) as err:
        check_schema(eng)
    assert str(err.value).endswith(
        f"is at schema 0001, behind this wbledger ({head_revision()}); run `wbledger db upgrade` "
        "(a SQLite file is backed up first)")
    before, after, backup = upgrade(eng)
    assert (before, after) == ("0001", head_revision())
    assert backup is not None and backup.parent == path.parent
    con = sqlite3.connect(backup)  # the copy is the file as it was before the upgrade
    assert con.execute("SELECT version_num FROM alembic_version").fetchone() == ("0001",)
    assert con.execute("SELECT name FROM vehicle_types").fetchone() == ("OLD-1",)
    con.close()
    check_schema(eng)
    with eng.connect() as conn:  # data kept across the upgrade
        assert conn.execute(text("SELECT name FROM vehicle_types")).scalar() == "OLD-1"
    eng.dispose()


def test_upgrade_at_head_writes_no_backup(sqlite_url):
    eng = make_engine(sqlite_url)
    upgrade(eng)
    assert upgrade(eng)[2] is None
    eng.dispose()


def test_sqlite_settings(sqlite_url):
    eng = make_engine(sqlite_url)
    with eng.connect() as conn:
        assert conn.exec_driver_sql("PRAGMA foreign_keys").scalar() == 1
        assert conn.exec_driver_sql("PRAGMA journal_mode").scalar() == "wal"
        assert conn.exec_driver_sql("PRAGMA synchronous").scalar() == 2  # FULL
        assert conn.exec_driver_sql("PRAGMA busy_timeout").scalar() == 60000
    eng.dispose()


def test_bad_url_is_an_input_error():
    from ledger.errors import InputError

    with pytest.raises(InputError) as err:
        make_engine("not a url at all")
    assert str(err.value).startswith("--db = 'not a url at all': not a database URL")


def test_an_unreadable_stored_date_is_a_stored_data_error(sqlite_url):
    # SQLite keeps any text in a DATE column; reading it back must give the ledger's own error
    # (exit 1, naming verify), while other ValueErrors pass through unchanged.
    from ledger.errors import StoredDataError
    from ledger.store.db import session_scope

    eng = make_engine(sqlite_url)
    upgrade(eng)
    con = sqlite3.connect(sqlite_url.removeprefix("sqlite:///"))
    with con:
        con.execute("INSERT INTO vehicle_types (name, created_at) VALUES ('X', 'not a time')")
    con.close()
    with pytest.raises(StoredDataError) as err, session_scope(eng) as s:
        s.execute(text("SELECT 1")).all()
        s.execute(select(VehicleTypeRow.created_at)).all()
    assert err.value.exit_code == 3  # issue 13 item 8: stored data cannot be read
    assert str(err.value).startswith("a value stored in the database cannot be read (")
    with pytest.raises(ValueError, match="^plain$") as plain, session_scope(eng):
        raise ValueError("plain")
    assert not isinstance(plain.value, StoredDataError)
    eng.dispose()
