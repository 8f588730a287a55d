"""The type a vehicle is computed with: the newest revision of its type, parsed and verified."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from sqlalchemy import select
from sqlalchemy.orm import Session

from ledger.store.models import VehicleTypeRow

__all__ = ["TypeInfo", "type_info", "vehicle_type_info"]


@dataclass(frozen=True)
class TypeInfo:
    """The type a vehicle is computed with: its newest revision."""

    name: str
    revision_id: int
    revision: int
    vtype: Any  # ledger.typedata.VehicleType


def vehicle_type_info(session: Session, vehicle) -> TypeInfo:
    """The newest revision of the vehicle's type, parsed (cached by content hash)."""
    return type_info(session, vehicle.type_id)


def type_info(session: Session, type_id: int) -> TypeInfo:
    """The newest revision of type ``type_id``, parsed, once the type's chain of revisions
    verifies (:func:`ledger.store.evidence.checked_type`)."""
    from ledger.store.evidence import checked_type

    row, vtype = checked_type(session, type_id)
    name = session.scalar(select(VehicleTypeRow.name).where(VehicleTypeRow.id == type_id))
    return TypeInfo(name, row.id, row.revision, vtype)
