"""Analyses of a vehicle beyond the loading sheet, as JSON-able report documents.

:mod:`ledger.analysis.inertia`
    Mass, CG and inertia of the loaded vehicle about its CG (``wbledger.inertia/1``).
:mod:`ledger.analysis.ground`
    Road-vehicle weighings: corner weights (``wbledger.corners/1``), CG height by axle lift
    (``wbledger.cg-height/1``), and axle-group rule sets (``wbledger.axle-rules/1``).

Both are pure: numbers and parsed type data in, plain dicts out; the command line fetches
from the store and renders with :mod:`ledger.report`. Importing this package loads nothing
heavy.
"""

__all__ = ["MISSING"]


class _Missing:
    """Shown as the value of a required input that was not given."""

    def __str__(self) -> str:
        return "(missing)"

    def __repr__(self) -> str:
        return "(missing)"


#: The value an error names for a required input that was not given.
MISSING = _Missing()
