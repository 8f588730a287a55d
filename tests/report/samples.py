"""Sample ``wbledger.sheet/1`` documents for the renderer tests (docs/sheet-document.md).

Invented vehicles and figures, made up for these tests only; not for operational use.
The builder computes each document's phases, CGs and margins from its items, so that
every sample is self-consistent (CG = Σ m·x / Σ m, %MAC = (CG − LEMAC) / MAC × 100,
as in the domain notes), but the renderers under test only display these values.

Use the functions (each returns a new dict), never a shared module-level document.
"""

from __future__ import annotations

import copy

from ledger.caution import CAUTION, GROUND_CAUTION
from ledger.units import from_unit, to_unit

__all__ = ["airplane_in_limits", "airplane_moment_envelope", "airplane_out_of_limits",
           "airplane_path_leaves", "ground_vehicle", "helicopter_lateral", "with_changes"]


PHASE_LABELS = {"zero_fuel": "Zero-fuel", "ramp": "Ramp", "takeoff": "Take-off",
                "landing": "Landing", "departure": "Departure", "arrival": "Arrival"}


def _limits_at(points, mass):
    """Forward (smallest) and aft (largest) x where the polygon crosses ``mass``."""
    xs = []
    n = len(points)
    for i in range(n):
        (x0, m0), (x1, m1) = points[i], points[(i + 1) % n]
        if m0 == m1:
            if m0 == mass:
                xs += [x0, x1]
            continue
        if min(m0, m1) <= mass <= max(m0, m1):
            xs.append(x0 + (x1 - x0) * (mass - m0) / (m1 - m0))
    return (min(xs), max(xs)) if xs else (None, None)


def _envelope_result(poly, mass, cg, mac=None):
    fwd, aft = _limits_at(poly["points"], mass)
    top = max(p[1] for p in poly["points"])
    if fwd is None:
        inside, fm, am = False, None, None
    else:
        fm, am = cg - fwd, aft - cg
        inside = fm >= 0 and am >= 0
    res = {"name": poly["name"], "axis": poly["axis"], "category": poly["category"],
           "inside": inside and mass <= top, "forward_margin_m": fm, "aft_margin_m": am,
           "forward_margin_percent_mac": None, "aft_margin_percent_mac": None,
           "mass_margin_kg": top - mass}
    if mac and fm is not None:
        res["forward_margin_percent_mac"] = fm / mac[1] * 100
        res["aft_margin_percent_mac"] = am / mac[1] * 100
    return res


def _build(*, vehicle, units, empty, items, fuel, limits, polygons, mac=None,
           standard=None, violations=(), fixes=(), axles=None, axle_rules=None,
           coordinates="arm", phase_names=("zero_fuel", "ramp", "takeoff", "landing"),
           envelope_phases=("zero_fuel", "takeoff", "landing")):
    """Build a document. Inputs in display units (``units``); the document is SI.

    empty: (mass, x, y); items: (station, kind, label, mass, x, y, max_mass or None, source);
    fuel: (tank, fluid, density per display volume, ramp volume, capacity, unusable, taxi
    volume, trip volume, arm x); limits: phase → max mass or None; polygons: (name, axis,
    [(cg, mass)...]) in display units; mac: (lemac, length) in display length.
    """
    mu, lu, vu = units["mass"], units["length"], units["volume"]
    red = units["moment_reduction"]

    def M(v):
        return from_unit(v, mu)

    def L(v):
        return from_unit(v, lu)

    def V(v):
        return from_unit(v, vu)

    ew_m, ew_x, ew_y = M(empty[0]), L(empty[1]), L(empty[2])
    doc_items = []
    for st, kind, label, m, x, y, mx, src in items:
        doc_items.append({"station": st, "kind": kind, "label": label, "mass_kg": M(m),
                          "x_m": L(x), "y_m": L(y), "z_m": None, "moment_x_kgm": M(m) * L(x),
                          "max_mass_kg": None if mx is None else M(mx),
                          "mass_source": src})
    mac_si = None if mac is None else (L(mac[0]), L(mac[1]))
    doc_fuel = []
    fuel_x = []
    for tank, fluid, dens, ramp, cap, unus, taxi, trip, x in fuel:
        rho = from_unit(dens, f"{mu}/{vu}")
        doc_fuel.append({"tank": tank, "fluid": fluid, "density_kg_m3": rho,
                         "density_source": "nominal", "ramp_mass_kg": V(ramp) * rho,
                         "ramp_volume_m3": V(ramp), "capacity_m3": V(cap),
                         "unusable_m3": V(unus), "taxi_mass_kg": V(taxi) * rho,
                         "trip_mass_kg": V(trip) * rho,
                         "landing_mass_kg": V(ramp - taxi - trip) * rho})
        fuel_x.append((L(x), 0.0))

    zf_m = ew_m + sum(i["mass_kg"] for i in doc_items)
    zf_mx = ew_m * ew_x + sum(i["mass_kg"] * i["x_m"] for i in doc_items)
    zf_my = ew_m * ew_y + sum(i["mass_kg"] * i["y_m"] for i in doc_items)

    def fuel_state(key):
        m = sum(f[key] for f in doc_fuel)
        mx = sum(f[key] * fx for f, (fx, _) in zip(doc_fuel, fuel_x))
        return m, mx

    ramp_f = fuel_state("ramp_mass_kg")
    taxi_f = fuel_state("taxi_mass_kg")
    trip_f = fuel_state("trip_mass_kg")
    states = {
        "zero_fuel": (zf_m, zf_mx),
        "departure": (zf_m + ramp_f[0], zf_mx + ramp_f[1]),
        "arrival": (zf_m + ramp_f[0] - taxi_f[0] - trip_f[0],
                    zf_mx + ramp_f[1] - taxi_f[1] - trip_f[1]),
        "ramp": (zf_m + ramp_f[0], zf_mx + ramp_f[1]),
        "takeoff": (zf_m + ramp_f[0] - taxi_f[0], zf_mx + ramp_f[1] - taxi_f[1]),
        "landing": (zf_m + ramp_f[0] - taxi_f[0] - trip_f[0],
                    zf_mx + ramp_f[1] - taxi_f[1] - trip_f[1]),
    }
    doc_polys = []
    for name, axis, pts in polygons:
        if coordinates == "moment" and axis == "longitudinal":
            si = [[M(m) * L(x), M(m)] for x, m in pts]
            coords = "moment"
        else:
            si = [[L(x), M(m)] for x, m in pts]
            coords = "arm"
        doc_polys.append({"name": name, "axis": axis, "category": name,
                          "coordinates": coords, "points": si, "_arm": [[L(x), M(m)]
                                                                       for x, m in pts]})

    def check(mass, cgx, cgy):
        out = []
        for p in doc_polys:
            arm_poly = {"name": p["name"], "axis": p["axis"], "category": p["category"],
                        "points": p["_arm"]}
            cg = cgy if p["axis"] == "lateral" else cgx
            out.append(_envelope_result(arm_poly, mass, cg,
                                        mac_si if p["axis"] == "longitudinal" else None))
        return out

    phases = []
    for name in phase_names:
        m, mx = states[name]
        cgx, cgy = mx / m, zf_my / m
        limit = limits.get(name)
        lim_kg = None if limit is None else M(limit)
        envs = check(m, cgx, cgy) if name in envelope_phases else []
        phases.append({
            "name": name, "mass_kg": m, "cg_m": {"x": cgx, "y": cgy, "z": None},
            "moment_kgm": {"x": mx, "y": zf_my, "z": None},
            "moment_index": to_unit(mx, f"{mu}*{lu}") / red,
            "percent_mac": None if mac_si is None else (cgx - mac_si[0]) / mac_si[1] * 100,
            "mass_limit_kg": lim_kg,
            "mass_margin_kg": None if lim_kg is None else lim_kg - m,
            "envelopes": envs,
            "label": PHASE_LABELS.get(name),
            "in_limits": (lim_kg is None or m <= lim_kg) and all(e["inside"] for e in envs),
        })
    path_points = []
    path_envs = []
    ground = "departure" in phase_names
    start, end = ("departure", "arrival") if ground else ("takeoff", "landing")
    if doc_fuel and not ground:
        (m0, mx0), (m1, mx1) = states[start], states[end]
        for k in range(6):
            t = k / 5
            m, mx = m0 + (m1 - m0) * t, mx0 + (mx1 - mx0) * t
            path_points.append({"mass_kg": m, "cg_x_m": mx / m, "cg_y_m": zf_my / m,
                                "moment_x_kgm": mx})
        for p in doc_polys:
            exit_pt = None
            for q in path_points:
                cg = q["cg_y_m"] if p["axis"] == "lateral" else q["cg_x_m"]
                r = _envelope_result({**p, "points": p["_arm"]}, q["mass_kg"], cg)
                if not r["inside"]:
                    exit_pt = dict(q)
                    break
            path_envs.append({"name": p["name"], "axis": p["axis"], "inside": exit_pt is None,
                              "first_exit": exit_pt})
    for p in doc_polys:
        del p["_arm"]
    for v in violations:
        v.setdefault("unit", "kg")
    ok = not violations and all(ph["in_limits"] for ph in phases)
    return {
        "schema": "wbledger.sheet/1",
        "caution": CAUTION,
        "sheet": {"id": None, "amends": None, "saved": False},
        "vehicle": vehicle,
        "empty_weight": {"entry_seq": 3, "entry_date": "2026-11-30", "mass_kg": ew_m,
                         "cg_m": {"x": ew_x, "y": ew_y, "z": None}},
        "configuration": {"name": "standard", "items": []},
        "prepared": {"by": "R. Tanaka (invented)", "at": "2026-12-01T09:00:00+00:00"},
        "standard_masses": standard or {"name": "actual", "description": "actual masses as "
                                                                          "entered"},
        "units": dict(units),
        "items": doc_items,
        "stations": [{"station": i["station"], "kind": i["kind"], "mass_kg": i["mass_kg"],
                      "max_mass_kg": i["max_mass_kg"],
                      "margin_kg": i["max_mass_kg"] - i["mass_kg"],
                      "floor_loading_kg_m2": None, "floor_load_limit_kg_m2": None,
                      "in_limits": i["mass_kg"] <= i["max_mass_kg"]}
                     for i in doc_items if i["max_mass_kg"] is not None],
        "category": "normal" if polygons else None,
        "fuel": doc_fuel,
        "burn": {"sequence": "proportional", "order": [f["tank"] for f in doc_fuel]},
        "phases": phases,
        "burn_path": {"from": start, "to": end, "points": path_points,
                      "envelopes": path_envs},
        "axles": axles,
        "axle_rules": axle_rules,
        "violations": list(violations),
        "fixes": list(fixes),
        "envelope_polygons": doc_polys,
        "verdict": "in_limits" if ok else "out_of_limits",
    }


# An invented single-engine type (lb, in, US gal; moment index lb*in/1000).
_P4_UNITS = {"mass": "lb", "length": "in", "volume": "USgal", "moment_reduction": 1000}
_P4_VEHICLE = {"registration": "KV-101", "type": "KV-P4", "type_revision": 2,
               "kind": "airplane",
               "title": "Kestrel Valley Air & Freight (invented) four-seat single"}
_P4_ENVELOPE = [("normal", "longitudinal",
                 [(35.0, 1500.0), (35.0, 1950.0), (39.5, 2550.0), (47.3, 2550.0),
                  (47.3, 1500.0)])]
_P4_LIMITS = {"zero_fuel": None, "ramp": 2558.0, "takeoff": 2550.0, "landing": 2550.0}
_P4_FUEL = [("main", "avgas", 6.0, 48.0, 53.0, 3.0, 1.4, 30.0, 48.0)]
_P4_MAC = (30.0, 58.0)


def airplane_in_limits() -> dict:
    """An airplane loading in limits, one standard-mass passenger."""
    return _build(
        vehicle=dict(_P4_VEHICLE), units=_P4_UNITS, empty=(1495.0, 38.9, 0.0),
        items=[("front_left", "crew", "A. Lindqvist", 180.0, 37.0, 0.0, None, "actual"),
               ("front_right", "passenger", "B. Okafor", 160.0, 37.0, 0.0, None, "actual"),
               ("rear_left", "passenger", "passenger 3", 170.0, 73.0, 0.0, None,
                "standard"),
               ("baggage", "cargo", "bags", 40.0, 95.0, 0.0, 120.0, "actual")],
        fuel=_P4_FUEL, limits=_P4_LIMITS, polygons=_P4_ENVELOPE, mac=_P4_MAC,
        standard={"name": "faa-light-170lb",
                  "description": "Crew and passengers 170 lb each (light aircraft)"})


def airplane_moment_envelope() -> dict:
    """The in-limits airplane with its envelope given as (moment, mass)."""
    return _build(
        vehicle=dict(_P4_VEHICLE), units=_P4_UNITS, empty=(1495.0, 38.9, 0.0),
        items=[("front_left", "crew", "A. Lindqvist", 180.0, 37.0, 0.0, None, "actual"),
               ("baggage", "cargo", "bags", 40.0, 95.0, 0.0, 120.0, "actual")],
        fuel=_P4_FUEL, limits=_P4_LIMITS, polygons=_P4_ENVELOPE, mac=_P4_MAC,
        coordinates="moment")


def airplane_out_of_limits() -> dict:
    """Too heavy and aft: station, mass, envelope and burn-path violations, with fixes."""
    lb = from_unit(1, "lb")
    violations = [
        {"code": "station_limit", "phase": None, "subject": "baggage",
         "limit": 120 * lb, "actual": 150 * lb, "excess": 30 * lb,
         "message": "Baggage holds 150 lb, over its limit of 120 lb by 30 lb"},
        {"code": "mass_limit", "phase": "ramp", "subject": "maximum ramp mass",
         "limit": 2558 * lb, "actual": 2733 * lb, "excess": 175 * lb,
         "message": "Ramp mass 2733 lb is over the maximum 2558 lb by 175 lb"},
        {"code": "mass_limit", "phase": "takeoff", "subject": "maximum take-off mass",
         "limit": 2550 * lb, "actual": 2724.6 * lb, "excess": 174.6 * lb,
         "message": "Take-off mass 2724.6 lb is over the maximum 2550 lb by 174.6 lb"},
        {"code": "envelope", "phase": "zero_fuel", "subject": "normal envelope, aft limit",
         "limit": from_unit(47.3, "in"), "actual": from_unit(47.76, "in"),
         "excess": from_unit(0.46, "in"), "unit": "m",
         "message": "Zero-fuel CG 47.76 in is aft of the limit 47.30 in by 0.46 in"},
        {"code": "burn_path", "phase": "trip", "subject": "normal envelope while fuel burns",
         "limit": None, "actual": from_unit(47.78, "in"), "excess": None, "unit": "m",
         "message": "While fuel burns from take-off to landing the CG leaves the normal "
                    "envelope at 2724.6 lb, CG 47.78 in"},
    ]
    fixes = [
        {"kind": "offload_payload", "description": "Offload 180 lb of baggage and cargo "
         "(leave the baggage compartment empty and take 30 lb off the rear seats)",
         "mass_kg": 180 * lb, "from_station": "baggage", "to_station": None,
         "rechecked": True, "in_limits_after": True},
        {"kind": "shift", "description": "Move 30 lb from baggage to rear_right",
         "mass_kg": 30 * lb, "from_station": "baggage", "to_station": "rear_right",
         "rechecked": True, "in_limits_after": False},
    ]
    return _build(
        vehicle=dict(_P4_VEHICLE), units=_P4_UNITS, empty=(1495.0, 38.9, 0.0),
        items=[("front_left", "crew", "A. Lindqvist", 200.0, 37.0, 0.0, None, "actual"),
               ("front_right", "passenger", "C. Moreau", 190.0, 37.0, 0.0, None, "actual"),
               ("rear_left", "passenger", "D. Adeyemi", 210.0, 73.0, 0.0, None, "actual"),
               ("rear_right", "passenger", "E. Novak", 200.0, 73.0, 0.0, None, "actual"),
               ("baggage", "cargo", "bags and tools", 150.0, 95.0, 0.0, 120.0, "actual")],
        fuel=_P4_FUEL, limits=_P4_LIMITS, polygons=_P4_ENVELOPE, mac=_P4_MAC,
        violations=violations, fixes=fixes)


def airplane_path_leaves() -> dict:
    """Take-off and landing in limits, but the burn path crosses a notch in the envelope."""
    notch = [("normal", "longitudinal",
              [(35.0, 1500.0), (35.0, 1950.0), (39.5, 2550.0), (47.3, 2550.0),
               (47.3, 2300.0), (42.5, 2240.0), (42.5, 2200.0), (47.3, 2150.0),
               (47.3, 1500.0)])]
    doc = _build(
        vehicle=dict(_P4_VEHICLE), units=_P4_UNITS, empty=(1495.0, 38.9, 0.0),
        items=[("front_left", "crew", "A. Lindqvist", 180.0, 37.0, 0.0, None, "actual"),
               ("front_right", "passenger", "B. Okafor", 160.0, 37.0, 0.0, None, "actual"),
               ("rear_left", "passenger", "passenger 3", 170.0, 73.0, 0.0, None,
                "standard"),
               ("baggage", "cargo", "bags", 40.0, 95.0, 0.0, 120.0, "actual")],
        fuel=_P4_FUEL, limits=_P4_LIMITS, polygons=notch, mac=_P4_MAC,
        standard={"name": "faa-light-170lb",
                  "description": "Crew and passengers 170 lb each (light aircraft)"})
    exit_pt = doc["burn_path"]["envelopes"][0]["first_exit"]
    assert exit_pt is not None and all(p["in_limits"] for p in doc["phases"])
    doc["violations"] = [{
        "code": "burn_path", "phase": "trip", "subject": "normal envelope while fuel burns",
        "limit": None, "actual": exit_pt["cg_x_m"], "excess": None, "unit": "m",
        "message": "While fuel burns from take-off to landing the CG leaves the normal "
                   "envelope at 2216.6 lb, although take-off and landing are in limits"}]
    doc["fixes"] = [{"kind": "shift", "description": "Move 20 lb from baggage to front_right",
                     "mass_kg": from_unit(20, "lb"), "from_station": "baggage",
                     "to_station": "front_right", "rechecked": True, "in_limits_after": True}]
    doc["verdict"] = "out_of_limits"
    return doc


def helicopter_lateral() -> dict:
    """A helicopter (kg, m, L) with a longitudinal and a lateral envelope, in limits."""
    return _build(
        vehicle={"registration": "KV-H2", "type": "KV-R5", "type_revision": 1,
                 "kind": "helicopter", "title": "invented five-seat helicopter"},
        units={"mass": "kg", "length": "m", "volume": "L", "moment_reduction": 1},
        empty=(1050.0, 3.40, 0.010),
        items=[("pilot", "crew", "F. Iqbal", 85.0, 2.10, 0.35, None, "actual"),
               ("front_left", "passenger", "G. Silva", 80.0, 2.10, -0.35, None, "actual"),
               ("rear_left", "passenger", "H. Berg", 75.0, 3.00, -0.40, None, "actual"),
               ("rear_right", "passenger", "I. Chen", 75.0, 3.00, 0.40, None, "actual"),
               ("hold", "cargo", "survey kit", 20.0, 4.20, 0.0, 60.0, "actual")],
        fuel=[("main", "jet", 0.80, 400.0, 450.0, 5.0, 10.0, 250.0, 3.60)],
        limits={"zero_fuel": None, "ramp": 2100.0, "takeoff": 2100.0, "landing": 2100.0},
        polygons=[("normal", "longitudinal",
                   [(3.05, 1000.0), (3.05, 1700.0), (3.25, 2100.0), (3.55, 2100.0),
                    (3.60, 1000.0)]),
                  ("normal", "lateral",
                   [(-0.10, 1000.0), (-0.10, 2100.0), (0.10, 2100.0), (0.10, 1000.0)])])


def ground_vehicle() -> dict:
    """A two-axle truck (kg, mm, L): departure and arrival, axle loads, an advisory rule."""
    doc = _build(
        vehicle={"registration": "KV-T7", "type": "KV-LT12", "type_revision": 3,
                 "kind": "ground_vehicle", "title": "invented 12 t box truck"},
        units={"mass": "kg", "length": "mm", "volume": "L", "moment_reduction": 1000},
        empty=(5200.0, 1800.0, 0.0),
        items=[("cab", "crew", "driver J. Ruiz", 80.0, -400.0, 0.0, None, "actual"),
               ("body", "cargo", "pallets", 3000.0, 2500.0, 0.0, 6500.0, "actual")],
        fuel=[("diesel", "diesel", 0.84, 200.0, 300.0, 10.0, 0.0, 60.0, 1500.0)],
        limits={"departure": 12000.0, "arrival": 12000.0},
        polygons=[], phase_names=("departure", "arrival"), envelope_phases=())
    wheelbase = 4.2
    rules = []
    for phase in doc["phases"]:
        w, x = phase["mass_kg"], phase["cg_m"]["x"]
        rear = w * x / wheelbase  # W_r = W·a/L (domain notes, road vehicles)
        front = w - rear
        phase["axles"] = [
            {"phase": phase["name"], "name": "front", "x_m": 0.0, "load_kg": front,
             "rating_kg": 5000.0, "margin_kg": 5000.0 - front, "left_kg": front / 2,
             "right_kg": front / 2, "in_limits": front <= 5000.0},
            {"phase": phase["name"], "name": "rear", "x_m": wheelbase, "load_kg": rear,
             "rating_kg": 8000.0, "margin_kg": 8000.0 - rear, "left_kg": rear / 2,
             "right_kg": rear / 2, "in_limits": rear <= 8000.0},
        ]
        if phase["name"] == "departure":
            # 20,000 lb single axle (23 CFR 658.17) = 9071.847 kg
            rules.append({"phase": "departure", "rule": "single axle", "axles": [1],
                          "axle_names": ["rear"], "load_kg": rear, "limit_kg": 9071.847,
                          "margin_kg": 9071.847 - rear, "ok": True, "detail": "",
                          "text": "(kg text from the core)"})
    doc["axles"] = doc["phases"][0]["axles"]
    doc["axle_rules"] = rules
    doc["axle_rule_set"] = {"key": "us-federal-interstate", "name": "US federal (Interstate)",
                            "source": "23 CFR 658.17", "advisory": "Advisory only: not a "
                            "legal determination.", "caution": GROUND_CAUTION}
    doc["ground_caution"] = GROUND_CAUTION
    return doc


def with_changes(doc: dict, **changes) -> dict:
    """A deep copy of ``doc`` with top-level keys replaced."""
    out = copy.deepcopy(doc)
    out.update(changes)
    return out
