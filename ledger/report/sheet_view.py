"""What a loading sheet shows, ready for any renderer: :class:`SheetView`.

The document (docs/sheet-document.md) carries SI values and the display units to show them
in. :class:`SheetView` turns it into display-ready text once (headings, table rows, chart
data, verdict, caution) so that the terminal sheet (:mod:`ledger.report.sheet_text`) and the
printed sheet (:mod:`ledger.report.sheet_pdf`) show the same content; the renderers only lay
it out. The tables are built in :mod:`ledger.report.sheet_tables`, the charts in
:mod:`ledger.report.sheet_charts`.
"""

from __future__ import annotations

from datetime import datetime

from ledger.caution import CAUTION, GROUND_CAUTION
from ledger.loadsheet.text import phase_title
from ledger.report import sheet_amend, sheet_charts, sheet_tables
from ledger.report.sheet_charts import ChartData
from ledger.report.sheet_format import DASH, DisplayFormat, number
from ledger.report.sheet_tables import TableData
from ledger.units import nonzero_excess

__all__ = ["SheetView"]


class SheetView(DisplayFormat):
    """Display-ready content of a loading-sheet document (shared by every renderer).

    Parameters
    ----------
    doc : dict
        A ``wbledger.sheet/1`` document (docs/sheet-document.md).
    """

    def __init__(self, doc: dict):
        super().__init__(doc)
        vehicle = doc.get("vehicle") or {}
        self.kind = vehicle.get("kind") or ""
        self.is_ground = bool(doc.get("axles")) or self.kind == "ground_vehicle"
        #: The standard-mass set the sheet names (items of that source are marked).
        self.standard_set = (doc.get("standard_masses") or {}).get("name")
        self.ok = doc.get("verdict") == "in_limits"

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
    def is_draft(self) -> bool:
        """Not saved: no sheet number, so not for signature (issue 13 item 6)."""
        sheet = self.doc.get("sheet") or {}
        return not (sheet.get("saved") or sheet.get("id") is not None)

    @property
    def draft_notice(self) -> str:
        return ("This sheet is a draft: it is not saved and has no sheet number, so it is not "
                "for signature. Prepare it with --save to print a numbered sheet to sign.")

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
        if number(cg.get("y")) not in (None, 0.0):
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
        if d.get("note"):
            rows.append(("Note", str(d["note"])))
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

    # --- tables and charts (built by sheet_tables and sheet_charts) ------------------------
    def amendment_tables(self) -> list[TableData]:
        """What an amended sheet changed from the sheet it amends (none for another)."""
        return sheet_amend.amendment_tables(self)

    def items_table(self) -> TableData:
        return sheet_tables.items_table(self)

    def stations_table(self) -> TableData | None:
        """Station and compartment limits (``stations``): only those with a limit."""
        return sheet_tables.stations_table(self)

    def fuel_table(self) -> TableData | None:
        return sheet_tables.fuel_table(self)

    def phases_table(self) -> TableData:
        return sheet_tables.phases_table(self)

    def margins_table(self) -> TableData | None:
        return sheet_tables.margins_table(self)

    def axles_table(self) -> TableData | None:
        """Axle loads: per phase when the phases carry them, else the document's ``axles``."""
        return sheet_tables.axles_table(self)

    def charts(self) -> list[ChartData]:
        return sheet_charts.charts(self)

    # --- phases, advisories, violations, fixes ---------------------------------------------
    def phase(self, name: str) -> dict | None:
        for p in self.doc.get("phases") or []:
            if p.get("name") == name:
                return p
        return None

    def over_mass_limit(self, p: dict) -> str | None:
        """"maximum zero-fuel mass by 50.0 lb" when the sheet's violations say phase ``p`` is
        over its mass limit (the verdict's own test), else None (issue 13 item 1)."""
        for v in self.doc.get("violations") or []:
            if v.get("phase") == p.get("name") and v.get("code") in ("mass_limit", "gross") \
                    and number(v.get("limit")) == number(p.get("mass_limit_kg")):
                return f"{v.get('subject')} by {self.quantity(v.get('excess'), 'kg')}"
        return None

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
                margin = number(r.get("margin_kg"))
                if margin is None:
                    margin = float(limit) - float(load)
                within = ok if ok is not None else margin >= 0
                text += ", within" if within else \
                    f", over by {nonzero_excess(self.mass(-margin), -margin)} {self.mass_unit}"
            elif r.get("message") or r.get("text"):
                text = r.get("message") or r.get("text")
            out.append(text)
        return out

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
    if sheet.get("saved") or sheet.get("id") is not None:  # as SheetView.is_draft
        text = f"saved as sheet #{sheet.get('id', '?')}"
    else:
        text = "not saved (draft)"
    if sheet.get("amends") is not None:
        text += f", amends sheet #{sheet['amends']}"
    return text

