"""The tamper suite: every stored value a verdict depends on, changed behind wbledger's back.

Each case is a hand edit by someone with direct access to the database (SQLite and PostgreSQL):
it removes the append-only guard of the table first (the guard refuses the edit otherwise, which
the last test checks), makes one change, and then

- ``wbledger verify`` (:func:`verify_fleet`) must fail, or — for the changes only a hash kept
  outside the database can show — comparing with such a hash must fail: ``--expect`` a sheet's
  printed hash, or a checkpoint (``--against``, with ``--exact`` for appends);
- and no sheet may be prepared on the changed data (:class:`ChainError`), or, for a change to a
  saved sheet, it may not be amended and ``sheet show`` reports it.

Every edit runs in a transaction that is rolled back, so the cases share one fleet. The types are
INVENTED for the tests (not any real vehicle's data). The plan loads TS-1 to 2,460 lb against
its maximum take-off mass of 2,450 lb: OUT OF LIMITS (limits are inclusive, common practice);
the headline cases raise that limit in the stored type, or link the vehicle to TS-2, whose
maximum is 3,000 lb, and must still never give IN LIMITS.
"""

from __future__ import annotations

import datetime as dt
import json

import pytest
from sqlalchemy import text
from sqlalchemy.orm import Session

from ledger.services.sheets import amend_sheet, prepare_sheet, save_prepared
from ledger.store import checkpoint, guards
from ledger.store.catalog import add_vehicle
from ledger.store.chain import content_hash
from ledger.store.configs import define_configuration
from ledger.store.db import session_scope
from ledger.store.entries import install_item, record_weighing
from ledger.store.evidence import verify_fleet
from ledger.store.sheets import verify_sheet
from ledger.testing import import_types
from ledger.typedata.plan import QuickOptions, read_plan_text
from tests.store.ledger_support import ts_type


def type_text(name: str, mtow: float) -> str:
    """The suite's test type (INVENTED) under ``name`` with take-off limit ``mtow`` lb."""
    return ts_type(name, title="Test type for the tamper suite (invented)", mtow=mtow)


# 1,650 lb empty + 2 lb lamp + 1 lb horn + 180 lb pilot + 447 lb cargo + 180 lb fuel (30 USgal
# of avgas at 6.0 lb/USgal, FAA-H-8083-30 ch. 4) = 2,460 lb at take-off (no taxi fuel): 10 lb
# over TS-1's 2,450 lb.
HEAVY = """plan_format = 1
vehicle = "TS-101"
[[person]]
seat = "pilot"
mass = 180
[[cargo]]
station = "baggage"
mass = 447
[fuel]
trip = "20 USgal"
[fuel.tanks]
main = "30 USgal"
"""
LIGHT = HEAVY.replace("mass = 447", "mass = 40")

def _types(s):
    import_types(s, {f"{name}.toml": type_text(name, mtow)
                     for name, mtow in (("TS-1", 2450), ("TS-2", 3000))})


@pytest.fixture
def fleet(engine):
    """TS-101 (TS-1): a weighing, a lamp, two saved sheets and an amendment, then one more
    entry no sheet has used; TS-201 (TS-2); a vehicle configuration in two versions."""
    with session_scope(engine) as s:
        _types(s)
        add_vehicle(s, "TS-101", "TS-1", serial="S-1", note="test vehicle")
        add_vehicle(s, "TS-201", "TS-2")
        for reg in ("TS-101", "TS-201"):
            record_weighing(s, reg, {"nose": "350 lb", "main": "1300 lb"}, actor="tester",
                            entry_date="2026-11-30")
        install_item(s, "TS-101", "lamp", mass="2 lb", arm="80 in", reason="fit",
                     actor="tester", entry_date="2026-12-01")
        define_configuration(s, "pod", registration="TS-101", actor="tester",
                             items=[{"name": "pod", "action": "install", "mass": "30 lb",
                                     "x": "60 in"}])
        define_configuration(s, "pod", registration="TS-101", actor="tester", replace=True,
                             items=[{"name": "pod", "action": "install", "mass": "31 lb",
                                     "x": "60 in"}])
    for _ in range(2):
        with session_scope(engine) as s:
            save_prepared(s, prepare_sheet(s, read_plan_text(LIGHT, "p.toml"), source="p",
                                           preparer="R. Ortega"))
    with session_scope(engine) as s:
        amend_sheet(s, 2, options=QuickOptions(cargo=("baggage=50",)), preparer="R. Ortega")
        install_item(s, "TS-101", "horn", mass="1 lb", arm="10 in", reason="fit",
                     actor="tester", entry_date="2026-12-02")
    with session_scope(engine) as s:
        assert verify_fleet(s).ok
        cp = checkpoint.take(s, database="test")
        heavy = prepare_sheet(s, read_plan_text(HEAVY, "p.toml"), source="p", preparer="x")
        assert heavy.verdict == "out_of_limits"
    engine.checkpoint = cp
    return engine


def _ids(conn):
    return {r[0]: r[1] for r in conn.execute(text("SELECT registration, id FROM vehicles"))}


def _tampered(fleet, table: str, sql: str, params=None):
    """Open a transaction, remove ``table``'s guard, run ``sql``; yield a Session in it."""
    conn = fleet.connect()
    trans = conn.begin()
    guards.drop(conn, [table])
    ids = _ids(conn)
    before = _rows(conn, table)
    conn.execute(text(sql.format(**{k.replace("-", "_"): v for k, v in ids.items()})),
                 params or {})
    assert _rows(conn, table) != before, f"the edit changed nothing: {sql}"
    return conn, trans, Session(bind=conn)


def _rows(conn, table: str) -> list:
    return [tuple(r) for r in conn.execute(text(f"SELECT * FROM {table} ORDER BY id"))]


def _refused(fn) -> str:
    """``fn()`` must refuse with a LedgerError; returns its message."""
    from ledger.errors import LedgerError

    with pytest.raises(LedgerError) as err:
        fn()
    return str(err.value)


def _refused_or_out_of_limits(s, configuration: str | None = None) -> bool:
    """Whether preparing a sheet for TS-101 is refused; if it is not, the 10 lb overload must
    still be OUT OF LIMITS (the heavy plan) — never IN LIMITS."""
    from ledger.errors import LedgerError

    refused = True
    for plan in (HEAVY, LIGHT):
        if configuration:
            plan = plan.replace("plan_format = 1",
                                f'plan_format = 1\nconfiguration = "{configuration}"')
        try:
            doc = prepare_sheet(s, read_plan_text(plan, "p.toml"), source="p",
                                preparer="x").document
        except LedgerError:
            continue
        refused = False
        if "447" in plan:  # the heavy plan, 10 lb over
            assert doc["verdict"] == "out_of_limits"
    return refused


# Where a hand edit leaves TS-101's own evidence whole, as a deletion of its newest row would:
# entry 3 (used by no sheet) or the newest version of "pod" moved to TS-201 (whose chain
# breaks). TS-101 can still be computed, on what it had before; the checkpoint shows the row
# gone (checked below).
PREPARE_STILL_ALLOWED = {("ledger_entries", "vehicle_id"), ("configurations", "vehicle_id")}

def _flip(col: str) -> str:
    """SQL for the hash in ``col`` with its first digit changed (always a change)."""
    return f"CASE WHEN substr({col}, 1, 1) = '0' THEN '1' ELSE '0' END || substr({col}, 2)"


# Columns changed one at a time, with the new value as SQL. {TS_101}/{TS_201} are vehicle ids.
CASES = {
    "vehicle_types": [("name", "name || 'x'", "name = 'TS-1'")],
    "type_revisions": [
        ("spec_json", "REPLACE(spec_json, '\"max_takeoff_kg\": 1111.3013065', "
                      "'\"max_takeoff_kg\": 1360.77711')", None),
        # moved to TS-2 as its revision 2 (UNIQUE (type_id, revision) holds)
        ("type_id", "(SELECT id FROM vehicle_types WHERE name = 'TS-2'), revision = 2", None),
        ("revision", "revision + 1", None),
        ("content_sha256", _flip("content_sha256"), None),
        ("source_name", "source_name || 'x'", None),
        ("source_text", "source_text || '#'", None),
        ("imported_at", "@ts", None),
        ("prev_hash", _flip("prev_hash"), None),
        ("row_hash", _flip("row_hash"), None),
    ],
    "vehicles": [
        ("registration", "'TS-999'", None),
        ("type_id", "(SELECT id FROM vehicle_types WHERE name = 'TS-2')", None),
        ("serial", "'S-2'", None),
        ("note", "'changed'", None),
        ("created_at", "@ts", None),
        ("row_hash", _flip("row_hash"), None),
    ],
    "ledger_entries": [
        ("empty_mass_kg", "empty_mass_kg - 50", "seq = 2"),
        ("item_mass_kg", "item_mass_kg * 0.5", "seq = 2"),
        ("vehicle_id", "{TS_201}", "seq = 3"),
        ("entry_hash", _flip("entry_hash"), "seq = 2"),
        ("actor", "'forger'", "seq = 1"),
        ("recorded_at", "@ts", "seq = 1"),
    ],
    "configurations": [
        ("items_json", "REPLACE(items_json, '14.06', '4.06')", "version = 2"),
        ("description", "'changed'", "version = 2"),
        ("name", "'pod2'", "version = 2"),
        ("version", "version + 1", "version = 2"),
        ("vehicle_id", "{TS_201}", "version = 2"),
        ("created_by", "'forger'", "version = 2"),
        ("created_at", "@ts", "version = 2"),
        ("prev_hash", _flip("prev_hash"), "version = 2"),
        ("row_hash", _flip("row_hash"), "version = 1"),
    ],
}
SHEET_COLUMNS = [
    ("verdict", "'out_of_limits'"), ("preparer", "'forger'"), ("created_at", "@ts"),
    ("plan_json", "REPLACE(plan_json, '\"seat\"', '\"seat\" ')"),
    ("result_json", "REPLACE(result_json, 'in_limits', 'in_limits ')"),
    ("content_sha256", _flip("content_sha256")),
    ("entry_id", "(SELECT id FROM ledger_entries WHERE seq = 1 AND vehicle_id = {TS_101})"),
    ("type_revision_id", "(SELECT min(id) FROM type_revisions WHERE type_id = "
                         "(SELECT id FROM vehicle_types WHERE name = 'TS-2'))"),
    ("amends_id", "1"), ("entry_hash", _flip("entry_hash")),
    ("prev_hash", _flip("prev_hash")), ("row_hash", _flip("row_hash")),
    ("vehicle_id", "{TS_201}"),
]


def _ts(dialect: str, col: str) -> str:
    return (f"datetime({col}, '+1 second')" if dialect == "sqlite"
            else f"{col} + interval '1 second'")


def _edit_sql(table: str, col: str, expr: str, where: str | None, dialect: str) -> str:
    if expr == "@ts":
        expr = _ts(dialect, col)
    if where is None:
        where = {"type_revisions": "type_id = (SELECT id FROM vehicle_types WHERE name = "
                                   "'TS-1')",
                 "vehicles": "registration = 'TS-101'"}.get(table, "1 = 1")
    elif table in ("ledger_entries", "configurations"):
        where += " AND vehicle_id = {TS_101}"
    return f"UPDATE {table} SET {col} = {expr} WHERE {where}"


def _all_cases():
    for table, cols in CASES.items():
        for col, expr, where in cols:
            yield pytest.param(table, col, expr, where, id=f"{table}.{col}")


@pytest.mark.parametrize(("table", "col", "expr", "where"), list(_all_cases()))
def test_every_column_a_verdict_depends_on(fleet, table, col, expr, where):
    sql = _edit_sql(table, col, expr, where, fleet.dialect.name)
    conn, trans, s = _tampered(fleet, table, sql)
    try:
        report = verify_fleet(s)
        assert not report.ok, (table, col)
        assert any("guards of " + table in p for p in report.problems)
        assert len(report.problems) >= 2, report.problems  # the guard, and the change itself
        refused = _refused_or_out_of_limits(
            s, configuration="pod" if table == "configurations" else None)
        assert refused == ((table, col) not in PREPARE_STILL_ALLOWED), (table, col)
        if not refused:
            assert checkpoint.compare_with(s, fleet.checkpoint, report).problems
    finally:
        s.close()
        trans.rollback()
        conn.close()


@pytest.mark.parametrize(("col", "expr"), SHEET_COLUMNS, ids=[c for c, _ in SHEET_COLUMNS])
def test_every_column_of_a_saved_sheet(fleet, col, expr):
    # Sheet 1 is the first of TS-101; sheet 3 amends sheet 2.
    target = 3 if col != "amends_id" else 2
    sql = _edit_sql("loading_sheets", col, expr, f"id = {target}", fleet.dialect.name)
    conn, trans, s = _tampered(fleet, "loading_sheets", sql)
    try:
        report = verify_fleet(s)
        bad = [v for v in report.vehicles if not v.ok]
        assert bad and "saved sheet" in bad[0].problem, report.problems
        assert not verify_sheet(s, target)
        _refused(lambda: amend_sheet(s, target, options=QuickOptions(cargo=("baggage=45",)),
                                     preparer="x"))
    finally:
        s.close()
        trans.rollback()
        conn.close()


DELETIONS = [
    # (what, table, SQL, caught by verify alone)
    ("the last entry, used by no sheet", "ledger_entries",
     "DELETE FROM ledger_entries WHERE vehicle_id = {TS_101} AND seq = 3", False),
    ("the entry the newest sheet was built on, and the one after",
     "ledger_entries", "DELETE FROM ledger_entries WHERE vehicle_id = {TS_101} AND seq >= 2",
     True),
    ("a middle entry", "ledger_entries",
     "DELETE FROM ledger_entries WHERE vehicle_id = {TS_101} AND seq = 2", True),
    ("every entry of a vehicle with saved sheets", "ledger_entries",
     "DELETE FROM ledger_entries WHERE vehicle_id = {TS_101}", True),
    ("the first sheet", "loading_sheets", "DELETE FROM loading_sheets WHERE id = 1", True),
    ("the newest sheet, an amendment", "loading_sheets",
     "DELETE FROM loading_sheets WHERE id = 3", False),
    ("the newest configuration version", "configurations",
     "DELETE FROM configurations WHERE version = 2", False),
    ("the first configuration version", "configurations",
     "DELETE FROM configurations WHERE version = 1", True),
    ("a type's only revision", "type_revisions",
     "DELETE FROM type_revisions WHERE type_id = (SELECT id FROM vehicle_types WHERE name = "
     "'TS-2')", True),
    ("a vehicle (its entries left behind)", "vehicles",
     "DELETE FROM vehicles WHERE registration = 'TS-201'", True),
]


@pytest.mark.parametrize(("what", "table", "sql", "by_verify"), DELETIONS,
                         ids=[d[0] for d in DELETIONS])
def test_deletions(fleet, what, table, sql, by_verify):
    conn = fleet.connect()
    if fleet.dialect.name == "sqlite":  # a hand edit can switch foreign keys off too
        conn.connection.driver_connection.execute("PRAGMA foreign_keys = OFF")
    else:
        conn.exec_driver_sql("SET session_replication_role = replica")  # FKs off, as owner
        conn.commit()
    trans = conn.begin()
    try:
        guards.drop(conn, [table])
        conn.execute(text(sql.format(**{k.replace("-", "_"): v for k, v in _ids(conn).items()})))
        with Session(bind=conn) as s:
            report = verify_fleet(s)
            problems = [p for p in report.problems if "guards of" not in p]
            assert bool(problems) == by_verify, (what, report.problems)
            found = checkpoint.compare_with(s, fleet.checkpoint, report)
            assert problems or found.problems, what
    finally:
        trans.rollback()
        if fleet.dialect.name == "sqlite":
            conn.connection.driver_connection.execute("PRAGMA foreign_keys = ON")
        else:
            conn.exec_driver_sql("SET session_replication_role = DEFAULT")
            conn.commit()
        conn.close()


def test_a_deleted_last_entry_is_caught_by_the_head_a_sheet_printed(fleet):
    with session_scope(fleet) as s:
        head = verify_fleet(s, "TS-101").vehicles[0].ledger.head_hash
    conn, trans, s = _tampered(fleet, "ledger_entries", _edit_sql(
        "ledger_entries", "seq", "seq", "seq = 3", fleet.dialect.name).replace(
        "UPDATE ledger_entries SET seq = seq WHERE", "DELETE FROM ledger_entries WHERE"))
    try:
        assert [p for p in verify_fleet(s).problems if "guards" not in p] == []
        report = verify_fleet(s, expect=[head])
        assert report.expected == ((head, False),)
    finally:
        s.close()
        trans.rollback()
        conn.close()


REORDERINGS = {
    # two entries swapped (through a free seq, as UNIQUE (vehicle_id, seq) demands)
    "ledger_entries": ["UPDATE ledger_entries SET seq = 99 WHERE vehicle_id = {TS_101} AND "
                       "seq = 1", "UPDATE ledger_entries SET seq = 1 WHERE vehicle_id = "
                       "{TS_101} AND seq = 2", "UPDATE ledger_entries SET seq = 2 WHERE "
                       "vehicle_id = {TS_101} AND seq = 99"],
    # the first sheet moved after the others (a new id)
    "loading_sheets": ["UPDATE loading_sheets SET id = 100 WHERE id = 1"],
    # a type's revisions swapped
    "type_revisions": ["UPDATE configurations SET version = 99 WHERE version = 1",
                       "UPDATE configurations SET version = 1 WHERE version = 2",
                       "UPDATE configurations SET version = 2 WHERE version = 99"],
}


@pytest.mark.parametrize("table", list(REORDERINGS))
def test_reordering(fleet, table):
    conn = fleet.connect()
    trans = conn.begin()
    try:
        guards.drop(conn, [table, "configurations"])
        ids = {k.replace("-", "_"): v for k, v in _ids(conn).items()}
        for sql in REORDERINGS[table]:
            assert conn.execute(text(sql.format(**ids))).rowcount == 1
        with Session(bind=conn) as s:
            problems = [p for p in verify_fleet(s).problems if "guards" not in p]
            assert problems, table
    finally:
        trans.rollback()
        conn.close()


def test_a_forged_append_is_found_only_against_a_checkpoint(fleet):
    """An entry appended with a correct hash looks like any other: verify passes, and the
    checkpoint lists it as added since (``verify --against FILE --exact`` fails)."""
    conn = fleet.connect()
    trans = conn.begin()
    try:
        row = conn.execute(text(
            "SELECT * FROM ledger_entries WHERE seq = 3 AND vehicle_id = "
            "(SELECT id FROM vehicles WHERE registration = 'TS-101')")).mappings().one()
        forged = {k: v for k, v in row.items() if k != "id"}
        if isinstance(forged["recorded_at"], str):  # SQLite gives the stored text
            forged["recorded_at"] = dt.datetime.fromisoformat(forged["recorded_at"])
            forged["entry_date"] = dt.date.fromisoformat(forged["entry_date"])
        forged.update(seq=4, prev_hash=row["entry_hash"], actor="forger",
                      reason="forged", baseline_seq=row["baseline_seq"])
        forged.update(kind="correction", delta_mass_kg=0.0, delta_mx_kgm=0.0, delta_my_kgm=0.0,
                      delta_mz_kgm=0.0)
        forged["entry_hash"] = content_hash(forged, "TS-101")
        cols = ", ".join(forged)
        conn.execute(text(f"INSERT INTO ledger_entries ({cols}) VALUES "
                          f"({', '.join(':' + c for c in forged)})"), forged)
        with Session(bind=conn) as s:
            report = verify_fleet(s)
            assert report.ok, report.problems
            found = checkpoint.compare_with(s, fleet.checkpoint, report)
            assert found.problems == () and found.added == ("TS-101: 1 entry",)
    finally:
        trans.rollback()
        conn.close()


def test_the_guards_refuse_every_edit_while_in_place(fleet):
    tables = [*CASES, "loading_sheets"]
    for table in tables:
        for sql in (f"UPDATE {table} SET id = id", f"DELETE FROM {table}"):
            with pytest.raises(Exception, match="append-only"):
                with fleet.begin() as conn:
                    conn.execute(text(sql))
    with session_scope(fleet) as s:
        assert verify_fleet(s).ok
        assert json.dumps(checkpoint.compare_with(s, fleet.checkpoint, verify_fleet(s))
                          .to_dict()) == json.dumps({"problems": [], "added": [],
                                                     "signature": "not signed"})
