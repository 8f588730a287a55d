"""Type revisions: a type is read only if its chain of revisions verifies and the stored spec,
parsed, still has the content hash the revision was sealed with."""

from __future__ import annotations

import json
from collections.abc import Sequence
from typing import Any

from sqlalchemy import select
from sqlalchemy.orm import Session

from ledger.errors import ChainError, NotFoundError
from ledger.store.chain import GENESIS_HASH
from ledger.store.models import TypeRevisionRow, VehicleTypeRow
from ledger.store.seal import sha256_text, type_revision_seal

__all__ = ["REVISION_COLUMNS", "checked_type", "type_chain_problem"]

_SPEC_CACHE: dict[str, tuple[Any, str]] = {}  # sha256(spec_json) -> (VehicleType, content hash)


def _parsed_spec(spec_json: str):
    """The type stored as ``spec_json`` and its content hash (parsed once per distinct text)."""
    key = sha256_text(spec_json)
    hit = _SPEC_CACHE.get(key)
    if hit is None:
        from ledger.typedata.model import VehicleType

        vtype = VehicleType.from_dict(json.loads(spec_json))
        if len(_SPEC_CACHE) > 64:
            _SPEC_CACHE.clear()
        hit = _SPEC_CACHE[key] = (vtype, vtype.content_hash())
    return hit


REVISION_COLUMNS = (TypeRevisionRow.id, TypeRevisionRow.type_id, TypeRevisionRow.revision,
             TypeRevisionRow.content_sha256, TypeRevisionRow.source_name,
             TypeRevisionRow.source_text, TypeRevisionRow.spec_json,
             TypeRevisionRow.imported_at, TypeRevisionRow.prev_hash, TypeRevisionRow.row_hash)


def type_chain_problem(name: str, revs: Sequence[Any], *, parse: bool = True) -> str | None:
    """Why the revisions of type ``name`` (in revision order) do not verify, or None."""
    prev = GENESIS_HASH
    for k, r in enumerate(revs, 1):
        if r.revision.__class__ is not int:
            return f"revision {k}: its number {r.revision!r} is not a whole number"
        if r.revision != k:
            return (f"revision {k} is missing" if r.revision > k
                    else f"revision {r.revision} appears twice")
        if r.prev_hash != prev:
            return f"revision {k} does not follow revision {k - 1} (prev_hash)"
        try:
            seal = type_revision_seal(type_name=name, revision=r.revision,
                                      content_sha256=r.content_sha256,
                                      source_name=r.source_name, source_text=r.source_text,
                                      spec_json=r.spec_json, imported_at=r.imported_at,
                                      prev_hash=r.prev_hash)
        except (TypeError, ValueError, AttributeError) as exc:
            return f"revision {k}: a stored value cannot be read ({exc})"
        if seal != r.row_hash:
            return (f"revision {k} does not match its seal (its limits, file text, name or "
                    "date were changed after import)")
        if parse:
            try:
                _, digest = _parsed_spec(r.spec_json)
            except Exception as exc:  # noqa: BLE001 - any failure to read the stored type
                return f"revision {k}: the stored type cannot be read ({exc})"
            if digest != r.content_sha256:
                return f"revision {k}: the stored type does not have its recorded content hash"
        prev = r.row_hash
    return None


def checked_type(session: Session, type_id: int, revision: int | None = None):
    """(revision row values, parsed type) of revision ``revision`` (default newest) of type
    ``type_id``, after the type's whole chain of revisions has verified.

    Raises
    ------
    ChainError
        The chain of revisions does not verify (exit 1; ``wbledger verify`` names it).
    """
    name = session.scalar(select(VehicleTypeRow.name).where(VehicleTypeRow.id == type_id))
    revs = session.execute(select(*REVISION_COLUMNS).where(TypeRevisionRow.type_id == type_id)
                           .order_by(TypeRevisionRow.revision)).all()
    problem = "it has no revision" if not revs else type_chain_problem(name, revs)
    if problem:
        raise ChainError(f"the type data of {name} does not verify, so nothing is computed "
                         f"with it: {problem}. See `wbledger verify`")
    row = revs[-1] if revision is None else next((r for r in revs if r.revision == revision),
                                                  None)
    if row is None:
        raise NotFoundError(f"revision of type {name!r}", revision)
    return row, _parsed_spec(row.spec_json)[0]
