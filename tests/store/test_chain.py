"""The hash chain: canonical content, and that any change made by direct SQL is caught and the
first entry that does not match is named — on SQLite and PostgreSQL.

The expected hash below is computed independently of :mod:`ledger.store.chain`: the canonical
text is written out by hand and hashed with :mod:`hashlib` (SHA-256, FIPS 180-4).
"""

from __future__ import annotations

import datetime as dt
import hashlib

import pytest
from sqlalchemy import text

from ledger.store import chain, entries, guards
from ledger.store.db import session_scope
from tests.store.ledger_support import DAY0, setup_fleet, weigh_a

D1 = DAY0 + dt.timedelta(days=1)

SAMPLE = dict(seq=1, kind="weighing", entry_date=dt.date(2026, 1, 5),
              recorded_at=dt.datetime(2026, 1, 5, 9, 30, 0, 250000, tzinfo=dt.UTC),
              actor="A. Weigher", reason=None, reference="WO-1", item=None,
              item_mass_kg=None, item_x_m=None, item_y_m=None, item_z_m=None,
              delta_mass_kg=700.1, delta_mx_kgm=1400.0, delta_my_kgm=-0.0, delta_mz_kgm=0,
              empty_mass_kg=700.1, empty_mx_kgm=1400.0, empty_my_kgm=0.0, empty_mz_kgm=0.0,
              z_known=0, baseline_seq=1, reverses_seq=None, detail_json='{"a":1}',
              prev_hash=chain.GENESIS_HASH)

SAMPLE_TEXT = (
    '{"actor":"A. Weigher","baseline_seq":1,"delta_mass_kg":700.1,"delta_mx_kgm":1400.0,'
    '"delta_my_kgm":0.0,"delta_mz_kgm":0.0,"detail":"{\\"a\\":1}","empty_mass_kg":700.1,'
    '"empty_mx_kgm":1400.0,"empty_my_kgm":0.0,"empty_mz_kgm":0.0,"entry_date":"2026-01-05",'
    '"item":null,"item_mass_kg":null,"item_x_m":null,"item_y_m":null,"item_z_m":null,'
    '"kind":"weighing","prev_hash":"' + "0" * 64 + '","reason":null,'
    '"recorded_at":"2026-01-05T09:30:00.250000Z","reference":"WO-1","reverses_seq":null,'
    '"seq":1,"v":1,"vehicle":"KV-101","z_known":0}'
)


def test_canonical_content_is_the_documented_text():
    # Sorted keys, no whitespace, exact float repr, -0.0 written as 0.0, ints as floats for
    # float columns, UTC with microseconds, the detail JSON as a string.
    assert chain.canonical_content(SAMPLE, "KV-101") == SAMPLE_TEXT
    assert chain.content_hash(SAMPLE, "KV-101") == hashlib.sha256(
        SAMPLE_TEXT.encode("utf-8")).hexdigest()
    # the same instant given in another time zone hashes the same
    other = {**SAMPLE, "recorded_at": dt.datetime(2026, 1, 5, 11, 30, 0, 250000,
                                                  tzinfo=dt.timezone(dt.timedelta(hours=2)))}
    assert chain.content_hash(other, "KV-101") == chain.content_hash(SAMPLE, "KV-101")
    # one ulp of one float, or the registration, changes the hash
    import math

    bumped = {**SAMPLE, "empty_mass_kg": math.nextafter(700.1, 800.0)}
    assert chain.content_hash(bumped, "KV-101") != chain.content_hash(SAMPLE, "KV-101")
    assert chain.content_hash(SAMPLE, "KV-102") != chain.content_hash(SAMPLE, "KV-101")


@pytest.fixture
def chained(engine):
    """KV-101 with five entries of every append kind, KV-102 with one, KV-103 with none."""
    setup_fleet(engine, {"KV-101": "TT-A1", "KV-102": "TT-A1", "KV-103": "TT-A1"})
    weigh_a(engine, "KV-101")
    weigh_a(engine, "KV-102")
    with session_scope(engine) as s:
        entries.install_item(s, "KV-101", "radio", mass="3.3 lb", arm="61.7 in",
                             vert_arm="10 in", actor="T", reason="fit", reference="WO-9",
                             entry_date=D1, shape="box,length=5,width=4,height=3")
        entries.install_item(s, "KV-101", "lamp", mass=0.123456789, arm=1.987654321,
                             lat_arm=-0.5, actor="T", reason="fit", entry_date=D1)
        entries.remove_item(s, "KV-101", "radio", actor="T", reason="u/s", entry_date=D1)
        entries.correct_entry(s, "KV-101", 4, actor="Q", reason="stays", entry_date=D1)
    return engine


def _reports(engine):
    with session_scope(engine) as s:
        return {r.registration: r for r in chain.verify_all(s)}


def test_untouched_chains_verify(chained):
    reps = _reports(chained)
    assert {k: (r.ok, r.entries) for k, r in reps.items()} == {
        "KV-101": (True, 5), "KV-102": (True, 1), "KV-103": (True, 0)}
    with chained.connect() as conn:
        first = conn.execute(text("SELECT prev_hash FROM ledger_entries e JOIN vehicles v "
                                  "ON v.id = e.vehicle_id WHERE v.registration = 'KV-101' "
                                  "AND seq = 1")).scalar()
        head = conn.execute(text("SELECT entry_hash FROM ledger_entries e JOIN vehicles v "
                                 "ON v.id = e.vehicle_id WHERE v.registration = 'KV-101' "
                                 "AND seq = 5")).scalar()
    assert first == "0" * 64
    assert reps["KV-101"].head_hash == head and reps["KV-101"].head_seq == 5


# Each change is made by direct SQL on entry 3 of KV-101 (the lamp installation), one at a
# time inside a transaction that is rolled back; verify must name entry 3 (entry 4 when entry
# 3 is renumbered: then entry 3 is missing).
EDITS = [
    ("seq", "99", 4, "entry 4 follows entry 2: entry 3 is missing"),
    ("kind", "'remove'", 3, "its content does not match its hash"),
    ("entry_date", None, 3, "its content does not match"),   # expression per dialect below
    ("recorded_at", None, 3, "its content does not match"),
    ("actor", "'someone else'", 3, "its content does not match"),
    ("reason", "NULL", 3, "its content does not match"),
    ("reference", "'WO-X'", 3, "its content does not match"),
    ("item", "'lamp2'", 3, "its content does not match"),
    ("item_mass_kg", "item_mass_kg * 1.0000000001", 3, "its content does not match"),
    ("item_x_m", "item_x_m + 0.001", 3, "its content does not match"),
    ("item_y_m", "0.0", 3, "its content does not match"),
    ("item_z_m", "0.5", 3, "its content does not match"),
    ("delta_mass_kg", "delta_mass_kg + 1e-9", 3, "its content does not match"),
    ("delta_mx_kgm", "delta_mx_kgm - 1", 3, "its content does not match"),
    ("delta_my_kgm", "delta_my_kgm + 1", 3, "its content does not match"),
    ("delta_mz_kgm", "delta_mz_kgm + 1", 3, "its content does not match"),
    ("empty_mass_kg", "empty_mass_kg + 1", 3, "its content does not match"),
    ("empty_mx_kgm", "empty_mx_kgm + 1", 3, "its content does not match"),
    ("empty_my_kgm", "empty_my_kgm + 1", 3, "its content does not match"),
    ("empty_mz_kgm", "empty_mz_kgm + 1", 3, "its content does not match"),
    ("z_known", "1", 3, "its content does not match"),
    ("baseline_seq", "2", 3, "its content does not match"),
    ("reverses_seq", "1", 3, "its content does not match"),
    ("detail_json", "'{ }'", 3, "its content does not match"),
    ("prev_hash", "'" + "1" * 64 + "'", 3, "prev_hash does not match the hash of entry 2"),
    ("entry_hash", "'" + "2" * 64 + "'", 3, "its content does not match"),
]


def _date_plus_one(dialect: str) -> str:
    return "date(entry_date, '+1 day')" if dialect == "sqlite" else "entry_date + 1"


def _time_plus_1us(dialect: str) -> str:
    # SQLite keeps the timestamp as text; PostgreSQL as a timestamp
    return ("substr(recorded_at, 1, 25) || CASE substr(recorded_at, 26, 1) WHEN '9' THEN '8' "
            "ELSE '9' END || substr(recorded_at, 27)"
            if dialect == "sqlite" else "recorded_at + interval '1 microsecond'")


def test_every_field_edited_by_sql_is_caught(chained):
    from sqlalchemy.orm import Session

    dialect = chained.dialect.name
    caught = []
    for column, expr, bad_seq, problem in EDITS:
        if column == "entry_date":
            expr = _date_plus_one(dialect)
        elif column == "recorded_at":
            expr = _time_plus_1us(dialect)
        with chained.connect() as conn:
            trans = conn.begin()
            guards.drop(conn, ["ledger_entries"])  # a hand edit removes the guard first
            n = conn.execute(text(
                f"UPDATE ledger_entries SET {column} = {expr} WHERE seq = 3 AND vehicle_id = "
                "(SELECT id FROM vehicles WHERE registration = 'KV-101')")).rowcount
            assert n == 1, column
            with Session(bind=conn) as s:
                rep = chain.verify_vehicle(s, "KV-101")
                other = chain.verify_vehicle(s, "KV-102")
            trans.rollback()
        assert not rep.ok, column
        assert rep.bad_seq == bad_seq, (column, rep)
        assert problem in rep.problem, (column, rep.problem)
        assert other.ok  # another vehicle's chain is not affected
        caught.append(column)
    assert set(caught) == set(chain.HASHED_COLUMNS) | {"entry_hash"}
    assert _reports(chained)["KV-101"].ok  # every change was rolled back


def test_changing_the_registration_breaks_that_vehicles_chain(chained):
    with chained.begin() as conn:
        guards.drop(conn, ["vehicles"])
        conn.execute(text("UPDATE vehicles SET registration = 'KV-999' "
                          "WHERE registration = 'KV-102'"))
    rep = _reports(chained)["KV-999"]
    assert (rep.ok, rep.bad_seq) == (False, 1)


def test_deleted_and_reordered_entries_are_caught(chained):
    vid = "(SELECT id FROM vehicles WHERE registration = 'KV-101')"
    with chained.connect() as conn:
        trans = conn.begin()
        guards.drop(conn, ["ledger_entries"])
        conn.execute(text(f"DELETE FROM ledger_entries WHERE seq = 2 AND vehicle_id = {vid}"))
        from sqlalchemy.orm import Session

        with Session(bind=conn) as s:
            rep = chain.verify_vehicle(s, "KV-101")
        trans.rollback()
    assert (rep.bad_seq, rep.problem) == (3, "entry 3 follows entry 1: entry 2 is missing")
    with chained.connect() as conn:
        trans = conn.begin()
        guards.drop(conn, ["ledger_entries"])
        conn.execute(text(f"UPDATE ledger_entries SET seq = 99 WHERE seq = 5 AND vehicle_id = "
                          f"{vid}"))
        with Session(bind=conn) as s:
            rep = chain.verify_vehicle(s, "KV-101")
        trans.rollback()
    assert rep.bad_seq == 99 and "entries 5 to 98 are missing" in rep.problem
    # Deleting the newest entry leaves a valid shorter chain: only a recorded head shows it.
    with session_scope(chained) as s:
        head = chain.verify_vehicle(s, "KV-101").head_hash
    with chained.begin() as conn:
        guards.drop(conn, ["ledger_entries"])
        conn.execute(text(f"DELETE FROM ledger_entries WHERE seq = 5 AND vehicle_id = {vid}"))
    with session_scope(chained) as s:
        assert chain.verify_vehicle(s, "KV-101").ok
        rep = chain.verify_vehicle(s, "KV-101", expect_head=head)
    assert not rep.ok and rep.bad_seq == 5
    assert rep.problem == (f"the recorded head hash {head[:12]}… is not in the chain: entries "
                           "were removed or replaced")


def test_a_rehashed_entry_breaks_the_next_link(chained):
    """Changing entry 3 and storing a correct new hash for it is caught at entry 4."""
    from sqlalchemy.orm import Session

    with session_scope(chained) as s:
        es = entries.entries_of(s, "KV-101")
    e3 = es[2]
    values = {c: getattr(e3, c) for c in chain.HASHED_COLUMNS}
    values["actor"] = "forger"
    new_hash = chain.content_hash(values, "KV-101")
    with chained.connect() as conn:
        trans = conn.begin()
        guards.drop(conn, ["ledger_entries"])
        conn.execute(text("UPDATE ledger_entries SET actor = 'forger', entry_hash = :h "
                          "WHERE id = :id"), {"h": new_hash, "id": e3.id})
        with Session(bind=conn) as s:
            rep = chain.verify_vehicle(s, "KV-101")
        trans.rollback()
    assert (rep.bad_seq, rep.problem) == (4, "entry 4: prev_hash does not match the hash of "
                                             "entry 3")


def test_running_totals_must_follow_even_with_valid_hashes():
    """A chain whose hashes are all recomputed but whose totals do not add up is refused."""
    rows = []
    prev = chain.GENESIS_HASH
    for seq, (kind, dm, m) in enumerate([("weighing", 700.0, 700.0), ("install", 5.0, 706.0)],
                                        1):
        e = {**SAMPLE, "seq": seq, "kind": kind, "delta_mass_kg": dm, "empty_mass_kg": m,
             "delta_mx_kgm": 0.0, "empty_mx_kgm": 0.0, "delta_my_kgm": 0.0,
             "empty_my_kgm": 0.0, "baseline_seq": 1, "prev_hash": prev}
        h = chain.content_hash(e, "KV-1")
        rows.append(tuple(e[c] for c in chain.HASHED_COLUMNS) + (h,))
        prev = h
    rep = chain.check_entries("KV-1", rows)
    assert (rep.ok, rep.bad_seq) == (False, 2)
    assert rep.problem == ("entry 2: running totals do not follow: empty_mass_kg is not the "
                           "previous entry's plus delta_mass_kg")


def test_floats_survive_the_database_bit_for_bit(chained):
    # The hashes were computed from Python floats before the insert; verifying after reading
    # them back (REAL on SQLite, double precision on PostgreSQL) proves they came back exact.
    with session_scope(chained) as s:
        lamp = entries.get_entry(s, "KV-101", 3)
    assert lamp.item_mass_kg == 0.123456789 and lamp.item_x_m == 1.987654321
    assert lamp.delta_mx_kgm == 0.123456789 * 1.987654321
    assert _reports(chained)["KV-101"].ok


def test_assembled_canonical_text_equals_json_dumps():
    """Hypothesis: the key-by-key assembly is exactly json.dumps of the documented object
    (sorted keys, compact, UTF-8, exact float repr) for any values an entry can hold."""
    import json

    from hypothesis import given, settings
    from hypothesis import strategies as st

    floats = st.floats(allow_nan=False, allow_infinity=False)
    opt_floats = st.none() | floats
    texts = st.text(max_size=30)
    opt_texts = st.none() | texts

    @settings(max_examples=200, deadline=None)
    @given(st.fixed_dictionaries({
        "seq": st.integers(1, 10**9), "kind": st.sampled_from(
            ["weighing", "install", "remove", "correction", "cg_height"]),
        "entry_date": st.dates(), "recorded_at": st.datetimes(timezones=st.just(
            dt.UTC)),
        "actor": texts, "reason": opt_texts, "reference": opt_texts, "item": opt_texts,
        "item_mass_kg": opt_floats, "item_x_m": opt_floats, "item_y_m": opt_floats,
        "item_z_m": opt_floats, "delta_mass_kg": floats, "delta_mx_kgm": floats,
        "delta_my_kgm": floats, "delta_mz_kgm": floats, "empty_mass_kg": floats,
        "empty_mx_kgm": floats, "empty_my_kgm": floats, "empty_mz_kgm": floats,
        "z_known": st.integers(0, 1), "baseline_seq": st.integers(1, 10**9),
        "reverses_seq": st.none() | st.integers(1, 10**9), "detail_json": texts,
        "prev_hash": st.text("0123456789abcdef", min_size=64, max_size=64)}), texts)
    def check(entry, registration):
        expected = json.dumps(chain.canonical_object(entry, registration), sort_keys=True,
                              separators=(",", ":"), ensure_ascii=False, allow_nan=False)
        assert chain.canonical_content(entry, registration) == expected

    check()
    with pytest.raises(ValueError):
        chain.canonical_content({**SAMPLE, "empty_mass_kg": float("nan")}, "KV-101")


def test_a_seq_that_is_not_a_whole_number_is_reported():
    # int() would quietly make 2.5 into 2 (found by the review of the integrity work).
    row = (2.5,) + (None,) * len(chain.HASHED_COLUMNS)
    rep = chain.check_entries("KV-101", [row])
    assert (rep.ok, rep.bad_seq, rep.problem) == (
        False, 1, "entry 1: its seq 2.5 is not a whole number")
