"""Changing what is fitted to a vehicle: installing and removing items, and reversing such an
entry with a correction that says why. Each is one entry appended to the vehicle's ledger in one
unit of work; quantities are SI numbers or the user's text (a bare number takes the type's
display unit)."""

from __future__ import annotations

from sqlalchemy.engine import Engine

from ledger.services.recorded import RecordedEntry, record
from ledger.store.entries import correct_entry, install_item, remove_item

__all__ = ["install", "remove", "correct"]


def install(engine: Engine, registration: str, item: str, *, mass, arm, lat_arm=None,
            vert_arm=None, shape=None, actor: str, reason: str | None,
            reference: str | None = None, entry_date: str | None = None) -> RecordedEntry:
    """Record the installation of ``item`` (:func:`ledger.store.entries.install_item`)."""
    return record(engine, lambda s: install_item(
        s, registration, item, mass=mass, arm=arm, lat_arm=lat_arm, vert_arm=vert_arm,
        shape=shape, actor=actor, reason=reason, reference=reference, entry_date=entry_date))


def remove(engine: Engine, registration: str, item: str, *, mass=None, arm=None, lat_arm=None,
           vert_arm=None, actor: str, reason: str | None, reference: str | None = None,
           entry_date: str | None = None) -> RecordedEntry:
    """Record the removal of an installed ``item`` (:func:`ledger.store.entries.remove_item`)."""
    return record(engine, lambda s: remove_item(
        s, registration, item, mass=mass, arm=arm, lat_arm=lat_arm, vert_arm=vert_arm,
        actor=actor, reason=reason, reference=reference, entry_date=entry_date))


def correct(engine: Engine, registration: str, seq: int, *, reason: str | None, actor: str,
            reference: str | None = None, entry_date: str | None = None) -> RecordedEntry:
    """Reverse installation or removal ``seq`` (:func:`ledger.store.entries.correct_entry`)."""
    return record(engine, lambda s: correct_entry(
        s, registration, seq, reason=reason, actor=actor, reference=reference,
        entry_date=entry_date))
