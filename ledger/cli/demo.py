"""``wbledger demo``: the main job end to end on a throw-away database of the invented demo fleet.

It runs real commands, printing each one before its output, so its output doubles as a
tutorial: import the demo types, add the vehicles, record their first weighings (the invented
scale readings of ``demo_fleet/README.md``), log an equipment change, print the running record,
then loading sheets (one in limits with its PDF, one out of limits with its fixes, the truck with
its axle loads) and loaded inertia reports. The user's own ledger is never touched: the demo
uses a file of its own, or the database ``--db`` / ``WBLEDGER_DB`` names if that one is empty.
"""

from __future__ import annotations

import datetime as dt
import shlex
from pathlib import Path

import typer

from ledger.cli import common


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


def _shown(path: Path) -> str:
    """A path as the user would type it: relative to the current folder when below it."""
    try:
        return str(path.resolve().relative_to(Path.cwd().resolve()))
    except ValueError:
        return str(path)


def _steps(fleet: Path, out: Path, today: dt.date) -> list[tuple[str, list[str]]]:
    fleet, out = Path(_shown(fleet)), Path(_shown(out))
    weighed = (today - dt.timedelta(days=30)).isoformat()
    changed = (today - dt.timedelta(days=6)).isoformat()
    plans = fleet / "plans"
    steps: list[tuple[str, list[str]]] = [
        ("Create the demo ledger and import the five invented types.", ["init"]),
        ("", ["type", "import", *sorted(str(p) for p in fleet.glob("kv-*.toml"))]),
        ("", ["type", "list"]),
    ]
    for reg, (type_name, _unit, _points, _extra) in WEIGHINGS.items():
        steps.append(("" if steps[-1][1][0] == "vehicle" else "Add the vehicles.",
                      ["vehicle", "add", reg, "--type", type_name]))
    for reg, (_t, unit, points, extra) in WEIGHINGS.items():
        args = ["weigh", reg]
        for name, reading, tare in points:
            args += ["--reading", f"{name}={reading} {unit}"]
            if tare:
                args += ["--tare", f"{name}={tare} {unit}"]
        args += [*extra, "--date", weighed, "--scales", "platform scales S/N 0000 (invented)",
                 "--by", "M. Haddad (invented)", "--reason", "initial weighing (invented)"]
        steps.append(("Maintenance records the first weighing of each vehicle."
                      if reg == "KVA-101" else "", args))
    steps += [
        ("An equipment change: a new emergency locator transmitter in the tail cone.",
         ["install", "KVA-101", "ELT", "--mass", "2.9 lb", "--arm", "171.5 in",
          "--vert-arm", "31 in", "--shape", "box,length=7.5 in,width=3.5 in,height=3.5 in",
          "--reason", "ELT replaced (invented)", "--ref", "WO-0417", "--date", changed,
          "--by", "M. Haddad (invented)"]),
        ("", ["history", "KVA-101"]),
        ("The fleet at a glance.", ["vehicle", "list"]),
        ("A loading sheet in limits, saved, with a PDF to print and sign.",
         ["sheet", "prepare", str(plans / "kva-101-local.toml"), "--save",
          "--pdf", str(out / "kva-101-local.pdf")]),
        ("The same aircraft loaded with its CG aft of the limit: the sheet names the fixes.",
         ["sheet", "prepare", str(plans / "kva-101-aft-cg.toml")]),
        ("The delivery truck: axle loads against their ratings, advisory axle-group rules.",
         ["sheet", "prepare", str(plans / "kva-t75-delivery.toml"),
          "--pdf", str(out / "kva-t75-delivery.pdf")]),
        ("The truck's corner weights, and its CG height from an axle-lift weighing "
         "(invented readings at three angles).",
         ["corners", "KVA-T75", "--lf", "1052 kg", "--rf", "949 kg", "--lr", "790 kg",
          "--rr", "739 kg"]),
        ("", ["cg-height", "KVA-T75", "--front-level", "1951 kg", "--rear-level", "1469 kg",
              "--front-tilted", "2022 kg", "--angle", "7 deg",
              "--front-tilted", "2063.5 kg", "--angle", "11 deg",
              "--front-tilted", "2106 kg", "--angle", "15 deg",
              "--wheel-radius", "0.39 m", "--datum-height", "0 m", "--date", changed,
              "--reason", "axle-lift weighing (invented)", "--by", "M. Haddad (invented)"]),
        ("Loaded inertia of the truck, the airplane and the drone.",
         ["inertia", "KVA-T75", "--plan", str(plans / "kva-t75-delivery.toml"),
          "--csv", str(out / "kva-t75-inertia.csv")]),
        ("", ["inertia", "KVA-101", "--plan", str(plans / "kva-101-local.toml"),
              "--assume-z", "34 in"]),
        ("", ["inertia", "KVA-D07", "--plan", str(plans / "kva-d07-survey.toml"),
              "--assume-z", "4 mm", "--csv", str(out / "kva-d07-inertia.csv")]),
        ("Prove that nobody rewrote the history.", ["verify"]),
        ("Keep the heads of every chain outside the database; a later check against the file "
         "catches a rewrite made since.", ["checkpoint", str(out / "checkpoint.json")]),
        ("", ["verify", "--against", str(out / "checkpoint.json")]),
    ]
    return steps


def demo(ctx: typer.Context,
         out: Path = typer.Option(Path("wbledger-demo"), "--out", metavar="FOLDER",
                                  help="Folder for the demo "
                                  "database, PDFs and CSV files (made anew each run)."),
         ) -> None:
    """Run the main job on a fresh demo database of the invented demo fleet."""
    from typer.main import get_command

    from ledger.cli import app
    from ledger.services.demo import demo_database

    db_url = demo_database(common.state(ctx).db_url, out).url
    fleet = demo_fleet_dir()
    command = get_command(app)
    con = common.console()
    con.print("[bold]wbledger demo[/bold]: Kestrel Valley Air & Freight, an invented operator "
              "with invented types and data, not for operational use.")
    con.print(f"Demo database: {db_url}", markup=False)
    for say, args in _steps(fleet, out, dt.date.today()):
        if say:
            con.print()
            con.print(f"[bold]# {say}[/bold]")
        con.print(f"[bold cyan]$ wbledger {shlex.join(args)}[/bold cyan]")
        code = command.main(args=["--db", db_url, *args], prog_name="wbledger",
                            standalone_mode=False)
        code = code if isinstance(code, int) else 0
        expected_out_of_limits = "kva-101-aft-cg.toml" in " ".join(args)
        if code != 0 and not (expected_out_of_limits and code == 1):
            common.fail(f"demo step `wbledger {shlex.join(args)}` ended with exit code {code}")
        if code == 1:
            con.print("[dim](exit code 1: out of limits, as this demo case intends)[/dim]")
    con.print()
    con.print(f"Files written in {out}/: kva-101-local.pdf, kva-t75-delivery.pdf, "
              "checkpoint.json, "
              "kva-t75-inertia.csv, kva-d07-inertia.csv, and the demo database.", markup=False)
    con.print(f"Try it yourself: export WBLEDGER_DB={db_url} and run `wbledger --help`.",
              markup=False)
