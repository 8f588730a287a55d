"""The tables of a loading sheet, ready to lay out: load by station, stations, fuel, phases,
envelope margins and axles (:class:`TableData`, built from a :class:`~ledger.report.sheet_view.
SheetView`). The terminal and the printed sheet lay out the same tables.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING

from ledger.report.sheet_format import number

if TYPE_CHECKING:
    from ledger.report.sheet_view import SheetView

__all__ = ["TableData", "items_table", "stations_table", "fuel_table", "phases_table",
           "margins_table", "axles_table"]

_DENSITY_MARKS = {"given": "g", "type": "f", "temperature": "t"}


@dataclass
class TableData:
    """A table ready to lay out: a title, column headers, rows of text, numeric columns."""

    title: str
    headers: list[str]
    rows: list[list[str]]
    numeric: set[int] = field(default_factory=set)
    notes: list[str] = field(default_factory=list)
    bold_rows: set[int] = field(default_factory=set)




def items_table(view: SheetView) -> TableData:
    d = view.doc
    items = d.get("items") or []
    conf = d.get("configuration") or {}
    conf_items = conf.get("items") or []
    lateral = any(number(i.get("y_m")) not in (None, 0.0) for i in items + conf_items)
    lu, mu = view.length_unit, view.mass_unit
    headers = ["Station", "Load", f"Mass\n{mu}", f"Arm\n{lu}"]
    if lateral:
        headers.append(f"Lateral\n{lu}")
    headers += [view.moment_header, f"Max\n{mu}"]
    numeric = set(range(2, len(headers)))
    rows: list[list[str]] = []
    ew = d.get("empty_weight") or {}
    cg = ew.get("cg_m") or {}
    ew_mass, ew_x = number(ew.get("mass_kg")), number(cg.get("x"))
    row = ["empty weight", f"entry #{ew.get('entry_seq', '?')}", view.mass(ew_mass),
           view.length(ew_x)]
    if lateral:
        row.append(view.length(cg.get("y"), signed=True))
    row += [view.index(ew_mass * ew_x if ew_mass is not None and ew_x is not None
                       else None), ""]
    rows.append(row)
    # The configuration's items, so that the rows add up to the zero-fuel total.
    for it in conf_items:
        signed = number(it.get("signed_mass_kg"))
        removed = it.get("action") == "remove"
        row = [str(it.get("name") or "?"), "removed (config)" if removed else "config",
               view.mass(signed, signed=removed), view.length(it.get("x_m"))]
        if lateral:
            row.append(view.length(it.get("y_m"), signed=True))
        x = number(it.get("x_m"))
        row += [view.index(signed * x if signed is not None and x is not None else None), ""]
        rows.append(row)
    standard = False
    for it in items:
        src = it.get("mass_source") or "actual"
        mark = ""
        if src == "standard" or (src == view.standard_set and src != "actual"):
            mark, standard = "*", True
        row = [str(it.get("station") or "?"), str(it.get("label") or ""),
               view.mass(it.get("mass_kg")) + mark, view.length(it.get("x_m"))]
        if lateral:
            row.append(view.length(it.get("y_m"), signed=True))
        moment = it.get("moment_x_kgm")
        if moment is None and number(it.get("mass_kg")) is not None and \
                number(it.get("x_m")) is not None:
            moment = float(it["mass_kg"]) * float(it["x_m"])
        row += [view.index(moment),
                "" if it.get("max_mass_kg") is None else view.mass(it["max_mass_kg"])]
        rows.append(row)
    zf = view.phase("zero_fuel")
    bold = set()
    if zf:
        cgz = zf.get("cg_m") or {}
        mom = (zf.get("moment_kgm") or {}).get("x")
        row = ["zero-fuel", "total", view.mass(zf.get("mass_kg")), view.length(cgz.get("x"))]
        if lateral:
            row.append(view.length(cgz.get("y"), signed=True))
        row += [view.index(mom), ""]
        rows.append(row)
        bold.add(len(rows) - 1)
    notes = []
    if standard:
        sm = d.get("standard_masses") or {}
        notes.append(f"* standard mass ({sm.get('name') or 'standard set'})")
    return TableData("Load by station", headers, rows, numeric, notes, bold)


def stations_table(view: SheetView) -> TableData | None:
    """Station and compartment limits (``stations``): only those with a limit."""
    rows_in = [st for st in view.doc.get("stations") or []
               if st.get("max_mass_kg") is not None
               or st.get("floor_load_limit_kg_m2") is not None]
    if not rows_in:
        return None
    mu = view.mass_unit
    area = f"{mu}/{view.length_unit}2"
    floor = any(st.get("floor_load_limit_kg_m2") is not None for st in rows_in)
    headers = ["Station", "Kind", f"Load\n{mu}", f"Max\n{mu}", f"Margin\n{mu}"]
    if floor:
        headers += [f"Floor\n{area}", f"Limit\n{area}"]
    headers.append("Status")
    rows = []
    for st in rows_in:
        row = [str(st.get("station") or "?"), str(st.get("kind") or ""),
               view.mass(st.get("mass_kg")), view.mass(st.get("max_mass_kg")),
               view.mass(st.get("margin_kg"), signed=True)]
        if floor:
            row += [view.area_density(st.get("floor_loading_kg_m2")),
                    view.area_density(st.get("floor_load_limit_kg_m2"))]
        row.append("ok" if st.get("in_limits", True) else "OUT")
        rows.append(row)
    return TableData("Station limits", headers, rows, set(range(2, len(headers) - 1)))


def fuel_table(view: SheetView) -> TableData | None:
    fuel = view.doc.get("fuel") or []
    if not fuel:
        return None
    mu, vu = view.mass_unit, view.volume_unit
    start, end = ("Depart.", "Arrival") if view.is_ground else ("Ramp", "Landing")
    headers = ["Tank", "Fluid", f"Density\n{view.du.density_unit}", f"Usable\n{vu}",
               f"{start}\n{vu}", f"{start}\n{mu}", f"Taxi\n{mu}", f"Trip\n{mu}",
               f"{end}\n{mu}"]
    rows = []
    for f in fuel:
        cap, unus = number(f.get("capacity_m3")), number(f.get("unusable_m3")) or 0.0
        src = f.get("density_source")
        dens = view.density(f.get("density_kg_m3"))
        if src and src != "nominal":
            dens += " " + _DENSITY_MARKS.get(src, src[:1])
        rows.append([str(f.get("tank") or "?"), str(f.get("fluid") or ""), dens,
                     view.volume(None if cap is None else cap - unus),
                     view.volume(f.get("ramp_volume_m3")), view.mass(f.get("ramp_mass_kg")),
                     view.mass(f.get("taxi_mass_kg")), view.mass(f.get("trip_mass_kg")),
                     view.mass(f.get("landing_mass_kg"))])
    notes = []
    srcs = {f.get("density_source") for f in fuel}
    if "given" in srcs:
        notes.append("g: density given in the plan")
    if "type" in srcs:
        notes.append("f: density from the type file")
    if "temperature" in srcs:
        temps = [f"{f['tank']} {f['temperature_c']:.0f} \u00b0C" for f in fuel
                 if f.get("density_source") == "temperature"
                 and number(f.get("temperature_c")) is not None]
        notes.append("t: density corrected to the fuel temperature (ASTM D1250 table 54B)"
                     + (f": {', '.join(temps)}" if temps else ""))
    not_feeding = [str(f.get("tank")) for f in fuel if f.get("feeds") is False]
    if not_feeding:
        notes.append(f"Not burned on this trip: {', '.join(not_feeding)}")
    if srcs & {"nominal", None}:
        notes.append("unmarked density: nominal for the fluid")
    burn = view.doc.get("burn") or {}
    seq = burn.get("sequence")
    if seq:
        order = burn.get("order") or []
        text = f"Burn sequence: {seq}"
        if order and seq != "proportional":
            text += " (" + " \u2192 ".join(str(o) for o in order) + ")"
        notes.append(text)
    return TableData("Fuel", headers, rows, set(range(2, len(headers))), notes)


def phases_table(view: SheetView) -> TableData:
    phases = view.doc.get("phases") or []
    lateral = any(number((p.get("cg_m") or {}).get("y")) not in (None, 0.0) for p in phases)
    mac = any(number(p.get("percent_mac")) is not None for p in phases)
    mu, lu = view.mass_unit, view.length_unit
    headers = ["Phase", f"Mass\n{mu}", f"Max\n{mu}", f"Margin\n{mu}", f"CG\n{lu}"]
    if lateral:
        headers.append(f"Lateral\n{lu}")
    if mac:
        headers.append("%MAC")
    headers += [view.index_header, "Status"]
    rows = []
    for p in phases:
        cg = p.get("cg_m") or {}
        row = [view.phase_label(p), view.mass(p.get("mass_kg")),
               view.mass(p.get("mass_limit_kg")),
               view.mass(p.get("mass_margin_kg"), signed=True), view.length(cg.get("x"))]
        if lateral:
            row.append(view.length(cg.get("y"), signed=True))
        if mac:
            row.append(view.percent(p.get("percent_mac")))
        idx = p.get("moment_index")
        row.append(view.index_value(idx) if idx is not None else
                   view.index((p.get("moment_kgm") or {}).get("x")))
        row.append("ok" if p.get("in_limits") else "OUT")
        rows.append(row)
    notes = []
    if view.du.moment_divisor != 1:
        notes.append(f"Index: moment in {view.du.moment_unit} / "
                     f"{view.du.moment_divisor:g}")
    notes.append("Margin: maximum minus actual; negative is over the limit")
    return TableData("Phases", headers, rows, set(range(1, len(headers) - 1)), notes)


def margins_table(view: SheetView) -> TableData | None:
    phases = view.doc.get("phases") or []
    if not any(p.get("envelopes") for p in phases):
        return None
    lu, mu = view.length_unit, view.mass_unit
    has_mac = any(number(e.get("forward_margin_percent_mac")) is not None
                  for p in phases for e in p.get("envelopes") or [])
    headers = ["Phase", "Envelope", "In\nlimits", f"Fwd or\nleft\n{lu}",
               f"Aft or\nright\n{lu}"]
    if has_mac:
        headers += ["Fwd\n\n%MAC", "Aft\n\n%MAC"]
    headers.append(f"Room\nabove\n{mu}")
    rows = []
    for p in phases:
        for e in p.get("envelopes") or []:
            axis = e.get("axis") or "longitudinal"
            env = f"{e.get('name') or e.get('category') or '?'} {_axis_short(axis)}"
            over = view.over_mass_limit(p) is not None
            row = [view.phase_label(p), env, "yes" if e.get("inside") and not over else "NO",
                   view.length(e.get("forward_margin_m"), signed=True),
                   view.length(e.get("aft_margin_m"), signed=True)]
            if has_mac:
                row += [view.percent(e.get("forward_margin_percent_mac"), signed=True),
                        view.percent(e.get("aft_margin_percent_mac"), signed=True)]
            row.append(view.mass(_room_above(e, p), signed=True))
            rows.append(row)
    notes = ["Distance from the CG to each limit at the phase mass (lateral envelopes: "
             "left and right limits); room above: mass up to the envelope's top or the "
             "phase's mass limit, whichever is lower. Negative is outside or over."]
    return TableData("Envelope margins", headers, rows, set(range(3, len(headers))), notes)


def axles_table(view: SheetView) -> TableData | None:
    """Axle loads: per phase when the phases carry them, else the document's ``axles``."""
    per_phase = [(p, a) for p in view.doc.get("phases") or []
                 for a in (p.get("axles") or []) + (p.get("axle_groups") or [])]
    if not per_phase:
        per_phase = [(None, a) for a in view.doc.get("axles") or []]
    if not per_phase:
        return None
    mu = view.mass_unit
    with_phase = any(p is not None for p, _ in per_phase)
    headers = (["Phase"] if with_phase else []) + [
        "Axle", f"Load\n{mu}", f"Rating\n{mu}", f"Margin\n{mu}", f"Left\n{mu}",
        f"Right\n{mu}", "Status"]
    rows = []
    for p, a in per_phase:
        row = [view.phase_label(p)] if with_phase else []
        name = str(a.get("name") or "?")
        if "axles" in a:  # an axle group's row (issue 13 item 2): the sum over its axles
            name = f"{name} (group)"
        row += [name, view.mass(a.get("load_kg")),
                view.mass(a.get("rating_kg")), view.mass(a.get("margin_kg"), signed=True),
                view.mass(a.get("left_kg")), view.mass(a.get("right_kg")),
                "ok" if a.get("in_limits") else "OUT"]
        rows.append(row)
    off = 1 if with_phase else 0
    notes = ["Margin: rating minus load; negative is over the rating. A group's load is the "
             "sum over its axles"]
    rule_set = view.doc.get("axle_rule_set") or {}
    if rule_set.get("name"):
        src = f" ({rule_set['source']})" if rule_set.get("source") else ""
        notes.append(f"Axle-group rules: {rule_set['name']}{src}")
    notes += [f"Advisory: {r}" for r in view.axle_rules()]
    # The rule set's advisory is not repeated here: the sheet prints its ground caution, which
    # says the same, right below this table (issue 13 item 21).
    return TableData("Axles", headers, rows, set(range(1 + off, 6 + off)), notes)


def _room_above(env: dict, phase: dict) -> float | None:
    """Mass that may still be added: to the envelope's top or the phase's mass limit, whichever
    is lower (negative when either is exceeded; issue 13 item 1)."""
    rooms = [r for r in (number(env.get("mass_margin_kg")), number(phase.get("mass_margin_kg")))
             if r is not None]
    return min(rooms) if rooms else None


def _axis_short(axis: str) -> str:
    return {"longitudinal": "long.", "lateral": "lat."}.get(axis, axis)
