"""Issue 13 item 13: the command line as people expect it.

Every command and parameter of the whole command tree is walked: each has help text, takes a
placeholder that follows ``ledger/cli/conventions.py``, uses the one option name of its concept,
and the main commands end their help with examples that can be pasted. ``--version`` and shell
completion work. (What the help says, not how it is laid out: typer draws the panels.)
"""

from __future__ import annotations

import os
import re
import shlex
import subprocess
import sys
from importlib.metadata import version

import pytest
from typer.main import get_command
from typer.testing import CliRunner

from ledger.cli import app
from ledger.cli.conventions import PLACEHOLDERS, SYNONYMS

ROOT = get_command(app)
#: typer's own options (completion), whose wording is typer's.
TYPER_OWN = {"--install-completion", "--show-completion"}
#: Commands whose help must end with examples (issue 13 item 13 names them).
MAIN_COMMANDS = ["check", "sheet prepare", "weigh", "install", "remove", "inertia",
                 "vehicle list", "type import"]
#: One option name whose placeholder differs on purpose, with the reason.
DIFFERENT_PLACEHOLDERS = {
    # the fuel in a tank as weighed is a quantity; a plan's fuel may add a density or temperature
    "--fuel": {"TANK=QTY", "TANK=QTY[@DENSITY|@TEMP]"},
}


def _walk(command, path):
    yield path, command
    for name, sub in sorted(getattr(command, "commands", {}).items()):
        yield from _walk(sub, [*path, name])


COMMANDS = list(_walk(ROOT, []))
PARAMS = [(" ".join(path) or "wbledger", param) for path, cmd in COMMANDS
          for param in cmd.params if not getattr(param, "hidden", False)]


def _id(case) -> str:
    return case if isinstance(case, str) else (case.opts[0] if case.opts else case.name)


def _takes_value(param) -> bool:
    return param.param_type_name == "argument" or not getattr(param, "is_flag", False)


@pytest.mark.parametrize("path,command", COMMANDS, ids=[" ".join(p) or "wbledger"
                                                        for p, _ in COMMANDS])
def test_every_command_has_help(path, command):
    assert (command.help or "").strip(), f"`wbledger {' '.join(path)}` has no help"


@pytest.mark.parametrize("where,param", PARAMS, ids=map(_id, (p for _, p in PARAMS)))
def test_every_parameter_has_help(where, param):
    assert (getattr(param, "help", None) or "").strip(), f"{where}: {param.opts} has no help"


@pytest.mark.parametrize("where,param", PARAMS, ids=map(_id, (p for _, p in PARAMS)))
def test_placeholders_follow_the_convention(where, param):
    if param.opts and param.opts[0] in TYPER_OWN:
        return
    metavar = param.metavar
    if not _takes_value(param):
        assert metavar is None, f"{where} {param.opts}: a flag takes no placeholder"
        return
    assert metavar, f"{where} {param.opts}: no placeholder (typer would show <str>)"
    assert re.fullmatch(r"[A-Za-z0-9=@,|\[\]…_-]+", metavar), metavar
    if param.param_type_name == "argument":
        assert not metavar.startswith("[") and not metavar.endswith(("…", "...")), (
            f"{where} {param.opts}: {metavar!r} carries its own brackets or dots; the help "
            "adds them to optional and repeated arguments")
    for word in re.findall(r"[A-Za-z0-9][A-Za-z0-9_-]*", metavar):
        if word.isupper() or word == "YYYY-MM-DD":
            assert word in PLACEHOLDERS, f"{where} {param.opts}: {word!r} is not a placeholder "\
                                         "word of ledger/cli/conventions.py"
        else:  # a literal word is one of a choice: next to a |
            assert re.search(rf"(^|\|){re.escape(word)}(\||$)|\|{re.escape(word)}|"
                             rf"{re.escape(word)}\|", metavar), (
                f"{where} {param.opts}: lower-case {word!r} outside a literal choice")


def test_one_name_for_one_concept():
    """No command uses a refused synonym; an option name takes the same placeholder everywhere
    (``--configuration`` in `check`, `sheet` and `inertia`; `inertia` had ``--config``)."""
    refused = {name: canon for canon, names in SYNONYMS.items() for name in names}
    placeholders: dict[str, set[str]] = {}
    for where, param in PARAMS:
        for name in param.opts:
            assert name not in refused, f"{where}: {name} should be {refused[name]}"
            if param.param_type_name == "option" and _takes_value(param):
                placeholders.setdefault(name, set()).add(param.metavar)
    for name, seen in placeholders.items():
        assert len(seen) == 1 or seen == DIFFERENT_PLACEHOLDERS.get(name), (name, seen)
    names = {n for _, p in PARAMS for n in p.opts}
    assert "--configuration" in names and "--config" not in names


def test_required_options_are_declared_required():
    """An option whose help calls it required is declared so, and the help marks it."""
    for where, param in PARAMS:
        text = getattr(param, "help", None) or ""
        if re.search(r"\brequired\b", text, re.IGNORECASE) and "unless" not in text:
            assert param.required, f"{where} {param.opts}: says required, is not declared so"


#: Options without which the command always refuses to run: declared required, so that the help
#: marks them and a missing one is named before anything is opened.
ALWAYS_NEEDED = [("install", "--mass"), ("install", "--arm"), ("install", "--reason"),
                 ("remove", "--reason"), ("correct", "--reason"), ("vehicle add", "--type"),
                 ("corners", "--lf"), ("cg-height", "--wheel-radius")]


@pytest.mark.parametrize("path,name", ALWAYS_NEEDED)
def test_options_a_command_cannot_do_without_are_marked_required(path, name):
    param = next(p for p in _command(path).params if name in p.opts)
    assert param.required
    r = CliRunner().invoke(app, [*path.split(), "--help"], terminal_width=100)
    row = next(ln for ln in r.stdout.splitlines() if f" {name} " in ln)
    assert row.lstrip("│ ").startswith("*"), row  # typer's mark of a required option


def _command(path: str):
    command = ROOT
    for name in path.split():
        command = command.commands[name]
    return command


@pytest.mark.parametrize("path", MAIN_COMMANDS)
def test_main_commands_show_examples_that_paste(path):
    command = _command(path)
    epilog = command.epilog or ""
    assert epilog.startswith("Examples:\n"), f"`wbledger {path}` shows no example"
    # Each example joined across its backslash continuations is a command of this path whose
    # options exist.
    known = {n for p in command.params for n in p.opts} | {"--help"}
    shown = CliRunner().invoke(app, [*path.split(), "--help"], terminal_width=80).stdout
    shown_lines = {ln.strip() for ln in shown.splitlines()}
    for line in epilog.splitlines()[1:]:
        # the help draws every example line whole at 80 columns: none is wrapped
        assert line.strip() in shown_lines, line
    for example in epilog.split("\n", 1)[1].replace("\\\n", " ").splitlines():
        words = shlex.split(example)
        assert words[0] == "wbledger", example
        used = [w.split("=")[0] for w in words if w.startswith("--")]
        assert set(used) <= known, (example, set(used) - known)
        top = words[1]
        assert top == path.split()[0], example


def test_version_comes_from_the_installed_metadata():
    r = CliRunner().invoke(app, ["--version"])
    assert r.exit_code == 0
    assert r.stdout == f"wbledger {version('wbledger')}\n"


def test_shell_completion_is_offered_and_completes():
    r = CliRunner().invoke(app, ["--help"], terminal_width=100)
    assert "--install-completion" in r.stdout and "--show-completion" in r.stdout
    assert "Shell completion: run `wbledger --install-completion` once" in r.stdout
    # the shell named, not detected from the processes above the test (there may be none)
    named = {**os.environ, "_TYPER_COMPLETE_TEST_DISABLE_SHELL_DETECTION": "1"}
    script = subprocess.run([sys.executable, "-m", "ledger", "--show-completion", "bash"],
                            env=named, capture_output=True, text=True, check=True).stdout
    assert "_WBLEDGER_COMPLETE=complete_bash" in script
    env = {**os.environ, "_WBLEDGER_COMPLETE": "complete_bash",
           "COMP_WORDS": "wbledger sheet prepare plan.toml --conf", "COMP_CWORD": "4"}
    out = subprocess.run([sys.executable, "-m", "ledger"], env=env, capture_output=True,
                         text=True, check=True).stdout
    assert out.split() == ["--configuration"]
