"""Saved sheets: each one's content hash and seal, the ledger head and type revision it was
built on, the sheet it amends, and its place in its vehicle's chain of sheets."""

from __future__ import annotations

import itertools
from collections.abc import Iterable
from typing import Any

from sqlalchemy import select
from sqlalchemy.orm import Session, aliased

from ledger.store.chain import GENESIS_HASH
from ledger.store.models import (
    LedgerEntryRow,
    LoadingSheetRow,
    TypeRevisionRow,
    VehicleRow,
    VehicleTypeRow,
)
from ledger.store.seal import sheet_seal

__all__ = ["sheet_chain", "sheet_problem", "sheet_rows"]


def sheet_rows(session: Session, vehicle_ids=None):
    entry = aliased(LedgerEntryRow)
    query = (select(LoadingSheetRow.id, LoadingSheetRow.vehicle_id,
                    LoadingSheetRow.type_revision_id, LoadingSheetRow.entry_id,
                    LoadingSheetRow.amends_id, LoadingSheetRow.created_at,
                    LoadingSheetRow.preparer, LoadingSheetRow.verdict,
                    LoadingSheetRow.plan_json, LoadingSheetRow.result_json,
                    LoadingSheetRow.content_sha256, LoadingSheetRow.entry_hash,
                    LoadingSheetRow.prev_hash, LoadingSheetRow.row_hash,
                    entry.vehicle_id.label("e_vehicle"), entry.seq.label("e_seq"),
                    entry.entry_hash.label("e_hash"),
                    TypeRevisionRow.type_id.label("r_type"),
                    TypeRevisionRow.revision.label("r_revision"),
                    TypeRevisionRow.row_hash.label("r_hash"))
             .outerjoin(entry, entry.id == LoadingSheetRow.entry_id)
             .outerjoin(TypeRevisionRow, TypeRevisionRow.id == LoadingSheetRow.type_revision_id)
             .order_by(LoadingSheetRow.vehicle_id, LoadingSheetRow.id))
    if vehicle_ids is not None:
        query = query.where(LoadingSheetRow.vehicle_id.in_(vehicle_ids))
    return session.connection().execute(query.execution_options(yield_per=1000))


def sheet_chain(rows: Iterable[Any], registration: str, type_names: dict[int, str],
                 seen: set[str] | None) -> tuple[int, str | None, str | None]:
    """(count, head hash, first problem) of one vehicle's saved sheets, in id order."""
    prev = GENESIS_HASH
    hashes: dict[int, str] = {}
    count = 0
    for s in rows:
        count += 1
        try:
            problem = _sheet_problem(s, prev, hashes, registration, type_names)
        except (TypeError, ValueError, AttributeError) as exc:
            problem = f"saved sheet {s.id}: a stored value cannot be read ({exc})"
        if problem:
            return count, None, problem
        hashes[s.id] = prev = s.row_hash
        if seen is not None:
            seen.add(s.row_hash)
    return count, (prev if count else None), None


def _sheet_problem(s, prev: str, hashes: dict[int, str], registration: str,
                   type_names: dict[int, str]) -> str | None:
    """Why one saved sheet (a row of :func:`sheet_rows`) does not verify, or None; ``prev``
    is the seal of the sheet before it, ``hashes`` the seals of the earlier ones by id."""
    from ledger.store.sheets import sheet_content_hash

    where = f"saved sheet {s.id}"
    if s.prev_hash != prev:
        return (f"{where} does not follow the sheet saved before it (a sheet was removed, or "
                "inserted)")
    content = sheet_content_hash(
        vehicle_id=s.vehicle_id, type_revision_id=s.type_revision_id, entry_id=s.entry_id,
        amends_id=s.amends_id, created_at=s.created_at, preparer=s.preparer,
        verdict=s.verdict, plan_json=s.plan_json, result_json=s.result_json)
    if content != s.content_sha256:
        return (f"{where}: its content does not match its hash (its plan, figures, verdict, "
                "preparer or links were changed)")
    if s.e_hash is None or s.e_vehicle != s.vehicle_id or s.e_hash != s.entry_hash:
        return (f"{where} was built on ledger head {str(s.entry_hash)[:12]}…, which is no "
                "longer in the chain: entries were removed or replaced")
    if s.r_hash is None:
        return f"{where}: the type revision it was checked against is gone"
    amends_hash = None
    if s.amends_id is not None:
        amends_hash = hashes.get(s.amends_id)
        if amends_hash is None:
            return (f"{where} amends sheet {s.amends_id}, which is not an earlier sheet of "
                    f"{registration}")
    seal = sheet_seal(registration=registration, content_sha256=s.content_sha256,
                      type_name=type_names.get(s.r_type, "?"), type_revision=s.r_revision,
                      type_hash=s.r_hash, entry_seq=s.e_seq, entry_hash=s.entry_hash,
                      amends_hash=amends_hash, prev_hash=s.prev_hash)
    if seal != s.row_hash:
        return (f"{where} does not match its seal (its vehicle, type revision, ledger head or "
                "amended sheet were changed)")
    return None


def sheet_problem(session: Session, sheet_id: int) -> str | None:
    """Why saved sheet ``sheet_id`` does not verify — its content, its seal, and its vehicle's
    chain of sheets up to it, with the ledger head and type revision it used — or None."""
    vid, reg = session.execute(
        select(VehicleRow.id, VehicleRow.registration)
        .join(LoadingSheetRow, LoadingSheetRow.vehicle_id == VehicleRow.id)
        .where(LoadingSheetRow.id == int(sheet_id))).one()
    type_names = dict(session.execute(select(VehicleTypeRow.id, VehicleTypeRow.name)).all())
    rows = itertools.takewhile(lambda r: r.id <= int(sheet_id), sheet_rows(session, [vid]))
    return sheet_chain(rows, reg, type_names, None)[2]
