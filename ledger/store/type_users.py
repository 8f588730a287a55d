"""What a new revision of a type would touch: the type's newest revision, the revision that
already holds some content, and the vehicles of the type (every one of them is computed with
the newest revision, so a new revision moves them all onto it)."""

from __future__ import annotations

from sqlalchemy import select
from sqlalchemy.orm import Session

from ledger.store.models import TypeRevisionRow, VehicleRow, VehicleTypeRow

__all__ = ["newest_revision", "revision_with_content", "type_vehicles"]


def _revisions(type_name: str):
    return (select(TypeRevisionRow).join(VehicleTypeRow,
                                         VehicleTypeRow.id == TypeRevisionRow.type_id)
            .where(VehicleTypeRow.name == type_name))


def newest_revision(session: Session, type_name: str) -> TypeRevisionRow | None:
    """The newest revision row of ``type_name``, or None for a type not imported yet."""
    return session.scalar(_revisions(type_name).order_by(TypeRevisionRow.revision.desc())
                          .limit(1))


def revision_with_content(session: Session, type_name: str, content_sha256: str) -> int | None:
    """The revision of ``type_name`` whose content hash is ``content_sha256``, if any."""
    row = session.scalar(_revisions(type_name)
                         .where(TypeRevisionRow.content_sha256 == content_sha256))
    return None if row is None else row.revision


def type_vehicles(session: Session, type_name: str) -> list[str]:
    """Registrations of the vehicles of ``type_name``, sorted."""
    return list(session.scalars(
        select(VehicleRow.registration).join(VehicleTypeRow,
                                             VehicleTypeRow.id == VehicleRow.type_id)
        .where(VehicleTypeRow.name == type_name).order_by(VehicleRow.registration)))
