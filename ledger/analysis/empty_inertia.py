"""The empty vehicle's own item of an inertia report: its mass, CG and own inertia.

The empty vehicle less what is listed separately ("empty vehicle (rest)") is the ledger's
current empty mass and CG minus every item installed through the ledger and minus every item a
``remove`` configuration takes out. Its own inertia comes from the type data:

- ``measured``: the type's tensor about the empty CG in body axes, applied as recorded; the
  items a configuration removes are taken out of it by the parallel-axis theorem;
- ``gyration``: an **estimate** from nondimensional radii of gyration (Raymer, Aircraft
  Design: A Conceptual Approach, §16.7, eqs 16.52–16.54) with the rest's mass:
  ``Ixx = b²·M·Rx²/4``, ``Iyy = L²·M·Ry²/4``, ``Izz = ((b + L)/2)²·M·Rz²/4``;
- none: refused. A point mass would understate every moment by far.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Any, NamedTuple, TypedDict

import numpy as np

from ledger.analysis import MISSING
from ledger.analysis.mass_items import MassItem
from ledger.analysis.shapes import shape_tensor
from ledger.core.inertia import RAYMER_SOURCE, estimate_from_gyration, to_body_axes
from ledger.errors import InputError, MassPropertiesError

__all__ = ["EmptyInertiaSection", "OwnInertia", "Point", "empty_rest"]


class Point(TypedDict):
    """A point in datum axes, m."""

    x: float
    y: float
    z: float


class OwnInertia(TypedDict):
    """The rest's own inertia about its own CG, body axes, kg·m² (products positive)."""

    Ixx: float
    Iyy: float
    Izz: float
    Ixy_product: float
    Ixz_product: float
    Iyz_product: float
    axes: str


class EmptyInertiaSection(TypedDict):
    """The ``empty_inertia`` section of a ``wbledger.inertia/1`` document."""

    basis: str
    estimate: bool
    source: str
    note: str
    applied_to: str
    parameters: dict[str, float | None]
    own_inertia_kgm2: OwnInertia
    mass_kg: float
    cg_m: Point


class _Own(NamedTuple):
    """The rest's own inertia and where it came from."""

    datum: np.ndarray  # about the rest's CG, datum-parallel axes
    body: np.ndarray  # the same in body axes
    source: str  # "measured" or "estimate"
    source_text: str
    applied_to: str
    parameters: dict[str, float | None]


def _parallel(m: float, r: np.ndarray) -> np.ndarray:
    """The parallel-axis term of a mass ``m`` at ``r`` from the reference point."""
    return m * (float(r @ r) * np.eye(3) - np.outer(r, r))


def _arms(item: MassItem) -> np.ndarray:
    return np.array([item.x_m, item.y_m, item.z_m])


def _measured(data: Any, m_empty: float, cg: np.ndarray, separate: Sequence[MassItem],
              removed: Sequence[MassItem], m_rest: float, cg_rest: np.ndarray) -> _Own:
    """The type's measured tensor, with the removed items taken out of it."""
    body = np.array([[data.ixx_kg_m2, -data.ixy_kg_m2, -data.ixz_kg_m2],
                     [-data.ixy_kg_m2, data.iyy_kg_m2, -data.iyz_kg_m2],
                     [-data.ixz_kg_m2, -data.iyz_kg_m2, data.izz_kg_m2]])
    # The measured tensor belongs to the vehicle as weighed, about its CG: the empty vehicle
    # less the ledger's installed items. Take the removed items out of it, then move it to
    # the rest's CG (parallel-axis theorem in both steps).
    m_ref = m_empty - math.fsum(i.mass_kg for i in separate)
    ref_cg = (m_empty * cg - sum((i.mass_kg * _arms(i) for i in separate), np.zeros(3))) / m_ref
    t = to_body_axes(body)  # body -> datum-parallel (the rotation is its own inverse)
    for i in removed:
        r = _arms(i) - ref_cg
        t = t - shape_tensor(i.shape, i.mass_kg, field=f"item {i.name!r} shape") \
            - _parallel(i.mass_kg, r)
    if removed:
        t = t - _parallel(m_rest, cg_rest - ref_cg)
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
    return _Own(
        datum=own, body=to_body_axes(own), source="measured",
        source_text="type data, measured about the empty CG in body axes",
        applied_to="the empty vehicle less the items listed separately" +
                   ("; the removed items were taken out of the measured tensor by the "
                    "parallel-axis theorem" if removed else ""),
        parameters={"Ixx_kgm2": data.ixx_kg_m2, "Iyy_kgm2": data.iyy_kg_m2,
                    "Izz_kgm2": data.izz_kg_m2, "Ixy_product_kgm2": data.ixy_kg_m2,
                    "Ixz_product_kgm2": data.ixz_kg_m2, "Iyz_product_kgm2": data.iyz_kg_m2})


def _gyration(data: Any, m_rest: float) -> _Own:
    """An estimate from the type's radii of gyration with the rest's mass."""
    est = estimate_from_gyration(m_rest, data.span_m, data.length_m, data.rx, data.ry, data.rz)
    own = np.diag([est.Ixx, est.Iyy, est.Izz])  # diagonal: the same in datum axes
    return _Own(
        datum=own, body=own, source="estimate", source_text=RAYMER_SOURCE,
        applied_to="the empty vehicle less the items listed separately, with its mass "
                   "M; products of inertia are not estimated (taken as 0)",
        parameters={"rx": data.rx, "ry": data.ry, "rz": data.rz, "span_m": data.span_m,
                    "length_m": data.length_m, "mass_kg": m_rest})


def empty_rest(vtype: Any, empty_mass_kg: float, empty_cg_m: Sequence[float | None],
               separate: Sequence[MassItem] = (), removed: Sequence[MassItem] = ()
               ) -> tuple[MassItem, EmptyInertiaSection]:
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
    (MassItem, EmptyInertiaSection)
        The rest, with ``own`` set, and the ``empty_inertia`` section of the document.

    Raises
    ------
    InputError
        The type has no inertia data.
    MassPropertiesError
        The items take out as much mass as the empty vehicle has, or leave a tensor no body
        can have.
    """
    data = getattr(vtype, "inertia", None)
    if data is None:
        raise InputError(
            "inertia", MISSING,
            f"inertia data of the empty vehicle in type {vtype.name}: an [inertia] table with "
            "basis = \"measured\" (ixx, iyy, izz about the empty CG, body axes) or basis = "
            "\"gyration\" (rx, ry, rz, span, length)",
            hint="Add it to the type file and import it again; a point mass would understate "
                 "every moment")
    cg = np.array([float(c) for c in empty_cg_m])  # type: ignore[arg-type]  # z known by now
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
    cg_rest = (m_empty * cg - sum((i.mass_kg * _arms(i) for i in out), np.zeros(3))) / m_rest
    if data.basis == "measured":
        own = _measured(data, m_empty, cg, separate, removed, m_rest, cg_rest)
    elif data.basis == "gyration":
        own = _gyration(data, m_rest)
    else:  # pragma: no cover - the type parser allows only the two bases
        raise InputError("inertia.basis", data.basis, "measured or gyration")
    b = own.body
    section: EmptyInertiaSection = {
        "basis": data.basis, "estimate": own.source == "estimate",
        "source": own.source_text, "note": data.note or "", "applied_to": own.applied_to,
        "parameters": own.parameters,
        "own_inertia_kgm2": {
            "Ixx": float(b[0, 0]), "Iyy": float(b[1, 1]), "Izz": float(b[2, 2]),
            "Ixy_product": float(-b[0, 1]), "Ixz_product": float(-b[0, 2]),
            "Iyz_product": float(-b[1, 2]), "axes": "body axes about the rest's own CG"},
        "mass_kg": m_rest,
        "cg_m": {"x": float(cg_rest[0]), "y": float(cg_rest[1]), "z": float(cg_rest[2])},
    }
    rest = MassItem(name="empty vehicle (rest)", group="empty vehicle", mass_kg=m_rest,
                    x_m=float(cg_rest[0]), y_m=float(cg_rest[1]), z_m=float(cg_rest[2]),
                    own=own.datum, own_source=own.source)
    return rest, section
