"""Build the loading-sheet document (``wbledger.sheet/1``) from a type, an empty weight and a plan.

Pure: numbers in, a JSON-able dict out; no database, no terminal, no files. The document's
layout is described in ``docs/sheet-document.md``.

What is computed
----------------
Aircraft: four phases. Zero-fuel = empty weight + configuration + people + cargo; ramp = that
+ the usable fuel loaded; take-off = ramp − taxi fuel; landing = take-off − trip fuel, the fuel
drawn in the plan's burn sequence (:func:`ledger.core.fuel.burn_states`). Each phase has its
mass, CG per axis, moments, moment index and %MAC. Checked:

- each phase's mass limit (maximum zero-fuel, ramp, take-off and landing mass; minimum flight
  mass at take-off and landing);
- every station limit (seats and compartments), the floor loading of a compartment, and every
  tank's usable capacity;
- every envelope of the chosen category, per axis, at zero-fuel, take-off and landing (the ramp
  is a ground phase: its mass limit is checked, not the flight envelope);
- the fuel-burn path from take-off to landing as a whole
  (:func:`ledger.core.envelope.path_inside` over the burn states), so a non-convex envelope
  that the path leaves between its end points is caught.

Ground vehicles: two phases, departure (everything aboard) and arrival (after taxi and trip
fuel), each checked against the gross vehicle rating, with the load on every axle and wheel side
(:func:`ledger.core.ground.axle_loads`) against the axle and axle-group ratings; axle-group
rules of a named rule set (:mod:`ledger.core.ground`) are shown as an advisory.

Limits are inclusive: a CG exactly on an envelope edge, or a mass exactly at its limit, is in
limits. When anything is out of limits, :mod:`ledger.loadsheet.fixes` proposes changes, each
re-checked by building the sheet again with the change applied.
"""

from __future__ import annotations

import datetime as dt
import math
from collections.abc import Iterable
from typing import TYPE_CHECKING, Any, NamedTuple

from ledger.caution import CAUTION, GROUND_CAUTION
from ledger.core.massprops import moment_index
from ledger.errors import PlanError
from ledger.loadsheet.axles import axle_checks
from ledger.loadsheet.burnpath import burn_path
from ledger.loadsheet.checks import (
    envelope_result,
    envelopes_of,
    mass_checks,
    station_checks,
    tank_checks,
)
from ledger.loadsheet.document import (
    AIRCRAFT_PHASES,
    ENVELOPE_PHASES,
    GROUND_PHASES,
    SCHEMA,
    ConfigurationItemDoc,
    EmptyWeightDoc,
    EnvelopePolygon,
    ItemDoc,
    PhaseDoc,
    SheetDocument,
    StandardMassesDoc,
    UnitsDoc,
    Vector,
    VehicleDoc,
    Violation,
)
from ledger.loadsheet.fixes import find_fixes
from ledger.loadsheet.fuel import FuelStates, fuel_doc, fuel_states
from ledger.loadsheet.inputs import (
    ConfigurationItem,
    EmptyWeight,
    MassState,
    attr,
    config_items,
    empty_mass_state,
    iso_date,
    load_items,
)
from ledger.loadsheet.text import phase_title
from ledger.units import to_unit

if TYPE_CHECKING:
    from ledger.typedata.model import Envelope, VehicleType
    from ledger.typedata.plan import Plan

__all__ = [
    "SCHEMA",
    "EmptyWeight",
    "ConfigurationItem",
    "build_sheet",
    "AIRCRAFT_PHASES",
    "GROUND_PHASES",
    "ENVELOPE_PHASES",
]


# --- the load, phase by phase -------------------------------------------------------------------

class _Loading(NamedTuple):
    """Every state the sheet shows, before any limit is checked."""

    empty: MassState
    configuration: str | None
    configuration_items: list[ConfigurationItemDoc]
    items: list[ItemDoc]
    fuel: FuelStates
    zero_fuel: MassState
    phases: dict[str, MassState]     # by phase name, in the order the sheet shows them
    z_known: bool


def _load(vtype: VehicleType, empty: Any, plan: Plan,
          configuration_items: Iterable[Any] | None, samples: int) -> _Loading:
    """Empty weight + configuration + people and cargo (+ other tanks) = zero fuel; + fuel."""
    ground = vtype.kind == "ground_vehicle"
    empty_st = empty_mass_state(empty)
    base = empty_st
    cfg_name, cfg_items = config_items(vtype, plan, configuration_items)
    for it in cfg_items:
        base = base.plus(it["signed_mass_kg"], it["x_m"], it["y_m"], it["z_m"])
    if base.mass <= 0:
        raise PlanError("configuration", cfg_name, "a configuration that leaves a positive "
                        "empty mass")
    items = load_items(vtype, plan)
    zf = base
    for item in items:
        zf = zf.plus(item["mass_kg"], item["x_m"], item["y_m"], item["z_m"])
    fuel = fuel_states(vtype, plan, samples)
    for t, ld in fuel.other:
        x, y, z = t.arms_at(t.unusable + (ld.volume_m3 if t.basis == "volume" else ld.mass_kg))
        zf = zf.plus(ld.mass_kg, x, y, z)
        items.append({"station": t.name, "kind": "tank", "label": t.fluid,
                      "mass_kg": ld.mass_kg, "x_m": x, "y_m": y, "z_m": z,
                      "moment_x_kgm": ld.mass_kg * x, "max_mass_kg": None,
                      "mass_source": ld.density_source, "occupant_class": None})
    z_known = zf.mz is not None and fuel.z_known

    def with_fuel(mass: Any, moment: Any) -> MassState:
        mz = None if zf.mz is None else zf.mz + float(moment[2])
        return MassState(zf.mass + float(mass), zf.mx + float(moment[0]),
                         zf.my + float(moment[1]), mz)

    ramp = with_fuel(fuel.ramp.sum(), fuel.ramp_moment)
    takeoff = with_fuel(fuel.takeoff.sum(), fuel.takeoff_moment)
    landing = with_fuel(fuel.landing.sum(), fuel.landing_moment)
    if ground:
        states = {"departure": ramp, "arrival": landing}
    else:
        states = {"zero_fuel": zf, "ramp": ramp, "takeoff": takeoff, "landing": landing}
    return _Loading(empty_st, cfg_name, cfg_items, items, fuel, zf, states, z_known)


def _phase_doc(vtype: VehicleType, name: str, st: MassState, violations: list[Violation],
               envs: list[Envelope], z_known: bool) -> PhaseDoc:
    du = vtype.units
    cg = st.cg()
    if not z_known:
        cg["z"] = None
    moments: Vector = {"x": st.mx, "y": st.my, "z": st.mz if z_known else None}
    limit, margin = mass_checks(vtype, name, st.mass, violations)
    index = moment_index(to_unit(st.mx, du.moment_unit), du.moment_divisor)
    pmac = None
    if vtype.mac is not None and cg["x"] is not None:
        pmac = vtype.mac.percent_mac(cg["x"])
    env_docs = []
    if name in ENVELOPE_PHASES:
        for env in envs:
            env_docs.append(envelope_result(vtype, env, name, st.mass, cg, moments,
                                            violations))
    phase_violations = [v for v in violations if v.get("phase") == name]
    return {"name": name, "label": phase_title(name), "mass_kg": st.mass, "cg_m": cg,
            "moment_kgm": moments, "moment_index": index, "percent_mac": pmac,
            "mass_limit_kg": limit, "mass_margin_kg": margin, "envelopes": env_docs,
            "in_limits": not phase_violations}


# --- parts of the document ----------------------------------------------------------------------

def _vehicle_doc(vtype: VehicleType, plan: Plan, registration: str | None,
                 type_revision: int | None) -> VehicleDoc:
    return {"registration": registration or plan.vehicle, "type": vtype.name,
            "type_revision": type_revision, "kind": vtype.kind, "title": vtype.title,
            "type_sha256": vtype.content_hash()}


def _empty_doc(empty: Any, st: MassState) -> EmptyWeightDoc:
    return {"entry_seq": attr(empty, "seq"),
            "entry_id": attr(empty, "entry_id"),
            "entry_date": iso_date(attr(empty, "entry_date")),
            "entry_hash": attr(empty, "entry_hash"),
            "mass_kg": st.mass,
            "cg_m": st.cg(),
            "moment_kgm": {"x": st.mx, "y": st.my, "z": st.mz}}


def _standard_doc(vtype: VehicleType, plan: Plan) -> StandardMassesDoc:
    if plan.standard_masses == "actual":
        return {"name": "actual", "description": "actual masses as entered", "source": None}
    s = vtype.mass_set(plan.standard_masses)
    return {"name": s.name, "description": s.description, "source": s.source,
            "masses_kg": {c: m for c, m in s.masses_kg}}


def _units_doc(vtype: VehicleType) -> UnitsDoc:
    du = vtype.units
    return {"mass": du.mass, "length": du.length, "volume": du.volume,
            "moment": du.moment_unit, "density": du.density_unit,
            "moment_reduction": du.moment_divisor}


def _polygons_doc(envs: list[Envelope]) -> list[EnvelopePolygon]:
    return [{"name": e.name, "axis": e.axis, "category": e.category,
             "coordinates": e.coordinates,
             "points": [[float(a), float(b)] for a, b in e.points]}
            for e in envs]


def _compute(vtype: VehicleType, empty: Any, plan: Plan, *,
             configuration_items: Iterable[Any] | None, prepared_by: str | None,
             prepared_at: dt.datetime | str | None, type_revision: int | None,
             registration: str | None, samples: int, axle_rule_set: Any) -> SheetDocument:
    """The document without fixes: every state, checked against every limit."""
    ground = vtype.kind == "ground_vehicle"
    violations: list[Violation] = []
    loading = _load(vtype, empty, plan, configuration_items, samples)
    stations = station_checks(vtype, plan, violations)
    tank_checks(vtype, plan, violations)
    envs = envelopes_of(vtype, plan.category)
    phases = [_phase_doc(vtype, name, st, violations, envs, loading.z_known)
              for name, st in loading.phases.items()]
    burn = burn_path(vtype, loading.zero_fuel, loading.fuel, envs, violations, ground)
    axles = axle_rules = rule_doc = None
    if ground:
        axles, axle_rules, rule_doc = axle_checks(vtype, phases, loading.phases,
                                                  plan.axle_rules, violations, axle_rule_set)
    cfg_items = loading.configuration_items
    return {
        "schema": SCHEMA,
        "caution": CAUTION,
        "ground_caution": GROUND_CAUTION if ground else None,
        "sheet": {"id": None, "amends": None, "saved": False},
        "vehicle": _vehicle_doc(vtype, plan, registration, type_revision),
        "empty_weight": _empty_doc(empty, loading.empty),
        "configuration": {"name": loading.configuration, "items": cfg_items,
                          "mass_change_kg": math.fsum(i["signed_mass_kg"] for i in cfg_items)},
        "prepared": {"by": prepared_by or plan.prepared_by,
                     "at": iso_date(prepared_at)},
        "plan_source": plan.source,
        "note": plan.note or None,
        "category": plan.category,
        "standard_masses": _standard_doc(vtype, plan),
        "units": _units_doc(vtype),
        "items": loading.items,
        "stations": stations,
        "fuel": fuel_doc(vtype, plan, loading.fuel),
        "burn": {"sequence": plan.burn_sequence, "order": list(plan.burn_order),
                 "taxi_fuel_kg": plan.taxi_fuel_kg, "trip_fuel_kg": plan.trip_fuel_kg},
        "phases": phases,
        "burn_path": burn,
        "axles": axles,
        "axle_rules": axle_rules,
        "axle_rule_set": rule_doc,
        "violations": violations,
        "fixes": [],
        "fixes_note": None,
        "envelope_polygons": _polygons_doc(envs),
        "verdict": "in_limits" if not violations else "out_of_limits",
    }


def build_sheet(vtype: VehicleType, empty_state: Any, plan: Plan, *,
                configuration_items: Iterable[Any] | None = None,
                prepared_by: str | None = None, prepared_at: dt.datetime | str | None = None,
                type_revision: int | None = None, registration: str | None = None,
                with_fixes: bool = True, samples: int = 41,
                axle_rule_set: Any = None) -> SheetDocument:
    """The loading-sheet document for ``plan`` (see ``docs/sheet-document.md``).

    Parameters
    ----------
    vtype : VehicleType
        The vehicle's type (:mod:`ledger.typedata`).
    empty_state : EmptyWeight or ledger.store.entries.EmptyState
        The current empty weight: ``mass_kg``, ``mx_kgm``, ``my_kgm``, ``mz_kgm``,
        ``z_known``, and for the heading ``seq``, ``entry_date``, ``entry_id``.
    plan : Plan
        From :func:`ledger.typedata.plan.parse_plan`.
    configuration_items : iterable, optional
        Items of the configuration in use (objects or dicts with ``name``, ``action``,
        ``mass_kg``, ``x_m``, ``y_m``, ``z_m``), e.g. those of
        :func:`ledger.store.configs.configuration_items`. None: the type-file configuration
        the plan names, if any.
    prepared_by, prepared_at : optional
        Shown in the heading (default: the plan's ``prepared_by``; no time).
    type_revision : int, optional
        Revision of the type data used.
    registration : str, optional
        Default: the plan's vehicle.
    with_fixes : bool
        Look for fixes when out of limits (each re-checked with ``with_fixes=False``).
    samples : int
        Evenly spaced burn states from take-off to landing, besides every tank switch and
        arm-table row (see :func:`ledger.core.fuel.burn_states`).
    axle_rule_set : ledger.core.ground.RuleSet, optional
        Ground vehicles: the advisory axle-group rules for the plan's ``axle_rules`` name
        (e.g. from :func:`ledger.rules.load_rule_set`); without it the name is looked up among
        the core's built-in rule sets.

    Returns
    -------
    SheetDocument
        The document (a plain dict, typed by :mod:`ledger.loadsheet.document`); ``verdict`` is
        ``"in_limits"`` or ``"out_of_limits"``.
    """
    def compute(changed_plan: Plan) -> SheetDocument:
        return _compute(vtype, empty_state, changed_plan, configuration_items=items,
                        prepared_by=prepared_by, prepared_at=prepared_at,
                        type_revision=type_revision, registration=registration,
                        samples=samples, axle_rule_set=axle_rule_set)

    items = None if configuration_items is None else list(configuration_items)
    doc = compute(plan)
    if with_fixes and doc["violations"]:
        # Each option is re-checked on the sheet built again without fixes.
        doc["fixes"], doc["fixes_note"] = find_fixes(vtype, plan, doc, compute)
    return doc
