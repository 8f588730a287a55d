"""The pre-trip check (``ledger.services.check``): a verdict from verified data, nothing saved,
and nothing that renders a sheet imported for ``--json``.

Runs on SQLite and PostgreSQL (the ``fleet`` of ``tests/store/test_sheets.py``: type TS-1, no
real aircraft).
"""

from __future__ import annotations

import json
import os
import subprocess
import sys
from dataclasses import replace

import pytest

from ledger.errors import ChainError
from ledger.services.check import check
from ledger.services.sheets import read_plan
from tests.conftest import REPO
from tests.services.test_sheets import QUICK, _tamper_first_entry
from tests.store import test_sheets as store_sheets
from tests.store.test_sheets import PLAN, _count

fleet = store_sheets.fleet  # the fixture: TS-1 imported, TS-101 weighed, TS-102 not


def test_in_and_out_of_limits_and_nothing_saved(fleet):
    result = check(fleet, read_plan("TS-101", QUICK), user="login")
    assert result.in_limits and result.document["verdict"] == "in_limits"
    assert result.document["prepared"]["by"] == "login"
    # 95 lb more in the baggage: the CG goes aft of 47.3 in (and the station over 120 lb).
    aft = check(fleet, read_plan("TS-101", replace(QUICK, cargo=("baggage=135",))),
                user="login", by="R. Ortega")
    assert not aft.in_limits and aft.document["verdict"] == "out_of_limits"
    assert aft.document["prepared"]["by"] == "R. Ortega"
    assert _count(fleet) == 0


def test_no_verdict_from_a_chain_that_does_not_verify(fleet):
    _tamper_first_entry(fleet)
    with pytest.raises(ChainError):
        check(fleet, read_plan("TS-101", QUICK), user="login")


def test_the_json_check_imports_no_renderer(fleet, tmp_path):
    plan = tmp_path / "plan.toml"
    plan.write_text(PLAN, encoding="utf-8")
    url = fleet.url.render_as_string(hide_password=False)
    env = {**os.environ, "PYTHONPATH": str(REPO)}
    run = subprocess.run([sys.executable, "-X", "importtime", "-m", "ledger", "--db", url,
                          "check", str(plan), "--json"],
                         capture_output=True, text=True, env=env, cwd=tmp_path, timeout=120)
    assert run.returncode == 0, run.stderr[-2000:]
    assert json.loads(run.stdout)["verdict"] == "in_limits"
    imported = {line.rsplit("|", 1)[-1].strip() for line in run.stderr.splitlines()
                if line.startswith("import time:")}
    assert "ledger.services.check" in imported
    assert not {m for m in imported if m.startswith(("rich", "ledger.report"))}
