"""``type import --dry-run`` and the summary of a real import (issue 13 item 14).

A type file that changes a revision moves every vehicle of the type onto it; before the fix it
did so without a word. Now the dry run shows each changed field (old → new, in the type's
display units), the stations, tanks and envelope points added or removed, and the vehicles that
would move, and writes nothing; a real import prints the same. The type is the invented test
type TT-A1 (tests/store/ledger_support.py).
"""

from __future__ import annotations

import json

import pytest

from ledger.typedata import parse_type_text
from ledger.typedata.type_diff import type_changes
from tests.cli.test_bad_input import dump
from tests.store.ledger_support import TYPE_A, write_types

# Revision 2 of TT-A1: a higher take-off mass, the envelope's top moved with it and its aft
# top corner moved aft, a larger tank, a baggage station added, the cabin station removed.
TYPE_A2 = (TYPE_A.replace("max_takeoff = 12500", "max_takeoff = 12600")
           .replace("[[70.0, 5000], [70.0, 12500], [95.0, 12500], [95.0, 5000]]",
                    "[[70.0, 5000], [70.0, 12600], [96.0, 12600], [95.0, 5000]]")
           .replace("capacity = 100.0", "capacity = 110.0")
           .replace('name = "cabin"\nkind = "cargo"\nx = 120.0\nmax_mass = 800',
                    'name = "baggage"\nkind = "cargo"\nx = 150.0\nmax_mass = 100'))

EXPECTED_CHANGES = [
    "  limits.max_takeoff: 12500.0 lb \u2192 12600.0 lb",
    "  stations: removed cabin",
    "  stations: added baggage",
    "  tanks[main].capacity: 100.0 USgal \u2192 110.0 USgal",
    "  envelopes[normal].points: removed (70.00 in, 12500.0 lb)",
    "  envelopes[normal].points: removed (95.00 in, 12500.0 lb)",
    "  envelopes[normal].points: added (70.00 in, 12600.0 lb)",
    "  envelopes[normal].points: added (96.00 in, 12600.0 lb)",
]


@pytest.fixture
def fleet(cli, tmp_path):
    assert cli("init").exit_code == 0
    for path in write_types(tmp_path):
        assert cli("type", "import", str(path)).exit_code == 0
    for reg, tname in (("KV-101", "TT-A1"), ("KV-102", "TT-A1"), ("KH-1", "TT-H1")):
        assert cli("vehicle", "add", reg, "--type", tname).exit_code == 0
    new = tmp_path / "tt-a1-rev2.toml"
    new.write_text(TYPE_A2, encoding="utf-8")
    return cli, new


def test_dry_run_shows_the_changes_and_the_vehicles_and_writes_nothing(fleet):
    """issue 13 item 14: before the fix `--dry-run` did not exist (exit 2, usage error)."""
    cli, new = fleet
    before = dump(cli.db_url)
    r = cli("type", "import", "--dry-run", str(new))
    assert r.exit_code == 0, r.stderr
    lines = r.stdout.splitlines()
    assert lines[0] == (f"{new}: type TT-A1 would be imported as revision 2; changed from "
                        "revision 1:")
    assert lines[1:-2] == EXPECTED_CHANGES
    assert lines[-2] == "  Vehicles that would move onto revision 2 (2): KV-101, KV-102"
    assert lines[-1] == "Dry run: nothing was written."
    assert dump(cli.db_url) == before  # every row of every table, unchanged
    shown = json.loads(cli("type", "show", "TT-A1", "--json").stdout)
    assert shown["revision"] == 1


def test_dry_run_json_names_each_field_in_si(fleet):
    """issue 13 item 14: the JSON of the dry run (SI values, unit in the field name)."""
    cli, new = fleet
    before = dump(cli.db_url)
    doc = json.loads(cli("type", "import", "--dry-run", "--json", str(new)).stdout)
    assert dump(cli.db_url) == before
    (row,) = doc
    assert (row["dry_run"], row["revision"], row["previous_revision"], row["new_revision"]) == (
        True, 2, 1, True)
    assert row["vehicles_moved"] == ["KV-101", "KV-102"]
    takeoff = next(c for c in row["changes"] if c["field"] == "limits.max_takeoff_kg")
    # 12,500 lb and 12,600 lb in kg (1 lb = 0.45359237 kg exactly, NIST SP 811 appendix B)
    assert (takeoff["old"], takeoff["new"]) == pytest.approx((12500 * 0.45359237,
                                                              12600 * 0.45359237))
    assert takeoff["dimension"] == "mass"


def test_a_real_import_prints_the_same_summary(fleet):
    """issue 13 item 14: the import that moves the vehicles says so."""
    cli, new = fleet
    r = cli("type", "import", str(new))
    assert r.exit_code == 0, r.stderr
    lines = r.stdout.splitlines()
    assert lines[0] == f"{new}: type TT-A1 imported as revision 2; changed from revision 1:"
    assert lines[1:-1] == EXPECTED_CHANGES
    assert lines[-1] == "  Vehicles that moved onto revision 2 (2): KV-101, KV-102"
    assert json.loads(cli("type", "show", "TT-A1", "--json").stdout)["revision"] == 2
    # The same file again, or the old one: no new revision, no vehicle moves.
    assert cli("type", "import", "--dry-run", str(new)).stdout.splitlines()[0] == (
        f"{new}: type TT-A1 unchanged, already revision 2")


def test_an_older_revision_again_says_the_vehicles_stay_on_the_newest(fleet, tmp_path):
    """issue 13 item 14: re-importing revision 1's file makes nothing and moves nobody."""
    cli, new = fleet
    assert cli("type", "import", str(new)).exit_code == 0
    old = tmp_path / "tt-a1.toml"
    r = cli("type", "import", "--dry-run", str(old))
    assert r.stdout.splitlines() == [
        f"{old}: type TT-A1 unchanged, already revision 1 (its vehicles stay on revision 2, "
        "the newest)", "Dry run: nothing was written."]


def test_a_new_type_in_a_dry_run(cli, tmp_path):
    assert cli("init").exit_code == 0
    path = write_types(tmp_path)[0]
    before = dump(cli.db_url)
    r = cli("type", "import", "--dry-run", str(path))
    assert r.stdout.splitlines() == [
        f"{path}: type TT-A1 would be imported as revision 1 (a new type)",
        "Dry run: nothing was written."]
    assert dump(cli.db_url) == before


def test_type_changes_match_parts_by_name_and_ignore_layout():
    """issue 13 item 14: a file that only adds a comment or writes 12600 as 12600.0 has no changes;
    parts are matched by name, not by position."""
    a = parse_type_text(TYPE_A, source="a").to_dict()
    relaid_text = "# a comment\n" + TYPE_A.replace("max_ramp = 12600", "max_ramp = 12600.0")
    relaid = parse_type_text(relaid_text, source="b").to_dict()
    assert type_changes(a, relaid) == []
    reordered = TYPE_A.replace('[[station]]\nname = "pilot"', '[[station]]\nname = "pilotX"')
    changes = type_changes(a, parse_type_text(reordered, source="c").to_dict())
    assert [(c.path, c.change, c.old, c.new) for c in changes] == [
        ("stations", "removed", "pilot", None), ("stations", "added", None, "pilotX")]
