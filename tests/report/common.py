"""Built sheets of small invented test types for the renderer tests of issue 13 (items 1, 3,
4, 6, 16, 18). Not the demo fleet's figures: those are being re-invented."""

from __future__ import annotations

from ledger.testing import envelope, lb_in_type, station, tank
from tests.loadsheet.common import empty_lb_in, make_type, sheet
from tests.store.test_sheets import PLAN, TYPE

#: A type in lb and in: MZFM 1,500 lb under an envelope whose top is 2,600 lb, so a zero-fuel
#: mass can be over its limit with the CG well inside the polygon.
OVER_ZF_TYPE = lb_in_type(
    name="TEST-ZF",
    limits="max_takeoff = 2450\nmax_landing = 2400\nmax_zero_fuel = 1500\nmax_ramp = 2460",
    stations=(station("pilot", "crew", 80.0, max_mass=300)
              + station("baggage", "cargo", 95.0, max_mass=400)),
    tanks=tank("main", "avgas", 90.0, capacity=60, unusable=2),
    envelopes=envelope([(70, 1000), (92, 1000), (92, 2600), (70, 2600)]))


def built(body: str, *, empty_lb: float = 1250.0, note: str | None = None,
          sheet_id: int | None = None, **kw) -> dict:
    """A sheet of :data:`OVER_ZF_TYPE` with the plan ``body`` (TOML after the header)."""
    if note is not None:
        body = f'note = "{note}"\n' + body
    doc = sheet(make_type(OVER_ZF_TYPE), empty_lb_in(empty_lb, 80.0), body,
                prepared_by="T. Tester", prepared_at="2026-12-01T09:00:00+00:00",
                registration="T-1", **kw)
    if sheet_id is not None:
        doc["sheet"] = {"id": sheet_id, "amends": None, "saved": True}
    return doc


OVER_ZF_PLAN = """
[[person]]
seat = "pilot"
mass = 200
[[cargo]]
station = "baggage"
mass = 100
[fuel]
taxi = 1
trip = 20
tanks = { main = 40 }
"""
"""Zero-fuel 1,250 + 200 + 100 = 1,550 lb: 50 lb over the 1,500 lb MZFM (CG inside)."""


def saved_sheet_vehicle(cli, tmp_path) -> None:
    """A ledger with TS-101 weighed (tests/store/test_sheets.py) and its plan as ok.toml."""
    type_file = tmp_path / "ts-1.toml"
    type_file.write_text(TYPE, encoding="utf-8")
    for args in (("init",), ("type", "import", type_file),
                 ("vehicle", "add", "TS-101", "--type", "TS-1"),
                 ("weigh", "TS-101", "--reading", "nose=350 lb", "--reading", "main=1300 lb",
                  "--by", "tester", "--date", "2026-11-30")):
        assert cli(*args).exit_code == 0
    (tmp_path / "ok.toml").write_text(PLAN, encoding="utf-8")
