"""An entry just appended to a vehicle's ledger, with its line of the running record: what the
weighing and equipment services return."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from sqlalchemy.engine import Engine
from sqlalchemy.orm import Session

from ledger.services.database import unit_of_work
from ledger.store.records import Entry
from ledger.store.views import entry_view

__all__ = ["RecordedEntry", "record"]


@dataclass(frozen=True)
class RecordedEntry:
    """The entry as stored, and its line of the running record with the type's units
    (:func:`ledger.store.views.entry_view`, the document ``wbledger … --json`` prints)."""

    entry: Entry
    document: dict[str, Any]
    #: The lines of entries appended with it (a pitched weighing's CG height), in order.
    more: tuple[dict[str, Any], ...] = ()


def record(engine: Engine, append: Callable[[Session], Entry], *,
           following: int = 0) -> RecordedEntry:
    """Run ``append(session)`` in one unit of work and read back the line it made, and those
    of the ``following`` entries it appended after it."""
    from ledger.store.entries import get_entry

    with unit_of_work(engine) as session:
        entry = append(session)
        more = tuple(entry_view(session, get_entry(session, entry.registration, entry.seq + k))
                     for k in range(1, following + 1))
        return RecordedEntry(entry, entry_view(session, entry), more)
