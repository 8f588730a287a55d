"""Fuel on a sheet: the usable fuel per tank at ramp, take-off and landing, and the burn path.

Internal to :mod:`ledger.loadsheet`. Taxi fuel is drawn first, then trip fuel, both in the
plan's burn sequence (:func:`ledger.core.fuel.burn_states`); the unusable fuel is in the empty
weight, so every figure here is usable fuel.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from ledger.core.fuel import Tank as CoreTank
from ledger.core.fuel import burn_states
from ledger.loadsheet.document import TankDoc

if TYPE_CHECKING:
    from ledger.typedata.model import Tank, VehicleType
    from ledger.typedata.plan import Plan, TankLoad

__all__ = ["FuelStates", "fuel_states", "fuel_doc"]


@dataclass
class FuelStates:
    """Fuel states (usable fuel only: the unusable fuel is in the empty weight)."""

    tanks: list[Tank]          # type Tank objects of the fuel tanks loaded, in burn-list order
    loads: list[TankLoad]      # TankLoad per tank
    ramp: np.ndarray           # (T,) usable kg per tank
    takeoff: np.ndarray
    landing: np.ndarray
    ramp_moment: np.ndarray    # (3,) usable fuel moment (x, y, z)
    takeoff_moment: np.ndarray
    landing_moment: np.ndarray
    path_mass: np.ndarray      # (n,) usable fuel mass along the trip burn
    path_moment: np.ndarray    # (n, 3)
    path_kind: tuple[str, ...]
    z_known: bool
    other: list[tuple[Tank, TankLoad]]   # non-fuel tanks loaded; constant mass


def _core_tank(tank: Tank, load: TankLoad, mass_kg: float) -> tuple[CoreTank, float]:
    """The core's tank holding ``mass_kg`` of usable fuel, and its unusable fuel (kg)."""
    rho = load.density_kg_m3
    unusable = tank.unusable if tank.basis == "mass" else tank.unusable * rho
    if tank.arm_table:
        tm = [r.quantity if tank.basis == "mass" else r.quantity * rho for r in tank.arm_table]
        ta = [(r.x_m, r.y_m, r.z_m if r.z_m is not None else 0.0) for r in tank.arm_table]
        return CoreTank(mass=mass_kg + unusable, unusable=unusable, table_mass=tm,
                        table_arm=ta, name=tank.name), unusable
    return CoreTank(mass=mass_kg + unusable, unusable=unusable,
                    arm=(tank.x_m, tank.y_m, tank.z_m if tank.z_m is not None else 0.0),
                    name=tank.name), unusable


def _tank_z_known(tank: Tank) -> bool:
    if tank.arm_table:
        return all(r.z_m is not None for r in tank.arm_table)
    return tank.z_m is not None


def _fuel_loads(vtype: VehicleType, plan: Plan,
                ) -> tuple[list[tuple[Tank, TankLoad]], list[tuple[Tank, TankLoad]]]:
    """(fuel tanks loaded, in the order they burn; other tanks loaded)."""
    fuel_loads: list[tuple[Tank, TankLoad]] = []
    other: list[tuple[Tank, TankLoad]] = []
    for load in plan.tanks:
        tank = vtype.tank(load.tank)
        (fuel_loads if tank.is_fuel else other).append((tank, load))
    if plan.burn_sequence == "tank order":
        order_names = list(plan.burn_order)
        fuel_loads.sort(key=lambda tl: order_names.index(tl[0].name)
                        if tl[0].name in order_names else len(order_names))
    return fuel_loads, other


def fuel_states(vtype: VehicleType, plan: Plan, samples: int) -> FuelStates:
    """Usable fuel per tank at ramp, take-off and landing, and ``samples`` states between."""
    fuel_loads, other = _fuel_loads(vtype, plan)
    z_known = all(_tank_z_known(t) for t, _ in fuel_loads)
    zero3 = np.zeros(3)
    if not fuel_loads:
        e = np.zeros(0)
        return FuelStates([], [], e, e, e, zero3, zero3, zero3, np.zeros(1), np.zeros((1, 3)),
                          ("start",), True, other)
    tanks = [t for t, _ in fuel_loads]
    loads = [ld for _, ld in fuel_loads]
    seq: Any
    if plan.burn_sequence == "tank order":
        seq = [i for i, t in enumerate(tanks) if t.name in plan.burn_order]
        if not seq:
            seq = [0]
    else:
        seq = "proportional"
    core, unusable_kg = [], []
    for t, ld in fuel_loads:
        ct, u = _core_tank(t, ld, ld.mass_kg)
        core.append(ct)
        unusable_kg.append(u)
    unusable = np.asarray(unusable_kg)
    unusable_moment = np.zeros(3)
    for (t, _), u in zip(fuel_loads, unusable):
        x, y, z = t.arms_at(t.unusable)
        unusable_moment += u * np.array([x, y, z if z is not None else 0.0])
    base = burn_states(core, 0.0, seq, samples=2)
    ramp_moment = base.fuel_moment[0] - unusable_moment

    taxi = burn_states(core, plan.taxi_fuel_kg, seq, samples=2)
    to_total = taxi.tank_mass[-1]
    core_to = [_core_tank(t, ld, max(m - u, 0.0))[0]
               for (t, ld), m, u in zip(fuel_loads, to_total, unusable)]
    trip = burn_states(core_to, plan.trip_fuel_kg, seq, samples=samples)
    takeoff_moment = trip.fuel_moment[0] - unusable_moment
    landing_moment = trip.fuel_moment[-1] - unusable_moment
    ramp = np.array([ld.mass_kg for ld in loads])
    takeoff = np.maximum(to_total - unusable, 0.0)
    landing = np.maximum(trip.tank_mass[-1] - unusable, 0.0)
    return FuelStates(tanks, loads, ramp, takeoff, landing, ramp_moment, takeoff_moment,
                      landing_moment, trip.fuel_mass - unusable.sum(),
                      trip.fuel_moment - unusable_moment, trip.kind, z_known, other)


def fuel_doc(vtype: VehicleType, plan: Plan, fuel: FuelStates) -> list[TankDoc]:
    """The document's ``fuel``: every tank of the type, loaded or not."""
    out: list[TankDoc] = []
    idx = {t.name: i for i, t in enumerate(fuel.tanks)}
    for t in vtype.tanks:
        ld = plan.tank_load(t.name)
        rho = ld.density_kg_m3 if ld else t.density_kg_m3
        if ld is None:
            source = "type" if t.density_from_file else "nominal"
        else:
            source = ld.density_source
        cap_kg = t.capacity if t.basis == "mass" else t.capacity * rho
        unu_kg = t.unusable if t.basis == "mass" else t.unusable * rho
        ramp = ld.mass_kg if ld else 0.0
        if t.name in idx:
            i = idx[t.name]
            to, land = float(fuel.takeoff[i]), float(fuel.landing[i])
        else:
            to = land = ramp  # a tank that does not feed (or holds another fluid)
        out.append({"tank": t.name, "fluid": t.fluid, "basis": t.basis,
                    "density_kg_m3": rho, "density_source": source,
                    "temperature_c": ld.temperature_c if ld else None,
                    "density_15c_kg_m3": ld.density_15c_kg_m3 if ld else None,
                    "ramp_mass_kg": ramp, "ramp_volume_m3": ramp / rho,
                    "capacity_m3": cap_kg / rho, "capacity_kg": cap_kg,
                    "unusable_m3": unu_kg / rho, "unusable_kg": unu_kg,
                    "taxi_mass_kg": ramp - to, "takeoff_mass_kg": to,
                    "trip_mass_kg": to - land, "landing_mass_kg": land,
                    "feeds": t.name in plan.burn_order})
    return out
