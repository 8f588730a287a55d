"""``ledger.services.ground``: corner weights and the axle rule sets, as the CLI calls them.

The truck is the invented one of ``tests/cli/test_ground_cli.py`` (shared, not copied), whose
corner figures are checked there against CG = Σ(R·x)/ΣR.
"""

from __future__ import annotations

import json

import pytest

from ledger.caution import CAUTION_SHORT, GROUND_CAUTION
from ledger.errors import InputError
from ledger.services.database import open_database
from ledger.services.ground import (
    CornerWeights,
    axle_rule_set,
    axle_rule_sets,
    corner_weights,
)
from ledger.testing import assert_close
from tests.cli import test_ground_cli as case

truck = case.truck  # the shared fixture: type TT-2, vehicle KV-TT1 weighed

WHEELS = {"lf": "1100", "rf": "1060", "lr": "760", "rr": "780"}


@pytest.fixture
def engine_of(truck):
    eng = open_database(truck.db_url)
    yield eng
    eng.dispose()


def test_corners_of_a_registered_truck_match_the_cli(truck, engine_of):
    result = corner_weights(engine_of, case.REG, **WHEELS)
    assert isinstance(result, CornerWeights)
    doc = result.document
    assert doc["caution"] == CAUTION_SHORT
    assert doc["geometry_m"]["wheelbase_m"] == pytest.approx(3.8)
    assert_close(doc["cg_m"]["x"], case.A, unit="m", rtol=1e-12, what="CG x",
                 source="CG = Σ(R·x)/ΣR (FAA-H-8083-1)")
    r = truck("corners", case.REG, *[a for k, v in WHEELS.items() for a in (f"--{k}", v)],
              "--json")
    assert r.exit_code == 0, r.stderr
    assert json.loads(r.stdout) == json.loads(json.dumps(doc))


def test_corners_without_a_vehicle_need_no_database():
    doc = corner_weights(None, None, lf="400 lb", rf="380 lb", lr="360 lb", rr="360 lb",
                         wheelbase="100 in", track="60 in").document
    assert doc["vehicle"] is None
    assert doc["units"]["mass"] == "lb" and doc["units"]["length"] == "in"
    assert doc["total_kg"] == pytest.approx(1500 * 0.45359237)


def test_corners_without_a_vehicle_need_units_and_geometry():
    with pytest.raises(InputError, match="--wheelbase"):
        corner_weights(None, None, lf="400 kg", rf="380 kg", lr="360 kg", rr="360 kg")
    with pytest.raises(InputError, match="--lf"):
        corner_weights(None, None, lf="-4 kg", rf="380 kg", lr="360 kg", rr="360 kg",
                       wheelbase="2 m", track="1 m")


def test_a_registration_needs_the_engine():
    with pytest.raises(ValueError, match="engine"):
        corner_weights(None, case.REG, **WHEELS)


def test_axle_rule_sets_list_the_builtin_set():
    found = axle_rule_sets()
    assert "us-federal-interstate" in [r["name"] for r in found.rows]
    assert found.folders


def test_axle_rule_set_with_its_bridge_table():
    doc = axle_rule_set("us-federal-interstate", table=True, max_length_ft=10)
    assert doc["caution"] == GROUND_CAUTION
    assert doc["bridge_table"] is not None
    assert [r["length_ft"] for r in doc["bridge_table"]["rows"]] == list(range(4, 11))
    assert axle_rule_set("us-federal-interstate")["bridge_table"] is None
