"""Read-only documents of the ledger for the CLI and reports: the fleet, one vehicle, and a
vehicle's running record.

Every value is SI with its unit in the key (``empty_mass_kg``, ``cg_x_m``, ``mx_kgm``); each
document also carries the type's display units (``units``) and, where it helps a reader of the
JSON, the same figures converted to them (``display``). The fleet view takes the current state
of every vehicle from one SQL query (:func:`ledger.store.fleet.fleet_rows`); it does not load
the entries.
"""

from __future__ import annotations

import datetime as dt

from sqlalchemy import func, select
from sqlalchemy.orm import Session

from ledger.core.ledger_rule import negligible_change
from ledger.store.entry_reads import entries_of, get_entry, installed_items
from ledger.store.models import LedgerEntryRow, VehicleTypeRow
from ledger.store.records import Entry
from ledger.store.typeinfo import type_info
from ledger.typedata.readings import parse_date
from ledger.typedata.reweigh import drift_warnings

__all__ = ["fleet_view", "vehicle_view", "history_view", "entry_view"]

NO_WEIGHING = "no weighing recorded"


def _units_doc(vtype) -> dict:
    u = vtype.units
    return {"mass": u.mass, "length": u.length, "volume": u.volume,
            "moment": u.moment_unit, "moment_divisor": u.moment_divisor}


def _mac_doc(vtype) -> dict | None:
    if vtype.mac is None:
        return None
    return {"lemac_m": vtype.mac.lemac_m, "length_m": vtype.mac.length_m}


def _factors(vtype) -> tuple[float, float, float]:
    """Display factors of a type: kg → mass unit, m → length unit, kg·m → moment index."""
    from ledger.units import to_unit

    u = vtype.units
    return (to_unit(1.0, u.mass), to_unit(1.0, u.length), u.moment_index(1.0))


def _state_doc(vtype, m: float, mx: float, my: float, mz: float, z_known: bool,
               factors: tuple[float, float, float] | None = None) -> dict:
    fm, fl, fi = factors or _factors(vtype)
    cx, cy = mx / m, my / m
    cz = mz / m if z_known else None
    mac = vtype.mac
    return {"empty_mass_kg": m, "mx_kgm": mx, "my_kgm": my, "mz_kgm": mz if z_known else None,
            "cg_x_m": cx, "cg_y_m": cy, "cg_z_m": cz,
            "percent_mac": (cx - mac.lemac_m) / mac.length_m * 100.0 if mac else None,
            "display": {"empty_mass": m * fm, "cg_x": cx * fl, "cg_y": cy * fl,
                        "cg_z": None if cz is None else cz * fl, "moment_index": mx * fi}}


def fleet_view(session: Session) -> list[dict]:
    """Every vehicle: type, current empty mass and CG, last weighing, warnings.

    One SQL query finds each vehicle's newest entry and its baseline weighing; the type of each
    distinct type is read once.
    """
    from ledger.store.fleet import fleet_rows

    rows = fleet_rows(session)
    types: dict[int, tuple] = {}
    out = []
    for (reg, tname, tid, seq, m, mx, my, mz, zk, base_seq, weighed, bm, bmx,
         last_date) in rows:
        known = types.get(tid)
        if known is None:
            info = type_info(session, tid)
            known = types[tid] = (info, _factors(info.vtype))
        info, factors = known
        vt = info.vtype
        doc = {"registration": reg, "type": tname, "type_revision": info.revision,
               "units": {"mass": vt.units.mass, "length": vt.units.length},
               "entries": seq or 0}
        if seq is None:
            doc.update({"empty": None, "last_weighed": None, "baseline_seq": None,
                        "last_entry_date": None,
                        "warnings": [{"code": "no_weighing", "message": NO_WEIGHING}]})
        else:
            doc.update({"empty": _state_doc(vt, m, mx, my, mz, bool(zk), factors),
                        "last_weighed": weighed.isoformat(), "baseline_seq": base_seq,
                        "last_entry_date": last_date.isoformat(),
                        "warnings": drift_warnings(vt, bm, bmx, m, mx, base_seq=base_seq,
                                                   base_date=weighed)})
        out.append(doc)
    return out


def _entry_line(vt, e: Entry, prev: Entry | None, base: Entry | None) -> dict:
    """One line of the running record: the change, the state after it, the assessments."""
    after = _state_doc(vt, e.empty_mass_kg, e.empty_mx_kgm, e.empty_my_kgm, e.empty_mz_kgm,
                       e.z_known)
    line = {
        "seq": e.seq, "kind": e.kind, "entry_date": e.entry_date.isoformat(),
        "actor": e.actor, "reason": e.reason, "reference": e.reference, "item": e.item,
        "item_mass_kg": e.item_mass_kg, "item_x_m": e.item_x_m, "item_y_m": e.item_y_m,
        "item_z_m": e.item_z_m, "reverses_seq": e.reverses_seq, "baseline_seq": e.baseline_seq,
        "change": {"mass_kg": e.delta_mass_kg, "mx_kgm": e.delta_mx_kgm,
                   "my_kgm": e.delta_my_kgm, "mz_kgm": e.delta_mz_kgm if e.z_known else None},
        "after": after, "negligible": None, "negligible_note": None, "warnings": [],
        "entry_hash": e.entry_hash,
    }
    if e.kind in ("install", "remove", "correction") and prev is not None:
        verdict, why = negligible_change(vt, prev.empty_mass_kg, prev.cg_x_m, e.empty_mass_kg,
                                         e.cg_x_m)
        line["negligible"], line["negligible_note"] = verdict, why
    if base is not None and e.kind != "weighing":
        line["warnings"] = drift_warnings(vt, base.empty_mass_kg, base.empty_mx_kgm,
                                          e.empty_mass_kg, e.empty_mx_kgm, base_seq=base.seq,
                                          base_date=base.entry_date)
    if e.kind == "weighing":
        d = e.detail
        line["weighing"] = {k: d.get(k) for k in ("points", "as_weighed", "fuel",
                                                  "adjustments", "scales", "level", "note")}
    return line


def history_view(session: Session, registration: str, *,
                 as_of: dt.date | str | None = None) -> dict:
    """A vehicle's running record: per entry the change in mass and moments, then the empty
    mass, moments, CG and %MAC after it, negligible changes and reweigh warnings marked.

    With ``as_of`` only the entries on or before that date are shown, and ``current`` is the
    state on that date.
    """
    from ledger.store.catalog import get_vehicle

    day = None if as_of is None else parse_date(as_of, field="--as-of")
    vehicle = get_vehicle(session, registration)
    info = type_info(session, vehicle.type_id)
    vt = info.vtype
    entries = entries_of(session, registration, as_of=day)
    by_seq: dict[int, Entry] = {}
    lines = []
    prev = None
    for e in entries:
        by_seq[e.seq] = e
        lines.append(_entry_line(vt, e, prev, by_seq.get(e.baseline_seq)))
        prev = e
    total = session.scalar(select(func.count()).where(LedgerEntryRow.vehicle_id == vehicle.id))
    doc = {
        "registration": vehicle.registration, "type": info.name,
        "type_revision": info.revision, "kind": vt.kind, "units": _units_doc(vt),
        "mac": _mac_doc(vt), "as_of": None if day is None else day.isoformat(),
        "entries": lines, "entries_total": total,
        "current": None, "last_weighing": None, "warnings": [],
        "head_hash": prev.entry_hash if prev else None,
    }
    if prev is None:
        doc["warnings"] = [{"code": "no_weighing", "message": NO_WEIGHING +
                            (f" on or before {day}" if day else "")}]
        return doc
    doc["current"] = {"seq": prev.seq, "entry_date": prev.entry_date.isoformat(),
                      **lines[-1]["after"]}
    base = by_seq[prev.baseline_seq]
    doc["last_weighing"] = {"seq": base.seq, "entry_date": base.entry_date.isoformat(),
                            "empty_mass_kg": base.empty_mass_kg, "cg_x_m": base.cg_x_m}
    doc["warnings"] = lines[-1]["warnings"]
    return doc


def vehicle_view(session: Session, registration: str, *, recent: int = 5) -> dict:
    """One vehicle: type, current empty state, last weighing, change since, warnings, items
    installed by the ledger, configurations, and its ``recent`` newest entries."""
    from ledger.store.catalog import get_vehicle
    from ledger.store.configs import list_configurations

    vehicle = get_vehicle(session, registration)
    title = session.scalar(select(VehicleTypeRow.name)
                           .where(VehicleTypeRow.id == vehicle.type_id))
    hist = history_view(session, registration)
    info = type_info(session, vehicle.type_id)
    vt = info.vtype
    since = None
    if hist["current"] is not None:
        cur, base = hist["current"], hist["last_weighing"]
        dcg = cur["cg_x_m"] - base["cg_x_m"]
        since = {"delta_mass_kg": cur["empty_mass_kg"] - base["empty_mass_kg"],
                 "delta_cg_x_m": dcg,
                 "delta_percent_mac": dcg / vt.mac.length_m * 100.0 if vt.mac else None}
    return {
        "registration": vehicle.registration, "type": title, "type_title": vt.title,
        "type_revision": info.revision, "kind": vt.kind, "serial": vehicle.serial,
        "note": vehicle.note, "units": hist["units"], "mac": hist["mac"],
        "entries": hist["entries_total"], "empty": hist["current"],
        "last_weighing": hist["last_weighing"], "since_weighing": since,
        "warnings": hist["warnings"],
        "installed_items": [i.to_dict() for i in installed_items(session, registration)],
        "configurations": [{"name": c.name, "source": c.source, "description": c.description}
                           for c in list_configurations(session, registration=registration)],
        "recent_entries": hist["entries"][-recent:] if recent else [],
        "head_hash": hist["head_hash"],
    }


def entry_view(session: Session, entry: Entry) -> dict:
    """A just-recorded entry as one line of the running record, with the type's units."""
    from ledger.store.catalog import get_vehicle

    vehicle = get_vehicle(session, entry.registration)
    vt = type_info(session, vehicle.type_id).vtype
    prev = get_entry(session, entry.registration, entry.seq - 1) if entry.seq > 1 else None
    base = (entry if entry.baseline_seq == entry.seq
            else get_entry(session, entry.registration, entry.baseline_seq))
    return {"registration": entry.registration, "units": _units_doc(vt), "mac": _mac_doc(vt),
            "entry": _entry_line(vt, entry, prev, base)}
