"""The demo's database (``ledger.services.demo``): an empty one the user named, or its own file.

Runs on SQLite and PostgreSQL; the vehicle type is the demo fleet's KV-P4 (invented).
"""

from __future__ import annotations

import stat

import pytest

from ledger.errors import ConflictError
from ledger.services.demo import DEMO_DB_NAME, demo_database
from ledger.store.catalog import add_vehicle, import_type
from ledger.store.db import session_scope
from ledger.typedata import load_type_file
from tests.conftest import DEMO_FLEET


def test_a_fresh_file_of_its_own_with_leftovers_removed(tmp_path, monkeypatch):
    monkeypatch.delenv("WBLEDGER_DB", raising=False)
    out = tmp_path / "demo"
    out.mkdir(mode=0o755)
    for name in (DEMO_DB_NAME, DEMO_DB_NAME + "-wal", DEMO_DB_NAME + "-shm"):
        (out / name).write_text("left over", encoding="utf-8")
    place = demo_database(None, out)
    assert place.url == f"sqlite:///{out / DEMO_DB_NAME}" and place.out == out
    assert list(out.iterdir()) == []
    assert stat.S_IMODE(out.stat().st_mode) == 0o755  # a folder the user made keeps its mode
    new = tmp_path / "new" / "demo"
    demo_database(None, new)
    assert stat.S_IMODE(new.stat().st_mode) == 0o700


def test_a_named_database_is_used_while_it_holds_no_vehicle(db_url, engine, tmp_path,
                                                             monkeypatch):
    monkeypatch.delenv("WBLEDGER_DB", raising=False)
    out = tmp_path / "demo"
    assert demo_database(db_url, out).url == db_url  # initialised, no vehicle
    assert out.is_dir() and not (out / DEMO_DB_NAME).exists()
    path = DEMO_FLEET / "kv-p4.toml"
    with session_scope(engine) as s:
        import_type(s, load_type_file(path), path.name, path.read_text(encoding="utf-8"))
        add_vehicle(s, "KVA-101", "KV-P4")
    monkeypatch.setenv("WBLEDGER_DB", db_url)
    with pytest.raises(ConflictError) as err:
        demo_database(None, out)  # $WBLEDGER_DB when --db is not given
    assert str(err.value) == (f"the demo needs an empty database, and {db_url} already holds "
                              "1 vehicle(s); unset WBLEDGER_DB or give --db a new database")


def test_the_command_line_refuses_a_database_with_vehicles(cli, tmp_path):
    path = DEMO_FLEET / "kv-p4.toml"
    for args in (("init",), ("type", "import", path), ("vehicle", "add", "KVA-101", "--type",
                                                       "KV-P4")):
        assert cli(*args).exit_code == 0
    r = cli("demo", "--out", tmp_path / "demo")
    assert (r.exit_code, r.stdout) == (2, "")
    assert r.stderr == (f"Error: the demo needs an empty database, and {cli.db_url} already "
                        "holds 1 vehicle(s); unset WBLEDGER_DB or give --db a new database\n")
