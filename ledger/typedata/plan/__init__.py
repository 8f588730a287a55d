"""Loading plans: the TOML plan file and the quick command-line form, parsed against a type.

A plan says who and what goes where and how much fuel: people per seat (actual masses, or the
standard masses of a set the operator names), cargo, equipment or ballast per station, fuel per
tank (volume or mass; density given, from the type data, nominal, or from the fuel temperature
by table 54B), taxi fuel, trip fuel and the burn sequence. The file format is described in
``docs/plan-format.md``.

Reading a plan takes two steps, because bare numbers take the display units of the vehicle's
type and names must be checked against the type's stations and tanks:

1. :func:`read_plan_file` / :func:`read_plan_text` / :func:`plan_from_options` give the *raw*
   plan (a dict in the file's own layout) and :func:`plan_vehicle` its registration;
2. :func:`parse_plan` checks the raw plan against a :class:`~ledger.typedata.model.VehicleType`
   and returns a frozen :class:`Plan` in SI.

:func:`merge_options` applies quick options over a raw plan (a file plus a few changes, or a
saved sheet plus a last-minute change).

Every problem is one :class:`~ledger.errors.PlanError` (exit code 2) naming the file or option,
the field, the value and what is allowed. A load that is possible but over a limit (cargo over
a compartment limit, mass over the take-off limit) is *not* an input error: the sheet shows it
as a violation with its fixes.

Fuel quantities in a plan are **usable** fuel: the unusable fuel is part of the empty weight
(FAA-H-8083-1, weighing chapter: the empty weight keeps the unusable fuel), so a tank takes at
most its capacity less its unusable fuel.

Modules: :mod:`~ledger.typedata.plan.model` (the parsed plan), :mod:`~ledger.typedata.plan.raw`
(reading the raw plan and the quick options), :mod:`~ledger.typedata.plan.check` (checking it
against the type; its fuel in :mod:`~ledger.typedata.plan._fuel`).
"""

from __future__ import annotations

from ledger.typedata.plan.check import load_plan, parse_plan
from ledger.typedata.plan.model import (
    ACTUAL,
    BURN_PROPORTIONAL,
    BURN_TANK_ORDER,
    PLAN_FORMAT,
    CargoLoad,
    Person,
    Plan,
    TankLoad,
)
from ledger.typedata.plan.raw import (
    QuickOptions,
    merge_options,
    plan_from_options,
    plan_vehicle,
    read_plan_file,
    read_plan_text,
)

__all__ = [
    "PLAN_FORMAT",
    "ACTUAL",
    "BURN_PROPORTIONAL",
    "BURN_TANK_ORDER",
    "Person",
    "CargoLoad",
    "TankLoad",
    "Plan",
    "QuickOptions",
    "read_plan_file",
    "read_plan_text",
    "plan_vehicle",
    "plan_from_options",
    "merge_options",
    "parse_plan",
    "load_plan",
]
