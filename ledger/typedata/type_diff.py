"""The differences between two revisions of a vehicle type, field by field.

Both sides are the types' canonical dicts (:meth:`ledger.typedata.VehicleType.to_dict`: SI,
the unit in every key name), so a file that only moves comments or respells a unit shows no
difference, exactly as it makes no new revision. Named parts (stations, tanks, envelopes,
weighing points, axles, configurations, …) are matched by name: a part is added, removed, or
changed field by field; an envelope's points are compared as points (which were removed, which
added).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

__all__ = ["FieldChange", "type_changes"]

_SKIPPED = frozenset({"canonical_version"})


@dataclass(frozen=True)
class FieldChange:
    """One difference: ``path`` names the field (``limits.max_takeoff_kg``,
    ``stations[baggage].x_m``, ``envelopes[normal].points``); ``change`` is ``"changed"``
    (``old`` → ``new``), ``"added"`` or ``"removed"`` (a named part: its name; points: the
    points)."""

    path: str
    change: str
    old: Any = None
    new: Any = None
    dimension: str | None = None

    def to_dict(self) -> dict[str, Any]:
        return {"field": self.path, "change": self.change, "old": self.old, "new": self.new,
                "dimension": self.dimension}


#: The dimension of a value by the unit its key ends in (see the canonical dict); ``dimension``
#: of a change is one of these, or ``"points:arm"`` / ``"points:moment"`` for envelope points
#: (CG as an arm or a moment, then mass), ``"volume"`` (a tank measured by volume), or None
#: (a number without unit, a text).
SUFFIXES = (("_kgm", "moment"), ("_kg", "mass"), ("_m", "length"))


#: Quantities whose unit is given by a sibling field: a tank's capacity and unusable fuel are
#: a volume or a mass as its ``basis`` says.
_BY_BASIS = frozenset({"capacity", "unusable"})


def _dimension(path: str, parent: dict) -> str | None:
    if path.rpartition(".")[2] in _BY_BASIS and parent.get("basis") in ("volume", "mass"):
        return parent["basis"]
    return next((dim for suffix, dim in SUFFIXES if path.endswith(suffix)), None)


def _named(value: Any) -> bool:
    return (isinstance(value, list) and bool(value)
            and all(isinstance(v, dict) and isinstance(v.get("name"), str) for v in value))


def _points(path: str, old: list, new: list, dim: str) -> list[FieldChange]:
    olds = [tuple(p) for p in old]
    news = [tuple(p) for p in new]
    out = []
    gone = [list(p) for p in olds if p not in news]
    came = [list(p) for p in news if p not in olds]
    if gone:
        out.append(FieldChange(path, "removed", old=gone, dimension=dim))
    if came:
        out.append(FieldChange(path, "added", new=came, dimension=dim))
    if not out and olds != news:  # the same points in another order
        out.append(FieldChange(path, "changed", old, new, dim))
    return out


def _parts(path: str, old: list, new: list) -> list[FieldChange]:
    olds = {v["name"]: v for v in old}
    news = {v["name"]: v for v in new}
    out = [FieldChange(path, "removed", old=name) for name in olds if name not in news]
    out += [FieldChange(path, "added", new=name) for name in news if name not in olds]
    for name, part in news.items():
        if name in olds:
            out += _diff(f"{path}[{name}]", olds[name], part)
    return out


def _diff(path: str, old: Any, new: Any, parent: dict | None = None) -> list[FieldChange]:
    if isinstance(old, dict) and isinstance(new, dict):
        out = []
        for key in [*new, *(k for k in old if k not in new)]:
            sub = f"{path}.{key}" if path else key
            a, b = old.get(key), new.get(key)
            if key in _SKIPPED:
                continue
            if key == "points" and isinstance(a, list) and isinstance(b, list):
                out += _points(sub, a, b, f"points:{new.get('coordinates', 'arm')}")
            else:
                out += _diff(sub, a, b, new)
        return out
    if (_named(old) or _named(new)) and isinstance(old, list) and isinstance(new, list):
        return _parts(path, old, new)
    if old == new:
        return []
    return [FieldChange(path, "changed", old, new, _dimension(path, parent or {}))]


def type_changes(old: dict, new: dict) -> list[FieldChange]:
    """Every difference from the canonical dict ``old`` to ``new``, in the order of ``new``.

    Examples
    --------
    >>> old = {"limits": {"max_takeoff_kg": 1000.0}, "stations": [{"name": "pilot", "x_m": 1.0}]}
    >>> new = {"limits": {"max_takeoff_kg": 1050.0},
    ...        "stations": [{"name": "pilot", "x_m": 1.1}, {"name": "baggage", "x_m": 2.0}]}
    >>> for c in type_changes(old, new):
    ...     print(c.path, c.change, c.old, c.new)
    limits.max_takeoff_kg changed 1000.0 1050.0
    stations added None baggage
    stations[pilot].x_m changed 1.0 1.1
    """
    return _diff("", old, new)
