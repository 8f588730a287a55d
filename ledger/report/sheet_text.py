"""The loading sheet in the terminal, rendered with rich from a ``wbledger.sheet/1`` document.

The document (docs/sheet-document.md) carries SI values and the display units to show them
in. :class:`SheetView` turns it into display-ready text once (headings, table rows, chart
data, verdict, caution) so that the terminal sheet here and the printed sheet in
:mod:`ledger.report.sheet_pdf` show the same content; the renderers only lay it out.

The layout is our own. From top to bottom:

1. a heading panel (vehicle, type and revision, empty-weight entry used, configuration,
   preparer and time, standard-mass set or "actual", display units) with a one-line verdict;
2. "Load by station": the empty weight, the configuration's items (a removed one with a
   negative mass), every item with mass, arm and moment, and the zero-fuel total they add up
   to;
3. "Fuel": per tank, and the burn sequence;
4. "Phases": mass against its limit, CG, %MAC, moment index; then "Envelope margins":
   per phase and envelope, the distance to the forward and aft (or left and right) limits;
5. one character chart per envelope: outline, phase CG points by letter, the burn path;
6. "Axles" for ground vehicles;
7. "Limits exceeded", "Ways to bring the load within limits", the verdict and the caution.

At ``width=80`` no line is wider than 80 columns.
"""

from __future__ import annotations

import io
import math
from dataclasses import dataclass, field
from datetime import datetime

from rich import box
from rich.console import Console, Group
from rich.panel import Panel
from rich.rule import Rule
from rich.table import Table
from rich.text import Text

from ledger.caution import CAUTION, GROUND_CAUTION
from ledger.report.textchart import PATH, envelope_chart
from ledger.units import DisplayUnits, display_decimals, nonzero_excess, to_unit

__all__ = ["ChartData", "SheetView", "TableData", "render_sheet", "sheet_text"]

DASH = "\u2014"

PHASE_TITLES = {"zero_fuel": "Zero-fuel", "ramp": "Ramp", "takeoff": "Take-off",
                "landing": "Landing", "departure": "Departure", "arrival": "Arrival"}
PHASE_MARKS = {"zero_fuel": "Z", "ramp": "R", "takeoff": "T", "landing": "L",
               "departure": "D", "arrival": "A"}
EXIT_MARK = "!"
AIRCRAFT_KINDS = ("airplane", "helicopter", "drone")

_VOLUME_DECIMALS = {"USgal": 1, "impgal": 1, "L": 1, "m3": 3, "ft3": 2, "in3": 0}
_DENSITY_MARKS = {"given": "g", "type": "f", "temperature": "t"}


def phase_title(name: str) -> str:
    """Display title of a phase name (``"takeoff"`` → ``"Take-off"``)."""
    return PHASE_TITLES.get(name, name.replace("_", " ").capitalize())


def _num(v) -> float | None:
    if v is None or isinstance(v, bool):
        return None
    try:
        f = float(v)
    except (TypeError, ValueError):
        return None
    return f if math.isfinite(f) else None


def _fixed(v: float, decimals: int, signed: bool = False) -> str:
    text = f"{v:+.{decimals}f}" if signed else f"{v:.{decimals}f}"
    if float(text) == 0.0:  # no "-0.0", and no sign on a zero
        text = text.lstrip("+-")
    return text


@dataclass
class TableData:
    """A table ready to lay out: a title, column headers, rows of text, numeric columns."""

    title: str
    headers: list[str]
    rows: list[list[str]]
    numeric: set[int] = field(default_factory=set)
    notes: list[str] = field(default_factory=list)
    bold_rows: set[int] = field(default_factory=set)


@dataclass
class ChartData:
    """One envelope chart in display units."""

    title: str
    x_label: str
    y_label: str
    polygon: list[tuple[float, float]]
    points: list[tuple[float, float, str]]
    path: list[tuple[float, float]]
    exits: list[tuple[float, float]]
    legend: list[str]
    """One line per phase point: mark, phase, mass, CG, inside or not."""
    axis: str = "longitudinal"
    exit_note: str | None = None
    """Where the burn path first leaves the envelope, if it does."""


class SheetView:
    """Display-ready content of a loading-sheet document (shared by every renderer).

    Parameters
    ----------
    doc : dict
        A ``wbledger.sheet/1`` document (docs/sheet-document.md).
    """

    def __init__(self, doc: dict):
        self.doc = doc
        u = doc.get("units") or {}
        divisor = u.get("moment_reduction", u.get("moment_divisor", 1)) or 1
        self.du = DisplayUnits(u.get("mass", "kg"), u.get("length", "m"),
                               u.get("volume", "L"), float(divisor))
        self.mass_unit = self.du.mass
        self.length_unit = self.du.length
        self.volume_unit = self.du.volume
        empty = _num((doc.get("empty_weight") or {}).get("mass_kg"))
        self._md = display_decimals(self.mass_unit, empty)
        self._ld = display_decimals(self.length_unit)
        self._vd = _VOLUME_DECIMALS.get(self.volume_unit, 1)
        biggest = max([abs(_num(p.get("moment_index")) or 0.0)
                       for p in doc.get("phases") or []] + [0.0])
        self._id = 2 if biggest < 1000 else 1 if biggest < 100000 else 0
        vehicle = doc.get("vehicle") or {}
        self.kind = vehicle.get("kind") or ""
        self.is_ground = bool(doc.get("axles")) or self.kind == "ground_vehicle"
        self._set_name = (doc.get("standard_masses") or {}).get("name")
        self.ok = doc.get("verdict") == "in_limits"

    # --- number formatting --------------------------------------------------------------
    def mass(self, kg, signed: bool = False) -> str:
        """A mass in the display unit, without the unit (the column header carries it)."""
        v = _num(kg)
        return DASH if v is None else _fixed(to_unit(v, self.mass_unit), self._md, signed)

    def length(self, m, signed: bool = False) -> str:
        """An arm or distance in the display unit, without the unit."""
        v = _num(m)
        return DASH if v is None else _fixed(to_unit(v, self.length_unit), self._ld, signed)

    def volume(self, m3) -> str:
        """A volume in the display unit, without the unit."""
        v = _num(m3)
        return DASH if v is None else _fixed(to_unit(v, self.volume_unit), self._vd)

    def density(self, kg_m3) -> str:
        """A density in display mass per display volume, without the unit."""
        v = _num(kg_m3)
        if v is None:
            return DASH
        d = to_unit(v, self.du.density_unit)
        return _fixed(d, 3 if abs(d) < 10 else 1 if abs(d) < 1000 else 0)

    def index(self, moment_kgm) -> str:
        """A moment as a moment index (display moment ÷ reduction factor)."""
        v = _num(moment_kgm)
        return DASH if v is None else _fixed(self.du.moment_index(v), self._id)

    def index_value(self, value) -> str:
        """A moment index already reduced (as the document's ``moment_index``)."""
        v = _num(value)
        return DASH if v is None else _fixed(v, self._id)

    @staticmethod
    def percent(value, signed: bool = False) -> str:
        """A percentage (of MAC), one decimal."""
        v = _num(value)
        return DASH if v is None else _fixed(v, 1, signed)

    def with_unit(self, text: str, unit: str) -> str:
        return text if text == DASH else f"{text} {unit}"

    @property
    def moment_header(self) -> str:
        d = self.du.moment_divisor
        unit = self.du.moment_unit
        return f"Moment\n{unit}" if d == 1 else f"Moment\n{unit}/{d:g}"

    @property
    def index_header(self) -> str:
        d = self.du.moment_divisor
        return "Moment" if d == 1 else "Index"

    def quantity(self, value, unit: str | None) -> str:
        """A violation amount: SI with its unit name → display text with the display unit."""
        v = _num(value)
        if v is None:
            return DASH
        if unit in ("kg", None):
            return f"{self.mass(v)} {self.mass_unit}"
        if unit == "m":
            return f"{self.length(v)} {self.length_unit}"
        if unit == "m3":
            return f"{self.volume(v)} {self.volume_unit}"
        if unit in ("kgm", "kg*m", "kg_m"):
            d = self.du.moment_divisor
            return f"{self.index(v)} {self.du.moment_unit}" + (f"/{d:g}" if d != 1 else "")
        if unit in ("kg/m2", "kg_m2"):
            return f"{self.area_density(v)} {self.mass_unit}/{self.length_unit}2"
        if unit in ("%MAC", "percent_mac", "%"):
            return f"{self.percent(v)} %MAC"
        return f"{v:g} {unit}"

    # --- sections --------------------------------------------------------------------------
    @property
    def title(self) -> str:
        reg = (self.doc.get("vehicle") or {}).get("registration") or "?"
        return f"LOADING SHEET  {reg}"

    @property
    def verdict_text(self) -> str:
        return "IN LIMITS" if self.ok else "OUT OF LIMITS"

    @property
    def verdict_detail(self) -> str:
        n = len(self.doc.get("violations") or [])
        if self.ok:
            what = "axle loads" if self.is_ground else "the fuel-burn path"
            return (f"Every phase, every station and {what} are within the limits "
                    "recorded for this type.")
        fixes = self.doc.get("fixes") or []
        tail = (f" {len(fixes)} way{'s' if len(fixes) != 1 else ''} to bring it within "
                "limits listed." if fixes else " No fix is listed: change the plan.")
        return (f"{n} limit{'s' if n != 1 else ''} exceeded: this loading must not be used "
                f"as planned.{tail}")

    @property
    def caution(self) -> str:
        return self.doc.get("caution") or CAUTION

    @property
    def ground_caution(self) -> str | None:
        if self.doc.get("ground_caution"):
            return self.doc["ground_caution"]
        return GROUND_CAUTION if self.is_ground else None

    @property
    def signature_roles(self) -> list[str]:
        third = "Driver" if self.is_ground else "Commander"
        return ["Prepared by", "Checked by", third]

    def anchors(self) -> list[tuple[str, str]]:
        """The hashes a paper copy keeps: the content hash of the type data it was checked
        against (as ``type import`` printed it), the ledger head it was built on, and the
        sheet's own hash (a saved sheet) — the last two for ``wbledger verify --expect``."""
        ew = self.doc.get("empty_weight") or {}
        sheet = self.doc.get("sheet") or {}
        vehicle = self.doc.get("vehicle") or {}
        return [("Type data", vehicle.get("type_sha256") or DASH),
                ("Ledger head", ew.get("entry_hash") or DASH),
                ("Sheet hash", sheet.get("sheet_hash") or "none: not saved (a draft)")]

    def heading(self) -> list[tuple[str, str]]:
        """(label, value) pairs for the heading block."""
        d = self.doc
        v = d.get("vehicle") or {}
        ew = d.get("empty_weight") or {}
        cg = ew.get("cg_m") or {}
        sheet = d.get("sheet") or {}
        prepared = d.get("prepared") or {}
        sm = d.get("standard_masses") or {}
        rows = []
        vehicle = v.get("registration") or "?"
        if v.get("title"):
            vehicle += f"  {v['title']}"
        rows.append(("Vehicle", vehicle))
        kind = (v.get("kind") or "").replace("_", " ")
        rows.append(("Type", f"{v.get('type') or '?'} revision {v.get('type_revision', '?')}"
                     + (f" ({kind})" if kind else "")))
        entry = f"ledger entry #{ew.get('entry_seq', '?')}"
        if ew.get("entry_date"):
            entry += f" of {ew['entry_date']}"
        cg_text = f"CG {self.length(cg.get('x'))} {self.length_unit}"
        if _num(cg.get("y")) not in (None, 0.0):
            cg_text += f", lateral {self.length(cg.get('y'), signed=True)} {self.length_unit}"
        rows.append(("Empty weight", f"{self.mass(ew.get('mass_kg'))} {self.mass_unit}, "
                     f"{cg_text} ({entry})"))
        conf = d.get("configuration") or {}
        if conf.get("name"):
            rows.append(("Configuration", conf["name"]))
        if d.get("category"):
            rows.append(("Category", str(d["category"])))
        if d.get("plan_source"):
            rows.append(("Plan", str(d["plan_source"])))
        who = prepared.get("by") or DASH
        when = _when(prepared.get("at"))
        rows.append(("Prepared", f"{who}, {when}" if when else who))
        name = sm.get("name") or "actual"
        desc = sm.get("description")
        rows.append(("Masses", f"{name}: {desc}" if desc and desc != name else name))
        rows.append(("Sheet", _sheet_state(sheet)))
        div = self.du.moment_divisor
        units = f"mass {self.mass_unit}, arm {self.length_unit}, volume {self.volume_unit}"
        units += f"; moment index = {self.du.moment_unit} / {div:g}" if div != 1 else \
            f"; moment {self.du.moment_unit}"
        rows.append(("Units", units))
        rows.append(("Verdict", self.verdict_text))
        return rows

    def items_table(self) -> TableData:
        d = self.doc
        items = d.get("items") or []
        conf = d.get("configuration") or {}
        conf_items = conf.get("items") or []
        lateral = any(_num(i.get("y_m")) not in (None, 0.0) for i in items + conf_items)
        lu, mu = self.length_unit, self.mass_unit
        headers = ["Station", "Load", f"Mass\n{mu}", f"Arm\n{lu}"]
        if lateral:
            headers.append(f"Lateral\n{lu}")
        headers += [self.moment_header, f"Max\n{mu}"]
        numeric = set(range(2, len(headers)))
        rows: list[list[str]] = []
        ew = d.get("empty_weight") or {}
        cg = ew.get("cg_m") or {}
        ew_mass, ew_x = _num(ew.get("mass_kg")), _num(cg.get("x"))
        row = ["empty weight", f"entry #{ew.get('entry_seq', '?')}", self.mass(ew_mass),
               self.length(ew_x)]
        if lateral:
            row.append(self.length(cg.get("y"), signed=True))
        row += [self.index(ew_mass * ew_x if ew_mass is not None and ew_x is not None
                           else None), ""]
        rows.append(row)
        # The configuration's items, so that the rows add up to the zero-fuel total.
        for it in conf_items:
            signed = _num(it.get("signed_mass_kg"))
            removed = it.get("action") == "remove"
            row = [str(it.get("name") or "?"), "removed (config)" if removed else "config",
                   self.mass(signed, signed=removed), self.length(it.get("x_m"))]
            if lateral:
                row.append(self.length(it.get("y_m"), signed=True))
            x = _num(it.get("x_m"))
            row += [self.index(signed * x if signed is not None and x is not None else None), ""]
            rows.append(row)
        standard = False
        for it in items:
            src = it.get("mass_source") or "actual"
            mark = ""
            if src == "standard" or (src == self._set_name and src != "actual"):
                mark, standard = "*", True
            row = [str(it.get("station") or "?"), str(it.get("label") or ""),
                   self.mass(it.get("mass_kg")) + mark, self.length(it.get("x_m"))]
            if lateral:
                row.append(self.length(it.get("y_m"), signed=True))
            moment = it.get("moment_x_kgm")
            if moment is None and _num(it.get("mass_kg")) is not None and \
                    _num(it.get("x_m")) is not None:
                moment = float(it["mass_kg"]) * float(it["x_m"])
            row += [self.index(moment),
                    "" if it.get("max_mass_kg") is None else self.mass(it["max_mass_kg"])]
            rows.append(row)
        zf = self.phase("zero_fuel")
        bold = set()
        if zf:
            cgz = zf.get("cg_m") or {}
            mom = (zf.get("moment_kgm") or {}).get("x")
            row = ["zero-fuel", "total", self.mass(zf.get("mass_kg")), self.length(cgz.get("x"))]
            if lateral:
                row.append(self.length(cgz.get("y"), signed=True))
            row += [self.index(mom), ""]
            rows.append(row)
            bold.add(len(rows) - 1)
        notes = []
        if standard:
            sm = d.get("standard_masses") or {}
            notes.append(f"* standard mass ({sm.get('name') or 'standard set'})")
        return TableData("Load by station", headers, rows, numeric, notes, bold)

    def fuel_table(self) -> TableData | None:
        fuel = self.doc.get("fuel") or []
        if not fuel:
            return None
        mu, vu = self.mass_unit, self.volume_unit
        start, end = ("Depart.", "Arrival") if self.is_ground else ("Ramp", "Landing")
        headers = ["Tank", "Fluid", f"Density\n{self.du.density_unit}", f"Usable\n{vu}",
                   f"{start}\n{vu}", f"{start}\n{mu}", f"Taxi\n{mu}", f"Trip\n{mu}",
                   f"{end}\n{mu}"]
        rows = []
        for f in fuel:
            cap, unus = _num(f.get("capacity_m3")), _num(f.get("unusable_m3")) or 0.0
            src = f.get("density_source")
            dens = self.density(f.get("density_kg_m3"))
            if src and src != "nominal":
                dens += " " + _DENSITY_MARKS.get(src, src[:1])
            rows.append([str(f.get("tank") or "?"), str(f.get("fluid") or ""), dens,
                         self.volume(None if cap is None else cap - unus),
                         self.volume(f.get("ramp_volume_m3")), self.mass(f.get("ramp_mass_kg")),
                         self.mass(f.get("taxi_mass_kg")), self.mass(f.get("trip_mass_kg")),
                         self.mass(f.get("landing_mass_kg"))])
        notes = []
        srcs = {f.get("density_source") for f in fuel}
        if "given" in srcs:
            notes.append("g: density given in the plan")
        if "type" in srcs:
            notes.append("f: density from the type file")
        if "temperature" in srcs:
            temps = [f"{f['tank']} {f['temperature_c']:.0f} \u00b0C" for f in fuel
                     if f.get("density_source") == "temperature"
                     and _num(f.get("temperature_c")) is not None]
            notes.append("t: density corrected to the fuel temperature (ASTM D1250 table 54B)"
                         + (f": {', '.join(temps)}" if temps else ""))
        not_feeding = [str(f.get("tank")) for f in fuel if f.get("feeds") is False]
        if not_feeding:
            notes.append(f"Not burned on this trip: {', '.join(not_feeding)}")
        if srcs & {"nominal", None}:
            notes.append("unmarked density: nominal for the fluid")
        burn = self.doc.get("burn") or {}
        seq = burn.get("sequence")
        if seq:
            order = burn.get("order") or []
            text = f"Burn sequence: {seq}"
            if order and seq != "proportional":
                text += " (" + " \u2192 ".join(str(o) for o in order) + ")"
            notes.append(text)
        return TableData("Fuel", headers, rows, set(range(2, len(headers))), notes)

    def phase(self, name: str) -> dict | None:
        for p in self.doc.get("phases") or []:
            if p.get("name") == name:
                return p
        return None

    def phases_table(self) -> TableData:
        phases = self.doc.get("phases") or []
        lateral = any(_num((p.get("cg_m") or {}).get("y")) not in (None, 0.0) for p in phases)
        mac = any(_num(p.get("percent_mac")) is not None for p in phases)
        mu, lu = self.mass_unit, self.length_unit
        headers = ["Phase", f"Mass\n{mu}", f"Max\n{mu}", f"Margin\n{mu}", f"CG\n{lu}"]
        if lateral:
            headers.append(f"Lateral\n{lu}")
        if mac:
            headers.append("%MAC")
        headers += [self.index_header, "Status"]
        rows = []
        for p in phases:
            cg = p.get("cg_m") or {}
            row = [self.phase_label(p), self.mass(p.get("mass_kg")),
                   self.mass(p.get("mass_limit_kg")),
                   self.mass(p.get("mass_margin_kg"), signed=True), self.length(cg.get("x"))]
            if lateral:
                row.append(self.length(cg.get("y"), signed=True))
            if mac:
                row.append(self.percent(p.get("percent_mac")))
            idx = p.get("moment_index")
            row.append(self.index_value(idx) if idx is not None else
                       self.index((p.get("moment_kgm") or {}).get("x")))
            row.append("ok" if p.get("in_limits") else "OUT")
            rows.append(row)
        notes = []
        if self.du.moment_divisor != 1:
            notes.append(f"Index: moment in {self.du.moment_unit} / "
                         f"{self.du.moment_divisor:g}")
        notes.append("Margin: maximum minus actual; negative is over the limit")
        return TableData("Phases", headers, rows, set(range(1, len(headers) - 1)), notes)

    def margins_table(self) -> TableData | None:
        phases = self.doc.get("phases") or []
        if not any(p.get("envelopes") for p in phases):
            return None
        lu, mu = self.length_unit, self.mass_unit
        has_mac = any(_num(e.get("forward_margin_percent_mac")) is not None
                      for p in phases for e in p.get("envelopes") or [])
        headers = ["Phase", "Envelope", "Inside", f"Fwd or\nleft\n{lu}",
                   f"Aft or\nright\n{lu}"]
        if has_mac:
            headers += ["Fwd\n\n%MAC", "Aft\n\n%MAC"]
        headers.append(f"Room\nabove\n{mu}")
        rows = []
        for p in phases:
            for e in p.get("envelopes") or []:
                axis = e.get("axis") or "longitudinal"
                env = f"{e.get('name') or e.get('category') or '?'} {_axis_short(axis)}"
                row = [self.phase_label(p), env, "yes" if e.get("inside") else "NO",
                       self.length(e.get("forward_margin_m"), signed=True),
                       self.length(e.get("aft_margin_m"), signed=True)]
                if has_mac:
                    row += [self.percent(e.get("forward_margin_percent_mac"), signed=True),
                            self.percent(e.get("aft_margin_percent_mac"), signed=True)]
                row.append(self.mass(e.get("mass_margin_kg"), signed=True))
                rows.append(row)
        notes = ["Distance from the CG to each limit at the phase mass (lateral envelopes: "
                 "left and right limits); room above: mass up to the envelope's top. "
                 "Negative is outside."]
        return TableData("Envelope margins", headers, rows, set(range(3, len(headers))), notes)

    def charts(self) -> list[ChartData]:
        d = self.doc
        out = []
        phases = d.get("phases") or []
        bp = d.get("burn_path") or {}
        path_pts = bp.get("points") or []
        exits = {(e.get("name"), e.get("axis") or "longitudinal"): e.get("first_exit")
                 for e in bp.get("envelopes") or []}
        mu, lu = self.mass_unit, self.length_unit
        for poly in d.get("envelope_polygons") or []:
            axis = poly.get("axis") or "longitudinal"
            coords = poly.get("coordinates") or "arm"
            key = "y" if axis == "lateral" else "x"
            pkey = "cg_y_m" if axis == "lateral" else "cg_x_m"

            def xval(cg_m, mass_kg, moment_kgm=None, coords=coords):
                if coords == "moment":
                    if moment_kgm is None:
                        if cg_m is None or mass_kg is None:
                            return None
                        moment_kgm = cg_m * mass_kg
                    return self.du.moment_index(moment_kgm)
                return None if cg_m is None else to_unit(cg_m, lu)

            if coords == "moment":
                polygon = [(self.du.moment_index(float(x)), to_unit(float(m), mu))
                           for x, m in poly.get("points") or []]
            else:
                polygon = [(to_unit(float(x), lu), to_unit(float(m), mu))
                           for x, m in poly.get("points") or []]
            points, legend = [], []
            for p in phases:
                name = str(p.get("name"))
                mass = _num(p.get("mass_kg"))
                cg = _num((p.get("cg_m") or {}).get(key))
                mom = _num((p.get("moment_kgm") or {}).get(key))
                x = xval(cg, mass, mom)
                if x is None or mass is None:
                    continue
                mark = PHASE_MARKS.get(name, name[:1].upper() or "?")
                points.append((x, to_unit(mass, mu), mark))
                state = ", not an envelope phase" if not p.get("envelopes") and any(
                    q.get("envelopes") for q in phases) else ""
                for e in p.get("envelopes") or []:
                    if e.get("name") == poly.get("name") and \
                            (e.get("axis") or "longitudinal") == axis:
                        state = ", inside" if e.get("inside") else ", OUTSIDE"
                where = (f"index {self.index(mom if mom is not None else cg * mass)}"
                         if coords == "moment" else
                         f"{'lat. ' if axis == 'lateral' else ''}CG "
                         f"{self.length(cg, signed=axis == 'lateral')} {lu}")
                legend.append(f"{mark} {self.phase_label(p)}: {self.mass(mass)} {mu}, "
                              f"{where}{state}")
            path = []
            mkey = "moment_y_kgm" if axis == "lateral" else "moment_x_kgm"
            for q in path_pts:
                m, c = _num(q.get("mass_kg")), _num(q.get(pkey))
                x = xval(c, m, _num(q.get(mkey)))
                if x is not None and m is not None:
                    path.append((x, to_unit(m, mu)))
            ex = []
            first = exits.get((poly.get("name"), axis))
            # Mark where the path leaves only if it starts inside: a take-off already
            # outside is its own violation, and "leaves" would mislead.
            start = self.phase(str(bp.get("from") or "takeoff")) or {}
            for e in start.get("envelopes") or []:
                if e.get("name") == poly.get("name") and \
                        (e.get("axis") or "longitudinal") == axis and not e.get("inside"):
                    first = None
            if first:
                m, c = _num(first.get("mass_kg")), _num(first.get(pkey))
                x = xval(c, m)
                if x is not None and m is not None:
                    ex.append((x, to_unit(m, mu)))
            exit_note = None
            if ex:
                exit_note = (f"the burn path leaves this envelope at "
                             f"{self.mass(first.get('mass_kg'))} {mu}")
            if coords == "moment":
                x_label = f"moment index ({self.du.moment_unit}" + (
                    f" / {self.du.moment_divisor:g})" if self.du.moment_divisor != 1 else ")")
            elif axis == "lateral":
                x_label = f"lateral CG ({lu}, + right)"
            else:
                x_label = f"CG arm ({lu} from datum, + aft)"
            name = poly.get("name") or poly.get("category") or "envelope"
            title = f"Envelope {name}, {axis}"
            out.append(ChartData(title, x_label, f"mass ({mu})", polygon, points, path, ex,
                                 legend, axis, exit_note))
        return out

    def axles_table(self) -> TableData | None:
        """Axle loads: per phase when the phases carry them, else the document's ``axles``."""
        per_phase = [(p, a) for p in self.doc.get("phases") or [] for a in p.get("axles") or []]
        if not per_phase:
            per_phase = [(None, a) for a in self.doc.get("axles") or []]
        if not per_phase:
            return None
        mu = self.mass_unit
        with_phase = any(p is not None for p, _ in per_phase)
        headers = (["Phase"] if with_phase else []) + [
            "Axle", f"Load\n{mu}", f"Rating\n{mu}", f"Margin\n{mu}", f"Left\n{mu}",
            f"Right\n{mu}", "Status"]
        rows = []
        for p, a in per_phase:
            row = [self.phase_label(p)] if with_phase else []
            row += [str(a.get("name") or "?"), self.mass(a.get("load_kg")),
                    self.mass(a.get("rating_kg")), self.mass(a.get("margin_kg"), signed=True),
                    self.mass(a.get("left_kg")), self.mass(a.get("right_kg")),
                    "ok" if a.get("in_limits") else "OUT"]
            rows.append(row)
        off = 1 if with_phase else 0
        notes = ["Margin: rating minus load; negative is over the rating"]
        rule_set = self.doc.get("axle_rule_set") or {}
        if rule_set.get("name"):
            src = f" ({rule_set['source']})" if rule_set.get("source") else ""
            notes.append(f"Axle-group rules: {rule_set['name']}{src}")
        notes += [f"Advisory: {r}" for r in self.axle_rules()]
        if rule_set.get("advisory"):
            notes.append(rule_set["advisory"])
        return TableData("Axles", headers, rows, set(range(1 + off, 6 + off)), notes)

    def phase_label(self, p: dict | None) -> str:
        if p is None:
            return ""
        return str(p.get("label") or phase_title(str(p.get("name"))))

    def axle_rules(self) -> list[str]:
        """Text of the axle-group rule advisories (``axle_rules``) in display units."""
        out = []
        for r in self.doc.get("axle_rules") or []:
            if isinstance(r, str):
                out.append(r)
                continue
            name = r.get("rule") or r.get("name") or "rule"
            names = r.get("axle_names")
            axles = names or r.get("axles")
            who = ""
            if names:
                who = f" ({', '.join(str(a) for a in names)} axle" + \
                    ("s)" if len(names) > 1 else ")")
            elif axles:  # indices, front first
                who = " (axle" + ("s " if len(axles) > 1 else " ") + ", ".join(
                    str(a + 1) if isinstance(a, int) else str(a) for a in axles) + ")"
            load = r.get("load_kg")
            limit = r.get("limit_kg")
            ok = r.get("in_limits", r.get("ok"))
            phase = f"{phase_title(str(r['phase']))}: " if r.get("phase") else ""
            text = f"{phase}{name}{who}"
            if r.get("detail"):
                text += f" [{r['detail']}]"
            if load is not None and limit is not None:
                text += f": {self.mass(load)} against {self.mass(limit)} {self.mass_unit}"
                margin = _num(r.get("margin_kg"))
                if margin is None:
                    margin = float(limit) - float(load)
                within = ok if ok is not None else margin >= 0
                text += ", within" if within else \
                    f", over by {nonzero_excess(self.mass(-margin), -margin)} {self.mass_unit}"
            elif r.get("message") or r.get("text"):
                text = r.get("message") or r.get("text")
            out.append(text)
        return out

    def stations_table(self) -> TableData | None:
        """Station and compartment limits (``stations``): only those with a limit."""
        rows_in = [st for st in self.doc.get("stations") or []
                   if st.get("max_mass_kg") is not None
                   or st.get("floor_load_limit_kg_m2") is not None]
        if not rows_in:
            return None
        mu = self.mass_unit
        area = f"{mu}/{self.length_unit}2"
        floor = any(st.get("floor_load_limit_kg_m2") is not None for st in rows_in)
        headers = ["Station", "Kind", f"Load\n{mu}", f"Max\n{mu}", f"Margin\n{mu}"]
        if floor:
            headers += [f"Floor\n{area}", f"Limit\n{area}"]
        headers.append("Status")
        rows = []
        for st in rows_in:
            row = [str(st.get("station") or "?"), str(st.get("kind") or ""),
                   self.mass(st.get("mass_kg")), self.mass(st.get("max_mass_kg")),
                   self.mass(st.get("margin_kg"), signed=True)]
            if floor:
                row += [self.area_density(st.get("floor_loading_kg_m2")),
                        self.area_density(st.get("floor_load_limit_kg_m2"))]
            row.append("ok" if st.get("in_limits", True) else "OUT")
            rows.append(row)
        return TableData("Station limits", headers, rows, set(range(2, len(headers) - 1)))

    def area_density(self, kg_m2) -> str:
        """A floor loading in display mass per display length squared."""
        v = _num(kg_m2)
        if v is None:
            return DASH
        d = to_unit(v, f"{self.mass_unit}/{self.length_unit}2")
        return _fixed(d, 2 if abs(d) < 10 else 1 if abs(d) < 1000 else 0)

    def violations(self) -> list[tuple[str, str]]:
        """(message, figures in display units) for each violation."""
        out = []
        for v in self.doc.get("violations") or []:
            phase = v.get("phase")
            msg = v.get("message") or v.get("subject") or v.get("code") or "limit exceeded"
            title = phase_title(str(phase)) if phase else ""
            # name the phase unless the message starts with it already
            head = f"[{title}] " if title and not msg.lower().startswith(title.lower()) else ""
            unit = v.get("unit")
            figures = []
            for key, word in (("limit", "limit"), ("actual", "actual"), ("excess", "excess")):
                if v.get(key) is not None:
                    figures.append(f"{word} {self.quantity(v[key], unit)}")
            # The figures again in display units, unless the message already speaks in them.
            shown = ", ".join(figures)
            unit_word = self.quantity(0.0, unit).split(" ", 1)[-1] if figures else ""
            if v.get("message") and unit_word and f" {unit_word}" in msg:
                shown = ""
            out.append((head + msg, shown))
        return out

    @property
    def fixes_note(self) -> str | None:
        """The builder's note on the fixes (for example why none was found), if any."""
        note = self.doc.get("fixes_note")
        return str(note) if note else None

    def fixes(self) -> list[str]:
        out = []
        for f in self.doc.get("fixes") or []:
            text = f.get("description") or f.get("kind") or "fix"
            if f.get("rechecked"):
                text += (" \u2014 re-checked: within limits" if f.get("in_limits_after") else
                         " \u2014 re-checked: not enough on its own")
            else:
                text += " \u2014 not re-checked"
            out.append(text)
        return out


def _axis_short(axis: str) -> str:
    return {"longitudinal": "long.", "lateral": "lat."}.get(axis, axis)


def _when(at) -> str:
    if not at:
        return ""
    try:
        dt = datetime.fromisoformat(str(at))
    except ValueError:
        return str(at)
    off = dt.utcoffset()
    if off is None:
        return f"{dt:%Y-%m-%d %H:%M}"
    if off.total_seconds() == 0:
        return f"{dt:%Y-%m-%d %H:%M} UTC"
    return f"{dt:%Y-%m-%d %H:%M} {dt:%z}"[:-2] + ":" + f"{dt:%z}"[-2:]


def _sheet_state(sheet: dict) -> str:
    if sheet.get("saved") or sheet.get("id") is not None:
        text = f"saved as sheet #{sheet.get('id', '?')}"
    else:
        text = "not saved (draft)"
    if sheet.get("amends") is not None:
        text += f", amends sheet #{sheet['amends']}"
    return text


# --- rich rendering -------------------------------------------------------------------------

def _rich_table(t: TableData) -> Table:
    table = Table(box=box.SIMPLE_HEAD, show_edge=False, pad_edge=False, padding=(0, 1),
                  header_style="bold", expand=False)
    for i, h in enumerate(t.headers):
        table.add_column(Text(h), justify="right" if i in t.numeric else "left",
                         overflow="fold", no_wrap=(i == 0))
    for i, r in enumerate(t.rows):
        # Text, not str: a label typed by a user ("[/]") must not be read as rich markup.
        table.add_row(*(Text(c) for c in r), style="bold" if i in t.bold_rows else None,
                      end_section=(i + 1 in t.bold_rows))
    return table


def _section(console: Console, title: str, width: int) -> None:
    console.print()
    console.print(Rule(Text(f" {title.upper()} ", style="bold"), align="left",
                       characters="\u2500"), width=width)


def render_sheet(doc: dict, console: Console | None = None, width: int = 80) -> None:
    """Print the loading sheet of a ``wbledger.sheet/1`` document.

    Parameters
    ----------
    doc : dict
        The sheet document (docs/sheet-document.md).
    console : rich.console.Console, optional
        Where to print; a new console ``width`` columns wide if not given.
    width : int
        Layout width in columns; the sheet never prints wider than this (or than the
        console, whichever is narrower). At least 60.
    """
    if console is None:
        console = Console(width=width, highlight=False)
    w = max(60, min(width, console.width))
    view = SheetView(doc)

    def out(*a, **kw):
        kw.setdefault("width", w)
        console.print(*a, **kw)

    head = Table.grid(padding=(0, 2))
    head.add_column(style="bold", no_wrap=True)
    head.add_column(overflow="fold")
    for k, v in view.heading():
        style = None
        if k == "Verdict":
            style = "bold green" if view.ok else "bold red"
        head.add_row(k, Text(v, style=style or ""))
    out(Panel(head, title=Text(view.title, style="bold"), title_align="left",
              box=box.HEAVY, width=w))

    def table_block(t: TableData | None) -> None:
        if t is None:
            return
        _section(console, t.title, w)
        out(_rich_table(t))
        for n in t.notes:
            out(Text(n, style="dim"), overflow="fold")

    table_block(view.items_table())
    table_block(view.stations_table())
    table_block(view.fuel_table())
    table_block(view.phases_table())
    table_block(view.margins_table())

    for chart in view.charts():
        _section(console, chart.title, w)
        pts = chart.points + [(x, y, EXIT_MARK) for x, y in chart.exits]
        for line in envelope_chart([chart.polygon], pts, chart.path, width=w,
                                   height=16, x_label=chart.x_label, y_label=chart.y_label):
            out(Text(line), no_wrap=True, overflow="crop", soft_wrap=False)
        legend = list(chart.legend)
        if chart.path:
            legend.append(f"{PATH} burn path: the CG as fuel burns")
        if chart.exit_note:
            legend.append(f"{EXIT_MARK} {chart.exit_note}")
        legend.append("+-|/\\ envelope outline (limits inclusive: on the line is inside)")
        for line in legend:
            out(Text("  " + line), overflow="fold")

    table_block(view.axles_table())
    if view.ground_caution:
        out(Text(view.ground_caution, style="italic"), overflow="fold")

    viol = view.violations()
    if viol:
        _section(console, f"Limits exceeded ({len(viol)})", w)
        for i, (msg, figures) in enumerate(viol, 1):
            out(_hanging(f"{i}.", msg + (f"\n{figures}" if figures else ""), w))
    fixes = view.fixes()
    note = view.fixes_note if not view.ok else None
    if fixes or note:
        _section(console, "Ways to bring the load within limits", w)
    if note:
        out(Text(note), overflow="fold")
    if fixes:
        for i, f in enumerate(fixes, 1):
            out(_hanging(f"{chr(ord('A') + i - 1) if i <= 26 else i})", f, w))
        out(Text("Each option is re-checked on its own; apply one, then prepare a new sheet.",
                 style="dim"), overflow="fold")

    console.print()
    verdict = Group(Text(view.verdict_text, style="bold"), Text(view.verdict_detail))
    out(Panel(verdict, title="Verdict", title_align="left", box=box.DOUBLE,
              border_style="green" if view.ok else "red", width=w))
    out(Panel(Text(view.caution, style="bold"), box=box.HEAVY, border_style="yellow",
              width=w))
    for label, value in view.anchors():
        out(Text(f"{label:<11} {value}"), overflow="fold")


def _hanging(mark: str, text: str, width: int) -> Table:
    t = Table.grid(padding=(0, 1))
    t.add_column(no_wrap=True, width=len(mark))
    t.add_column(overflow="fold", max_width=width - len(mark) - 1)
    t.add_row(Text(mark), Text(text))
    return t


def sheet_text(doc: dict, width: int = 80) -> str:
    """The loading sheet as plain text (no colour), ``width`` columns wide.

    Examples
    --------
    Used by tests and by anything that wants the sheet as a string::

        text = sheet_text(doc)
        assert "CAUTION" in text
    """
    buf = io.StringIO()
    console = Console(file=buf, width=width, color_system=None, force_terminal=False,
                      highlight=False, legacy_windows=False, emoji=False)
    render_sheet(doc, console=console, width=width)
    return "".join(line.rstrip() + "\n" for line in buf.getvalue().splitlines())


def check_lines(doc: dict, width: int = 80) -> list[str]:
    """The short text of ``wbledger check``: verdict, violations, fixes, caution (``width`` wide).

    Examples
    --------
    >>> doc = {"vehicle": {"registration": "X-1"}, "verdict": "in_limits", "violations": [],
    ...        "fixes": [], "caution": "CAUTION: not approved data."}
    >>> check_lines(doc)
    ['X-1: IN LIMITS', 'CAUTION: not approved data.']
    """
    import textwrap

    ok = doc["verdict"] == "in_limits"
    lines = [f"{doc['vehicle']['registration']}: {'IN LIMITS' if ok else 'OUT OF LIMITS'}"]

    def wrapped(text: str, first: str, rest: str) -> list[str]:
        return textwrap.wrap(text, width, initial_indent=first, subsequent_indent=rest,
                             break_on_hyphens=False)

    for v in doc["violations"]:
        lines += wrapped(v["message"], "  - ", "    ")
    if doc["fixes"]:
        if doc.get("fixes_note"):
            lines += wrapped(doc["fixes_note"], "  ", "  ")
        for f in doc["fixes"]:
            lines += wrapped(f["description"], "  fix: ", "       ")
    elif not ok and doc.get("fixes_note"):
        lines += wrapped(doc["fixes_note"], "  ", "  ")
    lines += wrapped(doc["caution"], "", "")
    return lines
