"""The PostgreSQL roles of ``wbledger db roles`` and the append-only guards, on a real server.

PostgreSQL only (the ``pg_server`` fixture). One fleet is built for the module by the tables'
owner (the test server's ``wbledger``, a superuser); ``create_roles`` then makes the four group
roles under a prefix of this run, and one login role per group connects by name (trust
authentication): a loadmaster, a mechanic (maintenance), a weight engineer and an auditor.
Each does what its role may through the library, and is recorded under its own login name
whatever name it types; each then tries, by direct SQL, every write it must not make and is
refused by the database, with every table left as it was. The last test, that ``db roles``
refuses a SQLite file, needs no server.

Roles live in the whole cluster, not in one database, so every name here carries a suffix of
this run, and the roles are dropped at the end (``DROP OWNED BY`` and ``DROP ROLE``) so that the
shared test server stays clean.

Sources: the privileges a statement needs, and the refusals' SQLSTATE 42501
(insufficient_privilege), are PostgreSQL 15's documented behaviour ("Privileges", ``GRANT``,
``SELECT … FOR UPDATE``, ``TRUNCATE``, ``ALTER TABLE``, ``DROP TRIGGER``, "Writing
SECURITY DEFINER functions safely" for the search path; appendix A, error codes).
"""

from __future__ import annotations

import re
import uuid
from contextlib import contextmanager
from types import SimpleNamespace

import pytest
from sqlalchemy import text
from typer.testing import CliRunner

from ledger.cli import app
from ledger.errors import AccessRefusedError
from ledger.services.sheets import amend_sheet, prepare_sheet, save_prepared
from ledger.store import guards
from ledger.store.catalog import add_vehicle, import_type
from ledger.store.configs import define_configuration
from ledger.store.db import make_engine, session_scope, upgrade
from ledger.store.entries import entries_of, install_item
from ledger.store.evidence import verify_fleet
from ledger.store.roles import create_roles, role_names
from ledger.store.sheets import list_sheets
from ledger.typedata import parse_type_text
from ledger.typedata.plan import QuickOptions, read_plan_text
from tests.store.ledger_support import TYPE_A, setup_fleet, weigh_a

pytestmark = pytest.mark.postgres
psycopg = pytest.importorskip("psycopg")

TABLES = guards.GUARDED_TABLES

#: What each role may write, as the roles are meant to be (the brief of ``db roles``), written
#: out here rather than read from ``ROLE_GRANTS`` so that a wrong grant there is caught.
MAY_INSERT = {
    "auditor": set(),
    "loadmaster": {"loading_sheets"},
    "maintenance": {"ledger_entries", "configurations"},
    "weight_engineer": {"vehicle_types", "type_revisions", "vehicles", "configurations"},
}
#: Who needs UPDATE on vehicles.id: the roles that lock a vehicle (SELECT … FOR UPDATE).
LOCKS_VEHICLES = {"loadmaster", "maintenance"}
LOGINS = {"loadmaster": "alice", "maintenance": "bob", "weight_engineer": "carol",
          "auditor": "dave"}

#: INVENTED: TT-A1 of ledger_support with a last-minute tolerance, for amended sheets.
TYPE_L = TYPE_A.replace('name = "TT-A1"', 'name = "TT-L1"').replace(
    "[tolerances]\n", '[tolerances]\nlast_minute_mass = "20 lb"\nlast_minute_persons = 0\n')
# INVENTED plan for TT-L1: in limits by a wide margin.
PLAN = """plan_format = 1
vehicle = "TL-1"
[[person]]
seat = "pilot"
mass = 180
[[cargo]]
station = "cabin"
mass = 100
[fuel]
trip = "20 USgal"
[fuel.tanks]
main = "60 USgal"
"""
#: A second INVENTED type, imported by the weight engineer.
TYPE_E = TYPE_A.replace('name = "TT-A1"', 'name = "TT-E1"').replace(
    "Test twin (invented)", "Test twin, engineer's variant (invented)")


# --- roles that must not outlive the module ----------------------------------------------------

class Cluster:
    """Group and login roles made for one test, and how to drop them again."""

    def __init__(self, server, dbname: str) -> None:
        self.server, self.dbname = server, dbname
        self.suffix = uuid.uuid4().hex[:8]
        self.prefix = f"t{self.suffix}"
        self.created: list[str] = []

    def owner(self):
        return psycopg.connect(self.server.dsn(self.dbname), autocommit=True)

    def login(self, role: str) -> str:
        """Make a LOGIN role for ``role``'s group and return its name."""
        name = f"{LOGINS[role]}_{self.suffix}"
        group = role_names(self.prefix)[role]
        with self.owner() as conn:
            conn.execute(f"CREATE ROLE {name} LOGIN")
            self.created.append(name)
            conn.execute(f"GRANT {group} TO {name}")
        return name

    def dsn(self, user: str) -> str:
        return self.server.dsn(self.dbname).replace("//wbledger@", f"//{user}@")

    def url(self, user: str) -> str:
        return self.server.url(self.dbname).replace("//wbledger@", f"//{user}@")

    def drop(self) -> None:
        groups = list(role_names(self.prefix).values())
        with self.owner() as conn:
            present = [r for (r,) in conn.execute(
                "SELECT rolname::text FROM pg_roles WHERE rolname = ANY(%s)",
                [self.created + groups])]
            if present:
                conn.execute(f"DROP OWNED BY {', '.join(present)}")
        with psycopg.connect(self.server.dsn("postgres"), autocommit=True) as conn:
            for r in self.created + groups:
                conn.execute(f"DROP ROLE IF EXISTS {r}")


@pytest.fixture(scope="module")
def ledger(pg_server):
    """The module's fleet, its roles and one engine per login (see the module notes)."""
    dbname = pg_server.create_database()
    cluster = Cluster(pg_server, dbname)
    engines = []
    try:
        owner = make_engine(pg_server.url(dbname))
        engines.append(owner)
        upgrade(owner)
        setup_fleet(owner, {"TA-1": "TT-A1", "TA-2": "TT-A1"})
        with session_scope(owner) as s:
            import_type(s, parse_type_text(TYPE_L, source="tt-l1.toml"), "tt-l1.toml", TYPE_L)
            add_vehicle(s, "TL-1", "TT-L1")
        weigh_a(owner, "TA-1")
        weigh_a(owner, "TL-1")
        with session_scope(owner) as s:
            define_configuration(s, "pod", actor="Owner Name", registration="TA-1",
                                 items=[{"name": "cargo pod", "action": "install",
                                         "mass": "30 lb", "x": "110 in"}])
            save_prepared(s, prepare_sheet(s, read_plan_text(PLAN, "plan.toml"),
                                           source="plan.toml", preparer="Owner Name"))
        with owner.begin() as conn:
            create_roles(conn, cluster.prefix)
        users = {role: cluster.login(role) for role in LOGINS}
        as_user = {}
        for role, user in users.items():
            as_user[role] = make_engine(cluster.url(user))
            engines.append(as_user[role])
        yield SimpleNamespace(cluster=cluster, owner=owner, users=users, engine=as_user)
    finally:
        for e in engines:
            e.dispose()
        cluster.drop()
        pg_server.drop_database(dbname)


def snapshot(cluster: Cluster) -> dict:
    """Every row of every ledger table, and the guards in force, read as the owner."""
    with cluster.owner() as conn:
        rows = {t: conn.execute(f"SELECT * FROM {t} ORDER BY 1").fetchall()
                for t in (*TABLES, "alembic_version")}
        rows["triggers enabled"] = conn.execute(
            "SELECT tgrelid::regclass::text, tgname::text, tgenabled FROM pg_trigger "
            "WHERE NOT tgisinternal ORDER BY 1, 2").fetchall()
        rows["table owners"] = conn.execute(
            "SELECT tablename::text, tableowner::text FROM pg_tables "
            "WHERE schemaname = 'public' ORDER BY 1").fetchall()
    return rows


def _columns(cluster: Cluster, table: str) -> list[str]:
    with cluster.owner() as conn:
        return [c for (c,) in conn.execute(
            "SELECT column_name::text FROM information_schema.columns WHERE table_name = %s "
            "AND column_name <> 'id' ORDER BY ordinal_position", [table])]


def _copy_newest(cluster: Cluster, table: str, **replace: str) -> str:
    """INSERT of a copy of the newest row of ``table`` with some columns replaced (SQL
    expressions over the copied row)."""
    cols = _columns(cluster, table)
    values = ", ".join(replace.get(c, c) for c in cols)
    return (f"INSERT INTO {table} ({', '.join(cols)}) SELECT {values} FROM {table} "
            "ORDER BY id DESC LIMIT 1")


@contextmanager
def refused(match: str):
    """The statement inside must be refused by the database with SQLSTATE 42501 and a message
    that ``match`` (a regular expression) finds."""
    with pytest.raises(psycopg.errors.InsufficientPrivilege) as err:
        yield err
    assert err.value.sqlstate == "42501"
    assert re.search(match, str(err.value)), str(err.value)


# --- 1 and 2: each role does what it may, under its own name -----------------------------------

def test_loadmaster_saves_a_sheet_under_the_login_name(ledger):
    user = ledger.users["loadmaster"]
    with session_scope(ledger.engine["loadmaster"]) as s:
        prepared = prepare_sheet(s, read_plan_text(PLAN, "plan.toml"), source="plan.toml",
                                 preparer="Someone Else")
        assert prepared.preparer == user  # what the sheet prints, before it is saved
        saved = save_prepared(s, prepared)
    assert saved.preparer == user and saved.verdict == "in_limits"
    with session_scope(ledger.engine["loadmaster"]) as s:  # a last-minute change of 10 lb
        amended, _ = amend_sheet(s, saved.id, options=QuickOptions(cargo=("cabin=110",)),
                                 preparer="Someone Else")
    assert amended.amends_id == saved.id and amended.preparer == user
    with session_scope(ledger.owner) as s:
        stored = [x for x in list_sheets(s, "TL-1") if x.id in (saved.id, amended.id)]
        assert [x.preparer for x in stored] == [user, user]
        assert verify_fleet(s).ok


def test_maintenance_records_entries_and_configurations_under_the_login_name(ledger):
    user = ledger.users["maintenance"]
    with session_scope(ledger.engine["maintenance"]) as s:
        entry = install_item(s, "TA-1", "radio", mass="3 lb", arm="20 in",
                             actor="W. Eigher", reason="role test")
        cfg = define_configuration(s, "stretcher", actor="W. Eigher", registration="TA-1",
                                   items=[{"name": "stretcher", "action": "install",
                                           "mass": "25 lb", "x": "120 in"}])
    assert entry.actor == user
    first = weigh_a(ledger.engine["maintenance"], "TA-2")  # it passes actor="W. Eigher"
    assert first.actor == user and first.seq == 1
    with session_scope(ledger.owner) as s:
        assert entries_of(s, "TA-1")[-1].actor == user
        assert entries_of(s, "TA-2")[-1].actor == user
        made_by = s.execute(text("SELECT created_by FROM configurations WHERE name = "
                                 "'stretcher'")).scalar_one()
        assert made_by == user and cfg.name == "stretcher"
        assert verify_fleet(s).ok


def test_weight_engineer_imports_types_adds_vehicles_and_defines_configurations(ledger):
    user = ledger.users["weight_engineer"]
    with session_scope(ledger.engine["weight_engineer"]) as s:
        imported = import_type(s, parse_type_text(TYPE_E, source="tt-e1.toml"),
                               "tt-e1.toml", TYPE_E)
        add_vehicle(s, "TE-1", "TT-E1")
        define_configuration(s, "ferry", actor="Someone Else", type_name="TT-E1",
                             items=[{"name": "ferry tank", "action": "install",
                                     "mass": "40 lb", "x": "100 in"}])
    assert imported.created and imported.revision == 1
    with ledger.owner.connect() as conn:
        made_by = conn.execute(text("SELECT created_by FROM configurations WHERE name = "
                                    "'ferry'")).scalar_one()
        reg = conn.execute(text("SELECT registration FROM vehicles WHERE registration = "
                                "'TE-1'")).scalar_one()
    assert made_by == user and reg == "TE-1"
    with session_scope(ledger.owner) as s:
        assert verify_fleet(s).ok


def test_auditor_verifies_the_fleet_and_reads_everything(ledger):
    with session_scope(ledger.engine["auditor"]) as s:
        report = verify_fleet(s)
        assert report.ok, report.problems
        assert report.guards_problem is None
        assert {"TA-1", "TA-2", "TL-1"} <= {v.registration for v in report.vehicles}
        assert [x.preparer for x in list_sheets(s, "TL-1")][-1] == "Owner Name"  # the first
        assert entries_of(s, "TA-1")[0].actor == "W. Eigher"
    with ledger.engine["auditor"].connect() as conn:
        for t in TABLES:
            conn.execute(text(f"SELECT count(*) FROM {t}")).scalar_one()


# --- 3: each role tries what it must not do ----------------------------------------------------

#: A column of each table to "update" (set to itself), other than ``id``.
SOME_COLUMN = {"vehicle_types": "name", "type_revisions": "spec_json", "vehicles": "type_id",
               "ledger_entries": "empty_mass_kg", "configurations": "items_json",
               "loading_sheets": "verdict"}


@pytest.mark.parametrize("role", list(LOGINS))
def test_each_role_is_refused_what_it_may_not_do(ledger, role):
    cluster = ledger.cluster
    before = snapshot(cluster)
    assert all(len(before[t]) > 0 for t in TABLES)  # something to change on every table
    with psycopg.connect(cluster.dsn(ledger.users[role]), autocommit=True) as conn:
        for t in TABLES:
            if t not in MAY_INSERT[role]:
                with refused(f"permission denied for table {t}$"):
                    conn.execute(_copy_newest(cluster, t))
            col = SOME_COLUMN[t]
            with refused(f"permission denied for table {t}$"):
                conn.execute(f"UPDATE {t} SET {col} = {col}")
            with refused(f"permission denied for table {t}$"):
                conn.execute(f"DELETE FROM {t}")
            with refused(f"permission denied for table {t}$"):
                conn.execute(f"TRUNCATE {t}")
            with refused(f"permission denied for table {t}$"):
                conn.execute(f"TRUNCATE {t} CASCADE")
            for stmt in (f"ALTER TABLE {t} DISABLE TRIGGER ALL",
                         f"ALTER TABLE {t} DISABLE TRIGGER {t}_append_only",
                         f"DROP TRIGGER {t}_append_only ON {t}",
                         f"DROP TRIGGER {t}_no_truncate ON {t}",
                         f"ALTER TABLE {t} OWNER TO {ledger.users[role]}",
                         f"DROP TABLE {t} CASCADE"):
                # (PostgreSQL says "table" or "relation" depending on the statement)
                with refused(f"must be owner of (table|relation) {t}$"):
                    conn.execute(stmt)
            if t in guards.RECORDED_BY:
                with refused(f"must be owner of relation {t}$"):
                    conn.execute(f"DROP TRIGGER {t}_recorded_by ON {t}")
        if role in LOCKS_VEHICLES:
            # The one column it may update (for FOR UPDATE locks); the guard refuses the update.
            with refused("UPDATE on vehicles is refused: the table is append-only"):
                conn.execute("UPDATE vehicles SET id = id")
            conn.execute("SELECT id FROM vehicles FOR UPDATE")  # the lock itself is allowed
        else:
            with refused("permission denied for table vehicles$"):
                conn.execute("SELECT id FROM vehicles FOR UPDATE")
        with refused("must be owner of function wbledger_append_only"):
            conn.execute("DROP FUNCTION wbledger_append_only()")
        # (refused for the schema first where, as from PostgreSQL 15 on, users may not create
        # objects in schema public)
        with refused("permission denied for schema public$|"
                     "must be owner of function wbledger_recorded_by$"):
            conn.execute("CREATE OR REPLACE FUNCTION wbledger_recorded_by() RETURNS trigger "
                         "LANGUAGE plpgsql AS $$ BEGIN RETURN NEW; END $$")
        # Triggers do not fire in replica mode; only a superuser may choose it.
        with refused("session_replication_role"):
            conn.execute("SET session_replication_role = replica")
    assert snapshot(cluster) == before


#: A copy of the newest row that is new in every unique key, for each table with a recorder.
FORGE = {
    "ledger_entries": {"seq": "seq + 1"},
    "loading_sheets": {"prev_hash": "row_hash"},
    "configurations": {"version": "version + 1", "prev_hash": "row_hash"},
}
FORGEABLE = [(role, t) for role in LOGINS for t in sorted(MAY_INSERT[role])
             if t in guards.RECORDED_BY]


@pytest.mark.parametrize(("role", "table"), FORGEABLE)
def test_a_row_in_another_name_is_refused(ledger, role, table):
    cluster = ledger.cluster
    user = ledger.users[role]
    col = guards.RECORDED_BY[table]
    before = snapshot(cluster)
    with psycopg.connect(cluster.dsn(user), autocommit=True) as conn:
        with refused(f"{col} of a new row of {table} must be the database user {user}"):
            conn.execute(_copy_newest(cluster, table, **FORGE[table], **{col: "'W. Eigher'"}))
        # The same row in the user's own name is accepted (and rolled back here): the name,
        # and nothing else about the row, is what the database refused.
        with conn.transaction(force_rollback=True):
            conn.execute(_copy_newest(cluster, table, **FORGE[table], **{col: "current_user"}))
    assert snapshot(cluster) == before


def test_a_search_path_of_the_users_choosing_does_not_open_the_recorder_check(ledger):
    """Up to PostgreSQL 14 every user could create objects in schema public. A function there
    named like one the trigger calls, put first on the user's search path, must not be what
    the trigger runs."""
    cluster = ledger.cluster
    user = ledger.users["maintenance"]
    before = snapshot(cluster)
    with cluster.owner() as conn:
        conn.execute(f"GRANT CREATE ON SCHEMA public TO {user}")
    try:
        with psycopg.connect(cluster.dsn(user), autocommit=True) as conn:
            conn.execute("CREATE FUNCTION public.pg_has_role(name, oid, text) RETURNS boolean "
                         "LANGUAGE sql AS 'SELECT true'")
            conn.execute("CREATE FUNCTION public.pg_has_role(name, oid, name) RETURNS boolean "
                         "LANGUAGE sql AS 'SELECT true'")
            conn.execute("SET search_path = public, pg_catalog")
            with refused("actor of a new row of ledger_entries must be the database user"):
                conn.execute(_copy_newest(cluster, "ledger_entries", seq="seq + 1",
                                          actor="'W. Eigher'"))
    finally:
        with cluster.owner() as conn:
            conn.execute("DROP FUNCTION IF EXISTS public.pg_has_role(name, oid, text)")
            conn.execute("DROP FUNCTION IF EXISTS public.pg_has_role(name, oid, name)")
            conn.execute(f"REVOKE CREATE ON SCHEMA public FROM {user}")
    assert snapshot(cluster) == before


# --- 4: the owner is held by the guards too ----------------------------------------------------

def test_the_owner_cannot_update_delete_or_truncate(ledger):
    cluster = ledger.cluster
    before = snapshot(cluster)
    with cluster.owner() as conn:
        for t in TABLES:
            col = SOME_COLUMN[t]
            with refused(f"UPDATE on {t} is refused: the table is append-only"):
                conn.execute(f"UPDATE {t} SET {col} = {col}")
            with refused(f"DELETE on {t} is refused: the table is append-only"):
                conn.execute(f"DELETE FROM {t}")
            # CASCADE: without it a table others refer to is refused for that reason first.
            with refused("TRUNCATE on"):
                conn.execute(f"TRUNCATE {t} CASCADE")
    # Through the library's engine the same refusal is one of wbledger's errors.
    with pytest.raises(AccessRefusedError) as err:
        with ledger.owner.begin() as conn:
            conn.execute(text("DELETE FROM ledger_entries"))
    assert err.value.reason == ("wbledger: DELETE on ledger_entries is refused: the table is "
                                "append-only")
    assert snapshot(cluster) == before


# --- 3 again, through the command line: one line, exit 2 ---------------------------------------

def _wbledger(*args: str):
    return CliRunner().invoke(app, [str(a) for a in args], catch_exceptions=False)


def _role_cli_cases():
    install = ["install", "TA-1", "antenna", "--mass", "2 lb", "--arm", "30 in",
               "--reason", "role test", "--by", "Someone Else"]
    return [
        ("auditor", install, "permission denied for table vehicles"),
        ("loadmaster", install, "permission denied for table ledger_entries"),
        ("maintenance", ["type", "import", "TYPE_FILE"], "permission denied for table "
                                                          "vehicle_types"),
        ("weight_engineer", ["db", "roles", "--prefix", "PREFIX"],
         "permission denied to create role"),
    ]


@pytest.mark.parametrize(("role", "args", "reason"), _role_cli_cases())
def test_a_command_the_role_may_not_run_is_one_line_and_exit_2(ledger, tmp_path, role, args,
                                                               reason):
    type_file = tmp_path / "tt-f1.toml"
    type_file.write_text(TYPE_E.replace('name = "TT-E1"', 'name = "TT-F1"'), encoding="utf-8")
    prefix = f"t{uuid.uuid4().hex[:8]}"
    args = [str(type_file) if a == "TYPE_FILE" else prefix if a == "PREFIX" else a
            for a in args]
    user = ledger.users[role]
    before = snapshot(ledger.cluster)
    result = _wbledger("--db", ledger.cluster.url(user), *args)
    assert result.exit_code == 2, result.output
    assert result.stdout == ""
    assert result.stderr == (
        f"Error: the database refused this to user {user!r} ({reason}); each role of "
        "`wbledger db roles` may do only its own part: ask the ledger's owner for the role "
        "that may do this\n")
    assert snapshot(ledger.cluster) == before
    with ledger.cluster.owner() as conn:  # and no role came of it
        assert conn.execute("SELECT count(*) FROM pg_roles WHERE rolname LIKE %s",
                            [f"{prefix}%"]).fetchone()[0] == 0


# --- 5: the command ------------------------------------------------------------------------------

def _privileges(cluster: Cluster, prefix: str) -> dict:
    """{(role, table): sorted privileges} from the catalog, and the roles' attributes."""
    groups = role_names(prefix)
    with cluster.owner() as conn:
        out = {}
        for role, name in groups.items():
            for t in (*TABLES, "alembic_version"):
                out[role, t] = sorted(
                    p for p in ("SELECT", "INSERT", "UPDATE", "DELETE", "TRUNCATE",
                                "REFERENCES", "TRIGGER")
                    if conn.execute("SELECT has_table_privilege(%s, %s, %s)",
                                    [name, t, p]).fetchone()[0])
            out[role, "vehicles.id UPDATE"] = conn.execute(
                "SELECT has_column_privilege(%s, 'vehicles', 'id', 'UPDATE')",
                [name]).fetchone()[0]
            out[role, "login"] = conn.execute(
                "SELECT rolcanlogin FROM pg_roles WHERE rolname = %s", [name]).fetchone()[0]
            out[role, "owns"] = conn.execute(
                "SELECT count(*) FROM pg_class WHERE relowner = %s::regrole", [name]
            ).fetchone()[0]
    return out


def test_db_roles_twice_sets_exactly_the_grants_again(ledger):
    cluster = Cluster(ledger.cluster.server, ledger.cluster.dbname)
    try:
        url = cluster.server.url(cluster.dbname)
        first = _wbledger("--db", url, "db", "roles", "--prefix", cluster.prefix)
        assert first.exit_code == 0, first.output
        got = _privileges(cluster, cluster.prefix)
        for role in LOGINS:
            assert got[role, "login"] is False and got[role, "owns"] == 0
            assert got[role, "alembic_version"] == ["SELECT"]
            for t in TABLES:
                may = {"SELECT", "INSERT"} if t in MAY_INSERT[role] else {"SELECT"}
                assert got[role, t] == sorted(may), (role, t)
            assert got[role, "vehicles.id UPDATE"] is (role in LOCKS_VEHICLES)
        # A privilege someone added by hand is taken away again by the next run.
        auditor = role_names(cluster.prefix)["auditor"]
        with cluster.owner() as conn:
            conn.execute(f"GRANT INSERT, DELETE ON ledger_entries TO {auditor}")
        second = _wbledger("--db", url, "db", "roles", "--prefix", cluster.prefix)
        assert second.exit_code == 0, second.output
        assert second.stdout == first.stdout
        assert _privileges(cluster, cluster.prefix) == got
        assert f"{cluster.prefix}_loadmaster: read; add rows to loading_sheets\n" in first.stdout
    finally:
        cluster.drop()


def test_db_roles_dry_run_prints_the_statements_and_creates_nothing(ledger):
    prefix = f"t{uuid.uuid4().hex[:8]}"
    result = _wbledger("--db", ledger.cluster.server.url(ledger.cluster.dbname), "db", "roles",
                       "--prefix", prefix, "--dry-run")
    assert result.exit_code == 0, result.output
    lines = result.stdout.splitlines()
    assert all(line.endswith(";") for line in lines)
    assert sum("CREATE ROLE" in line for line in lines) == 4
    assert f"GRANT INSERT ON loading_sheets TO {prefix}_loadmaster;" in lines
    assert f"GRANT UPDATE (id) ON vehicles TO {prefix}_maintenance;" in lines
    assert f"GRANT INSERT ON ledger_entries TO {prefix}_loadmaster;" not in lines
    assert not any(f"TO {prefix}_auditor" in line and "GRANT INSERT" in line for line in lines)
    with ledger.cluster.owner() as conn:
        assert conn.execute("SELECT count(*) FROM pg_roles WHERE rolname LIKE %s",
                            [f"{prefix}%"]).fetchone()[0] == 0


def test_db_roles_on_sqlite_is_one_line_and_exit_2(tmp_path):
    url = f"sqlite:///{tmp_path / 'ledger.sqlite3'}"
    assert _wbledger("--db", url, "init").exit_code == 0
    before = (tmp_path / "ledger.sqlite3").read_bytes()
    result = _wbledger("--db", url, "db", "roles")
    assert result.exit_code == 2
    assert result.stdout == ""
    assert result.stderr == (
        f"Error: --db = '{url}': a PostgreSQL database; a SQLite file is a single-user ledger "
        "with no roles (protect the file itself)\n")
    assert (tmp_path / "ledger.sqlite3").read_bytes() == before
