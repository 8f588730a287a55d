"""The road-vehicle report documents as types.

What :mod:`ledger.analysis.ground` returns and :mod:`ledger.report.ground` renders:
``wbledger.corners/1``, ``wbledger.cg-height/1`` and ``wbledger.axle-rules/1``. TypedDicts, so
that each document is the plain dict its JSON is (``--json`` prints it as it is); the keys carry
their unit.
"""

from __future__ import annotations

from typing import Any, Literal, NotRequired, TypedDict

__all__ = [
    "GroundVehicle",
    "CornersDocument",
    "CgHeightInputs",
    "CgHeightReading",
    "StoredEntry",
    "CgHeightDocument",
    "RuleSetDocument",
]


class GroundVehicle(TypedDict):
    """The vehicle a document is for; ``type_revision`` when it came from the ledger."""

    registration: str | None
    type: str | None
    title: str | None
    kind: str | None
    type_revision: NotRequired[int]


class CornersDocument(TypedDict):
    """A ``wbledger.corners/1`` document: four wheel loads and what follows from them."""

    schema: str
    caution: str
    vehicle: GroundVehicle | None
    units: dict[str, str] | None
    readings_kg: dict[str, float]
    geometry_m: dict[str, float]
    geometry_source: dict[str, str]
    total_kg: float
    front_kg: float
    rear_kg: float
    left_kg: float
    right_kg: float
    cg_m: dict[str, float]
    cg_x_behind_front_axle_m: float
    percent: dict[str, float]
    diagonals_percent: dict[str, float]
    diagonal_note: str
    formulas: dict[str, str]


class CgHeightInputs(TypedDict):
    """The level weighing and the geometry; the level load is the grounded axle's."""

    total_kg: float
    wheelbase_m: float
    wheel_radius_m: float
    front_level_kg: NotRequired[float]
    rear_level_kg: NotRequired[float]
    datum_height_m: float | None


class CgHeightReading(TypedDict):
    """One lift angle: the grounded axle's load (``front_…`` or ``rear_tilted_kg``)."""

    angle_deg: float
    front_tilted_kg: NotRequired[float]
    rear_tilted_kg: NotRequired[float]
    load_change_kg: float
    total_tilted_kg: float | None
    height_m: float


class StoredEntry(TypedDict):
    """The ledger entry a CG height was recorded as."""

    registration: str
    seq: int
    entry_date: str


class CgHeightDocument(TypedDict):
    """A ``wbledger.cg-height/1`` document; ``stored`` once a service has recorded it (or not:
    False on a dry run)."""

    schema: str
    caution: str
    vehicle: GroundVehicle | None
    units: dict[str, str] | None
    method: str
    raised_axle: str
    grounded_axle: str
    angle_source: str
    inputs: CgHeightInputs
    readings: list[CgHeightReading]
    height_m: float
    residual_rms_kg: float
    height_spread_m: float
    z_m: float | None
    assumptions: list[str]
    stored: NotRequired[StoredEntry | Literal[False]]


class RuleSetDocument(TypedDict):
    """A ``wbledger.axle-rules/1`` document: a rule set's file (as
    :meth:`ledger.rules.RuleSetFile.to_dict` gives it), with its bridge table when asked."""

    schema: str
    caution: str
    name: str
    title: str
    jurisdiction: str
    source: str
    note: str
    path: str
    builtin: bool
    limits_kg: dict[str, float]
    definitions_m: dict[str, float]
    bridge_formula: dict[str, Any]
    advisory: str
    bridge_table: dict[str, Any] | None
