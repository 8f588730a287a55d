"""Vehicles: the record's seal, names that must be unique, the append-only guards, and
:func:`require_vehicle`, which every command that builds figures for operation calls first."""

from __future__ import annotations

from sqlalchemy import func, select
from sqlalchemy.orm import Session

from ledger.errors import ChainError
from ledger.store import guards
from ledger.store.chain import ChainReport, verify_vehicle
from ledger.store.evidence.revisions import checked_type
from ledger.store.models import LedgerEntryRow, LoadingSheetRow, VehicleRow, VehicleTypeRow
from ledger.store.seal import vehicle_seal

__all__ = ["duplicates", "guards_problem", "require_vehicle", "vehicle_problem"]


def vehicle_problem(v, type_name: str | None) -> str | None:
    if type_name is None:
        return "its type link points at no type"
    try:
        seal = vehicle_seal(registration=v.registration, type_name=type_name, serial=v.serial,
                            note=v.note, created_at=v.created_at)
    except (TypeError, ValueError, AttributeError) as exc:
        return f"a stored value cannot be read ({exc})"
    if seal != v.row_hash:
        return ("its record does not match its seal (its registration, type link or details "
                "were changed)")
    return None


def guards_problem(session: Session) -> str | None:
    gone = guards.missing(session.connection())
    if gone:
        return (f"the append-only guards of {', '.join(gone)} are missing or disabled: the "
                "database was opened for editing outside wbledger")
    return None


def duplicates(session: Session, *, registration: str | None = None,
                type_name: str | None = None) -> list[str]:
    """Names that more than one row carries (a UNIQUE constraint removed by hand): a second
    type of the same name, or a second vehicle of the same registration, could take the place
    of the real one without changing a seal. Of the given ones only, or of all."""
    out = []
    for col, what, only in ((VehicleTypeRow.name, "type", type_name),
                            (VehicleRow.registration, "vehicle", registration)):
        query = select(col).group_by(col).having(func.count() > 1)
        if only is not None:
            query = query.where(col == only)
        out += [f"more than one {what} is named {name!r} (a uniqueness rule was removed)"
                for name in session.scalars(query)]
    return out


def require_vehicle(session: Session, vehicle) -> ChainReport:
    """Refuse (ChainError) to build figures on a vehicle whose evidence does not verify.

    Checks the vehicle's record, its type's chain of revisions, its ledger chain, and that the
    ledger head its newest saved sheet was built on is still in the chain. (Missing append-only
    guards are reported by ``verify``; they do not stop a vehicle whose seals all verify.)
    ``vehicle`` has ``id``, ``registration`` and ``type_id``. Returns the ledger report.
    """
    reg = vehicle.registration

    def refuse(problem: str) -> ChainError:
        return ChainError(f"the ledger of {reg} does not verify, so no sheet or report is "
                          f"built on it: {problem}. See `wbledger verify {reg}`")

    v = session.execute(select(VehicleRow).where(VehicleRow.id == vehicle.id)).scalar_one()
    tname = session.scalar(select(VehicleTypeRow.name).where(VehicleTypeRow.id == v.type_id))
    problem = vehicle_problem(v, tname)
    if problem:
        raise refuse(f"vehicle {reg}: {problem}")
    twins = duplicates(session, registration=v.registration, type_name=tname)
    if twins:
        raise refuse(twins[0])
    checked_type(session, v.type_id)
    report = verify_vehicle(session, reg)
    if not report.ok:
        raise refuse(report.problem)
    newest = session.execute(
        select(LoadingSheetRow.id, LoadingSheetRow.entry_hash)
        .where(LoadingSheetRow.vehicle_id == v.id)
        .order_by(LoadingSheetRow.id.desc()).limit(1)).first()
    if newest is not None:
        found = session.scalar(select(LedgerEntryRow.seq).where(
            LedgerEntryRow.vehicle_id == v.id, LedgerEntryRow.entry_hash == newest.entry_hash))
        if found is None:
            raise refuse(f"saved sheet {newest.id} was built on ledger head "
                         f"{newest.entry_hash[:12]}…, which is no longer in the chain: entries "
                         "were removed or replaced")
    return report
