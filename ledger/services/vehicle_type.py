"""The parsed type of a registered vehicle, with the revision it was read from."""

from __future__ import annotations

from typing import NamedTuple, cast

from sqlalchemy.orm import Session

from ledger.store.catalog import get_vehicle, vehicle_type
from ledger.typedata import VehicleType

__all__ = ["RegisteredType", "registered_type"]


class RegisteredType(NamedTuple):
    """A vehicle's type as the ledger holds it now: its newest revision, parsed."""

    revision: int
    vtype: VehicleType


def registered_type(session: Session, registration: str) -> RegisteredType:
    """The type of the vehicle ``registration`` (NotFoundError names the known vehicles)."""
    row, vtype = vehicle_type(session, get_vehicle(session, registration))
    return RegisteredType(row.revision, cast(VehicleType, vtype))
