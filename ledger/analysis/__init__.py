"""Analyses of a vehicle beyond the loading sheet, as typed, JSON-able report documents.

:mod:`ledger.analysis.inertia`
    Mass, CG and inertia of the loaded vehicle about its CG (``wbledger.inertia/1``), built
    from :mod:`~ledger.analysis.mass_items`, :mod:`~ledger.analysis.shapes` and
    :mod:`~ledger.analysis.empty_inertia`; the document's types are in
    :mod:`~ledger.analysis.inertia_types`.
:mod:`ledger.analysis.ground`
    Road-vehicle weighings: corner weights (``wbledger.corners/1``), CG height by axle lift
    (``wbledger.cg-height/1``), and axle-group rule sets (``wbledger.axle-rules/1``); types in
    :mod:`~ledger.analysis.ground_types`.

Both are pure: numbers and parsed type data in, plain dicts (TypedDicts) out; they know nothing
of the store or the report. The services (:mod:`ledger.services.inertia`,
:mod:`ledger.services.ground`, :mod:`ledger.services.cg_height`) fetch from the store and call
them; :mod:`ledger.report` renders the documents. Importing this package loads nothing heavy.
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
