"""Axes of an inertia result: datum to body axes, principal axes, the x-axis inclination."""

from __future__ import annotations

import math

import numpy as np

__all__ = ["PRODUCT_CONVENTION", "BODY_AXES", "DATUM_AXES", "to_body_axes", "principal_axes",
           "x_axis_inclination"]

PRODUCT_CONVENTION = ("products of inertia in the positive-product convention Ixy = Σ m·x·y; "
                      "the inertia tensor's off-diagonal terms are −Ixy")
BODY_AXES = ("body axes about the CG: x forward, y right, z down "
             "(x_b = −(x − x_cg), y_b = y − y_cg, z_b = −(z − z_cg))")
DATUM_AXES = "datum axes through the CG: x aft, y right, z up"

# The 180° rotation about y from datum-parallel axes to body axes (its own inverse).
_TO_BODY = np.diag([-1.0, 1.0, -1.0])


def to_body_axes(tensor) -> np.ndarray:
    """Turn a tensor (or a stack of them) from datum-parallel axes into body axes.

    Body axes are the datum axes rotated 180° about y (x forward, y right, z down). The rotation
    is its own inverse, so the same call turns body axes back into datum axes. Ixx, Iyy, Izz
    and Ixz are unchanged; Ixy and Iyz change sign.

    Parameters
    ----------
    tensor : array_like, shape (..., 3, 3)

    Returns
    -------
    ndarray, shape (..., 3, 3)

    Examples
    --------
    >>> t = [[10.0, -1.0, -2.0], [-1.0, 20.0, -3.0], [-2.0, -3.0, 25.0]]
    >>> to_body_axes(t)
    array([[10.,  1., -2.],
           [ 1., 20.,  3.],
           [-2.,  3., 25.]])
    """
    t = np.asarray(tensor, dtype=float)
    return _TO_BODY @ t @ _TO_BODY


def principal_axes(tensor) -> tuple[np.ndarray, np.ndarray]:
    """Principal moments (ascending) and principal axes of a symmetric inertia tensor.

    Parameters
    ----------
    tensor : array_like, shape (3, 3)

    Returns
    -------
    moments : ndarray, shape (3,)
        Ascending.
    axes : ndarray, shape (3, 3)
        Column j is the unit axis of ``moments[j]``, in the tensor's axes. The set is
        right-handed (det = +1); each of the first two columns has its largest component
        positive. With repeated moments the axes in that plane are not unique.

    Examples
    --------
    >>> m, ax = principal_axes(np.diag([3.0, 1.0, 2.0]))
    >>> m.tolist(), ax.round(12).tolist()
    ([1.0, 2.0, 3.0], [[0.0, 0.0, 1.0], [1.0, 0.0, 0.0], [0.0, 1.0, 0.0]])
    """
    t = np.asarray(tensor, dtype=float)
    w, v = np.linalg.eigh(0.5 * (t + t.T))
    v = v.copy()
    for j in range(3):
        if v[np.argmax(np.abs(v[:, j])), j] < 0:
            v[:, j] = -v[:, j]
    if np.linalg.det(v) < 0:
        v[:, 2] = -v[:, 2]
    return w, v + 0.0


def x_axis_inclination(Ixx: float, Izz: float, Ixz_product: float) -> float:
    """Inclination ε of the principal x axis in the x–z plane: ``ε = ½·atan2(2·Ixz, Izz − Ixx)``.

    ``Ixz_product`` is in the positive-product convention (``Σ m·x·z``) in the same axes as
    ``Ixx`` and ``Izz``. The axis of least moment of inertia within the x–z plane is
    ``(cos ε, 0, sin ε)`` in those axes: ε is measured from +x toward +z. In body axes (z down)
    ε > 0 means that axis lies *below* x_b at the nose (nose-down), i.e. a right-hand rotation of
    −ε about y_b. Exact when Ixy = Iyz = 0 (a vehicle symmetric about its x–z plane); otherwise
    use :func:`principal_axes`.

    Returns
    -------
    float
        ε in radians, in (−π/2, π/2].

    Examples
    --------
    A slender rod along (cos 10°, 0, sin 10°) in body axes (forward end low):

    >>> import math
    >>> c, s = math.cos(math.radians(10)), math.sin(math.radians(10))
    >>> round(math.degrees(x_axis_inclination(s * s, c * c, s * c)), 9)
    10.0
    """
    return 0.5 * math.atan2(2.0 * float(Ixz_product), float(Izz) - float(Ixx))


