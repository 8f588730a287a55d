"""Terminal rendering of road-vehicle weighings and axle-rule sets.

Renders the documents of :mod:`ledger.analysis.ground`: corner weights (``wbledger.corners/1``),
CG height by axle lift (``wbledger.cg-height/1``) and axle-group rule sets
(``wbledger.axle-rules/1``, with :data:`ledger.caution.GROUND_CAUTION`). Masses and
lengths are shown in the document's display units (the vehicle type's, or the units the user
typed), percentages to two decimals. At ``width=80`` no line is wider than 80 columns.
"""

from __future__ import annotations

import io
from collections.abc import Mapping
from typing import TYPE_CHECKING, Any

from ledger.report.safe_text import clean
from ledger.units import fixed, to_unit

if TYPE_CHECKING:
    from ledger.analysis.ground_types import CgHeightDocument, CornersDocument, RuleSetDocument

__all__ = ["render_corners", "render_cg_height", "render_rule_list", "render_rule_set",
           "as_text", "simple_table"]

_MASS_DEC = {"kg": 1, "lb": 0, "g": 0, "t": 3, "slug": 2}
_LEN_DEC = {"m": 3, "mm": 0, "cm": 1, "in": 2, "ft": 3}


def _units(doc: Mapping[str, Any]) -> tuple[str, str]:
    u = doc.get("units") or {}
    return u.get("mass", "kg"), u.get("length", "m")


def _fx(v: float, d: int) -> str:
    text = f"{v:.{d}f}"
    return text.lstrip("-") if float(text) == 0.0 else text


def _mass(kg: float, unit: str) -> str:
    return f"{_fx(to_unit(kg, unit), _MASS_DEC.get(unit, 1))} {unit}"


def _len(m: float, unit: str) -> str:
    return f"{_fx(to_unit(m, unit), _LEN_DEC.get(unit, 3))} {unit}"


def _short(m: float, unit: str) -> str:
    """A rule's length as written in regulations: 40 in, 36 ft (no trailing zeros)."""
    return f"{round(to_unit(m, unit), 6):g} {unit}"


def _console(console, width):
    from ledger.report.safe_text import text_console

    return console if console is not None else text_console(width=width)


def simple_table(headers, rows, numeric=()):
    """A plain rich table: bold header, one rule under it, numeric columns right-aligned."""
    from rich import box
    from rich.table import Table

    t = Table(box=box.SIMPLE_HEAD, show_edge=False, pad_edge=False, padding=(0, 1),
              header_style="bold")
    for i, h in enumerate(headers):
        t.add_column(h, justify="right" if i in numeric else "left", overflow="fold")
    for r in rows:
        t.add_row(*r)
    return t


def _kv(rows):
    from rich.table import Table

    t = Table.grid(padding=(0, 2))
    t.add_column(style="bold", no_wrap=True)
    t.add_column(overflow="fold")
    for r in rows:
        t.add_row(*r)
    return t


def _title(console, text: str, w: int) -> None:
    from rich.rule import Rule
    from rich.text import Text

    console.print(Rule(Text(f" {text} ", style="bold"), align="left", characters="\u2500"),
                  width=w)


def _vehicle_line(doc: Mapping[str, Any]) -> str | None:
    v = doc.get("vehicle")
    if not v:
        return None
    return " ".join(x for x in (v.get("registration"), f"({v['type']})" if v.get("type")
                                else None) if x)


def render_corners(doc: CornersDocument, console: Any = None, width: int = 80) -> None:
    """Print a ``wbledger.corners/1`` document."""
    from rich.text import Text

    doc = clean(doc)
    console = _console(console, width)
    w = max(60, min(width, console.width))
    mu, lu = _units(doc)
    who = _vehicle_line(doc)
    _title(console, "Corner weights" + (f": {who}" if who else ""), w)
    r = doc["readings_kg"]
    pct = {k: 100.0 * v / doc["total_kg"] for k, v in r.items()}
    console.print(simple_table(["", "left", "right", "axle"], [
        ["front", f"{_mass(r['LF'], mu)} ({pct['LF']:.2f} %)",
         f"{_mass(r['RF'], mu)} ({pct['RF']:.2f} %)", _mass(doc["front_kg"], mu)],
        ["rear", f"{_mass(r['LR'], mu)} ({pct['LR']:.2f} %)",
         f"{_mass(r['RR'], mu)} ({pct['RR']:.2f} %)", _mass(doc["rear_kg"], mu)],
        ["side", _mass(doc["left_kg"], mu), _mass(doc["right_kg"], mu),
         _mass(doc["total_kg"], mu)],
    ], numeric=(1, 2, 3)), width=w)
    p = doc["percent"]
    d = doc["diagonals_percent"]
    g = doc["geometry_m"]
    rows = [["total", _mass(doc["total_kg"], mu)],
            ["left / right", f"{p['left']:.2f} % / {p['right']:.2f} %"],
            ["front / rear", f"{p['front']:.2f} % / {p['rear']:.2f} %"],
            ["diagonal RF+LR", f"{d['RF+LR']:.2f} %"],
            ["diagonal LF+RR", f"{d['LF+RR']:.2f} %"],
            ["CG x (datum)", _len(doc["cg_m"]["x"], lu) +
             f", {_len(doc['cg_x_behind_front_axle_m'], lu)} behind the front axle"],
            ["CG y", _len(doc["cg_m"]["y"], lu) + " (+ right of the centreline)"],
            ["wheelbase", _len(g["wheelbase_m"], lu)],
            ["track front / rear", f"{_len(g['track_front_m'], lu)} / "
                                   f"{_len(g['track_rear_m'], lu)}"]]
    console.print(_kv(rows), width=w)
    console.print(Text(doc["diagonal_note"], style="dim"), width=w, overflow="fold")
    src = doc.get("geometry_source") or {}
    given = [k.replace("_m", "").replace("_", " ") + f": {v}" for k, v in src.items() if v]
    if given:
        console.print(Text("Geometry from " + "; ".join(given), style="dim"), width=w,
                      overflow="fold")
    console.print(Text(doc["caution"], style="italic"), width=w, overflow="fold")


def render_cg_height(doc: CgHeightDocument, console: Any = None, width: int = 80) -> None:
    """Print a ``wbledger.cg-height/1`` document (and whether it was stored)."""
    from rich.text import Text

    doc = clean(doc)
    console = _console(console, width)
    w = max(60, min(width, console.width))
    mu, lu = _units(doc)
    who = _vehicle_line(doc)
    _title(console, "CG height by axle lift" + (f": {who}" if who else ""), w)
    g = doc["grounded_axle"]
    inp = doc["inputs"]
    rows = []
    for i, r in enumerate(doc["readings"], 1):
        rows.append([str(i), f"{r['angle_deg']:.2f}°", _mass(r[f"{g}_tilted_kg"], mu),
                     _mass(r["load_change_kg"], mu), _len(r["height_m"], lu)])
    console.print(simple_table(["", "angle", f"{g} axle", "change", "height"], rows,
                         numeric=(1, 2, 3, 4)), width=w)
    lines = [["CG height", _len(doc["height_m"], lu) + " above the ground"],
             ["residual (RMS)", _mass(doc["residual_rms_kg"], mu) + f" on the {g} axle"],
             ["spread of heights", _len(doc["height_spread_m"], lu)]]
    if doc.get("z_m") is not None:
        lines.append(["vertical arm z", _len(doc["z_m"], lu) + " in the type's datum (datum "
                      f"{_len(inp['datum_height_m'], lu)} above the ground)"])
    lines += [["weighed", f"{_mass(inp['total_kg'], mu)}; {g} axle level "
                          f"{_mass(inp[f'{g}_level_kg'], mu)}"],
              ["geometry", f"wheelbase {_len(inp['wheelbase_m'], lu)}, loaded wheel radius "
                           f"{_len(inp['wheel_radius_m'], lu)}; {doc['raised_axle']} axle "
                           f"raised"]]
    console.print(_kv(lines), width=w)
    console.print(Text(doc["method"], style="dim"), width=w, overflow="fold")
    console.print(Text("Assumes: " + "; ".join(doc["assumptions"]) + ".", style="dim"),
                  width=w, overflow="fold")
    stored = doc.get("stored")
    if stored:
        console.print(Text(f"Stored as ledger entry {stored['seq']} of "
                           f"{stored['registration']} (kind cg_height).", style="bold"),
                      width=w, overflow="fold")
    elif stored is False:
        console.print(Text("Not stored (--dry-run).", style="bold"), width=w)
    console.print(Text(doc["caution"], style="italic"), width=w, overflow="fold")


def render_rule_list(rows: list[dict], console=None, width: int = 80) -> None:
    """Print the rule sets found (``wbledger axle-rules list``)."""
    from rich.text import Text

    rows = clean(rows)
    console = _console(console, width)
    w = max(60, min(width, console.width))
    if not rows:
        console.print("No axle rule sets found.", width=w)
        return
    console.print(simple_table(["name", "title", "where"],
                         [[r["name"], r["title"], "built in" if r["builtin"] else r["path"]]
                          for r in rows]), width=w)
    from ledger.caution import GROUND_CAUTION

    console.print(Text(GROUND_CAUTION, style="italic"), width=w, overflow="fold")


def render_rule_set(doc: RuleSetDocument, console: Any = None, width: int = 80) -> None:
    """Print one rule set, with its bridge table if the document has one."""
    from rich.text import Text

    doc = clean(doc)
    console = _console(console, width)
    w = max(60, min(width, console.width))
    _title(console, f"Axle rules {doc['name']}: {doc['title']}", w)
    lim = doc["limits_kg"]
    de = doc["definitions_m"]
    def both(kg: float) -> str:
        return f"{_mass(kg, 'lb')} ({_mass(kg, 'kg')})"

    rows = [["applies to", doc["jurisdiction"]], ["source", doc["source"]],
            ["single axle", both(lim["single_axle"])], ["tandem", both(lim["tandem"])],
            ["gross", both(lim["gross"])],
            ["single axle means", f"axles within {_short(de['single_spread'], 'in')} "
                                  f"({_len(de['single_spread'], 'm')})"],
            ["tandem means", f"consecutive axles more than "
                             f"{_short(de['single_spread'], 'in')} and at most "
                             f"{_short(de['tandem_spread'], 'in')} apart"]]
    bf = doc["bridge_formula"]
    if bf["applies"]:
        rows.append(["bridge formula", bf["formula"]])
        if bf.get("two_tandem_exception_spread_m"):
            rows.append(["exception", "two consecutive tandems may carry the tandem limit "
                         f"each when their outer axles are at least "
                         f"{_short(bf['two_tandem_exception_spread_m'], 'ft')} apart"])
    if doc.get("note"):
        rows.append(["note", doc["note"]])
    rows.append(["file", doc["path"]])
    console.print(_kv(rows), width=w)
    tab = doc.get("bridge_table")
    if tab:
        headers = ["L ft"] + [f"{n} axles" for n in tab["axles"]]
        body = [[f"{r['length_ft']:g}"] + ["" if v is None else fixed(v, 0) for v in r["max_lb"]]
                for r in tab["rows"]]
        console.print(Text("Most a group of N consecutive axles may carry, lb (L between "
                           "the outer axles):", style="bold"), width=w, overflow="fold")
        console.print(simple_table(headers, body, numeric=tuple(range(1, len(headers)))),
                      width=w)
        console.print(Text(tab["note"] + "; blank: N axles do not fit, or the single-axle "
                           "limits govern.", style="dim"), width=w, overflow="fold")
    console.print(Text(doc["caution"], style="italic"), width=w, overflow="fold")


def as_text(render, doc, width: int = 80) -> str:
    """Run one of the renderers into plain text (tests, files)."""
    from rich.console import Console

    buf = io.StringIO()
    console = Console(file=buf, width=width, color_system=None, force_terminal=False,
                      highlight=False, legacy_windows=False, emoji=False)
    render(doc, console=console, width=width)
    return "".join(line.rstrip() + "\n" for line in buf.getvalue().splitlines())
