"""Last-minute changes: is a changed plan within the type's tolerance of the original?

A finished loading sheet may be amended when the change is small: the type data sets how much
mass (``tolerances.last_minute_mass``) and how many persons (``last_minute_persons``) may
change (0 means any change of that kind needs a new sheet). Beyond that, or when anything but
the load changes (vehicle, configuration, envelope category, standard-mass set, burn sequence),
a new sheet is needed. Common practice: a sheet amended several times is measured against the
first sheet of the chain, so small changes cannot add up unseen.

How a change is measured:

- mass: the sum over every seat, station and tank of the absolute change of what it holds,
  plus the absolute change of taxi and trip fuel (moving 20 kg from one station to another
  counts as 40 kg: both stations changed);
- persons: the sum over every seat of the absolute change of the number of people in it.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any, cast

from ledger.loadsheet.document import AmendmentChangeDoc, AmendmentDoc, AmendmentPhaseDoc

__all__ = ["Change", "AmendmentCheck", "compare_plans", "plan_changes", "amendment_doc"]


@dataclass(frozen=True)
class Change:
    """What one seat, station, tank or fuel figure holds before and after."""

    kind: str           # "seat", "station", "tank", "taxi fuel", "trip fuel"
    subject: str
    before_kg: float
    after_kg: float
    persons_before: int = 0
    persons_after: int = 0

    @property
    def mass_change_kg(self) -> float:
        return abs(self.after_kg - self.before_kg)

    @property
    def person_change(self) -> int:
        return abs(self.persons_after - self.persons_before)


@dataclass(frozen=True)
class AmendmentCheck:
    """Result of :func:`compare_plans`."""

    changes: tuple[Change, ...]
    mass_change_kg: float
    person_change: int
    tolerance_mass_kg: float
    tolerance_persons: int
    structural: tuple[str, ...]
    """Changes that always need a new sheet (e.g. "configuration 'a' → 'b'")."""

    @property
    def within(self) -> bool:
        return (not self.structural and bool(self.changes)
                and self.mass_change_kg <= self.tolerance_mass_kg * (1 + 1e-9) + 1e-9
                and self.person_change <= self.tolerance_persons)

    def to_dict(self) -> dict:
        return {"changes": [_change_doc(c) for c in self.changes],
                "mass_change_kg": self.mass_change_kg, "person_change": self.person_change,
                "tolerance_mass_kg": self.tolerance_mass_kg,
                "tolerance_persons": self.tolerance_persons,
                "structural": list(self.structural), "within": self.within}


def _change_doc(c: Change) -> AmendmentChangeDoc:
    return {"kind": c.kind, "subject": c.subject, "before_kg": c.before_kg,
            "after_kg": c.after_kg, "persons_before": c.persons_before,
            "persons_after": c.persons_after}


def _by(items, key, mass) -> dict[str, list[float]]:
    out: dict[str, list[float]] = {}
    for it in items:
        out.setdefault(key(it), []).append(mass(it))
    return out


def compare_plans(original, amended, tolerances) -> AmendmentCheck:
    """Measure the change from ``original`` to ``amended`` (both :class:`ledger.typedata.plan.
    Plan`) against ``tolerances`` (:class:`ledger.typedata.model.Tolerances`).

    Examples
    --------
    >>> from ledger.typedata.plan import Plan, Person, CargoLoad
    >>> from ledger.typedata.model import Tolerances
    >>> a = Plan("X", persons=(Person("pilot", 80.0),), cargo=(CargoLoad("hold", 20.0),))
    >>> b = Plan("X", persons=(Person("pilot", 80.0),), cargo=(CargoLoad("hold", 28.0),))
    >>> r = compare_plans(a, b, Tolerances(last_minute_mass_kg=10.0))
    >>> r.mass_change_kg, r.person_change, r.within
    (8.0, 0, True)
    >>> compare_plans(a, b, Tolerances(last_minute_mass_kg=5.0)).within
    False
    """
    changes, structural = plan_changes(original, amended)
    return AmendmentCheck(
        changes=tuple(changes),
        mass_change_kg=math.fsum(c.mass_change_kg for c in changes),
        person_change=sum(c.person_change for c in changes),
        tolerance_mass_kg=tolerances.last_minute_mass_kg,
        tolerance_persons=tolerances.last_minute_persons,
        structural=tuple(structural))


def plan_changes(original, amended) -> tuple[list[Change], list[str]]:
    """What each seat, station, tank and fuel figure holds before and after, and the changes
    that always need a new sheet (as :func:`compare_plans` measures them)."""
    structural = []
    for attr, label in (("vehicle", "vehicle"), ("configuration", "configuration"),
                        ("category", "envelope category"),
                        ("standard_masses", "standard-mass set"),
                        ("burn_sequence", "burn sequence"), ("burn_order", "burn order")):
        a, b = getattr(original, attr), getattr(amended, attr)
        if a != b:
            structural.append(f"{label} {a!r} -> {b!r}")
    changes: list[Change] = []
    seats_a = _by(original.persons, lambda p: p.seat, lambda p: p.mass_kg)
    seats_b = _by(amended.persons, lambda p: p.seat, lambda p: p.mass_kg)
    for seat in sorted(set(seats_a) | set(seats_b)):
        la, lb = seats_a.get(seat, []), seats_b.get(seat, [])
        if sorted(la) != sorted(lb):
            changes.append(Change("seat", seat, math.fsum(la), math.fsum(lb), len(la), len(lb)))
    st_a = _by(original.cargo, lambda c: c.station, lambda c: c.mass_kg)
    st_b = _by(amended.cargo, lambda c: c.station, lambda c: c.mass_kg)
    for st in sorted(set(st_a) | set(st_b)):
        ma, mb = math.fsum(st_a.get(st, [])), math.fsum(st_b.get(st, []))
        xa = sorted((c.x_m or 0.0) for c in original.cargo if c.station == st)
        xb = sorted((c.x_m or 0.0) for c in amended.cargo if c.station == st)
        if not math.isclose(ma, mb, rel_tol=1e-12, abs_tol=1e-9):
            changes.append(Change("station", st, ma, mb))
        elif xa != xb:
            structural.append(f"load placed differently in station {st!r}")
    tk_a = {t.tank: t.mass_kg for t in original.tanks}
    tk_b = {t.tank: t.mass_kg for t in amended.tanks}
    for tank in sorted(set(tk_a) | set(tk_b)):
        ma, mb = tk_a.get(tank, 0.0), tk_b.get(tank, 0.0)
        if not math.isclose(ma, mb, rel_tol=1e-12, abs_tol=1e-9):
            changes.append(Change("tank", tank, ma, mb))
    for attr, label in (("taxi_fuel_kg", "taxi fuel"), ("trip_fuel_kg", "trip fuel")):
        a, b = getattr(original, attr), getattr(amended, attr)
        if not math.isclose(a, b, rel_tol=1e-12, abs_tol=1e-9):
            changes.append(Change(label, label, a, b))
    return changes, structural


def amendment_doc(check: AmendmentCheck, *, of: int, first_sheet: int, before_plan,
                  after_plan, before: Mapping[str, Any], after: Mapping[str, Any],
                  ) -> AmendmentDoc:
    """The document's ``amendment``: the tolerance check against the first sheet of the chain
    (``check``), and the ``differences`` from the sheet it amends (sheet ``of``, whose plan is
    ``before_plan`` and document ``before``): the load, fuel and people changed, and each
    phase's mass and CG before and after (issue 13 item 4)."""
    changes, _ = plan_changes(before_plan, after_plan)
    was = {p["name"]: p for p in before.get("phases") or []}
    phases: list[AmendmentPhaseDoc] = []
    for p in after.get("phases") or []:
        old = was.get(p["name"])
        if old is None:
            continue
        phases.append({"name": p["name"], "mass_before_kg": old["mass_kg"],
                       "mass_after_kg": p["mass_kg"], "cg_before_m": old["cg_m"],
                       "cg_after_m": p["cg_m"]})
    doc = cast(AmendmentDoc, {"of": of, "first_sheet": first_sheet, **check.to_dict()})
    doc["differences"] = {"from_sheet": of, "changes": [_change_doc(c) for c in changes],
                          "phases": phases}
    return doc
