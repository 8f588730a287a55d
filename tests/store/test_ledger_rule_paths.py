"""One ledger rule, two ways in: entries appended one by one (``ledger.store.entries``) and the
same entries imported in bulk (``ledger.store.transfer.import_entries``) store the same rows.

Both paths compute an entry's effect with :func:`ledger.core.ledger_rule.apply_entry`; this test
holds them to it end to end. The import is given only what a person would write (kind, date,
time recorded, who, why, the item and its arms, what a correction reverses, the detail, and the
measured state of a weighing or CG height), never a computed column, so the delta, the running
totals, ``z_known``, the baseline and both hashes are the import's own. Every column of every
row is then compared, ``id`` and ``vehicle_id`` included: both databases are fresh and set up
alike, so nothing may legitimately differ.
"""

from __future__ import annotations

import datetime as dt

import pytest
from sqlalchemy import select, text

from ledger.store import entries, transfer
from ledger.store.chain import utc_text, verify_vehicle
from ledger.store.db import make_engine, session_scope, upgrade
from ledger.store.models import LedgerEntryRow
from tests.store.ledger_support import DAY0, setup_fleet, weigh_a

REG = "KV-101"
D = [DAY0 + dt.timedelta(days=k) for k in range(6)]

#: What a person writing a history file gives; the rest is computed by the ledger's rule.
INPUT_COLUMNS = ("seq", "kind", "entry_date", "recorded_at", "actor", "reason", "reference",
                 "item", "item_mass_kg", "item_x_m", "item_y_m", "item_z_m", "reverses_seq",
                 "detail_json")
MEASURED = ("empty_mass_kg", "empty_mx_kgm", "empty_my_kgm", "empty_mz_kgm", "z_known")


@pytest.fixture
def second_engine(request, db_url, tmp_path):
    """Another fresh database of the same kind as ``engine``'s, built through the migrations."""
    if db_url.startswith("sqlite"):
        url, drop = f"sqlite:///{tmp_path / 'bulk.sqlite3'}", None
    else:
        server = request.getfixturevalue("pg_server")
        name = server.create_database()
        url, drop = server.url(name), (lambda: server.drop_database(name))
    eng = make_engine(url)
    upgrade(eng)
    try:
        yield eng
    finally:
        eng.dispose()
        if drop is not None:
            drop()


def _append_every_kind(engine) -> None:
    """Every entry kind, and each branch of the rule, recorded by hand."""
    weigh_a(engine, REG, fuel={"main": "20 USgal"}, tares={"nose": "4 lb"},
            adjustments=[{"label": "oil drained", "mass": "15 lb", "x": "40 in"}],
            scales="S-1", level="marks")
    with session_scope(engine) as s:
        # An installation without a vertical arm: the vertical CG stays unknown.
        entries.install_item(s, REG, "radio", mass="3.3 lb", arm="61.7 in",
                             lat_arm="-2.25 in", actor="I", reason="fit", entry_date=D[1],
                             reference="WO-1")
        # A negligible change (0.1 lb), with a shape kept for inertia.
        entries.install_item(s, REG, "seat", mass="0.1 lb", arm="1e-3 in", vert_arm="-0.0",
                             shape="cylinder,radius=3,length=10,axis=y", actor="I",
                             reason="fit", entry_date=D[1])
        entries.install_item(s, REG, "rack", mass="40 lb", arm="150 in", vert_arm="20 in",
                             actor="I", reason="fit", entry_date=D[1])
        # A removal with another mass than installed (kept as "as_installed" in the detail).
        entries.remove_item(s, REG, "radio", mass="3.5 lb", actor="R", reason="out",
                            entry_date=D[2])
        # Corrections of a removal (reinstalls) and of an installation (takes away).
        entries.correct_entry(s, REG, 5, reason="radio stays,\nsecond line", actor="Q",
                              entry_date=D[2])
        entries.correct_entry(s, REG, 4, reason="rack never fitted", actor="Q",
                              entry_date=D[3])
        # A measured CG height: the vertical CG becomes known ...
        entries.record_cg_height(s, REG, "31.123456789 in", actor="W", entry_date=D[3],
                                 detail={"method": "axle lift"})
        # ... and stays known through an installation with a vertical arm ...
        entries.install_item(s, REG, "box", mass="12 lb", arm="120 in", vert_arm="25 in",
                             actor="I", reason="fit", entry_date=D[4])
        # ... and is lost again through one without.
        entries.install_item(s, REG, "bag", mass="2 lb", arm="130 in", actor="I",
                             reason="fit", entry_date=D[4])
        # Late paperwork (issue 13 item 15): work of D[3] recorded after entries of D[4].
        entries.install_item(s, REG, "logbook", mass="1 lb", arm="20 in", vert_arm="5 in",
                             actor="I", reason="late paperwork", entry_date=D[3])
    # A second weighing starts a new baseline; a removal after it keeps that baseline.
    weigh_a(engine, REG, day=D[5], readings={"nose": "1720 lb", "left main": "2570 lb",
                                             "right main": "2575.5 lb"})
    with session_scope(engine) as s:
        entries.remove_item(s, REG, "box", actor="R", reason="out", entry_date=D[5])


def _rows(engine, *, raw: bool = False) -> list[dict]:
    """Every stored row, read through the table's types, or ``raw`` as the driver gives it
    (on SQLite: the text a date or timestamp is stored as)."""
    table = LedgerEntryRow.__table__
    query = (text("SELECT * FROM ledger_entries ORDER BY vehicle_id, seq") if raw
             else select(table).order_by(table.c.vehicle_id, table.c.seq))
    with engine.connect() as conn:
        return [dict(r._mapping) for r in conn.execute(query)]


def _assert_same(appended: list[dict], imported: list[dict]) -> None:
    assert len(imported) == len(appended)
    for a, b in zip(appended, imported):
        assert a.keys() == b.keys()
        differ = {k: (a[k], b[k]) for k in a if a[k] != b[k] or type(a[k]) is not type(b[k])}
        assert not differ, f"entry {a['seq']} ({a['kind']}): {differ}"


def _as_typed(row: dict) -> dict:
    """What a person would write for a stored row: inputs only, plus a measured state."""
    rec = {k: row[k] for k in INPUT_COLUMNS if row[k] is not None}
    rec["entry_date"] = row["entry_date"].isoformat()
    rec["recorded_at"] = utc_text(row["recorded_at"])
    if row["kind"] in ("weighing", "cg_height"):
        rec.update({k: row[k] for k in MEASURED})
        if not row["z_known"]:
            rec.pop("empty_mz_kgm")
    return rec


def test_append_and_bulk_import_store_the_same_rows(engine, second_engine):
    setup_fleet(engine, {REG: "TT-A1"})
    setup_fleet(second_engine, {REG: "TT-A1"})
    _append_every_kind(engine)
    appended = _rows(engine)
    kinds = {r["kind"] for r in appended}
    assert kinds == {"weighing", "install", "remove", "correction", "cg_height"}
    assert [r["z_known"] for r in appended] == [0, 0, 0, 0, 0, 0, 0, 1, 1, 0, 0, 0, 0]
    assert [r["baseline_seq"] for r in appended] == [1] * 11 + [12, 12]
    assert appended[10]["entry_date"] < appended[9]["entry_date"]  # the late entry

    records = [(k + 1, _as_typed(r)) for k, r in enumerate(appended)]
    assert not any(c in rec for _, rec in records for c in
                   ("delta_mass_kg", "baseline_seq", "prev_hash", "entry_hash"))
    with session_scope(second_engine) as s:
        summary = transfer.import_entries(s, REG, records, source="typed")
    assert summary.imported == len(appended)

    _assert_same(appended, _rows(second_engine))
    _assert_same(_rows(engine, raw=True), _rows(second_engine, raw=True))
    with session_scope(second_engine) as s:
        assert verify_vehicle(s, REG).ok


def test_bulk_import_then_append_continues_alike(engine, second_engine):
    # The other way round: the first entries imported, the rest appended by hand, must give the
    # rows that appending everything by hand gives (the state the import leaves is the rule's).
    setup_fleet(engine, {REG: "TT-A1"})
    setup_fleet(second_engine, {REG: "TT-A1"})
    _append_every_kind(engine)
    appended = _rows(engine)
    head = [(k + 1, _as_typed(r)) for k, r in enumerate(appended[:9])]
    with session_scope(second_engine) as s:
        transfer.import_entries(s, REG, head, source="typed")
        entries.install_item(s, REG, "bag", mass="2 lb", arm="130 in", actor="I",
                             reason="fit", entry_date=D[4])
        # Late paperwork (issue 13 item 15): work of D[3] recorded after entries of D[4].
        entries.install_item(s, REG, "logbook", mass="1 lb", arm="20 in", vert_arm="5 in",
                             actor="I", reason="late paperwork", entry_date=D[3])
        entry = entries.get_entry(s, REG, 10)
    want = appended[9]
    for col in ("delta_mass_kg", "delta_mx_kgm", "delta_my_kgm", "delta_mz_kgm",
                "empty_mass_kg", "empty_mx_kgm", "empty_my_kgm", "empty_mz_kgm",
                "baseline_seq", "prev_hash"):
        assert getattr(entry, col) == want[col], col
    assert entry.z_known == bool(want["z_known"])
