"""Crash safety: a process killed (SIGKILL) in the middle of a bulk import leaves the database
consistent and the import all or nothing.

A child process imports 50,000 entries in one transaction, in chunks of 2,000, printing a line
after each chunk has been sent to the database. Once it has written a few chunks the parent
kills it. Then: ``PRAGMA integrity_check`` is ``ok`` (SQLite), the vehicle has exactly the
entries it had before, and its chain verifies. Running the same import to the end adds all
50,000 entries, and the chain still verifies.
"""

from __future__ import annotations

import datetime as dt
import os
import signal
import subprocess
import sys
from pathlib import Path

import pytest
from sqlalchemy import text

from tests.store.ledger_support import DAY0, setup_fleet, weigh_a

REPO = Path(__file__).resolve().parents[2]
N = 50_000
DAY = (DAY0 + dt.timedelta(days=3)).isoformat()

CHILD = r"""
import sys
from ledger.store.db import make_engine, session_scope
from ledger.store.transfer import import_entries
from tests.store.test_crash import bulk_records

eng = make_engine(sys.argv[1])
records = bulk_records(int(sys.argv[2]))
print("parsed", flush=True)
with session_scope(eng) as s:
    import_entries(s, "KV-101", records, source="bulk", chunk=2000,
                   progress=lambda n: print(f"wrote {n}", flush=True))
print("committed", flush=True)
"""


def bulk_records(n: int) -> list[tuple[int, dict]]:
    """``n`` records continuing a ledger: an item installed, then removed, and so on."""
    out = []
    for k in range(n):
        item = f"crate {k // 2}"
        if k % 2 == 0:
            rec = {"kind": "install", "entry_date": DAY, "actor": "bulk", "item": item,
                   "item_mass_kg": 1.0 + (k % 7) / 8, "item_x_m": 2.0 + (k % 11) / 16,
                   "reason": "bulk test"}
        else:
            rec = {"kind": "remove", "entry_date": DAY, "actor": "bulk", "item": item,
                   "reason": "bulk test"}
        out.append((k + 2, rec))
    return out


def _count(engine) -> int:
    with engine.connect() as conn:
        return conn.execute(text("SELECT count(*) FROM ledger_entries")).scalar()


def _verify(engine):
    from ledger.store.chain import verify_vehicle
    from ledger.store.db import session_scope

    with session_scope(engine) as s:
        return verify_vehicle(s, "KV-101")


@pytest.mark.slow
def test_sigkill_during_bulk_import_leaves_all_or_nothing(engine, db_url):
    from ledger.store.db import make_engine, session_scope
    from ledger.store.entries import install_item
    from ledger.store.transfer import import_entries

    setup_fleet(engine, {"KV-101": "TT-A1"})
    weigh_a(engine, "KV-101")
    with session_scope(engine) as s:
        install_item(s, "KV-101", "radio", mass=2.0, arm=1.5, actor="T", reason="fit",
                     entry_date=DAY0)
    head_before = _verify(engine).head_hash
    assert _count(engine) == 2
    engine.dispose()  # the child must be the only one with the file open while it writes

    wal = wal_before = None
    if engine.dialect.name == "sqlite":
        wal = Path(engine.url.database + "-wal")
        wal_before = wal.stat().st_size if wal.exists() else 0
    env = {**os.environ, "PYTHONPATH": str(REPO)}
    child = subprocess.Popen([sys.executable, "-c", CHILD, db_url, str(N)], cwd=REPO, env=env,
                             stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    seen = []
    try:
        for line in child.stdout:
            seen.append(line.strip())
            if line.startswith("wrote ") and int(line.split()[1]) >= 20000:
                wal_size = wal.stat().st_size if wal is not None else None
                os.kill(child.pid, signal.SIGKILL)
                break
        child.wait(timeout=60)
    finally:
        if child.poll() is None:
            child.kill()
            child.wait()
    assert child.returncode == -signal.SIGKILL, (seen, child.stderr.read())
    assert "committed" not in seen and seen[0] == "parsed"
    if wal is not None:
        # the killed transaction had reached the file: uncommitted pages went to the WAL
        assert wal_size > wal_before + 1_000_000, (wal_before, wal_size)

    after = make_engine(db_url)
    try:
        if after.dialect.name == "sqlite":
            with after.connect() as conn:
                assert conn.exec_driver_sql("PRAGMA integrity_check").scalar() == "ok"
        assert _count(after) == 2  # nothing of the killed import
        rep = _verify(after)
        assert rep.ok and rep.head_hash == head_before and rep.entries == 2
        # the same import, left to finish, writes all of it
        with session_scope(after) as s:
            summary = import_entries(s, "KV-101", bulk_records(N), source="bulk")
        assert summary.imported == N and _count(after) == N + 2
        rep = _verify(after)
        assert rep.ok and rep.entries == N + 2
        if after.dialect.name == "sqlite":
            with after.connect() as conn:
                assert conn.exec_driver_sql("PRAGMA integrity_check").scalar() == "ok"
    finally:
        after.dispose()
