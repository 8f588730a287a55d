"""Seals: the SHA-256 each stored row carries over everything a verdict may depend on.

Ledger entries have had their seal from the start (``entry_hash``, :mod:`ledger.store.chain`).
This module gives the other tables theirs, in the same manner: the canonical JSON (sorted keys,
no whitespace, UTF-8, no NaN) of an object naming the row by *names*, not database ids, so that
moving a row to another vehicle or type changes its content; and, where rows follow one another,
the previous row's seal (``prev_hash``) so that a row removed from the middle breaks the next
link.

``type_revisions``
    Chained per type, revision 1 first::

        {"v": 1, "record": "type_revision", "type": NAME, "revision": N,
         "content_sha256": HASH of the canonical parsed type, "source_name": TEXT,
         "source_sha256": HASH of the stored file text, "spec_sha256": HASH of spec_json,
         "imported_at": UTC, "prev_hash": HASH}

``vehicles``
    One seal per vehicle (a vehicle is never changed)::

        {"v": 1, "record": "vehicle", "registration": REG, "type": NAME, "serial": TEXT,
         "note": TEXT, "created_at": UTC}

``configurations``
    Chained per owner and name, version 1 first::

        {"v": 1, "record": "configuration", "owner_kind": "type"|"vehicle", "owner": NAME,
         "name": NAME, "version": N, "description": TEXT, "items_json": TEXT,
         "created_at": UTC, "created_by": TEXT, "prev_hash": HASH}

``loading_sheets``
    Chained per vehicle in the order saved (``content_sha256`` is the sheet's own content
    hash, :func:`ledger.store.sheets.sheet_content_hash`)::

        {"v": 1, "record": "loading_sheet", "vehicle": REG, "content_sha256": HASH,
         "type": NAME, "type_revision": N, "type_hash": the revision's row_hash,
         "entry_seq": N, "entry_hash": the ledger entry's entry_hash,
         "amends_hash": the amended sheet's row_hash or null, "prev_hash": HASH}

Timestamps are written as :func:`ledger.store.chain.utc_text`. The first row of a chain has
``prev_hash`` :data:`~ledger.store.chain.GENESIS_HASH`.

A seal shows that a row was changed unless whoever changed it also recomputed the seal and every
later link; that is caught only by comparing with a hash kept outside the database (printed on a
sheet, or in a checkpoint file: :mod:`ledger.store.checkpoint`).
"""

from __future__ import annotations

import datetime as dt
import hashlib

from ledger.store.chain import GENESIS_HASH, canonical_json, utc_text

__all__ = [
    "SEAL_VERSION",
    "GENESIS_HASH",
    "sha256_text",
    "type_revision_seal",
    "vehicle_seal",
    "configuration_seal",
    "sheet_seal",
]

#: Layout version of every seal's content (the ``v`` key).
SEAL_VERSION = 1


def sha256_text(text: str) -> str:
    """SHA-256 (hex) of ``text`` encoded as UTF-8.

    Examples
    --------
    >>> sha256_text("")[:16]
    'e3b0c44298fc1c14'
    """
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def _seal(record: str, **content) -> str:
    return sha256_text(canonical_json({"v": SEAL_VERSION, "record": record, **content}))


def type_revision_seal(*, type_name: str, revision: int, content_sha256: str, source_name: str,
                       source_text: str, spec_json: str, imported_at: dt.datetime,
                       prev_hash: str) -> str:
    """The ``row_hash`` of a type revision (see the module notes)."""
    return _seal("type_revision", type=type_name, revision=int(revision),
                 content_sha256=content_sha256, source_name=source_name,
                 source_sha256=sha256_text(source_text), spec_sha256=sha256_text(spec_json),
                 imported_at=utc_text(imported_at), prev_hash=prev_hash)


def vehicle_seal(*, registration: str, type_name: str, serial: str | None, note: str | None,
                 created_at: dt.datetime) -> str:
    """The ``row_hash`` of a vehicle (see the module notes).

    Examples
    --------
    >>> import datetime as dt
    >>> at = dt.datetime(2026, 12, 1, tzinfo=dt.timezone.utc)
    >>> a = vehicle_seal(registration="KV-1", type_name="T1", serial=None, note=None,
    ...                  created_at=at)
    >>> a == vehicle_seal(registration="KV-1", type_name="T2", serial=None, note=None,
    ...                   created_at=at)
    False
    """
    return _seal("vehicle", registration=registration, type=type_name, serial=serial,
                 note=note, created_at=utc_text(created_at))


def configuration_seal(*, owner_kind: str, owner: str, name: str, version: int,
                       description: str | None, items_json: str, created_at: dt.datetime,
                       created_by: str, prev_hash: str) -> str:
    """The ``row_hash`` of a configuration version (see the module notes)."""
    return _seal("configuration", owner_kind=owner_kind, owner=owner, name=name,
                 version=int(version), description=description, items_json=items_json,
                 created_at=utc_text(created_at), created_by=created_by, prev_hash=prev_hash)


def sheet_seal(*, registration: str, content_sha256: str, type_name: str, type_revision: int,
               type_hash: str, entry_seq: int, entry_hash: str, amends_hash: str | None,
               prev_hash: str) -> str:
    """The ``row_hash`` of a saved loading sheet (see the module notes)."""
    return _seal("loading_sheet", vehicle=registration, content_sha256=content_sha256,
                 type=type_name, type_revision=int(type_revision), type_hash=type_hash,
                 entry_seq=int(entry_seq), entry_hash=entry_hash, amends_hash=amends_hash,
                 prev_hash=prev_hash)
