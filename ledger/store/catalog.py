"""Vehicle types (with their revisions) and vehicles.

A type is known by its name; each import of a type file whose content differs from every earlier
revision makes a new revision. A vehicle belongs to a type and is computed with the type's newest
revision unless a caller asks for another; whatever is saved (a loading sheet) keeps the id of
the revision it used.
"""

from __future__ import annotations

import datetime as dt
import json
import re
from dataclasses import dataclass

from sqlalchemy import func, select
from sqlalchemy.orm import Session

from ledger.bounds import NAME_MAX, check_text
from ledger.errors import ConflictError, InputError, NotFoundError
from ledger.store.models import TypeRevisionRow, VehicleRow, VehicleTypeRow
from ledger.store.seal import GENESIS_HASH, type_revision_seal, vehicle_seal

__all__ = [
    "ImportResult",
    "import_type",
    "list_types",
    "type_revision",
    "load_type",
    "add_vehicle",
    "get_vehicle",
    "vehicle_type",
    "REGISTRATION_PATTERN",
    "registration_key",
]

#: A registration once :func:`registration_key` has normalised it: letters, digits, '-' and
#: single inner spaces (road plates such as ``NC 33-TR``), starting with a letter or digit.
REGISTRATION_PATTERN = re.compile(r"^[A-Za-z0-9][A-Za-z0-9 -]{0,39}\Z")


def registration_key(text: str) -> str:
    """A registration as it is stored and looked up: spaces at the ends trimmed and each inner
    run of spaces one space; letters keep their case (issue 13 item 9). Other white space (a
    tab, a line break) is left for :data:`REGISTRATION_PATTERN` to refuse.

    Registrations stored before spaces were accepted have none, so this never changes what a
    stored one means.

    Examples
    --------
    >>> registration_key("  NC   33-TR ")
    'NC 33-TR'
    """
    return re.sub(" {2,}", " ", str(text).strip(" "))


def _now() -> dt.datetime:
    return dt.datetime.now(dt.UTC)


@dataclass(frozen=True)
class ImportResult:
    name: str
    revision: int
    created: bool
    content_sha256: str


def import_type(session: Session, vtype, source_name: str, source_text: str) -> ImportResult:
    """Store ``vtype`` (a parsed :class:`ledger.typedata.VehicleType`) as a new revision.

    Importing content identical to an existing revision of the same type creates nothing and
    returns that revision.
    """
    digest = vtype.content_hash()
    type_row = session.scalar(select(VehicleTypeRow).where(VehicleTypeRow.name == vtype.name))
    if type_row is None:
        type_row = VehicleTypeRow(name=vtype.name, created_at=_now())
        session.add(type_row)
        session.flush()
    existing = session.scalar(
        select(TypeRevisionRow).where(
            TypeRevisionRow.type_id == type_row.id, TypeRevisionRow.content_sha256 == digest
        )
    )
    if existing is not None:
        return ImportResult(vtype.name, existing.revision, False, digest)
    last = session.execute(
        select(TypeRevisionRow.revision, TypeRevisionRow.row_hash)
        .where(TypeRevisionRow.type_id == type_row.id)
        .order_by(TypeRevisionRow.revision.desc()).limit(1)
    ).first()
    revision, prev_hash = (last[0] + 1, last[1]) if last else (1, GENESIS_HASH)
    spec_json = json.dumps(vtype.to_dict(), sort_keys=True, allow_nan=False)
    imported_at = _now()
    row = TypeRevisionRow(
        type_id=type_row.id,
        revision=revision,
        content_sha256=digest,
        source_name=source_name,
        source_text=source_text,
        spec_json=spec_json,
        imported_at=imported_at,
        prev_hash=prev_hash,
        row_hash=type_revision_seal(
            type_name=vtype.name, revision=revision, content_sha256=digest,
            source_name=source_name, source_text=source_text, spec_json=spec_json,
            imported_at=imported_at, prev_hash=prev_hash),
    )
    session.add(row)
    session.flush()
    return ImportResult(vtype.name, row.revision, True, digest)


def list_types(session: Session) -> list[dict]:
    """Every type with its newest revision and the number of vehicles of that type."""
    newest = (
        select(TypeRevisionRow.type_id, func.max(TypeRevisionRow.revision).label("revision"))
        .group_by(TypeRevisionRow.type_id)
        .subquery()
    )
    counts = (
        select(VehicleRow.type_id, func.count(VehicleRow.id).label("vehicles"))
        .group_by(VehicleRow.type_id)
        .subquery()
    )
    rows = session.execute(
        select(
            VehicleTypeRow.name,
            newest.c.revision,
            TypeRevisionRow.spec_json,
            TypeRevisionRow.imported_at,
            func.coalesce(counts.c.vehicles, 0),
        )
        .join(newest, newest.c.type_id == VehicleTypeRow.id)
        .join(
            TypeRevisionRow,
            (TypeRevisionRow.type_id == VehicleTypeRow.id)
            & (TypeRevisionRow.revision == newest.c.revision),
        )
        .outerjoin(counts, counts.c.type_id == VehicleTypeRow.id)
        .order_by(VehicleTypeRow.name)
    ).all()
    out = []
    for name, revision, spec_json, imported_at, vehicles in rows:
        spec = json.loads(spec_json)
        out.append(
            {
                "name": name,
                "revision": revision,
                "kind": spec.get("kind"),
                "title": spec.get("title"),
                "imported_at": imported_at.isoformat(),
                "vehicles": vehicles,
            }
        )
    return out


def type_revision(session: Session, name: str, revision: int | None = None) -> TypeRevisionRow:
    """The row of revision ``revision`` (default: newest) of type ``name``."""
    type_row = session.scalar(select(VehicleTypeRow).where(VehicleTypeRow.name == name))
    if type_row is None:
        known = session.scalars(select(VehicleTypeRow.name).order_by(VehicleTypeRow.name)).all()
        hint = (f"Known types: {', '.join(known)}" if known
                else "Import one with `wbledger type import FILE`")
        raise NotFoundError("vehicle type", name, hint)
    query = select(TypeRevisionRow).where(TypeRevisionRow.type_id == type_row.id)
    if revision is None:
        query = query.order_by(TypeRevisionRow.revision.desc()).limit(1)
    else:
        query = query.where(TypeRevisionRow.revision == revision)
    row = session.scalar(query)
    if row is None:
        raise NotFoundError(f"revision of type {name!r}", revision)
    return row


def load_type(session: Session, row: TypeRevisionRow):
    """The :class:`ledger.typedata.VehicleType` stored in a revision row, once the type's
    chain of revisions verifies (:func:`ledger.store.evidence.checked_type`)."""
    from ledger.store.evidence import checked_type

    return checked_type(session, row.type_id, row.revision)[1]


def add_vehicle(session: Session, registration: str, type_name: str, *,
                serial: str | None = None, note: str | None = None) -> VehicleRow:
    """Add a vehicle of an imported type; ``registration`` is normalised by
    :func:`registration_key` and must not differ from another vehicle's by case only."""
    given, registration = registration, registration_key(registration or "")
    if not REGISTRATION_PATTERN.match(registration):
        raise InputError("registration", given,
                         "1 to 40 letters, digits or '-' (single spaces between them allowed), "
                         "starting with a letter or digit")
    twin = _same_but_case(session, registration)
    if twin is not None and twin != registration:
        raise ConflictError(f"vehicle {twin!r} exists already and differs from "
                            f"{registration!r} only in case; use {twin!r}")
    for option, text, most in (("--serial", serial, NAME_MAX), ("--note", note, None)):
        if text is not None:
            check_text(option, text, most)  # no NUL; within the column (ledger.bounds)
    rev = type_revision(session, type_name)
    if session.scalar(select(VehicleRow.id).where(VehicleRow.registration == registration)):
        raise ConflictError(f"vehicle {registration!r} already exists; "
                            "see it with `wbledger vehicle show " + registration + "`")
    created_at = _now()
    row = VehicleRow(registration=registration, type_id=rev.type_id, serial=serial, note=note,
                     created_at=created_at,
                     row_hash=vehicle_seal(registration=registration, type_name=type_name,
                                           serial=serial, note=note, created_at=created_at))
    session.add(row)
    session.flush()
    return row


def get_vehicle(session: Session, registration: str, *, lock: bool = False) -> VehicleRow:
    """The vehicle ``registration`` (normalised by :func:`registration_key`); with ``lock``
    its row is locked (PostgreSQL FOR UPDATE)."""
    registration = registration_key(registration)
    query = select(VehicleRow).where(VehicleRow.registration == registration)
    if lock:
        query = query.with_for_update()
    row = session.scalar(query)
    if row is None:
        twin = _same_but_case(session, registration)
        known = session.scalars(select(VehicleRow.registration).order_by(VehicleRow.registration)
                                .limit(12)).all()
        hint = (f"Did you mean {twin!r}? (registrations keep their case)" if twin
                else f"Known vehicles: {', '.join(known)}" if known
                else "Add one with `wbledger vehicle add REG --type NAME`")
        raise NotFoundError("vehicle", registration, hint)
    return row


def _same_but_case(session: Session, registration: str) -> str | None:
    """A stored registration equal to ``registration`` ignoring case, if there is one."""
    return session.scalar(select(VehicleRow.registration)
                          .where(func.upper(VehicleRow.registration) == registration.upper())
                          .order_by(VehicleRow.registration).limit(1))


def vehicle_type(session: Session, vehicle: VehicleRow) -> tuple[TypeRevisionRow, object]:
    """The newest revision row of the vehicle's type and the parsed type."""
    name = session.scalar(select(VehicleTypeRow.name).where(VehicleTypeRow.id == vehicle.type_id))
    row = type_revision(session, name)
    return row, load_type(session, row)
