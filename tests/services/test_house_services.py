"""The services of the type, database and integrity commands, called as a library would."""

from __future__ import annotations

import pytest

from ledger.cli.demo import demo_fleet_dir
from ledger.errors import InputError, SchemaError
from ledger.services import database, integrity, types
from ledger.store.db import HEAD_REVISION


def test_database_status_init_and_upgrade(db_url):
    engine = database.open_database(db_url, check=False)
    try:
        before = database.database_status(engine)
        assert (before.schema_revision, before.up_to_date) == (None, False)
        with pytest.raises(SchemaError, match="run `wbledger init` first"):
            database.check_database(engine)
        made = database.init_database(engine)
        assert (made.before, made.after, made.changed) == (None, HEAD_REVISION, True)
        again = database.upgrade_database(engine)
        assert (again.before, again.after, again.changed, again.backup) == (
            HEAD_REVISION, HEAD_REVISION, False, None)
        after = database.database_status(engine).to_dict()
        assert after["schema_revision"] == after["required_revision"] == HEAD_REVISION
        assert after["up_to_date"] is True
    finally:
        engine.dispose()


def test_roles_sql_needs_no_database():
    sql = database.roles_sql("fleet")
    assert any("CREATE ROLE fleet_loadmaster NOLOGIN" in s for s in sql)


def test_import_list_and_show_types(engine):
    files = types.read_type_files([demo_fleet_dir() / "kv-p4.toml"])
    (first,) = types.import_types(engine, files)
    assert (first.name, first.revision, first.new_revision) == ("KV-P4", 1, True)
    (again,) = types.import_types(engine, files)
    assert (again.revision, again.new_revision) == (1, False)
    assert again.to_dict()["content_sha256"] == first.content_sha256
    assert [(t["name"], t["revision"], t["vehicles"]) for t in types.list_types(engine)] == [
        ("KV-P4", 1, 0)]
    shown = types.show_type(engine, "KV-P4")
    assert (shown.name, shown.revision, shown.content_sha256) == ("KV-P4", 1,
                                                                 first.content_sha256)
    assert shown.to_dict()["spec"] == shown.vehicle_type.to_dict()


@pytest.mark.parametrize("kwargs,field", [
    ({"public_key": "k.pub"}, "--public-key"),
    ({"exact": True}, "--exact"),
    ({"expect": ["abc"]}, "--expect"),
])
def test_verify_request_refuses_options_before_any_database_work(kwargs, field):
    with pytest.raises(InputError) as err:
        integrity.verify_request(**kwargs)
    assert err.value.field == field


def test_checkpoint_then_verify_against_it(engine, tmp_path):
    types.import_types(engine, types.read_type_files([demo_fleet_dir() / "kv-p4.toml"]))
    written = integrity.write_checkpoint(engine, tmp_path / "cp.json")
    assert (written.types, written.vehicles, written.signed) == (1, 0, False)
    request = integrity.verify_request(against=tmp_path / "cp.json", exact=True)
    result = integrity.verify(engine, request)
    assert result.ok and result.failure is None
    assert result.document["checkpoint"]["problems"] == []
