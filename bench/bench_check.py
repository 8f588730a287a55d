"""The cost of one command: ``wbledger check`` on a demo plan against the floor its libraries set.

Run from the repository root with ``python -m bench.bench_check``. Prints::

    bench check_latency: ratio R (target 1.5)

``check_latency`` is the median wall time of ``wbledger check`` on a demo plan (a new process
each time: ``python -m ledger check PLAN`` against a demo database) divided by the median wall
time of ``python -c "import sqlalchemy, numpy, rich, typer"`` in the same interpreter: the
libraries a command cannot do without. After a warm-up run of each, nine runs of each alternate,
so that a change of machine load falls on both sides.

Every child runs without ``PYTHONDONTWRITEBYTECODE``: the warm-up writes the bytecode caches an
installed package has, so that no run compiles source (with the variable set, every run would
compile wbledger's own modules again, which an installed wbledger never does).

The demo database is built by ``wbledger demo`` in a temporary folder; the data are invented.
"""

from __future__ import annotations

import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

if __package__ in (None, ""):  # run as a script: make the checkout importable
    sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

__all__ = ["FLOOR_IMPORTS", "PLAN", "bench_check_latency", "main"]

#: What the floor imports: the libraries every wbledger command depends on.
FLOOR_IMPORTS = "import sqlalchemy, numpy, rich, typer"
#: The demo plan checked (in limits: the command exits 0).
PLAN = "kva-101-local.toml"
RUNS = 9


def _child_env(database: Path) -> dict[str, str]:
    env = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
    env["WBLEDGER_DB"] = f"sqlite:///{database}"
    # The checkout first, as when the bench is run from it (the same tree the parent imports).
    root = str(Path(__file__).resolve().parents[1])
    env["PYTHONPATH"] = os.pathsep.join(p for p in (root, env.get("PYTHONPATH")) if p)
    return env


def _timed(args: list[str], env: dict[str, str], cwd: Path, ok: tuple[int, ...] = (0,)) -> float:
    start = time.perf_counter()
    done = subprocess.run(args, env=env, cwd=cwd, capture_output=True, text=True)
    elapsed = time.perf_counter() - start
    if done.returncode not in ok:
        raise RuntimeError(f"{' '.join(args)} exited {done.returncode}: {done.stderr.strip()}")
    return elapsed


def bench_check_latency(folder: Path, runs: int = RUNS) -> tuple[float, float, float]:
    """(ratio, median seconds of the check, median seconds of the floor)."""
    from ledger.cli.demo import demo_fleet_dir

    database = folder / "demo.sqlite3"
    env = _child_env(database)
    _timed([sys.executable, "-m", "ledger", "demo"], env, folder)
    check = [sys.executable, "-m", "ledger", "check", str(demo_fleet_dir() / "plans" / PLAN)]
    floor = [sys.executable, "-c", FLOOR_IMPORTS]
    for _ in range(2):  # warm-up: bytecode caches written, files in the page cache
        _timed(check, env, folder)
        _timed(floor, env, folder)
    ours, base = [], []
    for _ in range(runs):
        ours.append(_timed(check, env, folder))
        base.append(_timed(floor, env, folder))
    t_ours, t_base = statistics.median(ours), statistics.median(base)
    return t_ours / t_base, t_ours, t_base


def main() -> None:
    with tempfile.TemporaryDirectory(prefix="wbledger-bench-") as tmp:
        ratio, ours, base = bench_check_latency(Path(tmp))
    print(f"# check_latency: wbledger check {ours * 1000:.0f} ms, "
          f"{FLOOR_IMPORTS!r} {base * 1000:.0f} ms (medians of {RUNS})", flush=True)
    print(f"bench check_latency: ratio {ratio:.2f} (target 1.5)", flush=True)


if __name__ == "__main__":
    main()
