"""The ledger's rule (ledger.core.ledger_rule), pure: what one entry does to the running state.

The arithmetic is the one ``ledger.store.chain`` re-checks on every stored row (an absolute
entry's delta is new − previous; any other entry's state is previous + delta), so these tests
hold the rule to that, exactly.
"""

from __future__ import annotations

import datetime as dt

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ledger.core.ledger_rule import (
    EmptyMassNotPositive,
    EntryBeforeBaseline,
    EntryOutOfOrder,
    FirstEntryNotWeighing,
    Moments,
    RunningState,
    apply_entry,
    item_delta,
    leaves_installed,
    reversal_delta,
)

DAY = dt.date(2026, 3, 1)
finite = st.floats(min_value=-1e6, max_value=1e6, allow_nan=False, allow_infinity=False)
mass = st.floats(min_value=1.0, max_value=1e6, allow_nan=False)


def _weighed(m=1000.0, mx=2000.0, my=0.0, mz=None) -> RunningState:
    return apply_entry(RunningState(), "weighing", DAY, Moments(m, mx, my, mz)).after


def test_the_first_entry_is_a_weighing():
    for kind in ("install", "remove", "correction", "cg_height"):
        with pytest.raises(FirstEntryNotWeighing):
            apply_entry(RunningState(), kind, DAY, Moments(1.0, 1.0, 0.0, None))
    first = apply_entry(RunningState(), "weighing", DAY, Moments(1000.0, 2000.0, 0.0, None))
    assert (first.after.seq, first.after.baseline_seq) == (1, 1)
    assert first.delta_mass_kg == 1000.0 and first.after.z_known is False


def test_late_paperwork_is_accepted_in_sequence_with_its_own_date():
    """issue 13 item 15: an entry dated before the newest one was refused ("entries are kept
    in date order"); a change is now accepted after it, in sequence, with its work date."""
    state = _weighed()  # entry 1, weighed on DAY
    later = apply_entry(state, "install", DAY + dt.timedelta(days=9),
                        Moments(1.0, 1.0, 0.0, None)).after
    late = apply_entry(later, "install", DAY + dt.timedelta(days=2),
                       Moments(2.0, 4.0, 0.0, None), baseline_date=DAY)
    assert (late.after.seq, late.after.entry_date) == (3, DAY + dt.timedelta(days=2))
    assert (late.after.mass_kg, late.after.mx_kgm) == (1003.0, 2005.0)
    # equal dates were always fine, and a late change on the weighing's own day too
    apply_entry(later, "remove", DAY, Moments(-1.0, -1.0, 0.0, None), baseline_date=DAY)


def test_a_late_measurement_or_a_change_before_the_weighing_is_refused():
    """issue 13 item 15: a weighing sets the state to what was measured, so one dated before
    a recorded change would drop it; a change dated before the weighing is already in it."""
    state = _weighed()
    later = apply_entry(state, "install", DAY + dt.timedelta(days=9),
                        Moments(1.0, 1.0, 0.0, None)).after
    for kind in ("weighing", "cg_height"):
        with pytest.raises(EntryOutOfOrder) as info:
            apply_entry(later, kind, DAY + dt.timedelta(days=1), Moments(1.0, 1.0, 0.0, None))
        assert (info.value.previous_seq, info.value.previous_date) == \
            (2, DAY + dt.timedelta(days=9))
    with pytest.raises(EntryBeforeBaseline) as before:
        apply_entry(later, "install", DAY - dt.timedelta(days=1), Moments(1.0, 1.0, 0.0, None),
                    baseline_date=DAY)
    assert (before.value.baseline_seq, before.value.baseline_date) == (1, DAY)


def test_the_empty_mass_stays_above_zero():
    state = _weighed(m=10.0, mx=20.0)
    with pytest.raises(EmptyMassNotPositive) as info:
        apply_entry(state, "remove", DAY, item_delta("remove", 10.0, 2.0, 0.0, None))
    assert info.value.mass_kg == 0.0
    with pytest.raises(EmptyMassNotPositive):
        apply_entry(RunningState(), "weighing", DAY, Moments(0.0, 0.0, 0.0, None))


def test_a_weighing_starts_a_baseline_and_other_entries_keep_it():
    state = _weighed()
    state = apply_entry(state, "install", DAY, item_delta("install", 5.0, 3.0, 0.0, 1.0)).after
    assert (state.seq, state.baseline_seq) == (2, 1)
    state = apply_entry(state, "cg_height", DAY, Moments(1005.0, 2015.0, 0.0, 500.0)).after
    assert (state.seq, state.baseline_seq, state.z_known) == (3, 1, True)
    state = apply_entry(state, "weighing", DAY, Moments(990.0, 1980.0, 0.0, None)).after
    assert (state.seq, state.baseline_seq, state.z_known) == (4, 4, False)


def test_the_vertical_cg_is_known_only_while_every_change_has_a_vertical_arm():
    state = _weighed(mz=300.0)
    assert state.z_known
    known = apply_entry(state, "install", DAY, item_delta("install", 5.0, 3.0, 0.0, 1.0))
    assert known.after.z_known and known.after.mz_kgm == 305.0
    lost = apply_entry(known.after, "install", DAY, item_delta("install", 1.0, 3.0, 0.0, None))
    assert not lost.after.z_known and lost.delta_mz_kgm == 0.0
    # Never assumed 0 again: a later change with a vertical arm does not bring it back.
    later = apply_entry(lost.after, "install", DAY, item_delta("install", 1.0, 3.0, 0.0, 2.0))
    assert not later.after.z_known


@settings(max_examples=60, deadline=None)
@given(m0=mass, x0=finite, m=st.floats(min_value=0.0, max_value=1e5), x=finite, y=finite,
       z=st.one_of(st.none(), finite))
def test_totals_follow_exactly(m0, x0, m, x, y, z):
    state = _weighed(m=m0 + 1e5, mx=x0)
    eff = apply_entry(state, "install", DAY, item_delta("install", m, x, y, z))
    after = eff.after
    assert after.mass_kg == state.mass_kg + eff.delta_mass_kg
    assert after.mx_kgm == state.mx_kgm + eff.delta_mx_kgm
    assert after.my_kgm == state.my_kgm + eff.delta_my_kgm
    assert after.mz_kgm == state.mz_kgm + eff.delta_mz_kgm
    # The correction applies the opposite change.
    back = reversal_delta(eff.delta_mass_kg, eff.delta_mx_kgm, eff.delta_my_kgm,
                          eff.delta_mz_kgm, z)
    assert back.mass_kg == -eff.delta_mass_kg and back.mx_kgm == -eff.delta_mx_kgm
    assert back.mz_kgm == (None if z is None else -eff.delta_mz_kgm)


@settings(max_examples=60, deadline=None)
@given(m=mass, mx=finite, my=finite, mz=st.one_of(st.none(), finite))
def test_a_measured_state_is_taken_as_measured(m, mx, my, mz):
    state = apply_entry(_weighed(), "install", DAY, Moments(3.0, 4.0, 0.0, None)).after
    eff = apply_entry(state, "weighing", DAY, Moments(m, mx, my, mz))
    assert (eff.after.mass_kg, eff.after.mx_kgm, eff.after.my_kgm) == (m, mx, my)
    assert eff.after.z_known is (mz is not None)
    assert eff.delta_mass_kg == m - state.mass_kg
    assert eff.columns()["z_known"] in (0, 1)


def test_which_entries_leave_an_item_installed():
    assert leaves_installed("install")
    assert not leaves_installed("remove")
    assert leaves_installed("correction", "remove")
    assert not leaves_installed("correction", "install")
