"""Issue 13 item 10: stored and user-given text is shown as text.

An item named ``[bold red]x[/]`` is printed as those eleven characters, not as red text, and
an escape sequence in a name, a reason or a signatory never reaches the terminal: the reports
show it as the visible ``\\x1b``. The output is read as a terminal would get it (``color=True``:
the runner does not strip escape sequences itself).
"""

from __future__ import annotations

import pytest
from typer.testing import CliRunner

from ledger.cli import app
from tests.store.ledger_support import write_types

MARKUP = "[bold red]x[/]"
ESCAPED = "lamp\x1b[31m red"       # ESC: a colour change
C1 = "WO\x9b2J-7"                   # the single-byte CSI of C1: clear the screen
SIGNER = "A. Signer[/]\x1b]0;title\x07"  # OSC: sets the window title, ended by BEL
READINGS = ["--reading", "nose=1715", "--reading", "left main=2572.5 lb",
            "--reading", "right main=2572.5"]


@pytest.fixture
def run(sqlite_url, monkeypatch, tmp_path):
    monkeypatch.setenv("WBLEDGER_DB", sqlite_url)
    monkeypatch.setenv("COLUMNS", "160")  # wide enough that no name is folded in a table
    runner = CliRunner()

    def invoke(*args: str, code: int = 0) -> str:
        r = runner.invoke(app, list(args), color=True, catch_exceptions=False)
        assert r.exit_code == code, (r.stdout, r.stderr)
        return r.stdout + r.stderr

    invoke("init")
    invoke("type", "import", *map(str, write_types(tmp_path)))
    invoke("vehicle", "add", "KV-101", "--type", "TT-A1", "--note",
           "hangar [b]3[/b] :warning:\x1b[2J")
    invoke("weigh", "KV-101", *READINGS, "--date", "2025-01-10", "--by", SIGNER)
    invoke("install", "KV-101", MARKUP, "--mass", "2 lb", "--arm", "80", "--date",
           "2025-02-01", "--reason", "fit [i]it[/i]", "--by", SIGNER)
    invoke("install", "KV-101", ESCAPED, "--mass", "1 lb", "--arm", "70", "--date",
           "2025-02-02", "--ref", C1, "--reason", "fit", "--by", SIGNER)
    return invoke


def _no_control(out: str) -> None:
    for char in ("\x1b", "\x9b", "\x07"):
        assert char not in out, f"{char!r} reached the terminal"


def test_vehicle_show_prints_names_as_text(run):
    out = run("vehicle", "show", "KV-101")
    _no_control(out)
    assert f"  {MARKUP}: 2.0 lb at 80.00 in" in out
    assert "  lamp\\x1b[31m red: 1.0 lb at 70.00 in" in out
    assert "Note: hangar [b]3[/b] :warning:\\x1b[2J" in out  # no emoji read either


def test_history_prints_names_reasons_and_signatories_as_text(run):
    out = run("history", "KV-101")
    _no_control(out)
    assert f"install {MARKUP}" in out
    assert "install lamp\\x1b[31m red" in out
    assert "#2 fit [i]it[/i]; by A. Signer[/]\\x1b]0;title\\x07" in out
    assert "ref WO\\x9b2J-7" in out


def test_the_record_prints_names_reasons_and_signatories_as_text(run):
    out = run("record", "KV-101")
    _no_control(out)
    assert "lamp\\x1b[31m red" in out
    assert "A. Signer[/]\\x1b]0;title\\x07" in out


def test_the_recorded_entry_and_the_fleet_print_text(run):
    out = run("install", "KV-101", "[u]rack[/u]\x1b[1m", "--mass", "3 lb", "--arm", "90",
              "--date", "2025-03-01", "--reason", "fit")
    _no_control(out)
    assert out.startswith("Recorded entry 4 of KV-101: install [u]rack[/u]\\x1b[1m\n")
    _no_control(run("vehicle", "list"))


def test_the_sheet_and_check_print_the_signatory_as_text(run):
    args = ["KV-101", "--person", "pilot=170 lb", "--fuel", "main=20 USgal", "--by", SIGNER]
    sheet = run("sheet", "prepare", *args, "--save")
    _no_control(sheet)
    assert "A. Signer[/]\\x1b]0;title\\x07" in sheet
    _no_control(run("check", *args))
    listed = run("sheet", "list")
    _no_control(listed)
    assert "by A. Signer[/]\\x1b]0;title\\x07" in listed
