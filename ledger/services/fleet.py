"""The fleet: adding a vehicle, every vehicle's current state, one vehicle in full.

The documents are :func:`ledger.store.views.fleet_view` and
:func:`ledger.store.views.vehicle_view` (SI values with unit-named keys, and the type's display
units).
"""

from __future__ import annotations

from typing import Any

from sqlalchemy.engine import Engine
from sqlalchemy.orm import Session

from ledger.services.database import unit_of_work
from ledger.store.catalog import add_vehicle as _add_vehicle
from ledger.store.views import fleet_view, vehicle_view

__all__ = ["add_vehicle", "fleet", "vehicle"]


def add_vehicle(engine: Engine, registration: str, type_name: str, *,
                serial: str | None = None, note: str | None = None) -> str:
    """Add a vehicle of an imported type; returns its registration as stored (normalised by
    :func:`ledger.store.catalog.registration_key`)."""
    with unit_of_work(engine) as session:
        return _add_vehicle(session, registration, type_name, serial=serial, note=note
                            ).registration


def fleet(engine: Engine) -> list[dict[str, Any]]:
    """Every vehicle: type, current empty mass and CG, last weighing, warnings, and
    ``not_verified``: why its evidence does not verify (None when it does)."""
    from ledger.store.evidence import unverified_vehicles

    with unit_of_work(engine) as session:
        rows = fleet_view(session)
        problems = unverified_vehicles(session)
    return [{**r, "not_verified": problems.get(r["registration"])} for r in rows]


def vehicle(engine: Engine, registration: str) -> dict[str, Any]:
    """One vehicle: type, current empty state, last weighing, items, recent entries, and
    ``not_verified`` as in :func:`fleet`."""
    with unit_of_work(engine) as session:
        return marked(session, vehicle_view(session, registration))


def marked(session: Session, doc: dict[str, Any]) -> dict[str, Any]:
    """``doc`` (of one vehicle) with ``not_verified``: why its evidence does not verify, or
    None (issue 13 item 5: a ledger that ``sheet`` refuses does not look normal elsewhere)."""
    from ledger.store.evidence import unverified_vehicles

    reg = doc["registration"]
    return {**doc, "not_verified": unverified_vehicles(session, reg).get(reg)}
