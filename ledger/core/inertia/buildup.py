"""Inertia of a body made of items, about the combined CG (parallel-axis theorem)."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ledger.core.inertia.axes import (
    BODY_AXES,
    DATUM_AXES,
    PRODUCT_CONVENTION,
    principal_axes,
    to_body_axes,
    x_axis_inclination,
)
from ledger.errors import InputError, MassPropertiesError

__all__ = ["CONTRIBUTION_COLUMNS", "InertiaResult", "combined_inertia"]

#: Columns of :attr:`InertiaResult.contributions`.
CONTRIBUTION_COLUMNS = ("Ixx", "Iyy", "Izz", "Ixy_product", "Ixz_product", "Iyz_product")


@dataclass(frozen=True)
class InertiaResult:
    """Mass properties of a body about its combined CG (from :func:`combined_inertia`).

    Attributes
    ----------
    frame : str
        ``"body"`` (x forward, y right, z down) or ``"datum"`` (x aft, y right, z up), both
        through the CG; the axes of every tensor, moment and product below.
    convention : str
        Text stating the axes and the product convention, for reports.
    mass : float
        Total mass, kg.
    cg : ndarray, shape (3,)
        Combined CG in *datum* coordinates (x aft, y right, z up), m.
    tensor : ndarray, shape (3, 3)
        Inertia tensor about the CG in ``frame`` axes: moments on the diagonal, −products off it.
    Ixx, Iyy, Izz : float
        Moments of inertia (roll, pitch, yaw in body axes), kg·m².
    Ixy_product, Ixz_product, Iyz_product : float
        Products of inertia, positive-product convention (``Σ m·x·y``), kg·m².
    principal_moments : ndarray, shape (3,)
        Ascending, kg·m².
    principal_axes : ndarray, shape (3, 3)
        Columns: unit principal axes in ``frame`` axes, right-handed.
    radii_of_gyration : ndarray, shape (3,)
        ``k = √(I/M)`` for Ixx, Iyy, Izz, m.
    inclination : float
        ε of :func:`x_axis_inclination` in ``frame`` axes, rad.
    contributions : ndarray, shape (n, 6)
        Each item's share of each figure (own inertia plus its parallel-axis part about the
        combined CG), columns :data:`CONTRIBUTION_COLUMNS`; each column sums to the total.
    """

    frame: str
    convention: str
    mass: float
    cg: np.ndarray
    tensor: np.ndarray
    Ixx: float
    Iyy: float
    Izz: float
    Ixy_product: float
    Ixz_product: float
    Iyz_product: float
    principal_moments: np.ndarray
    principal_axes: np.ndarray
    radii_of_gyration: np.ndarray
    inclination: float
    contributions: np.ndarray

    def ranked(self, column: str = "Iyy") -> np.ndarray:
        """Item indices by decreasing magnitude of their contribution to ``column``.

        ``column`` is one of :data:`CONTRIBUTION_COLUMNS`.

        Examples
        --------
        >>> r = combined_inertia([5.0, 1.0, 2.0], [[0, 0, 0], [4, 0, 0], [-1, 0, 0]])
        >>> r.ranked("Izz").tolist()
        [1, 2, 0]
        """
        if column not in CONTRIBUTION_COLUMNS:
            raise InputError("column", column,
                             "one of " + ", ".join(repr(c) for c in CONTRIBUTION_COLUMNS))
        k = CONTRIBUTION_COLUMNS.index(column)
        return np.argsort(-np.abs(self.contributions[:, k]), kind="stable")


def _tensor_to_columns(t: np.ndarray) -> np.ndarray:
    """(..., 3, 3) tensors → (..., 6) [Ixx, Iyy, Izz, Ixy_p, Ixz_p, Iyz_p]."""
    return np.stack([t[..., 0, 0], t[..., 1, 1], t[..., 2, 2],
                     -t[..., 0, 1], -t[..., 0, 2], -t[..., 1, 2]], axis=-1)


def _check_own(own, n: int) -> np.ndarray:
    try:
        t = np.asarray(own, dtype=float)
    except (TypeError, ValueError):
        raise MassPropertiesError("own_tensors", own, "an (n, 3, 3) array of inertia tensors") \
            from None
    if t.shape != (n, 3, 3):
        raise MassPropertiesError("own_tensors", f"shape {t.shape}",
                                  f"shape ({n}, 3, 3): one 3×3 tensor per item")
    for i in range(n):
        ti = t[i]
        field = f"own_tensors[{i}]"
        if not np.all(np.isfinite(ti)):
            raise MassPropertiesError(field, ti.tolist(), "finite values")
        scale = max(float(np.abs(ti).max()), 1e-300)
        if np.abs(ti - ti.T).max() > 1e-9 * scale:
            raise MassPropertiesError(field, ti.tolist(), "a symmetric tensor")
        w = np.linalg.eigvalsh(ti)
        tol = 1e-9 * scale
        if w[0] < -tol or w[2] > w[0] + w[1] + tol:
            raise MassPropertiesError(
                field, [round(float(x), 12) for x in w],
                "principal moments of 0 or more, each at most the sum of the other two "
                "(a physical body's tensor)",
                hint="Check the sign convention: off-diagonal tensor terms are −products")
    return t


def combined_inertia(masses, positions, own_tensors=None, *, frame: str = "body") -> InertiaResult:
    """Total mass, CG and inertia about the combined CG of items, by the parallel-axis theorem.

    ``I = Σ_i [ I_own,i + m_i (|r_i|² E − r_i r_iᵀ) ]`` with ``r_i`` the item's position
    relative to the combined CG; component-wise this is the SAWE build-up
    ``I_xx = Σ[I_xx,i + m_i(y_i² + z_i²)] − M(ȳ² + z̄²)``,
    ``I_xy = Σ[I_xy,i + m_i x_i y_i] − M x̄ ȳ`` (products in the positive-product convention).

    Parameters
    ----------
    masses : array_like, shape (n,)
        Item masses, kg, 0 or more, total greater than 0.
    positions : array_like, shape (n, 3)
        Item CGs (x, y, z) in datum coordinates, m.
    own_tensors : array_like, shape (n, 3, 3), optional
        Each item's own tensor about its CG in datum-parallel axes (e.g. from
        :func:`shape_inertia`); point masses if omitted.
    frame : {"body", "datum"}
        Axes of the results (see the module notes). ``"body"`` is the reporting convention.

    Returns
    -------
    InertiaResult

    Raises
    ------
    MassPropertiesError
        Non-finite or negative masses, zero total, bad positions, non-physical own tensors.
    InputError
        Unknown frame.

    Examples
    --------
    Two 10 kg points 2 m apart along y, 1 m aft of the datum:

    >>> r = combined_inertia([10.0, 10.0], [[1.0, -1.0, 0.0], [1.0, 1.0, 0.0]])
    >>> r.mass, r.cg.tolist(), (r.Ixx, r.Iyy, r.Izz)
    (20.0, [1.0, 0.0, 0.0], (20.0, 0.0, 20.0))
    >>> r.frame, r.radii_of_gyration.round(6).tolist()
    ('body', [1.0, 0.0, 1.0])
    """
    if frame not in ("body", "datum"):
        raise InputError("frame", frame, "'body' or 'datum'")
    try:
        m = np.asarray(masses, dtype=float)
        p = np.asarray(positions, dtype=float)
    except (TypeError, ValueError):
        raise MassPropertiesError("masses", masses, "numbers") from None
    if m.ndim != 1 or m.size == 0:
        raise MassPropertiesError("masses", masses, "a non-empty list of masses in kg")
    n = m.size
    if p.shape != (n, 3):
        raise MassPropertiesError("positions", f"shape {p.shape}",
                                  f"shape ({n}, 3): an (x, y, z) per item")
    for i in range(n):
        if not math.isfinite(m[i]) or m[i] < 0:
            raise MassPropertiesError(f"masses[{i}]", float(m[i]), "a finite mass of 0 kg or more")
        if not np.all(np.isfinite(p[i])):
            raise MassPropertiesError(f"positions[{i}]", p[i].tolist(), "finite arms in m")
    total = float(m.sum())
    if total <= 0:
        raise MassPropertiesError("masses", m.tolist(), "masses whose total is greater than 0 kg")
    own = np.zeros((n, 3, 3)) if own_tensors is None else _check_own(own_tensors, n)
    cg = (m @ p) / total
    r = p - cg
    r2 = np.einsum("ij,ij->i", r, r)
    parallel = m[:, None, None] * (r2[:, None, None] * np.eye(3) - r[:, :, None] * r[:, None, :])
    contrib = own + parallel
    if frame == "body":
        contrib = to_body_axes(contrib)
    tensor = contrib.sum(axis=0)
    tensor = 0.5 * (tensor + tensor.T)
    cols = _tensor_to_columns(contrib)
    moments, axes = principal_axes(tensor)
    diag = np.diag(tensor)
    return InertiaResult(
        frame=frame,
        convention=(BODY_AXES if frame == "body" else DATUM_AXES) + "; " + PRODUCT_CONVENTION,
        mass=total, cg=cg, tensor=tensor,
        Ixx=float(tensor[0, 0]), Iyy=float(tensor[1, 1]), Izz=float(tensor[2, 2]),
        Ixy_product=float(-tensor[0, 1]), Ixz_product=float(-tensor[0, 2]),
        Iyz_product=float(-tensor[1, 2]),
        principal_moments=moments, principal_axes=axes,
        radii_of_gyration=np.sqrt(np.maximum(diag, 0.0) / total),
        inclination=x_axis_inclination(tensor[0, 0], tensor[2, 2], -tensor[0, 2]),
        contributions=cols)


