"""The loaded vehicle's inertia as a report document: items in, ``wbledger.inertia/1`` out.

Pure: the command line fetches the type, the empty state, the installed items and the
configuration from the store, reads the plan, and passes them in; this module builds the list
of mass items, calls :func:`ledger.core.inertia.combined_inertia` and returns a JSON-able dict
(SI, the unit in every key) that :mod:`ledger.report.inertia` renders.

The items
---------
1. **The empty vehicle, less what is listed separately** ("empty vehicle (rest)"): the ledger's
   current empty mass and CG minus every item installed through the ledger and minus every item
   a ``remove`` configuration takes out. Its own inertia comes from the type data:

   - ``measured``: the type's tensor about the empty CG in body axes, applied as recorded; the
     items a configuration removes are taken out of it by the parallel-axis theorem;
   - ``gyration``: an **estimate** from nondimensional radii of gyration (Raymer, Aircraft
     Design: A Conceptual Approach, §16.7, eqs 16.52–16.54) with the rest's mass:
     ``Ixx = b²·M·Rx²/4``, ``Iyy = L²·M·Ry²/4``, ``Izz = ((b + L)/2)²·M·Rz²/4``;
   - none: refused. A point mass would understate every moment by far.

2. **Installed items** from the ledger, with their shapes (a point mass where none is recorded).
3. **Configuration items** that a configuration installs, with their shapes.
4. **Loads** of a plan: persons and cargo at their stations, usable fuel at the CG of the usable
   part of each tank's contents (point masses).

Axes and signs (stated in every document): the report's tensor is about the loaded CG in body
axes, x forward, y right, z down (``x_b = −(x − x_cg)``, ``y_b = y − y_cg``,
``z_b = −(z − z_cg)``, a 180° rotation about y from the datum axes, x aft, y right, z up):
Ixx, Iyy, Izz and Ixz are the same in both; Ixy and Iyz change sign. Products are given in the
positive-product convention ``Ixy = Σ m·x·y``; the tensor's off-diagonal terms are −Ixy.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import dataclass, field, replace
from typing import Any

import numpy as np

from ledger.analysis import MISSING
from ledger.caution import CAUTION
from ledger.errors import InputError, MassPropertiesError

__all__ = [
    "SCHEMA",
    "GROUPS",
    "MassItem",
    "shape_tensor",
    "describe_shape",
    "empty_rest",
    "installed_mass_items",
    "configuration_mass_items",
    "plan_mass_items",
    "PHASES",
    "default_phase",
    "phase_tank_masses",
    "inertia_document",
]

SCHEMA = "wbledger.inertia/1"

#: Item groups, in report order.
GROUPS = ("empty vehicle", "installed", "configuration", "person", "cargo", "equipment",
          "ballast", "fuel")

AXES_STATEMENT = ("Body axes about the loaded CG: x forward, y right, z down "
                  "(x_b = −(x − x_cg), y_b = y − y_cg, z_b = −(z − z_cg)); the datum axes are x "
                  "aft, y right, z up. Ixx, Iyy, Izz and Ixz are the same in both; Ixy and Iyz "
                  "change sign between them.")
PRODUCT_STATEMENT = ("Products of inertia in the positive-product convention Ixy = Σ m·x·y "
                     "(likewise Ixz, Iyz); the inertia tensor's off-diagonal terms are −Ixy.")
INCLINATION_STATEMENT = ("ε = ½·atan2(2·Ixz, Izz − Ixx) in body axes: the angle of the principal "
                         "x axis from x_b toward z_b (positive nose-down), exact when Ixy = Iyz "
                         "= 0.")


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

    def to_dict(self) -> dict:
        return {"name": self.name, "group": self.group, "mass_kg": self.mass_kg,
                "x_m": self.x_m, "y_m": self.y_m, "z_m": self.z_m,
                "z_assumed": self.z_assumed,
                "shape": None if self.shape is None else dict(self.shape),
                "own_inertia": self.own_source}


# --- shapes ---------------------------------------------------------------------------------

_DIMS = {  # shape kind -> (core dimension name, shape key)
    "point": (),
    "box": (("a", "length_m"), ("b", "width_m"), ("c", "height_m")),
    "cylinder": (("r", "radius_m"), ("h", "length_m")),
    "hollow_cylinder": (("R", "radius_m"), ("r", "inner_radius_m"), ("h", "length_m")),
    "disk": (("r", "radius_m"),),
    "rod": (("L", "length_m"),),
    "sphere": (("r", "radius_m"),),
}
_AXIAL = ("cylinder", "hollow_cylinder", "disk", "rod")


def _shape_dict(shape) -> dict | None:
    """A shape as a plain dict: a type file's :class:`Shape`, a ledger dict, or None."""
    if shape is None:
        return None
    if isinstance(shape, Mapping):
        d = dict(shape)
    else:
        d = {k: getattr(shape, k) for k in ("kind", "length_m", "width_m", "height_m",
                                            "radius_m", "inner_radius_m", "axis")
             if getattr(shape, k, None) is not None}
    return {k: v for k, v in d.items() if v is not None}


def shape_tensor(shape, mass_kg: float, *, field: str = "shape") -> np.ndarray:
    """Own inertia tensor (datum-parallel axes, about the item's CG) of a shape.

    ``shape`` is a dict such as ``{"kind": "box", "length_m": 2, "width_m": 1, "height_m": 1}``
    (what the ledger stores) or a type file's :class:`ledger.typedata.Shape`; None is a point
    mass. Box extents: length along x, width along y, height along z.

    Examples
    --------
    >>> shape_tensor({"kind": "box", "length_m": 1.0, "width_m": 2.0, "height_m": 3.0},
    ...              12.0).diagonal().tolist()
    [13.0, 10.0, 5.0]
    >>> shape_tensor(None, 5.0).any()
    np.False_
    """
    from ledger.core.inertia import shape_inertia

    d = _shape_dict(shape)
    if d is None:
        return np.zeros((3, 3))
    kind = d.get("kind")
    if kind not in _DIMS:
        raise InputError(f"{field}.kind", kind, "one of " + ", ".join(_DIMS))
    dims = {}
    for core_name, key in _DIMS[kind]:
        if key not in d:
            raise InputError(f"{field}.{key}", MISSING, f"a length in m; a {kind} takes " +
                             ", ".join(k for _, k in _DIMS[kind]))
        dims[core_name] = d[key]
    axis = d.get("axis", "x") if kind in _AXIAL else "x"
    return shape_inertia(kind, mass_kg, axis=axis, **dims)


def describe_shape(shape) -> str:
    """One line for a shape, in m.

    Examples
    --------
    >>> describe_shape({"kind": "cylinder", "radius_m": 0.2, "length_m": 1.5, "axis": "y"})
    'cylinder r 0.2 m, length 1.5 m, axis y'
    """
    d = _shape_dict(shape)
    if d is None or d.get("kind") == "point":
        return "point mass"
    kind = d["kind"]
    words = {"length_m": "length", "width_m": "width", "height_m": "height",
             "radius_m": "r", "inner_radius_m": "inner r"}
    parts = [f"{words[k]} {d[k]:g} m" for _, k in _DIMS[kind] if k in d]
    text = f"{kind} " + ", ".join(parts)
    if kind in _AXIAL and "axis" in d:
        text += f", axis {d['axis']}"
    return text


def _item(name: str, group: str, mass: float, x: float, y: float | None, z: float | None,
          shape=None) -> MassItem:
    sd = _shape_dict(shape)
    if sd is not None and sd.get("kind") == "point":
        sd = None
    return MassItem(name=name, group=group, mass_kg=float(mass), x_m=float(x),
                    y_m=float(y or 0.0), z_m=None if z is None else float(z), shape=sd,
                    own_source="shape" if sd is not None else "point mass")


# --- building the item list -------------------------------------------------------------------

def installed_mass_items(installed: Iterable) -> list[MassItem]:
    """Items installed through the ledger (:class:`ledger.store.entries.InstalledItem` or any
    object with ``name, mass_kg, x_m, y_m, z_m, shape``)."""
    return [_item(i.name, "installed", i.mass_kg, i.x_m, i.y_m, i.z_m,
                  getattr(i, "shape", None)) for i in installed]


def configuration_mass_items(configuration) -> tuple[list[MassItem], list[MassItem]]:
    """(installed, removed) items of a configuration.

    ``configuration`` is a :class:`ledger.store.configs.ConfigurationView` (items with
    ``action``), or a type file's :class:`ledger.typedata.Configuration` (one ``action`` for
    all its items), or None.
    """
    if configuration is None:
        return [], []
    inst, rem = [], []
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


def _usable_arms(tank, usable_kg: float, density: float) -> tuple[float, float, float | None]:
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
    out = []
    for a_tot, a_un in zip(full, un):
        if a_tot is None or a_un is None:
            out.append(None)
        else:
            out.append((m_tot * a_tot - m_un * a_un) / usable_kg)
    return tuple(out)


def plan_mass_items(plan, vtype, *, tank_masses: Mapping[str, float] | None = None
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


def default_phase(vtype) -> str:
    """``"takeoff"`` for an aircraft, ``"departure"`` for a ground vehicle."""
    return "departure" if getattr(vtype, "kind", None) == "ground_vehicle" else "takeoff"


def phase_tank_masses(sheet: Mapping[str, Any], phase: str, vtype) -> dict[str, float]:
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
    out = {}
    for f in sheet.get("fuel") or []:
        if phase == "zero_fuel":
            tank = vtype.tank(f["tank"]) if vtype is not None else None
            out[f["tank"]] = 0.0 if tank is None or tank.is_fuel else float(f["ramp_mass_kg"])
        else:
            out[f["tank"]] = float(f[_PHASE_KEY[phase]])
    return out


def empty_rest(vtype, empty_mass_kg: float, empty_cg_m: Sequence[float | None],
               separate: Sequence[MassItem] = (), removed: Sequence[MassItem] = ()
               ) -> tuple[MassItem, dict]:
    """The empty vehicle less the items listed separately, with its own inertia.

    Parameters
    ----------
    vtype : VehicleType
        Gives the inertia data (``vtype.inertia``: measured, gyration or None).
    empty_mass_kg, empty_cg_m : float, (x, y, z)
        The ledger's current empty mass and CG (z must be known by now).
    separate : sequence of MassItem
        Items installed through the ledger: inside the empty mass, outside the type's measured
        tensor (listed on their own, or taken off by a configuration).
    removed : sequence of MassItem
        Items of the vehicle as weighed that a configuration takes out.

    Returns
    -------
    (MassItem, dict)
        The rest, with ``own`` set, and the ``empty_inertia`` section of the document.

    Raises
    ------
    InputError
        The type has no inertia data.
    MassPropertiesError
        The items take out as much mass as the empty vehicle has, or leave a tensor no body
        can have.
    """
    from ledger.core.inertia import RAYMER_SOURCE, estimate_from_gyration, to_body_axes

    data = getattr(vtype, "inertia", None)
    if data is None:
        raise InputError(
            "inertia", MISSING,
            f"inertia data of the empty vehicle in type {vtype.name}: an [inertia] table with "
            "basis = \"measured\" (ixx, iyy, izz about the empty CG, body axes) or basis = "
            "\"gyration\" (rx, ry, rz, span, length)",
            hint="Add it to the type file and import it again; a point mass would understate "
                 "every moment")
    cg = np.array([float(c) for c in empty_cg_m])
    m_empty = float(empty_mass_kg)
    out = list(separate) + list(removed)
    m_out = math.fsum(i.mass_kg for i in out)
    m_rest = m_empty - m_out
    if not m_rest > 1e-9 * m_empty:
        raise MassPropertiesError(
            "empty vehicle", round(m_empty, 6),
            f"more mass than the {m_out:.3f} kg of items listed separately or removed "
            f"({', '.join(i.name for i in out)})",
            hint="Check the installed items and the configuration against the last weighing")
    mom = m_empty * cg - sum((i.mass_kg * np.array([i.x_m, i.y_m, i.z_m]) for i in out),
                             np.zeros(3))
    cg_rest = mom / m_rest

    def parallel(m: float, r: np.ndarray) -> np.ndarray:
        return m * (float(r @ r) * np.eye(3) - np.outer(r, r))

    if data.basis == "measured":
        body = np.array([[data.ixx_kg_m2, -data.ixy_kg_m2, -data.ixz_kg_m2],
                         [-data.ixy_kg_m2, data.iyy_kg_m2, -data.iyz_kg_m2],
                         [-data.ixz_kg_m2, -data.iyz_kg_m2, data.izz_kg_m2]])
        # The measured tensor belongs to the vehicle as weighed, about its CG: the empty vehicle
        # less the ledger's installed items. Take the removed items out of it, then move it to
        # the rest's CG (parallel-axis theorem in both steps).
        m_ref = m_empty - math.fsum(i.mass_kg for i in separate)
        ref_cg = (m_empty * cg - sum((i.mass_kg * np.array([i.x_m, i.y_m, i.z_m])
                                      for i in separate), np.zeros(3))) / m_ref
        t = to_body_axes(body)  # body -> datum-parallel (the rotation is its own inverse)
        for i in removed:
            r = np.array([i.x_m, i.y_m, i.z_m]) - ref_cg
            t = t - shape_tensor(i.shape, i.mass_kg, field=f"item {i.name!r} shape") \
                - parallel(i.mass_kg, r)
        if removed:
            t = t - parallel(m_rest, cg_rest - ref_cg)
        own = 0.5 * (t + t.T)
        w = np.linalg.eigvalsh(own)
        scale = max(float(np.abs(own).max()), 1e-300)
        if w[0] < -1e-9 * scale or w[2] > w[0] + w[1] + 1e-9 * scale:
            raise MassPropertiesError(
                "inertia", [round(float(v), 6) for v in w],
                "a measured tensor that still describes a body once the removed items are "
                "taken out (principal moments of 0 or more, each at most the sum of the "
                "others)", hint="The removed items' masses, arms or shapes do not fit the "
                "measured inertia; check them")
        own_body = to_body_axes(own)
        section = {
            "basis": "measured", "estimate": False,
            "source": "type data, measured about the empty CG in body axes",
            "note": data.note or "",
            "applied_to": "the empty vehicle less the items listed separately" +
                          ("; the removed items were taken out of the measured tensor by the "
                           "parallel-axis theorem" if removed else ""),
            "parameters": {"Ixx_kgm2": data.ixx_kg_m2, "Iyy_kgm2": data.iyy_kg_m2,
                           "Izz_kgm2": data.izz_kg_m2, "Ixy_product_kgm2": data.ixy_kg_m2,
                           "Ixz_product_kgm2": data.ixz_kg_m2,
                           "Iyz_product_kgm2": data.iyz_kg_m2},
        }
        source = "measured"
    elif data.basis == "gyration":
        est = estimate_from_gyration(m_rest, data.span_m, data.length_m, data.rx, data.ry,
                                     data.rz)
        own = np.diag([est.Ixx, est.Iyy, est.Izz])  # diagonal: the same in datum axes
        own_body = own
        section = {
            "basis": "gyration", "estimate": True,
            "source": RAYMER_SOURCE,
            "note": data.note or "",
            "applied_to": "the empty vehicle less the items listed separately, with its mass "
                          "M; products of inertia are not estimated (taken as 0)",
            "parameters": {"rx": data.rx, "ry": data.ry, "rz": data.rz, "span_m": data.span_m,
                           "length_m": data.length_m, "mass_kg": m_rest},
        }
        source = "estimate"
    else:  # pragma: no cover - the type parser allows only the two bases
        raise InputError("inertia.basis", data.basis, "measured or gyration")
    section["own_inertia_kgm2"] = {
        "Ixx": float(own_body[0, 0]), "Iyy": float(own_body[1, 1]),
        "Izz": float(own_body[2, 2]), "Ixy_product": float(-own_body[0, 1]),
        "Ixz_product": float(-own_body[0, 2]), "Iyz_product": float(-own_body[1, 2]),
        "axes": "body axes about the rest's own CG"}
    section["mass_kg"] = m_rest
    section["cg_m"] = {"x": float(cg_rest[0]), "y": float(cg_rest[1]), "z": float(cg_rest[2])}
    rest = MassItem(name="empty vehicle (rest)", group="empty vehicle", mass_kg=m_rest,
                    x_m=float(cg_rest[0]), y_m=float(cg_rest[1]), z_m=float(cg_rest[2]),
                    own=own, own_source=source)
    return rest, section


def _fill_z(items: Sequence[MassItem], assume_z_m: float | None) -> tuple[list[MassItem], list]:
    missing = [i for i in items if i.z_m is None]
    if not missing:
        return list(items), []
    if assume_z_m is None:
        names = ", ".join(repr(i.name) for i in missing[:6]) + (" …" if len(missing) > 6 else "")
        raise InputError(
            "z", MISSING,
            f"a vertical arm for every item; none is recorded for {names}",
            hint="Give the vertical arms in the type file or the ledger, record the vertical CG "
                 "(wbledger cg-height), or pass --assume-z LENGTH to place those items at one "
                 "height (the report lists them)")
    out = [replace(i, z_m=float(assume_z_m), z_assumed=True) if i.z_m is None else i
           for i in items]
    return out, [i.name for i in missing]


def _rank(cols: np.ndarray, items: Sequence[MassItem], totals: Sequence[float]) -> dict:
    ranked = {}
    for k, name in enumerate(("Ixx", "Iyy", "Izz")):
        total = totals[k]
        order = sorted(range(len(items)), key=lambda i: (-cols[i, k], i))
        ranked[name] = [{"item": items[i].name, "group": items[i].group,
                         "kgm2": float(cols[i, k]),
                         "percent": (100.0 * float(cols[i, k]) / total) if total > 0 else None}
                        for i in order]
    return ranked


def inertia_document(vtype, empty_mass_kg: float, empty_cg_m: Sequence[float | None], *,
                     installed: Iterable = (), configuration=None,
                     loads: Sequence[MassItem] = (), assume_z_m: float | None = None,
                     vehicle: Mapping[str, Any] | None = None,
                     condition: Mapping[str, Any] | None = None) -> dict:
    """Mass, CG and inertia of the loaded vehicle about its CG, as a ``wbledger.inertia/1`` dict.

    Parameters
    ----------
    vtype : VehicleType
        The vehicle's type (inertia data, stations, tanks, display units).
    empty_mass_kg : float
        Current empty mass (the ledger's), kg.
    empty_cg_m : (x, y, z or None)
        Current empty CG, datum coordinates, m. A z of None needs ``assume_z_m``.
    installed : iterable
        Items installed through the ledger (:func:`installed_mass_items` accepts them).
    configuration : ConfigurationView or Configuration, optional
        Items switched in or out by a configuration.
    loads : sequence of MassItem
        Persons, cargo and fuel (:func:`plan_mass_items`), or any other items.
    assume_z_m : float, optional
        Vertical arm for every item (and the empty vehicle) without one; listed in
        ``warnings`` and flagged on each item.
    vehicle, condition : mapping, optional
        Copied into the document (registration, type, revision; configuration, plan, phase).

    Returns
    -------
    dict
        ``schema``, ``caution``, ``vehicle``, ``condition``, ``axes`` (convention statements),
        ``mass_kg``, ``cg_m`` (datum), ``moments_kgm2`` (Ixx, Iyy, Izz), ``products_kgm2``
        (positive-product convention, labelled), ``tensor_kgm2`` (rows; off-diagonal =
        −product), ``principal`` (moments ascending and unit axes in body axes),
        ``radii_of_gyration_m``, ``inclination``, ``empty_inertia`` (its source, ``estimate``
        flag), ``items`` (each with its six contributions), ``ranking`` (items by contribution
        to each moment), ``warnings``, ``units``.

    Examples
    --------
    A made-up drone: 1.2 kg empty with a measured tensor and a 0.3 kg battery box on top:

    >>> from ledger.typedata import MeasuredInertia
    >>> class T:  # the parts of a VehicleType this needs
    ...     name, inertia, units = "demo", MeasuredInertia(0.02, 0.02, 0.03), None
    >>> bat = MassItem("battery", "cargo", 0.3, 0.0, 0.0, 0.05,
    ...                {"kind": "box", "length_m": 0.15, "width_m": 0.05, "height_m": 0.04})
    >>> d = inertia_document(T(), 1.2, (0.0, 0.0, 0.0), loads=[bat])
    >>> d["mass_kg"], round(d["cg_m"]["z"], 6), d["empty_inertia"]["basis"]
    (1.5, 0.01, 'measured')
    >>> round(d["moments_kgm2"]["Ixx"], 9)   # 0.02 + 0.3·(0.05²+0.04²)/12 + 1.2·0.3/1.5·0.05²
    0.0207025
    """
    from ledger.core.inertia import (
        BODY_AXES,
        CONTRIBUTION_COLUMNS,
        PRODUCT_CONVENTION,
        combined_inertia,
        x_axis_inclination,
    )

    warnings: list[str] = []
    inst_all = installed_mass_items(installed)
    cfg_in, cfg_out = configuration_mass_items(configuration)
    # A configuration that removes an item installed through the ledger takes that item off
    # the list (it is still taken out of the empty mass once, like every installed item).
    on = {i.name for i in inst_all}
    off = {i.name for i in cfg_out if i.name in on}
    cfg_out = [i for i in cfg_out if i.name not in off]
    cg = list(empty_cg_m)
    z_assumed_empty = False
    if cg[2] is None:
        if assume_z_m is None:
            raise InputError(
                "empty vehicle z", MISSING,
                "the vertical CG of the empty vehicle, which inertia needs (Ixx, Iyy and Ixz "
                "depend on it)",
                hint="Record it with `wbledger cg-height REG …` (road vehicles) or a weighing "
                     "that gives it, or pass --assume-z LENGTH to take one height (the report "
                     "says so)")
        cg[2] = float(assume_z_m)
        z_assumed_empty = True
        warnings.append(f"vertical CG of the empty vehicle not recorded: taken as z = "
                        f"{_z_text(vtype, assume_z_m)} (--assume-z)")
    inst_all, miss_a = _fill_z(inst_all, assume_z_m)
    inst = [i for i in inst_all if i.name not in off]
    cfg_in, miss_b = _fill_z(cfg_in, assume_z_m)
    cfg_out, miss_c = _fill_z(cfg_out, assume_z_m)
    loads_f, miss_d = _fill_z(list(loads), assume_z_m)
    missing = miss_a + miss_b + miss_c + miss_d
    if missing:
        warnings.append(f"no vertical arm recorded for {', '.join(missing)}: placed at z = "
                        f"{_z_text(vtype, assume_z_m)} (--assume-z)")
    rest, empty_section = empty_rest(vtype, empty_mass_kg, cg, inst_all, cfg_out)
    if z_assumed_empty:
        rest = replace(rest, z_assumed=True)
    if empty_section["estimate"]:
        warnings.append("the empty vehicle's own inertia is an ESTIMATE from radii of gyration "
                        "(Raymer §16.7, a conceptual-design method); use measured figures "
                        "where the result matters")
    items = [rest] + inst + cfg_in + loads_f
    masses = np.array([i.mass_kg for i in items])
    pos = np.array([[i.x_m, i.y_m, i.z_m] for i in items])
    owns = np.array([i.own if i.own is not None else
                     shape_tensor(i.shape, i.mass_kg, field=f"item {i.name!r} shape")
                     for i in items])
    res = combined_inertia(masses, pos, owns, frame="body")
    # Rounding noise (1e-19 m on a symmetric vehicle) is shown as the 0 it is.
    len_scale = float(np.abs(pos).max()) or 1.0
    i_scale = float(np.abs(np.diag(res.tensor)).max()) or 1.0
    cg_out = [_clean(float(c), len_scale) for c in res.cg]
    tensor = [[_clean(float(res.tensor[r, c]), i_scale) for c in range(3)] for r in range(3)]
    ixy, ixz, iyz = -tensor[0][1] + 0.0, -tensor[0][2] + 0.0, -tensor[1][2] + 0.0
    ax = np.array([[_clean(float(v), 1.0) for v in row] for row in res.principal_axes])
    inclination = x_axis_inclination(tensor[0][0], tensor[2][2], ixz) + 0.0
    totals = (res.Ixx, res.Iyy, res.Izz)
    cols = res.contributions
    item_rows = []
    for i, it in enumerate(items):
        row = it.to_dict()
        row["shape_text"] = describe_shape(it.shape) if it.own is None else it.own_source
        row["contribution_kgm2"] = {c: float(cols[i, k]) for k, c in
                                    enumerate(CONTRIBUTION_COLUMNS)}
        item_rows.append(row)
    units = getattr(vtype, "units", None)
    k = res.radii_of_gyration
    doc = {
        "schema": SCHEMA,
        "caution": CAUTION,
        "vehicle": dict(vehicle or {"type": getattr(vtype, "name", None)}),
        "condition": dict(condition or {}),
        "axes": {"frame": "body", "origin": "loaded CG", "x": "forward", "y": "right",
                 "z": "down", "statement": AXES_STATEMENT, "core": BODY_AXES,
                 "products": PRODUCT_STATEMENT, "core_products": PRODUCT_CONVENTION},
        "units": {"mass": "kg", "length": "m", "inertia": "kg*m2", "angle": "deg",
                  "display": units.to_dict() if units is not None else None},
        "mass_kg": res.mass,
        "cg_m": {"x": cg_out[0], "y": cg_out[1], "z": cg_out[2],
                 "axes": "datum: x aft, y right, z up"},
        "moments_kgm2": {"Ixx": res.Ixx, "Iyy": res.Iyy, "Izz": res.Izz,
                         "names": {"Ixx": "roll", "Iyy": "pitch", "Izz": "yaw"}},
        "products_kgm2": {"convention": "positive-product: Ixy = Σ m·x·y (body axes)",
                          "Ixy": ixy, "Ixz": ixz, "Iyz": iyz},
        "tensor_kgm2": {"convention": "inertia tensor in body axes; off-diagonal terms are "
                                      "−products (tensor[x][y] = −Ixy)",
                        "rows": tensor},
        "principal": {
            "moments_kgm2": [float(v) for v in res.principal_moments],
            "axes": [{"moment_kgm2": float(res.principal_moments[j]),
                      "axis_body": [float(ax[r, j]) for r in range(3)]}
                     for j in range(3)],
            "note": "ascending; unit axes in body axes (x forward, y right, z down), "
                    "right-handed set"},
        "radii_of_gyration_m": {"kx": float(k[0]), "ky": float(k[1]), "kz": float(k[2])},
        "inclination": {"deg": math.degrees(inclination), "rad": inclination,
                        "statement": INCLINATION_STATEMENT},
        "empty_inertia": empty_section,
        "items": item_rows,
        "ranking": _rank(cols, items, totals),
        "warnings": warnings,
    }
    _check_finite(doc)
    return doc


def _z_text(vtype, z_m: float) -> str:
    """A vertical arm in the type's display unit, and in m if that is another unit."""
    units = getattr(vtype, "units", None)
    unit = getattr(units, "length", "m") or "m"
    if unit == "m":
        return f"{z_m:g} m"
    from ledger.units import to_unit

    return f"{round(to_unit(z_m, unit), 6):g} {unit} ({z_m:.4g} m)"


def _clean(v: float, scale: float) -> float:
    return 0.0 if abs(v) <= 1e-12 * scale else v + 0.0


def _check_finite(obj, path: str = "document") -> None:
    if isinstance(obj, float):
        if not math.isfinite(obj):
            raise MassPropertiesError(path, obj, "a finite number")
    elif isinstance(obj, dict):
        for k, v in obj.items():
            _check_finite(v, f"{path}.{k}")
    elif isinstance(obj, list):
        for i, v in enumerate(obj):
            _check_finite(v, f"{path}[{i}]")
