"""A command on an up-to-date database does not import Alembic: the schema revision it needs is
a constant (``ledger.store.db.HEAD_REVISION``) and the database's is read directly. Alembic is
for migrating only. (What is imported, not how long it takes: no timings in tests.)"""

from __future__ import annotations

import os
import subprocess
import sys

import pytest

from ledger.testing import new_ledger
from tests.store import test_sheets as store_sheets
from tests.store.test_sheets import PLAN

fleet = store_sheets.fleet  # the fixture: type TS-1 imported, TS-101 weighed (no real aircraft)

#: Runs a command; prints its exit code and which of ``names`` it imported.
PROBE = """
import runpy, sys
sys.argv = {argv!r}
try:
    runpy.run_module("ledger", run_name="__main__")
except SystemExit as exc:
    code = exc.code
print(code, sorted(m for m in {names!r} if m in sys.modules))
"""


@pytest.mark.parametrize("argv", [["wbledger", "type", "list", "--json"],
                                  ["wbledger", "db", "status", "--json"],
                                  ["wbledger", "verify", "--json"]])
def test_a_command_on_a_current_database_imports_no_alembic(argv, tmp_path):
    url = f"sqlite:///{tmp_path / 'ledger.sqlite3'}"
    new_ledger(url).dispose()
    env = {**os.environ, "WBLEDGER_DB": url}
    out = subprocess.run([sys.executable, "-c", PROBE.format(argv=argv, names=("alembic",))],
                         env=env, capture_output=True, text=True, check=True)
    assert out.stdout.strip().splitlines()[-1] == "0 []", out.stderr


#: Modules a check never needs (issue 12, the cost of one command): Alembic; ``numpy.ma``
#: (``np.unique`` loads it; the envelope code avoids it); saving, showing and amending saved
#: sheets; the entries' write path. Each once cost a check time at every start.
NOT_ON_THE_CHECK_PATH = ("alembic", "numpy.ma", "ledger.store.sheets", "ledger.store.entries",
                         "ledger.loadsheet.amend", "ledger.store.bulk_import")


def test_a_check_imports_only_what_it_needs(fleet, tmp_path):
    """issue 12, check_latency: a plan checked in limits (text output, as ``make bench``
    times it) loads none of :data:`NOT_ON_THE_CHECK_PATH`."""
    plan = tmp_path / "plan.toml"
    plan.write_text(PLAN, encoding="utf-8")
    env = {**os.environ, "WBLEDGER_DB": fleet.url.render_as_string(hide_password=False)}
    argv = ["wbledger", "check", str(plan)]
    out = subprocess.run([sys.executable, "-c", PROBE.format(
        argv=argv, names=NOT_ON_THE_CHECK_PATH)], env=env, capture_output=True, text=True,
        check=True, cwd=tmp_path)
    assert out.stdout.strip().splitlines()[-1] == "0 []", out.stderr[-2000:]
