"""The mass items of a loaded vehicle: installed items, configuration items and a plan's loads.

Each item is a :class:`MassItem` in SI, datum axes (x aft, y right, z up), with its shape when
one is recorded. The empty vehicle's own item is built by :mod:`ledger.analysis.empty_inertia`.
A plan's fuel follows the loading sheet at the chosen phase (:func:`phase_tank_masses`).
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping
from dataclasses import dataclass, field
from typing import Any, cast

import numpy as np

from ledger.analysis import MISSING
from ledger.analysis.shapes import shape_dict
from ledger.errors import InputError

__all__ = [
    "GROUPS",
    "MassItem",
    "installed_mass_items",
    "configuration_mass_items",
    "plan_mass_items",
    "PHASES",
    "default_phase",
    "phase_tank_masses",
]

#: Item groups, in report order.
GROUPS = ("empty vehicle", "installed", "configuration", "person", "cargo", "equipment",
          "ballast", "fuel")


@dataclass(frozen=True)
class MassItem:
    """One item of the loaded vehicle, SI, datum axes (x aft, y right, z up).

    ``own`` is the item's own tensor about its CG in datum-parallel axes (None: from ``shape``,
    or a point mass). ``own_source`` says where it came from (``"point mass"``, ``"shape"``,
    ``"measured"``, ``"estimate"``).
    """

    name: str
    group: str
    mass_kg: float
    x_m: float
    y_m: float = 0.0
    z_m: float | None = None
    shape: Mapping[str, Any] | None = None
    own: np.ndarray | None = field(default=None, compare=False, repr=False)
    own_source: str = "point mass"
    z_assumed: bool = False

    def to_dict(self) -> dict[str, Any]:
        """The item's row of the report document (before its contributions)."""
        return {"name": self.name, "group": self.group, "mass_kg": self.mass_kg,
                "x_m": self.x_m, "y_m": self.y_m, "z_m": self.z_m,
                "z_assumed": self.z_assumed,
                "shape": None if self.shape is None else dict(self.shape),
                "own_inertia": self.own_source}


def _item(name: str, group: str, mass: float, x: float, y: float | None, z: float | None,
          shape: Any = None) -> MassItem:
    sd = shape_dict(shape)
    if sd is not None and sd.get("kind") == "point":
        sd = None
    return MassItem(name=name, group=group, mass_kg=float(mass), x_m=float(x),
                    y_m=float(y or 0.0), z_m=None if z is None else float(z), shape=sd,
                    own_source="shape" if sd is not None else "point mass")


# --- building the item list -------------------------------------------------------------------

def installed_mass_items(installed: Iterable[Any]) -> list[MassItem]:
    """Items installed through the ledger (:class:`ledger.store.entries.InstalledItem` or any
    object with ``name, mass_kg, x_m, y_m, z_m, shape``)."""
    return [_item(i.name, "installed", i.mass_kg, i.x_m, i.y_m, i.z_m,
                  getattr(i, "shape", None)) for i in installed]


def configuration_mass_items(configuration: Any) -> tuple[list[MassItem], list[MassItem]]:
    """(installed, removed) items of a configuration.

    ``configuration`` is a :class:`ledger.store.configs.ConfigurationView` (items with
    ``action``), or a type file's :class:`ledger.typedata.Configuration` (one ``action`` for
    all its items), or None.
    """
    if configuration is None:
        return [], []
    inst: list[MassItem] = []
    rem: list[MassItem] = []
    for it in configuration.items:
        action = getattr(it, "action", None) or configuration.action
        if it.mass_kg is None or it.x_m is None:
            raise InputError(f"configuration {configuration.name!r}.{it.name}", MISSING,
                             "an item with a mass and an arm (resolve it against the vehicle's "
                             "ledger first)")
        item = _item(it.name, "configuration", it.mass_kg, it.x_m, it.y_m, it.z_m,
                     getattr(it, "shape", None))
        (inst if action == "install" else rem).append(item)
    return inst, rem


def _usable_arms(tank: Any, usable_kg: float, density: float
                 ) -> tuple[float, float | None, float | None]:
    """Arms of the usable part of a tank's contents: contents at (unusable + usable) less the
    unusable part at its own arms (the unusable fuel belongs to the empty weight)."""
    q_un = tank.unusable
    q_use = tank.quantity_of(usable_kg, density)
    q_tot = q_un + q_use
    full = tank.arms_at(q_tot)
    if q_un <= 0 or not tank.arm_table:
        return full
    un = tank.arms_at(q_un)
    m_un = tank.mass_of(q_un, density)
    m_tot = m_un + usable_kg
    out: list[float | None] = []
    for a_tot, a_un in zip(full, un):
        if a_tot is None or a_un is None:
            out.append(None)
        else:
            out.append((m_tot * a_tot - m_un * a_un) / usable_kg)
    return cast(float, out[0]), out[1], out[2]  # a tank always has its x arm


def plan_mass_items(plan: Any, vtype: Any, *, tank_masses: Mapping[str, float] | None = None
                    ) -> list[MassItem]:
    """Persons, cargo and fuel of a parsed :class:`ledger.typedata.plan.Plan` as point masses.

    A load's group is its station's kind (cargo, equipment, ballast); persons are "person".

    ``tank_masses`` (usable kg per tank) overrides the plan's loaded fuel, e.g. the fuel left at
    take-off or landing; by default the fuel as loaded (ramp).
    """
    items: list[MassItem] = []
    for p in plan.persons:
        st = vtype.station(p.seat)
        label = p.name or p.seat
        items.append(_item(f"{label} ({p.seat})" if p.name else label, "person", p.mass_kg,
                           st.x_m, st.y_m, st.z_m))
    for c in plan.cargo:
        st = vtype.station(c.station)
        label = f"{c.what} ({c.station})" if c.what else c.station
        x = getattr(c, "x_m", None)  # a load placed at its own arm within a compartment
        group = st.kind if st.kind in GROUPS else "cargo"
        items.append(_item(label, group, c.mass_kg, st.x_m if x is None else x, st.y_m,
                           st.z_m))
    for t in plan.tanks:
        tank = vtype.tank(t.tank)
        mass = t.mass_kg if tank_masses is None else float(tank_masses.get(t.tank, 0.0))
        if mass <= 0:
            continue
        x, y, z = _usable_arms(tank, mass, t.density_kg_m3)
        items.append(_item(f"{tank.fluid} ({t.tank})", "fuel", mass, x, y, z))
    return items


#: Phases of a plan an inertia report may be made for (aircraft, then ground vehicles).
PHASES = ("zero_fuel", "ramp", "takeoff", "landing", "departure", "arrival")
_PHASE_KEY = {"ramp": "ramp_mass_kg", "takeoff": "takeoff_mass_kg",
              "landing": "landing_mass_kg", "departure": "ramp_mass_kg",
              "arrival": "landing_mass_kg"}


def default_phase(vtype: Any) -> str:
    """``"takeoff"`` for an aircraft, ``"departure"`` for a ground vehicle."""
    return "departure" if getattr(vtype, "kind", None) == "ground_vehicle" else "takeoff"


def phase_tank_masses(sheet: Mapping[str, Any], phase: str, vtype: Any) -> dict[str, float]:
    """Usable mass (kg) in each tank at ``phase``, from a loading-sheet document's ``fuel``.

    The loading sheet (:func:`ledger.loadsheet.build.build_sheet`) draws taxi and trip fuel in
    the plan's burn sequence; taking its figures keeps the inertia report and the sheet on the
    same fuel. At ``zero_fuel`` the fuel tanks are empty and other fluids stay as loaded.

    Examples
    --------
    >>> sheet = {"fuel": [{"tank": "main", "ramp_mass_kg": 100.0, "takeoff_mass_kg": 95.0,
    ...                    "landing_mass_kg": 40.0}]}
    >>> phase_tank_masses(sheet, "landing", None)
    {'main': 40.0}
    """
    ground = getattr(vtype, "kind", None) == "ground_vehicle"
    allowed = ("departure", "arrival") if ground else ("zero_fuel", "ramp", "takeoff",
                                                        "landing")
    if vtype is not None and phase not in allowed:
        raise InputError("--phase", phase, "one of " + ", ".join(allowed) +
                         (" for a ground vehicle" if ground else " for an aircraft"))
    out: dict[str, float] = {}
    for f in sheet.get("fuel") or []:
        if phase == "zero_fuel":
            tank = vtype.tank(f["tank"]) if vtype is not None else None
            out[f["tank"]] = 0.0 if tank is None or tank.is_fuel else float(f["ramp_mass_kg"])
        else:
            out[f["tank"]] = float(f[_PHASE_KEY[phase]])
    return out
