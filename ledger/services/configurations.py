"""Configurations: define, list and show named groups of removable items of a type or vehicle.

The results are the JSON documents ``wbledger config`` prints: a configuration's
:meth:`~ledger.store.configs.ConfigurationView.to_dict`, plus (for one configuration) the owner
type's display units under ``units``.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

from sqlalchemy.engine import Engine

from ledger.services.database import unit_of_work
from ledger.store import configs

__all__ = ["parse_items", "define_configuration", "list_configurations", "show_configuration"]


def parse_items(install: Sequence[str] = (), remove: Sequence[str] = ()) -> list[dict[str, Any]]:
    """The items of ``--install NAME=MASS@ARM…`` and ``--remove NAME[=MASS@ARM…]`` as typed,
    installed items first; raises :class:`ledger.errors.InputError` for a malformed one."""
    return ([{"action": "install", **configs.parse_item_spec(t, field="--install")}
             for t in install]
            + [{"action": "remove", **configs.parse_item_spec(t, field="--remove")}
               for t in remove])


def define_configuration(engine: Engine, name: str, *, actor: str,
                         type_name: str | None = None, registration: str | None = None,
                         items: Sequence[dict[str, Any]] = (),
                         description: str | None = None,
                         disables_stations: Sequence[str] = (),
                         replace: bool = False) -> dict[str, Any]:
    """Define (with ``replace``, redefine) a configuration of a type or of one vehicle, from
    items read by :func:`parse_items`; returns its document."""
    with unit_of_work(engine) as session:
        view = configs.define_configuration(
            session, name, actor=actor, type_name=type_name, registration=registration,
            items=items, description=description, disables_stations=disables_stations,
            replace=replace)
        return configs.configuration_document(session, view)


def list_configurations(engine: Engine, *, type_name: str | None = None,
                        registration: str | None = None) -> list[dict[str, Any]]:
    """Configurations of a vehicle (its type's and its own), of a type, or (neither) all."""
    with unit_of_work(engine) as session:
        return [c.to_dict() for c in configs.list_configurations(
            session, type_name=type_name, registration=registration)]


def show_configuration(engine: Engine, name: str, *, type_name: str | None = None,
                       registration: str | None = None) -> dict[str, Any]:
    """One configuration; for a vehicle, with removed items resolved from its ledger."""
    with unit_of_work(engine) as session:
        view = (configs.configuration_items(session, registration, name) if registration
                else configs.get_configuration(session, name, type_name=type_name))
        return configs.configuration_document(session, view)
