"""Issue 13 item 17: the vertical CG from a nose-up weighing, recorded as a CG-height entry.

Sources: weighing on jack pads or load cells, net reaction × arm (FAA-H-8083-1, weight and
balance handbook, weighing chapter); the tilt relation is statics of a rigid body pitched about
its lateral axis (common practice): a body point (x, z) lies, after a nose-up pitch θ, at the
horizontal position X = x·cosθ + z·sinθ. The hand calculation below uses moment balance about
the nose point directly; it is checked against :func:`ledger.core.weighing.vertical_cg_from_pitch`
too. TT-A1 is the invented test type of ``tests/store/ledger_support.py`` (nose at 20 in, mains
at 100 in; main tank at z = 30 in, 4 USgal unusable); avgas 6.0 lb/US gal (FAA-H-8083-30 ch. 4).
"""

from __future__ import annotations

import math

import pytest

from ledger.core.weighing import vertical_cg_from_pitch
from ledger.errors import InputError
from ledger.store import entries
from ledger.store.db import session_scope
from ledger.testing import assert_close
from ledger.typedata.scales import PitchedWeighing
from tests.store.ledger_support import IN, LB, READINGS_A, setup_fleet, snapshot, weigh_a

THETA = math.radians(10.0)
PLANE_IN = 10.0     # the jack pads' vertical arm, in
Z_CG_IN = 40.0      # the as-weighed CG's vertical arm chosen for the readings, in
W_LB, X_CG_IN = 6860.0, 80.0  # READINGS_A: 6,860 lb at 80.0 in


def _pitched_readings() -> dict[str, str]:
    """Readings of TT-A1 pitched nose-up by THETA with its CG at (80 in, 40 in): moment
    balance about the nose point in the pitched attitude (horizontal arms x·cosθ + z·sinθ)."""
    def horizontal(x, z):
        return x * math.cos(THETA) + z * math.sin(THETA)
    nose, main = horizontal(20.0, PLANE_IN), horizontal(100.0, PLANE_IN)
    both_mains = W_LB * (horizontal(X_CG_IN, Z_CG_IN) - nose) / (main - nose)
    return {"nose": f"{W_LB - both_mains!r} lb", "left main": f"{both_mains / 2!r} lb",
            "right main": f"{both_mains / 2!r} lb"}


def _hand_height_in(readings: dict[str, str]) -> float:
    """The vertical arm of the CG from the pitched readings, by moment balance about the nose
    point: X_cg − X_nose = Σ R_i (X_i − X_nose) / W, then z = (X_cg − x_cg·cosθ) / sinθ."""
    r = {k: float(v.split()[0]) for k, v in readings.items()}
    w = sum(r.values())
    dx = (100.0 - 20.0) * math.cos(THETA)  # the points share the plane z, so only x differs
    x_cg_h = (20.0 * math.cos(THETA) + PLANE_IN * math.sin(THETA)
              + (r["left main"] + r["right main"]) * dx / w)
    return (x_cg_h - X_CG_IN * math.cos(THETA)) / math.sin(THETA)


@pytest.fixture
def fleet(engine):
    setup_fleet(engine, {"KV-101": "TT-A1"})
    return engine


def _pitched(**kw) -> PitchedWeighing:
    return PitchedWeighing(kw.get("readings", _pitched_readings()), kw.get("pitch", "10 deg"),
                           kw.get("points_z", f"{PLANE_IN} in"))


def test_a_pitched_weighing_records_the_vertical_cg_as_a_cg_height_entry(fleet):
    """issue 13 item 17: the weighing command had no way to give the vertical CG."""
    readings = _pitched_readings()
    hand = _hand_height_in(readings)
    assert_close(hand, Z_CG_IN, unit="in", rtol=1e-9, source="statics, moment balance")
    weighed = weigh_a(fleet, "KV-101", pitched=_pitched(readings=readings))
    with session_scope(fleet) as s:
        es = entries.entries_of(s, "KV-101")
    assert [(e.seq, e.kind, e.entry_date) for e in es] == [
        (1, "weighing", weighed.entry_date), (2, "cg_height", weighed.entry_date)]
    height = es[1]
    assert height.detail["method"] == "pitched weighing" and height.detail["pitch_deg"] == 10.0
    assert_close(height.detail["cg_z_m"], hand * IN, unit="m", rtol=1e-9,
                 source="statics (hand calculation)")
    core = vertical_cg_from_pitch(X_CG_IN * IN, height.detail["apparent_cg_x_m"], THETA,
                                  plane_z=PLANE_IN * IN)
    assert_close(height.detail["cg_z_m"], core.z_cg, unit="m", rtol=1e-12,
                 source="ledger.core.weighing.vertical_cg_from_pitch")
    # the mass and horizontal moments are the weighing's; the vertical moment is now known
    assert (height.empty_mass_kg, height.z_known) == (es[0].empty_mass_kg, True)
    assert_close(height.empty_mz_kgm, W_LB * LB * Z_CG_IN * IN, unit="kg*m", rtol=1e-9)


def test_the_empty_vertical_cg_takes_the_fuel_out_at_its_vertical_arm(fleet):
    """issue 13 item 17: weighed with 20 US gal in the main tank (z = 30 in, 4 US gal
    unusable): 96 lb of usable fuel leaves at z = 30 in."""
    weigh_a(fleet, "KV-101", fuel={"main": "20 USgal"}, pitched=_pitched())
    with session_scope(fleet) as s:
        height = entries.entries_of(s, "KV-101")[1]
    usable_lb = (20 - 4) * 6.0
    z_empty_in = (W_LB * Z_CG_IN - usable_lb * 30.0) / (W_LB - usable_lb)
    assert_close(height.detail["cg_z_m"], z_empty_in * IN, unit="m", rtol=1e-6,
                 source="FAA-H-8083-1 (remove usable fuel at its arm)")


@pytest.mark.parametrize("kw, message", [
    (dict(pitch="1 deg"), "--pitch = 1: a pitch of 2° to 60°. Pitch the vehicle further; a "
                          "small angle gives a CG shift lost in the scale resolution"),
    (dict(readings={**READINGS_A, "nose": "1600 lb"}),
     "--pitched-reading = '6745.00 lb': within 0.5 % of the level weighing's 6860.00 lb. "
     "Re-zero the scales and check nothing moved or was removed"),
    (dict(readings={"nose": "1715 lb"}),
     "--pitched-reading = 'left main': missing; type TT-A1 is weighed at nose, left main, "
     "right main: give one --pitched-reading POINT=MASS for each"),
])
def test_bad_pitched_readings_write_nothing(fleet, kw, message):
    before = snapshot(fleet)
    with pytest.raises(InputError) as err:
        weigh_a(fleet, "KV-101", pitched=_pitched(**kw))
    assert str(err.value) == message
    assert snapshot(fleet) == before
