"""A vehicle's running record: reading it, exporting it exactly, importing a history file.

The running record is :func:`ledger.store.views.history_view`; export and import are
:mod:`ledger.store.transfer` (every stored column, hashes included; an import is all or
nothing, in one unit of work).
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from sqlalchemy.engine import Engine

from ledger.services.database import unit_of_work
from ledger.store.transfer import FORMATS, ImportSummary, export_history, import_history
from ledger.store.views import history_view

__all__ = ["FORMATS", "ImportSummary", "running_record", "export", "import_file"]


def running_record(engine: Engine, registration: str, *,
                   as_of: str | None = None) -> dict[str, Any]:
    """The running record of ``registration`` (as it stood on ``as_of`` if given)."""
    with unit_of_work(engine) as session:
        return history_view(session, registration, as_of=as_of)


def export(engine: Engine, registration: str, fmt: str) -> str:
    """The whole ledger of ``registration`` as CSV or JSON text."""
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
