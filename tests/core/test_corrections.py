"""Loading fixes against handbook worked examples; every fix is re-checked by applying it with
mass_properties (and the envelope functions) rather than trusting the formula."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from ledger.core.corrections import (
    AddableMass,
    ballast_mass,
    cg_after_shift,
    max_addable_mass,
    new_cg_after_change,
    offload_for_cg_limit,
    offload_for_mass_limit,
    shift_mass,
)
from ledger.core.envelope import covers, path_inside, validate_polygon
from ledger.core.massprops import mass_properties
from ledger.errors import CorrectionError, EnvelopeError
from ledger.testing import assert_close

PHAK = "Pilot's Handbook of Aeronautical Knowledge, FAA-H-8083-25, ch. 9"
AMT = "Aviation Maintenance Technician Handbook, FAA-H-8083-30, ch. 4"

RECT = [[2.0, 600.0], [2.6, 600.0], [2.6, 1100.0], [2.0, 1100.0]]   # invented, arm–mass (m, kg)


# --------------------------------------------------------------------------- handbook examples
def test_weight_shift_handbook_example():
    # PHAK ch. 9 (as quoted in the domain notes): 7,800 lb, CG 81.5 in, aft limit 80.5 in; moving
    # cargo from station 150 to station 30 needs 65 lb (7,800 × 1.0 / 120 = 65 exactly).
    dm = shift_mass(7800.0, 81.5, 80.5, 150.0, 30.0)
    assert_close(dm, 65.0, unit="lb", rtol=1e-12, what="mass to move", source=PHAK)
    # Re-check by applying the move to the items: the airplane less the cargo, plus the cargo
    # at its new station.
    rest = 7800.0 - dm
    rest_arm = (7800.0 * 81.5 - dm * 150.0) / rest
    after = mass_properties([rest, dm], [rest_arm, 30.0])
    assert_close(after.cg.x, 80.5, unit="in", rtol=1e-12, what="CG after the shift", source=PHAK)
    assert_close(cg_after_shift(7800.0, 81.5, dm, 150.0, 30.0), 80.5, unit="in", rtol=1e-12,
                 what="CG after the shift", source=PHAK)
    # The other way round the sign flips: moving aft would need -65 lb, i.e. 65 lb forward.
    assert_close(shift_mass(7800.0, 81.5, 80.5, 30.0, 150.0), -65.0, unit="lb", rtol=1e-12,
                 what="signed mass", source=PHAK)


def test_adding_weight_handbook_example():
    # PHAK ch. 9: 6,860 lb at 80.0 in plus 140 lb at 150 in -> 81.4 in; and via
    # Δm/(M+Δm) = ΔCG/(arm − CG_old): 140/7000 = ΔCG/70 -> ΔCG = 1.4 in.
    assert_close(new_cg_after_change(6860.0, 80.0, 140.0, 150.0), 81.4, unit="in", rtol=1e-12,
                 what="new CG", source=PHAK)
    assert_close(140.0 / 7000.0 * (150.0 - 80.0), 1.4, unit="in", rtol=1e-12, what="ΔCG",
                 source=PHAK)
    # Removing the same 140 lb brings it back.
    assert_close(new_cg_after_change(7000.0, 81.4, -140.0, 150.0), 80.0, unit="in", rtol=1e-12,
                 what="CG after removal", source=PHAK)


def test_ballast_formula():
    # FAA-H-8083-30 ch. 4: ballast = M × (distance out of limits) / (distance from the ballast
    # arm to the limit). Numbers chosen for this test, checked by hand: 1,800 lb at 76.0 in, fwd
    # limit 78.0 in, ballast at 150 in -> 1,800 × 2 / 72 = 50 lb.
    b = ballast_mass(1800.0, 76.0, 78.0, 150.0)
    assert_close(b, 50.0, unit="lb", rtol=1e-12, what="ballast", source=AMT)
    after = mass_properties([1800.0, b], [76.0, 150.0])
    assert_close(after.cg.x, 78.0, unit="in", rtol=1e-12, what="CG with ballast", source=AMT)
    # The shortcut dividing by the distance to the *old* CG gives 1,800 × 2 / 74 = 48.6 lb,
    # which does not reach the limit (the docstring's note).
    shortcut = 1800.0 * 2.0 / (150.0 - 76.0)
    assert shortcut < b
    assert mass_properties([1800.0, shortcut], [76.0, 150.0]).cg.x < 78.0


def test_ballast_aft_and_vectorised():
    # CG aft of an aft limit: ballast forward of the limit. 1,000 kg at 2.70 m, aft limit 2.60 m,
    # ballast at 0.60 m: 1,000 × 0.10 / 2.00 = 50 kg (by hand).
    assert_close(ballast_mass(1000.0, 2.70, 2.60, 0.60), 50.0, unit="kg", rtol=1e-12,
                 what="ballast")
    out = ballast_mass([1000.0, 1800.0], [2.70, 76.0], [2.60, 78.0], [0.60, 150.0])
    np.testing.assert_allclose(out, [50.0, 50.0], rtol=1e-12)
    assert ballast_mass(1000.0, 2.6, 2.6, 2.6) == 0.0


def test_offloads():
    assert offload_for_mass_limit(1240.0, 1200.0) == 40.0
    np.testing.assert_array_equal(offload_for_mass_limit([1150.0, 1200.0, 1240.0], 1200.0),
                                  [0.0, 0.0, 40.0])
    # Removing weight (PHAK ch. 9 relation with Δm < 0): 7,800 lb at 81.5 in, aft limit 80.5 in,
    # offload from station 150: Δm = 7,800 × 1.0 / 69.5 lb; re-checked with mass_properties.
    dm = offload_for_cg_limit(7800.0, 81.5, 80.5, 150.0)
    assert_close(dm, 7800.0 / 69.5, unit="lb", rtol=1e-12, what="offload", source=PHAK)
    rest = 7800.0 - dm
    assert_close((7800.0 * 81.5 - dm * 150.0) / rest, 80.5, unit="in", rtol=1e-12,
                 what="CG after offload", source=PHAK)
    assert offload_for_cg_limit(7800.0, 80.5, 80.5, 150.0) == 0.0


# --------------------------------------------------------------------------- errors (exact text)
@pytest.mark.parametrize(
    "call, message",
    [
        (lambda: ballast_mass(1800.0, 76.0, 78.0, 70.0),
         "ballast_arm = 70: an arm beyond the limit 78 on the side the CG must move to (greater "
         "than 78). Ballast at or short of the limit cannot bring the CG 76 to 78; choose a "
         "station beyond the limit"),
        (lambda: ballast_mass(1800.0, 76.0, 78.0, 77.0),
         "ballast_arm = 77: an arm beyond the limit 78 on the side the CG must move to (greater "
         "than 78). Ballast at or short of the limit cannot bring the CG 76 to 78; choose a "
         "station beyond the limit"),
        (lambda: ballast_mass(1000.0, 2.7, 2.6, 2.6),
         "ballast_arm = 2.6: an arm beyond the limit 2.6 on the side the CG must move to (less "
         "than 2.6). Ballast at or short of the limit cannot bring the CG 2.7 to 2.6; choose a "
         "station beyond the limit"),
        (lambda: ballast_mass([1000.0, 1000.0], 2.7, 2.6, [0.5, 3.0]),
         "ballast_arm[1] = 3: an arm beyond the limit 2.6 on the side the CG must move to (less "
         "than 2.6). Ballast at or short of the limit cannot bring the CG 2.7 to 2.6; choose a "
         "station beyond the limit"),
        (lambda: shift_mass(7800.0, 81.5, 80.5, 150.0, 150.0),
         "arm_to = 150: an arm different from arm_from (150); moving weight within one arm does "
         "not move the CG"),
        (lambda: shift_mass(0.0, 81.5, 80.5, 150.0, 30.0), "total_mass = 0: a finite mass above 0"),
        (lambda: shift_mass(7800.0, float("nan"), 80.5, 150.0, 30.0), "cg = nan: a finite number"),
        (lambda: offload_for_cg_limit(7800.0, 81.5, 80.5, 81.0),
         "station_arm = 81: a station beyond the CG 81.5 on the far side from the limit 80.5 "
         "(greater than 81.5). Removing weight there moves the CG the wrong way or not far "
         "enough; offload from a station further out"),
        (lambda: offload_for_cg_limit(7800.0, 81.5, 80.5, 30.0),
         "station_arm = 30: a station beyond the CG 81.5 on the far side from the limit 80.5 "
         "(greater than 81.5). Removing weight there moves the CG the wrong way or not far "
         "enough; offload from a station further out"),
        (lambda: offload_for_mass_limit(-1.0, 1200.0), "mass = -1: a finite mass of 0 or more"),
        (lambda: offload_for_mass_limit(1.0, 0.0), "limit = 0: a finite mass above 0"),
        (lambda: new_cg_after_change(100.0, 2.0, -100.0, 1.0),
         "delta_mass = -100: a change that leaves some mass (more than -100)"),
        (lambda: max_addable_mass(1200.0, 2.4, 2.5, mass_limit=1100.0, envelope=RECT),
         "total_mass = 1200: at most the mass limit 1100 before adding. Offload 100 first"),
        (lambda: max_addable_mass(800.0, 2.7, 2.5, mass_limit=1100.0, envelope=RECT),
         "cg = 2.7: a state inside the envelope before adding (mass 800). Bring the CG within "
         "limits first (shift weight, ballast or offload)"),
        (lambda: max_addable_mass(800.0, 2.4, 2.5, mass_limit=1100.0, cg_y=0.3, arm_y=0.0,
                                  lateral_envelope=[[-0.1, 600.0], [0.1, 600.0], [0.0, 1200.0]]),
         "cg_y = 0.3: a state inside the lateral envelope before adding (mass 800). Bring the CG "
         "within limits first (shift weight, ballast or offload)"),
        (lambda: max_addable_mass(800.0, 2.4, 2.5, mass_limit=1100.0, cg_y=0.0),
         "arm_y = None: a value: cg_y, arm_y and lateral_envelope go together"),
        (lambda: max_addable_mass(800.0, 2.4, 2.5, mass_limit=1100.0, station_capacity=-5.0),
         "station_capacity = -5: a finite mass of 0 or more"),
    ],
)
def test_error_messages(call, message):
    with pytest.raises(CorrectionError) as info:
        call()
    assert str(info.value) == message
    assert isinstance(info.value, ValueError)


# --------------------------------------------------------------------------- max_addable_mass
def test_max_addable_hand_worked_arm_and_moment_envelopes():
    # Arm–mass rectangle: 800 kg at 2.40 m, station at 3.40 m: (1920 + 3.4 t)/(800 + t) = 2.60
    # -> 0.8 t = 160 -> t = 200 kg (by hand).
    r = max_addable_mass(800.0, 2.4, 3.4, mass_limit=1100.0, envelope=RECT)
    assert isinstance(r, AddableMass) and r.limited_by == "envelope"
    assert_close(r.mass, 200.0, unit="kg", rtol=1e-12, what="addable mass")
    assert_close([r.new_mass, r.new_cg], [1000.0, 2.6], unit="kg / m", rtol=1e-12, what="new state")
    # The same envelope as a moment–mass polygon (moment ÷ 100): the aft line 2.6·mass is
    # (15.6, 600)-(28.6, 1100); the answer must be the same 200 kg.
    moment_env = [[12.0, 600.0], [15.6, 600.0], [28.6, 1100.0], [22.0, 1100.0]]
    r2 = max_addable_mass(800.0, 2.4, 3.4, mass_limit=1100.0, envelope=moment_env,
                          moment_envelope=True, reduction=100.0)
    assert r2.limited_by == "envelope"
    assert_close(r2.mass, 200.0, unit="kg", rtol=1e-12, what="addable mass (moment envelope)")
    # Station within the limits' arms: the mass limit binds.
    r3 = max_addable_mass(800.0, 2.4, 2.5, mass_limit=1100.0, envelope=RECT)
    assert r3.limited_by == "mass limit" and r3.mass == 300.0
    # Station capacity binds first.
    r4 = max_addable_mass(800.0, 2.4, 2.5, mass_limit=1100.0, envelope=RECT, station_capacity=40.0)
    assert (r4.limited_by, r4.mass) == ("station capacity", 40.0)


def test_max_addable_stops_at_the_first_exit_of_a_notched_envelope():
    # A notch from the forward side reaches past 2.30 m between 900 and 950 kg (invented):
    # at x = 2.30 its edges are at 925 - 25 × 0.1/0.4 = 918.75 kg and 950 - 25 × 0.3/0.4 =
    # 931.25 kg (by hand). Mass added at the CG's own arm keeps the CG at 2.30 m: the path is
    # vertical, leaves at 918.75 kg and comes back at 931.25 kg; the final state at 1100 kg is
    # inside, but only 118.75 kg can be added.
    env = [[2.0, 600.0], [2.6, 600.0], [2.6, 1100.0], [2.0, 1100.0], [2.0, 950.0], [2.4, 925.0],
           [2.0, 900.0]]
    assert covers(env, 2.30, 1100.0)
    r = max_addable_mass(800.0, 2.30, 2.30, mass_limit=1100.0, envelope=env)
    assert r.limited_by == "envelope"
    assert_close(r.mass, 118.75, unit="kg", rtol=1e-12, what="addable before the notch")
    assert not path_inside(env, [2.30, 2.30], [800.0, 1100.0]).inside


def test_max_addable_lateral_envelope():
    # Lateral envelope ±0.10 m at every mass (invented); station 0.50 m right of the centreline:
    # 0.5 t / (800 + t) = 0.10 -> 0.4 t = 80 -> t = 200 kg (by hand).
    lateral = [[-0.1, 600.0], [0.1, 600.0], [0.1, 1200.0], [-0.1, 1200.0]]
    r = max_addable_mass(800.0, 2.4, 2.4, mass_limit=1150.0, envelope=RECT, cg_y=0.0, arm_y=0.5,
                         lateral_envelope=lateral)
    assert r.limited_by == "lateral envelope"
    assert_close(r.mass, 200.0, unit="kg", rtol=1e-12, what="addable mass")
    assert_close(r.new_cg_y, 0.1, unit="m", rtol=1e-12, what="new lateral CG")


def _path_states(M, cg, arm, t):
    t = np.asarray(t, dtype=float)
    return (M * cg + t * arm) / (M + t), M + t


@settings(max_examples=60, deadline=None)
@given(st.integers(0, 10_000), st.floats(0.0, 5.0), st.booleans())
def test_max_addable_against_dense_path_sampling(seed, arm, moment):
    # Oracle: the path sampled densely and tested with covers; just beyond the answer (by more
    # than the tolerance band) the state is outside when the envelope is what limits.
    rng = np.random.default_rng(seed)
    k = int(rng.integers(4, 10))
    # Angular gaps below pi: the star contains its centre, the start state.
    ang = (np.arange(k) + rng.uniform(0.0, 0.8, k)) * 2 * np.pi / k
    rad = rng.uniform(0.4, 1.0, k)
    P = np.column_stack([2.3 + 0.3 * rad * np.cos(ang), 900.0 + 300.0 * rad * np.sin(ang)])
    M, cg = 900.0, 2.3
    env = np.column_stack([P[:, 0] * P[:, 1] / 100.0, P[:, 1]]) if moment else P
    try:
        validate_polygon(env)
    except EnvelopeError:
        assume(False)
    assume(covers(env, M * cg / 100.0 if moment else cg, M))
    r = max_addable_mass(M, cg, arm, mass_limit=1250.0, envelope=env, moment_envelope=moment,
                         reduction=100.0)
    t = np.linspace(0.0, r.mass, 2001)
    x, y = _path_states(M, cg, arm, t)
    if moment:
        x = (M * cg + t * arm) / 100.0
    assert covers(env, x, y).all()
    if r.limited_by == "envelope":
        probe = r.mass + 1e-3
        px, py = _path_states(M, cg, arm, probe)
        if moment:
            px = (M * cg + probe * arm) / 100.0
        assert not covers(env, px, py)


# ----------------------------------------------------------------- applied fixes hit the target
masses = st.floats(100.0, 10_000.0)
arms = st.floats(-10.0, 10.0)


@settings(max_examples=100, deadline=None)
@given(masses, arms, arms, arms, arms)
def test_shift_applied_reaches_target(M, cg, target, a_from, a_to):
    assume(abs(a_to - a_from) > 1e-3)
    dm = shift_mass(M, cg, target, a_from, a_to)
    if dm < 0:                      # negative: the move goes the other way
        dm, a_from, a_to = -dm, a_to, a_from
    assume(dm < 0.9 * M)            # there must be that much to move
    # Apply as items: the rest of the vehicle, and the moved mass before and after the move.
    rest, moved = M - dm, dm
    rest_arm = (M * cg - moved * a_from) / rest
    scale = 1e-9 * (1 + abs(cg) + abs(a_from) + abs(a_to)) * 10
    before = mass_properties([rest, moved], [rest_arm, a_from])
    assert_close(before.cg.x, cg, unit="m", atol=scale, what="CG before")
    after = mass_properties([rest, moved], [rest_arm, a_to])
    assert_close(after.cg.x, target, unit="m", atol=scale, what="CG after the shift")


@settings(max_examples=100, deadline=None)
@given(masses, arms, arms, st.floats(0.01, 20.0))
def test_ballast_applied_reaches_limit(M, cg, limit, beyond):
    assume(abs(limit - cg) > 1e-6)
    arm = limit + math.copysign(beyond, limit - cg)
    b = ballast_mass(M, cg, limit, arm)
    assert b > 0
    after = mass_properties([M, b], [cg, arm])
    assert_close(after.cg.x, limit, unit="m", atol=1e-9 * (1 + abs(limit) + abs(arm)), what="CG")


@settings(max_examples=100, deadline=None)
@given(masses, arms, arms, st.floats(0.01, 20.0))
def test_offload_applied_reaches_limit(M, cg, limit, beyond):
    assume(abs(limit - cg) > 1e-6)
    station = cg + math.copysign(beyond, cg - limit)
    dm = offload_for_cg_limit(M, cg, limit, station)
    assert 0 < dm < M
    # Re-check: the body less the offloaded mass.
    rest_cg = (M * cg - dm * station) / (M - dm)
    assert_close(rest_cg, limit, unit="m", atol=1e-8 * (1 + abs(limit) + abs(station)), what="CG")
