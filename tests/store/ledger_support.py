"""Shared samples for the ledger tests (storage and CLI): invented test types and helpers.

Every type here is INVENTED for the tests (not any real vehicle's data, not for operational
use). TT-A1 is chosen so that hand computation is easy: weighed on a nose wheel at 20 in and two
mains at 100 in (±50 in), a reading of 1715 lb on the nose and 2572.5 lb on each main gives the
6,860 lb at 80.0 in of the worked example in the Pilot's Handbook of Aeronautical Knowledge
(FAA-H-8083-25, ch. 9, as quoted in the domain notes).
"""

from __future__ import annotations

import datetime as dt
from pathlib import Path

from sqlalchemy import text

from ledger.testing import envelope, import_types, lb_in_type, reaction_point, station, tank

LB = 0.45359237   # kg, exact (NIST SP 811, appendix B)
IN = 0.0254       # m, exact (NIST SP 811, appendix B)
USGAL = 3.785411784e-3  # m3, exact (NIST SP 811, appendix B)

TYPE_A = """\
# INVENTED test type, not for operational use.
format_version = 1

[vehicle]
name = "TT-A1"
title = "Test twin (invented)"
kind = "airplane"

[units]
mass = "lb"
length = "in"
volume = "USgal"
moment_divisor = 1000

[datum]
description = "Test datum (invented)"

[mac]
lemac = 70.0
length = 60.0

[limits]
max_ramp = 12600
max_takeoff = 12500
max_landing = 7500
max_zero_fuel = 11000

[[station]]
name = "pilot"
kind = "crew"
x = 60.0
z = 40.0

[[station]]
name = "cabin"
kind = "cargo"
x = 120.0
max_mass = 800

[[tank]]
name = "main"
fluid = "avgas"
capacity = 100.0
unusable = 4.0
x = 90.0
y = 0.0
z = 30.0

[[envelope]]
name = "normal"
category = "normal"
axis = "longitudinal"
points = [[70.0, 5000], [70.0, 12500], [95.0, 12500], [95.0, 5000]]

[[reaction_point]]
name = "nose"
x = 20.0

[[reaction_point]]
name = "left main"
x = 100.0
y = -50.0

[[reaction_point]]
name = "right main"
x = 100.0
y = 50.0

[tolerances]
reweigh_mass_percent = 0.5
reweigh_cg_percent_mac = 0.5

[[configuration]]
name = "seats-out"
action = "remove"
description = "Cabin seats out (invented)"

[[configuration.item]]
name = "cabin seat"
mass = 20
x = 120.0
z = 25.0
"""

TYPE_H = """\
# INVENTED test helicopter, not for operational use.
format_version = 1

[vehicle]
name = "TT-H1"
title = "Test helicopter (invented)"
kind = "helicopter"

[units]
mass = "lb"
length = "in"
volume = "USgal"
moment_divisor = 100

[datum]
description = "Test datum (invented)"

[limits]
max_takeoff = 1600

[[envelope]]
name = "longitudinal"
category = "normal"
axis = "longitudinal"
points = [[95.0, 1000], [95.0, 1400], [97.0, 1600], [101.0, 1600], [102.5, 1000]]

[[envelope]]
name = "lateral"
category = "normal"
axis = "lateral"
points = [[-2.5, 1000], [-2.5, 1600], [2.5, 1600], [2.5, 1000]]

[[reaction_point]]
name = "forward"
x = 85.0

[[reaction_point]]
name = "aft"
x = 125.0
"""

TYPE_D = """\
# INVENTED test drone, not for operational use.
format_version = 1

[vehicle]
name = "TT-D1"
title = "Test drone (invented)"
kind = "drone"

[units]
mass = "kg"
length = "mm"
volume = "L"

[datum]
description = "Test datum (invented)"

[limits]
max_takeoff = 25

[[envelope]]
name = "normal"
category = "normal"
axis = "longitudinal"
points = [[250.0, 5], [250.0, 25], [350.0, 25], [350.0, 5]]

[[reaction_point]]
name = "front"
x = 100.0

[[reaction_point]]
name = "rear"
x = 500.0
"""

TYPES = {"TT-A1": TYPE_A, "TT-H1": TYPE_H, "TT-D1": TYPE_D}


def ts_type(name: str = "TS-1", *, title: str, mtow: float = 2450, baggage_max: float = 500,
            aft_x: float = 60.0, rear_seats: bool = False) -> str:
    """TOML text of the small test airplane of the saved-sheet and tamper suites (INVENTED):
    lb and in, a pilot at 37 in, baggage at 95 in, one avgas tank, a rectangular envelope from
    35 in to ``aft_x``, weighed on a nose wheel at -6.5 in and mains at 58 in."""
    stations = station("pilot", "crew", 37.0)
    if rear_seats:
        stations += station("rear", "passenger", 73.0, extra="persons = 2\n")
    stations += station("baggage", "cargo", 95.0, max_mass=baggage_max)
    return lb_in_type(
        name=name, title=title, limits=f"max_takeoff = {mtow}", stations=stations,
        tanks=tank("main", "avgas", 48.0, capacity=40, unusable=1),
        envelopes=envelope([(35.0, 1500), (35.0, mtow), (aft_x, mtow), (aft_x, 1500)]),
        extra=(reaction_point("nose", -6.5) + reaction_point("main", 58.0)
               + '[tolerances]\nlast_minute_mass = "20 lb"\nlast_minute_persons = 0\n'))

#: Readings giving 6,860 lb at 80.0 in on TT-A1 (see the module notes).
READINGS_A = {"nose": "1715 lb", "left main": "2572.5 lb", "right main": "2572.5 lb"}
DAY0 = dt.date(2025, 1, 10)


def write_types(folder: Path) -> list[Path]:
    paths = []
    for name, body in TYPES.items():
        p = folder / f"{name.lower()}.toml"
        p.write_text(body, encoding="utf-8")
        paths.append(p)
    return paths


def setup_fleet(engine, vehicles: dict[str, str]) -> None:
    """Import the test types and add ``{registration: type name}``."""
    from ledger.store.catalog import add_vehicle
    from ledger.store.db import session_scope

    with session_scope(engine) as s:
        import_types(s, {f"{name}.toml": body for name, body in TYPES.items()})
        for reg, tname in vehicles.items():
            add_vehicle(s, reg, tname)


def weigh_a(engine, reg: str, *, day: dt.date = DAY0, readings=None, **kw):
    """The standard TT-A1 weighing (6,860 lb at 80.0 in)."""
    from ledger.store.db import session_scope
    from ledger.store.entries import record_weighing

    with session_scope(engine) as s:
        return record_weighing(s, reg, readings or READINGS_A, actor="W. Eigher",
                               entry_date=day, **kw)


def snapshot(engine) -> tuple:
    """Everything the ledger stores, to show that a failed command wrote nothing."""
    with engine.connect() as conn:
        entries = conn.execute(text("SELECT * FROM ledger_entries ORDER BY id")).all()
        configs = conn.execute(text("SELECT * FROM configurations ORDER BY id")).all()
        vehicles = conn.execute(text("SELECT * FROM vehicles ORDER BY id")).all()
    return (tuple(map(tuple, entries)), tuple(map(tuple, configs)), tuple(map(tuple, vehicles)))
