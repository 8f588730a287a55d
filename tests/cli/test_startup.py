"""The CLI starts fast: no SQLAlchemy, numpy, Alembic or units library before a command needs it."""

from __future__ import annotations

import subprocess
import sys

import pytest

HEAVY = ("sqlalchemy", "numpy", "alembic", "pint", "matplotlib", "psycopg")

PROBE = """
import runpy, sys
sys.argv = {argv!r}
try:
    runpy.run_module("ledger", run_name="__main__")
except SystemExit:
    pass
print(sorted({{m.split(".")[0] for m in sys.modules}} & set({heavy!r})))
"""


@pytest.mark.parametrize("argv", [["wbledger", "--help"], ["wbledger", "--version"],
                                  ["wbledger", "type", "--help"],
                                  ["wbledger", "vehicle", "--help"]])
def test_help_imports_no_heavy_library(argv):
    out = subprocess.run([sys.executable, "-c", PROBE.format(argv=argv, heavy=HEAVY)],
                         capture_output=True, text=True, check=True)
    assert out.stdout.strip().splitlines()[-1] == "[]"
