"""Benchmarks of the ledger store, each against raw ``sqlite3`` measured in the same run.

Run from the repository root with ``python -m bench.bench_ledger`` (or
``python bench/bench_ledger.py``); name benchmarks to run only those
(``python -m bench.bench_ledger bulk single``; the names are in ``BENCHES``). Prints one line
per benchmark::

    bench NAME: ratio R (target T)

- ``ledger_bulk_import_100k``: :func:`ledger.store.transfer.import_entries` of 100,000 entries
  (checking every row, computing running totals and the SHA-256 chain in Python, Core
  ``executemany`` in chunks, one transaction) against ``sqlite3.executemany`` of the very same
  final rows (hashes already known) into an identical empty table, one transaction; three
  alternating rounds into new files, the best of each counts. Ratio = our rate ÷ raw rate;
  target at least 0.3.
- ``ledger_single_append``: installations through :func:`ledger.store.entries.install_item`
  — the library call ``wbledger install`` makes — each in its own transaction
  (:func:`ledger.store.db.session_scope`: ``BEGIN IMMEDIATE``, vehicle, newest entry and item
  state read, insert, commit) against raw single-row ``BEGIN IMMEDIATE`` / ``INSERT`` /
  ``COMMIT`` of the same rows with ``sqlite3``. Both use the same file settings, WAL and
  ``synchronous=FULL``, so both pay the same fsync per commit; ten rounds of 80 alternate between
  the two and the best round of each counts. Ratio = our rate ÷ raw rate; target at least 0.3.
- ``ledger_fleet_view_1000x100``: :func:`ledger.store.views.fleet_view` over 1,000 vehicles with
  100 entries each (the documents ``wbledger vehicle list --json`` prints: state, CG, %MAC,
  display values, reweigh warnings), against one raw SQL query with a ``GROUP BY`` that finds
  each vehicle's newest entry and its baseline (the same columns), fetched with ``sqlite3``.
  Ratio = our time ÷ raw time (best of 7 alternating runs each); target at most 1.5.
- ``verify_1000x100_10k_sheets``: :func:`ledger.store.evidence.verify_fleet` — what
  ``wbledger verify`` runs: every seal and chain — over 1,000 vehicles with 100 entries each and
  10,000 saved sheets (10 per vehicle, saved through the library), against reading the same
  rows raw with ``sqlite3`` (``SELECT *`` of the entries and of the sheets). Ratio = our time ÷
  raw time (best of 3 alternating runs each); target at most 3.

All files live in a temporary directory on the same disk. The data are invented.
"""

from __future__ import annotations

import dataclasses
import datetime as dt
import math
import sqlite3
import sys
import tempfile
import time
from pathlib import Path

from sqlalchemy import text as text_

if __package__ in (None, ""):  # run as a script: make the checkout importable
    sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

TYPE = """\
# INVENTED benchmark type, not for operational use.
format_version = 1
[vehicle]
name = "BX-1"
title = "Benchmark type (invented)"
kind = "airplane"
[units]
mass = "kg"
length = "m"
volume = "L"
[datum]
description = "invented"
[mac]
lemac = 2.0
length = 1.5
[limits]
max_takeoff = 5000
max_landing = 4800
[[envelope]]
name = "normal"
category = "normal"
axis = "longitudinal"
points = [[2.0, 1000], [2.0, 5000], [3.0, 5000], [3.0, 1000]]
[[reaction_point]]
name = "nose"
x = 1.0
[[reaction_point]]
name = "main"
x = 3.0
[tolerances]
reweigh_mass_percent = 0.5
reweigh_cg_percent_mac = 0.5
"""

DAY = dt.date(2025, 1, 10)


def records(n: int) -> list[tuple[int, dict]]:
    """A weighing, then ``n - 1`` installations and removals (as parsed from a JSON file)."""
    out = [(1, {"kind": "weighing", "entry_date": DAY.isoformat(), "actor": "bench",
                "empty_mass_kg": 2000.0, "empty_mx_kgm": 5000.0, "empty_my_kgm": 0.0,
                "z_known": 0, "detail_json": {"source": "benchmark"}})]
    for k in range(1, n):
        item = f"item {(k - 1) // 2}"
        if k % 2:
            rec = {"kind": "install", "entry_date": DAY.isoformat(), "actor": "bench",
                   "item": item, "item_mass_kg": 1.0 + (k % 7) / 8,
                   "item_x_m": 2.0 + (k % 11) / 16, "item_y_m": 0.0,
                   "reason": "benchmark", "reference": f"WO-{k}"}
        else:
            rec = {"kind": "remove", "entry_date": DAY.isoformat(), "actor": "bench",
                   "item": item, "reason": "benchmark"}
        out.append((k + 1, rec))
    return out


def _fresh(folder: Path, name: str, vehicles: list[str]):
    """A new ledger file built through the migrations, with the benchmark type and vehicles."""
    from ledger.store.catalog import add_vehicle
    from ledger.store.db import session_scope
    from ledger.testing import import_types, new_ledger

    eng = new_ledger(f"sqlite:///{folder / name}")
    with session_scope(eng) as s:
        import_types(s, {"bx-1.toml": TYPE})
        for reg in vehicles:
            add_vehicle(s, reg, "BX-1")
    return eng


def _raw(path: Path) -> sqlite3.Connection:
    """sqlite3 on the same file settings as the ledger (WAL, synchronous FULL)."""
    con = sqlite3.connect(path, isolation_level=None)
    con.execute("PRAGMA journal_mode = WAL")
    con.execute("PRAGMA synchronous = FULL")
    con.execute("PRAGMA foreign_keys = ON")
    return con


def _rows_of(eng) -> tuple[list[str], list[tuple]]:
    with eng.connect() as conn:
        result = conn.exec_driver_sql("SELECT * FROM ledger_entries ORDER BY id")
        cols = list(result.keys())
        return cols, [tuple(r) for r in result]


def bench_bulk_import(folder: Path, n: int = 100_000, rounds: int = 3) -> float:
    """Rounds of one import each way into new files, alternately, so that both see the same
    disk and background load; ratio of the best round of each."""
    from ledger.store.db import session_scope
    from ledger.store.transfer import import_entries

    recs = records(n)
    best_ours = best_raw = math.inf
    for r in range(rounds):
        ours = _fresh(folder, f"bulk_ours_{r}.sqlite3", ["BX-1001"])
        t0 = time.perf_counter()
        with session_scope(ours) as s:
            summary = import_entries(s, "BX-1001", recs, source="bench")
        best_ours = min(best_ours, time.perf_counter() - t0)
        assert summary.imported == n
        cols, rows = _rows_of(ours)
        ours.dispose()

        raw_eng = _fresh(folder, f"bulk_raw_{r}.sqlite3", ["BX-1001"])
        raw_eng.dispose()
        con = _raw(folder / f"bulk_raw_{r}.sqlite3")
        sql = (f"INSERT INTO ledger_entries ({', '.join(cols)}) "
               f"VALUES ({', '.join('?' for _ in cols)})")
        t0 = time.perf_counter()
        con.execute("BEGIN IMMEDIATE")
        con.executemany(sql, rows)
        con.execute("COMMIT")
        best_raw = min(best_raw, time.perf_counter() - t0)
        assert con.execute("SELECT count(*) FROM ledger_entries").fetchone()[0] == n
        con.close()
    return best_raw / best_ours


def bench_single_append(folder: Path, rounds: int = 10, per_round: int = 80) -> float:
    """Rounds of ``per_round`` appends each way, alternately, so that both see the same disk
    and background load; ratio of the best round of each (the raw rows are those our appends
    wrote in the same round, read back outside the timing)."""
    from ledger.store.db import session_scope
    from ledger.store.entries import install_item
    from ledger.store.transfer import import_entries

    ours = _fresh(folder, "single_ours.sqlite3", ["BX-2001"])
    with session_scope(ours) as s:  # a weighing to start from
        import_entries(s, "BX-2001", records(1), source="bench")
    with session_scope(ours) as s:  # warm up the statement caches
        install_item(s, "BX-2001", "warm-up", mass=1.0, arm=2.0, actor="bench",
                     reason="benchmark", entry_date=DAY)
    raw_eng = _fresh(folder, "single_raw.sqlite3", ["BX-2001"])
    raw_eng.dispose()
    con = _raw(folder / "single_raw.sqlite3")
    cols, rows = _rows_of(ours)
    sql = (f"INSERT INTO ledger_entries ({', '.join(cols)}) "
           f"VALUES ({', '.join('?' for _ in cols)})")
    for row in rows:  # the same starting state
        con.execute(sql, row)
    done = len(rows)
    best_ours = best_raw = math.inf
    for r in range(rounds):
        t0 = time.perf_counter()
        for i in range(per_round):
            with session_scope(ours) as s:
                install_item(s, "BX-2001", f"part {r}.{i}", mass=1.0 + i / 1000, arm=2.5,
                             actor="bench", reason="benchmark", entry_date=DAY)
        best_ours = min(best_ours, time.perf_counter() - t0)
        _, rows = _rows_of(ours)
        new, done = rows[done:], len(rows)
        t0 = time.perf_counter()
        for row in new:
            con.execute("BEGIN IMMEDIATE")
            con.execute(sql, row)
            con.execute("COMMIT")
        best_raw = min(best_raw, time.perf_counter() - t0)
    con.close()
    ours.dispose()
    return best_raw / best_ours


RAW_FLEET_SQL = """
SELECT v.registration, t.name, t.id, e.seq, e.empty_mass_kg, e.empty_mx_kgm, e.empty_my_kgm,
       e.empty_mz_kgm, e.z_known, e.baseline_seq, b.entry_date, b.empty_mass_kg,
       b.empty_mx_kgm, e.entry_date
FROM vehicles v
JOIN vehicle_types t ON t.id = v.type_id
LEFT JOIN (SELECT vehicle_id, MAX(seq) AS seq FROM ledger_entries GROUP BY vehicle_id) h
       ON h.vehicle_id = v.id
LEFT JOIN ledger_entries e ON e.vehicle_id = v.id AND e.seq = h.seq
LEFT JOIN ledger_entries b ON b.vehicle_id = v.id AND b.seq = e.baseline_seq
ORDER BY v.registration
"""


def _time_ratio(ours, raw, rounds: int) -> float:
    """Best time of ``ours`` ÷ best time of ``raw``, the two run alternately ``rounds`` times."""
    best_ours = best_raw = math.inf
    for _ in range(rounds):
        t0 = time.perf_counter()
        ours()
        t1 = time.perf_counter()
        raw()
        t2 = time.perf_counter()
        best_ours, best_raw = min(best_ours, t1 - t0), min(best_raw, t2 - t1)
    return best_ours / best_raw


def bench_fleet_view(folder: Path, vehicles: int = 1000, per_vehicle: int = 100) -> float:
    from ledger.store.db import session_scope
    from ledger.store.transfer import import_entries
    from ledger.store.views import fleet_view

    regs = [f"BX-{3000 + i}" for i in range(vehicles)]
    eng = _fresh(folder, "fleet.sqlite3", regs)
    recs = records(per_vehicle)
    with session_scope(eng) as s:
        for reg in regs:
            import_entries(s, reg, recs, source="bench")
    con = _raw(folder / "fleet.sqlite3")

    def ours():
        with session_scope(eng) as s:
            return fleet_view(s)

    def raw():
        return con.execute(RAW_FLEET_SQL).fetchall()

    a, b = ours(), raw()  # warm caches; same answer
    assert len(a) == len(b) == vehicles and a[0]["entries"] == b[0][3] == per_vehicle
    assert math.isclose(a[0]["empty"]["empty_mass_kg"], b[0][4], rel_tol=0, abs_tol=0)
    ratio = _time_ratio(ours, raw, 7)
    con.close()
    eng.dispose()
    return ratio


RAW_VERIFY_SQL = ("SELECT * FROM ledger_entries ORDER BY vehicle_id, seq",
                  "SELECT * FROM loading_sheets ORDER BY vehicle_id, id")


def _add_sheets(eng, regs: list[str], per_vehicle: int) -> None:
    """``per_vehicle`` saved sheets of an (empty) plan for each of ``regs``, through the
    library's save path (content hash, links, seal, chain)."""
    from ledger.services.sheets import prepare_sheet, save_prepared
    from ledger.store.db import session_scope

    with session_scope(eng) as s:
        prepared = prepare_sheet(s, {"plan_format": 1, "vehicle": regs[0]}, source="bench",
                                 preparer="bench", with_fixes=False)
        for reg in regs:
            vid = s.execute(text_("SELECT id FROM vehicles WHERE registration = :r"),
                            {"r": reg}).scalar_one()
            eid = s.execute(text_("SELECT id FROM ledger_entries WHERE vehicle_id = :v "
                                  "ORDER BY seq DESC LIMIT 1"), {"v": vid}).scalar_one()
            for _ in range(per_vehicle):
                save_prepared(s, dataclasses.replace(prepared, registration=reg,
                                                     vehicle_id=vid, entry_id=eid))


def bench_verify(folder: Path, vehicles: int = 1000, per_vehicle: int = 100,
                 sheets: int = 10_000) -> float:
    """``wbledger verify`` of the whole database ÷ reading the same rows raw."""
    from ledger.store.db import session_scope
    from ledger.store.evidence import verify_fleet
    from ledger.store.transfer import import_entries

    regs = [f"BX-{5000 + i}" for i in range(vehicles)]
    eng = _fresh(folder, "verify.sqlite3", regs)
    recs = records(per_vehicle)
    with session_scope(eng) as s:
        for reg in regs:
            import_entries(s, reg, recs, source="bench")
    _add_sheets(eng, regs, sheets // vehicles)
    con = _raw(folder / "verify.sqlite3")

    def ours():
        with session_scope(eng) as s:
            return verify_fleet(s)

    def raw():
        return [con.execute(sql).fetchall() for sql in RAW_VERIFY_SQL]

    report, (entries, saved) = ours(), raw()
    assert report.ok and len(entries) == vehicles * per_vehicle and len(saved) == sheets
    assert sum(v.sheets for v in report.vehicles) == sheets
    ratio = _time_ratio(ours, raw, 3)
    con.close()
    eng.dispose()
    return ratio


#: The benchmarks by short name (``python -m bench.bench_ledger bulk single`` runs two).
BENCHES = {
    "bulk": ("ledger_bulk_import_100k", bench_bulk_import, "0.3"),
    "single": ("ledger_single_append", bench_single_append, "0.3"),
    "fleet": ("ledger_fleet_view_1000x100", bench_fleet_view, "1.5"),
    "verify": ("verify_1000x100_10k_sheets", bench_verify, "3"),
}


def main(names: list[str] | None = None) -> None:
    names = names or list(BENCHES)
    unknown = sorted(set(names) - set(BENCHES))
    if unknown:
        raise SystemExit(f"unknown bench {', '.join(unknown)}; choose from {', '.join(BENCHES)}")
    with tempfile.TemporaryDirectory(prefix="wbledger-bench-", dir=None) as tmp:
        folder = Path(tmp)
        for key in names:
            title, bench, target = BENCHES[key]
            print(f"bench {title}: ratio {bench(folder):.2f} (target {target})", flush=True)


if __name__ == "__main__":
    main(sys.argv[1:])
