"""Weighing a vehicle: scale readings at its weighing points become a new baseline.

The readings are read against the vehicle's type (:mod:`ledger.typedata.scales`) and the
weighing is appended to its ledger (:func:`ledger.store.entries.record_weighing`), in one unit
of work.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from typing import Any

from sqlalchemy.engine import Engine

from ledger.services.recorded import RecordedEntry, record
from ledger.store.configs import parse_item_spec
from ledger.store.entries import record_weighing

__all__ = ["parse_adjustments", "weigh"]


def parse_adjustments(specs: Sequence[str] | None) -> list[dict[str, Any]]:
    """``--adjust LABEL=MASS@ARM[,LAT[,VERT]]`` texts as the adjustments :func:`weigh` takes.

    Separate from :func:`weigh` so that a caller can refuse a mistyped option before it opens
    the database.
    """
    return [parse_item_spec(a, field="--adjust") for a in specs or []]


def weigh(engine: Engine, registration: str, readings: Mapping[str, Any], *, actor: str,
          tares: Mapping[str, Any] | None = None, fuel: Mapping[str, Any] | None = None,
          adjustments: Sequence[Mapping[str, Any]] = (), entry_date: str | None = None,
          scales: str | None = None, level: str | None = None, note: str | None = None,
          reason: str | None = None, reference: str | None = None) -> RecordedEntry:
    """Record a weighing of ``registration`` (see :func:`ledger.store.entries.record_weighing`
    for the parameters) and return it with its line of the running record."""
    return record(engine, lambda s: record_weighing(
        s, registration, readings, tares=tares, fuel=fuel, adjustments=adjustments,
        actor=actor, entry_date=entry_date, scales=scales, level=level, note=note,
        reason=reason, reference=reference))
