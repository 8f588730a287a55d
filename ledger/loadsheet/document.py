"""The loading-sheet document (``wbledger.sheet/1``) as types: what :func:`build_sheet` returns.

These are :class:`typing.TypedDict` classes, so the document stays the plain dict the JSON
output, the saved sheets and the renderers already use; the types only say, for the type
checker and the reader, which keys each part has. ``docs/sheet-document.md`` describes the
meaning of every key; the layout here follows it key for key. Keys marked ``NotRequired`` are
added only in some cases (by code, for a ground vehicle, or when a sheet is saved or amended).

Examples
--------
>>> from ledger.loadsheet.document import PHASE_TITLES, phase_title
>>> phase_title("takeoff"), phase_title("zero_fuel"), phase_title("holding_pattern")
('Take-off', 'Zero-fuel', 'Holding pattern')
"""

# No ``from __future__ import annotations`` here: TypedDict reads NotRequired[...] from the
# evaluated annotations (Python 3.11), and the document test compares those key sets.
from typing import NotRequired, TypedDict

__all__ = [
    "SCHEMA",
    "AIRCRAFT_PHASES",
    "GROUND_PHASES",
    "ENVELOPE_PHASES",
    "PHASE_TITLES",
    "phase_title",
    "SheetDocument",
    "SheetRecord",
    "VehicleDoc",
    "Vector",
    "EmptyWeightDoc",
    "ConfigurationItemDoc",
    "ConfigurationDoc",
    "PreparedDoc",
    "StandardMassesDoc",
    "UnitsDoc",
    "ItemDoc",
    "StationDoc",
    "TankDoc",
    "BurnDoc",
    "EnvelopeResult",
    "AxleRow",
    "PhaseDoc",
    "PathPoint",
    "FirstExit",
    "PathEnvelope",
    "BurnPathDoc",
    "AxleFinding",
    "AxleRuleSetDoc",
    "Violation",
    "FixStep",
    "AfterPhase",
    "AfterDoc",
    "FixDoc",
    "EnvelopePolygon",
    "AmendmentChangeDoc",
    "AmendmentPhaseDoc",
    "AmendmentDifferencesDoc",
    "AmendmentDoc",
]

SCHEMA = "wbledger.sheet/1"
AIRCRAFT_PHASES = ("zero_fuel", "ramp", "takeoff", "landing")
GROUND_PHASES = ("departure", "arrival")
#: Phases whose CG is checked against the flight envelopes.
ENVELOPE_PHASES = ("zero_fuel", "takeoff", "landing")
#: The display title of each phase (the document's ``phases[].label``; renderers show it).
PHASE_TITLES = {"zero_fuel": "Zero-fuel", "ramp": "Ramp", "takeoff": "Take-off",
                "landing": "Landing", "departure": "Departure", "arrival": "Arrival"}


def phase_title(name: str) -> str:
    """``"takeoff"`` → ``"Take-off"``; a name not in :data:`PHASE_TITLES` is spelt out.

    Examples
    --------
    >>> phase_title("zero_fuel"), phase_title("arrival")
    ('Zero-fuel', 'Arrival')
    """
    return PHASE_TITLES.get(name, name.replace("_", " ").capitalize())


# --- heading ------------------------------------------------------------------------------------

class SheetRecord(TypedDict):
    """``sheet``: whether and as what the sheet is saved (the store fills it in)."""

    id: int | None
    amends: int | None
    saved: bool
    content_sha256: NotRequired[str]
    sheet_hash: NotRequired[str]
    verified: NotRequired[bool]


class VehicleDoc(TypedDict):
    registration: str
    type: str
    type_revision: int | None
    kind: str
    title: str
    type_sha256: str


class Vector(TypedDict):
    """A CG (m) or a first moment (kg·m) per axis; ``None`` where unknown."""

    x: float | None
    y: float | None
    z: float | None


class EmptyWeightDoc(TypedDict):
    entry_seq: int | None
    entry_id: int | None
    entry_date: str | None
    entry_hash: str | None
    mass_kg: float
    cg_m: Vector
    moment_kgm: Vector


class ConfigurationItemDoc(TypedDict):
    name: str
    action: str                 # "install" or "remove"
    mass_kg: float
    x_m: float
    y_m: float
    z_m: float | None
    signed_mass_kg: float       # negative for a removed item


class ConfigurationDoc(TypedDict):
    name: str | None
    items: list[ConfigurationItemDoc]
    mass_change_kg: float


class PreparedDoc(TypedDict):
    by: str | None
    at: str | None


class StandardMassesDoc(TypedDict):
    name: str
    description: str
    source: str | None
    masses_kg: NotRequired[dict[str, float]]


class UnitsDoc(TypedDict):
    mass: str
    length: str
    volume: str
    moment: str
    density: str
    moment_reduction: float


# --- the load -----------------------------------------------------------------------------------

class ItemDoc(TypedDict):
    """One person, cargo load or non-fuel tank on the sheet."""

    station: str
    kind: str
    label: str
    mass_kg: float
    x_m: float
    y_m: float | None
    z_m: float | None
    moment_x_kgm: float
    max_mass_kg: float | None
    mass_source: str
    occupant_class: str | None


class StationDoc(TypedDict):
    station: str
    kind: str
    mass_kg: float
    max_mass_kg: float | None
    margin_kg: float | None
    floor_loading_kg_m2: float | None
    floor_load_limit_kg_m2: float | None
    in_limits: bool


class TankDoc(TypedDict):
    """One tank of the type in ``fuel`` (usable fuel only)."""

    tank: str
    fluid: str
    basis: str
    density_kg_m3: float
    density_source: str
    temperature_c: float | None
    density_15c_kg_m3: float | None
    ramp_mass_kg: float
    ramp_volume_m3: float
    capacity_m3: float
    capacity_kg: float
    unusable_m3: float
    unusable_kg: float
    taxi_mass_kg: float
    takeoff_mass_kg: float
    trip_mass_kg: float
    landing_mass_kg: float
    feeds: bool


class BurnDoc(TypedDict):
    sequence: str
    order: list[str]
    taxi_fuel_kg: float
    trip_fuel_kg: float


# --- phases and the burn path -------------------------------------------------------------------

class EnvelopeResult(TypedDict):
    """One envelope checked at one phase (see "Envelope results" in the document's notes)."""

    name: str
    axis: str
    category: str
    coordinates: str
    inside: bool
    forward_limit_m: float | None
    aft_limit_m: float | None
    forward_margin_m: float | None
    aft_margin_m: float | None
    forward_margin_percent_mac: float | None
    aft_margin_percent_mac: float | None
    mass_margin_kg: float | None


class AxleRow(TypedDict):
    phase: str
    name: str
    x_m: float
    load_kg: float
    rating_kg: float | None
    margin_kg: float | None
    left_kg: float | None
    right_kg: float | None
    in_limits: bool


class AxleGroupRow(TypedDict):
    """The load on an axle group (the sum over its axles) against the group's rating."""

    phase: str
    name: str
    axles: list[str]
    load_kg: float
    rating_kg: float | None
    margin_kg: float | None
    in_limits: bool


class PhaseDoc(TypedDict):
    name: str
    label: str
    mass_kg: float
    cg_m: Vector
    moment_kgm: Vector
    moment_index: float
    percent_mac: float | None
    mass_limit_kg: float | None
    mass_margin_kg: float | None
    envelopes: list[EnvelopeResult]
    in_limits: bool
    axles: NotRequired[list[AxleRow]]   # ground vehicles
    axle_groups: NotRequired[list[AxleGroupRow]]   # ground vehicles with axle groups


class PathPoint(TypedDict):
    mass_kg: float
    cg_x_m: float
    cg_y_m: float
    moment_x_kgm: float
    kind: str


class FirstExit(TypedDict):
    """Where the burn path first leaves an envelope."""

    mass_kg: float
    cg_x_m: float
    cg_y_m: float
    fuel_burned_kg: float


class PathEnvelope(TypedDict):
    name: str
    axis: str
    category: str
    inside: bool
    first_exit: FirstExit | None


# "from" is a keyword, hence the functional form.
BurnPathDoc = TypedDict("BurnPathDoc", {
    "from": str,
    "to": str,
    "points": list[PathPoint],
    "envelopes": list[PathEnvelope],
})


class AxleFinding(TypedDict):
    """An advisory finding of an axle-group rule set (``axle_rules``)."""

    phase: str
    rule: str
    axles: list[int]
    axle_names: list[str]
    load_kg: float
    limit_kg: float
    margin_kg: float
    ok: bool
    detail: str
    text: str


class AxleRuleSetDoc(TypedDict):
    key: str | None
    name: str
    source: str
    advisory: str
    caution: str


# --- verdict: violations and fixes -------------------------------------------------------------

class Violation(TypedDict):
    """A limit exceeded. The keys beyond the common ones depend on ``code``."""

    code: str
    phase: str | None
    subject: str
    limit: float | None
    actual: float | None
    excess: float | None
    unit: str
    message: str
    envelope: NotRequired[str]          # envelope, burn_path
    axis: NotRequired[str]              # envelope, burn_path
    side: NotRequired[str]              # envelope
    first_exit: NotRequired[FirstExit]  # burn_path
    station: NotRequired[str]           # station_limit, floor_loading
    tank: NotRequired[str]              # tank_capacity
    axle: NotRequired[str]              # axle


class FixStep(TypedDict):
    """One change: a fix on its own, or a step of a ``combined`` fix."""

    kind: str
    description: str
    mass_kg: float
    from_station: str | None
    to_station: str | None
    tanks_kg: NotRequired[dict[str, float]]    # offload_fuel
    distance_m: NotRequired[float]             # move_load


class AfterPhase(TypedDict):
    name: str
    mass_kg: float
    cg_m: Vector


class AfterDoc(TypedDict):
    """The re-checked sheet of a fix, in short."""

    verdict: str
    phases: list[AfterPhase]


class FixDoc(FixStep):
    rechecked: bool
    in_limits_after: bool
    after: AfterDoc
    steps: NotRequired[list[FixStep]]           # combined


class EnvelopePolygon(TypedDict):
    name: str
    axis: str
    category: str
    coordinates: str
    points: list[list[float]]


class AmendmentChangeDoc(TypedDict):
    """What one seat, station, tank or fuel figure holds before and after an amendment."""

    kind: str                   # "seat", "station", "tank", "taxi fuel", "trip fuel"
    subject: str
    before_kg: float
    after_kg: float
    persons_before: int
    persons_after: int


class AmendmentPhaseDoc(TypedDict):
    """One phase's mass and CG on the amended sheet and on the sheet it amends."""

    name: str
    mass_before_kg: float
    mass_after_kg: float
    cg_before_m: Vector
    cg_after_m: Vector


class AmendmentDifferencesDoc(TypedDict):
    """``amendment.differences``: what changed from the sheet amended (issue 13 item 4)."""

    from_sheet: int
    changes: list[AmendmentChangeDoc]
    phases: list[AmendmentPhaseDoc]


class AmendmentDoc(TypedDict):
    """``amendment`` of an amended sheet (added by the services; see :mod:`.amend`)."""

    of: int
    first_sheet: int
    changes: list[AmendmentChangeDoc]
    mass_change_kg: float
    person_change: int
    tolerance_mass_kg: float
    tolerance_persons: int
    structural: list[str]
    within: bool
    differences: NotRequired[AmendmentDifferencesDoc]  # sheets amended from this version on


class SheetDocument(TypedDict):
    """The whole document, key order as :func:`ledger.loadsheet.build_sheet` writes it."""

    schema: str
    caution: str
    ground_caution: str | None
    sheet: SheetRecord
    vehicle: VehicleDoc
    empty_weight: EmptyWeightDoc
    configuration: ConfigurationDoc
    prepared: PreparedDoc
    plan_source: str | None
    note: str | None                  # the plan's free-text note
    category: str | None
    standard_masses: StandardMassesDoc
    units: UnitsDoc
    items: list[ItemDoc]
    stations: list[StationDoc]
    fuel: list[TankDoc]
    burn: BurnDoc
    phases: list[PhaseDoc]
    burn_path: BurnPathDoc
    axles: list[AxleRow] | None
    axle_rules: list[AxleFinding] | None
    axle_rule_set: AxleRuleSetDoc | None
    violations: list[Violation]
    fixes: list[FixDoc]
    fixes_note: str | None
    envelope_polygons: list[EnvelopePolygon]
    verdict: str
    amendment: NotRequired[AmendmentDoc]
