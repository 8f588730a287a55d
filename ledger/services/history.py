"""A vehicle's running record: reading it, exporting it exactly, importing a history file.

The running record is :func:`ledger.store.views.history_view`; export and import are
:mod:`ledger.store.transfer` (every stored column, hashes included; an import is all or
nothing, in one unit of work).
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from sqlalchemy.engine import Engine

from ledger.errors import InputError
from ledger.services.database import unit_of_work
from ledger.store.transfer import FORMATS, ImportSummary, export_history, import_history
from ledger.store.views import history_view

__all__ = ["FORMATS", "EXPORT_UNITS", "ImportSummary", "running_record", "export",
           "import_file"]


def running_record(engine: Engine, registration: str, *,
                   as_of: str | None = None) -> dict[str, Any]:
    """The running record of ``registration`` (as it stood on ``as_of`` if given)."""
    from ledger.services.fleet import marked

    with unit_of_work(engine) as session:
        return marked(session, history_view(session, registration, as_of=as_of))


#: What ``export --units`` accepts: the exact SI columns (the default, the only form that
#: imports back) or the type's display units at the precision people read.
EXPORT_UNITS = ("si", "display")


def export(engine: Engine, registration: str, fmt: str, *, units: str = "si") -> str:
    """The whole ledger of ``registration`` as CSV or JSON text.

    ``units="si"`` writes every stored column exactly (import reads it back to the same values
    and hashes); ``units="display"`` writes the running record in the type's display units with
    sensible precision (:mod:`ledger.report.record_export`), built like ``wbledger record`` on
    a ledger whose evidence verifies, and not meant for import.
    """
    if units not in EXPORT_UNITS:
        raise InputError("--units", units, " or ".join(EXPORT_UNITS))
    if fmt not in FORMATS:
        raise InputError("--format", fmt, " or ".join(FORMATS))
    if units == "display":
        from ledger.report.record_export import export_display
        from ledger.services.record import maintenance_record

        return export_display(maintenance_record(engine, registration), fmt)
    with unit_of_work(engine) as session:
        return export_history(session, registration, fmt)


def import_file(engine: Engine, registration: str, text: str, fmt: str, *,
                source: str = "file",
                progress: Callable[[int], None] | None = None) -> ImportSummary:
    """Append the entries of a history ``text`` (CSV or JSON) to the vehicle, all or nothing;
    ``source`` names the file in messages."""
    with unit_of_work(engine) as session:
        return import_history(session, registration, text, fmt, source=source,
                              progress=progress)
