"""The CG height of a road vehicle from an axle-lift weighing, stored in its ledger.

``wbledger cg-height``: weigh level, raise one axle to one or more angles and read the other;
:func:`ledger.analysis.ground.cg_height_document` fits the height (ISO 10392 method) and
:func:`ledger.store.entries.record_cg_height` records the vertical arm as a ledger entry of kind
``cg_height`` (unless it is a dry run). The readings arrive as the user typed them
(:class:`AxleLiftReadings`); bare numbers take the vehicle type's display units.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import NamedTuple

from sqlalchemy.engine import Engine

from ledger.analysis import MISSING
from ledger.analysis.ground import angles_from_lift, cg_height_document
from ledger.analysis.ground_types import CgHeightDocument
from ledger.errors import InputError
from ledger.services.database import unit_of_work
from ledger.services.options import quantity_option
from ledger.services.vehicle_type import registered_type
from ledger.store.entries import current_empty, record_cg_height
from ledger.typedata import VehicleType

__all__ = ["AxleLiftReadings", "CgHeight", "measure_cg_height"]

#: What the ledger entry keeps of the document, under ``detail.axle_lift``.
_KEPT = ("method", "raised_axle", "inputs", "readings", "height_m", "residual_rms_kg",
         "height_spread_m")


@dataclass(frozen=True)
class AxleLiftReadings:
    """An axle-lift weighing as typed: masses and lengths with or without units.

    Give ``front_tilted`` (the front axle's load with the rear raised) or ``rear_tilted`` (the
    rear's with the front raised), one per ``angle`` or ``lift``; the grounded axle's level load
    and ``total`` (or both level loads); and the loaded ``wheel_radius``.
    """

    wheel_radius: str
    front_level: str | None = None
    rear_level: str | None = None
    total: str | None = None
    front_tilted: Sequence[str] = ()
    rear_tilted: Sequence[str] = ()
    angle: Sequence[str] = ()
    lift: Sequence[str] = ()
    total_tilted: Sequence[str] = ()
    datum_height: str | None = None
    wheelbase: str | None = None


@dataclass(frozen=True)
class CgHeight:
    """The ``wbledger.cg-height/1`` document; its ``stored`` names the ledger entry written,
    or is False for a dry run."""

    document: CgHeightDocument


class _Level(NamedTuple):
    raised: str
    grounded: str
    level_kg: float
    total_kg: float


class _Angles(NamedTuple):
    degrees: list[float]
    source: str


def measure_cg_height(engine: Engine, registration: str, readings: AxleLiftReadings, *,
                      actor: str, dry_run: bool = False, entry_date: str | None = None,
                      reason: str | None = None, reference: str | None = None) -> CgHeight:
    """Fit the CG height of ``registration`` from ``readings`` and record it (unless
    ``dry_run``) as the vertical CG of the empty vehicle.

    Raises
    ------
    LedgerError
        Unknown vehicle, readings missing, contradicting each other or out of range, a
        weighed total far from the recorded empty mass, or no ``datum_height`` to store with.
    """
    with unit_of_work(engine) as session:
        revision, vtype = registered_type(session, registration)
        mu, lu = vtype.units.mass, vtype.units.length
        level = _level(readings, mu)
        tilted = [quantity_option(t, "mass", mu, f"--{level.grounded}-tilted")
                  for t in (readings.front_tilted or readings.rear_tilted)]
        wb = _wheelbase(readings, vtype)
        angles = _angles(readings, wb, lu)
        tt = ([quantity_option(t, "mass", mu, "--total-tilted") for t in readings.total_tilted]
              if readings.total_tilted else None)
        r = quantity_option(readings.wheel_radius, "length", lu, "--wheel-radius",
                            positive=True)
        dh = quantity_option(readings.datum_height, "length", lu, "--datum-height")
        if dh is None and not dry_run:
            raise InputError("--datum-height", MISSING,
                             "the height of the type's datum (z = 0) above the ground, to "
                             "store the vertical arm", hint=f"The type's datum: {vtype.datum}. "
                             "Or use --dry-run to compute without storing")
        empty = current_empty(session, registration)
        doc = cg_height_document(total_kg=level.total_kg, wheelbase_m=wb, wheel_radius_m=r,
                                 level_kg=level.level_kg, tilted_kg=tilted,
                                 angles_deg=angles.degrees, raised=level.raised,
                                 total_tilted_kg=tt, datum_height_m=dh,
                                 empty_mass_kg=empty.mass_kg, vtype=vtype,
                                 registration=registration, angle_source=angles.source)
        if doc["vehicle"] is not None:  # it is: a registration was given
            doc["vehicle"]["type_revision"] = revision
        if dry_run:
            doc["stored"] = False
        else:
            keep = {k: doc[k] for k in _KEPT}  # type: ignore[literal-required]
            entry = record_cg_height(session, registration, doc["z_m"], actor=actor,
                                     entry_date=entry_date, reason=reason,
                                     reference=reference, detail={"axle_lift": keep})
            doc["stored"] = {"registration": registration, "seq": entry.seq,
                             "entry_date": entry.entry_date.isoformat()}
    return CgHeight(doc)


def _level(readings: AxleLiftReadings, mu: str) -> _Level:
    """Which axle was raised, the grounded axle's level load and the level total."""
    if readings.front_tilted and readings.rear_tilted:
        raise InputError("--rear-tilted", readings.rear_tilted[0],
                         "not together with --front-tilted: raise one axle per weighing")
    if not readings.front_tilted and not readings.rear_tilted:
        raise InputError("--front-tilted", MISSING, "the grounded axle's load at each angle: "
                         "--front-tilted (rear raised) or --rear-tilted (front raised)")
    raised = "rear" if readings.front_tilted else "front"
    grounded = "front" if raised == "rear" else "rear"
    level_text = readings.front_level if grounded == "front" else readings.rear_level
    if level_text is None:
        raise InputError(f"--{grounded}-level", MISSING,
                         f"the {grounded} axle load with the vehicle level")
    level = quantity_option(level_text, "mass", mu, f"--{grounded}-level")
    if readings.total is not None:
        return _Level(raised, grounded, level,
                      quantity_option(readings.total, "mass", mu, "--total"))
    other = readings.rear_level if grounded == "front" else readings.front_level
    if other is None:
        raise InputError("--total", MISSING, "the total mass level: give --total, or both "
                         "--front-level and --rear-level")
    return _Level(raised, grounded, level,
                  level + quantity_option(other, "mass", mu, f"--{raised}-level"))


def _wheelbase(readings: AxleLiftReadings, vtype: VehicleType) -> float:
    """As given, or the type's for a two-axle vehicle."""
    if readings.wheelbase is not None:
        return quantity_option(readings.wheelbase, "length", vtype.units.length, "--wheelbase",
                               positive=True)
    if len(vtype.axles) == 2:
        return vtype.axles[1].x_m - vtype.axles[0].x_m
    raise InputError("--wheelbase", MISSING,
                     f"the distance between the raised and the grounded axle; type "
                     f"{vtype.name} has {len(vtype.axles)} axles")


def _angles(readings: AxleLiftReadings, wheelbase_m: float, lu: str) -> _Angles:
    """The lift angles in degrees, as given or from the lift heights."""
    if readings.angle and readings.lift:
        raise InputError("--lift", readings.lift[0],
                         "not together with --angle: give one of them")
    if readings.lift:
        lifts = [quantity_option(x, "length", lu, "--lift") for x in readings.lift]
        return _Angles(angles_from_lift(lifts, wheelbase_m),
                       "from the lift heights: θ = asin(lift / wheelbase)")
    return _Angles([quantity_option(a, "angle", "deg", "--angle") for a in readings.angle],
                   "given")
