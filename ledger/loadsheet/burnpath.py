"""The fuel-burn path from take-off to landing, checked as a whole against every envelope.

Internal to :mod:`ledger.loadsheet`. The path is the CG at every burn state
(:mod:`ledger.loadsheet.fuel`), checked with :func:`ledger.core.envelope.path_inside`, so a
non-convex envelope that the path leaves between two in-limits end points is caught.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from ledger.core.envelope import covers, path_inside
from ledger.loadsheet.checks import polygon
from ledger.loadsheet.document import BurnPathDoc, FirstExit, PathEnvelope, PathPoint, Violation
from ledger.loadsheet.fuel import FuelStates
from ledger.loadsheet.inputs import MassState
from ledger.loadsheet.text import length_text, mass_text

if TYPE_CHECKING:
    from ledger.typedata.model import Envelope, VehicleType

__all__ = ["burn_path"]


def burn_path(vtype: VehicleType, zf: MassState, fuel: FuelStates, envs: list[Envelope],
              violations: list[Violation], ground: bool) -> BurnPathDoc:
    """The document's ``burn_path``; a ``burn_path`` violation for an envelope the path
    leaves although both its ends are inside."""
    masses = zf.mass + fuel.path_mass
    mx = zf.mx + fuel.path_moment[:, 0]
    my = zf.my + fuel.path_moment[:, 1]
    cgx, cgy = mx / masses, my / masses
    points: list[PathPoint] = [
        {"mass_kg": float(m), "cg_x_m": float(x), "cg_y_m": float(y),
         "moment_x_kgm": float(a), "kind": k}
        for m, x, y, a, k in zip(masses, cgx, cgy, mx, fuel.path_kind)]
    results: list[PathEnvelope] = []
    du = vtype.units
    start, end = ("departure", "arrival") if ground else ("takeoff", "landing")
    for env in ([] if ground else envs):
        lateral = env.axis == "lateral"
        first = (my if lateral else mx) if env.coordinates == "moment" else \
            (cgy if lateral else cgx)
        poly = polygon(env)
        chk = path_inside(poly, first, masses)
        exit_doc = None
        if not chk.inside:
            exit_doc = _first_exit(chk, first, masses, mx, my, zf.mass + fuel.path_mass[0])
            ends_in = bool(covers(poly, first[0], masses[0])) and \
                bool(covers(poly, first[-1], masses[-1]))
            if ends_in:
                m_e = exit_doc["mass_kg"]
                cg_e = exit_doc["cg_y_m" if lateral else "cg_x_m"]
                violations.append({
                    "code": "burn_path", "phase": "trip", "envelope": env.name,
                    "axis": env.axis, "subject": f"{env.name} envelope ({env.axis}) while "
                    "fuel burns", "limit": None, "actual": cg_e, "excess": None,
                    "unit": "m", "first_exit": exit_doc,
                    "message": f"While fuel burns from take-off to landing the "
                               f"{'lateral ' if lateral else ''}CG leaves the {env.name} "
                               f"envelope at {mass_text(m_e, du)}, CG "
                               f"{length_text(cg_e, du)}, after "
                               f"{mass_text(exit_doc['fuel_burned_kg'], du)} of trip fuel, "
                               f"although take-off and landing are in limits"})
        results.append({"name": env.name, "axis": env.axis, "category": env.category,
                        "inside": bool(chk.inside), "first_exit": exit_doc})
    return {"from": start, "to": end, "points": points, "envelopes": results}


def _first_exit(chk, first: np.ndarray, masses: np.ndarray, mx: np.ndarray, my: np.ndarray,
                start_mass: float) -> FirstExit:
    """The state where the path first leaves the envelope, interpolated on its segment."""
    seg = chk.segment or 0
    fx, fm = chk.first_exit
    j = min(seg + 1, len(masses) - 1)
    span_m = masses[j] - masses[seg]
    span_f = first[j] - first[seg]
    t = ((fm - masses[seg]) / span_m if abs(span_m) > 1e-12 else
         (fx - first[seg]) / span_f if abs(span_f) > 1e-15 else 0.0)
    t = min(max(float(t), 0.0), 1.0)
    m_e = float(masses[seg] + t * span_m)
    mx_e = float(mx[seg] + t * (mx[j] - mx[seg]))
    my_e = float(my[seg] + t * (my[j] - my[seg]))
    return {"mass_kg": m_e, "cg_x_m": mx_e / m_e, "cg_y_m": my_e / m_e,
            "fuel_burned_kg": float(start_mass - m_e)}
