"""``verify``, ``checkpoint`` and ``checkpoint-key`` through the command line, and the hashes a
sheet prints, on SQLite and PostgreSQL. The type and plan are test fixtures (no real aircraft).
"""

from __future__ import annotations

import json
import shutil
import subprocess

import pytest
from sqlalchemy import text

from ledger.store import guards
from ledger.store.db import make_engine
from tests.cli.test_sheets import ready  # noqa: F401 - the fixture: TS-101 weighed, plans


def _ok(r):
    assert r.exit_code == 0, (r.stdout, r.stderr)
    return r.stdout


def _sql(cli, *statements, drop=()):
    eng = make_engine(cli.db_url)
    try:
        with eng.begin() as conn:
            guards.drop(conn, list(drop))
            for sql in statements:
                conn.execute(text(sql))
    finally:
        eng.dispose()


def test_a_sheet_prints_the_hashes_that_anchor_it(ready):  # noqa: F811
    cli, d = ready
    draft = _ok(cli("sheet", d / "ok.toml")).splitlines()
    doc = json.loads(_ok(cli("sheet", d / "ok.toml", "--save", "--json", "--by", "R. Ortega",
                             "--pdf", d / "s.pdf")))
    head = doc["empty_weight"]["entry_hash"]
    sheet_hash = doc["sheet"]["sheet_hash"]
    assert len(head) == len(sheet_hash) == len(doc["vehicle"]["type_sha256"]) == 64
    type_hash = json.loads(_ok(cli("type", "show", "TS-1", "--json")))["content_sha256"]
    assert doc["vehicle"]["type_sha256"] == type_hash  # what `type import` printed
    assert draft[-3:] == [f"Type data   {type_hash}", f"Ledger head {head}",
                          "Sheet hash  none: not saved (a draft)"]
    shown = _ok(cli("sheet", "show", str(doc["sheet"]["id"]))).splitlines()
    assert shown[-1] == f"Sheet hash  {sheet_hash}"
    # the printed hashes are what verify knows
    out = _ok(cli("verify", "TS-101", "--expect", head, "--expect", sheet_hash,
                  "--expect", type_hash))
    for h in (head, sheet_hash, type_hash):  # every hash the sheet prints
        assert f"expected {h}: found" in out
    if shutil.which("pdftotext"):
        pdf = subprocess.run(["pdftotext", d / "s.pdf", "-"], capture_output=True, text=True,
                             check=True).stdout
        assert f"ledger head {head}" in pdf and f"sheet hash {sheet_hash}" in pdf
        assert f"type data {type_hash}" in pdf


def test_checkpoint_signed_and_checked(ready, tmp_path):  # noqa: F811
    cli, d = ready
    _ok(cli("sheet", d / "ok.toml", "--save", "--by", "R. Ortega"))
    out = _ok(cli("checkpoint-key", tmp_path / "key"))
    assert out.startswith(f"Wrote the private key {tmp_path / 'key'} ")
    assert (tmp_path / "key").stat().st_mode & 0o777 == 0o600
    r = cli("checkpoint-key", tmp_path / "key")
    assert (r.exit_code, r.stderr) == (2, f"Error: KEYFILE = '{tmp_path / 'key'}': a new file; "
                                          "it exists already and a key is never overwritten\n")
    out = _ok(cli("checkpoint", tmp_path / "cp.json", "--sign", tmp_path / "key"))
    # issue 13 item 21: counts agree with their nouns, and the lines stay short
    assert out.splitlines()[:2] == [f"Wrote checkpoint {tmp_path / 'cp.json'}:",
                                    "  1 type, 1 vehicle, 0 configurations, signed."]
    assert (tmp_path / "cp.json").stat().st_mode & 0o777 == 0o600
    cp = json.loads((tmp_path / "cp.json").read_text())
    assert [(v["registration"], v["entries"], v["sheets"]) for v in cp["vehicles"]] == [
        ("TS-101", 1, 1)]
    pub = tmp_path / "key.pub"
    out = _ok(cli("verify", "--against", tmp_path / "cp.json", "--public-key", pub))
    assert "matches; signature: checked" in " ".join(out.split())

    # An entry added since is listed; --exact fails on it.
    _ok(cli("install", "TS-101", "lamp", "--mass", "2 lb", "--arm", "80 in", "--reason", "fit",
            "--by", "tester"))
    out = " ".join(_ok(cli("verify", "--against", tmp_path / "cp.json")).split())
    assert "added since: TS-101: 1 entry" in out
    r = cli("verify", "--against", tmp_path / "cp.json", "--exact")
    assert r.exit_code == 3  # issue 13 item 8: data that does not verify
    assert r.stderr == (f"Error: the database does not match the checkpoint "
                        f"{tmp_path / 'cp.json'}: added since the checkpoint: TS-101: 1 entry\n")

    # A checkpoint edited by hand, or re-signed with another key, is caught.
    edited = dict(cp, vehicles=[dict(cp["vehicles"][0], entries=2)])
    (tmp_path / "edited.json").write_text(json.dumps(edited))
    r = cli("verify", "--against", tmp_path / "edited.json")
    assert (r.exit_code, r.stderr) == (3, f"Error: the checkpoint {tmp_path / 'edited.json'} "
                                          "was changed after it was written: its digest does not "
                                          "match its content\n")
    _ok(cli("checkpoint-key", tmp_path / "other"))
    _ok(cli("checkpoint", tmp_path / "cp2.json", "--sign", tmp_path / "other"))
    r = cli("verify", "--against", tmp_path / "cp2.json", "--public-key", pub)
    assert r.exit_code == 3
    assert "signature does not verify with that public key" in r.stderr
    r = cli("verify", "--against", tmp_path / "cp2.json")
    assert r.exit_code == 0 and "signature: not checked (give --public-key)" in " ".join(
        r.stdout.split())


def test_a_rewrite_with_recomputed_seals_is_caught_only_by_the_checkpoint(ready, tmp_path):  # noqa: F811,E501
    """The newest entry removed: the chain left is whole, the checkpoint's head is gone."""
    cli, d = ready
    _ok(cli("install", "TS-101", "lamp", "--mass", "2 lb", "--arm", "80 in", "--reason", "fit",
            "--by", "tester"))
    _ok(cli("checkpoint", tmp_path / "cp.json"))
    _sql(cli, "DELETE FROM ledger_entries WHERE seq = 2", drop=["ledger_entries"])
    eng = make_engine(cli.db_url)
    try:
        with eng.begin() as conn:
            guards.install(conn, ["ledger_entries"])  # and the guard put back
    finally:
        eng.dispose()
    _ok(cli("verify"))
    r = cli("verify", "--against", tmp_path / "cp.json")
    assert r.exit_code == 3
    assert r.stderr == (f"Error: the database does not match the checkpoint "
                        f"{tmp_path / 'cp.json'}: TS-101: entry 2, checkpointed, is gone: "
                        "entries were removed\n")
    # and a checkpoint is never written of data that does not verify
    _sql(cli, "UPDATE vehicles SET serial = 'X'", drop=["vehicles"])
    r = cli("checkpoint", tmp_path / "cp3.json")
    assert r.exit_code == 3 and not (tmp_path / "cp3.json").exists()
    assert r.stderr.startswith("Error: no checkpoint is written of data that does not verify: "
                               "the chain of TS-101 does not verify: vehicle record:")


BAD = [
    (["verify", "--public-key", "k.pub"],
     "Error: --public-key = 'k.pub': only with --against FILE"),
    (["verify", "--exact"], "Error: --exact = 'true': only with --against FILE"),
    (["verify", "TS-101", "--against", "{tmp}/ok.toml"],
     "Error: REG = 'TS-101': none with --against: a checkpoint is compared with the whole "
     "database"),
    (["vehicle", "add", "TS-102\n", "--type", "TS-1"],
     "Error: registration = 'TS-102\\n': 1 to 40 letters, digits or '-'"),
    (["verify", "--against", "{tmp}"], "Error: --against = '{tmp}': a regular file"),
    (["verify", "--against", "{tmp}/none.json"],
     "Error: --against = '{tmp}/none.json': an existing file"),
    (["verify", "--against", "/dev/zero"], "Error: --against = '/dev/zero': a regular file"),
    (["verify", "--against", "{tmp}/ok.toml"],
     "Error: --against = '{tmp}/ok.toml': a checkpoint file written by `wbledger checkpoint` "
     "(it is not JSON)"),
    (["checkpoint", "{tmp}/no/cp.json"],
     "Error: FILE = '{tmp}/no/cp.json': a file in an existing folder; '{tmp}/no' does not "
     "exist"),
    (["checkpoint", "{tmp}/cp.json", "--sign", "{tmp}/ok.toml"],
     "Error: --sign = '{tmp}/ok.toml': an unencrypted PEM Ed25519 private key"),
]


@pytest.mark.parametrize(("args", "message"), BAD, ids=[" ".join(a) for a, _ in BAD])
def test_bad_input_is_one_line_and_exit_2(ready, args, message):  # noqa: F811
    cli, d = ready
    r = cli(*[a.replace("{tmp}", str(d)) for a in args])
    assert r.exit_code == 2, r.stdout
    assert r.stderr.startswith(message.replace("{tmp}", str(d))), r.stderr
    assert r.stderr.count("\n") == 1
    assert not (d / "cp.json").exists()


def test_a_checkpoint_whose_items_are_not_as_written_is_refused(ready, tmp_path):  # noqa: F811
    from ledger.store import checkpoint

    cli, _ = ready
    _ok(cli("checkpoint", tmp_path / "cp.json"))
    doc = json.loads((tmp_path / "cp.json").read_text())
    for bad in ({"types": "abc"}, {"types": [1]},
                {"vehicles": [dict(doc["vehicles"][0], entries="x")]},
                {"vehicles": [dict(doc["vehicles"][0], entries=1e30)]}):
        edited = {**doc, **bad}
        edited["digest"] = checkpoint._digest(edited)  # a digest made to match
        (tmp_path / "bad.json").write_text(json.dumps(edited))
        r = cli("verify", "--against", tmp_path / "bad.json")
        key = next(iter(bad))
        assert (r.exit_code, r.stderr) == (2, f"Error: --against = '{tmp_path / 'bad.json'}': "
                                              f"a checkpoint file (wbledger.checkpoint/1); its "
                                              f"'{key}' are not as wbledger writes them\n")
