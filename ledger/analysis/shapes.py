"""Shapes of mass items: their own inertia tensor about their CG, and a one-line description.

A shape is what the ledger stores for an item (a dict such as ``{"kind": "box", "length_m": 2,
"width_m": 1, "height_m": 1}``) or a type file's :class:`ledger.typedata.Shape`; None is a
point mass. The tensors come from :func:`ledger.core.inertia.shape_inertia`.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

import numpy as np

from ledger.analysis import MISSING
from ledger.core.inertia import shape_inertia
from ledger.errors import InputError

__all__ = ["shape_dict", "shape_tensor", "describe_shape"]

_DIMS: dict[str, tuple[tuple[str, str], ...]] = {  # shape kind -> (core dimension name, shape key)
    "point": (),
    "box": (("a", "length_m"), ("b", "width_m"), ("c", "height_m")),
    "cylinder": (("r", "radius_m"), ("h", "length_m")),
    "hollow_cylinder": (("R", "radius_m"), ("r", "inner_radius_m"), ("h", "length_m")),
    "disk": (("r", "radius_m"),),
    "rod": (("L", "length_m"),),
    "sphere": (("r", "radius_m"),),
}
_AXIAL = ("cylinder", "hollow_cylinder", "disk", "rod")


def shape_dict(shape: Any) -> dict[str, Any] | None:
    """A shape as a plain dict: a type file's :class:`Shape`, a ledger dict, or None."""
    if shape is None:
        return None
    if isinstance(shape, Mapping):
        d = dict(shape)
    else:
        d = {k: getattr(shape, k) for k in ("kind", "length_m", "width_m", "height_m",
                                            "radius_m", "inner_radius_m", "axis")
             if getattr(shape, k, None) is not None}
    return {k: v for k, v in d.items() if v is not None}


def shape_tensor(shape: Any, mass_kg: float, *, field: str = "shape") -> np.ndarray:
    """Own inertia tensor (datum-parallel axes, about the item's CG) of a shape.

    ``shape`` is a dict such as ``{"kind": "box", "length_m": 2, "width_m": 1, "height_m": 1}``
    (what the ledger stores) or a type file's :class:`ledger.typedata.Shape`; None is a point
    mass. Box extents: length along x, width along y, height along z.

    Examples
    --------
    >>> shape_tensor({"kind": "box", "length_m": 1.0, "width_m": 2.0, "height_m": 3.0},
    ...              12.0).diagonal().tolist()
    [13.0, 10.0, 5.0]
    >>> shape_tensor(None, 5.0).any()
    np.False_
    """
    d = shape_dict(shape)
    if d is None:
        return np.zeros((3, 3))
    kind = d.get("kind")
    if kind not in _DIMS:
        raise InputError(f"{field}.kind", kind, "one of " + ", ".join(_DIMS))
    dims: dict[str, float] = {}
    for core_name, key in _DIMS[kind]:
        if key not in d:
            raise InputError(f"{field}.{key}", MISSING, f"a length in m; a {kind} takes " +
                             ", ".join(k for _, k in _DIMS[kind]))
        dims[core_name] = d[key]
    axis = d.get("axis", "x") if kind in _AXIAL else "x"
    return shape_inertia(kind, mass_kg, axis=axis, **dims)


def describe_shape(shape: Any) -> str:
    """One line for a shape, in m.

    Examples
    --------
    >>> describe_shape({"kind": "cylinder", "radius_m": 0.2, "length_m": 1.5, "axis": "y"})
    'cylinder r 0.2 m, length 1.5 m, axis y'
    """
    d = shape_dict(shape)
    if d is None or d.get("kind") == "point":
        return "point mass"
    kind = d["kind"]
    words = {"length_m": "length", "width_m": "width", "height_m": "height",
             "radius_m": "r", "inner_radius_m": "inner r"}
    parts = [f"{words[k]} {d[k]:g} m" for _, k in _DIMS[kind] if k in d]
    text = f"{kind} " + ", ".join(parts)
    if kind in _AXIAL and "axis" in d:
        text += f", axis {d['axis']}"
    return text
