"""The loaded vehicle's inertia as a report document: items in, ``wbledger.inertia/1`` out.

Pure: a service (:mod:`ledger.services.inertia`) fetches the type, the empty state, the
installed items and the configuration from the store, reads the plan, and passes them in; this
module gathers the mass items, calls :func:`ledger.core.inertia.combined_inertia` and returns a
typed, JSON-able document (:class:`InertiaDocument`; SI, the unit in every key) that
:mod:`ledger.report.inertia` renders.

The items
---------
1. **The empty vehicle, less what is listed separately** ("empty vehicle (rest)", built by
   :mod:`ledger.analysis.empty_inertia`, which says where its own inertia comes from).
2. **Installed items** from the ledger, with their shapes (a point mass where none is recorded).
3. **Configuration items** that a configuration installs, with their shapes.
4. **Loads** of a plan: persons and cargo at their stations, usable fuel at the CG of the usable
   part of each tank's contents (point masses). :mod:`ledger.analysis.mass_items` builds 2–4.

Axes and signs (stated in every document): the report's tensor is about the loaded CG in body
axes, x forward, y right, z down (``x_b = −(x − x_cg)``, ``y_b = y − y_cg``,
``z_b = −(z − z_cg)``, a 180° rotation about y from the datum axes, x aft, y right, z up):
Ixx, Iyy, Izz and Ixz are the same in both; Ixy and Iyz change sign. Products are given in the
positive-product convention ``Ixy = Σ m·x·y``; the tensor's off-diagonal terms are −Ixy.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import replace
from typing import Any, NamedTuple, cast

import numpy as np

from ledger.analysis import MISSING
from ledger.analysis.empty_inertia import EmptyInertiaSection, empty_rest
from ledger.analysis.inertia_types import (
    InertiaCondition,
    InertiaDocument,
    InertiaItemRow,
    InertiaVehicle,
    Principal,
    RankRow,
)
from ledger.analysis.mass_items import (
    GROUPS,
    PHASES,
    MassItem,
    configuration_mass_items,
    default_phase,
    installed_mass_items,
    phase_tank_masses,
    plan_mass_items,
)
from ledger.analysis.shapes import describe_shape, shape_tensor
from ledger.bounds import item_field
from ledger.caution import CAUTION
from ledger.core.inertia import (
    BODY_AXES,
    CONTRIBUTION_COLUMNS,
    PRODUCT_CONVENTION,
    InertiaResult,
    combined_inertia,
    x_axis_inclination,
)
from ledger.errors import InputError, MassPropertiesError
from ledger.units import to_unit

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
    "InertiaDocument",
    "InertiaVehicle",
    "InertiaCondition",
    "InertiaItemRow",
]

SCHEMA = "wbledger.inertia/1"

AXES_STATEMENT = ("Body axes about the loaded CG: x forward, y right, z down "
                  "(x_b = −(x − x_cg), y_b = y − y_cg, z_b = −(z − z_cg)); the datum axes are x "
                  "aft, y right, z up. Ixx, Iyy, Izz and Ixz are the same in both; Ixy and Iyz "
                  "change sign between them.")
PRODUCT_STATEMENT = ("Products of inertia in the positive-product convention Ixy = Σ m·x·y "
                     "(likewise Ixz, Iyz); the inertia tensor's off-diagonal terms are −Ixy.")
INCLINATION_STATEMENT = ("ε = ½·atan2(2·Ixz, Izz − Ixx) in body axes: the angle of the principal "
                         "x axis from x_b toward z_b (positive nose-down), exact when Ixy = Iyz "
                         "= 0.")


# --- the items, with their vertical arms ------------------------------------------------------

class _Items(NamedTuple):
    """Every item of the loaded vehicle, the empty vehicle's section, and the warnings so far."""

    items: list[MassItem]
    empty: EmptyInertiaSection
    warnings: list[str]


def _fill_z(items: Sequence[MassItem], assume_z_m: float | None
            ) -> tuple[list[MassItem], list[str]]:
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


def _empty_cg(vtype: Any, empty_cg_m: Sequence[float | None], assume_z_m: float | None,
              warnings: list[str]) -> tuple[list[float | None], bool]:
    """The empty CG with its vertical arm, assumed (and said so) when none is recorded."""
    cg = list(empty_cg_m)
    if cg[2] is not None:
        return cg, False
    if assume_z_m is None:
        raise InputError(
            "empty vehicle z", MISSING,
            "the vertical CG of the empty vehicle, which inertia needs (Ixx, Iyy and Ixz "
            "depend on it)",
            hint="Record it with `wbledger cg-height REG …` (road vehicles) or a weighing "
                 "that gives it, or pass --assume-z LENGTH to take one height (the report "
                 "says so)")
    cg[2] = float(assume_z_m)
    warnings.append(f"vertical CG of the empty vehicle not recorded: taken as z = "
                    f"{_z_text(vtype, assume_z_m)} (--assume-z)")
    return cg, True


def _loaded_items(vtype: Any, empty_mass_kg: float, empty_cg_m: Sequence[float | None],
                  installed: Iterable[Any], configuration: Any, loads: Sequence[MassItem],
                  assume_z_m: float | None) -> _Items:
    """The empty vehicle's rest first, then installed, configuration and load items."""
    warnings: list[str] = []
    inst_all = installed_mass_items(installed)
    cfg_in, cfg_out = configuration_mass_items(configuration)
    # A configuration that removes an item installed through the ledger takes that item off
    # the list (it is still taken out of the empty mass once, like every installed item).
    on = {i.name for i in inst_all}
    off = {i.name for i in cfg_out if i.name in on}
    cfg_out = [i for i in cfg_out if i.name not in off]
    cg, z_assumed_empty = _empty_cg(vtype, empty_cg_m, assume_z_m, warnings)
    inst_all, miss_a = _fill_z(inst_all, assume_z_m)
    inst = [i for i in inst_all if i.name not in off]
    cfg_in, miss_b = _fill_z(cfg_in, assume_z_m)
    cfg_out, miss_c = _fill_z(cfg_out, assume_z_m)
    loads_f, miss_d = _fill_z(list(loads), assume_z_m)
    missing = miss_a + miss_b + miss_c + miss_d
    if missing:
        warnings.append(f"no vertical arm recorded for {', '.join(missing)}: placed at z = "
                        f"{_z_text(vtype, cast(float, assume_z_m))} (--assume-z)")
    rest, empty_section = empty_rest(vtype, empty_mass_kg, cg, inst_all, cfg_out)
    if z_assumed_empty:
        rest = replace(rest, z_assumed=True)
    if empty_section["estimate"]:
        warnings.append("the empty vehicle's own inertia is an ESTIMATE from radii of gyration "
                        "(Raymer §16.7, a conceptual-design method); use measured figures "
                        "where the result matters")
    return _Items([rest] + inst + cfg_in + loads_f, empty_section, warnings)


# --- the figures ------------------------------------------------------------------------------

def _item_rows(items: Sequence[MassItem], cols: np.ndarray) -> list[InertiaItemRow]:
    rows = []
    for i, it in enumerate(items):
        row = it.to_dict()
        row["shape_text"] = describe_shape(it.shape) if it.own is None else it.own_source
        row["contribution_kgm2"] = {c: float(cols[i, k]) for k, c in
                                    enumerate(CONTRIBUTION_COLUMNS)}
        rows.append(cast(InertiaItemRow, row))
    return rows


def _rank(cols: np.ndarray, items: Sequence[MassItem], totals: Sequence[float]
          ) -> dict[str, list[RankRow]]:
    ranked = {}
    for k, name in enumerate(("Ixx", "Iyy", "Izz")):
        total = totals[k]
        order = sorted(range(len(items)), key=lambda i: (-cols[i, k], i))
        ranked[name] = [RankRow(item=items[i].name, group=items[i].group,
                                kgm2=float(cols[i, k]),
                                percent=(100.0 * float(cols[i, k]) / total) if total > 0
                                else None)
                        for i in order]
    return ranked


def _principal(res: InertiaResult) -> Principal:
    ax = np.array([[_clean(float(v), 1.0) for v in row] for row in res.principal_axes])
    return {
        "moments_kgm2": [float(v) for v in res.principal_moments],
        "axes": [{"moment_kgm2": float(res.principal_moments[j]),
                  "axis_body": [float(ax[r, j]) for r in range(3)]}
                 for j in range(3)],
        "note": "ascending; unit axes in body axes (x forward, y right, z down), "
                "right-handed set"}


def inertia_document(vtype: Any, empty_mass_kg: float, empty_cg_m: Sequence[float | None], *,
                     installed: Iterable[Any] = (), configuration: Any = None,
                     loads: Sequence[MassItem] = (), assume_z_m: float | None = None,
                     vehicle: Mapping[str, Any] | None = None,
                     condition: Mapping[str, Any] | None = None) -> InertiaDocument:
    """Mass, CG and inertia of the loaded vehicle about its CG, as ``wbledger.inertia/1``.

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
    InertiaDocument
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
    loaded = _loaded_items(vtype, empty_mass_kg, empty_cg_m, installed, configuration, loads,
                           assume_z_m)
    items = loaded.items
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
    inclination = x_axis_inclination(tensor[0][0], tensor[2][2], ixz) + 0.0
    units = getattr(vtype, "units", None)
    k = res.radii_of_gyration
    doc: InertiaDocument = {
        "schema": SCHEMA,
        "caution": CAUTION,
        "vehicle": cast(InertiaVehicle, dict(vehicle or {"type": getattr(vtype, "name", None)})),
        "condition": cast(InertiaCondition, dict(condition or {})),
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
        "principal": _principal(res),
        "radii_of_gyration_m": {"kx": float(k[0]), "ky": float(k[1]), "kz": float(k[2])},
        "inclination": {"deg": math.degrees(inclination), "rad": inclination,
                        "statement": INCLINATION_STATEMENT},
        "empty_inertia": loaded.empty,
        "items": _item_rows(items, res.contributions),
        "ranking": _rank(res.contributions, items, (res.Ixx, res.Iyy, res.Izz)),
        "warnings": loaded.warnings,
    }
    _check_finite(doc)
    return doc


def _z_text(vtype: Any, z_m: float) -> str:
    """A vertical arm in the type's display unit, and in m if that is another unit."""
    units = getattr(vtype, "units", None)
    unit = getattr(units, "length", "m") or "m"
    if unit == "m":
        return f"{z_m:g} m"
    return f"{round(to_unit(z_m, unit), 6):g} {unit} ({z_m:.4g} m)"


def _clean(v: float, scale: float) -> float:
    return 0.0 if abs(v) <= 1e-12 * scale else v + 0.0


def _check_finite(obj: object, path: str = "document") -> None:
    if isinstance(obj, float):
        if not math.isfinite(obj):
            raise MassPropertiesError(path, obj, "a finite number")
    elif isinstance(obj, dict):
        for k, v in obj.items():
            _check_finite(v, f"{path}.{k}")
    elif isinstance(obj, list):
        for i, v in enumerate(obj):
            _check_finite(v, item_field(path, i))
