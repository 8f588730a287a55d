"""``ledger.services.inertia``: the loaded-inertia use case, called the way the CLI calls it.

The vehicle, its type and the plan are the invented ones of ``tests/cli/test_inertia_cli.py``
(shared, not copied); the figures themselves are checked there against a parallel-axis
build-up. Here: the service returns the very document ``wbledger inertia --json`` prints, with
its caution, and bad input leaves the database as it was.
"""

from __future__ import annotations

import json

import pytest

from ledger.caution import CAUTION
from ledger.errors import InputError
from ledger.services.database import open_database
from ledger.services.inertia import InertiaReport, inertia_report
from tests.cli import test_inertia_cli as case

fleet = case.fleet  # the shared fixture: type TI-2, vehicle KV-I1 weighed, a plan file


@pytest.fixture
def engine_of(fleet):
    eng = open_database(fleet.db_url)
    yield eng
    eng.dispose()


def test_the_report_is_the_document_the_cli_prints(fleet, engine_of):
    fleet.set_z()
    report = inertia_report(engine_of, case.REG, plan=fleet.plan, phase="landing")
    assert isinstance(report, InertiaReport)
    r = fleet("inertia", case.REG, "--plan", str(fleet.plan), "--phase", "landing", "--json")
    assert r.exit_code == 0, r.stderr
    assert json.loads(r.stdout) == json.loads(json.dumps(report.document))
    assert report.caution == CAUTION == report.document["caution"]
    assert report.document["condition"]["phase"] == "landing"


def test_an_empty_vehicle_with_a_configuration(fleet, engine_of):
    fleet.set_z()
    doc = inertia_report(engine_of, case.REG, config="pod").document
    assert [i["name"] for i in doc["items"]] == ["empty vehicle (rest)", "pod"]
    assert doc["condition"]["plan"] is None and doc["condition"]["phase"] is None
    assert doc["caution"] == CAUTION


def test_an_assumed_vertical_arm_is_listed(fleet, engine_of):
    doc = inertia_report(engine_of, case.REG, assume_z="0.8 m").document
    assert any("--assume-z" in w for w in doc["warnings"])
    assert doc["items"][0]["z_assumed"] is True


def test_a_plan_for_another_configuration_is_refused(fleet, engine_of):
    fleet.set_z()
    plan = fleet.plan.with_name("pod-plan.toml")
    plan.write_text(case.PLAN.replace('vehicle = "KV-I1"',
                                      'vehicle = "KV-I1"\nconfiguration = "pod"'),
                    encoding="utf-8")
    with pytest.raises(InputError, match="--configuration"):
        inertia_report(engine_of, case.REG, plan=plan, config="other")


def test_no_vertical_cg_and_no_assumption_is_refused(fleet, engine_of):
    with pytest.raises(InputError, match="vertical CG of the empty vehicle"):
        inertia_report(engine_of, case.REG)
