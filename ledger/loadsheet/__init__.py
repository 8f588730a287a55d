"""Loading sheets: every phase, the fuel-burn path and the fixes, as one JSON-able document.

Pure (no database, no terminal). Public names::

    from ledger.loadsheet import build_sheet, EmptyWeight, ConfigurationItem, compare_plans

The document is described in ``docs/sheet-document.md``; plans come from
:mod:`ledger.typedata.plan`; saving and amending sheets is :mod:`ledger.store.sheets`.
"""

from ledger.loadsheet.amend import AmendmentCheck, Change, compare_plans
from ledger.loadsheet.build import (
    AIRCRAFT_PHASES,
    GROUND_PHASES,
    SCHEMA,
    ConfigurationItem,
    EmptyWeight,
    build_sheet,
)

__all__ = [
    "AIRCRAFT_PHASES",
    "GROUND_PHASES",
    "SCHEMA",
    "AmendmentCheck",
    "Change",
    "ConfigurationItem",
    "EmptyWeight",
    "build_sheet",
    "compare_plans",
]
