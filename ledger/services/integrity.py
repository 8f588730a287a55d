"""Integrity: verify every seal and chain, write checkpoints, make the keys that sign them.

``verify`` recomputes every seal and follows every chain (:mod:`ledger.store.evidence`) and
compares with hashes kept outside the database: ``expect`` (printed on a sheet) and a
checkpoint file (:mod:`ledger.store.checkpoint`).
"""

from __future__ import annotations

import json
import os
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from sqlalchemy.engine import Engine

from ledger.errors import InputError
from ledger.files import check_output_path, write_new, write_output
from ledger.services.database import unit_of_work
from ledger.store import checkpoint as cp
from ledger.store.evidence import EvidenceReport, parse_hash, verify_fleet

__all__ = [
    "VerifyRequest",
    "Verification",
    "CheckpointWritten",
    "KeyPair",
    "verify_request",
    "verify",
    "write_checkpoint",
    "make_key_pair",
]


@dataclass(frozen=True)
class VerifyRequest:
    """What to verify, its options checked and its checkpoint file read (:func:`verify_request`)."""

    registration: str | None
    expect: tuple[str, ...]
    against: Path | None
    checkpoint: dict[str, Any] | None
    public_key: Path | None
    exact: bool


@dataclass(frozen=True)
class Verification:
    """The outcome of ``verify``: the evidence report, its JSON document (with the comparison
    with the checkpoint, if one was given), and the one-line failure, if any."""

    report: EvidenceReport
    document: dict[str, Any]
    failure: str | None

    @property
    def ok(self) -> bool:
        return self.failure is None


@dataclass(frozen=True)
class CheckpointWritten:
    """A checkpoint file written: where, when, its digest and what it counts."""

    file: str
    created_at: str
    digest: str
    types: int
    vehicles: int
    configurations: int
    signed: bool

    def to_dict(self) -> dict[str, Any]:
        return {"file": self.file, "created_at": self.created_at, "digest": self.digest,
                "types": self.types, "vehicles": self.vehicles,
                "configurations": self.configurations, "signed": self.signed}


@dataclass(frozen=True)
class KeyPair:
    """The files of a new signing key: the private key and the public one beside it."""

    private: Path
    public: Path


def verify_request(registration: str | None = None, *, expect: Sequence[str] = (),
                   against: Path | None = None, public_key: Path | None = None,
                   exact: bool = False) -> VerifyRequest:
    """Check the options of ``verify`` and read the checkpoint file, before any database work.

    Raises
    ------
    InputError
        A malformed hash, an option that needs ``against``, a registration with ``against``,
        or a checkpoint file that is not one.
    ChainError
        A checkpoint file changed after it was written.
    """
    hashes = tuple(parse_hash(h) for h in expect)
    if public_key is not None and against is None:
        raise InputError("--public-key", str(public_key), "only with --against FILE")
    if exact and against is None:
        raise InputError("--exact", "true", "only with --against FILE")
    if against is not None and registration is not None:
        raise InputError("REG", registration, "none with --against: a checkpoint is compared "
                         "with the whole database")
    saved = cp.read(against) if against is not None else None
    return VerifyRequest(registration, hashes, against, saved, public_key, exact)


def verify(engine: Engine, request: VerifyRequest) -> Verification:
    """Check every seal and chain (of one vehicle, or all) and, with a checkpoint, that every
    head it recorded is still in its place."""
    with unit_of_work(engine) as session:
        report = verify_fleet(session, request.registration, expect=list(request.expect))
        doc = report.to_dict()
        saved = request.checkpoint
        if saved is not None:
            found = cp.compare_with(session, saved, report, public_key=request.public_key)
            problems = list(found.problems)
            if request.exact:
                problems += [f"added since the checkpoint: {a}" for a in found.added]
            doc["checkpoint"] = {"file": str(request.against), "created_at": saved["created_at"],
                                 **found.to_dict(), "problems": problems,
                                 "exact": request.exact}
            doc["problems"] += problems
            doc["ok"] = doc["ok"] and not problems
    failure = None
    if not report.ok:
        failure = report.summary()
    elif not doc["ok"]:
        failure = (f"the database does not match the checkpoint {request.against}: "
                   f"{doc['checkpoint']['problems'][0]}")
    return Verification(report, doc, failure)


def write_checkpoint(engine: Engine, output: str | os.PathLike[str], *,
                     sign: str | os.PathLike[str] | None = None) -> CheckpointWritten:
    """Write the heads of every chain to ``output`` (JSON), signed with the Ed25519 private
    key file ``sign`` if given. Check ``output`` first with
    :func:`ledger.files.check_output_path`."""
    with unit_of_work(engine) as session:
        doc = cp.take(session, database=engine.url.render_as_string(hide_password=True))
    if sign is not None:
        doc = cp.sign(doc, sign)
    write_output(output, json.dumps(doc, indent=1, ensure_ascii=False) + "\n", "FILE")
    return CheckpointWritten(str(output), doc["created_at"], doc["digest"], len(doc["types"]),
                             len(doc["vehicles"]), len(doc["configurations"]),
                             "signature" in doc)


def make_key_pair(keyfile: str | os.PathLike[str]) -> KeyPair:
    """Make a new Ed25519 key pair: the private key at ``keyfile`` (created 0600) and the
    public key beside it as ``keyfile.pub``; neither may exist already."""
    keyfile = Path(keyfile)
    public = keyfile.with_name(keyfile.name + ".pub")
    for path in (keyfile, public):
        check_output_path(path, "KEYFILE")
        if path.exists() or path.is_symlink():
            raise InputError("KEYFILE", str(path), "a new file; it exists already and a key "
                             "is never overwritten")
    private_pem, public_pem = cp.new_key_pair()
    private = write_new(keyfile, private_pem, "KEYFILE")
    write_new(public, public_pem, "KEYFILE")
    return KeyPair(private, public)
