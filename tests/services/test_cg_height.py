"""``ledger.services.cg_height``: the axle-lift CG height, computed and recorded in one unit of
work.

The truck and its axle loads by statics are those of ``tests/cli/test_ground_cli.py`` (shared,
not copied); the height is checked there and here against the truck's true CG height.
"""

from __future__ import annotations

import pytest

from ledger.caution import CAUTION_SHORT
from ledger.errors import InputError
from ledger.services.cg_height import AxleLiftReadings, CgHeight, measure_cg_height
from ledger.services.database import open_database
from ledger.testing import assert_close
from tests.cli import test_ground_cli as case

truck = case.truck  # the shared fixture: type TT-2, vehicle KV-TT1 weighed


@pytest.fixture
def engine_of(truck):
    eng = open_database(truck.db_url)
    yield eng
    eng.dispose()


def _readings(**changes) -> AxleLiftReadings:
    angles = (8.0, 12.0, 16.0)
    base = dict(
        wheel_radius=f"{case.R_WHEEL} m",
        front_level=f"{case.CORNERS['front left'] + case.CORNERS['front right']} kg",
        rear_level=f"{case.CORNERS['rear left'] + case.CORNERS['rear right']} kg",
        front_tilted=[f"{case.statics_front_load(a):.9f}" for a in angles],
        angle=[f"{a} deg" for a in angles], datum_height="0 m")
    base.update(changes)
    return AxleLiftReadings(**base)


def test_a_dry_run_computes_and_stores_nothing(truck, engine_of):
    before = len(truck.entries())
    result = measure_cg_height(engine_of, case.REG, _readings(), actor="test", dry_run=True)
    assert isinstance(result, CgHeight)
    doc = result.document
    assert doc["stored"] is False
    assert doc["caution"] == CAUTION_SHORT
    assert doc["vehicle"]["type_revision"] == 1
    assert_close(doc["height_m"], case.H, unit="m", atol=1e-6, what="CG height",
                 source="statics of the invented rigid truck (ISO 10392 relation)")
    assert len(truck.entries()) == before


def test_the_height_is_recorded_as_a_ledger_entry(truck, engine_of):
    before = len(truck.entries())
    doc = measure_cg_height(engine_of, case.REG, _readings(), actor="test",
                            reason="axle lift").document
    entries = truck.entries()
    assert len(entries) == before + 1
    assert doc["stored"]["seq"] == entries[-1].seq
    assert doc["stored"]["registration"] == case.REG


@pytest.mark.parametrize("changes,field", [
    ({"datum_height": None}, "--datum-height"),
    ({"rear_tilted": ["1500"]}, "--rear-tilted"),
    ({"front_tilted": []}, "--front-tilted"),
    ({"angle": ["8 deg"], "lift": ["0.5 m"]}, "--lift"),
    ({"front_level": None}, "--front-level"),
    ({"rear_level": None}, "--total"),
])
def test_bad_readings_leave_the_ledger_unchanged(truck, engine_of, changes, field):
    before = len(truck.entries())
    with pytest.raises(InputError, match=field):
        measure_cg_height(engine_of, case.REG, _readings(**changes), actor="test")
    assert len(truck.entries()) == before
