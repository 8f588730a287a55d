"""Evidence: checking that everything a verdict depends on is as it was written.

A loading sheet's verdict depends on the vehicle's type revision (its limits and envelopes), the
vehicle's link to that type, its ledger (the empty weight), the configuration it names, and, for
an amendment, the sheet it amends. Each of these is sealed (:mod:`ledger.store.seal`,
:mod:`ledger.store.chain`); this module recomputes the seals and follows the links:

- :func:`checked_type` reads a type revision only if the type's chain of revisions verifies and
  the stored spec, parsed, still has the content hash the revision was sealed with;
- :func:`require_vehicle` is what every command that builds figures for operation calls first
  (through :func:`ledger.store.entries.current_empty`): the vehicle's record,
  its type's revisions, its ledger chain, and the ledger head recorded by its newest saved sheet;
- :func:`verify_fleet` is ``wbledger verify``: all of the above for every type and vehicle, every
  configuration version and every saved sheet, and the hashes a user kept (``--expect``).

What no seal can show by itself — rows rewritten with every later seal recomputed, the newest
rows removed, a forged row appended with a correct seal — is caught by comparing with hashes
kept outside the database: a printed sheet's hashes (``--expect``) or a checkpoint file
(:mod:`ledger.store.checkpoint`).
"""

from __future__ import annotations

import itertools
import json
import os
import pickle
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field
from typing import Any

from sqlalchemy import func, select
from sqlalchemy.orm import Session, aliased

from ledger.errors import ChainError, InputError
from ledger.store import guards
from ledger.store.chain import (
    GENESIS_HASH,
    ChainReport,
    check_entries,
    entries_query,
    verify_vehicle,
)
from ledger.store.models import (
    ConfigurationRow,
    LedgerEntryRow,
    LoadingSheetRow,
    TypeRevisionRow,
    VehicleRow,
    VehicleTypeRow,
)
from ledger.store.seal import (
    configuration_seal,
    sha256_text,
    sheet_seal,
    type_revision_seal,
    vehicle_seal,
)

__all__ = [
    "TypeEvidence",
    "VehicleEvidence",
    "EvidenceReport",
    "checked_type",
    "check_configuration_chain",
    "require_vehicle",
    "sheet_problem",
    "verify_fleet",
    "parse_hash",
]

_HEX = frozenset("0123456789abcdef")


def parse_hash(value: str, field: str = "--expect") -> str:
    """A hash as ``verify`` prints it: 64 lower-case hexadecimal digits (else InputError)."""
    text = (value or "").strip().lower()
    if len(text) != 64 or not set(text) <= _HEX:
        raise InputError(field, value, "a hash: 64 hexadecimal digits (0-9, a-f) as a sheet "
                         "or `wbledger verify` prints it")
    return text


# --- type revisions ------------------------------------------------------------------------

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


_REV_COLS = (TypeRevisionRow.id, TypeRevisionRow.type_id, TypeRevisionRow.revision,
             TypeRevisionRow.content_sha256, TypeRevisionRow.source_name,
             TypeRevisionRow.source_text, TypeRevisionRow.spec_json,
             TypeRevisionRow.imported_at, TypeRevisionRow.prev_hash, TypeRevisionRow.row_hash)


def _type_chain_problem(name: str, revs: Sequence[Any], *, parse: bool = True) -> str | None:
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
    revs = session.execute(select(*_REV_COLS).where(TypeRevisionRow.type_id == type_id)
                           .order_by(TypeRevisionRow.revision)).all()
    problem = "it has no revision" if not revs else _type_chain_problem(name, revs)
    if problem:
        raise ChainError(f"the type data of {name} does not verify, so nothing is computed "
                         f"with it: {problem}. See `wbledger verify`")
    row = revs[-1] if revision is None else next((r for r in revs if r.revision == revision),
                                                  None)
    if row is None:
        from ledger.errors import NotFoundError

        raise NotFoundError(f"revision of type {name!r}", revision)
    return row, _parsed_spec(row.spec_json)[0]


# --- vehicles --------------------------------------------------------------------------------

def _vehicle_problem(v, type_name: str | None) -> str | None:
    if type_name is None:
        return "its type link points at no type"
    try:
        seal = vehicle_seal(registration=v.registration, type_name=type_name, serial=v.serial,
                            note=v.note, created_at=v.created_at)
    except (TypeError, ValueError, AttributeError) as exc:
        return f"a stored value cannot be read ({exc})"
    if seal != v.row_hash:
        return ("its record does not match its seal (its registration, type link or details "
                "were changed)")
    return None


def _guards_problem(session: Session) -> str | None:
    gone = guards.missing(session.connection())
    if gone:
        return (f"the append-only guards of {', '.join(gone)} are missing or disabled: the "
                "database was opened for editing outside wbledger")
    return None


def _duplicates(session: Session, *, registration: str | None = None,
                type_name: str | None = None) -> list[str]:
    """Names that more than one row carries (a UNIQUE constraint removed by hand): a second
    type of the same name, or a second vehicle of the same registration, could take the place
    of the real one without changing a seal. Of the given ones only, or of all."""
    out = []
    for col, what, only in ((VehicleTypeRow.name, "type", type_name),
                            (VehicleRow.registration, "vehicle", registration)):
        query = select(col).group_by(col).having(func.count() > 1)
        if only is not None:
            query = query.where(col == only)
        out += [f"more than one {what} is named {name!r} (a uniqueness rule was removed)"
                for name in session.scalars(query)]
    return out


def require_vehicle(session: Session, vehicle) -> ChainReport:
    """Refuse (ChainError) to build figures on a vehicle whose evidence does not verify.

    Checks the vehicle's record, its type's chain of revisions, its ledger chain, and that the
    ledger head its newest saved sheet was built on is still in the chain. (Missing append-only
    guards are reported by ``verify``; they do not stop a vehicle whose seals all verify.)
    ``vehicle`` has ``id``, ``registration`` and ``type_id``. Returns the ledger report.
    """
    reg = vehicle.registration

    def refuse(problem: str) -> ChainError:
        return ChainError(f"the ledger of {reg} does not verify, so no sheet or report is "
                          f"built on it: {problem}. See `wbledger verify {reg}`")

    v = session.execute(select(VehicleRow).where(VehicleRow.id == vehicle.id)).scalar_one()
    tname = session.scalar(select(VehicleTypeRow.name).where(VehicleTypeRow.id == v.type_id))
    problem = _vehicle_problem(v, tname)
    if problem:
        raise refuse(f"vehicle {reg}: {problem}")
    twins = _duplicates(session, registration=v.registration, type_name=tname)
    if twins:
        raise refuse(twins[0])
    checked_type(session, v.type_id)
    report = verify_vehicle(session, reg)
    if not report.ok:
        raise refuse(report.problem)
    newest = session.execute(
        select(LoadingSheetRow.id, LoadingSheetRow.entry_hash)
        .where(LoadingSheetRow.vehicle_id == v.id)
        .order_by(LoadingSheetRow.id.desc()).limit(1)).first()
    if newest is not None:
        found = session.scalar(select(LedgerEntryRow.seq).where(
            LedgerEntryRow.vehicle_id == v.id, LedgerEntryRow.entry_hash == newest.entry_hash))
        if found is None:
            raise refuse(f"saved sheet {newest.id} was built on ledger head "
                         f"{newest.entry_hash[:12]}…, which is no longer in the chain: entries "
                         "were removed or replaced")
    return report


# --- configurations --------------------------------------------------------------------------

def check_configuration_chain(rows: Sequence[ConfigurationRow], owner_kind: str,
                              owner: str) -> str | None:
    """Why the versions of one configuration (in version order) do not verify, or None."""
    prev = GENESIS_HASH
    for k, r in enumerate(rows, 1):
        if r.version != k:
            return f"configuration {r.name!r} of {owner}: version {k} is missing"
        if r.prev_hash != prev:
            return f"configuration {r.name!r} of {owner}: version {k} does not follow {k - 1}"
        seal = configuration_seal(owner_kind=owner_kind, owner=owner, name=r.name,
                                  version=r.version, description=r.description,
                                  items_json=r.items_json, created_at=r.created_at,
                                  created_by=r.created_by, prev_hash=r.prev_hash)
        if seal != r.row_hash:
            return (f"configuration {r.name!r} of {owner}: version {k} does not match its seal "
                    "(its items or details were changed)")
        prev = r.row_hash
    return None


def _configuration_problems(session: Session, type_names: dict[int, str],
                            registrations: dict[int, str]) -> tuple[dict, dict]:
    """Problems and counts per owner: ({("type"|"vehicle", id): [problem]}, {(…): count})."""
    problems: dict[tuple[str, int], list[str]] = {}
    counts: dict[tuple[str, int], int] = {}
    rows = session.scalars(select(ConfigurationRow).order_by(
        ConfigurationRow.type_id, ConfigurationRow.vehicle_id, ConfigurationRow.name,
        ConfigurationRow.version)).all()
    for (tid, vid, _name), group in itertools.groupby(
            rows, key=lambda r: (r.type_id, r.vehicle_id, r.name)):
        group = list(group)
        key = ("type", tid) if tid is not None else ("vehicle", vid)
        owner = type_names.get(tid) if tid is not None else registrations.get(vid)
        counts[key] = counts.get(key, 0) + len(group)
        if owner is None:
            problems.setdefault(key, []).append(
                f"configuration {group[0].name!r} belongs to no {key[0]}")
            continue
        why = check_configuration_chain(group, key[0], owner)
        if why:
            problems.setdefault(key, []).append(why)
    return problems, counts


# --- saved sheets ----------------------------------------------------------------------------

def _sheet_rows(session: Session, vehicle_ids=None):
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


def _sheet_chain(rows: Iterable[Any], registration: str, type_names: dict[int, str],
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
    """Why one saved sheet (a row of :func:`_sheet_rows`) does not verify, or None; ``prev``
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
    rows = itertools.takewhile(lambda r: r.id <= int(sheet_id), _sheet_rows(session, [vid]))
    return _sheet_chain(rows, reg, type_names, None)[2]


# --- the whole fleet -------------------------------------------------------------------------

@dataclass(frozen=True)
class TypeEvidence:
    """The chain of revisions of one type."""

    name: str
    revisions: int
    head_hash: str | None
    problem: str | None = None

    @property
    def ok(self) -> bool:
        return self.problem is None

    def to_dict(self) -> dict:
        return {"type": self.name, "revisions": self.revisions, "head_hash": self.head_hash,
                "ok": self.ok, "problem": self.problem}


@dataclass(frozen=True)
class VehicleEvidence:
    """One vehicle: its record, its ledger chain, its configurations and its saved sheets."""

    registration: str
    record_hash: str
    ledger: ChainReport
    sheets: int
    sheet_head_hash: str | None
    configurations: int
    problems: tuple[str, ...] = ()

    @property
    def ok(self) -> bool:
        return self.ledger.ok and not self.problems

    @property
    def problem(self) -> str | None:
        if not self.ledger.ok:
            return self.ledger.problem
        return self.problems[0] if self.problems else None

    def to_dict(self) -> dict:
        return {**self.ledger.to_dict(), "ok": self.ok, "problem": self.problem,
                "problems": ([self.ledger.problem] if not self.ledger.ok else [])
                + list(self.problems),
                "record_hash": self.record_hash, "sheets": self.sheets,
                "sheet_head_hash": self.sheet_head_hash,
                "configurations": self.configurations}


@dataclass(frozen=True)
class EvidenceReport:
    """What ``wbledger verify`` found."""

    guards_problem: str | None
    types: tuple[TypeEvidence, ...]
    vehicles: tuple[VehicleEvidence, ...]
    expected: tuple[tuple[str, bool], ...] = ()   # (hash, found)
    other_problems: tuple[str, ...] = field(default=())

    @property
    def problems(self) -> list[str]:
        out = [self.guards_problem] if self.guards_problem else []
        out += [f"type {t.name}: {t.problem}" for t in self.types if not t.ok]
        out += [f"{v.registration}: {v.problem}" for v in self.vehicles if not v.ok]
        out += [f"the recorded hash {h[:12]}… is in none of the chains checked: rows were "
                "removed or replaced" for h, found in self.expected if not found]
        out += list(self.other_problems)
        return out

    @property
    def ok(self) -> bool:
        return not self.problems

    def summary(self) -> str:
        """One line: the most specific thing that does not verify (a vehicle's first)."""
        bad = next((v for v in self.vehicles if not v.ok), None)
        if bad is not None:
            return f"the chain of {bad.registration} does not verify: {bad.problem}"
        bad_type = next((t for t in self.types if not t.ok), None)
        if bad_type is not None:
            return f"the type data of {bad_type.name} does not verify: {bad_type.problem}"
        return self.problems[0] if self.problems else "everything verifies"

    def to_dict(self) -> dict:
        return {"ok": self.ok, "problems": self.problems,
                "guards": {"ok": self.guards_problem is None, "problem": self.guards_problem},
                "types": [t.to_dict() for t in self.types],
                "vehicles": [v.to_dict() for v in self.vehicles],
                "expected": [{"hash": h, "found": f} for h, f in self.expected]}


def verify_fleet(session: Session, registration: str | None = None, *,
                 expect: Sequence[str] = ()) -> EvidenceReport:
    """Verify the evidence of every vehicle (or one) and every type it may use.

    ``expect`` holds hashes kept outside the database — a ledger head or a sheet hash printed
    on a sheet, or a head from ``verify`` — each of which must still be in a chain.
    """
    from ledger.store.catalog import get_vehicle

    wanted = [parse_hash(h) for h in expect]
    type_names = dict(session.execute(select(VehicleTypeRow.id, VehicleTypeRow.name)).all())
    vquery = select(VehicleRow).order_by(VehicleRow.registration)
    if registration is not None:
        vquery = vquery.where(VehicleRow.id == get_vehicle(session, registration).id)
    vehicles = session.scalars(vquery).all()
    ids = None if registration is None else [v.id for v in vehicles]
    type_ids = sorted(type_names if registration is None else {v.type_id for v in vehicles},
                      key=lambda t: type_names.get(t, ""))

    seen: set[str] | None = set() if wanted else None
    types = []
    for tid in type_ids:
        revs = session.execute(select(*_REV_COLS).where(TypeRevisionRow.type_id == tid)
                               .order_by(TypeRevisionRow.revision)).all()
        problem = ("it has no revision" if not revs
                   else _type_chain_problem(type_names.get(tid, "?"), revs))
        types.append(TypeEvidence(type_names.get(tid, "?"), len(revs),
                                  revs[-1].row_hash if revs else None, problem))
        if seen is not None and problem is None:
            seen.update(r.row_hash for r in revs)
            seen.update(r.content_sha256 for r in revs)  # "Type data" printed on a sheet

    registrations = {v.id: v.registration for v in vehicles}
    ledgers, sheets, found_hashes = _all_chains(session, ids, registrations, type_names,
                                                seen is not None)
    if seen is not None:
        seen |= found_hashes
    cfg_problems, cfg_counts = _configuration_problems(session, type_names, registrations)

    other = _duplicates(session) if registration is None else _duplicates(
        session, registration=registration,
        type_name=type_names.get(vehicles[0].type_id) if vehicles else None)
    if registration is None:  # rows that belong to nothing (their owner deleted by hand)
        other += [f"ledger entries of vehicle id {vid} belong to no vehicle"
                  for vid in sorted(set(ledgers) - set(registrations))]
        other += [f"saved sheets of vehicle id {vid} belong to no vehicle"
                  for vid in sorted(set(sheets) - set(registrations))]
        for (kind, oid), probs in sorted(cfg_problems.items()):
            if kind == "type" or oid not in registrations:
                other += probs
    out = []
    for v in vehicles:
        problems = []
        why = _vehicle_problem(v, type_names.get(v.type_id))
        if why:
            problems.append(f"vehicle record: {why}")
        ledger = ledgers.get(v.id) or ChainReport(v.registration, 0, None, None, True)
        count, head, why = sheets.get(v.id, (0, None, None))
        if why:
            problems.append(why)
        problems += cfg_problems.get(("vehicle", v.id), [])
        out.append(VehicleEvidence(v.registration, v.row_hash, ledger, count, head,
                                   cfg_counts.get(("vehicle", v.id), 0), tuple(problems)))
    found = tuple((h, seen is not None and h in seen) for h in wanted)
    return EvidenceReport(_guards_problem(session), tuple(types), tuple(out), found,
                          tuple(other))


#: From this many ledger entries on, ``verify_fleet`` checks the chains in two processes where
#: it can (a forked child with a connection of its own takes half the vehicles): hashing is
#: pure Python and holds the GIL, and a fleet's chains are independent of one another.
PARALLEL_FROM = 50_000


def _chains(session: Session, ids, registrations: dict[int, str], type_names: dict[int, str],
            remember: bool):
    """(ledger reports, sheet chains, hashes seen) of the vehicles ``ids`` (None: every row)."""
    seen: set[str] | None = set() if remember else None
    ledgers: dict[int, ChainReport] = {}
    result = session.connection().execute(entries_query(ids).execution_options(yield_per=5000))
    for vid, rows in itertools.groupby(result, key=lambda r: r[0]):
        rows = (r[1:] for r in rows)
        if seen is not None:
            rows = _remember(rows, seen)
        ledgers[vid] = check_entries(registrations.get(vid, f"vehicle id {vid}"), rows)
    sheets: dict[int, tuple[int, str | None, str | None]] = {}
    for vid, rows in itertools.groupby(_sheet_rows(session, ids), key=lambda r: r.vehicle_id):
        sheets[vid] = _sheet_chain(rows, registrations.get(vid, "?"), type_names, seen)
    return ledgers, sheets, seen or set()


def _can_fork(session: Session, ids) -> bool:
    from ledger.core._parallel import cores

    url = session.connection().engine.url
    if not hasattr(os, "fork") or cores() < 2 or url.get_backend_name() not in (
            "sqlite", "postgresql"):
        return False
    if url.get_backend_name() == "sqlite" and url.database in (None, "", ":memory:"):
        return False
    query = select(func.count()).select_from(LedgerEntryRow)
    if ids is not None:
        query = query.where(LedgerEntryRow.vehicle_id.in_(ids))
    return session.scalar(query) >= PARALLEL_FROM


def _all_chains(session: Session, ids, registrations, type_names, remember: bool):
    """:func:`_chains` of the vehicles ``ids`` (None: all), in two processes for a large fleet.

    The child opens a connection of its own (it never touches the parent's) and leaves with
    ``os._exit``, so nothing inherited is closed or finalised twice. Where forking is not
    possible or not worth it, or the child fails, everything runs here.
    """
    if not _can_fork(session, ids):
        return _chains(session, ids, registrations, type_names, remember)
    every = sorted(registrations) if ids is None else sorted(ids)
    mine, theirs = every[: len(every) // 2], every[len(every) // 2:]
    url = session.connection().engine.url.render_as_string(hide_password=False)
    read_fd, write_fd = os.pipe()
    pid = os.fork()
    if pid == 0:  # the child
        code = 1
        try:
            os.close(read_fd)
            from ledger.store.db import make_engine, session_scope

            engine = make_engine(url, read_only=True)
            with session_scope(engine) as child:
                data = pickle.dumps(_chains(child, theirs, registrations, type_names, remember))
            with os.fdopen(write_fd, "wb") as out:
                out.write(data)
            code = 0
        finally:
            os._exit(code)
    os.close(write_fd)
    try:
        ledgers, sheets, seen = _chains(session, mine, registrations, type_names, remember)
        if ids is None:  # rows of no vehicle (its row deleted by hand) are reported too
            stray = [vid for (vid,) in session.execute(
                select(LedgerEntryRow.vehicle_id).distinct()
                .where(LedgerEntryRow.vehicle_id.not_in(select(VehicleRow.id))))]
            if stray:
                more = _chains(session, stray, registrations, type_names, remember)
                ledgers.update(more[0])
                seen |= more[2]
        with os.fdopen(read_fd, "rb") as inp:
            data = inp.read()
    finally:
        _, status = os.waitpid(pid, 0)
    if status != 0 or not data:  # the child could not do its half: do it here
        theirs_result = _chains(session, theirs, registrations, type_names, remember)
    else:
        theirs_result = pickle.loads(data)
    ledgers.update(theirs_result[0])
    sheets.update(theirs_result[1])
    return ledgers, sheets, seen | theirs_result[2]


def _remember(rows, seen: set[str]):
    for r in rows:
        seen.add(r[-1])
        yield r
