"""Configurations: every version of a configuration follows the one before and matches its seal."""

from __future__ import annotations

import itertools
from collections.abc import Sequence

from sqlalchemy import select
from sqlalchemy.orm import Session

from ledger.store.chain import GENESIS_HASH
from ledger.store.models import ConfigurationRow
from ledger.store.seal import configuration_seal

__all__ = ["check_configuration_chain", "configuration_problems"]


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


def configuration_problems(session: Session, type_names: dict[int, str],
                            registrations: dict[int, str]) -> tuple[dict, dict]:
    """Problems and counts per owner: ({("type"|"vehicle", id): [problem]}, {(…): count})."""
    problems: dict[tuple[str, int], list[str]] = {}
    counts: dict[tuple[str, int], int] = {}
    rows = session.scalars(select(ConfigurationRow).order_by(
        ConfigurationRow.type_id, ConfigurationRow.vehicle_id, ConfigurationRow.name,
        ConfigurationRow.version)).all()
    for (tid, vid, _name), versions in itertools.groupby(
            rows, key=lambda r: (r.type_id, r.vehicle_id, r.name)):
        group = list(versions)
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
