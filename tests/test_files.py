"""Every file wbledger writes: private modes whatever the umask, atomic replacement, no links.

What is checked, and against what:

- Modes. A process's umask clears bits of the mode a new file or folder is created with
  (POSIX ``open(2)``/``umask(2)``), so 022 gives the usual 0644/0755 and 002 (a shared group
  set-up) 0664/0775. wbledger's files hold names, masses and routes: they are created 0600 and
  its folders 0700 under both umasks (common practice for private data, as ``ssh`` does with a
  key). Each mode test first shows that the umask is in force: a plain file made by the test
  itself gets the umask's mode. Files and folders that already exist keep their owner's mode.
- Atomic replacement. An output is written to a new file in the target's folder and renamed
  over the target (POSIX ``rename(2)`` replaces in one step), so a failure half-way leaves the
  previous file as it was and no temporary file behind.
- Links and special files. A target that is a symbolic link (to a file, a folder, or nothing),
  a folder or a named pipe is refused with one line, exit 2: nothing is written to the file the
  link points to, and nothing changes in the database.

The files are local whatever the database, so these tests run on SQLite only.
"""

from __future__ import annotations

import errno
import os
import re
import shutil
import sqlite3
import stat
from pathlib import Path

import pytest
from typer.testing import CliRunner

from ledger.cli import app
from tests.cli.test_bad_input import _seed, dump
from tests.conftest import DEMO_FLEET

PLAN = DEMO_FLEET / "plans" / "kva-101-local.toml"


def mode(path: Path) -> str:
    """The permission bits of ``path`` (not following a link), as ``0o600``."""
    return oct(stat.S_IMODE(path.lstat().st_mode))


@pytest.fixture(params=[0o022, 0o002], ids=["umask022", "umask002"])
def umask(request, tmp_path):
    """Run the test under this umask (restored after); proves it is in force first."""
    old = os.umask(request.param)
    try:
        control = tmp_path / "control.txt"
        control.write_text("made by the test, not by wbledger")
        assert mode(control) == oct(0o666 & ~request.param)
        control.unlink()
        yield request.param
    finally:
        os.umask(old)


def run(*args, env: dict | None = None):
    """``wbledger ARGS`` in-process: (exit code, stdout, stderr)."""
    res = CliRunner().invoke(app, [str(a) for a in args], env=env, catch_exceptions=False)
    return res.exit_code, res.stdout, res.stderr


@pytest.fixture(scope="module")
def _template(tmp_path_factory) -> Path:
    """A small ledger (two demo types, two vehicles weighed, a saved sheet), made once."""
    path = tmp_path_factory.mktemp("files-template") / "ledger.sqlite3"
    _seed(f"sqlite:///{path}")
    con = sqlite3.connect(path)  # fold the WAL into the file, so one file is the copy
    con.execute("PRAGMA wal_checkpoint(TRUNCATE)")
    con.close()
    return path


@pytest.fixture
def seeded(_template, tmp_path, monkeypatch) -> str:
    """A fresh copy of the small ledger; ``WBLEDGER_DB`` points at it."""
    target = tmp_path / "db" / "ledger.sqlite3"
    target.parent.mkdir()
    shutil.copyfile(_template, target)
    url = f"sqlite:///{target}"
    monkeypatch.setenv("WBLEDGER_DB", url)
    return url


# --- modes ----------------------------------------------------------------------------------

def test_demo_database_sheets_and_exports_are_private(umask, tmp_path, monkeypatch):
    """The demo's folder, database, PDFs (``sheet prepare --pdf``) and CSVs (``inertia --csv``),
    then on its database a sheet as SVG and the ledger exported as CSV and JSON: 0600 files in
    a 0700 folder, under umask 022 and 002."""
    monkeypatch.delenv("WBLEDGER_DB", raising=False)
    out = tmp_path / "demo"
    code, stdout, stderr = run("demo", "--out", out)
    assert code == 0, stderr
    assert "Prove that nobody rewrote the history." in stdout
    made = {p.name: mode(p) for p in out.iterdir() if p.name != "fleet"}
    # SQLite may leave its -wal and -shm files beside the database; if so they count too.
    assert set(made) - {"demo.sqlite3-wal", "demo.sqlite3-shm"} == {
        "demo.sqlite3", "kva-101-local.pdf", "kva-t75-delivery.pdf", "kva-t75-inertia.csv",
        "kva-d07-inertia.csv", "kva-101-ledger.csv", "checkpoint.json"}
    assert set(made.values()) == {"0o600"}, made
    assert mode(out) == "0o700"
    # The copy of the demo fleet the demo's commands name (issue 13 item 21): private too.
    fleet = {p.relative_to(out).as_posix(): mode(p) for p in (out / "fleet").rglob("*")}
    assert {"fleet/kv-p4.toml", "fleet/plans", "fleet/plans/kva-101-local.toml"} <= set(fleet)
    assert set(fleet.values()) == {"0o600", "0o700"}, fleet
    assert {fleet["fleet/plans"], mode(out / "fleet")} == {"0o700"}

    db = ["--db", f"sqlite:///{out / 'demo.sqlite3'}"]
    outputs = tmp_path / "outputs"
    outputs.mkdir()
    # An existing output with the umask's mode is replaced by a new, private file (not
    # rewritten in place, which would keep its mode).
    old_csv = outputs / "ledger.csv"
    old_csv.write_text("an older export\n")
    assert mode(old_csv) == oct(0o666 & ~umask)
    assert run(*db, "export", "KVA-101", "-o", old_csv)[0] == 0
    assert run(*db, "export", "KVA-101", "--format", "json", "-o", outputs / "ledger.json")[0] == 0
    code, _, stderr = run(*db, "sheet", "prepare", PLAN, "--svg", outputs / "sheet.svg")
    assert code == 0, stderr
    assert old_csv.read_text().startswith("seq,")
    assert (outputs / "ledger.json").read_text().startswith("{")
    assert (outputs / "sheet.svg").read_text().startswith("<?xml")
    assert {p.name: mode(p) for p in outputs.iterdir()} == {
        "ledger.csv": "0o600", "ledger.json": "0o600", "sheet.svg": "0o600"}
    # The folder was the user's: its mode is left alone.
    assert mode(outputs) == oct(0o777 & ~umask)


def test_a_new_database_and_its_wal_and_shm_files_are_private(umask, tmp_path):
    folder = tmp_path / "mine"
    folder.mkdir()
    path = folder / "new.sqlite3"
    url = f"sqlite:///{path}"
    code, _, stderr = run("--db", url, "init")
    assert code == 0, stderr
    assert mode(path) == "0o600"
    # SQLite gives its -wal and -shm files the database file's mode: see them while a writer
    # holds the database open.
    from sqlalchemy import text

    from ledger.store.db import make_engine

    eng = make_engine(url)
    try:
        with eng.begin() as conn:
            conn.execute(text("INSERT INTO vehicle_types (name, created_at) "
                              "VALUES ('T-1', '2026-01-01 00:00:00')"))
            wal, shm = path.with_name(path.name + "-wal"), path.with_name(path.name + "-shm")
            assert (mode(wal), mode(shm)) == ("0o600", "0o600")
    finally:
        eng.dispose()
    assert mode(folder) == oct(0o777 & ~umask)  # the user's folder: untouched


def test_the_default_database_folder_is_private(umask, tmp_path, monkeypatch):
    """With no --db and no WBLEDGER_DB, the file goes in the user data folder, made 0700 with
    any parent wbledger has to make; a parent that exists keeps its mode."""
    monkeypatch.delenv("WBLEDGER_DB", raising=False)
    data_home = tmp_path / "home" / "share"  # "home" exists, "share" does not
    (tmp_path / "home").mkdir()
    monkeypatch.setenv("XDG_DATA_HOME", str(data_home))
    from ledger.store.db import default_url

    expected = data_home / "wbledger" / "ledger.sqlite3"
    if default_url() != f"sqlite:///{expected}":
        pytest.skip("platformdirs does not follow XDG_DATA_HOME on this platform")
    code, _, stderr = run("init")
    assert code == 0, stderr
    assert (mode(data_home), mode(expected.parent), mode(expected)) == (
        "0o700", "0o700", "0o600")
    assert mode(tmp_path / "home") == oct(0o777 & ~umask)


def test_an_existing_database_and_folder_keep_their_modes(umask, tmp_path, monkeypatch):
    """wbledger never changes the mode of a file or folder it did not create."""
    monkeypatch.delenv("WBLEDGER_DB", raising=False)
    path = tmp_path / "shared.sqlite3"
    sqlite3.connect(path).close()  # an empty database file, made by the user
    os.chmod(path, 0o640)
    assert run("--db", f"sqlite:///{path}", "init")[0] == 0
    assert mode(path) == "0o640"
    out = tmp_path / "demo-out"  # a demo --out folder the user made
    out.mkdir()
    os.chmod(out, 0o750)
    from ledger.files import make_private_folder

    make_private_folder(out / "inner")
    assert (mode(out), mode(out / "inner")) == ("0o750", "0o700")


def test_the_backup_before_an_upgrade_is_private(umask, tmp_path):
    from ledger.store.db import make_engine, upgrade

    path = tmp_path / "old.sqlite3"
    eng = make_engine(f"sqlite:///{path}")
    upgrade(eng, "0001")  # a file written by an older wbledger
    eng.dispose()
    os.chmod(path, 0o644)  # as an older wbledger left it
    code, stdout, stderr = run("--db", f"sqlite:///{path}", "db", "upgrade")
    assert code == 0, stderr
    found = re.search(r"^Backup of the previous file: (.+)$", stdout, re.MULTILINE)
    assert found, stdout
    backup = Path(found.group(1))
    assert backup.parent == tmp_path and backup.name.startswith("old.sqlite3.")
    assert mode(backup) == "0o600"
    con = sqlite3.connect(backup)  # a whole database, as the file was before the upgrade
    assert con.execute("SELECT version_num FROM alembic_version").fetchone() == ("0001",)
    con.close()
    assert mode(path) == "0o644"  # the user's file keeps its mode
    assert not list(tmp_path.glob(".*.tmp"))


# --- links, folders and named pipes are refused ------------------------------------------------

COMMANDS = {
    "--pdf": ["sheet", "prepare", str(PLAN), "--save", "--pdf", "{target}"],
    "--svg": ["sheet", "prepare", str(PLAN), "--save", "--svg", "{target}"],
    "--output": ["export", "KVA-101", "-o", "{target}"],
    "--csv": ["inertia", "KVA-101", "--assume-z", "30 in", "--csv", "{target}"],
}
LINK = "a file name, not a symbolic link. wbledger does not write through links; name the file " \
       "itself"
TARGETS = {
    "link to a file": LINK,
    "dangling link": LINK,
    "link to a folder": LINK,
    "named pipe": "a regular file or a new file name, not a named pipe (FIFO)",
    "folder": "a file name, not a folder",
}


def _make_target(kind: str, folder: Path) -> tuple[Path, Path]:
    """The target of ``kind`` in ``folder``, and the file a link would lead to."""
    victim = folder / "precious.txt"
    victim.write_text("someone else's file\n")
    (folder / "a-folder").mkdir()
    target = folder / "target"
    if kind == "link to a file":
        target.symlink_to(victim)
    elif kind == "dangling link":
        target.symlink_to(folder / "nothing-here")
    elif kind == "link to a folder":
        target.symlink_to(folder / "a-folder")
    elif kind == "named pipe":
        os.mkfifo(target)
    else:
        target.mkdir()
    return target, victim


@pytest.mark.parametrize("kind", TARGETS)
@pytest.mark.parametrize("option", COMMANDS)
def test_a_link_folder_or_pipe_target_is_refused(seeded, tmp_path, option, kind):
    folder = tmp_path / "out"
    folder.mkdir()
    target, victim = _make_target(kind, folder)
    before_files = sorted(p.name for p in folder.rglob("*"))
    before = dump(seeded)
    argv = [a.format(target=target) for a in COMMANDS[option]]
    assert run(*argv) == (2, "", f"Error: {option} = '{target}': {TARGETS[kind]}\n")
    assert victim.read_text() == "someone else's file\n"
    assert sorted(p.name for p in folder.rglob("*")) == before_files
    assert not (folder / "nothing-here").exists()
    assert dump(seeded) == before


# --- atomic replacement -------------------------------------------------------------------------

class _DiskFullHalfway:
    """Wraps the temporary file: the first write of any bytes puts half of them on disk, then
    fails as a full disk does (ENOSPC)."""

    seen: list[tuple[Path, int]] = []

    def __init__(self, fh) -> None:
        self._fh = fh

    def write(self, data) -> int:
        if not len(data):  # matplotlib probes with b"" whether a file takes bytes
            return 0
        self._fh.write(bytes(data)[: max(1, len(data) // 2)])
        self._fh.flush()
        self.seen.append((Path(self._fh.name), os.path.getsize(self._fh.name)))
        raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC))

    def __getattr__(self, name):
        return getattr(self._fh, name)

    def __enter__(self):
        return self

    def __exit__(self, *exc) -> None:
        self._fh.close()


@pytest.mark.parametrize("option", COMMANDS)
def test_a_failure_halfway_leaves_the_previous_file_and_no_temporary_file(seeded, tmp_path,
                                                                         monkeypatch, option):
    import builtins

    import ledger.files

    folder = tmp_path / "out"
    folder.mkdir()
    target = folder / "previous.out"
    target.write_bytes(b"the previous version\n")
    real_open = builtins.open
    _DiskFullHalfway.seen = []
    monkeypatch.setattr(ledger.files, "open",
                        lambda *a, **k: _DiskFullHalfway(real_open(*a, **k)), raising=False)
    argv = [a.format(target=target) for a in COMMANDS[option] if a != "--save"]
    before = dump(seeded)
    code, _, stderr = run(*argv)
    assert (code, stderr) == (  # a full disk is the environment: exit 4 (issue 13 item 8)
        4, f"Error: {option} = '{target}': a file that can be written "
           f"({os.strerror(errno.ENOSPC)})\n")
    # Half of something was written, to a temporary file beside the target, now gone.
    assert len(_DiskFullHalfway.seen) == 1
    tmp, size = _DiskFullHalfway.seen[0]
    assert tmp.parent == folder and tmp.name != target.name and size > 0
    assert not tmp.exists()
    assert target.read_bytes() == b"the previous version\n"
    assert sorted(p.name for p in folder.iterdir()) == ["previous.out"]
    assert dump(seeded) == before


def test_an_interrupted_write_leaves_the_previous_file(tmp_path):
    """A kill (here KeyboardInterrupt, which is not an OSError) mid-way: the old file stays."""
    from ledger.files import replacing, write_output

    target = tmp_path / "sheet.pdf"
    write_output(target, b"%PDF the signed one", "--pdf")
    with pytest.raises(KeyboardInterrupt):
        with replacing(target, "--pdf") as fh:
            fh.write(b"%PDF half of the new")
            fh.flush()
            assert len(list(tmp_path.iterdir())) == 2  # the target and the temporary file
            raise KeyboardInterrupt
    assert target.read_bytes() == b"%PDF the signed one"
    assert [p.name for p in tmp_path.iterdir()] == ["sheet.pdf"]
    # Written whole, the new version replaces the old one.
    write_output(target, "%PDF the new one", "--pdf")
    assert target.read_text() == "%PDF the new one"
    assert [p.name for p in tmp_path.iterdir()] == ["sheet.pdf"]
