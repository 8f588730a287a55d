"""`wbledger init`, `type …` and `vehicle add` through the CLI, on SQLite and PostgreSQL."""

from __future__ import annotations

import json

import pytest

from tests.conftest import DEMO_FLEET

P4 = DEMO_FLEET / "kv-p4.toml"


def _init(cli):
    res = cli("init")
    assert res.exit_code == 0, res.output
    return res


def test_init_then_import_list_show(cli):
    res = _init(cli)
    assert "Schema empty -> 0003." in res.stdout
    res = cli("type", "import", str(P4))
    assert res.exit_code == 0, res.output
    assert res.stdout.strip() == f"{P4}: type KV-P4 imported as revision 1"
    # The same content again is recognised, not a new revision.
    res = cli("type", "import", str(P4))
    assert res.stdout.strip() == f"{P4}: type KV-P4 unchanged, already revision 1"
    data = json.loads(cli("type", "list", "--json").stdout)
    assert [(t["name"], t["revision"], t["kind"], t["vehicles"]) for t in data] == [
        ("KV-P4", 1, "airplane", 0)]
    doc = json.loads(cli("type", "show", "KV-P4", "--json").stdout)
    assert doc["revision"] == 1 and doc["spec"]["name"] == "KV-P4"
    # Explicit unit names in the JSON: SI keys, e.g. max_takeoff_kg (2315 lb, NIST SP 811).
    assert abs(doc["spec"]["limits"]["max_takeoff_kg"] - 2315 * 0.45359237) < 1e-9
    text = cli("type", "show", "KV-P4").stdout
    assert "max take-off 2315 lb" in text


def test_changed_type_file_makes_a_new_revision(cli, tmp_path):
    _init(cli)
    cli("type", "import", str(P4))
    changed = tmp_path / "p4-changed.toml"
    source = P4.read_text()
    assert "\nmax_takeoff = 2315\n" in source  # the demo type's maximum take-off mass, lb
    changed.write_text(source.replace("\nmax_takeoff = 2315\n", "\nmax_takeoff = 2300\n"))
    res = cli("type", "import", str(changed))
    assert res.exit_code == 0 and "revision 2" in res.stdout
    first = json.loads(cli("type", "show", "KV-P4", "--revision", "1", "--json").stdout)
    newest = json.loads(cli("type", "show", "KV-P4", "--json").stdout)
    assert newest["revision"] == 2
    assert newest["content_sha256"] != first["content_sha256"]
    limit = "max_takeoff_kg"
    assert newest["spec"]["limits"][limit] == pytest.approx(first["spec"]["limits"][limit]
                                                            - 15 * 0.45359237)
    comment = tmp_path / "p4-comment.toml"  # only a comment: same content, same revision
    comment.write_text(source + "\n# a comment changes the source, not the content\n")
    assert "unchanged" in cli("type", "import", str(comment)).stdout


def test_bad_type_file_writes_nothing(cli, tmp_path):
    _init(cli)
    bad = tmp_path / "bad.toml"
    bad.write_text(P4.read_text() + "\n[oops\n")
    res = cli("type", "import", str(P4), str(bad))
    assert res.exit_code == 2
    assert res.stderr.startswith(f"Error: {bad}")
    assert len(res.stderr.strip().splitlines()) == 1
    # The good file given first was not imported either: all files are checked before writing.
    assert json.loads(cli("type", "list", "--json").stdout) == []


def test_vehicle_add_errors(cli):
    _init(cli)
    res = cli("vehicle", "add", "KV-101", "--type", "NOPE")
    assert res.exit_code == 2
    assert res.stderr.strip() == ("Error: no vehicle type 'NOPE'. "
                                  "Import one with `wbledger type import FILE`")
    cli("type", "import", str(P4))
    assert cli("vehicle", "add", "KV-101", "--type", "KV-P4").exit_code == 0
    res = cli("vehicle", "add", "KV-101", "--type", "KV-P4")
    assert res.exit_code == 2
    assert res.stderr.strip() == ("Error: vehicle 'KV-101' already exists; "
                                  "see it with `wbledger vehicle show KV-101`")
    res = cli("vehicle", "add", "bad reg!", "--type", "KV-P4")
    assert res.exit_code == 2
    assert res.stderr.strip() == ("Error: registration = 'bad reg!': 1 to 40 letters, digits or "
                                  "'-' (single spaces between them allowed), starting with a "
                                  "letter or digit")


def test_commands_refuse_an_uninitialised_database(cli):
    res = cli("type", "list")
    assert res.exit_code == 4  # issue 13 item 8: the environment, not the input
    assert "has no wbledger schema; run `wbledger init` first" in res.stderr


def test_type_show_lists_the_axle_groups(cli, tmp_path):
    """issue 13 item 2: `type show` omitted `axle_group`."""
    from tests.loadsheet.test_axle_group_fixes import TANDEM

    _init(cli)
    path = tmp_path / "tandem.toml"
    path.write_text(TANDEM, encoding="utf-8")
    assert cli("type", "import", str(path)).exit_code == 0
    text = cli("type", "show", "TEST-TANDEM").stdout
    assert "axle_group tandem: axles rear 1, rear 2, load share 0.5/0.5, rating 11500 kg" in text


def test_a_registration_with_spaces_is_normalised_and_found_again(cli):
    """issue 13 item 9: road plates such as `NC 33-TR` were refused. Spaces at the ends are
    trimmed and inner runs become one space, when stored and when looked up; case is kept."""
    _init(cli)
    cli("type", "import", str(P4))
    res = cli("vehicle", "add", "  NC   33-TR ", "--type", "KV-P4")
    assert (res.exit_code, res.stdout.strip()) == (0, (
        "Added NC 33-TR (KV-P4); next, its first weighing: `wbledger weigh 'NC 33-TR'`."))
    for given in ("NC 33-TR", "NC  33-TR", " NC 33-TR"):
        shown = cli("vehicle", "show", given, "--json")
        assert shown.exit_code == 0, shown.stderr
        assert json.loads(shown.stdout)["registration"] == "NC 33-TR"
    again = cli("vehicle", "add", "nc 33-tr", "--type", "KV-P4")
    assert (again.exit_code, again.stderr) == (2, (
        "Error: vehicle 'NC 33-TR' exists already and differs from 'nc 33-tr' only in case; "
        "use 'NC 33-TR'\n"))
    listed = json.loads(cli("vehicle", "list", "--json").stdout)
    assert [v["registration"] for v in listed] == ["NC 33-TR"]
