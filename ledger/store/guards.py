"""Append-only guards: database triggers that refuse UPDATE and DELETE on every ledger table.

wbledger itself never updates or deletes a stored row; a correction, a redefinition or an
amendment is a new row. These triggers make the database refuse it too, for whoever connects:

- **SQLite**: ``BEFORE UPDATE`` and ``BEFORE DELETE`` triggers that ``RAISE(ABORT, …)``. Someone
  with the file can still drop them (a SQLite file is a single-user ledger); ``wbledger verify``
  reports a missing guard.
- **PostgreSQL**: a ``BEFORE UPDATE OR DELETE`` row trigger and a ``BEFORE TRUNCATE`` statement
  trigger per table, calling one function that raises. They hold for the tables' owner as well;
  an owner can still disable or drop them, which is why people connect as members of the group
  roles of ``wbledger db roles`` (:mod:`ledger.store.roles`), which own nothing. ``verify``
  reports a guard that is missing or disabled.

Migration 0003 installs the guards; a later migration that re-creates one of these tables (as
SQLite batch mode does) must install that table's guards again, and ``tests/store/test_db.py``
checks that a database at head has them all.
"""

from __future__ import annotations

from sqlalchemy.engine import Connection

__all__ = ["GUARDED_TABLES", "RECORDED_BY", "install", "drop", "missing"]

#: The tables no row of which may change once written.
GUARDED_TABLES = ("vehicle_types", "type_revisions", "vehicles", "ledger_entries",
                  "configurations", "loading_sheets")

_PG_FUNCTION = "wbledger_append_only"
_PG_RECORDER = "wbledger_recorded_by"
_PG_PATH = "pg_catalog, pg_temp"

#: On PostgreSQL, the column of each table that names who wrote the row: for anyone but the
#: tables' owner (or a member of the owner role) it must be the database user writing it.
RECORDED_BY = {"ledger_entries": "actor", "loading_sheets": "preparer",
               "configurations": "created_by"}


_PG_BODIES = {
    _PG_FUNCTION: (" BEGIN RAISE EXCEPTION 'wbledger: % on % is refused: the table is "
                   "append-only', TG_OP, TG_TABLE_NAME USING ERRCODE = 'insufficient_privilege';"
                   " END "),
    # Who wrote a row is the database session's user, not a name typed in: checked here so
    # that a member of a wbledger group role cannot record in someone else's name. The owner
    # (who runs migrations and imports histories recorded elsewhere) is not held to it.
    _PG_RECORDER: (" DECLARE owner oid; BEGIN "
                   "SELECT relowner INTO owner FROM pg_class WHERE oid = TG_RELID; "
                   "IF NOT pg_has_role(current_user, owner, 'MEMBER') "
                   "AND (to_jsonb(NEW) ->> TG_ARGV[0]) IS DISTINCT FROM current_user::text THEN "
                   "RAISE EXCEPTION 'wbledger: % of a new row of % must be the database user "
                   "%', TG_ARGV[0], TG_TABLE_NAME, current_user USING ERRCODE = "
                   "'insufficient_privilege'; END IF; RETURN NEW; END "),
}


def _sqlite_sql(table: str) -> dict[str, str]:
    upd, dele = _sqlite_names(table)
    return {upd: f"CREATE TRIGGER {upd} BEFORE UPDATE ON {table} BEGIN SELECT RAISE(ABORT, "
                 f"'wbledger: {table} is append-only; rows are never updated'); END",
            dele: f"CREATE TRIGGER {dele} BEFORE DELETE ON {table} BEGIN SELECT RAISE(ABORT, "
                  f"'wbledger: {table} is append-only; rows are never deleted'); END"}


def _sqlite_names(table: str) -> tuple[str, str]:
    return f"{table}_append_only_update", f"{table}_append_only_delete"


def _pg_names(table: str) -> tuple[str, str]:
    return f"{table}_append_only", f"{table}_no_truncate"


def install(conn: Connection, tables=GUARDED_TABLES) -> None:
    """Create the guards of ``tables`` (the trigger function too, on PostgreSQL)."""
    if conn.dialect.name == "sqlite":
        for t in tables:
            for sql in _sqlite_sql(t).values():
                conn.exec_driver_sql(sql)
        return
    # Each function fixes its own search path: a user who may create objects in some schema
    # (everyone could in public before PostgreSQL 15) could otherwise put a look-alike of
    # pg_has_role, to_jsonb or an operator first on the session's path and pass the check.
    # (%% is the driver's escape for the format's %.)
    for name, body in _PG_BODIES.items():
        conn.exec_driver_sql(
            f"CREATE OR REPLACE FUNCTION {name}() RETURNS trigger LANGUAGE plpgsql "
            f"SET search_path = {_PG_PATH} AS $${body}$$".replace("%", "%%"))
    for t in tables:
        row, trunc = _pg_names(t)
        conn.exec_driver_sql(f"CREATE TRIGGER {row} BEFORE UPDATE OR DELETE ON {t} "
                             f"FOR EACH ROW EXECUTE FUNCTION {_PG_FUNCTION}()")
        conn.exec_driver_sql(f"CREATE TRIGGER {trunc} BEFORE TRUNCATE ON {t} "
                             f"FOR EACH STATEMENT EXECUTE FUNCTION {_PG_FUNCTION}()")
        if t in RECORDED_BY:
            conn.exec_driver_sql(f"CREATE TRIGGER {t}_recorded_by BEFORE INSERT ON {t} "
                                 f"FOR EACH ROW EXECUTE FUNCTION {_PG_RECORDER}"
                                 f"('{RECORDED_BY[t]}')")


def drop(conn: Connection, tables=GUARDED_TABLES) -> None:
    """Remove the guards of ``tables`` (migrations going down; tests that tamper on purpose)."""
    for t in tables:
        if conn.dialect.name == "sqlite":
            for name in _sqlite_names(t):
                conn.exec_driver_sql(f"DROP TRIGGER IF EXISTS {name}")
        else:
            for name in (*_pg_names(t), f"{t}_recorded_by"):
                conn.exec_driver_sql(f"DROP TRIGGER IF EXISTS {name} ON {t}")
    if conn.dialect.name != "sqlite" and tuple(tables) == GUARDED_TABLES:
        conn.exec_driver_sql(f"DROP FUNCTION IF EXISTS {_PG_FUNCTION}()")
        conn.exec_driver_sql(f"DROP FUNCTION IF EXISTS {_PG_RECORDER}()")


def missing(conn: Connection) -> list[str]:
    """The tables whose guards are missing or not as installed, in table order.

    SQLite: each trigger's stored SQL must be the one :func:`install` wrote. PostgreSQL: each
    trigger must exist and fire (enabled, not only for replication), call the function it was
    installed with, and that function's body must be the one installed.
    """
    if conn.dialect.name == "sqlite":
        stored = dict(conn.exec_driver_sql(
            "SELECT name, sql FROM sqlite_master WHERE type = 'trigger'").all())
        return [t for t in GUARDED_TABLES
                if any(stored.get(n) != sql for n, sql in _sqlite_sql(t).items())]
    bodies = {name: (src, config) for name, src, config in conn.exec_driver_sql(
        "SELECT p.proname, p.prosrc, array_to_string(p.proconfig, ';') FROM pg_proc p "
        "WHERE p.pronamespace = to_regnamespace(current_schema())::oid AND p.proname IN "
        f"('{_PG_FUNCTION}', '{_PG_RECORDER}')")}
    good = {n for n, body in _PG_BODIES.items()
            if bodies.get(n) == (body, f"search_path={_PG_PATH}")}
    firing = {name: fn for name, fn in conn.exec_driver_sql(
        "SELECT t.tgname, p.proname FROM pg_trigger t JOIN pg_class c ON c.oid = t.tgrelid "
        "JOIN pg_proc p ON p.oid = t.tgfoid "
        "WHERE c.relnamespace = to_regnamespace(current_schema())::oid "
        "AND NOT t.tgisinternal AND t.tgenabled IN ('O', 'A')")}

    def whole(t: str) -> bool:
        want = {n: _PG_FUNCTION for n in _pg_names(t)}
        if t in RECORDED_BY:
            want[f"{t}_recorded_by"] = _PG_RECORDER
        return all(firing.get(n) == fn and fn in good for n, fn in want.items())

    return [t for t in GUARDED_TABLES if not whole(t)]
