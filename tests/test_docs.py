"""Every command has help text and is described in the README (like sqlite-utils' test_docs)."""

from __future__ import annotations

import re
from pathlib import Path

import pytest
from typer.main import get_command

from ledger.cli import app

README = (Path(__file__).resolve().parents[1] / "README.md").read_text(encoding="utf-8")


def _commands(group=None, prefix=()):
    group = group or get_command(app)
    for name, sub in sorted(group.commands.items()):
        if getattr(sub, "commands", None):
            yield from _commands(sub, (*prefix, name))
        else:
            yield " ".join((*prefix, name)), sub


COMMANDS = list(_commands())


def test_there_are_commands():
    names = [n for n, _ in COMMANDS]
    assert {"init", "sheet prepare", "check", "weigh", "inertia", "verify"} <= set(names)


@pytest.mark.parametrize("name, command", COMMANDS, ids=[n for n, _ in COMMANDS])
def test_command_has_help_and_is_in_the_readme(name, command):
    assert (command.help or "").strip(), f"{name} has no help text"
    assert re.search(rf"wbledger {re.escape(name)}\b", README), f"README does not show {name}"


def test_readme_starts_with_the_job_and_the_two_commands():
    first = README.split("\n## ")[0]
    assert "centre of gravity" in first and "loading sheet" in first
    quick = README.split("## Quick start")[1].split("\n## ")[0]
    assert "make demo" in quick and "make test" in quick


def test_readme_python_examples_run():
    # The README's pycon blocks are doctests of the calculation core.
    import doctest

    blocks = re.findall(r"```pycon\n(.*?)```", README, flags=re.S)
    assert blocks, "the README shows no Python example"
    parser, runner = doctest.DocTestParser(), doctest.DocTestRunner(verbose=False)
    for n, block in enumerate(blocks):
        runner.run(parser.get_doctest(block, {}, f"README block {n + 1}", "README.md", 0))
    assert runner.failures == 0, f"{runner.failures} README example(s) failed (see above)"
