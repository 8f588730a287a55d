"""The type's reweigh tolerances applied to the change since the last weighing.

A type file may say when the empty vehicle has drifted far enough from its last weighing that a
new one is due: a share of a maximum mass, a share of MAC, a CG shift. The warnings here are
worded in the type's display units for the running record, the vehicle view and the fleet view.
"""

from __future__ import annotations

import datetime as dt

from ledger.units import format_quantity

__all__ = ["drift_warnings"]


def _reference_mass(vtype) -> tuple[float, str]:
    lim = vtype.limits
    for value, label in ((lim.max_landing_kg, "maximum landing mass"),
                         (lim.max_takeoff_kg, "maximum take-off mass"),
                         (lim.gross_rating_kg, "gross vehicle rating")):
        if value is not None:
            return value, label
    return float("nan"), "no mass limit"


def drift_warnings(vtype, base_mass_kg: float, base_mx_kgm: float, mass_kg: float,
                   mx_kgm: float, *, base_seq: int | None = None,
                   base_date: dt.date | None = None) -> list[dict]:
    """Warnings when the change since the last weighing passes the type's reweigh tolerances.

    The change is the net one: current empty state minus the state the weighing set. Each
    warning is ``{"code": …, "message": …}`` with values in the type's display units.
    """
    tol = vtype.tolerances
    units = vtype.units
    out = []
    since = (f"since the weighing of {base_date} (entry {base_seq})" if base_seq
             else "since the last weighing")
    dm = mass_kg - base_mass_kg
    cg0, cg = base_mx_kgm / base_mass_kg, mx_kgm / mass_kg
    dcg = cg - cg0
    if tol.reweigh_mass_percent is not None:
        ref, label = _reference_mass(vtype)
        limit = tol.reweigh_mass_percent / 100.0 * ref
        if abs(dm) > limit:
            sign = "+" if dm > 0 else "-"
            out.append({"code": "reweigh_mass", "message": (
                f"empty mass changed by {sign}{format_quantity(abs(dm), units.mass, 1)} "
                f"{since}, more than the type's {tol.reweigh_mass_percent:g} % of {label} "
                f"({format_quantity(limit, units.mass, 1)}): consider a new weighing")})
    if tol.reweigh_cg_percent_mac is not None and vtype.mac is not None:
        dpct = dcg / vtype.mac.length_m * 100.0
        if abs(dpct) > tol.reweigh_cg_percent_mac:
            out.append({"code": "reweigh_cg", "message": (
                f"empty CG moved {dpct:+.2f} % MAC {since}, more than the type's "
                f"{tol.reweigh_cg_percent_mac:g} % MAC: consider a new weighing")})
    if tol.reweigh_cg_shift_m is not None and abs(dcg) > tol.reweigh_cg_shift_m:
        sign = "+" if dcg > 0 else "-"
        out.append({"code": "reweigh_cg_shift", "message": (
            f"empty CG moved {sign}{format_quantity(abs(dcg), units.length, 2)} {since}, more "
            f"than the type's {format_quantity(tol.reweigh_cg_shift_m, units.length, 2)}: "
            "consider a new weighing")})
    return out
