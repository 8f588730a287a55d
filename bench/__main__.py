"""`make bench`: every benchmark, each figure a ratio against a baseline measured in this run.

Lines read ``bench NAME: ratio R (target T)``. Run one module alone with
``python -m bench.bench_core``, ``python -m bench.bench_ledger`` or
``python -m bench.bench_check``.
"""

from __future__ import annotations

import importlib
import os
import platform

MODULES = ("bench.bench_core", "bench.bench_ledger", "bench.bench_check")


def main() -> None:
    print(f"# {platform.python_implementation()} {platform.python_version()} on "
          f"{platform.machine()}, {os.cpu_count()} cores, load average "
          f"{', '.join(f'{x:.2f}' for x in os.getloadavg())}")
    for name in MODULES:
        importlib.import_module(name).main()


if __name__ == "__main__":
    main()
