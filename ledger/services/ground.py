"""Road-vehicle use cases beside the loading sheet: corner weights and the axle-rule sets.

``wbledger corners`` (:func:`corner_weights`) and ``wbledger axle-rules list|show``
(:func:`axle_rule_sets`, :func:`axle_rule_set`). The CG height by axle lift, which writes to the
ledger, is :mod:`ledger.services.cg_height`. The documents carry their caution;
:mod:`ledger.report.ground` renders them.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from sqlalchemy.engine import Engine

from ledger.analysis.ground import corner_weights_document, rule_set_document, type_geometry
from ledger.analysis.ground_types import CornersDocument, RuleSetDocument
from ledger.rules import list_rule_sets, load_rule_set, rule_dirs
from ledger.services.database import unit_of_work
from ledger.services.options import quantity_option, typed_unit
from ledger.services.vehicle_type import registered_type
from ledger.typedata import VehicleType
from ledger.units import DisplayUnits

__all__ = ["CornerWeights", "RuleSetList", "corner_weights", "axle_rule_sets", "axle_rule_set"]


@dataclass(frozen=True)
class CornerWeights:
    """Corner weights from four wheel-scale readings: the ``wbledger.corners/1`` document."""

    document: CornersDocument


@dataclass(frozen=True)
class RuleSetList:
    """The axle rule sets found (``rows``) and the folders searched, in search order."""

    rows: list[dict[str, Any]]
    folders: list[str]


def corner_weights(engine: Engine | None, registration: str | None, *, lf: str, rf: str,
                   lr: str, rr: str, wheelbase: str | None = None, track: str | None = None,
                   rear_track: str | None = None) -> CornerWeights:
    """Corner weights from the four wheel loads as typed (left/right front, left/right rear).

    With ``registration`` (``engine`` is then needed) the wheelbase, tracks and display units
    come from the vehicle's type and bare numbers take its units; without it every figure
    needs its unit, and the document shows the units the user typed.
    """
    vtype: VehicleType | None = None
    if registration is not None:
        if engine is None:
            raise ValueError("corner_weights needs the engine to look up a registration")
        with unit_of_work(engine) as session:
            vtype = registered_type(session, registration).vtype
    mu = vtype.units.mass if vtype is not None else None
    lu = vtype.units.length if vtype is not None else None
    lf_kg, rf_kg, lr_kg, rr_kg = (quantity_option(v, "mass", mu, name) for v, name in
                                  ((lf, "--lf"), (rf, "--rf"), (lr, "--lr"), (rr, "--rr")))
    geo = type_geometry(vtype,
                        wheelbase_m=quantity_option(wheelbase, "length", lu, "--wheelbase",
                                                    positive=True),
                        track_front_m=quantity_option(track, "length", lu, "--track",
                                                      positive=True),
                        track_rear_m=quantity_option(rear_track, "length", lu, "--rear-track",
                                                     positive=True))
    doc = corner_weights_document(lf_kg, rf_kg, lr_kg, rr_kg, geo, vtype=vtype,
                                  registration=registration)
    if vtype is None:  # show what the user typed
        du = DisplayUnits(typed_unit(lf, "mass") or "kg",
                          typed_unit(wheelbase or track, "length") or "m", "L")
        doc["units"] = du.to_dict()
    return CornerWeights(doc)


def axle_rule_sets() -> RuleSetList:
    """Every axle rule set found: built in, ``$WBLEDGER_RULES``, the user's rules folder."""
    rows = [{"name": r.name, "title": r.title, "jurisdiction": r.jurisdiction,
             "path": r.path, "builtin": r.builtin} for r in list_rule_sets()]
    return RuleSetList(rows, [str(p) for p, _ in rule_dirs()])


def axle_rule_set(name: str, *, table: bool = False, max_length_ft: int = 60
                  ) -> RuleSetDocument:
    """The rule set ``name`` (or a ``.toml`` file) with, when ``table``, its bridge table
    for group lengths of 4 ft to ``max_length_ft``."""
    return rule_set_document(load_rule_set(name),
                             lengths_ft=list(range(4, max_length_ft + 1)) if table else None)
