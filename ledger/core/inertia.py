"""Moments and products of inertia: item shapes, build-up about the combined CG, body axes.

SI throughout: mass kg, lengths m, inertia kg·m².

Conventions (stated in every result)
------------------------------------
- **Datum axes**: x aft, y right, z up, as for arms (``frame="datum"``).
- **Body axes** about the CG: x_b forward, y_b right, z_b down;
  ``x_b = −(x − x_cg)``, ``y_b = y − y_cg``, ``z_b = −(z − z_cg)``: a proper rotation of 180°
  about y. Ixx, Iyy, Izz and Ixz are unchanged; Ixy and Iyz change sign (``frame="body"``).
- **Products of inertia** are reported in the positive-product convention used in flight
  dynamics, ``Ixy = Σ m·x·y`` (fields named ``*_product``). The inertia **tensor** holds the
  moments on its diagonal and the *negated* products off it: ``tensor[0, 1] = −Ixy``.

Sources
-------
- Own inertia of shapes about their centroid: standard tables (Beer & Johnston, Vector
  Mechanics for Engineers; common practice). Checked in the tests against symbolic integration
  (sympy) and against mesh integration (trimesh).
- Build-up by the parallel-axis theorem (SAWE practice):
  ``I_xx = Σ[I_xx,i + m_i(y_i² + z_i²)] − M(ȳ² + z̄²)``,
  ``I_xy = Σ[I_xy,i + m_i x_i y_i] − M x̄ ȳ``. Computed here from positions relative to the CG,
  which is the same sum without the cancellation of large terms.
- Estimate from nondimensional radii of gyration: Raymer, Aircraft Design: A Conceptual
  Approach, §16.7, eqs 16.52–16.54 (after Roskam).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ledger.errors import InputError, MassPropertiesError

__all__ = [
    "SHAPES",
    "PRODUCT_CONVENTION",
    "BODY_AXES",
    "DATUM_AXES",
    "CONTRIBUTION_COLUMNS",
    "shape_inertia",
    "to_body_axes",
    "principal_axes",
    "x_axis_inclination",
    "InertiaResult",
    "combined_inertia",
    "RAYMER_SOURCE",
    "GyrationEstimate",
    "estimate_from_gyration",
]

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

PRODUCT_CONVENTION = ("products of inertia in the positive-product convention Ixy = Σ m·x·y; "
                      "the inertia tensor's off-diagonal terms are −Ixy")
BODY_AXES = ("body axes about the CG: x forward, y right, z down "
             "(x_b = −(x − x_cg), y_b = y − y_cg, z_b = −(z − z_cg))")
DATUM_AXES = "datum axes through the CG: x aft, y right, z up"

#: Columns of :attr:`InertiaResult.contributions`.
CONTRIBUTION_COLUMNS = ("Ixx", "Iyy", "Izz", "Ixy_product", "Ixz_product", "Iyz_product")

_AXES = {"x": 0, "y": 1, "z": 2}
# The 180° rotation about y from datum-parallel axes to body axes (its own inverse).
_TO_BODY = np.diag([-1.0, 1.0, -1.0])


def _positive(value, field: str, *, allow_zero: bool = True) -> float:
    allowed = "a finite length in m of 0 or more" if allow_zero else \
        "a finite length in m greater than 0"
    try:
        v = float(value)
    except (TypeError, ValueError):
        raise InputError(field, value, allowed) from None
    if not math.isfinite(v) or v < 0 or (v == 0 and not allow_zero):
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


RAYMER_SOURCE = ("estimate from nondimensional radii of gyration: Raymer, Aircraft Design: "
                 "A Conceptual Approach, §16.7, eqs 16.52–16.54 (after Roskam): "
                 "Ixx = b²·M·Rx²/4, Iyy = L²·M·Ry²/4, Izz = ((b + L)/2)²·M·Rz²/4")


@dataclass(frozen=True)
class GyrationEstimate:
    """Moments of inertia estimated from nondimensional radii of gyration (body axes).

    ``estimated`` is always True: these are not measured or built-up figures. Products of
    inertia are not estimated.
    """

    Ixx: float
    Iyy: float
    Izz: float
    mass: float
    span: float
    length: float
    rx: float
    ry: float
    rz: float
    estimated: bool = True
    frame: str = "body"
    source: str = RAYMER_SOURCE


def estimate_from_gyration(mass: float, span: float, length: float, rx: float, ry: float,
                           rz: float) -> GyrationEstimate:
    """Estimate Ixx, Iyy, Izz of a whole aircraft from nondimensional radii of gyration.

    ``Ixx = b²·M·Rx²/4``, ``Iyy = L²·M·Ry²/4``, ``Izz = ((b + L)/2)²·M·Rz²/4``, that is
    ``(b + L)²·M·Rz²/16`` (Raymer §16.7, eqs 16.52–16.54, in SI with mass instead of W/g).
    Some copies print the last with /8 instead of /16; this is the /16 form. Typical R values
    come from a table for the aircraft class (Raymer table 16.1); such a build-up is rough,
    so report it as an estimate.

    Parameters
    ----------
    mass : float
        Mass, kg, greater than 0.
    span, length : float
        Wing span b and overall length L, m, greater than 0.
    rx, ry, rz : float
        Nondimensional radii of gyration, greater than 0.

    Returns
    -------
    GyrationEstimate

    Examples
    --------
    >>> e = estimate_from_gyration(1000.0, 10.0, 8.0, 0.25, 0.38, 0.39)
    >>> round(e.Ixx, 6), round(e.Iyy, 6), round(e.Izz, 6), e.estimated
    (1562.5, 2310.4, 3080.025, True)
    """
    vals = {}
    for name, v in (("mass", mass), ("span", span), ("length", length), ("rx", rx), ("ry", ry),
                    ("rz", rz)):
        try:
            f = float(v)
        except (TypeError, ValueError):
            f = float("nan")
        if not math.isfinite(f) or f <= 0:
            allowed = ("a finite mass in kg greater than 0" if name == "mass" else
                       "a finite length in m greater than 0" if name in ("span", "length") else
                       "a finite nondimensional radius of gyration greater than 0")
            err = MassPropertiesError if name == "mass" else InputError
            raise err(name, v, allowed)
        vals[name] = f
    b, L, M = vals["span"], vals["length"], vals["mass"]
    return GyrationEstimate(
        Ixx=b * b * M * vals["rx"] ** 2 / 4.0,
        Iyy=L * L * M * vals["ry"] ** 2 / 4.0,
        Izz=((b + L) / 2.0) ** 2 * M * vals["rz"] ** 2 / 4.0,
        mass=M, span=b, length=L, rx=vals["rx"], ry=vals["ry"], rz=vals["rz"])
