"""The environment, not the input, stops a command: one line, exit code 4, nothing written
(issue 13 items 7, 11 and 12).

Each case was a driver's traceback before: a read-only database on a write command, a lock
held longer than the lock timeout (SQLite's busy timeout, PostgreSQL's ``lock_timeout``), a
PostgreSQL backend terminated in the middle of a command, two processes importing revisions of
one type at once (PostgreSQL's unique violation). A wait for a lock says so on stderr after
about a second. Library use must not leave a server backend open per engine.

The ledger is the invented test type TT-A1 of ``tests/store/ledger_support.py``; no figure is
checked here, only behaviour (common practice for CLI error tests).
"""

from __future__ import annotations

import contextlib
import gc
import os
import subprocess
import sys
import threading
import time
from pathlib import Path

import pytest
from sqlalchemy import text

from ledger.errors import ExitCode
from tests.store.ledger_support import READINGS_A, TYPE_A, snapshot, write_types

REPO = Path(__file__).resolve().parents[2]
REG = "KV-101"
READINGS = [a for point, mass in READINGS_A.items() for a in ("--reading", f"{point}={mass}")]
INSTALL = ["install", REG, "lamp", "--mass", "2 lb", "--arm", "80 in", "--reason", "fit"]
NOTICE = ("waiting for the database lock held by another process (at most 1.5 s; "
          "$WBLEDGER_LOCK_TIMEOUT sets it)…")


@pytest.fixture
def ledger(cli, tmp_path, monkeypatch):
    """A ledger with the test types, one vehicle weighed; ``cli`` runs commands on it."""
    paths = write_types(tmp_path)
    for args in (["init"], ["type", "import", *map(str, paths)],
                 ["vehicle", "add", REG, "--type", "TT-A1"],
                 ["weigh", REG, *READINGS, "--date", "2025-01-10", "--reason", "qa"]):
        res = cli(*args)
        assert res.exit_code == 0, (args, res.stderr)
    monkeypatch.setenv("WBLEDGER_LOCK_TIMEOUT", "1.5")
    return cli


def _state(url: str) -> tuple:
    from ledger.store.db import make_engine

    eng = make_engine(url)
    try:
        return snapshot(eng)
    finally:
        eng.dispose()


def _pg_conn(url: str):
    import psycopg

    return psycopg.connect(url.replace("postgresql+psycopg://", "postgresql://"))


@contextlib.contextmanager
def _lock_held(url: str):
    """Hold the lock a write needs: SQLite's write lock, or the vehicle's row on PostgreSQL."""
    if url.startswith("sqlite"):
        import sqlite3

        con = sqlite3.connect(url.removeprefix("sqlite:///"), isolation_level=None,
                              check_same_thread=False)
        con.execute("BEGIN IMMEDIATE")
    else:
        con = _pg_conn(url)
        con.execute("SELECT id FROM vehicles WHERE registration = %s FOR UPDATE", (REG,))
    try:
        yield con
    finally:
        con.rollback()
        con.close()


def test_a_lock_held_past_the_timeout_is_one_line_exit_4(ledger):
    """Issue 13 item 7: was "database is locked" (SQLite) or a LockNotAvailable traceback
    (PostgreSQL, which had no lock timeout at all and waited for ever)."""
    before = _state(ledger.db_url)
    with _lock_held(ledger.db_url):
        start = time.monotonic()
        res = ledger(*INSTALL)
        waited = time.monotonic() - start
    where = ledger.db_url
    assert (res.exit_code, res.stdout) == (ExitCode.ENVIRONMENT, "")
    assert res.stderr.splitlines() == [
        NOTICE,
        f"Error: the database {where} stayed locked by another process for more than 1.5 s; "
        "nothing was changed. Run the command again when the other one has finished, or wait "
        "longer with WBLEDGER_LOCK_TIMEOUT=SECONDS"]
    assert 1.4 < waited < 10
    assert _state(ledger.db_url) == before


def test_a_lock_released_in_time_is_waited_for_and_said(ledger, monkeypatch):
    """Issue 13 item 7: a wait of more than about a second says so, then the command runs."""
    monkeypatch.setenv("WBLEDGER_LOCK_TIMEOUT", "20")
    with _lock_held(ledger.db_url) as con:
        release = threading.Timer(2.0, con.rollback)
        release.start()
        res = ledger(*INSTALL)
        release.join()
    assert res.exit_code == 0, res.stderr
    assert res.stderr == NOTICE.replace("1.5 s", "20 s") + "\n"
    assert "Recorded entry 2 of KV-101: install lamp" in res.stdout


def test_no_notice_without_a_wait(ledger):
    res = ledger(*INSTALL)
    assert (res.exit_code, res.stderr) == (0, "")


def test_a_lock_timeout_that_is_not_a_number_is_bad_input(ledger, monkeypatch):
    monkeypatch.setenv("WBLEDGER_LOCK_TIMEOUT", "soon")
    res = ledger("vehicle", "list")
    assert (res.exit_code, res.stdout, res.stderr) == (
        2, "", "Error: $WBLEDGER_LOCK_TIMEOUT = 'soon': a number of seconds greater than 0 and "
               "at most 86400\n")


def _read_only(url: str) -> str:
    """The same database, refusing writes: SQLite opened read-only (as a file the user may not
    write: tests run as root, for whom file modes do not count), PostgreSQL with read-only
    transactions by default."""
    if url.startswith("sqlite"):
        return f"sqlite:///file:{url.removeprefix('sqlite:///')}?mode=ro&uri=true"
    con = _pg_conn(url)
    con.autocommit = True
    name = url.rsplit("/", 1)[1]
    con.execute(f'ALTER DATABASE "{name}" SET default_transaction_read_only = on')
    con.close()
    return url


WRITES = [INSTALL, ["vehicle", "add", "KV-102", "--type", "TT-A1"],
          ["weigh", REG, *READINGS, "--date", "2025-01-11", "--reason", "again"],
          ["type", "import", "{tmp}/tt-a1-rev2.toml"]]


def test_every_write_to_a_read_only_database_is_one_line_exit_4(ledger, tmp_path):
    """Issue 13 item 7: was "attempt to write a readonly database" (SQLite) and a
    ReadOnlySqlTransaction traceback (PostgreSQL)."""
    (tmp_path / "tt-a1-rev2.toml").write_text(TYPE_A.replace("Test twin", "Test twin, rev 2"))
    before = _state(ledger.db_url)
    url = _read_only(ledger.db_url)
    shown = url.replace("%3A", ":")
    for args in WRITES:
        res = ledger("--db", url, *[a.format(tmp=tmp_path) for a in args])
        assert (res.exit_code, res.stdout) == (ExitCode.ENVIRONMENT, ""), (args, res.stderr)
        assert res.stderr.startswith(f"Error: the database {shown} is read-only ("), args
        assert res.stderr.endswith("); nothing was changed. Give your user write access to the "
                                   "file and its folder (or use a server that accepts writes), "
                                   "then run the command again\n"), args
        assert res.stderr.count("\n") == 1
    res = ledger("--db", url, "vehicle", "list")  # reading still works
    assert res.exit_code == 0, res.stderr
    assert _state(ledger.db_url) == before


@pytest.mark.postgres
def test_a_backend_terminated_mid_command_is_one_line_exit_4(ledger, monkeypatch):
    """Issue 13 item 7: pg_terminate_backend on the command's backend while it waits for a
    row lock was an AdminShutdown / OperationalError traceback."""
    if not ledger.db_url.startswith("postgresql"):
        pytest.skip("a server backend is PostgreSQL's")
    monkeypatch.setenv("WBLEDGER_LOCK_TIMEOUT", "60")
    name = ledger.db_url.rsplit("/", 1)[1]
    killed = []

    def terminate() -> None:
        with _pg_conn(ledger.db_url) as con:
            con.autocommit = True
            for _ in range(300):
                rows = con.execute("SELECT pid FROM pg_stat_activity WHERE datname = %s AND "
                                   "wait_event_type = 'Lock'", (name,)).fetchall()
                if rows:
                    killed.extend(con.execute("SELECT pg_terminate_backend(%s)", (pid,))
                                  .fetchone()[0] for (pid,) in rows)
                    return
                time.sleep(0.1)

    before = _state(ledger.db_url)
    with _lock_held(ledger.db_url):
        killer = threading.Thread(target=terminate)
        killer.start()
        res = ledger(*INSTALL)
        killer.join()
    assert killed == [True]
    assert (res.exit_code, res.stdout) == (ExitCode.ENVIRONMENT, "")
    lines = res.stderr.splitlines()
    assert lines[-1] == (
        f"Error: the database {ledger.db_url} could not complete the command (terminating "
        "connection due to administrator command); nothing was changed. Run the command again "
        "once the database is available"), res.stderr
    assert lines[:-1] in ([], [NOTICE.replace("1.5 s", "60 s")])
    assert _state(ledger.db_url) == before


def _wbledger(url: str, *args: str) -> subprocess.Popen:
    env = {**os.environ, "PYTHONPATH": str(REPO), "WBLEDGER_DB": url}
    return subprocess.Popen([sys.executable, "-m", "ledger", *args], env=env, text=True,
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE)


@pytest.mark.postgres
def test_two_imports_of_one_type_at_once_give_one_line_exit_4(ledger, tmp_path):
    """Issue 13 item 7: two processes import new revisions of TT-A1 at the same moment; both
    read revision 1 as the newest, both insert revision 2. The table is held locked until
    both wait to insert, so that the race happens every time. Was a UniqueViolation traceback;
    now one import is recorded and the other says what happened, exit 4."""
    if not ledger.db_url.startswith("postgresql"):
        pytest.skip("SQLite serialises writers with BEGIN IMMEDIATE: no race to lose")
    files = []
    for n in (2, 3):
        files.append(tmp_path / f"tt-a1-rev{n}.toml")
        files[-1].write_text(TYPE_A.replace("Test twin", f"Test twin, edit {n}"))
    name = ledger.db_url.rsplit("/", 1)[1]
    with _pg_conn(ledger.db_url) as holder:
        holder.execute("LOCK TABLE type_revisions IN EXCLUSIVE MODE")
        procs = [_wbledger(ledger.db_url, "type", "import", str(f)) for f in files]
        with _pg_conn(ledger.db_url) as watch:
            watch.autocommit = True
            for _ in range(600):
                waiting = watch.execute("SELECT count(*) FROM pg_stat_activity WHERE datname = "
                                        "%s AND wait_event_type = 'Lock'", (name,)).fetchone()[0]
                if waiting == 2 or any(p.poll() is not None for p in procs):
                    break
                time.sleep(0.1)
        holder.commit()
    outcomes = sorted((p.wait(timeout=120), *p.communicate()) for p in procs)
    (ok, ok_out, ok_err), (lost, lost_out, lost_err) = outcomes
    assert (ok, ok_err) == (0, ""), ok_err
    assert "revision 2" in ok_out
    assert (lost, lost_out) == (ExitCode.ENVIRONMENT, ""), lost_err
    assert lost_err.startswith(f"Error: another process wrote to the database {ledger.db_url} "
                               "at the same moment (duplicate key value violates unique "
                               "constraint "), lost_err
    assert lost_err.endswith("); nothing was changed by this command. Run it again: it will "
                             "see what the other one recorded\n")
    listed = ledger("type", "show", "TT-A1", "--json")
    assert listed.exit_code == 0 and '"revision": 2' in listed.stdout


@pytest.mark.postgres
def test_engines_a_library_drops_leave_no_backend_open(ledger):
    """Issue 13 item 12: ten times ``make_engine`` + ``session_scope`` left ten backends open
    (the session factory cache kept each engine, and so its pool, alive)."""
    if not ledger.db_url.startswith("postgresql"):
        pytest.skip("backends are PostgreSQL's")
    from ledger.store.db import make_engine, session_scope

    name = ledger.db_url.rsplit("/", 1)[1]

    def backends() -> int:
        with _pg_conn(ledger.db_url) as con:
            return con.execute("SELECT count(*) FROM pg_stat_activity WHERE datname = %s AND "
                               "pid <> pg_backend_pid()", (name,)).fetchone()[0]

    gc.collect()
    before = backends()
    for _ in range(10):
        eng = make_engine(ledger.db_url)
        with session_scope(eng) as s:
            assert s.execute(text("SELECT 1")).scalar() == 1
    del eng, s
    gc.collect()
    assert backends() == before
