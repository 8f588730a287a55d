"""Terminal rendering of the ledger: the fleet, one vehicle, a vehicle's running record, a
recorded entry, chain verification and configurations.

Input is the JSON-able documents of :mod:`ledger.store.views` (SI values with unit keys and the
type's display units); output is text readable at 80 columns, in the type's display units.
Negligible changes (AC 43.13-1B §10-2c) are marked ``n`` and entries beyond the type's reweigh
tolerance ``!``.
"""

from __future__ import annotations

from ledger.caution import CAUTION_SHORT
from ledger.report.safe_text import clean, text_console
from ledger.units import display_decimals, to_unit
from ledger.units.display import counted

__all__ = [
    "render_fleet",
    "render_vehicle",
    "render_history",
    "render_entry",
    "render_verify",
    "render_configurations",
    "render_configuration",
    "render_import",
    "fmt_mass",
    "fmt_length",
]

KIND_WORDS = {"weighing": "weighing", "install": "install", "remove": "remove",
              "correction": "correction", "cg_height": "CG height"}


def _num(value: float, digits: int, signed: bool = False) -> str:
    text = f"{value:+.{digits}f}" if signed else f"{value:.{digits}f}"
    if float(text) == 0.0:  # no "-0.0" and no "+0.0"
        text = f"{0.0:.{digits}f}"
    return text


def fmt_mass(kg: float | None, unit: str, *, signed: bool = False, unit_label: bool = True,
             scale: float | None = None) -> str:
    """A mass in ``unit`` with the unit's usual decimals ("1771.0 lb"), more for a small
    vehicle: ``scale`` is the vehicle's empty mass, kg (see :func:`ledger.units.display_decimals`).
    """
    if kg is None:
        return "-"
    text = _num(to_unit(kg, unit), display_decimals(unit, scale), signed)
    return f"{text} {unit}" if unit_label else text


def fmt_length(m: float | None, unit: str, *, signed: bool = False,
               unit_label: bool = True) -> str:
    """A length (arm, CG) in ``unit`` to 0.1 mm or 0.01 in ("42.99 in")."""
    if m is None:
        return "-"
    text = _num(to_unit(m, unit), display_decimals(unit), signed)
    return f"{text} {unit}" if unit_label else text


def _index(kgm: float | None, units: dict, *, signed: bool = False) -> str:
    if kgm is None:
        return "-"
    value = to_unit(kgm, units["moment"]) / units["moment_divisor"]
    return _num(value, 3 if units["moment_divisor"] > 1 else 1, signed)


def _moment_label(units: dict) -> str:
    d = units["moment_divisor"]
    return units["moment"] + (f"/{d:g}" if d != 1 else "")


def _indent(text: str) -> str:
    return "\n".join("  " + t for t in text.splitlines())


def _pct(value: float | None) -> str:
    return "-" if value is None else f"{value:.2f}"


# --- fleet and vehicle ----------------------------------------------------------------------

def _not_verified(doc: dict) -> str:
    """The mark of a vehicle whose evidence does not verify (``not_verified`` in its doc)."""
    reg = doc["registration"]
    return (f"{reg}: NOT VERIFIED: {doc['not_verified']}. No sheet or report is built on it; "
            f"see `wbledger verify {reg}`")


def render_fleet(rows: list[dict]) -> None:
    """The fleet list: one line per vehicle (``wbledger vehicle list``)."""
    rows = clean(rows)
    from rich import box
    from rich.table import Table

    con = text_console()
    if not rows:
        con.print("No vehicles yet. Add one with `wbledger vehicle add REG --type NAME`.")
        return
    table = Table(box=box.SIMPLE_HEAD, pad_edge=False, padding=(0, 1, 0, 0),
                  show_edge=False)
    for name, justify in (("Vehicle", "left"), ("Type", "left"), ("Empty mass", "right"),
                          ("CG", "right"), ("%MAC", "right"), ("Weighed", "left"),
                          ("Entries", "right")):
        table.add_column(name, justify=justify)
    warnings = []
    for r in rows:
        u = r["units"]
        e = r["empty"]
        flag = " !" if r["warnings"] or r.get("not_verified") else ""
        if e is None:
            table.add_row(r["registration"] + flag, r["type"], "-", "-", "-", "never",
                          str(r["entries"]))
        else:
            table.add_row(r["registration"] + flag, r["type"],
                          fmt_mass(e["empty_mass_kg"], u["mass"], scale=e["empty_mass_kg"]),
                          fmt_length(e["cg_x_m"], u["length"]), _pct(e["percent_mac"]),
                          r["last_weighed"], str(r["entries"]))
        if r.get("not_verified"):
            warnings.append(_not_verified(r))
        warnings += [f"{r['registration']}: {w['message']}" for w in r["warnings"]]
    con.print(table)
    for w in warnings:
        con.print(f"! {w}", overflow="fold")


def render_vehicle(d: dict) -> None:
    """One vehicle (``wbledger vehicle show``)."""
    d = clean(d)
    con = text_console()
    u = d["units"]
    con.print(f"{d['registration']}  type {d['type']} rev {d['type_revision']} "
              f"({d['type_title']})", overflow="fold")
    if d.get("not_verified"):
        con.print(_not_verified(d), overflow="fold")
    if d.get("serial"):
        con.print(f"Serial: {d['serial']}")
    if d.get("note"):
        con.print(f"Note: {d['note']}", overflow="fold")
    e = d["empty"]
    if e is None:
        con.print(f"No weighing recorded. Record one with `wbledger weigh {d['registration']}"
                  " --reading POINT=MASS …`.")
    else:
        con.print(_state_line(e, u, d["mac"]))
        w = d["last_weighing"]
        s = d["since_weighing"]
        dm = fmt_mass(s["delta_mass_kg"], u["mass"], signed=True, scale=e["empty_mass_kg"])
        since = (f"; since then {dm}, CG "
                 f"{fmt_length(s['delta_cg_x_m'], u['length'], signed=True)}"
                 + (f" ({s['delta_percent_mac']:+.2f} % MAC)"
                    if s["delta_percent_mac"] is not None else ""))
        con.print(f"Last weighing: entry {w['seq']} on {w['entry_date']}{since}",
                  overflow="fold")
        entries = counted(d["entries"], "entry", "entries")
        con.print(f"Ledger: {entries}, head hash {d['head_hash'][:16]}… "
                  "(`wbledger verify` checks it)", overflow="fold")
    for w in d["warnings"]:
        con.print(f"! {w['message']}", overflow="fold")
    items = d["installed_items"]
    if items:
        con.print("Installed by the ledger:")
        for it in items:
            scale = e["empty_mass_kg"] if e is not None else None
            con.print(f"  {it['name']}: {fmt_mass(it['mass_kg'], u['mass'], scale=scale)} at "
                      f"{fmt_length(it['x_m'], u['length'])} (entry {it['seq']}, "
                      f"{it['entry_date']})", overflow="fold")
    if d["configurations"]:
        con.print("Configurations: " + ", ".join(f"{c['name']} ({c['source']})"
                                                 for c in d["configurations"]),
                  overflow="fold")
    if d["recent_entries"]:
        con.print("Recent entries:")
        _history_table(con, d["recent_entries"], u, d["mac"] is not None)
    con.print(CAUTION_SHORT, overflow="fold")


def _state_line(e: dict, u: dict, mac: dict | None) -> str:
    """Two lines: empty mass, CG, %MAC and moment; then the lateral and vertical CG."""
    mass = fmt_mass(e["empty_mass_kg"], u["mass"], scale=e["empty_mass_kg"])
    text = f"Empty mass {mass}, CG {fmt_length(e['cg_x_m'], u['length'])}"
    if mac is not None and e.get("percent_mac") is not None:
        text += f" ({e['percent_mac']:.2f} % MAC)"
    text += f", moment {_index(e['mx_kgm'], u)} {_moment_label(u)}"
    text += f"\nLateral CG {fmt_length(e['cg_y_m'], u['length'])}, "
    text += (f"vertical CG {fmt_length(e['cg_z_m'], u['length'])}"
             if e.get("cg_z_m") is not None else "vertical CG not known")
    return text


# --- history --------------------------------------------------------------------------------

def _what(line: dict) -> str:
    kind = KIND_WORDS.get(line["kind"], line["kind"])
    text = kind
    if line.get("item"):
        text += f" {line['item']}"
    if line.get("reverses_seq"):
        text += f" (reverses {line['reverses_seq']})"
    if line["kind"] == "weighing":
        text += " (baseline)"
    return text


def _history_table(con, lines: list[dict], u: dict, has_mac: bool) -> None:
    from rich import box
    from rich.table import Table

    table = Table(box=box.SIMPLE_HEAD, pad_edge=False, padding=(0, 1, 0, 0),
                  show_edge=False)
    cols = [("#", "right"), ("Date", "left"), ("Entry", "left"),
            (f"Δ {u['mass']}", "right"), ("Δ mom", "right"), (u["mass"], "right"),
            ("Moment", "right"), (f"CG {u['length']}", "right")]
    if has_mac:
        cols.append(("%MAC", "right"))
    cols.append(("", "left"))
    for name, justify in cols:
        table.add_column(name, justify=justify,
                         overflow="fold" if name == "Entry" else "ellipsis",
                         no_wrap=name != "Entry", ratio=1 if name == "Entry" else None)
    notes = []
    for line in lines:
        a = line["after"]
        c = line["change"]
        flags = ("n" if line["negligible"] else "") + ("!" if line["warnings"] else "")
        # Who, why and the work order go under the table: in a column they would squeeze the
        # figures out of 80 columns.
        who = [f"by {line['actor']}"] + ([f"ref {line['reference']}"]
                                        if line.get("reference") else [])
        notes.append(f"  #{line['seq']} " + (f"{line['reason']}; " if line.get("reason") else "")
                     + ", ".join(who))
        row = [str(line["seq"]), line["entry_date"], _what(line),
               fmt_mass(c["mass_kg"], u["mass"], signed=True, unit_label=False,
                        scale=a["empty_mass_kg"]),
               _index(c["mx_kgm"], u, signed=True),
               fmt_mass(a["empty_mass_kg"], u["mass"], unit_label=False,
                        scale=a["empty_mass_kg"]),
               _index(a["mx_kgm"], u),
               fmt_length(a["cg_x_m"], u["length"], unit_label=False)]
        if has_mac:
            row.append(_pct(a["percent_mac"]))
        row.append(flags)
        table.add_row(*row)
    con.print(table)
    for note in notes:
        con.print(note, overflow="fold")


def render_history(doc: dict) -> None:
    """A vehicle's running record (``wbledger history``)."""
    doc = clean(doc)
    con = text_console()
    u = doc["units"]
    title = f"History of {doc['registration']} (type {doc['type']} rev {doc['type_revision']})"
    if doc["as_of"]:
        title += f" as of {doc['as_of']}"
    con.print(title, overflow="fold")
    if doc.get("not_verified"):
        con.print(_not_verified(doc), overflow="fold")
    if not doc["entries"]:
        for w in doc["warnings"]:
            con.print(w["message"].capitalize() + ".")
        return
    _history_table(con, doc["entries"], u, doc["mac"] is not None)
    con.print(f"Moment in {_moment_label(u)}. n: negligible change (AC 43.13-1B §10-2c); "
              "!: beyond the type's reweigh tolerance since the last weighing.",
              overflow="fold")
    cur = doc["current"]
    shown = len(doc["entries"])
    more = (f" (entries after {doc['as_of']} not shown: {doc['entries_total'] - shown})"
            if doc["as_of"] and doc["entries_total"] > shown else "")
    con.print(f"After entry {cur['seq']} ({cur['entry_date']}){more}:", overflow="fold")
    con.print(_indent(_state_line(cur, u, doc["mac"])), overflow="fold")
    for w in doc["warnings"]:
        con.print(f"! {w['message']}", overflow="fold")
    con.print(CAUTION_SHORT, overflow="fold")


def render_entry(doc: dict) -> None:
    """One entry just recorded (``weigh``, ``install``, ``remove``, ``correct``)."""
    doc = clean(doc)
    con = text_console()
    u = doc["units"]
    line = doc["entry"]
    con.print(f"Recorded entry {line['seq']} of {doc['registration']}: {_what(line)}",
              overflow="fold")
    c = line["change"]
    if line["kind"] != "weighing":
        scale = line["after"]["empty_mass_kg"]
        con.print(f"  Change: {fmt_mass(c['mass_kg'], u['mass'], signed=True, scale=scale)}, "
                  f"moment "
                  f"{_index(c['mx_kgm'], u, signed=True)} {_moment_label(u)}"
                  + (f"; negligible ({line['negligible_note']})" if line["negligible"]
                     else ""), overflow="fold")
    else:
        w = line.get("weighing") or {}
        aw = w.get("as_weighed") or {}
        if aw:
            mass = fmt_mass(aw["mass_kg"], u["mass"], scale=aw["mass_kg"])
            con.print(f"  As weighed: {mass}, CG "
                      f"{fmt_length(aw['mx_kgm'] / aw['mass_kg'], u['length'])}")
    con.print(_indent(_state_line(line["after"], u, doc["mac"])), overflow="fold")
    for w in line["warnings"]:
        con.print(f"! {w['message']}", overflow="fold")


def render_verify(doc: dict) -> None:
    """What ``wbledger verify`` found: each vehicle, then types and guards."""
    doc = clean(doc)
    con = text_console()
    if not doc["vehicles"] and not doc["types"]:
        con.print("No vehicles.")
    for r in doc["vehicles"]:
        if r["ok"]:
            sheets = f", {counted(r['sheets'], 'saved sheet')}" if r["sheets"] else ""
            entries = counted(r["entries"], "entry", "entries")
            con.print(f"{r['registration']}: {entries}{sheets}, chain verified")
            if r["head_hash"]:
                con.print(f"  head {r['head_hash']}")
            if r["sheets"]:
                con.print(f"  sheet head {r['sheet_head_hash']}")
        else:
            con.print(f"{r['registration']}: NOT VERIFIED: {r['problem']}", overflow="fold")
    for t in doc["types"]:
        if t["ok"]:
            con.print(f"type {t['type']}: {counted(t['revisions'], 'revision')}, verified",
                      overflow="fold")
        else:
            con.print(f"type {t['type']}: NOT VERIFIED: {t['problem']}", overflow="fold")
    for e in doc["expected"]:
        state = "found" if e["found"] else "NOT FOUND: rows were removed or replaced"
        con.print(f"expected {e['hash']}: {state}", overflow="fold")
    cp = doc.get("checkpoint")
    if cp is not None:
        state = ("matches" if not cp["problems"]
                 else f"DOES NOT MATCH: {'; '.join(cp['problems'])}")
        con.print(f"checkpoint {cp['file']} of {cp['created_at']}: {state}; signature: "
                  f"{cp['signature']}", overflow="fold")
        added = "; ".join(cp["added"]) or "nothing"
        con.print(f"  added since: {added}", overflow="fold")
    guards = doc["guards"]
    con.print("append-only guards: in place" if guards["ok"]
              else f"append-only guards: NOT IN PLACE: {guards['problem']}", overflow="fold")


def render_import(d: dict) -> None:
    d = clean(d)
    con = text_console()
    if d["imported"] == 0:
        con.print(f"Nothing to import into {d['registration']}: the file has no entries.")
        return
    con.print(f"Imported {d['imported']} entries into {d['registration']} (entries "
              f"{d['first_seq']} to {d['last_seq']}); head {d['head_hash']}", overflow="fold")


# --- configurations -------------------------------------------------------------------------

def _item_text(it: dict, units: dict | None) -> str:
    sign = "+" if it["action"] == "install" else "-"
    if it["mass_kg"] is None:
        return f"{sign} {it['name']} (mass and arms from the ledger)"
    if units is None:
        return (f"{sign} {it['name']}: {it['mass_kg']:.3f} kg at x {it['x_m']:.4f} m")
    return (f"{sign} {it['name']}: {fmt_mass(it['mass_kg'], units['mass'])} at "
            f"{fmt_length(it['x_m'], units['length'])}")


def render_configurations(rows: list[dict]) -> None:
    rows = clean(rows)
    con = text_console()
    if not rows:
        con.print("No configurations.")
        return
    for c in rows:
        n = len(c["items"])
        desc = f": {c['description']}" if c["description"] else ""
        con.print(f"{c['name']} ({c['source']} {c['owner']}, {n} item{'s' * (n != 1)}){desc}",
                  overflow="fold")


def render_configuration(c: dict) -> None:
    c = clean(c)
    con = text_console()
    u = c.get("units")
    con.print(f"Configuration {c['name']} ({c['source']} {c['owner']})", overflow="fold")
    if c["description"]:
        con.print(f"  {c['description']}", overflow="fold")
    for it in c["items"]:
        con.print("  " + _item_text(it, u), overflow="fold")
    if c["disables_stations"]:
        con.print("  Stations not available: " + ", ".join(c["disables_stations"]),
                  overflow="fold")
    if c["mass_change_kg"] is not None:
        change = (fmt_mass(c["mass_change_kg"], u["mass"], signed=True) if u
                  else f"{c['mass_change_kg']:+.3f} kg")
        con.print(f"  Change of empty mass: {change}")
