"""``wbledger demo``: the main job end to end on a throw-away database of the invented demo fleet.

It runs real commands, printing each one before its output, so its output doubles as a
tutorial: import the demo types, add the vehicles, record their first weighings (the invented
scale readings of ``demo_fleet/README.md``), log an equipment change, print the running record,
then loading sheets (one in limits with its PDF, one out of limits with its fixes, the twin,
the helicopter, the truck with its axle loads), a configuration, an amendment, an export and
loaded inertia reports. The user's own ledger is never touched: the demo uses a file of its own,
or the database ``--db`` / ``WBLEDGER_DB`` names if that one is empty.

Every echoed command can be pasted into a shell as it is printed (issue 13 item 21): it names
the program the user can run, the demo's files by short paths (the fleet is copied into the
output folder), and a long command is broken between arguments with a ``\\`` continuation so
that no line is wider than 80 columns.
"""

from __future__ import annotations

import datetime as dt
import shlex
import shutil
import sys
import textwrap
from pathlib import Path
from typing import NamedTuple

import typer

from ledger.cli import common

#: The widest line the demo prints of its own.
WIDTH = 80


def register(app: typer.Typer) -> None:
    app.command("demo")(demo)


def demo_fleet_dir() -> Path:
    """The demo fleet folder: shipped in the wheel as ``ledger._demo_fleet``, or the checkout's."""
    import importlib.util

    spec = importlib.util.find_spec("ledger._demo_fleet")
    if spec is not None and spec.submodule_search_locations:
        found = Path(next(iter(spec.submodule_search_locations)))
        if (found / "kv-p4.toml").exists():
            return found
    return Path(__file__).resolve().parents[2] / "demo_fleet"


# The invented first weighings of demo_fleet/README.md: (reaction point, reading, tare).
WEIGHINGS = {
    "KVA-101": ("KV-P4", "lb", [("nose", 336.5, 2.5), ("left main", 603.5, 2.5),
                                ("right main", 605, 2.5)], []),
    "KVA-201": ("KV-T20", "kg", [("nose", 317.5, 1.5), ("left main", 1496, 1.5),
                                 ("right main", 1501, 1.5)], []),
    "KVA-301": ("KV-H2", "lb", [("left forward", 219.5, 2), ("right forward", 221, 2),
                                ("left aft", 247, 2), ("right aft", 250.5, 2)], []),
    "KVA-D07": ("KV-D7", "kg", [("front left foot", 0.654, 0), ("front right foot", 0.656, 0),
                                ("rear left foot", 0.701, 0), ("rear right foot", 0.704, 0)], []),
    "KVA-T75": ("KV-TR75", "kg", [("front left", 1052, 0), ("front right", 949, 0),
                                  ("rear left", 790, 0), ("rear right", 739, 0)],
                ["--fuel", "diesel=135 L"]),
}


class Step(NamedTuple):
    """One demo command: what it shows (empty: continues the previous step), its arguments,
    and the exit code it is meant to end with (1: a plan out of limits on purpose)."""

    say: str
    args: list[str]
    code: int = 0


def _shown(path: Path) -> str:
    """A path as the user would type it: relative to the current folder when below it.
    Symbolic links are kept (a virtual environment's ``bin/python`` is one)."""
    try:
        return str(path.absolute().relative_to(Path.cwd()))
    except ValueError:
        return str(path)


def program() -> list[str]:
    """The command that runs wbledger, as the user can type it here: ``wbledger`` when that is
    on the PATH and is this program, else the path of the script that was run (such as
    ``.venv/bin/wbledger``), else ``PYTHON -m ledger`` (issue 13 item 21)."""
    script = Path(sys.argv[0]) if sys.argv and sys.argv[0] else None
    on_path = shutil.which("wbledger")
    if script is not None and script.name == "wbledger":
        if on_path and Path(on_path).resolve() == script.resolve():
            return ["wbledger"]
        shown = _shown(script)
        return [shown if "/" in shown else f"./{shown}"]
    if on_path:
        return ["wbledger"]
    return [_shown(Path(sys.executable)), "-m", "ledger"]


def command_lines(words: list[str], width: int = WIDTH) -> list[str]:
    """``$ words…`` as shell lines of at most ``width`` columns, broken only between arguments
    with a ``\\`` continuation; an option stays on the line of its value (a pair longer than a
    line stays whole on a line of its own).

    >>> command_lines(["wbledger", "verify"])
    ['$ wbledger verify']
    >>> command_lines(["wbledger", "weigh", "KVA-1", "--reading", "nose=1 kg"], width=26)
    ['$ wbledger weigh KVA-1 \\\\', "    --reading 'nose=1 kg'"]
    """
    quoted = [shlex.quote(w) for w in words]
    units, i = [], 0
    while i < len(quoted):
        takes_value = (quoted[i].startswith("-") and i + 1 < len(quoted)
                       and not quoted[i + 1].startswith("--"))
        units.append(" ".join(quoted[i:i + 2]) if takes_value else quoted[i])
        i += 2 if takes_value else 1
    lines, line = [], "$ " + units[0]
    for unit in units[1:]:
        if len(line) + len(unit) + 3 > width:  # the unit, a space and " \\"
            lines.append(line + " \\")
            line = "    " + unit
        else:
            line += " " + unit
    lines.append(line)
    return lines


def _narration(text: str) -> list[str]:
    return textwrap.wrap(text, WIDTH - 2, initial_indent="# ", subsequent_indent="# ")


def _steps(fleet: Path, out: Path, today: dt.date) -> list[Step]:
    fleet, out = Path(_shown(fleet)), Path(_shown(out))
    weighed = (today - dt.timedelta(days=30)).isoformat()
    changed = (today - dt.timedelta(days=6)).isoformat()
    plans = fleet / "plans"
    by = ["--by", "M. Haddad (invented)"]
    steps = [
        Step("Create the demo ledger and import the five invented types.", ["init"]),
        Step("", ["type", "import", *sorted(str(p) for p in fleet.glob("kv-*.toml"))]),
        Step("", ["type", "list"]),
    ]
    for reg, (type_name, _unit, _points, _extra) in WEIGHINGS.items():
        steps.append(Step("" if steps[-1].args[0] == "vehicle" else "Add the vehicles.",
                          ["vehicle", "add", reg, "--type", type_name]))
    for reg, (_t, unit, points, extra) in WEIGHINGS.items():
        args = ["weigh", reg]
        for name, reading, tare in points:
            args += ["--reading", f"{name}={reading} {unit}"]
            if tare:
                args += ["--tare", f"{name}={tare} {unit}"]
        args += [*extra, "--date", weighed, "--scales", "platform scales S/N 0000 (invented)",
                 *by, "--reason", "initial weighing (invented)"]
        steps.append(Step("Maintenance records the first weighing of each vehicle."
                          if reg == "KVA-101" else "", args))
    steps += [
        Step("An equipment change: a new emergency locator transmitter in the tail cone.",
             ["install", "KVA-101", "ELT", "--mass", "2.9 lb", "--arm", "171.5 in",
              "--vert-arm", "31 in", "--shape", "box,length=7.5 in,width=3.5 in,height=3.5 in",
              "--reason", "ELT replaced (invented)", "--ref", "WO-0417", "--date", changed,
              *by]),
        Step("", ["history", "KVA-101"]),
        Step("The fleet at a glance.", ["vehicle", "list"]),
        *_sheet_steps(plans, out),
        Step("The truck's corner weights, and its CG height from an axle-lift weighing "
             "(invented readings at three angles).",
             ["corners", "KVA-T75", "--lf", "1052 kg", "--rf", "949 kg", "--lr", "790 kg",
              "--rr", "739 kg"]),
        Step("", ["cg-height", "KVA-T75", "--front-level", "1951 kg", "--rear-level", "1469 kg",
                  "--front-tilted", "2022 kg", "--angle", "7 deg",
                  "--front-tilted", "2063.5 kg", "--angle", "11 deg",
                  "--front-tilted", "2106 kg", "--angle", "15 deg",
                  "--wheel-radius", "0.39 m", "--datum-height", "0 m", "--date", changed,
                  "--reason", "axle-lift weighing (invented)", *by]),
        Step("Loaded inertia of the truck, the airplane and the drone.",
             ["inertia", "KVA-T75", "--plan", str(plans / "kva-t75-delivery.toml"),
              "--csv", str(out / "kva-t75-inertia.csv")]),
        Step("", ["inertia", "KVA-101", "--plan", str(plans / "kva-101-local.toml"),
                  "--assume-z", "34 in"]),
        Step("", ["inertia", "KVA-D07", "--plan", str(plans / "kva-d07-survey.toml"),
                  "--assume-z", "4 mm", "--csv", str(out / "kva-d07-inertia.csv")]),
        Step("The whole ledger of a vehicle, exactly, for the records or another database.",
             ["export", "KVA-101", "-o", str(out / "kva-101-ledger.csv")]),
        Step("Prove that nobody rewrote the history.", ["verify"]),
        Step("Keep the heads of every chain outside the database; a later check against the "
             "file catches a rewrite made since.", ["checkpoint", str(out / "checkpoint.json")]),
        Step("", ["verify", "--against", str(out / "checkpoint.json")]),
    ]
    return steps


def _sheet_steps(plans: Path, out: Path) -> list[Step]:
    """The loading sheets: each demo plan, a configuration, an amendment."""
    return [
        Step("A loading sheet in limits, saved, with a PDF to print and sign.",
             ["sheet", "prepare", str(plans / "kva-101-local.toml"), "--save",
              "--pdf", str(out / "kva-101-local.pdf")]),
        Step("A last-minute change within the type's tolerance: the saved sheet is amended "
             "(a new sheet that points at the first).",
             ["sheet", "amend", "1", "--person", "front passenger=165 lb",
              "--by", "R. Ortega (invented)"]),
        Step("The same aircraft with its CG aft of the limit: the sheet names the fixes.",
             ["sheet", "prepare", str(plans / "kva-101-aft-cg.toml")], 1),
        Step("A configuration: rear seats out for bulky cargo, then a quick check with it.",
             ["config", "show", "rear-seats-out", "--vehicle", "KVA-101"]),
        Step("", ["check", "KVA-101", "--configuration", "rear-seats-out",
                  "--person", "pilot=176 lb", "--cargo", "baggage=95 lb",
                  "--fuel", "left wing=15 USgal", "--fuel", "right wing=15 USgal"]),
        Step("The twin turboprop's charter: %MAC, a zero-fuel limit, fuel arm tables.",
             ["sheet", "prepare", str(plans / "kva-201-charter.toml")]),
        Step("The helicopter with a heavy pilot alone: outside its lateral envelope.",
             ["sheet", "prepare", str(plans / "kva-301-lateral.toml")], 1),
        Step("The delivery truck: axle loads against ratings, advisory axle-group rules.",
             ["sheet", "prepare", str(plans / "kva-t75-delivery.toml"),
              "--pdf", str(out / "kva-t75-delivery.pdf")]),
    ]


def _echo(con, lines: list[str], style: str = "") -> None:
    from rich.text import Text

    for line in lines:
        con.print(Text(line, style=style), soft_wrap=True)


def demo(ctx: typer.Context,
         out: Path = typer.Option(Path("wbledger-demo"), "--out", metavar="FOLDER",
                                  help="Folder for the demo "
                                  "database, PDFs and CSV files (made anew each run)."),
         ) -> None:
    """Run the main job on a fresh demo database of the invented demo fleet."""
    from typer.main import get_command

    from ledger.cli import app
    from ledger.services.demo import copy_fleet, demo_database

    place = demo_database(common.state(ctx).db_url, out)
    fleet = copy_fleet(demo_fleet_dir(), out)
    command = get_command(app)
    prog = program()
    con = common.console()
    _echo(con, textwrap.wrap("wbledger demo: Kestrel Valley Air & Freight, an invented operator "
                             "with invented types and data, not for operational use.", WIDTH),
          "bold")
    _echo(con, _narration("Every command below uses the demo's database; to run them "
                          "yourself, first:"))
    export = f"export WBLEDGER_DB={shlex.quote(place.shown_url)}"
    _echo(con, [f"$ {export}"], "bold cyan")
    for step in _steps(fleet, out, dt.date.today()):
        if step.say:
            con.print()
            _echo(con, _narration(step.say), "bold")
        _echo(con, command_lines([*prog, *step.args]), "bold cyan")
        code = command.main(args=["--db", place.url, *step.args], prog_name="wbledger",
                            standalone_mode=False)
        code = code if isinstance(code, int) else 0
        if code != step.code:
            common.fail(f"demo step `wbledger {shlex.join(step.args)}` ended with exit code "
                        f"{code}")
        if code == 1:
            con.print("[dim](exit code 1: out of limits, as this demo case intends)[/dim]")
    con.print()
    shown_out = _shown(out)
    _echo(con, textwrap.wrap(
        f"Files written in {shown_out}/: kva-101-local.pdf, kva-t75-delivery.pdf, "
        "kva-t75-inertia.csv, kva-d07-inertia.csv, kva-101-ledger.csv, checkpoint.json, the "
        f"demo database and, in {shown_out}/{fleet.name}/, the demo fleet's type files and "
        "plans to edit and try.", WIDTH))
    _echo(con, ["Try it yourself:", f"  {export}", f"  {shlex.join([*prog, '--help'])}"])
