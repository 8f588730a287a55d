"""Checking the ledger and sheet chains of many vehicles, in two processes for a large fleet."""

from __future__ import annotations

import itertools
import os
import pickle

from sqlalchemy import func, select
from sqlalchemy.orm import Session

from ledger.store.chain import ChainReport, check_entries, entries_query
from ledger.store.evidence.sheets import sheet_chain, sheet_rows
from ledger.store.models import LedgerEntryRow, VehicleRow

__all__ = ["PARALLEL_FROM", "all_chains", "can_fork"]


#: From this many ledger entries on, ``verify_fleet`` checks the chains in two processes where
#: it can (a forked child with a connection of its own takes half the vehicles): hashing is
#: pure Python and holds the GIL, and a fleet's chains are independent of one another.
PARALLEL_FROM = 50_000


def chains(session: Session, ids, registrations: dict[int, str], type_names: dict[int, str],
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
    for vid, rows in itertools.groupby(sheet_rows(session, ids), key=lambda r: r.vehicle_id):
        sheets[vid] = sheet_chain(rows, registrations.get(vid, "?"), type_names, seen)
    return ledgers, sheets, seen or set()


def can_fork(session: Session, ids) -> bool:
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


def all_chains(session: Session, ids, registrations, type_names, remember: bool):
    """:func:`chains` of the vehicles ``ids`` (None: all), in two processes for a large fleet.

    The child opens a connection of its own (it never touches the parent's) and leaves with
    ``os._exit``, so nothing inherited is closed or finalised twice. Where forking is not
    possible or not worth it, or the child fails, everything runs here.
    """
    if not can_fork(session, ids):
        return chains(session, ids, registrations, type_names, remember)
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
                data = pickle.dumps(chains(child, theirs, registrations, type_names, remember))
            with os.fdopen(write_fd, "wb") as out:
                out.write(data)
            code = 0
        finally:
            os._exit(code)
    os.close(write_fd)
    try:
        ledgers, sheets, seen = chains(session, mine, registrations, type_names, remember)
        if ids is None:  # rows of no vehicle (its row deleted by hand) are reported too
            stray = [vid for (vid,) in session.execute(
                select(LedgerEntryRow.vehicle_id).distinct()
                .where(LedgerEntryRow.vehicle_id.not_in(select(VehicleRow.id))))]
            if stray:
                more = chains(session, stray, registrations, type_names, remember)
                ledgers.update(more[0])
                seen |= more[2]
        with os.fdopen(read_fd, "rb") as inp:
            data = inp.read()
    finally:
        _, status = os.waitpid(pid, 0)
    if status != 0 or not data:  # the child could not do its half: do it here
        theirs_result = chains(session, theirs, registrations, type_names, remember)
    else:
        theirs_result = pickle.loads(data)
    ledgers.update(theirs_result[0])
    sheets.update(theirs_result[1])
    return ledgers, sheets, seen | theirs_result[2]


def _remember(rows, seen: set[str]):
    for r in rows:
        seen.add(r[-1])
        yield r
