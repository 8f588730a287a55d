"""Saved loading sheets: immutable rows, amendments that point at the sheet they change.

A saved sheet keeps the plan (as canonical JSON in SI), the computed document
(``docs/sheet-document.md``), the id of the type revision and of the ledger entry (the empty
weight) it used, who prepared it and when, and the SHA-256 of all of that. Nothing here updates
or deletes a sheet: the ORM refuses a change to a saved row, and a last-minute change is a new
row whose ``amends_id`` names the sheet it changes.

The stored document has ``sheet.id`` ``null`` and ``sheet.saved`` ``false`` (the id is not known
before the insert and is not part of the hashed content); :func:`get_sheet` fills in
``sheet.id``, ``sheet.amends`` and ``sheet.saved`` when it reads a row back.

Preparing, saving and amending a sheet (the use cases that combine this with the type data and
the builders) is :mod:`ledger.services.sheets`; this module only persists and reads.
"""

from __future__ import annotations

import datetime as dt
import hashlib
import json
from collections.abc import Mapping
from dataclasses import dataclass, field
from typing import Any, NamedTuple

from sqlalchemy import event, select
from sqlalchemy.orm import Session

from ledger.bounds import TEXT_MAX, check_text
from ledger.errors import ConflictError, NotFoundError
from ledger.store.catalog import load_type, registration_key
from ledger.store.chain import canonical_json
from ledger.store.models import (
    LedgerEntryRow,
    LoadingSheetRow,
    TypeRevisionRow,
    VehicleRow,
    VehicleTypeRow,
)
from ledger.store.roles import recorder
from ledger.store.seal import GENESIS_HASH, sheet_seal

__all__ = [
    "SavedSheet",
    "sheet_content_hash",
    "save_sheet",
    "get_sheet",
    "list_sheets",
    "verify_sheet",
    "amendments_of",
    "sheet_type",
]


def _iso(value: dt.datetime) -> str:
    if value.tzinfo is None:  # SQLite gives back naive datetimes; they were stored as UTC
        value = value.replace(tzinfo=dt.UTC)
    return value.astimezone(dt.UTC).isoformat()


def sheet_content_hash(*, vehicle_id: int, type_revision_id: int, entry_id: int,
                       amends_id: int | None, created_at: dt.datetime, preparer: str,
                       verdict: str, plan_json: str, result_json: str) -> str:
    """SHA-256 over everything a saved sheet says (hex).

    Examples
    --------
    >>> import datetime as dt
    >>> h = sheet_content_hash(vehicle_id=1, type_revision_id=1, entry_id=1, amends_id=None,
    ...     created_at=dt.datetime(2026, 12, 1, tzinfo=dt.timezone.utc), preparer="A",
    ...     verdict="in_limits", plan_json="{}", result_json="{}")
    >>> len(h)
    64
    """
    content = canonical_json({
        "vehicle_id": vehicle_id, "type_revision_id": type_revision_id, "entry_id": entry_id,
        "amends_id": amends_id, "created_at": _iso(created_at), "preparer": preparer,
        "verdict": verdict, "plan": plan_json, "result": result_json,
    })
    return hashlib.sha256(content.encode("utf-8")).hexdigest()


@dataclass(frozen=True)
class SavedSheet:
    """A saved loading sheet as read back from the database."""

    id: int
    registration: str
    vehicle_id: int
    type_revision_id: int
    type_name: str
    type_revision: int
    entry_id: int
    entry_seq: int
    amends_id: int | None
    created_at: dt.datetime
    preparer: str
    verdict: str
    plan: dict = field(repr=False)
    document: dict = field(repr=False)
    content_sha256: str = ""

    def summary(self) -> dict:
        """One line of a listing, JSON-able."""
        return {"id": self.id, "registration": self.registration, "type": self.type_name,
                "type_revision": self.type_revision, "entry_seq": self.entry_seq,
                "amends": self.amends_id, "created_at": _iso(self.created_at),
                "preparer": self.preparer, "verdict": self.verdict,
                "content_sha256": self.content_sha256}


@event.listens_for(LoadingSheetRow, "before_update")
def _refuse_update(_mapper, _connection, target) -> None:  # pragma: no cover - guard
    raise ConflictError(f"loading sheet {target.id} is saved and cannot be changed; "
                        f"make an amendment with `wbledger sheet amend {target.id}`")


@event.listens_for(LoadingSheetRow, "before_delete")
def _refuse_delete(_mapper, _connection, target) -> None:  # pragma: no cover - guard
    raise ConflictError(f"loading sheet {target.id} is saved and cannot be deleted")


def save_sheet(session: Session, *, vehicle_id: int, type_revision_id: int, entry_id: int,
               plan: Mapping[str, Any], document: Mapping[str, Any], preparer: str,
               created_at: dt.datetime | None = None,
               amends_id: int | None = None) -> SavedSheet:
    """Store a computed sheet; return it as read back (with its id).

    Parameters
    ----------
    session : Session
        An open session; the caller's transaction commits it.
    vehicle_id, type_revision_id, entry_id : int
        The vehicle, the type revision and the ledger entry (empty weight) the sheet used.
    plan : mapping
        The plan in SI (``Plan.to_dict()``).
    document : mapping
        The sheet document (``ledger.loadsheet.build_sheet``); its ``verdict`` is stored too.
    preparer : str
        Who prepared it.
    created_at : datetime, optional
        Default: now (UTC).
    amends_id : int, optional
        The saved sheet this one amends.
    """
    check_text("--by", preparer, TEXT_MAX)  # no NUL; within the column (ledger.bounds)
    created_at = created_at or dt.datetime.now(dt.UTC)
    preparer = recorder(session.connection(), preparer)
    doc = json.loads(canonical_json(document))  # a copy; refuses NaN
    doc.setdefault("sheet", {})
    doc["sheet"] = {"id": None, "amends": None, "saved": False}
    verdict = doc.get("verdict")
    if verdict not in ("in_limits", "out_of_limits"):
        raise ValueError(f"document verdict {verdict!r} is not in_limits or out_of_limits")
    plan_json = canonical_json(plan)
    result_json = canonical_json(doc)
    digest = sheet_content_hash(vehicle_id=vehicle_id, type_revision_id=type_revision_id,
                                entry_id=entry_id, amends_id=amends_id, created_at=created_at,
                                preparer=preparer, verdict=verdict, plan_json=plan_json,
                                result_json=result_json)
    links = _links(session, vehicle_id=vehicle_id, type_revision_id=type_revision_id,
                   entry_id=entry_id, amends_id=amends_id)
    row = LoadingSheetRow(vehicle_id=vehicle_id, type_revision_id=type_revision_id,
                          entry_id=entry_id, amends_id=amends_id, created_at=created_at,
                          preparer=preparer, verdict=verdict, plan_json=plan_json,
                          result_json=result_json, content_sha256=digest,
                          entry_hash=links.entry_hash, prev_hash=links.prev_hash,
                          row_hash=sheet_seal(content_sha256=digest, **links._asdict()))
    session.add(row)
    session.flush()
    return get_sheet(session, row.id)


class _Links(NamedTuple):
    registration: str
    type_name: str
    type_revision: int
    type_hash: str
    entry_seq: int
    entry_hash: str
    amends_hash: str | None
    prev_hash: str


def _links(session: Session, *, vehicle_id: int, type_revision_id: int, entry_id: int,
           amends_id: int | None) -> _Links:
    """What a new sheet's seal covers besides its content: the vehicle (locked, so that two
    sheets saved at once cannot both follow the same one), the type revision, the ledger head,
    the amended sheet and the vehicle's newest sheet."""
    reg = session.execute(select(VehicleRow.registration).where(VehicleRow.id == vehicle_id)
                          .with_for_update()).scalar_one()
    tname, revision, type_hash = session.execute(
        select(VehicleTypeRow.name, TypeRevisionRow.revision, TypeRevisionRow.row_hash)
        .join(TypeRevisionRow, TypeRevisionRow.type_id == VehicleTypeRow.id)
        .where(TypeRevisionRow.id == type_revision_id)).one()
    seq, entry_hash = session.execute(
        select(LedgerEntryRow.seq, LedgerEntryRow.entry_hash)
        .where(LedgerEntryRow.id == entry_id, LedgerEntryRow.vehicle_id == vehicle_id)).one()
    amends_hash = None if amends_id is None else session.scalar(
        select(LoadingSheetRow.row_hash).where(LoadingSheetRow.id == amends_id))
    prev = session.scalar(select(LoadingSheetRow.row_hash)
                          .where(LoadingSheetRow.vehicle_id == vehicle_id)
                          .order_by(LoadingSheetRow.id.desc()).limit(1))
    return _Links(reg, tname, revision, type_hash, seq, entry_hash, amends_hash,
                  prev or GENESIS_HASH)


def _query():
    return (select(LoadingSheetRow, VehicleRow.registration, VehicleTypeRow.name,
                   TypeRevisionRow.revision, LedgerEntryRow.seq)
            .join(VehicleRow, VehicleRow.id == LoadingSheetRow.vehicle_id)
            .join(TypeRevisionRow, TypeRevisionRow.id == LoadingSheetRow.type_revision_id)
            .join(VehicleTypeRow, VehicleTypeRow.id == TypeRevisionRow.type_id)
            .join(LedgerEntryRow, LedgerEntryRow.id == LoadingSheetRow.entry_id))


def _saved(row: LoadingSheetRow, registration: str, type_name: str, revision: int,
           seq: int) -> SavedSheet:
    doc = json.loads(row.result_json)
    doc["sheet"] = {"id": row.id, "amends": row.amends_id, "saved": True,
                    "content_sha256": row.content_sha256, "sheet_hash": row.row_hash}
    return SavedSheet(id=row.id, registration=registration, vehicle_id=row.vehicle_id,
                      type_revision_id=row.type_revision_id, type_name=type_name,
                      type_revision=revision, entry_id=row.entry_id, entry_seq=seq,
                      amends_id=row.amends_id, created_at=row.created_at,
                      preparer=row.preparer, verdict=row.verdict,
                      plan=json.loads(row.plan_json), document=doc,
                      content_sha256=row.content_sha256)


def get_sheet(session: Session, sheet_id: int) -> SavedSheet:
    """The saved sheet ``sheet_id``; :class:`NotFoundError` if there is none."""
    found = session.execute(_query().where(LoadingSheetRow.id == int(sheet_id))).first()
    if found is None:
        raise NotFoundError("loading sheet", int(sheet_id),
                            "List saved sheets with `wbledger sheet list`")
    return _saved(*found)


def list_sheets(session: Session, registration: str | None = None, *,
                limit: int = 50) -> list[SavedSheet]:
    """Saved sheets, newest first; of one vehicle if ``registration`` is given."""
    query = _query()
    if registration is not None:
        query = query.where(VehicleRow.registration == registration_key(registration))
    query = query.order_by(LoadingSheetRow.id.desc()).limit(int(limit))
    return [_saved(*r) for r in session.execute(query).all()]


def amendments_of(session: Session, sheet_id: int) -> list[int]:
    """Ids of the sheets that amend ``sheet_id`` directly."""
    return list(session.scalars(select(LoadingSheetRow.id)
                                .where(LoadingSheetRow.amends_id == int(sheet_id))
                                .order_by(LoadingSheetRow.id)))


def verify_sheet(session: Session, sheet_id: int) -> bool:
    """Whether saved sheet ``sheet_id`` verifies: its content hash, its seal, and the chain of
    its vehicle's sheets up to it (:func:`ledger.store.evidence.sheet_problem`)."""
    from ledger.store.evidence import sheet_problem

    if session.get(LoadingSheetRow, int(sheet_id)) is None:
        raise NotFoundError("loading sheet", int(sheet_id))
    return sheet_problem(session, sheet_id) is None


def sheet_type(session: Session, sheet: SavedSheet):
    """The :class:`ledger.typedata.VehicleType` of the type revision a saved sheet used, once
    the type's chain of revisions verifies (:func:`ledger.store.catalog.load_type`)."""
    return load_type(session, session.get(TypeRevisionRow, sheet.type_revision_id))
