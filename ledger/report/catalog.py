"""Rendering of vehicle types: ``wbledger type list`` and ``wbledger type show``.

The JSON form of ``type show`` is the type's canonical dict (SI, unit in every key name) with the
revision it came from; the text form shows the same in the type's display units.
"""

from __future__ import annotations

from ledger.report.safe_text import clean, plain, text_console

__all__ = ["render_type_list", "render_type"]


def render_type_list(rows: list[dict]) -> None:
    from rich.table import Table

    con = text_console()
    rows = clean(rows)
    if not rows:
        con.print("No types yet. Import one with `wbledger type import FILE`.")
        return
    table = Table(box=None, pad_edge=False, header_style="bold")
    for col in ("type", "rev", "kind", "vehicles", "title"):
        table.add_column(col, justify="right" if col in ("rev", "vehicles") else "left")
    for r in rows:
        table.add_row(r["name"], str(r["revision"]), r["kind"] or "", str(r["vehicles"]),
                      r["title"] or "")
    con.print(table)


def _fmt(value_si: float | None, unit: str, digits: int = 1) -> str:
    from ledger.units import format_quantity

    return "-" if value_si is None else format_quantity(value_si, unit, digits)


def render_type(shown) -> None:
    """Text form of ``type show``, in the type's display units.

    ``shown`` is a :class:`ledger.services.types.TypeRevision`.
    """
    from rich.table import Table
    from rich.text import Text

    vt = shown.vehicle_type
    u = vt.units
    m, ln = u.mass, u.length
    con = text_console()

    def say(text: str) -> None:  # every line holds text from the type file: shown as text
        con.print(plain(text))

    con.print(Text.assemble((plain(vt.name), "bold"), "  ", plain(vt.title)))
    say(f"kind {vt.kind}; revision {shown.revision} imported {shown.imported_at[:19]}; "
        f"sha256 {shown.content_sha256[:12]}")
    say(f"display units: mass {m}, length {ln}, volume {u.volume}, "
              f"moment index = moment in {u.moment_unit} / {u.moment_divisor:g}")
    say(f"datum: {vt.datum}")
    if vt.note:
        say(f"note: {vt.note}")
    lim = vt.limits
    limits = [("max ramp", lim.max_ramp_kg), ("max take-off", lim.max_takeoff_kg),
              ("max landing", lim.max_landing_kg), ("max zero-fuel", lim.max_zero_fuel_kg),
              ("min flight", lim.min_flight_kg), ("gross rating", lim.gross_rating_kg)]
    shown = [f"{k} {_fmt(v, m, 0)}" for k, v in limits if v is not None]
    if shown:
        say("limits: " + "; ".join(shown))
    if vt.mac is not None:
        say(f"MAC: LEMAC {_fmt(vt.mac.lemac_m, ln, 2)}, length {_fmt(vt.mac.length_m, ln, 2)}")

    if vt.stations:
        t = Table(title="stations", title_justify="left", box=None, pad_edge=False,
                  header_style="bold")
        for col in ("name", "kind", f"x ({ln})", f"y ({ln})", f"max ({m})"):
            t.add_column(col, justify="left" if col in ("name", "kind") else "right")
        for s in vt.stations:
            t.add_row(plain(s.name), plain(s.kind), _num(s.x_m, ln), _num(s.y_m, ln),
                      "-" if s.max_mass_kg is None else _num(s.max_mass_kg, m, 0))
        con.print(t)
    if vt.tanks:
        t = Table(title="tanks", title_justify="left", box=None, pad_edge=False,
                  header_style="bold")
        for col in ("name", "fluid", "capacity", "unusable", f"x ({ln})", "arm table"):
            t.add_column(col, justify="left" if col in ("name", "fluid", "arm table") else "right")
        for tk in vt.tanks:
            qunit = u.volume if tk.basis == "volume" else m
            t.add_row(plain(tk.name), plain(tk.fluid), _fmt(tk.capacity, qunit),
                      _fmt(tk.unusable, qunit),
                      _num(tk.x_m, ln), f"{len(tk.arm_table)} rows" if tk.arm_table else "fixed")
        con.print(t)
    for env in vt.envelopes:
        cg_unit = u.moment_unit if env.coordinates == "moment" else ln
        pts = ", ".join(f"({_num(c, cg_unit)}, {_num(w, m, 0)})" for c, w in env.points)
        say(f"envelope {env.name} [{env.category}, {env.axis}, {env.coordinates}-{m}]: "
                  f"{pts}")
    if vt.reaction_points:
        say("weighing points: " + ", ".join(
            f"{p.name} x {_fmt(p.x_m, ln, 2)}" + (f" y {_fmt(p.y_m, ln, 2)}" if p.y_m else "")
            for p in vt.reaction_points))
    for ax in vt.axles:
        say(f"axle {ax.name}: x {_fmt(ax.x_m, ln, 3)}, rating {_fmt(ax.rating_kg, m, 0)}"
                  + (f", track {_fmt(ax.track_m, ln, 3)}" if ax.track_m else ""))
    for g in vt.axle_groups:
        shares = "/".join(f"{s:g}" for s in g.load_share)
        say(f"axle_group {g.name}: axles {', '.join(g.axles)}, load share {shares}"
            + (f", rating {_fmt(g.rating_kg, m, 0)}" if g.rating_kg is not None else ""))
    if vt.inertia is not None:
        say(f"inertia data: {vt.inertia.basis}")
    if vt.configurations:
        say("configurations: " + ", ".join(c.name for c in vt.configurations))


def _num(value_si: float, unit: str, digits: int = 2) -> str:
    from ledger.units import fixed, to_unit

    return fixed(to_unit(value_si, unit), digits)
