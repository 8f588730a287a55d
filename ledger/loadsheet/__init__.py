"""Loading sheets: every phase, the fuel-burn path and the fixes, as one JSON-able document.

Pure (no database, no terminal). Public names::

    from ledger.loadsheet import build_sheet, EmptyWeight, ConfigurationItem, compare_plans
    from ledger.loadsheet import SheetDocument   # the document's type

The document is described in ``docs/sheet-document.md`` and typed in
:mod:`ledger.loadsheet.document`; plans come from :mod:`ledger.typedata.plan`; saving and
amending sheets is the services' work. The modules, in the order a sheet is built:

- :mod:`~ledger.loadsheet.inputs`: the empty weight, the configuration, the plan's load;
- :mod:`~ledger.loadsheet.fuel`: usable fuel per tank at each phase, the burn states;
- :mod:`~ledger.loadsheet.checks`: phase masses, envelopes, stations, floors, tanks;
- :mod:`~ledger.loadsheet.burnpath`: the fuel-burn path against every envelope;
- :mod:`~ledger.loadsheet.axles`: axle loads and axle-group rules (ground vehicles);
- :mod:`~ledger.loadsheet.build`: the document from these parts (:func:`build_sheet`);
- :mod:`~ledger.loadsheet.fix_options` and :mod:`~ledger.loadsheet.fixes`: the changes that
  could help, and the search that re-checks each;
- :mod:`~ledger.loadsheet.amend`: whether a changed plan is within the last-minute tolerance;
- :mod:`~ledger.loadsheet.text`: the short texts of messages in display units.

The public names load their module on first use: a renderer that needs only
:mod:`~ledger.loadsheet.text` or :mod:`~ledger.loadsheet.document` (the report's phase titles
and volume decimals) does not import numpy and the calculation core with the builders.
"""

from __future__ import annotations

import importlib
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from ledger.loadsheet.amend import AmendmentCheck, Change, compare_plans
    from ledger.loadsheet.build import (
        AIRCRAFT_PHASES,
        GROUND_PHASES,
        SCHEMA,
        ConfigurationItem,
        EmptyWeight,
        build_sheet,
    )
    from ledger.loadsheet.document import SheetDocument

__all__ = [
    "AIRCRAFT_PHASES",
    "GROUND_PHASES",
    "SCHEMA",
    "AmendmentCheck",
    "Change",
    "ConfigurationItem",
    "EmptyWeight",
    "SheetDocument",
    "build_sheet",
    "compare_plans",
]

_HOMES = {
    "AIRCRAFT_PHASES": "build",
    "GROUND_PHASES": "build",
    "SCHEMA": "build",
    "AmendmentCheck": "amend",
    "Change": "amend",
    "ConfigurationItem": "build",
    "EmptyWeight": "build",
    "SheetDocument": "document",
    "build_sheet": "build",
    "compare_plans": "amend",
}


def __getattr__(name: str) -> Any:
    """A public name, from its module (imported on first use; PEP 562)."""
    home = _HOMES.get(name)
    if home is None:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    value = getattr(importlib.import_module(f"{__name__}.{home}"), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(__all__))
