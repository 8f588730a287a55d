"""The ``wbledger.inertia/1`` document as types.

What :func:`ledger.analysis.inertia.inertia_document` returns and :mod:`ledger.report.inertia`
renders.

TypedDicts, so that the document is the plain dict its JSON is (``--json`` prints it as it is);
the keys carry their unit.
"""

from __future__ import annotations

from typing import Any, TypedDict

from ledger.analysis.empty_inertia import EmptyInertiaSection

__all__ = [
    "InertiaVehicle",
    "InertiaCondition",
    "InertiaAxes",
    "InertiaUnits",
    "LoadedCG",
    "Moments",
    "Products",
    "Tensor",
    "PrincipalAxis",
    "Principal",
    "Radii",
    "Inclination",
    "InertiaItemRow",
    "RankRow",
    "InertiaDocument",
]


class InertiaVehicle(TypedDict, total=False):
    """Who the report is for (copied from the caller)."""

    registration: str
    type: str | None
    type_revision: int
    kind: str
    title: str


class InertiaCondition(TypedDict, total=False):
    """The loading condition reported (copied from the caller)."""

    configuration: str | None
    plan: str | None
    phase: str | None
    empty_entry_seq: int
    empty_entry_date: str
    sheet_phase_mass_kg: float | None


class InertiaAxes(TypedDict):
    frame: str
    origin: str
    x: str
    y: str
    z: str
    statement: str
    core: str
    products: str
    core_products: str


class InertiaUnits(TypedDict):
    mass: str
    length: str
    inertia: str
    angle: str
    display: dict[str, str] | None


class LoadedCG(TypedDict):
    x: float
    y: float
    z: float
    axes: str


class Moments(TypedDict):
    Ixx: float
    Iyy: float
    Izz: float
    names: dict[str, str]


class Products(TypedDict):
    convention: str
    Ixy: float
    Ixz: float
    Iyz: float


class Tensor(TypedDict):
    convention: str
    rows: list[list[float]]


class PrincipalAxis(TypedDict):
    moment_kgm2: float
    axis_body: list[float]


class Principal(TypedDict):
    moments_kgm2: list[float]
    axes: list[PrincipalAxis]
    note: str


class Radii(TypedDict):
    kx: float
    ky: float
    kz: float


class Inclination(TypedDict):
    deg: float
    rad: float
    statement: str


class InertiaItemRow(TypedDict):
    """One item of the report, datum axes, with its share of each moment and product."""

    name: str
    group: str
    mass_kg: float
    x_m: float
    y_m: float
    z_m: float
    z_assumed: bool
    shape: dict[str, Any] | None
    own_inertia: str
    shape_text: str
    contribution_kgm2: dict[str, float]


class RankRow(TypedDict):
    item: str
    group: str
    kgm2: float
    percent: float | None


class InertiaDocument(TypedDict):
    """A ``wbledger.inertia/1`` document; its JSON is the ``--json`` output."""

    schema: str
    caution: str
    vehicle: InertiaVehicle
    condition: InertiaCondition
    axes: InertiaAxes
    units: InertiaUnits
    mass_kg: float
    cg_m: LoadedCG
    moments_kgm2: Moments
    products_kgm2: Products
    tensor_kgm2: Tensor
    principal: Principal
    radii_of_gyration_m: Radii
    inclination: Inclination
    empty_inertia: EmptyInertiaSection
    items: list[InertiaItemRow]
    ranking: dict[str, list[RankRow]]
    warnings: list[str]
