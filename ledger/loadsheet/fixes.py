"""Ways to bring an out-of-limits load within limits, each re-checked before it is shown.

Options, sized with :mod:`ledger.core.corrections` (and :mod:`ledger.core.ground` for axles):

- **shift**: move cargo from one station to another (``shift_mass``, FAA-H-8083-25 ch. 9:
  Δm / M = ΔCG / (arm_to − arm_from)), also to clear a station or floor over its limit;
- **ballast**: add ballast at a ballast station the type has (``ballast_mass``,
  FAA-H-8083-30 ch. 4);
- **offload_payload**: take cargo off a station (``offload_for_mass_limit``,
  ``offload_for_cg_limit``), or leave a passenger off;
- **offload_fuel**: load less fuel, never less than the taxi and trip fuel;
- **move_load** (ground vehicles): move the load within its load area, forward or aft
  (``axle_overload_fix``).

Every option is applied to the plan and the whole sheet is built again
(:func:`ledger.loadsheet.build.build_sheet` without fixes); only options whose rebuilt sheet is
in limits are returned (``rechecked`` and ``in_limits_after`` are then both true). An amount
that a first estimate leaves a hair short (a sloped envelope edge moves with the mass, the CG
path while fuel burns) is grown from the rebuilt sheet a few times before the option is given
up. Amounts are rounded up to the display resolution, so the figure shown is the figure that
was checked.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, cast

from ledger.errors import InputError
from ledger.loadsheet.document import AfterDoc, FixDoc, FixStep, SheetDocument
from ledger.loadsheet.fix_options import FixFinder, FixOption, Rebuild

if TYPE_CHECKING:
    from ledger.typedata.model import VehicleType
    from ledger.typedata.plan import Plan

__all__ = ["find_fixes", "MAX_FIXES"]

MAX_FIXES = 6
_ITERATIONS = 5


def _attempt(finder: FixFinder, opt: FixOption) -> tuple[float, SheetDocument] | None:
    """The amount of ``opt`` that brings the sheet within limits, and that sheet; or None.

    The first amount is the option's own estimate; while the rebuilt sheet is still out of
    limits, the amount grows by what the option asks for on it, a few times at most.
    """
    if opt.fixed is not None:
        amount = opt.fixed
    else:
        first = opt.size(finder.doc)
        if first is None or first <= 0:
            return None
        amount = finder.up(first, opt.resolution)
    for _ in range(_ITERATIONS):
        if amount > opt.limit * (1 + 1e-9) + 1e-12:
            return None
        try:
            plan = opt.apply(amount)
            after = finder.rebuild(plan)
        except (InputError, ValueError):
            return None
        if after["verdict"] == "in_limits":
            return amount, after
        if opt.fixed is not None:
            return None
        more = opt.size(after)
        if more is None or more <= 0:
            return None
        amount = finder.up(amount + more, opt.resolution)
    return None


def _fix_doc(opt: FixOption, amount: float, after: SheetDocument) -> FixDoc:
    """A fix of one change, with the re-checked state it leads to."""
    after_doc: AfterDoc = {"verdict": after["verdict"],
                           "phases": [{"name": p["name"], "mass_kg": p["mass_kg"],
                                       "cg_m": p["cg_m"]} for p in after["phases"]]}
    return cast(FixDoc, {"kind": opt.kind, "description": opt.describe(amount),
                         **opt.extra(amount), "rechecked": True,
                         "in_limits_after": after["verdict"] == "in_limits",
                         "after": after_doc})


def _step(opt: FixOption, description: str, amount: float) -> FixStep:
    """One change of a ``combined`` fix."""
    return cast(FixStep, {"kind": opt.kind, "description": description, **opt.extra(amount)})


_ORDER = ["shift", "move_load", "ballast", "offload_payload", "offload_fuel", "combined"]
_PAIR_FIRSTS = 8


def _pairs(finder: FixFinder, options: list[FixOption]) -> list[FixDoc]:
    """Two changes together, when no single one is enough: the first at the amount its own
    sizing asks for (or all it can take), the second found on the sheet after the first."""
    out: list[FixDoc] = []
    for first in options[:_PAIR_FIRSTS]:
        if first.fixed is not None:
            amount = first.fixed
        else:
            need = first.size(finder.doc)
            if need is None or need <= 0:
                continue
            amount = min(finder.up(need, first.resolution), first.limit)
            if amount <= 0:
                continue
        try:
            plan1 = first.apply(amount)
            doc1 = finder.rebuild(plan1)
        except (InputError, ValueError):
            continue
        if doc1["verdict"] == "in_limits":
            continue  # found as a single option already (or nearly); not a pair
        sub = FixFinder(finder.t, plan1, doc1, finder.rebuild)
        for second in sub.options():
            if second.kind == first.kind and second.extra(0.0).get("from_station") == \
                    first.extra(0.0).get("from_station"):
                continue
            result = _attempt(sub, second)
            if result is None:
                continue
            amount2, after = result
            a, b = first.describe(amount), second.describe(amount2)
            out.append({"kind": "combined", "description": f"{a}, and {b[0].lower()}{b[1:]}",
                        "mass_kg": first.extra(amount).get("mass_kg", 0.0)
                        + second.extra(amount2).get("mass_kg", 0.0),
                        "from_station": None, "to_station": None,
                        "steps": [_step(first, a, amount), _step(second, b, amount2)],
                        "rechecked": True, "in_limits_after": True,
                        "after": _fix_doc(second, amount2, after)["after"]})
            break
        if len(out) >= MAX_FIXES:
            break
    return out


def find_fixes(vtype: VehicleType, plan: Plan, doc: SheetDocument, rebuild: Rebuild,
               ) -> tuple[list[FixDoc], str]:
    """Options that bring the load within limits, each re-checked; and a note saying so.

    Parameters
    ----------
    vtype, plan
        As given to :func:`ledger.loadsheet.build.build_sheet`.
    doc : dict
        The out-of-limits document.
    rebuild : callable
        ``rebuild(changed_plan) -> document`` (the sheet built again, without fixes).

    Returns
    -------
    (list of dict, str)
        The document's ``fixes`` and ``fixes_note``. When no single change is enough, pairs
        of changes are tried (``kind`` ``"combined"`` with its ``steps``).
    """
    finder = FixFinder(vtype, plan, doc, rebuild)
    options = finder.options()
    found = []
    for opt in options:
        result = _attempt(finder, opt)
        if result is not None:
            found.append(_fix_doc(opt, *result))
    if not found:
        found = _pairs(finder, options)
    found.sort(key=lambda f: (_ORDER.index(f["kind"]), f["mass_kg"] or 0.0))
    shown = found[:MAX_FIXES]
    return shown, _note(shown, len(options))


def _note(shown: list[FixDoc], tried: int) -> str:
    """The document's ``fixes_note``: how the fixes shown were checked, or why there is none."""
    if shown:
        alone = "on its own" if shown[0]["kind"] != "combined" else \
            "with both of its changes (no single change was enough)"
        return ("Each option below was re-checked by building the whole sheet again with the "
                f"change applied: {alone} it brings every phase, every station and the "
                "fuel-burn path within limits. Only options that do are shown.")
    if tried:
        return (f"None of the {tried} changes tried (moving cargo, ballast, offloading "
                "payload or fuel, alone or two together) brings the load within limits when "
                "re-checked; change the plan.")
    return ("No change could be proposed for these violations (nothing to move or "
            "offload); change the plan.")
