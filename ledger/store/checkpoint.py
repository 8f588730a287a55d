"""Checkpoints: the heads of every chain, written to a file kept outside the database.

The seals in the database show a row changed on its own. They cannot show a history rewritten
with every later seal recomputed, the newest rows removed, or a forged row appended with a
correct seal: the database is then consistent with itself. A checkpoint records, at one moment,
where every chain ended — each type's newest revision, each vehicle's record, ledger head and
newest saved sheet, each configuration's newest version — so that later every one of those
heads must still be found at the same place in a chain that verifies
(:func:`compare_with`, ``wbledger verify --against FILE``).

A checkpoint can be signed with an Ed25519 key the operator holds (``cryptography``, optional:
``pip install 'wbledger[sign]'``), so that someone who can write the database *and* the file
still cannot make a new checkpoint that passes ``--public-key``.

The file is JSON::

    {"format": "wbledger.checkpoint/1", "created_at": UTC, "database": URL (no password),
     "types": [{"type", "revisions", "head_hash"}],
     "vehicles": [{"registration", "record_hash", "entries", "head_hash", "sheets",
                   "sheet_head_hash"}],
     "configurations": [{"owner_kind", "owner", "name", "version", "head_hash"}],
     "digest": SHA-256 of the canonical JSON of everything above,
     "signature": {"algorithm": "ed25519", "public_key": HEX, "value": HEX}   // if signed
    }
"""

from __future__ import annotations

import datetime as dt
import json
import os
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from sqlalchemy import func, select
from sqlalchemy.orm import Session

from ledger.errors import ChainError, InputError
from ledger.store.chain import canonical_json, utc_text
from ledger.store.models import (
    ConfigurationRow,
    LedgerEntryRow,
    LoadingSheetRow,
    TypeRevisionRow,
    VehicleRow,
    VehicleTypeRow,
)
from ledger.store.seal import sha256_text

__all__ = [
    "FORMAT",
    "MAX_CHECKPOINT_BYTES",
    "take",
    "sign",
    "read",
    "Comparison",
    "compare_with",
    "new_key_pair",
]

FORMAT = "wbledger.checkpoint/1"
#: A checkpoint of 100,000 vehicles is about 40 MB; refuse anything much larger unread.
MAX_CHECKPOINT_BYTES = 256 * 1024 * 1024
_SIGNED_KEYS = ("format", "created_at", "database", "types", "vehicles", "configurations")


def _body(doc: Mapping[str, Any]) -> dict:
    return {k: doc[k] for k in _SIGNED_KEYS}


def _digest(doc: Mapping[str, Any]) -> str:
    return sha256_text(canonical_json(_body(doc)))


def take(session: Session, *, database: str, now: dt.datetime | None = None) -> dict:
    """The checkpoint of the whole database now; refused (ChainError) unless it all verifies."""
    from ledger.store.evidence import verify_fleet

    report = verify_fleet(session)
    if not report.ok:
        raise ChainError(f"no checkpoint is written of data that does not verify: "
                         f"{report.summary()}")
    configs = []
    type_names = dict(session.execute(select(VehicleTypeRow.id, VehicleTypeRow.name)).all())
    regs = dict(session.execute(select(VehicleRow.id, VehicleRow.registration)).all())
    newest = (select(ConfigurationRow.type_id, ConfigurationRow.vehicle_id,
                     ConfigurationRow.name, func.max(ConfigurationRow.version).label("v"))
              .group_by(ConfigurationRow.type_id, ConfigurationRow.vehicle_id,
                        ConfigurationRow.name).subquery())
    for c in session.execute(select(ConfigurationRow).join(
            newest, (ConfigurationRow.name == newest.c.name)
            & (ConfigurationRow.version == newest.c.v)
            & (func.coalesce(ConfigurationRow.type_id, -1) == func.coalesce(newest.c.type_id, -1))
            & (func.coalesce(ConfigurationRow.vehicle_id, -1)
               == func.coalesce(newest.c.vehicle_id, -1)))).scalars():
        kind, owner = (("type", type_names[c.type_id]) if c.type_id is not None
                       else ("vehicle", regs[c.vehicle_id]))
        configs.append({"owner_kind": kind, "owner": owner, "name": c.name,
                        "version": c.version, "head_hash": c.row_hash})
    configs.sort(key=lambda c: (c["owner_kind"], c["owner"], c["name"]))
    doc = {
        "format": FORMAT,
        "created_at": utc_text(now or dt.datetime.now(dt.UTC)),
        "database": database,
        "types": [{"type": t.name, "revisions": t.revisions, "head_hash": t.head_hash}
                  for t in report.types],
        "vehicles": [{"registration": v.registration, "record_hash": v.record_hash,
                      "entries": v.ledger.entries, "head_hash": v.ledger.head_hash,
                      "sheets": v.sheets, "sheet_head_hash": v.sheet_head_hash}
                     for v in report.vehicles],
        "configurations": configs,
    }
    doc["digest"] = _digest(doc)
    return doc


def _crypto():
    try:
        from cryptography.hazmat.primitives import serialization
        from cryptography.hazmat.primitives.asymmetric import ed25519
    except ModuleNotFoundError:
        raise InputError("--sign", "", "signing needs the cryptography package",
                         hint="Install it: pip install 'wbledger[sign]'") from None
    return serialization, ed25519


def _read_small(path: str | os.PathLike, field: str, limit: int) -> bytes:
    p = Path(path)
    try:
        if not p.is_file():
            raise InputError(field, str(p), "a regular file" if p.exists()
                             else "an existing file")
        if p.stat().st_size > limit:
            raise InputError(field, str(p), f"a file of at most {limit:,} bytes".replace(",", " "))
        with open(p, "rb") as fh:
            return fh.read(limit + 1)[:limit]
    except OSError as exc:
        raise InputError(field, str(p), f"a file that can be read ({exc.strerror})") from None


def _private_key(path: str | os.PathLike):
    serialization, ed25519 = _crypto()
    data = _read_small(path, "--sign", 64 * 1024)
    try:
        key = serialization.load_pem_private_key(data, password=None)
    except (ValueError, TypeError) as exc:
        raise InputError("--sign", str(path), f"an unencrypted PEM Ed25519 private key "
                         f"({exc})") from None
    if not isinstance(key, ed25519.Ed25519PrivateKey):
        raise InputError("--sign", str(path), "an Ed25519 private key (made by "
                         "`wbledger checkpoint-key`)")
    return key


def _public_key(path: str | os.PathLike):
    serialization, ed25519 = _crypto()
    data = _read_small(path, "--public-key", 64 * 1024)
    try:
        key = serialization.load_pem_public_key(data)
    except (ValueError, TypeError) as exc:
        raise InputError("--public-key", str(path), f"a PEM Ed25519 public key ({exc})") from None
    if not isinstance(key, ed25519.Ed25519PublicKey):
        raise InputError("--public-key", str(path), "an Ed25519 public key")
    return key


def _raw_public(key) -> str:
    serialization, _ = _crypto()
    return key.public_bytes(serialization.Encoding.Raw, serialization.PublicFormat.Raw).hex()


def sign(doc: dict, key_path: str | os.PathLike) -> dict:
    """``doc`` with an Ed25519 signature over its digest made with the key at ``key_path``."""
    key = _private_key(key_path)
    signature = key.sign(doc["digest"].encode("ascii"))
    return {**doc, "signature": {"algorithm": "ed25519",
                                 "public_key": _raw_public(key.public_key()),
                                 "value": signature.hex()}}


def new_key_pair() -> tuple[bytes, bytes]:
    """A new Ed25519 key pair as PEM: (private key, unencrypted PKCS#8; public key)."""
    serialization, ed25519 = _crypto()
    key = ed25519.Ed25519PrivateKey.generate()
    private = key.private_bytes(serialization.Encoding.PEM, serialization.PrivateFormat.PKCS8,
                                serialization.NoEncryption())
    public = key.public_key().public_bytes(serialization.Encoding.PEM,
                                           serialization.PublicFormat.SubjectPublicKeyInfo)
    return private, public


def read(path: str | os.PathLike) -> dict:
    """A checkpoint file, its layout and digest checked (InputError if it is not one)."""
    data = _read_small(path, "--against", MAX_CHECKPOINT_BYTES)
    try:
        doc = json.loads(data.decode("utf-8"))
    except (UnicodeDecodeError, json.JSONDecodeError, RecursionError):
        raise InputError("--against", str(path), "a checkpoint file written by "
                         "`wbledger checkpoint` (it is not JSON)") from None
    if not isinstance(doc, dict) or doc.get("format") != FORMAT or not all(
            k in doc for k in (*_SIGNED_KEYS, "digest")):
        raise InputError("--against", str(path), f"a checkpoint file ({FORMAT})")
    if _digest(doc) != doc["digest"]:
        raise ChainError(f"the checkpoint {path} was changed after it was written: its digest "
                         "does not match its content")
    for key, fields in _LAYOUT.items():
        items = doc[key]
        if not isinstance(items, list) or not all(
                isinstance(i, dict) and all(isinstance(i.get(f), kinds)
                                            and not isinstance(i.get(f), bool)
                                            for f, kinds in fields.items()) for i in items):
            raise InputError("--against", str(path), f"a checkpoint file ({FORMAT}); its "
                             f"{key!r} are not as wbledger writes them")
    return doc


_TEXT, _COUNT, _HASH = (str,), (int,), (str, type(None))
#: What each item of a checkpoint holds (checked on read, before anything is compared).
_LAYOUT = {
    "types": {"type": _TEXT, "revisions": _COUNT, "head_hash": _HASH},
    "vehicles": {"registration": _TEXT, "record_hash": _TEXT, "entries": _COUNT,
                 "head_hash": _HASH, "sheets": _COUNT, "sheet_head_hash": _HASH},
    "configurations": {"owner_kind": _TEXT, "owner": _TEXT, "name": _TEXT, "version": _COUNT,
                       "head_hash": _TEXT},
}


@dataclass(frozen=True)
class Comparison:
    """What ``verify --against`` found: heads not in their place (``problems``), rows added
    since (``added``, for the auditor to match with the paperwork), and the signature."""

    problems: tuple[str, ...]
    added: tuple[str, ...]
    signature: str

    def to_dict(self) -> dict:
        return {"problems": list(self.problems), "added": list(self.added),
                "signature": self.signature}


def _signature_state(doc: Mapping[str, Any], public_key) -> tuple[str, str | None]:
    sig = doc.get("signature")
    if public_key is None:
        return ("not checked (give --public-key)" if isinstance(sig, Mapping)
                else "not signed"), None
    key = _public_key(public_key)
    if not isinstance(sig, Mapping):
        return "missing", "the checkpoint is not signed, but --public-key asks for a signature"
    from cryptography.exceptions import InvalidSignature

    try:
        key.verify(bytes.fromhex(str(sig.get("value", ""))), str(doc["digest"]).encode("ascii"))
    except (InvalidSignature, ValueError):
        return "does not verify", ("the checkpoint's signature does not verify with that "
                                   "public key: it was not signed by that key, or it was "
                                   "changed")
    return "checked", None


def _plural(n: int, word: str) -> str:
    return f"{n} {word}{'' if n == 1 else 's'}"


def compare_with(session: Session, doc: Mapping[str, Any], now, *,
                 public_key: str | os.PathLike | None = None) -> Comparison:
    """Compare the database with checkpoint ``doc``; ``now`` is the current
    :class:`ledger.store.evidence.EvidenceReport` (which has verified every chain).

    Every head the checkpoint recorded must still be in its place: revision N of each type, the
    vehicle's record, entry N of its ledger, its N-th saved sheet, version N of each
    configuration, each with the recorded hash. What was added since is listed: a forged
    append looks like any other append, so the list is what the paperwork must account for.
    """
    said, why = _signature_state(doc, public_key)
    problems = [why] if why else []
    added = []
    types_now = {t.name: t for t in now.types}
    for t in doc.get("types") or []:
        name, n, h = t.get("type"), t.get("revisions"), t.get("head_hash")
        found = session.scalar(select(TypeRevisionRow.row_hash)
                               .join(VehicleTypeRow, VehicleTypeRow.id == TypeRevisionRow.type_id)
                               .where(VehicleTypeRow.name == name,
                                      TypeRevisionRow.revision == n))
        if found != h:
            problems.append(f"type {name}: revision {n} is not the one checkpointed "
                            f"({str(h)[:12]}…)" if found else
                            f"type {name}: revision {n}, checkpointed, is gone")
        elif name in types_now and types_now[name].revisions > n:
            added.append(f"type {name}: {_plural(types_now[name].revisions - n, 'revision')}")
    old_types = {t.get("type") for t in doc.get("types") or []}
    added += [f"type {t}: new" for t in types_now if t not in old_types]
    vehicles_now = {v.registration: v for v in now.vehicles}
    for v in doc.get("vehicles") or []:
        reg = v.get("registration")
        row = session.execute(select(VehicleRow.id, VehicleRow.row_hash)
                              .where(VehicleRow.registration == reg)).first()
        if row is None:
            problems.append(f"{reg}: the vehicle, checkpointed, is gone")
            continue
        vid, record = row
        if record != v.get("record_hash"):
            problems.append(f"{reg}: its record is not the one checkpointed")
        n, h = v.get("entries") or 0, v.get("head_hash")
        if n:
            found = session.scalar(select(LedgerEntryRow.entry_hash).where(
                LedgerEntryRow.vehicle_id == vid, LedgerEntryRow.seq == n))
            if found != h:
                problems.append(f"{reg}: entry {n} is not the one checkpointed "
                                f"({str(h)[:12]}…)" if found else
                                f"{reg}: entry {n}, checkpointed, is gone: entries were removed")
        m, sh = v.get("sheets") or 0, v.get("sheet_head_hash")
        if m:
            found = session.scalars(select(LoadingSheetRow.row_hash)
                                    .where(LoadingSheetRow.vehicle_id == vid)
                                    .order_by(LoadingSheetRow.id).offset(m - 1).limit(1)).first()
            if found != sh:
                problems.append(f"{reg}: saved sheet {m} of the vehicle is not the one "
                                f"checkpointed ({str(sh)[:12]}…)" if found else
                                f"{reg}: saved sheet {m} of the vehicle, checkpointed, is gone: "
                                "sheets were removed")
        cur = vehicles_now.get(reg)
        if cur is not None:
            more = [_plural(k, w) for k, w in ((cur.ledger.entries - n, "entry"),
                                               (cur.sheets - m, "saved sheet")) if k > 0]
            if more:
                added.append(f"{reg}: {' and '.join(more)}".replace("entrys", "entries"))
    old_vehicles = {v.get("registration") for v in doc.get("vehicles") or []}
    added += [f"{r}: new vehicle" for r in vehicles_now if r not in old_vehicles]
    for c in doc.get("configurations") or []:
        by_vehicle = c.get("owner_kind") == "vehicle"
        owner_row = VehicleRow if by_vehicle else VehicleTypeRow
        owner_col = VehicleRow.registration if by_vehicle else VehicleTypeRow.name
        fk = ConfigurationRow.vehicle_id if by_vehicle else ConfigurationRow.type_id
        rows = session.execute(select(ConfigurationRow.version, ConfigurationRow.row_hash)
                               .join(owner_row, owner_row.id == fk)
                               .where(owner_col == c.get("owner"),
                                      ConfigurationRow.name == c.get("name"))).all()
        versions = dict(rows)
        if versions.get(c.get("version")) != c.get("head_hash"):
            problems.append(f"configuration {c.get('name')!r} of {c.get('owner')}: version "
                            f"{c.get('version')} is not the one checkpointed")
        elif versions and max(versions) > c.get("version"):
            added.append(f"configuration {c.get('name')!r} of {c.get('owner')}: "
                         f"{_plural(max(versions) - c.get('version'), 'version')}")
    known = {(c.get("owner_kind"), c.get("owner"), c.get("name"))
             for c in doc.get("configurations") or []}
    added += [f"configuration {name!r} of {owner}: new"
              for kind, owner, name in _configuration_names(session) if (kind, owner, name)
              not in known]
    return Comparison(tuple(problems), tuple(added), said)


def _configuration_names(session: Session) -> list[tuple[str, str, str]]:
    """(owner kind, owner, name) of every configuration stored, sorted."""
    by_type = session.execute(select(VehicleTypeRow.name, ConfigurationRow.name).distinct()
                              .join(ConfigurationRow, ConfigurationRow.type_id
                                    == VehicleTypeRow.id)).all()
    by_vehicle = session.execute(select(VehicleRow.registration, ConfigurationRow.name)
                                 .distinct().join(ConfigurationRow, ConfigurationRow.vehicle_id
                                                  == VehicleRow.id)).all()
    return sorted([("type", o, n) for o, n in by_type]
                  + [("vehicle", o, n) for o, n in by_vehicle])
