"""Weighing a vehicle: scale readings at its weighing points become a new baseline.

The readings are read against the vehicle's type (:mod:`ledger.typedata.scales`) and the
weighing is appended to its ledger (:func:`ledger.store.entries.record_weighing`), in one unit
of work.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from typing import Any

from sqlalchemy.engine import Engine

from ledger.analysis import MISSING
from ledger.errors import InputError
from ledger.services.recorded import RecordedEntry, record
from ledger.store.configs import parse_item_spec
from ledger.store.entries import record_weighing
from ledger.typedata.scales import PitchedWeighing

__all__ = ["parse_adjustments", "pitched_weighing", "weigh", "PitchedWeighing"]


def parse_adjustments(specs: Sequence[str] | None) -> list[dict[str, Any]]:
    """``--adjust LABEL=MASS@ARM[,LAT[,VERT]]`` texts as the adjustments :func:`weigh` takes.

    Separate from :func:`weigh` so that a caller can refuse a mistyped option before it opens
    the database.
    """
    return [parse_item_spec(a, field="--adjust") for a in specs or []]


def pitched_weighing(readings: Mapping[str, Any] | None, pitch: str | None,
                     points_z: str | None) -> PitchedWeighing | None:
    """The pitched readings of ``--pitched-reading``, ``--pitch`` and ``--points-z``, or None
    when none of them is given; all three go together (issue 13 item 17)."""
    given = {"--pitched-reading": readings or None, "--pitch": pitch, "--points-z": points_z}
    if all(v is None for v in given.values()):
        return None
    missing = [k for k, v in given.items() if v is None]
    if missing:
        raise InputError(missing[0], MISSING,
                         "required with a pitched weighing: --pitched-reading POINT=MASS for "
                         "each weighing point, --pitch ANGLE (nose-up) and --points-z LENGTH "
                         "(the vertical arm of the weighing points)")
    assert readings is not None  # not missing
    return PitchedWeighing(readings, pitch, points_z)


def weigh(engine: Engine, registration: str, readings: Mapping[str, Any], *, actor: str,
          tares: Mapping[str, Any] | None = None, fuel: Mapping[str, Any] | None = None,
          adjustments: Sequence[Mapping[str, Any]] = (), entry_date: str | None = None,
          scales: str | None = None, level: str | None = None, note: str | None = None,
          reason: str | None = None, reference: str | None = None,
          pitched: PitchedWeighing | None = None) -> RecordedEntry:
    """Record a weighing of ``registration`` (see :func:`ledger.store.entries.record_weighing`
    for the parameters) and return it with its line of the running record; with ``pitched``
    readings, the CG-height entry recorded after it is in ``more``."""
    return record(engine, lambda s: record_weighing(
        s, registration, readings, tares=tares, fuel=fuel, adjustments=adjustments,
        actor=actor, entry_date=entry_date, scales=scales, level=level, note=note,
        reason=reason, reference=reference, pitched=pitched),
        following=0 if pitched is None else 1)
