"""What a sheet starts from: the empty weight, the configuration's items and the plan's load.

Internal to :mod:`ledger.loadsheet` (the builder's first step): each function turns one input
into the document's rows and adds it to a running :class:`MassState`.
"""

from __future__ import annotations

import datetime as dt
import math
from collections.abc import Iterable, Mapping
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from ledger.errors import PlanError
from ledger.loadsheet.document import ConfigurationItemDoc, ItemDoc, Vector

if TYPE_CHECKING:
    from ledger.typedata.model import Station, VehicleType
    from ledger.typedata.plan import Plan

__all__ = ["EmptyWeight", "ConfigurationItem", "MassState", "finite", "attr", "iso_date",
           "empty_mass_state", "config_items", "load_items"]


@dataclass(frozen=True)
class EmptyWeight:
    """The empty vehicle a sheet starts from (the attributes :class:`ledger.store.entries.
    EmptyState` also has, so either can be passed).

    ``mz_kgm`` means something only when ``z_known``.
    """

    mass_kg: float
    mx_kgm: float
    my_kgm: float = 0.0
    mz_kgm: float = 0.0
    z_known: bool = False
    seq: int | None = None
    entry_date: dt.date | str | None = None
    entry_id: int | None = None


@dataclass(frozen=True)
class ConfigurationItem:
    """An item a configuration installs (``action="install"``) or removes (``"remove"``)."""

    name: str
    mass_kg: float
    x_m: float
    y_m: float | None = 0.0
    z_m: float | None = None
    action: str = "install"


def finite(v: Any) -> float | None:
    """A finite float, or None (NaN and None become None)."""
    if v is None:
        return None
    v = float(v)
    return v if math.isfinite(v) else None


def attr(obj: Any, name: str, default: Any = None) -> Any:
    """``obj.name`` of an object, or ``obj[name]`` of a mapping."""
    if isinstance(obj, Mapping):
        return obj.get(name, default)
    return getattr(obj, name, default)


def iso_date(v: Any) -> str | None:
    if v is None:
        return None
    return v.isoformat() if hasattr(v, "isoformat") else str(v)


@dataclass
class MassState:
    """Mass and first moments; ``mz`` None when some vertical arm is unknown."""

    mass: float
    mx: float
    my: float
    mz: float | None

    def plus(self, m: float, x: float, y: float | None, z: float | None) -> MassState:
        y = y or 0.0
        mz = None if (self.mz is None or z is None) else self.mz + m * z
        return MassState(self.mass + m, self.mx + m * x, self.my + m * y, mz)

    def cg(self) -> Vector:
        m = self.mass
        if m <= 0:
            return {"x": None, "y": None, "z": None}
        return {"x": self.mx / m, "y": self.my / m,
                "z": None if self.mz is None else self.mz / m}


def empty_mass_state(empty: Any) -> MassState:
    """The empty weight (:class:`EmptyWeight` or anything with its attributes) as a state."""
    m = float(attr(empty, "mass_kg"))
    if not (math.isfinite(m) and m > 0):
        raise PlanError("empty weight", m, "a recorded empty mass greater than 0",
                        hint="Record a weighing first")
    z_known = bool(attr(empty, "z_known", False))
    mz = attr(empty, "mz_kgm", None)
    return MassState(m, float(attr(empty, "mx_kgm")), float(attr(empty, "my_kgm", 0.0) or 0.0),
                     float(mz) if (z_known and mz is not None) else None)


def config_items(vtype: VehicleType, plan: Plan, configuration_items: Iterable[Any] | None,
                 ) -> tuple[str | None, list[ConfigurationItemDoc]]:
    """(name, items as document rows) of the configuration in use."""
    if configuration_items is None:
        if plan.configuration is None:
            return None, []
        try:
            cfg = vtype.configuration(plan.configuration)
        except LookupError:
            known = ", ".join(c.name for c in vtype.configurations) or "none"
            raise PlanError("configuration", plan.configuration,
                            f"a configuration of type {vtype.name}: {known}") from None
        items: list[Any] = [ConfigurationItem(i.name, i.mass_kg, i.x_m, i.y_m, i.z_m,
                                              cfg.action) for i in cfg.items]
    else:
        items = list(configuration_items)
    out: list[ConfigurationItemDoc] = []
    for it in items:
        action = attr(it, "action", "install")
        mass = finite(attr(it, "mass_kg"))
        x = finite(attr(it, "x_m"))
        if mass is None or x is None:
            raise PlanError(f"configuration item {attr(it, 'name')!r}", attr(it, "mass_kg"),
                            "an item with a recorded mass and arm")
        out.append({"name": attr(it, "name"), "action": action, "mass_kg": mass,
                    "x_m": x, "y_m": finite(attr(it, "y_m")) or 0.0,
                    "z_m": finite(attr(it, "z_m")),
                    "signed_mass_kg": mass if action == "install" else -mass})
    return plan.configuration, out


def _station_arm(st: Station, load: Any) -> float:
    x = getattr(load, "x_m", None)
    return st.x_m if x is None else x


def load_items(vtype: VehicleType, plan: Plan) -> list[ItemDoc]:
    """The plan's people and cargo as the document's ``items``."""
    out: list[ItemDoc] = []
    for p in plan.persons:
        st = vtype.station(p.seat)
        out.append({"station": st.name, "kind": st.kind, "label": p.name or "",
                    "mass_kg": p.mass_kg, "x_m": st.x_m, "y_m": st.y_m, "z_m": st.z_m,
                    "moment_x_kgm": p.mass_kg * st.x_m, "max_mass_kg": st.max_mass_kg,
                    "mass_source": p.mass_source, "occupant_class": p.occupant_class})
    for c in plan.cargo:
        st = vtype.station(c.station)
        x = _station_arm(st, c)
        out.append({"station": st.name, "kind": st.kind, "label": c.what or "",
                    "mass_kg": c.mass_kg, "x_m": x, "y_m": st.y_m, "z_m": st.z_m,
                    "moment_x_kgm": c.mass_kg * x, "max_mass_kg": st.max_mass_kg,
                    "mass_source": "actual", "occupant_class": None})
    return out
