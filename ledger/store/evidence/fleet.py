"""``wbledger verify``: every seal and chain of every type and vehicle (or one vehicle), every
configuration version and saved sheet, and the hashes a user kept."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field

from sqlalchemy import select
from sqlalchemy.orm import Session

from ledger.errors import InputError
from ledger.store.chain import ChainReport
from ledger.store.evidence.configurations import configuration_problems
from ledger.store.evidence.parallel import all_chains
from ledger.store.evidence.revisions import REVISION_COLUMNS, type_chain_problem
from ledger.store.evidence.vehicles import duplicates, guards_problem, vehicle_problem
from ledger.store.models import TypeRevisionRow, VehicleRow, VehicleTypeRow

__all__ = ["EvidenceReport", "TypeEvidence", "VehicleEvidence", "parse_hash", "verify_fleet"]

_HEX = frozenset("0123456789abcdef")


def parse_hash(value: str, field: str = "--expect") -> str:
    """A hash as ``verify`` prints it: 64 lower-case hexadecimal digits (else InputError)."""
    text = (value or "").strip().lower()
    if len(text) != 64 or not set(text) <= _HEX:
        raise InputError(field, value, "a hash: 64 hexadecimal digits (0-9, a-f) as a sheet "
                         "or `wbledger verify` prints it")
    return text


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
        revs = session.execute(select(*REVISION_COLUMNS).where(TypeRevisionRow.type_id == tid)
                               .order_by(TypeRevisionRow.revision)).all()
        problem = ("it has no revision" if not revs
                   else type_chain_problem(type_names.get(tid, "?"), revs))
        types.append(TypeEvidence(type_names.get(tid, "?"), len(revs),
                                  revs[-1].row_hash if revs else None, problem))
        if seen is not None and problem is None:
            seen.update(r.row_hash for r in revs)
            seen.update(r.content_sha256 for r in revs)  # "Type data" printed on a sheet

    registrations = {v.id: v.registration for v in vehicles}
    ledgers, sheets, found_hashes = all_chains(session, ids, registrations, type_names,
                                                seen is not None)
    if seen is not None:
        seen |= found_hashes
    cfg_problems, cfg_counts = configuration_problems(session, type_names, registrations)

    other = duplicates(session) if registration is None else duplicates(
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
        why = vehicle_problem(v, type_names.get(v.type_id))
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
    return EvidenceReport(guards_problem(session), tuple(types), tuple(out), found,
                          tuple(other))


def unverified_vehicles(session: Session, registration: str | None = None) -> dict[str, str]:
    """Each vehicle (or the one named) whose evidence does not verify, with its first problem.

    What ``vehicle list``, ``vehicle show`` and ``history`` mark, so that a ledger that
    ``sheet`` refuses does not look normal elsewhere: the vehicle's own record and chain, or
    the chain of its type's revisions.
    """
    report = verify_fleet(session, registration)
    bad_types = {t.name: t.problem for t in report.types if not t.ok}
    type_of = dict(session.execute(
        select(VehicleRow.registration, VehicleTypeRow.name)
        .join(VehicleTypeRow, VehicleTypeRow.id == VehicleRow.type_id)).all())
    out = {}
    for v in report.vehicles:
        problem = v.problem or (f"type {type_of[v.registration]}: "
                                f"{bad_types[type_of[v.registration]]}"
                                if type_of.get(v.registration) in bad_types else None)
        if problem:
            out[v.registration] = problem
    return out

