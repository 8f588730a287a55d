"""Shared fixtures.

Databases
---------
``db_url``
    A fresh, empty database URL, parametrised over SQLite (a temporary file) and PostgreSQL (a new
    database on the temporary server below). Storage and CLI tests take it to run on both.
``engine``
    An engine on ``db_url`` whose schema was built **through the migrations** (never
    ``create_all``), disposed after the test.
``sqlite_url``
    A temporary SQLite file only, for tests that are about SQLite itself.

The PostgreSQL server
---------------------
``pg_server`` starts one PostgreSQL server per test session with ``initdb`` in a temporary
directory, listening on 127.0.0.1 on a free port, trust authentication, and stops it at the end
(cleanup always runs). PostgreSQL refuses to run as root, so as root it runs as the ``postgres``
user. Without server binaries the PostgreSQL cases skip, except under ``CI=true`` where that is a
failure. The server is shared: tests must create their own database (``db_url`` does).
"""

from __future__ import annotations

import glob
import os
import shutil
import socket
import subprocess
import tempfile
import time
import uuid
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parents[1]
DEMO_FLEET = REPO / "demo_fleet"


def _pg_bindir() -> Path | None:
    found = shutil.which("initdb")
    if found:
        return Path(found).parent
    candidates = sorted(glob.glob("/usr/lib/postgresql/*/bin/initdb"),
                        key=lambda p: int(p.split("/")[4]) if p.split("/")[4].isdigit() else 0)
    return Path(candidates[-1]).parent if candidates else None


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


class PgServer:
    def __init__(self, bindir: Path) -> None:
        self.bindir = bindir
        self.port = _free_port()
        self.root = Path(tempfile.mkdtemp(prefix="wbledger-pg-"))
        self.data = self.root / "data"
        self.as_root = os.geteuid() == 0
        self.proc: subprocess.Popen | None = None

    def _cmd(self, *args: str) -> list[str]:
        cmd = [str(a) for a in args]
        return ["runuser", "-u", "postgres", "--", *cmd] if self.as_root else cmd

    def start(self) -> None:
        if self.as_root:
            shutil.chown(self.root, "postgres", "postgres")
        os.chmod(self.root, 0o700)
        subprocess.run(
            self._cmd(self.bindir / "initdb", "-D", self.data, "-U", "wbledger", "-A", "trust",
                      "-E", "UTF8", "--no-sync"),
            check=True, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
        log = open(self.root / "server.log", "wb")  # noqa: SIM115 - closed in stop()
        self._log = log
        # fsync off: a test server in a temporary directory need not survive a power cut.
        self.proc = subprocess.Popen(
            self._cmd(self.bindir / "postgres", "-D", self.data, "-h", "127.0.0.1",
                      "-p", str(self.port), "-k", self.root, "-c", "fsync=off",
                      "-c", "synchronous_commit=off", "-c", "full_page_writes=off",
                      "-c", "max_connections=200"),
            stdout=log, stderr=subprocess.STDOUT)
        deadline = time.monotonic() + 60
        while time.monotonic() < deadline:
            if self.proc.poll() is not None:
                raise RuntimeError("PostgreSQL exited: " +
                                   (self.root / "server.log").read_text(errors="replace")[-2000:])
            try:
                with socket.create_connection(("127.0.0.1", self.port), timeout=0.5):
                    pass
                import psycopg

                with psycopg.connect(self.dsn("postgres"), connect_timeout=2):
                    return
            except Exception:  # noqa: BLE001 - not up yet
                time.sleep(0.2)
        raise RuntimeError("PostgreSQL did not start within 60 s")

    def dsn(self, dbname: str) -> str:
        return f"postgresql://wbledger@127.0.0.1:{self.port}/{dbname}"

    def url(self, dbname: str) -> str:
        return f"postgresql+psycopg://wbledger@127.0.0.1:{self.port}/{dbname}"

    def create_database(self) -> str:
        import psycopg

        name = "t_" + uuid.uuid4().hex[:12]
        with psycopg.connect(self.dsn("postgres"), autocommit=True) as conn:
            conn.execute(f'CREATE DATABASE "{name}"')
        return name

    def drop_database(self, name: str) -> None:
        import psycopg

        with psycopg.connect(self.dsn("postgres"), autocommit=True) as conn:
            conn.execute(f'DROP DATABASE IF EXISTS "{name}" WITH (FORCE)')

    def stop(self) -> None:
        if self.proc is not None and self.proc.poll() is None:
            self.proc.terminate()
            try:
                self.proc.wait(timeout=30)
            except subprocess.TimeoutExpired:
                self.proc.kill()
        if getattr(self, "_log", None):
            self._log.close()
        shutil.rmtree(self.root, ignore_errors=True)


@pytest.fixture(scope="session")
def pg_server():
    bindir = _pg_bindir()
    if bindir is None:
        reason = "no PostgreSQL server binaries (initdb) on this machine"
        if os.environ.get("CI") == "true":
            pytest.fail(f"{reason}; under CI=true the PostgreSQL tests must run")
        pytest.skip(reason)
    try:
        import psycopg  # noqa: F401
    except ImportError:
        if os.environ.get("CI") == "true":
            pytest.fail("psycopg is not installed; under CI=true the PostgreSQL tests must run")
        pytest.skip("psycopg is not installed")
    server = PgServer(bindir)
    try:
        server.start()
        yield server
    finally:
        server.stop()


@pytest.fixture
def sqlite_url(tmp_path) -> str:
    return f"sqlite:///{tmp_path / 'ledger.sqlite3'}"


@pytest.fixture(params=["sqlite", pytest.param("postgres", marks=pytest.mark.postgres)])
def db_url(request, tmp_path):
    """A fresh empty database on SQLite and on PostgreSQL."""
    if request.param == "sqlite":
        yield f"sqlite:///{tmp_path / 'ledger.sqlite3'}"
        return
    server = request.getfixturevalue("pg_server")
    name = server.create_database()
    try:
        yield server.url(name)
    finally:
        server.drop_database(name)


@pytest.fixture
def engine(db_url):
    """An engine on a fresh database whose schema was built through the migrations."""
    from ledger.testing import new_ledger

    eng = new_ledger(db_url)
    try:
        yield eng
    finally:
        eng.dispose()


@pytest.fixture
def cli(db_url, monkeypatch):
    """Run ``wbledger`` in-process against the fresh ``db_url``: ``cli("type", "list")``.

    Returns typer's ``Result`` (``exit_code``, ``stdout``, ``stderr``). ``WBLEDGER_DB`` is set
    so the commands never touch the user's own ledger.
    """
    from typer.testing import CliRunner

    from ledger.cli import app

    monkeypatch.setenv("WBLEDGER_DB", db_url)
    runner = CliRunner()

    def run(*args: str, input: str | None = None):
        return runner.invoke(app, [str(a) for a in args], input=input, catch_exceptions=False)

    run.db_url = db_url
    return run
