"""What ``wbledger demo`` prints (issue 13 item 21): commands that can be pasted and run as
printed, no line wider than 80 columns, counts that agree with their nouns, the truck's advisory
once, the program the user can actually run, and the sheets, configuration, amendment and
export it promises. Nothing here depends on the demo fleet's figures.
"""

from __future__ import annotations

import os
import re
import shlex
import subprocess
import sys
from pathlib import Path

import pytest
from rich.cells import cell_len
from typer.testing import CliRunner

from ledger.cli import app
from ledger.cli import demo as demo_cli

REPO = Path(__file__).resolve().parents[2]


@pytest.fixture(scope="module")
def demo_run(tmp_path_factory):
    """The demo run once in a folder of its own, from that folder, on an 80-column terminal."""
    where = tmp_path_factory.mktemp("demo-run")
    with pytest.MonkeyPatch.context() as mp:
        mp.chdir(where)
        mp.delenv("WBLEDGER_DB", raising=False)
        res = CliRunner().invoke(app, ["demo", "--out", "demo"], env={"COLUMNS": "80"},
                                 catch_exceptions=False)
    assert res.exit_code == 0, res.output[-3000:]
    return where, res.stdout


def _commands(out: str) -> list[str]:
    """Each echoed command as a shell would read it: ``$ `` lines with their ``\\``
    continuation lines joined."""
    commands, current = [], None
    for line in out.splitlines():
        if current is not None:
            current += " " + line.strip()
        elif line.startswith("$ "):
            current = line[2:]
        else:
            continue
        if current.endswith(" \\"):
            current = current[:-2]
        else:
            commands.append(current)
            current = None
    assert current is None, "a continuation line ends the output"
    return commands


def test_no_line_is_wider_than_80_columns(demo_run):
    _, out = demo_run
    wide = [(n, line) for n, line in enumerate(out.splitlines(), 1) if cell_len(line) > 80]
    assert wide == []


def test_counts_agree_with_their_nouns(demo_run):
    _, out = demo_run
    assert re.findall(r"\b1 (?:entries|types|vehicles|revisions|saved sheets)\b", out) == []
    assert re.search(r": 1 entry, chain verified", out)  # the twin has one entry


def test_the_truck_advisory_is_printed_once(demo_run):
    _, out = demo_run
    start = out.index("kva-t75-delivery.toml --pdf")
    truck = out[start:out.index("\n$ ", start)]
    assert "LOADING SHEET  KVA-T75" in truck
    assert " ".join(truck.split()).count("legal determination") == 1


def test_it_shows_every_type_a_configuration_an_amendment_and_an_export(demo_run):
    where, out = demo_run
    commands = [shlex.split(c) for c in _commands(out)]
    shown = {tuple(c[c.index(w):c.index(w) + 2]) for c in commands
             for w in ("sheet", "config", "export", "check") if w in c}
    assert {("sheet", "prepare"), ("sheet", "amend"), ("config", "show"),
            ("export", "KVA-101"), ("check", "KVA-101")} <= shown
    plans = {Path(c[c.index("prepare") + 1]).name for c in commands if "prepare" in c}
    assert {"kva-201-charter.toml", "kva-301-lateral.toml", "kva-t75-delivery.toml"} <= plans
    assert "amends sheet #1" in out and (where / "demo" / "kva-101-ledger.csv").is_file()


def test_echoed_commands_run_as_printed(demo_run, monkeypatch):
    """Each command is one shell command (quoted, continued with ``\\``); the paths it names
    are short and relative, and re-running a few verbatim in the demo's folder, with the
    database the demo says to export, works."""
    where, out = demo_run
    first = out.splitlines().index("$ export WBLEDGER_DB=sqlite:///demo/demo.sqlite3")
    assert first < 5  # the database is named before any command that uses it
    commands = _commands(out)
    prog = shlex.split(commands[1])[:-1]  # "… init"
    assert commands[1] == shlex.join([*prog, "init"])
    runner, env = CliRunner(), {"WBLEDGER_DB": "sqlite:///demo/demo.sqlite3", "COLUMNS": "80"}
    again = [c for c in commands if re.search(r" (vehicle list|config show|check KVA-101 |"
                                              r"sheet prepare \S+aft-cg|verify$)", c)]
    assert len(again) == 5
    monkeypatch.chdir(where)
    for command in again:
        words = shlex.split(command)
        assert words[:len(prog)] == prog
        assert not any(w.startswith("/") for w in words[len(prog):])  # short paths
        res = runner.invoke(app, words[len(prog):], env=env, catch_exceptions=False)
        assert res.exit_code == (1 if "aft-cg" in command else 0), (command, res.output)
    # The program prefix itself runs (here `python -m ledger` or `wbledger`).
    done = subprocess.run([*prog, "vehicle", "list"], cwd=where, capture_output=True,
                          text=True, env={**os.environ, **env, "PYTHONPATH": str(REPO)})
    assert done.returncode == 0 and "KVA-101" in done.stdout, done.stderr


def test_the_program_named_is_the_one_the_user_ran(tmp_path, monkeypatch):
    """`.venv/bin/wbledger demo` suggests `.venv/bin/wbledger --help`, not a `wbledger` that
    is not on the PATH."""
    script = tmp_path / ".venv" / "bin" / "wbledger"
    script.parent.mkdir(parents=True)
    script.write_text("#!/bin/sh\n")
    monkeypatch.chdir(tmp_path)
    monkeypatch.setenv("PATH", "/nonexistent")
    monkeypatch.setattr(sys, "argv", [str(script), "demo"])
    assert demo_cli.program() == [".venv/bin/wbledger"]
    monkeypatch.setattr(sys, "argv", ["/elsewhere/pytest"])
    assert demo_cli.program()[1:] == ["-m", "ledger"]


@pytest.mark.parametrize("width", [50, 64, 80])
def test_command_lines_break_between_arguments_only(width):
    words = ["wbledger", "weigh", "KVA-1", "--reading", "left main=1234.5 lb", "--tare",
             "left main=2 lb", "--scales", "platform scales S/N 0000", "--by", "A. Person",
             "--date", "2026-01-01", "--reason", "it's the first weighing"]
    lines = demo_cli.command_lines(words, width)
    assert len(lines) > 1 and all(len(line) <= width for line in lines)
    assert all(line.endswith(" \\") for line in lines[:-1])
    joined = " ".join(line.removesuffix(" \\").strip() for line in lines)
    assert shlex.split(joined.removeprefix("$ ")) == words
