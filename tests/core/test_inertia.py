"""Tests for ledger.core.inertia: sympy and trimesh as oracles, properties with Hypothesis.

Oracles: sympy integrates the uniform density exactly; trimesh integrates closed meshes
(``mesh.moment_inertia`` is the tensor about ``mesh.center_mass`` for density 1, i.e. mass equal
to the volume; off-diagonal terms are −products, as checked below).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import sympy as sp
import trimesh
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra import numpy as hnp

from ledger.core.inertia import (
    CONTRIBUTION_COLUMNS,
    combined_inertia,
    estimate_from_gyration,
    principal_axes,
    shape_inertia,
    to_body_axes,
    x_axis_inclination,
)
from ledger.errors import InputError, MassPropertiesError
from ledger.testing import assert_close

X, Y, Z = sp.symbols("x y z", real=True)
RHO, PHI, THETA = sp.symbols("rho phi theta", nonnegative=True)


def _sym_tensor(density, integrand_jacobian, limits, about=(0, 0, 0), coords=None):
    """Exact tensor [[Ixx, −Ixy, −Ixz], …] about ``about`` for a uniform density.

    ``coords`` gives (x, y, z) in terms of the integration variables (Cartesian by default);
    ``integrand_jacobian`` is the volume element factor.
    """
    cx, cy, cz = coords if coords is not None else (X, Y, Z)
    rx, ry, rz = cx - about[0], cy - about[1], cz - about[2]

    def integ(f):
        return sp.simplify(sp.integrate(density * f * integrand_jacobian, *limits))

    ixx, iyy, izz = integ(ry**2 + rz**2), integ(rx**2 + rz**2), integ(rx**2 + ry**2)
    pxy, pxz, pyz = integ(rx * ry), integ(rx * rz), integ(ry * rz)
    return sp.Matrix([[ixx, -pxy, -pxz], [-pxy, iyy, -pyz], [-pxz, -pyz, izz]])


# --- own inertia of shapes: sympy ------------------------------------------------------------

def test_box_against_symbolic_integration():
    m, a, b, c = sp.symbols("m a b c", positive=True)
    t = _sym_tensor(m / (a * b * c), 1, [(X, -a / 2, a / 2), (Y, -b / 2, b / 2),
                                         (Z, -c / 2, c / 2)])
    # Beer & Johnston table: Ixx = m(b² + c²)/12 and cyclic; products 0 (symmetry).
    assert sp.simplify(t[0, 0] - m * (b**2 + c**2) / 12) == 0
    assert sp.simplify(t[1, 1] - m * (a**2 + c**2) / 12) == 0
    assert t[0, 1] == 0 and t[0, 2] == 0 and t[1, 2] == 0
    vals = {m: 7.5, a: 0.4, b: 1.3, c: 2.2}
    expected = np.array(t.subs(vals), dtype=float)
    assert_close(shape_inertia("box", 7.5, a=0.4, b=1.3, c=2.2), expected, unit="kg·m²",
                 rtol=1e-13, what="box tensor", source="sympy integration")


def _cylinder_symbolic(inner=False):
    m, r_o, h = sp.symbols("m R h", positive=True)
    r_i = sp.Symbol("r", positive=True) if inner else sp.Integer(0)
    vol = sp.pi * (r_o**2 - r_i**2) * h
    # Axis along z: x = ρ cos φ, y = ρ sin φ; volume element ρ dρ dφ dz.
    t = _sym_tensor(m / vol, RHO, [(RHO, r_i, r_o), (PHI, 0, 2 * sp.pi), (Z, -h / 2, h / 2)],
                    coords=(RHO * sp.cos(PHI), RHO * sp.sin(PHI), Z))
    return t, m, r_o, r_i, h


def test_solid_cylinder_against_symbolic_integration():
    t, m, r, _, h = _cylinder_symbolic()
    # Tables: m r²/2 about the axis, m(3r² + h²)/12 transverse.
    assert sp.simplify(t[2, 2] - m * r**2 / 2) == 0
    assert sp.simplify(t[0, 0] - m * (3 * r**2 + h**2) / 12) == 0
    for axis, k in (("x", 0), ("y", 1), ("z", 2)):
        got = shape_inertia("cylinder", 3.0, axis=axis, r=0.25, h=1.7)
        axial = float(t[2, 2].subs({m: 3.0, r: 0.25, h: 1.7}))
        transverse = float(t[0, 0].subs({m: 3.0, r: 0.25, h: 1.7}))
        expected = np.full(3, transverse)
        expected[k] = axial
        assert_close(got, np.diag(expected), unit="kg·m²", rtol=1e-13,
                     what=f"cylinder along {axis}", source="sympy integration")


def test_hollow_cylinder_against_symbolic_integration():
    t, m, R, r, h = _cylinder_symbolic(inner=True)
    # Tables: m(R² + r²)/2 axial, m(3(R² + r²) + h²)/12 transverse.
    assert sp.simplify(t[2, 2] - m * (R**2 + r**2) / 2) == 0
    assert sp.simplify(t[0, 0] - m * (3 * (R**2 + r**2) + h**2) / 12) == 0
    vals = {m: 2.0, R: 0.3, r: 0.2, h: 0.9}
    got = shape_inertia("hollow_cylinder", 2.0, axis="z", R=0.3, r=0.2, h=0.9)
    assert_close(got, np.array(t.subs(vals), dtype=float), unit="kg·m²", rtol=1e-13,
                 what="hollow cylinder", source="sympy integration")


def test_disk_and_rod_are_limits_of_the_cylinder():
    t, m, r, _, h = _cylinder_symbolic()
    # Thin disk: h → 0 gives m r²/4 about a diameter; slender rod: r → 0 gives m h²/12.
    disk_diam = sp.limit(t[0, 0], h, 0)
    rod_trans = sp.limit(t[0, 0], r, 0)
    assert sp.simplify(disk_diam - m * r**2 / 4) == 0
    assert sp.limit(t[2, 2], r, 0) == 0
    got = shape_inertia("disk", 4.0, axis="y", r=0.6)
    assert_close(got.diagonal(), [float(disk_diam.subs({m: 4, r: 0.6})),
                                  float(t[2, 2].subs({m: 4, r: 0.6})),
                                  float(disk_diam.subs({m: 4, r: 0.6}))],
                 unit="kg·m²", rtol=1e-13, what="disk", source="sympy limit")
    got = shape_inertia("rod", 4.0, axis="x", L=2.5)
    assert_close(got.diagonal(), [0.0, float(rod_trans.subs({m: 4, h: 2.5})),
                                  float(rod_trans.subs({m: 4, h: 2.5}))],
                 unit="kg·m²", rtol=1e-13, what="rod", source="sympy limit")


def test_sphere_against_symbolic_integration():
    m, r = sp.symbols("m r", positive=True)
    coords = (RHO * sp.sin(THETA) * sp.cos(PHI), RHO * sp.sin(THETA) * sp.sin(PHI),
              RHO * sp.cos(THETA))
    t = _sym_tensor(m / (sp.Rational(4, 3) * sp.pi * r**3), RHO**2 * sp.sin(THETA),
                    [(RHO, 0, r), (THETA, 0, sp.pi), (PHI, 0, 2 * sp.pi)], coords=coords)
    assert sp.simplify(t[0, 0] - sp.Rational(2, 5) * m * r**2) == 0   # 2 m r²/5
    assert_close(shape_inertia("sphere", 9.0, r=0.35),
                 np.array(t.subs({m: 9.0, r: 0.35}), dtype=float), unit="kg·m²", rtol=1e-13,
                 what="sphere", source="sympy integration")


def test_point_mass_has_no_own_inertia():
    assert np.all(shape_inertia("point", 12.0) == 0)


# --- parallel axis: sympy ---------------------------------------------------------------------

def test_parallel_axis_matches_direct_symbolic_integration_of_two_boxes():
    # Two boxes at general offsets. The oracle integrates the density directly about the
    # combined CG (no theorem used); the SAWE build-up formula must equal it symbolically.
    m1, m2 = sp.Rational(30), sp.Rational(12)
    dims1 = (sp.Rational(1, 2), sp.Rational(3, 2), sp.Rational(1, 3))
    dims2 = (sp.Rational(2, 5), sp.Rational(1, 5), sp.Rational(6, 5))
    p1 = sp.symbols("p1x p1y p1z", real=True)
    p2 = sp.symbols("p2x p2y p2z", real=True)

    def limits(p, d):
        return [(X, p[0] - d[0] / 2, p[0] + d[0] / 2), (Y, p[1] - d[1] / 2, p[1] + d[1] / 2),
                (Z, p[2] - d[2] / 2, p[2] + d[2] / 2)]

    rho1 = m1 / (dims1[0] * dims1[1] * dims1[2])
    rho2 = m2 / (dims2[0] * dims2[1] * dims2[2])
    M = m1 + m2
    cg = [sp.simplify((sp.integrate(rho1 * c, *limits(p1, dims1))
                       + sp.integrate(rho2 * c, *limits(p2, dims2))) / M) for c in (X, Y, Z)]
    direct = (_sym_tensor(rho1, 1, limits(p1, dims1), about=cg)
              + _sym_tensor(rho2, 1, limits(p2, dims2), about=cg))
    # SAWE build-up: I_xx = Σ[I_xx,i + m_i(y_i² + z_i²)] − M(ȳ² + z̄²),
    #                I_xy = Σ[I_xy,i + m_i x_i y_i] − M x̄ ȳ   (I_xy,i = 0 for these boxes)
    own1 = [m1 * (dims1[1]**2 + dims1[2]**2) / 12, m1 * (dims1[0]**2 + dims1[2]**2) / 12]
    own2 = [m2 * (dims2[1]**2 + dims2[2]**2) / 12, m2 * (dims2[0]**2 + dims2[2]**2) / 12]
    sawe_xx = (own1[0] + m1 * (p1[1]**2 + p1[2]**2) + own2[0] + m2 * (p2[1]**2 + p2[2]**2)
               - M * (cg[1]**2 + cg[2]**2))
    sawe_xy = m1 * p1[0] * p1[1] + m2 * p2[0] * p2[1] - M * cg[0] * cg[1]
    assert sp.simplify(direct[0, 0] - sawe_xx) == 0
    assert sp.simplify(-direct[0, 1] - sawe_xy) == 0
    # And the module, in datum axes, at numeric offsets.
    vals1, vals2 = (1.2, -0.4, 0.3), (-2.0, 0.9, 1.1)
    subs = dict(zip(p1 + p2, vals1 + vals2))
    expected = np.array(direct.subs(subs), dtype=float)
    own = [shape_inertia("box", 30.0, a=0.5, b=1.5, c=1 / 3),
           shape_inertia("box", 12.0, a=0.4, b=0.2, c=1.2)]
    r = combined_inertia([30.0, 12.0], [vals1, vals2], own, frame="datum")
    assert_close(r.tensor, expected, unit="kg·m²", rtol=1e-12, atol=1e-12,
                 what="combined tensor", source="sympy direct integration")
    assert_close(r.cg, np.array([float(c.subs(subs)) for c in cg]), unit="m", rtol=1e-13,
                 what="CG")
    assert_close(r.Ixy_product, -expected[0, 1], unit="kg·m²", rtol=1e-12, what="Ixy_product")


# --- trimesh as oracle ------------------------------------------------------------------------

def _polygon_polar_per_area(radius: float, n: int) -> float:
    """J/A of a regular n-gon of circumradius R about its centre: R²(1 + 2cos²(π/n))/6.

    trimesh cylinders are prisms on an inscribed regular polygon. The n triangles from the centre
    each have J = (A/6)(|u|² + |v|² + u·v) about the apex, with |u| = |v| = R and
    u·v = R² cos(2π/n); that sums to the expression above, which → R²/2 as n → ∞.
    """
    return radius**2 * (1 + 2 * math.cos(math.pi / n) ** 2) / 6


def test_box_against_trimesh():
    mesh = trimesh.creation.box(extents=(0.6, 1.4, 2.0))
    expected = mesh.moment_inertia * (25.0 / mesh.volume)  # density 1 → scale to 25 kg
    assert_close(shape_inertia("box", 25.0, a=0.6, b=1.4, c=2.0), expected, unit="kg·m²",
                 rtol=1e-12, atol=1e-12, what="box", source="trimesh mesh integration")


@pytest.mark.parametrize("sections", [64, 512])
def test_cylinder_against_trimesh(sections):
    r, h, m = 0.45, 1.6, 10.0
    mesh = trimesh.creation.cylinder(radius=r, height=h, sections=sections)  # axis along z
    per_mass = mesh.moment_inertia / mesh.volume
    # 1) The faceted mesh agrees with the exact polygon-prism value to rounding: this pins the
    #    oracle itself.
    j = _polygon_polar_per_area(r, sections)
    assert_close(per_mass.diagonal(), [j / 2 + h * h / 12, j / 2 + h * h / 12, j], unit="m²",
                 rtol=1e-10, what="trimesh prism")
    # 2) Against the round cylinder the facets lower r² by the factor (1 + 2cos²(π/n))/3, a
    #    relative error (2/3)·sin²(π/n): 1.6e-3 at 64 sections, 2.5e-5 at 512. Allow that bound.
    rel = (2 / 3) * math.sin(math.pi / sections) ** 2 * 1.01
    assert_close(shape_inertia("cylinder", m, axis="z", r=r, h=h), m * per_mass, unit="kg·m²",
                 rtol=rel, atol=1e-12, what=f"cylinder, {sections} sections",
                 source="trimesh mesh integration")


def test_hollow_cylinder_against_trimesh():
    R, r, h, m, n = 0.5, 0.3, 1.0, 6.0, 512
    mesh = trimesh.creation.annulus(r_min=r, r_max=R, height=h, sections=n)
    per_mass = mesh.moment_inertia / mesh.volume
    rel = (2 / 3) * math.sin(math.pi / n) ** 2 * 1.01  # same facet bound as the solid cylinder
    assert_close(shape_inertia("hollow_cylinder", m, axis="z", R=R, r=r, h=h), m * per_mass,
                 unit="kg·m²", rtol=rel, atol=1e-12, what="hollow cylinder",
                 source="trimesh annulus")


def test_offset_items_against_trimesh_concatenation():
    # Boxes and a cylinder at offsets (density 1 everywhere, so each mass is its volume); the
    # concatenated mesh's tensor about its centre of mass is the oracle. The products from the
    # offsets check the sign convention: trimesh's tensor has −Σ m·x·y off the diagonal.
    specs = [("box", dict(a=0.8, b=0.5, c=0.4), (1.0, 0.5, -0.3), "x"),
             ("box", dict(a=0.3, b=1.2, c=0.6), (-1.5, -0.8, 0.9), "x"),
             ("cylinder", dict(r=0.2, h=1.5), (0.4, 1.6, 0.2), "x")]
    n_sec = 1024
    meshes, masses, pos, own = [], [], [], []
    for shape, dims, p, axis in specs:
        if shape == "box":
            mesh = trimesh.creation.box(extents=(dims["a"], dims["b"], dims["c"]))
        else:
            mesh = trimesh.creation.cylinder(radius=dims["r"], height=dims["h"], sections=n_sec)
            # trimesh builds it along z; turn it to lie along x.
            mesh.apply_transform(trimesh.transformations.rotation_matrix(math.pi / 2, [0, 1, 0]))
        mesh.apply_translation(p)
        meshes.append(mesh)
        masses.append(mesh.volume)
        pos.append(mesh.center_mass)
        own.append(shape_inertia(shape, mesh.volume, axis=axis, **dims))
    union = trimesh.util.concatenate(meshes)
    r = combined_inertia(masses, pos, own, frame="datum")
    assert_close(r.mass, union.volume, unit="m³", rtol=1e-12, what="mass (= volume)")
    assert_close(r.cg, union.center_mass, unit="m", rtol=1e-12, atol=1e-12, what="CG")
    # Only the cylinder's own r² terms carry the facet error (2/3)sin²(π/n) ≈ 6e-6 of a small
    # part of the total; 1e-6 relative to the largest moment covers it.
    scale = np.abs(union.moment_inertia).max()
    assert_close(r.tensor, union.moment_inertia, unit="kg·m²", atol=1e-6 * scale,
                 what="tensor", source="trimesh concatenated mesh")
    assert r.Ixy_product == pytest.approx(-union.moment_inertia[0, 1], rel=1e-5)


# --- properties: point clouds -----------------------------------------------------------------

def _direct_tensor(m, p):
    c = m @ p / m.sum()
    r = p - c
    t = np.zeros((3, 3))
    for mi, ri in zip(m, r):
        t += mi * (ri @ ri * np.eye(3) - np.outer(ri, ri))
    return c, t


clouds = st.integers(1, 8).flatmap(lambda n: st.tuples(
    hnp.arrays(float, n, elements=st.floats(0.1, 100.0)),
    hnp.arrays(float, (n, 3), elements=st.floats(-10.0, 10.0))))


@settings(max_examples=100, deadline=None)
@given(cloud=clouds)
def test_parallel_axis_equals_direct_sum_over_point_cloud(cloud):
    m, p = cloud
    c, t = _direct_tensor(m, p)
    r = combined_inertia(m, p, frame="datum")
    scale = max(float(np.abs(t).max()), float(m.sum()) * 1e-6)
    assert_close(r.cg, c, unit="m", rtol=1e-12, atol=1e-12, what="CG")
    assert_close(r.tensor, t, unit="kg·m²", atol=1e-10 * scale, what="tensor")


@settings(max_examples=100, deadline=None)
@given(cloud=clouds)
def test_body_axes_by_definition(cloud):
    # Body axes by the definition x_b = −(x − x_cg), y_b = y − y_cg, z_b = −(z − z_cg):
    # computing the tensor directly in those coordinates must equal the body-frame result.
    m, p = cloud
    c = m @ p / m.sum()
    pb = np.column_stack([-(p[:, 0] - c[0]), p[:, 1] - c[1], -(p[:, 2] - c[2])])
    _, tb = _direct_tensor(m, pb)
    body = combined_inertia(m, p)            # frame="body" is the default
    datum = combined_inertia(m, p, frame="datum")
    scale = max(float(np.abs(tb).max()), float(m.sum()) * 1e-6)
    assert body.frame == "body"
    assert_close(body.tensor, tb, unit="kg·m²", atol=1e-10 * scale, what="body tensor")
    # A 180° rotation about y: Ixx, Iyy, Izz, Ixz unchanged; Ixy, Iyz change sign.
    for name in ("Ixx", "Iyy", "Izz", "Ixz_product"):
        assert getattr(body, name) == pytest.approx(getattr(datum, name), abs=1e-10 * scale)
    assert body.Ixy_product == pytest.approx(-datum.Ixy_product, abs=1e-10 * scale)
    assert body.Iyz_product == pytest.approx(-datum.Iyz_product, abs=1e-10 * scale)
    assert_close(body.principal_moments, datum.principal_moments, unit="kg·m²",
                 atol=1e-9 * scale, what="principal moments")


@settings(max_examples=100, deadline=None)
@given(cloud=clouds)
def test_principal_axes_are_sorted_orthonormal_right_handed(cloud):
    m, p = cloud
    r = combined_inertia(m, p)
    w, v = r.principal_moments, r.principal_axes
    scale = max(float(np.abs(r.tensor).max()), 1e-9)
    assert np.all(np.diff(w) >= -1e-12 * scale)
    assert_close(v.T @ v, np.eye(3), unit="", atol=1e-10, what="orthonormal")
    assert np.linalg.det(v) == pytest.approx(1.0, abs=1e-10)
    assert_close(r.tensor @ v, v * w, unit="kg·m²", atol=1e-9 * scale, what="T·v = λ·v")


@settings(max_examples=50, deadline=None)
@given(cloud=clouds, shift=hnp.arrays(float, 3, elements=st.floats(-20.0, 20.0)))
def test_moving_every_item_moves_the_cg_not_the_inertia(cloud, shift):
    m, p = cloud
    a = combined_inertia(m, p)
    b = combined_inertia(m, p + shift)
    scale = max(float(np.abs(a.tensor).max()), float(m.sum()) * 1e-6)
    assert_close(b.cg, a.cg + shift, unit="m", atol=1e-9, what="CG")
    assert_close(b.tensor, a.tensor, unit="kg·m²", atol=1e-9 * scale, what="tensor")


def test_contributions_sum_to_totals_and_rank_items():
    own = [shape_inertia("box", 200.0, a=1.0, b=1.0, c=1.0), np.zeros((3, 3)),
           shape_inertia("rod", 10.0, axis="y", L=10.0)]
    r = combined_inertia([200.0, 50.0, 10.0], [[2.0, 0.0, 0.0], [6.0, 0.3, -0.2],
                                               [2.5, 0.0, 0.1]], own)
    totals = [r.Ixx, r.Iyy, r.Izz, r.Ixy_product, r.Ixz_product, r.Iyz_product]
    assert r.contributions.shape == (3, 6)
    assert_close(r.contributions.sum(axis=0), totals, unit="kg·m²", rtol=1e-12, atol=1e-12,
                 what="contributions")
    iyy = CONTRIBUTION_COLUMNS.index("Iyy")
    ixx = CONTRIBUTION_COLUMNS.index("Ixx")
    # The 50 kg item 4 m aft of the main mass dominates pitch; the 10 m rod along y dominates roll.
    assert int(np.argmax(r.contributions[:, iyy])) == 1
    assert int(np.argmax(r.contributions[:, ixx])) == 2
    assert r.ranked("Iyy")[0] == 1 and r.ranked("Ixx")[0] == 2
    with pytest.raises(InputError, match="column = 'Ixx_product': one of 'Ixx'"):
        r.ranked("Ixx_product")


# --- inclination of the principal x axis ------------------------------------------------------

@pytest.mark.parametrize("deg", [-30.0, -5.0, 0.0, 7.0, 25.0])
def test_inclination_sign_convention(deg):
    # Slender line of masses along (cos φ, 0, sin φ) in body axes (z down): φ > 0 puts the
    # forward end low. ε must equal φ, and the least-moment principal axis must be
    # (cos ε, 0, sin ε) (eigen-decomposition by numpy.linalg.eigh).
    phi = math.radians(deg)
    s = np.linspace(-3.0, 3.0, 7)
    body_pts = np.column_stack([s * math.cos(phi), np.zeros_like(s), s * math.sin(phi)])
    datum_pts = np.column_stack([-body_pts[:, 0], body_pts[:, 1], -body_pts[:, 2]]) + [4, 0, 1]
    # Side masses off the plane give the body some roll inertia without products.
    side = np.array([[4.0, 1.0, 1.0], [4.0, -1.0, 1.0]])
    r = combined_inertia(np.r_[np.ones(7), [0.5, 0.5]], np.vstack([datum_pts, side]))
    assert r.Ixy_product == pytest.approx(0.0, abs=1e-12)
    assert math.degrees(r.inclination) == pytest.approx(deg, abs=1e-9)
    axis = r.principal_axes[:, 0]
    expected = np.array([math.cos(r.inclination), 0.0, math.sin(r.inclination)])
    assert abs(abs(axis @ expected) - 1.0) < 1e-12


def test_inclination_function_matches_eigh_for_general_xz_tensor():
    ixx, izz, ixz = 1200.0, 3400.0, 150.0
    eps = x_axis_inclination(ixx, izz, ixz)
    t = np.array([[ixx, 0.0, -ixz], [0.0, 2500.0, 0.0], [-ixz, 0.0, izz]])
    w, v = principal_axes(t)
    assert abs(abs(v[:, 0] @ [math.cos(eps), 0.0, math.sin(eps)]) - 1.0) < 1e-12
    assert eps > 0  # positive Ixz product: the axis leans toward +z


def test_to_body_axes_signs_and_involution():
    t = np.array([[10.0, -1.0, -2.0], [-1.0, 20.0, -3.0], [-2.0, -3.0, 25.0]])
    b = to_body_axes(t)
    assert b[0, 1] == -t[0, 1] and b[1, 2] == -t[1, 2] and b[0, 2] == t[0, 2]
    assert np.all(np.diag(b) == np.diag(t))
    assert np.array_equal(to_body_axes(b), t)


# --- Raymer estimate --------------------------------------------------------------------------

def test_estimate_from_gyration_raymer_formulas():
    # Raymer, Aircraft Design, §16.7 eqs 16.52–16.54: Ixx = b²MRx²/4, Iyy = L²MRy²/4,
    # Izz = ((b + L)/2)²·M·Rz²/4 = (b + L)²·M·Rz²/16. Hand computation for M = 1,200 kg,
    # b = 11 m, L = 8.5 m, R = 0.25, 0.38, 0.39:
    # Ixx = 121·1200·0.0625/4 = 2268.75; Iyy = 72.25·1200·0.1444/4 = 3129.87;
    # Izz = 380.25·1200·0.1521/16 = 4337.6..., half of the /8 misprint.
    e = estimate_from_gyration(1200.0, 11.0, 8.5, 0.25, 0.38, 0.39)
    assert_close(e.Ixx, 2268.75, unit="kg·m²", rtol=1e-14, what="Ixx", source="Raymer eq 16.52")
    assert_close(e.Iyy, 3129.87, unit="kg·m²", rtol=1e-14, what="Iyy", source="Raymer eq 16.53")
    assert_close(e.Izz, 380.25 * 1200 * 0.1521 / 16, unit="kg·m²", rtol=1e-14, what="Izz",
                 source="Raymer eq 16.54")
    misprint = (11.0 + 8.5) ** 2 * 1200 * 0.39**2 / 8
    assert e.Izz == pytest.approx(misprint / 2, rel=1e-14)
    assert e.estimated is True and e.frame == "body"
    assert "Raymer" in e.source and "estimate" in e.source


# --- errors -----------------------------------------------------------------------------------

@pytest.mark.parametrize("call, exc, text", [
    (lambda: shape_inertia("cone", 1.0, r=1.0), InputError,
     "shape = 'cone': one of 'point', 'box', 'cylinder', 'hollow_cylinder', 'disk', 'rod', "
     "'sphere'"),
    (lambda: shape_inertia("cylinder", 1.0, r=1.0), InputError,
     "cylinder.h = None: a length in m; a cylinder takes r, h"),
    (lambda: shape_inertia("sphere", 1.0, r=1.0, h=2.0), InputError,
     "sphere.h = 2: no such dimension; a sphere takes r"),
    (lambda: shape_inertia("hollow_cylinder", 1.0, R=0.2, r=0.3, h=1.0), InputError,
     "hollow_cylinder.r = 0.3: an inner radius of at most the outer radius R = 0.2 m"),
    (lambda: shape_inertia("box", -1.0, a=1, b=1, c=1), MassPropertiesError,
     "mass = -1: a finite mass of 0 kg or more"),
    (lambda: shape_inertia("rod", 1.0, axis="w", L=1.0), InputError,
     "axis = 'w': one of 'x', 'y', 'z'"),
    (lambda: combined_inertia([1.0, -2.0], [[0, 0, 0], [1, 0, 0]]), MassPropertiesError,
     "masses[1] = -2: a finite mass of 0 kg or more"),
    (lambda: combined_inertia([0.0], [[0, 0, 0]]), MassPropertiesError,
     "masses = [0.0]: masses whose total is greater than 0 kg"),
    (lambda: combined_inertia([1.0], [[0, 0, 0]], frame="stability"), InputError,
     "frame = 'stability': 'body' or 'datum'"),
    (lambda: estimate_from_gyration(1000.0, 0.0, 8.0, 0.2, 0.3, 0.4), InputError,
     "span = 0: a finite length in m greater than 0"),
])
def test_errors(call, exc, text):
    with pytest.raises(exc) as err:
        call()
    assert str(err.value) == text


def test_non_physical_own_tensor_is_refused():
    # Positive off-diagonal "products" typed into a tensor slot: eigenvalues break the triangle
    # inequality (or go negative), so the tensor is refused with a hint about the sign.
    bad = np.array([[1.0, 5.0, 0.0], [5.0, 1.0, 0.0], [0.0, 0.0, 2.0]])
    with pytest.raises(MassPropertiesError, match=r"own_tensors\[0\].*off-diagonal tensor "
                                                  r"terms are −products"):
        combined_inertia([1.0], [[0, 0, 0]], [bad])
    with pytest.raises(MassPropertiesError, match="a symmetric tensor"):
        combined_inertia([1.0], [[0, 0, 0]], [[[1, 0.5, 0], [0, 1, 0], [0, 0, 1]]])
