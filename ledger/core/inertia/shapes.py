"""Own inertia of uniform item shapes about their centroid (standard tables)."""

from __future__ import annotations

import math

import numpy as np

from ledger.core._common import finite_float
from ledger.errors import InputError, MassPropertiesError

__all__ = ["SHAPES", "shape_inertia"]

#: Shapes known to :func:`shape_inertia` and the dimensions (m) each takes.
SHAPES: dict[str, tuple[str, ...]] = {
    "point": (),
    "box": ("a", "b", "c"),
    "cylinder": ("r", "h"),
    "hollow_cylinder": ("R", "r", "h"),
    "disk": ("r",),
    "rod": ("L",),
    "sphere": ("r",),
}

_AXES = {"x": 0, "y": 1, "z": 2}


def _positive(value, field: str, *, allow_zero: bool = True) -> float:
    """A dimension of a shape, in m: finite, 0 or more (or more than 0)."""
    allowed = "a finite length in m of 0 or more" if allow_zero else \
        "a finite length in m greater than 0"
    v = finite_float(value, field, allowed)
    if v < 0 or (v == 0 and not allow_zero):
        raise InputError(field, v, allowed)
    return v


def shape_inertia(shape: str, mass: float, axis: str = "x", **dims: float) -> np.ndarray:
    """Inertia tensor of a uniform solid about its own centroid, in axes parallel to the datum.

    ============== ============ ==========================================================
    shape          dims (m)     moments (axial / transverse)
    ============== ============ ==========================================================
    point          —            0
    box            a, b, c      extents along x, y, z: Ixx = m(b²+c²)/12, and cyclic
    cylinder       r, h         m r²/2 ; m(3r² + h²)/12
    hollow_cylinder R, r, h     m(R² + r²)/2 ; m(3(R² + r²) + h²)/12 (R outer, r inner)
    disk           r            m r²/2 ; m r²/4 (thin)
    rod            L            0 ; m L²/12 (slender)
    sphere         r            2 m r²/5 about every axis
    ============== ============ ==========================================================

    Parameters
    ----------
    shape : str
        One of :data:`SHAPES`.
    mass : float
        Mass, kg, 0 or more.
    axis : {"x", "y", "z"}
        Datum axis along which a cylinder, disk or rod lies; not used by point, box or sphere.
    **dims : float
        The dimensions the shape takes, m.

    Returns
    -------
    ndarray, shape (3, 3)
        Diagonal tensor (products are 0 for these shapes in these axes).

    Raises
    ------
    InputError
        Unknown shape or axis, missing or unexpected dimensions, negative dimensions, an inner
        radius larger than the outer.
    MassPropertiesError
        Negative or non-finite mass.

    Examples
    --------
    >>> shape_inertia("cylinder", 12.0, axis="y", r=0.5, h=2.0).diagonal().tolist()
    [4.75, 1.5, 4.75]
    >>> shape_inertia("box", 12.0, a=1.0, b=2.0, c=3.0).diagonal().tolist()
    [13.0, 10.0, 5.0]
    """
    key = str(shape).strip().lower()
    if key not in SHAPES:
        raise InputError("shape", shape, "one of " + ", ".join(repr(s) for s in SHAPES))
    if axis not in _AXES:
        raise InputError("axis", axis, "one of 'x', 'y', 'z'")
    try:
        m = float(mass)
    except (TypeError, ValueError):
        raise MassPropertiesError("mass", mass, "a finite mass of 0 kg or more") from None
    if not math.isfinite(m) or m < 0:
        raise MassPropertiesError("mass", m, "a finite mass of 0 kg or more")
    want = SHAPES[key]
    extra = sorted(set(dims) - set(want))
    if extra:
        raise InputError(f"{key}.{extra[0]}", dims[extra[0]],
                         f"no such dimension; a {key} takes " +
                         (", ".join(want) if want else "no dimensions"))
    missing = [d for d in want if d not in dims]
    if missing:
        raise InputError(f"{key}.{missing[0]}", None,
                         f"a length in m; a {key} takes " + ", ".join(want))
    d = {name: _positive(dims[name], f"{key}.{name}") for name in want}
    k = _AXES[axis]
    if key == "point":
        diag = np.zeros(3)
    elif key == "box":
        a, b, c = d["a"], d["b"], d["c"]
        diag = m / 12.0 * np.array([b * b + c * c, a * a + c * c, a * a + b * b])
    elif key == "sphere":
        diag = np.full(3, 0.4 * m * d["r"] ** 2)
    else:
        if key == "cylinder":
            r2 = d["r"] ** 2
            axial, transverse = m * r2 / 2.0, m * (3.0 * r2 + d["h"] ** 2) / 12.0
        elif key == "hollow_cylinder":
            if d["r"] > d["R"]:
                raise InputError(f"{key}.r", d["r"],
                                 f"an inner radius of at most the outer radius R = {d['R']:g} m")
            s = d["R"] ** 2 + d["r"] ** 2
            axial, transverse = m * s / 2.0, m * (3.0 * s + d["h"] ** 2) / 12.0
        elif key == "disk":
            axial, transverse = m * d["r"] ** 2 / 2.0, m * d["r"] ** 2 / 4.0
        else:  # rod
            axial, transverse = 0.0, m * d["L"] ** 2 / 12.0
        diag = np.full(3, transverse)
        diag[k] = axial
    return np.diag(diag)


