"""The ledger's rule: what one entry does to a vehicle's running empty state. Pure.

A vehicle's ledger is a sequence of entries; after each, the running empty state (mass and
moments about the datum) is stored with it. This module is the one place that says how an entry
moves that state, so that appending one entry (``ledger.store.entries``) and importing many
(``ledger.store.transfer``) cannot drift apart; ``ledger.store.chain`` re-checks stored rows
against the same arithmetic.

- **Absolute kinds** (a weighing, a measured CG height) set the running state to what was
  measured; their delta is ``new − previous``. The vertical moment is known when measured.
- **Other kinds** (installation, removal, correction) add a delta; the vertical CG stays known
  only while every delta since has a known vertical moment (never assumed 0).
- The first entry of a vehicle is a weighing; the empty mass stays above 0; a weighing starts
  a new baseline.
- Entries are ordered by their sequence number, the order they were recorded in; each keeps
  the date of the work as given. Late paperwork is normal (issue 13 item 15): a change
  (installation, removal, correction) dated before the newest entry is accepted, as long as it
  is not dated before the weighing the running state starts from (that weighing already
  measured anything done before it). A measurement (weighing, CG height) sets the state to what
  was measured, so it is never dated before the newest entry: it would drop the changes
  recorded since.
- An item is installed by an installation, or by a correction that reverses a removal.

Negligible changes (AC 43.13-1B CHG 1, §10-2c): a change of empty weight of 1 lb or less for an
aircraft whose empty weight is under 5,000 lb, 2 lb or less from 5,000 to 50,000 lb, 5 lb or less
above 50,000 lb, together with a CG change under 0.05 % MAC (fixed wing) or under 0.2 % of the
maximum allowable CG range (rotary wing). An empty weight of exactly 5,000 lb is put in the
2 lb band (the circular leaves it open). Types without a MAC (fixed wing), drones and ground
vehicles are not assessed.
"""

from __future__ import annotations

import datetime as dt
from typing import Any, NamedTuple

from ledger.errors import LedgerError

__all__ = [
    "ABSOLUTE_KINDS",
    "RunningState",
    "Moments",
    "EntryEffect",
    "LedgerRuleError",
    "FirstEntryNotWeighing",
    "EntryOutOfOrder",
    "EntryBeforeBaseline",
    "EmptyMassNotPositive",
    "check_first",
    "check_date",
    "is_late",
    "apply_entry",
    "item_delta",
    "reversal_delta",
    "leaves_installed",
    "negligible_change",
]

#: 1 lb in kg, exact (NIST SP 811, appendix B). Not imported from ledger.core.fuel, which
#: loads numpy: the append path does not need it.
LB = 0.45359237

#: Kinds whose running state is measured (set absolutely) rather than added to the previous
#: state: their delta is ``state − previous state``.
ABSOLUTE_KINDS = frozenset({"weighing", "cg_height"})


class RunningState(NamedTuple):
    """The running empty state after a vehicle's newest entry; ``seq`` 0 when it has none.

    Masses kg, moments kg·m; ``mz_kgm`` means something only when ``z_known``. Immutable; a
    named tuple rather than a frozen dataclass because a bulk import makes one per entry and a
    frozen dataclass costs several times as much to build.
    """

    seq: int = 0
    entry_date: dt.date | None = None
    mass_kg: float = 0.0
    mx_kgm: float = 0.0
    my_kgm: float = 0.0
    mz_kgm: float = 0.0
    z_known: bool = False
    baseline_seq: int | None = None


class Moments(NamedTuple):
    """Mass and first moments (kg, kg·m); ``mz_kgm`` None when the vertical arm is unknown.

    For an absolute kind it is the measured state, for the others the change.
    """

    mass_kg: float
    mx_kgm: float
    my_kgm: float
    mz_kgm: float | None


class EntryEffect(NamedTuple):
    """What one entry does: its number, its change and the running state after it.

    A named tuple, as :class:`RunningState` is (one per entry of a bulk import).
    """

    kind: str
    delta_mass_kg: float
    delta_mx_kgm: float
    delta_my_kgm: float
    delta_mz_kgm: float
    after: RunningState

    def columns(self) -> dict[str, Any]:
        """The stored columns the rule decides (``z_known`` as the 0/1 the table keeps)."""
        a = self.after
        return {
            "seq": a.seq,
            "delta_mass_kg": self.delta_mass_kg, "delta_mx_kgm": self.delta_mx_kgm,
            "delta_my_kgm": self.delta_my_kgm, "delta_mz_kgm": self.delta_mz_kgm,
            "empty_mass_kg": a.mass_kg, "empty_mx_kgm": a.mx_kgm, "empty_my_kgm": a.my_kgm,
            "empty_mz_kgm": a.mz_kgm, "z_known": int(a.z_known), "baseline_seq": a.baseline_seq,
        }


class LedgerRuleError(LedgerError):
    """An entry the ledger's rule refuses; callers word it for where the entry came from."""


class FirstEntryNotWeighing(LedgerRuleError):
    """The vehicle has no entry yet and this one is not a weighing."""

    def __init__(self, kind: str) -> None:
        super().__init__(kind)
        self.kind = kind


class EntryOutOfOrder(LedgerRuleError):
    """A measurement (weighing, CG height) dated before the vehicle's newest entry."""

    def __init__(self, previous_seq: int, previous_date: dt.date) -> None:
        super().__init__(previous_seq, previous_date)
        self.previous_seq = previous_seq
        self.previous_date = previous_date


class EntryBeforeBaseline(LedgerRuleError):
    """A change dated before the weighing the running state starts from."""

    def __init__(self, baseline_seq: int, baseline_date: dt.date) -> None:
        super().__init__(baseline_seq, baseline_date)
        self.baseline_seq = baseline_seq
        self.baseline_date = baseline_date


class EmptyMassNotPositive(LedgerRuleError):
    """The entry would leave the empty mass at 0 or below."""

    def __init__(self, kind: str, mass_kg: float) -> None:
        super().__init__(kind, mass_kg)
        self.kind = kind
        self.mass_kg = mass_kg


def _f(value: float) -> float:
    # A plain float (not a numpy scalar, which hashes and stores differently), and never -0.0.
    return float(value) + 0.0


def check_first(state: RunningState, kind: str) -> None:
    """Refuse anything but a weighing as a vehicle's first entry."""
    if state.seq == 0 and kind != "weighing":
        raise FirstEntryNotWeighing(kind)


def is_late(state: RunningState, day: dt.date) -> bool:
    """Whether an entry dated ``day`` is dated before the vehicle's newest entry: only then
    does :func:`check_date` need the date of the baseline weighing."""
    return state.entry_date is not None and day < state.entry_date


def check_date(state: RunningState, kind: str, day: dt.date,
               baseline_date: dt.date | None = None) -> None:
    """Refuse a measurement dated before the newest entry, and a change dated before the
    baseline weighing (``baseline_date``, the date of entry ``state.baseline_seq``; needed
    only when :func:`is_late`). A later or equal date is always accepted."""
    if not is_late(state, day):
        return
    if kind in ABSOLUTE_KINDS:
        assert state.entry_date is not None  # is_late
        raise EntryOutOfOrder(state.seq, state.entry_date)
    if baseline_date is not None and day < baseline_date:
        assert state.baseline_seq is not None  # a vehicle with entries has a baseline
        raise EntryBeforeBaseline(state.baseline_seq, baseline_date)


def apply_entry(state: RunningState, kind: str, day: dt.date, values: Moments, *,
                baseline_date: dt.date | None = None) -> EntryEffect:
    """The effect of an entry of ``kind`` dated ``day`` on the running ``state``.

    ``values`` is the measured state for an absolute kind (:data:`ABSOLUTE_KINDS`), else the
    change. Returns the entry's change and the state after it (``effect.after``), whose
    ``entry_date`` is ``day`` as given, even when it is before the previous entry's (late
    paperwork; ``baseline_date`` as in :func:`check_date`).

    Raises
    ------
    FirstEntryNotWeighing, EntryOutOfOrder, EntryBeforeBaseline, EmptyMassNotPositive
        The entry breaks the rule; nothing is computed.

    Examples
    --------
    >>> import datetime as dt
    >>> day = dt.date(2026, 3, 1)
    >>> w = apply_entry(RunningState(), "weighing", day, Moments(1000.0, 2000.0, 0.0, None))
    >>> (w.after.seq, w.after.baseline_seq, w.after.z_known)
    (1, 1, False)
    >>> i = apply_entry(w.after, "install", day, Moments(10.0, 30.0, 0.0, 5.0))
    >>> (i.after.mass_kg, i.after.mx_kgm, i.after.baseline_seq, i.after.z_known)
    (1010.0, 2030.0, 1, False)
    """
    check_first(state, kind)
    check_date(state, kind, day, baseline_date)
    seq = state.seq + 1
    if kind in ABSOLUTE_KINDS:
        m, mx, my = _f(values.mass_kg), _f(values.mx_kgm), _f(values.my_kgm)
        z_known = values.mz_kgm is not None
        mz = 0.0 if values.mz_kgm is None else _f(values.mz_kgm)
        dm, dmx, dmy = m - state.mass_kg, mx - state.mx_kgm, my - state.my_kgm
        dmz = mz - state.mz_kgm
    else:
        dm, dmx, dmy = _f(values.mass_kg), _f(values.mx_kgm), _f(values.my_kgm)
        z_known = state.z_known and values.mz_kgm is not None
        dmz = 0.0 if values.mz_kgm is None else _f(values.mz_kgm)
        m, mx, my = state.mass_kg + dm, state.mx_kgm + dmx, state.my_kgm + dmy
        mz = state.mz_kgm + dmz
    if not m > 0:
        raise EmptyMassNotPositive(kind, m)
    after = RunningState(seq, day, m, mx, my, mz, z_known,
                         seq if kind == "weighing" else state.baseline_seq)
    return EntryEffect(kind, dm, dmx, dmy, dmz, after)


def item_delta(kind: str, mass_kg: float, x_m: float, y_m: float,
               z_m: float | None) -> Moments:
    """The change an installation (adds) or a removal (takes away) of an item makes.

    Examples
    --------
    >>> item_delta("remove", 2.0, 3.0, 0.5, None)
    Moments(mass_kg=-2.0, mx_kgm=-6.0, my_kgm=-1.0, mz_kgm=None)
    """
    m = mass_kg if kind == "install" else -mass_kg
    return Moments(m, m * x_m, m * y_m, None if z_m is None else m * z_m)


def reversal_delta(dm: float, dmx: float, dmy: float, dmz: float,
                   item_z_m: float | None) -> Moments:
    """The change of a correction: the opposite of the reversed entry's change (its vertical
    part unknown when the item's vertical arm was)."""
    return Moments(-dm, -dmx, -dmy, None if item_z_m is None else -dmz)


def leaves_installed(kind: str, reverses_kind: str | None = None) -> bool:
    """Whether an entry of ``kind`` that names an item leaves that item installed (a
    correction does when it reverses a removal)."""
    if kind == "install":
        return True
    return kind == "correction" and reverses_kind == "remove"


# --- the negligible-change rule -------------------------------------------------------------

def _cg_range_m(vtype: Any) -> float | None:
    xs = []
    for env in vtype.envelopes_for("longitudinal"):
        for cg, mass in env.points:
            xs.append(cg if env.coordinates == "arm" else cg / mass)
    return (max(xs) - min(xs)) if len(xs) >= 2 else None


def negligible_change(vtype: Any, before_mass_kg: float, before_cg_x_m: float,
                      after_mass_kg: float, after_cg_x_m: float) -> tuple[bool | None, str]:
    """Whether a change of the empty vehicle is negligible under AC 43.13-1B §10-2c.

    Returns ``(verdict, why)``: ``verdict`` is None when the rule does not apply to this type.

    Examples
    --------
    >>> from types import SimpleNamespace as NS
    >>> plane = NS(kind="airplane", mac=NS(length_m=1.5), envelopes_for=lambda axis: ())
    >>> negligible_change(plane, 1000.0, 2.0, 1000.0 + 0.45359237, 2.0)[0]
    True
    >>> negligible_change(plane, 1000.0, 2.0, 1000.5, 2.0)[0]
    False
    """
    before_lb = before_mass_kg / LB
    limit_lb = 1.0 if before_lb < 5000.0 else 2.0 if before_lb <= 50000.0 else 5.0
    dm = abs(after_mass_kg - before_mass_kg)
    dcg = abs(after_cg_x_m - before_cg_x_m)
    # 1e-9 kg of slack absorbs the rounding of a difference of two large totals.
    mass_ok = dm <= limit_lb * LB + 1e-9
    if vtype.kind == "airplane":
        if vtype.mac is None:
            return None, "not assessed: the type has no MAC"
        cg_limit = 0.0005 * vtype.mac.length_m
        cg_text = "0.05 % MAC"
    elif vtype.kind == "helicopter":
        rng = _cg_range_m(vtype)
        if rng is None:
            return None, "not assessed: the type has no longitudinal CG range"
        cg_limit = 0.002 * rng
        cg_text = "0.2 % of the CG range"
    else:
        return None, "not assessed: AC 43.13-1B §10-2c covers airplanes and rotorcraft"
    cg_ok = dcg < cg_limit
    verdict = mass_ok and cg_ok
    why = (f"{'within' if mass_ok else 'beyond'} {limit_lb:g} lb and "
           f"{'under' if cg_ok else 'not under'} {cg_text} (AC 43.13-1B §10-2c)")
    return verdict, why
