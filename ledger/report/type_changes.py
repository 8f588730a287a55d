"""What ``wbledger type import`` did, or would do with ``--dry-run``: per file the revision,
each changed field (old → new) in the type's display units, the stations, tanks, envelope
points and other parts added or removed, and the vehicles that move onto the new revision.

Input is the ``to_dict`` documents of :class:`ledger.services.types.ImportedType` (values in
SI with a ``dimension`` per change, and the new revision's display units).
"""

from __future__ import annotations

from typing import Any

from ledger.units import display_decimals, to_unit

__all__ = ["change_text", "import_lines", "render_type_import"]

_UNIT_SUFFIXES = ("_kgm", "_kg", "_m")


def _value(value: Any, dimension: str | None, units: dict) -> str:
    if value is None:
        return "none"
    if isinstance(value, bool) or not isinstance(value, int | float):
        return str(value) if isinstance(value, str) else repr(value)
    if dimension in ("mass", "length", "volume"):
        unit = units[dimension]
        return f"{to_unit(value, unit):.{display_decimals(unit)}f} {unit}"
    if dimension == "moment":
        index = to_unit(value, units["moment"]) / units["moment_divisor"]
        return f"{index:.3f} {units['moment']}/{units['moment_divisor']:g}"
    return f"{value:g}"


def _point(point: list, dimension: str, units: dict) -> str:
    cg = "moment" if dimension == "points:moment" else "length"
    return f"({_value(point[0], cg, units)}, {_value(point[1], 'mass', units)})"


def _field(path: str) -> str:
    """``limits.max_takeoff_kg`` → ``limits.max_takeoff`` (the value shows its unit)."""
    for suffix in _UNIT_SUFFIXES:
        if path.endswith(suffix):
            return path[: -len(suffix)]
    return path


def change_text(c: dict, units: dict) -> list[str]:
    """One change in words, ``limits.max_takeoff: 12500.0 lb → 12600.0 lb``; envelope points
    one a line, ``envelopes[normal].points: added (96.00 in, 12600.0 lb)``."""
    dim = c.get("dimension")
    if dim and dim.startswith("points:"):
        if c["change"] == "changed":
            return [f"{c['field']}: the same points in another order"]
        pts = c["old"] if c["change"] == "removed" else c["new"]
        return [f"{c['field']}: {c['change']} {_point(p, dim, units)}" for p in pts]
    if c["change"] in ("added", "removed"):
        return [f"{c['field']}: {c['change']} "
                f"{c['new'] if c['change'] == 'added' else c['old']}"]
    return [f"{_field(c['field'])}: {_value(c['old'], dim, units)} \u2192 "
            f"{_value(c['new'], dim, units)}"]


def import_lines(row: dict) -> list[str]:
    """The lines for one file: what happened (or would), the changes, the vehicles moved."""
    would = row["dry_run"]
    head = f"{row['file']}: type {row['type']} "
    if not row["new_revision"]:
        newest = row["previous_revision"]
        stays = (f" (its vehicles stay on revision {newest}, the newest)"
                 if newest is not None and newest != row["revision"] else "")
        return [head + f"unchanged, already revision {row['revision']}" + stays]
    verb = "would be imported as" if would else "imported as"
    if row["previous_revision"] is None:
        return [head + f"{verb} revision {row['revision']}" + (" (a new type)" if would else "")]
    lines = [head + f"{verb} revision {row['revision']}; changed from revision "
             f"{row['previous_revision']}:"]
    lines += ["  " + text for c in row["changes"] for text in change_text(c, row["units"])]
    moved = row["vehicles_moved"]
    move = "would move" if would else "moved"
    lines.append(f"  Vehicles that {move} onto revision {row['revision']} ({len(moved)}): "
                 + (", ".join(moved) if moved else "none"))
    return lines


def render_type_import(rows: list[dict]) -> None:
    """Print :func:`import_lines` for every file; a dry run ends saying nothing was written."""
    from rich.console import Console

    # Not wrapped: a file name stays whole, and each change is one line.
    con = Console(highlight=False, soft_wrap=True)
    for row in rows:
        for line in import_lines(row):
            con.print(line, markup=False)
    if rows and rows[0]["dry_run"]:
        con.print("Dry run: nothing was written.")
