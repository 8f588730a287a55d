"""A command on an up-to-date database does not import Alembic: the schema revision it needs is
a constant (``ledger.store.db.HEAD_REVISION``) and the database's is read directly. Alembic is
for migrating only. (What is imported, not how long it takes: no timings in tests.)"""

from __future__ import annotations

import os
import subprocess
import sys

import pytest

from ledger.testing import new_ledger

PROBE = """
import runpy, sys
sys.argv = {argv!r}
try:
    runpy.run_module("ledger", run_name="__main__")
except SystemExit as exc:
    code = exc.code
print(code, "alembic" in sys.modules)
"""


@pytest.mark.parametrize("argv", [["wbledger", "type", "list", "--json"],
                                  ["wbledger", "db", "status", "--json"],
                                  ["wbledger", "verify", "--json"]])
def test_a_command_on_a_current_database_imports_no_alembic(argv, tmp_path):
    url = f"sqlite:///{tmp_path / 'ledger.sqlite3'}"
    new_ledger(url).dispose()
    env = {**os.environ, "WBLEDGER_DB": url}
    out = subprocess.run([sys.executable, "-c", PROBE.format(argv=argv)], env=env,
                         capture_output=True, text=True, check=True)
    assert out.stdout.strip().splitlines()[-1] == "0 False", out.stderr
