"""The loaded-inertia report: terminal (rich, 80 columns), CSV for simulation tools.

Everything is rendered from a ``wbledger.inertia/1`` document
(:func:`ledger.analysis.inertia.inertia_document`); ``--json`` prints that document as it is.
Figures are SI (kg, m, kg·m²) because that is what simulation tools read; the body axes and the
product sign convention are printed on the report, with the caution.

CSV columns
-----------
Both layouts use the same quantity names.

*long* (default): one row per quantity, columns ``quantity,value,unit,axes,note``.
*wide*: a header row of quantity names (with the unit in brackets, ``Ixx [kg*m2]``) and one
row of values.

========================  ========  ============================================================
quantity                  unit      meaning
========================  ========  ============================================================
registration, type        —         the vehicle
configuration, plan       —         the condition reported (empty text if none)
mass                      kg        total mass
cg_x, cg_y, cg_z          m         loaded CG in datum axes (x aft, y right, z up)
Ixx, Iyy, Izz             kg*m2     moments about the loaded CG, body axes (roll, pitch, yaw)
Ixy, Ixz, Iyz             kg*m2     products, body axes, positive-product convention Σ m·x·y
J_xx … J_zz (6)           kg*m2     the inertia tensor in body axes: J_xx = Ixx …, J_xy = −Ixy
I1, I2, I3                kg*m2     principal moments, ascending
e1_x … e3_z (9)           —         unit principal axes in body axes (e1 belongs to I1)
kx, ky, kz                m         radii of gyration √(I/M)
inclination               deg       ε = ½·atan2(2·Ixz, Izz − Ixx), principal x axis from x_b
                                    toward z_b (positive nose-down)
empty_inertia_source      —         ``measured`` or ``estimate`` (radii of gyration)
========================  ========  ============================================================

Body axes: x forward, y right, z down, origin at the loaded CG.
"""

from __future__ import annotations

import csv
import io
import math
from pathlib import Path
from typing import TYPE_CHECKING, Any

from ledger.files import write_output
from ledger.report.ground import simple_table as table
from ledger.report.safe_text import clean, text_console

if TYPE_CHECKING:
    from ledger.analysis.inertia_types import InertiaDocument

__all__ = ["CSV_LAYOUTS", "csv_quantities", "inertia_csv", "write_inertia_csv",
           "render_inertia", "inertia_text"]

CSV_LAYOUTS = ("long", "wide")

_BODY = "body (x fwd, y right, z down) at loaded CG"
_DATUM = "datum (x aft, y right, z up)"


def csv_quantities(doc: InertiaDocument) -> list[tuple[str, object, str, str, str]]:
    """(quantity, value, unit, axes, note) rows of an inertia document, in CSV order.

    Examples
    --------
    >>> from ledger.analysis.inertia import MassItem, inertia_document
    >>> from ledger.typedata import MeasuredInertia
    >>> class T:
    ...     name, inertia, units = "demo", MeasuredInertia(2.0, 3.0, 4.0), None
    >>> rows = csv_quantities(inertia_document(T(), 10.0, (0.0, 0.0, 0.0)))
    >>> [r[:3] for r in rows if r[0] in ("mass", "Ixx", "J_xy")]
    [('mass', 10.0, 'kg'), ('Ixx', 2.0, 'kg*m2'), ('J_xy', 0.0, 'kg*m2')]
    """
    v = doc.get("vehicle") or {}
    c = doc.get("condition") or {}
    m = doc["moments_kgm2"]
    p = doc["products_kgm2"]
    t = doc["tensor_kgm2"]["rows"]
    rows: list[tuple[str, object, str, str, str]] = [
        ("registration", v.get("registration") or "", "", "", ""),
        ("type", v.get("type") or "", "", "", ""),
        ("configuration", c.get("configuration") or "", "", "", ""),
        ("plan", c.get("plan") or "", "", "", ""),
        ("mass", doc["mass_kg"], "kg", "", "total mass"),
    ]
    for a in ("x", "y", "z"):
        rows.append((f"cg_{a}", doc["cg_m"][a], "m", _DATUM, "loaded CG"))
    names = {"Ixx": "roll", "Iyy": "pitch", "Izz": "yaw"}
    for k in ("Ixx", "Iyy", "Izz"):
        rows.append((k, m[k], "kg*m2", _BODY, f"moment of inertia ({names[k]})"))
    for k in ("Ixy", "Ixz", "Iyz"):
        rows.append((k, p[k], "kg*m2", _BODY,
                     f"product, positive-product convention {k} = sum m*{k[1]}*{k[2]}"))
    labels = "xyz"
    for i, j in ((0, 0), (1, 1), (2, 2), (0, 1), (0, 2), (1, 2)):
        rows.append((f"J_{labels[i]}{labels[j]}", t[i][j], "kg*m2", _BODY,
                     "inertia tensor" + ("" if i == j else
                                         f"; = -I{labels[i]}{labels[j]}")))
    pr = doc["principal"]
    for n, mom in enumerate(pr["moments_kgm2"], 1):
        rows.append((f"I{n}", mom, "kg*m2", _BODY, "principal moment, ascending"))
    for n, a in enumerate(pr["axes"], 1):
        for comp, val in zip("xyz", a["axis_body"]):
            rows.append((f"e{n}_{comp}", val, "", _BODY, f"unit principal axis of I{n}"))
    for k in ("kx", "ky", "kz"):
        rows.append((k, doc["radii_of_gyration_m"][k], "m", _BODY, "radius of gyration"))
    rows.append(("inclination", doc["inclination"]["deg"], "deg", _BODY,
                 "principal x axis from x_b toward z_b (positive nose-down)"))
    ei = doc["empty_inertia"]
    rows.append(("empty_inertia_source", "estimate" if ei["estimate"] else "measured", "", "",
                 ei["source"]))
    return rows


def _fmt(value) -> str:
    if isinstance(value, float):
        return repr(value) if math.isfinite(value) else ""
    return str(value)


def inertia_csv(doc: InertiaDocument, layout: str = "long") -> str:
    """The CSV text of an inertia document (see the module notes for the columns).

    Examples
    --------
    >>> from ledger.analysis.inertia import inertia_document
    >>> from ledger.typedata import MeasuredInertia
    >>> class T:
    ...     name, inertia, units = "demo", MeasuredInertia(2.0, 3.0, 4.0), None
    >>> text = inertia_csv(inertia_document(T(), 10.0, (0.0, 0.0, 0.0)), "wide")
    >>> text.splitlines()[0].split(",")[4:6]
    ['mass [kg]', 'cg_x [m]']
    """
    if layout not in CSV_LAYOUTS:
        from ledger.errors import InputError

        raise InputError("--csv-layout", layout, "one of " + ", ".join(CSV_LAYOUTS))
    rows = csv_quantities(doc)
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    if layout == "long":
        w.writerow(["quantity", "value", "unit", "axes", "note"])
        for q, v, u, a, n in rows:
            w.writerow([q, _fmt(v), u, a, n])
    else:
        w.writerow([f"{q} [{u}]" if u else q for q, _, u, _, _ in rows])
        w.writerow([_fmt(v) for _, v, _, _, _ in rows])
    return buf.getvalue()


def write_inertia_csv(doc: InertiaDocument, path: str | Path, layout: str = "long") -> Path:
    """Write :func:`inertia_csv` to ``path`` (UTF-8, mode 0600, replaced in one step; see
    :mod:`ledger.files`); returns the path."""
    return write_output(path, inertia_csv(doc, layout), "--csv")


# --- terminal -------------------------------------------------------------------------------

def _g(v: float, digits: int = 5) -> str:
    """Significant-figure format without exponent for ordinary sizes."""
    if v == 0 or not math.isfinite(v):
        return "0" if v == 0 else "—"
    mag = math.floor(math.log10(abs(v)))
    if -4 <= mag < 9:
        decimals = max(0, digits - 1 - mag)
        text = f"{v:.{decimals}f}"
        if float(text) == 0.0:
            text = text.lstrip("-")
        return text
    return f"{v:.{digits - 1}e}"


_GROUP_SHORT = {"empty vehicle": "empty", "configuration": "config", "equipment": "equip."}


def _f(v: float, decimals: int) -> str:
    text = f"{v:.{decimals}f}"
    return text.lstrip("-") if float(text) == 0.0 else text


class _Screen:
    """Where the report prints: the console, its width, and a section heading."""

    def __init__(self, console: Any, width: int) -> None:
        self.console = console
        self.w = width

    def out(self, *a: Any, **kw: Any) -> None:
        kw.setdefault("width", self.w)
        self.console.print(*a, **kw)

    def section(self, title: str) -> None:
        from rich.rule import Rule
        from rich.text import Text

        self.console.print()
        self.console.print(Rule(Text(f" {title.upper()} ", style="bold"), align="left",
                                characters="\u2500"), width=self.w)


def render_inertia(doc: InertiaDocument, console: Any = None, width: int = 80) -> None:
    """Print an inertia document in the terminal, at most ``width`` (≥ 60) columns wide."""
    from rich import box
    from rich.panel import Panel
    from rich.text import Text

    doc = clean(doc)
    if console is None:
        console = text_console(width=width)
    screen = _Screen(console, max(60, min(width, console.width)))
    _heading(screen, doc)
    _mass_and_cg(screen, doc)
    _moments(screen, doc)
    _principal_axes(screen, doc)
    _contributions(screen, doc)
    _items(screen, doc)
    for wline in doc.get("warnings", []):
        screen.out(Text(f"Warning: {wline}", style="yellow"), overflow="fold")
    console.print()
    screen.out(Panel(Text(doc["caution"], style="bold"), box=box.HEAVY, border_style="yellow",
                     width=screen.w))


def _heading(screen: _Screen, doc: InertiaDocument) -> None:
    """The panel: vehicle, condition, empty weight, where the empty inertia comes from, axes."""
    from rich import box
    from rich.panel import Panel
    from rich.table import Table
    from rich.text import Text

    v: Any = doc.get("vehicle") or {}
    c: Any = doc.get("condition") or {}
    ei = doc["empty_inertia"]
    head = Table.grid(padding=(0, 2))
    head.add_column(style="bold", no_wrap=True)
    head.add_column(overflow="fold")
    who = " ".join(x for x in (v.get("registration"), f"({v['type']})" if v.get("type") else
                               None) if x)
    head.add_row("Vehicle", who or "—")
    head.add_row("Condition", ", ".join(x for x in (
        f"configuration {c['configuration']}" if c.get("configuration") else "as in the ledger",
        f"plan {c['plan']}" if c.get("plan") else None,
        f"{c['phase']} fuel" if c.get("phase") else None) if x))
    if c.get("empty_entry_seq") is not None:
        head.add_row("Empty weight", f"ledger entry {c['empty_entry_seq']}"
                     + (f" of {c['empty_entry_date']}" if c.get("empty_entry_date") else ""))
    src = Text("ESTIMATE" if ei["estimate"] else "measured",
               style="bold yellow" if ei["estimate"] else "")
    src.append(f" — {ei['source']}", style="")
    head.add_row("Empty inertia", src)
    head.add_row("Axes", doc["axes"]["statement"])
    head.add_row("Products", doc["axes"]["products"])
    screen.out(Panel(head, title=Text("Loaded inertia", style="bold"), title_align="left",
                     box=box.HEAVY, width=screen.w))


def _mass_and_cg(screen: _Screen, doc: InertiaDocument) -> None:
    screen.section("Mass and CG")
    cg = doc["cg_m"]
    screen.out(table(["", "value", "unit", "axes"],
                     [["mass", _g(doc["mass_kg"], 6), "kg", ""],
                      ["CG x", _f(cg["x"], 4), "m", "datum, + aft"],
                      ["CG y", _f(cg["y"], 4), "m", "datum, + right"],
                      ["CG z", _f(cg["z"], 4), "m", "datum, + up"]], numeric=(1,)))


def _moments(screen: _Screen, doc: InertiaDocument) -> None:
    """Moments, products and radii of gyration, then the tensor."""
    from rich.text import Text

    screen.section("Moments and products (body axes, about the loaded CG)")
    m = doc["moments_kgm2"]
    p = doc["products_kgm2"]
    k = doc["radii_of_gyration_m"]
    screen.out(table(["", "kg·m²", "", "k (m)"],
                     [["Ixx roll", _g(m["Ixx"]), "", _g(k["kx"], 4)],
                      ["Iyy pitch", _g(m["Iyy"]), "", _g(k["ky"], 4)],
                      ["Izz yaw", _g(m["Izz"]), "", _g(k["kz"], 4)],
                      ["Ixy = Σm·x·y", _g(p["Ixy"]), "product", ""],
                      ["Ixz = Σm·x·z", _g(p["Ixz"]), "product", ""],
                      ["Iyz = Σm·y·z", _g(p["Iyz"]), "product", ""]], numeric=(1, 3)))
    t = doc["tensor_kgm2"]["rows"]
    screen.out(Text("Inertia tensor (kg·m², body axes; off-diagonal = −product):"),
               overflow="fold")
    screen.out(table(["", "x", "y", "z"],
                     [[a] + [_g(val) for val in row] for a, row in zip("xyz", t)],
                     numeric=(1, 2, 3)))


def _principal_axes(screen: _Screen, doc: InertiaDocument) -> None:
    from rich.text import Text

    screen.section("Principal axes (body axes)")
    rows = []
    for n, a in enumerate(doc["principal"]["axes"], 1):
        rows.append([f"I{n}", _g(a["moment_kgm2"])] + [f"{x:+.4f}" for x in a["axis_body"]])
    screen.out(table(["", "kg·m²", "axis x", "axis y", "axis z"], rows, numeric=(1, 2, 3, 4)))
    inc = doc["inclination"]
    screen.out(Text(f"Inclination of the principal x axis: ε = {_f(inc['deg'], 2)}° "
                    "(from x_b toward z_b; positive nose-down)."), overflow="fold")


def _contributions(screen: _Screen, doc: InertiaDocument) -> None:
    """The five largest shares of each moment."""
    from rich.text import Text

    screen.section("Largest contributions")
    groups = doc["ranking"]
    for name, label in (("Ixx", "Ixx roll"), ("Iyy", "Iyy pitch"), ("Izz", "Izz yaw")):
        top = groups[name][:5]
        rows = [[r["item"], _g(r["kgm2"]),
                 "" if r["percent"] is None else f"{r['percent']:.1f} %"] for r in top]
        screen.out(table([label, "kg·m²", "share"], rows, numeric=(1, 2)))
    screen.out(Text("Each item's share is its own inertia plus its parallel-axis part about "
                    "the loaded CG; the shares add up to the total.", style="dim"),
               overflow="fold")


def _items(screen: _Screen, doc: InertiaDocument) -> None:
    """Every item with its arms and where its own inertia comes from; then the shapes."""
    from rich.table import Table
    from rich.text import Text

    screen.section(f"Items ({len(doc['items'])})")
    rows, shaped = [], []
    for it in doc["items"]:
        z = _f(it["z_m"], 3) + ("*" if it.get("z_assumed") else "")
        own = it.get("own_inertia") or "point mass"
        if own == "shape":
            shaped.append(it)
        rows.append([it["name"], _GROUP_SHORT.get(it["group"], it["group"]),
                     _g(it["mass_kg"], 4), _f(it["x_m"], 3), _f(it["y_m"], 3), z,
                     {"point mass": "point"}.get(own, own)])
    screen.out(table(["item", "group", "kg", "x m", "y m", "z m", "own"], rows,
                     numeric=(2, 3, 4, 5)))
    screen.out(Text("Arms in datum axes (x aft, y right, z up). own: where the item's own "
                    "inertia about its CG comes from (point: none).", style="dim"),
               overflow="fold")
    if shaped:
        screen.out(Text("Shapes (dimensions in m; box length along x, width y, height z):"),
                   overflow="fold")
        grid = Table.grid(padding=(0, 1))
        grid.add_column(no_wrap=True)
        grid.add_column(overflow="fold")
        for it in shaped:
            grid.add_row(f"  {it['name']}:", it["shape_text"])
        screen.out(grid)
    if any(it.get("z_assumed") for it in doc["items"]):
        screen.out(Text("* vertical arm assumed (--assume-z)", style="dim"))


def inertia_text(doc: InertiaDocument, width: int = 80) -> str:
    """The terminal report as plain text (no colour), ``width`` columns wide."""
    from rich.console import Console

    buf = io.StringIO()
    console = Console(file=buf, width=width, color_system=None, force_terminal=False,
                      highlight=False, legacy_windows=False, emoji=False)
    render_inertia(doc, console=console, width=width)
    return "".join(line.rstrip() + "\n" for line in buf.getvalue().splitlines())
