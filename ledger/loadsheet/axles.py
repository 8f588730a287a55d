"""Ground vehicles on a loading sheet: axle and wheel-side loads, ratings, axle-group rules.

Pure. The loads come from :func:`ledger.core.ground.axle_loads` (statics of a rigid vehicle on
two supports; an axle group shares its support's load in the type's load-sharing ratios), the
rating check from :func:`ledger.core.ground.check_axle_ratings`, the advisory rules from
:func:`ledger.core.ground.check_axle_groups` with a rule set named by the plan (for example
``"us-interstate"``, 23 CFR 658.17). Rule findings are advisory: they never change the verdict,
and the sheet carries :data:`ledger.caution.GROUND_CAUTION` with them.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from typing import TYPE_CHECKING, Any, NamedTuple, cast

import numpy as np

from ledger.caution import GROUND_CAUTION
from ledger.core.ground import (
    ADVISORY,
    AxleLoads,
    RuleSet,
    axle_loads,
    check_axle_groups,
    check_axle_ratings,
)
from ledger.errors import InputError, LedgerError, PlanError, TypeDataError
from ledger.loadsheet.document import (
    AxleFinding,
    AxleGroupRow,
    AxleRow,
    AxleRuleSetDoc,
    PhaseDoc,
    Violation,
)
from ledger.loadsheet.text import excess_text, mass_text, phase_title
from ledger.rules import load_rule_set

if TYPE_CHECKING:
    from ledger.typedata.model import Axle, VehicleType

__all__ = ["supports", "axle_checks"]


def supports(vtype: VehicleType,
             ) -> tuple[list[Axle], list[list[int]] | None, list[list[float]] | None]:
    """(axles sorted front to rear, groups for ``axle_loads`` or None, shares or None).

    Axles of one axle group form one support; the others are one support each. A rigid vehicle
    on more than two supports is statically indeterminate, so the type must group its axles
    into two.
    """
    axles = sorted(vtype.axles, key=lambda a: a.x_m)
    if len(axles) < 2:
        raise TypeDataError("axle", len(axles), f"at least two axles for a ground vehicle; "
                            f"type {vtype.name} has {len(axles)}")
    index = {a.name: i for i, a in enumerate(axles)}
    units: list[list[int]] = []
    shares: list[list[float]] = []
    seen: set[str] = set()
    for a in axles:
        if a.name in seen:
            continue
        group = next((g for g in vtype.axle_groups if a.name in g.axles), None)
        if group is None:
            units.append([index[a.name]])
            shares.append([1.0])
            seen.add(a.name)
            continue
        members = sorted(group.axles, key=lambda n: index[n])
        share = {n: s for n, s in zip(group.axles, group.load_share)}
        units.append([index[n] for n in members])
        shares.append([share[n] for n in members])
        seen.update(members)
    if len(units) != 2:
        raise TypeDataError("axle_group", [a.name for a in axles],
                            f"axles grouped into two supports (front and rear); type "
                            f"{vtype.name} has {len(units)}, which is statically indeterminate")
    if len(axles) == 2:
        return axles, None, None
    return axles, units, shares


class _Supports(NamedTuple):
    """The type's axles front to rear, as :func:`ledger.core.ground.axle_loads` takes them."""

    axles: list[Axle]
    x: np.ndarray
    groups: list[list[int]] | None
    shares: list[list[float]] | None
    ratings: np.ndarray
    track: list[float] | None


def _supports_of(vtype: VehicleType) -> _Supports:
    axles, groups, shares = supports(vtype)
    tracks = [a.track_m for a in axles]
    return _Supports(axles, np.array([a.x_m for a in axles]), groups, shares,
                     np.array([a.rating_kg if a.rating_kg is not None else math.nan
                               for a in axles]),
                     [t for t in tracks if t is not None] if all(t is not None for t in tracks)
                     else None)


def _rule_set(rule_name: str | None, rules: RuleSet | None) -> RuleSet | None:
    """The rule set given, or the one ``rule_name`` names (an error on the plan's field)."""
    if rules is None and rule_name is not None:
        try:
            rules = load_rule_set(rule_name).rule_set()
        except LedgerError as exc:  # re-located on the plan field
            raise PlanError("axle_rules", rule_name, getattr(exc, "allowed", str(exc))) \
                from None
    return rules


def _phase_loads(sup: _Supports, phase: PhaseDoc, mass: float) -> AxleLoads:
    cg = phase["cg_m"]
    try:
        return axle_loads(mass, cast(float, cg["x"]), sup.x, cg_y=cg["y"] or 0.0, track=sup.track,
                          groups=sup.groups, shares=sup.shares)
    except InputError as exc:
        raise PlanError("plan", phase_title(phase["name"]),
                        f"a load the vehicle can stand on ({exc})",
                        hint="The CG lies outside the axles or the track; "
                             "redistribute the load") from None


def _axle_rows(vtype: VehicleType, sup: _Supports, name: str, loads: AxleLoads,
               violations: list[Violation]) -> list[AxleRow]:
    """One phase's load on each axle against its rating."""
    du = vtype.units
    check = check_axle_ratings(loads.axle, sup.ratings)
    rows: list[AxleRow] = []
    for i, a in enumerate(sup.axles):
        margin = None if math.isnan(check.margin[i]) else float(check.margin[i])
        ok = not bool(check.over[i])
        rows.append({"phase": name, "name": a.name, "x_m": a.x_m,
                     "load_kg": float(loads.axle[i]), "rating_kg": a.rating_kg,
                     "margin_kg": margin,
                     "left_kg": None if loads.left is None else float(loads.left[i]),
                     "right_kg": None if loads.right is None else float(loads.right[i]),
                     "in_limits": ok})
        if not ok:
            assert margin is not None  # an axle over its rating has one
            violations.append({
                "code": "axle", "phase": name, "axle": a.name,
                "subject": f"axle '{a.name}'", "limit": a.rating_kg,
                "actual": float(loads.axle[i]), "excess": -margin, "unit": "kg",
                "message": f"{phase_title(name)} load on axle '{a.name}' "
                           f"{mass_text(loads.axle[i], du)} is over its rating "
                           f"{mass_text(a.rating_kg, du)} by "
                           f"{excess_text(mass_text, -margin, du)}"})
    return rows


def _group_rows(vtype: VehicleType, sup: _Supports, name: str, loads: AxleLoads,
                violations: list[Violation]) -> list[AxleGroupRow]:
    """One phase's load on each axle group (the sum over its axles) against its rating."""
    du = vtype.units
    rows: list[AxleGroupRow] = []
    for g in vtype.axle_groups:
        idx = [i for i, a in enumerate(sup.axles) if a.name in g.axles]
        load = float(loads.axle[idx].sum())
        over = g.rating_kg is not None and load > g.rating_kg * (1 + 1e-9)
        rows.append({"phase": name, "name": g.name,
                     "axles": [sup.axles[i].name for i in idx], "load_kg": load,
                     "rating_kg": g.rating_kg,
                     "margin_kg": None if g.rating_kg is None else g.rating_kg - load,
                     "in_limits": not over})
        if over:
            assert g.rating_kg is not None  # only a rated group can be over
            violations.append({
                "code": "axle", "phase": name, "axle": g.name,
                "subject": f"axle group '{g.name}'", "limit": g.rating_kg, "actual": load,
                "excess": load - g.rating_kg, "unit": "kg",
                "message": f"{phase_title(name)} load on axle group '{g.name}' "
                           f"{mass_text(load, du)} is over its rating "
                           f"{mass_text(g.rating_kg, du)} by "
                           f"{excess_text(mass_text, load - g.rating_kg, du)}"})
    return rows


def axle_checks(vtype: VehicleType, phases: list[PhaseDoc], states: Mapping[str, Any],
                rule_name: str | None, violations: list[Violation], rules: RuleSet | None = None,
                ) -> tuple[list[AxleRow] | None, list[AxleFinding] | None,
                           AxleRuleSetDoc | None]:
    """Axle loads per phase (added to each phase as ``axles``), violations, advisories.

    ``rules`` is a :class:`ledger.core.ground.RuleSet`; without it a ``rule_name`` is looked up
    with :func:`ledger.rules.load_rule_set` (the shipped rule files and the user's own).

    Returns
    -------
    (list, list or None, dict or None)
        The departure axle rows (the document's ``axles``), the advisory findings
        (``axle_rules``) and the rule set description (``axle_rule_set``).
    """
    sup = _supports_of(vtype)
    rules = _rule_set(rule_name, rules)
    top_rows = None
    reported: set[tuple[str, tuple[int, ...]]] = set()
    findings: list[AxleFinding] = []
    for phase in phases:
        name = phase["name"]
        loads = _phase_loads(sup, phase, states[name].mass)
        rows = _axle_rows(vtype, sup, name, loads, violations)
        phase["axles"] = rows
        if vtype.axle_groups:
            phase["axle_groups"] = _group_rows(vtype, sup, name, loads, violations)
        phase["in_limits"] = phase["in_limits"] and all(r["in_limits"] for r in rows) and \
            not any(v.get("phase") == name for v in violations)
        if top_rows is None:
            top_rows = rows
        if rules is not None:
            for f in check_axle_groups(rules, sup.x, loads.axle):
                key = (f.rule, tuple(f.axles))
                if name != phases[0]["name"] and (f.ok or key in reported):
                    continue  # later phases add only what is newly over
                if not f.ok:
                    reported.add(key)
                findings.append({
                    "phase": name, "rule": f.rule, "axles": list(f.axles),
                    "axle_names": [sup.axles[i].name for i in f.axles], "load_kg": f.load,
                    "limit_kg": f.limit, "margin_kg": f.margin, "ok": bool(f.ok),
                    "detail": f.detail, "text": f.text})
    if rules is None:
        return top_rows, None, None
    rule_doc: AxleRuleSetDoc = {"key": rule_name, "name": rules.name, "source": rules.source,
                                "advisory": ADVISORY, "caution": GROUND_CAUTION}
    return top_rows, findings, rule_doc
