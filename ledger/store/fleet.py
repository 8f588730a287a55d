"""The fleet view: every vehicle with its current empty mass and CG, in one SQL query.

Each ledger entry carries the running empty state after it, so the current state of a vehicle
is its entry with the highest ``seq``, and the date of its last weighing is that of the entry its
``baseline_seq`` names. Both are found by the database, not by loading every entry: the newest
``seq`` of each vehicle comes from a correlated ``max(seq)`` that the ``UNIQUE (vehicle_id,
seq)`` index answers with one lookup per vehicle (faster than grouping every entry).
"""

from __future__ import annotations

from sqlalchemy import and_, func, select
from sqlalchemy.orm import Session, aliased

from ledger.store.models import LedgerEntryRow, VehicleRow, VehicleTypeRow

__all__ = ["fleet_rows"]


def _fleet_query():
    newest = aliased(LedgerEntryRow)
    head_seq = (select(func.max(newest.seq)).where(newest.vehicle_id == VehicleRow.id)
                .correlate(VehicleRow).scalar_subquery())
    head = aliased(LedgerEntryRow)
    base = aliased(LedgerEntryRow)
    return (
        select(
            VehicleRow.registration,
            VehicleTypeRow.name,
            VehicleTypeRow.id,
            head.seq,
            head.empty_mass_kg,
            head.empty_mx_kgm,
            head.empty_my_kgm,
            head.empty_mz_kgm,
            head.z_known,
            head.baseline_seq,
            base.entry_date,
            base.empty_mass_kg,
            base.empty_mx_kgm,
            head.entry_date,
        )
        .join(VehicleTypeRow, VehicleTypeRow.id == VehicleRow.type_id)
        .outerjoin(head, and_(head.vehicle_id == VehicleRow.id, head.seq == head_seq))
        .outerjoin(base, and_(base.vehicle_id == VehicleRow.id, base.seq == head.baseline_seq))
        .order_by(VehicleRow.registration)
    )


_FLEET = _fleet_query()  # built once: building a statement costs about as much as running it


def fleet_rows(session: Session) -> list[tuple]:
    """Tuples ``(registration, type name, type id, seq, empty_mass_kg, mx, my, mz, z_known,
    baseline_seq, last_weighed, baseline_mass_kg, baseline_mx, entry_date)`` ordered by
    registration; the entry fields are ``None`` for a vehicle with no entry yet.

    Plain tuples, not ``Row`` objects, so that callers can feed them to numpy cheaply."""
    return [tuple(r) for r in session.connection().execute(_FLEET)]
