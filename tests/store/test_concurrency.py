"""Concurrent appends lose nothing and keep the chain valid: 8 processes × 200 appends to the
same vehicle, on SQLite (BEGIN IMMEDIATE, WAL, busy timeout) and on PostgreSQL (row lock).

The processes are started with ``spawn`` (a fresh interpreter each, nothing shared but the
database) and released together by a barrier so that their appends overlap.
"""

from __future__ import annotations

import datetime as dt
import multiprocessing as mp

from sqlalchemy import text

from tests.store.ledger_support import DAY0, setup_fleet, weigh_a

WORKERS = 8
APPENDS = 200
D1 = DAY0 + dt.timedelta(days=1)


def _worker(url: str, worker: int, barrier, results) -> None:
    try:
        from ledger.store.db import make_engine, session_scope
        from ledger.store.entries import install_item

        eng = make_engine(url)
        with eng.connect():  # connect before the start line
            pass
        barrier.wait(timeout=120)
        for i in range(APPENDS):
            with session_scope(eng) as s:
                install_item(s, "KV-101", f"w{worker}-{i}", mass=0.001 * (worker + 1),
                             arm=1.0 + i / 1000, actor=f"worker {worker}", reason="load test",
                             entry_date=D1)
        eng.dispose()
        results.put((worker, APPENDS, None))
    except Exception as exc:  # noqa: BLE001 - reported to the parent
        results.put((worker, 0, f"{type(exc).__name__}: {exc}"))


def test_parallel_appends_lose_nothing(engine, db_url):
    from ledger.store.chain import verify_all
    from ledger.store.db import session_scope

    setup_fleet(engine, {"KV-101": "TT-A1", "KV-102": "TT-A1"})
    weigh_a(engine, "KV-101")
    weigh_a(engine, "KV-102")
    ctx = mp.get_context("spawn")
    barrier = ctx.Barrier(WORKERS)
    results = ctx.Queue()
    procs = [ctx.Process(target=_worker, args=(db_url, w, barrier, results))
             for w in range(WORKERS)]
    for p in procs:
        p.start()
    outcome = [results.get(timeout=300) for _ in procs]
    for p in procs:
        p.join(timeout=60)
    assert [err for _, _, err in outcome if err] == []
    assert sum(n for _, n, _ in outcome) == WORKERS * APPENDS

    with engine.connect() as conn:
        rows = conn.execute(text(
            "SELECT e.seq, e.item, e.actor FROM ledger_entries e JOIN vehicles v "
            "ON v.id = e.vehicle_id WHERE v.registration = 'KV-101' ORDER BY e.seq")).all()
    assert [r[0] for r in rows] == list(range(1, WORKERS * APPENDS + 2))  # no gap, no duplicate
    items = {r[1] for r in rows[1:]}
    assert items == {f"w{w}-{i}" for w in range(WORKERS) for i in range(APPENDS)}
    # the appends really interleaved: the workers' entries are not in eight solid blocks
    switches = sum(1 for a, b in zip(rows[1:], rows[2:]) if a[2] != b[2])
    assert switches > WORKERS
    with session_scope(engine) as s:
        reports = {r.registration: r for r in verify_all(s)}
    assert reports["KV-101"].ok and reports["KV-101"].entries == WORKERS * APPENDS + 1
    assert reports["KV-102"].ok and reports["KV-102"].entries == 1
