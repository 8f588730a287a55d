"""Road vehicles: axle and wheel loads, ratings, corner weights, CG height, axle-group rules.

SI throughout: masses (loads) in kg, lengths in m, angles in radians. x is positive aft of the
datum the type data names (for example the front axle centreline), y positive right, z up.

Sources
-------
- Axle loads of a rigid vehicle on two supports: statics (``W_f = W·b/L``, ``W_r = W·a/L``);
  common practice for axle groups (load-sharing ratios from the type data).
- CG height by the axle-lift method: ISO 10392 (the relation is derived and shown exact under
  its geometry in :func:`cg_height_axle_lift`).
- US federal limits, Interstate: 23 CFR 658.17 and 23 U.S.C. 127 (20,000 lb single axle,
  34,000 lb tandem, 80,000 lb gross, the bridge formula ``W = 500·[L·N/(N − 1) + 12N + 36]`` to
  the nearest 500 lb, and the two-consecutive-tandems exception at 36 ft or more; read as
  quoted in stored state and municipal codes); axle definitions (40 in and 96 in planes) as in
  23 CFR 658.5 (read in stored secondary text). Rounding ties of the bridge formula to the lower
  500 lb follows the FHWA bridge table as recalled (from memory).

These checks are advisory: they compare recorded figures with a selected rule set. Local
regulations, permits and the manufacturer's ratings govern.

Modules
-------
:mod:`~ledger.core.ground.axles`
    :func:`axle_loads` and :func:`check_axle_ratings`.
:mod:`~ledger.core.ground.overload`
    :func:`axle_overload_fix`: how far to move a payload off an overloaded axle.
:mod:`~ledger.core.ground.measured`
    From a weighing: :func:`corner_weights` and :func:`cg_height_axle_lift`.
:mod:`~ledger.core.ground.rules`
    Axle-group rules: :class:`RuleSet`, :func:`check_axle_groups`, :func:`bridge_formula_lb`.
"""

from __future__ import annotations

from ledger.core.factors import FOOT, INCH, LB
from ledger.core.ground.axles import AxleLoads, RatingCheck, axle_loads, check_axle_ratings
from ledger.core.ground.measured import (
    AxleLiftResult,
    CornerWeights,
    cg_height_axle_lift,
    corner_weights,
)
from ledger.core.ground.overload import AxleFix, axle_overload_fix
from ledger.core.ground.rules import (
    ADVISORY,
    Finding,
    RuleSet,
    bridge_formula_lb,
    check_axle_groups,
)

__all__ = [
    "LB",
    "INCH",
    "FOOT",
    "ADVISORY",
    "AxleLoads",
    "axle_loads",
    "RatingCheck",
    "check_axle_ratings",
    "AxleFix",
    "axle_overload_fix",
    "CornerWeights",
    "corner_weights",
    "AxleLiftResult",
    "cg_height_axle_lift",
    "bridge_formula_lb",
    "RuleSet",
    "Finding",
    "check_axle_groups",
]
