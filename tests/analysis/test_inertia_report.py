"""The loaded-inertia report against outside references.

References used here:

- trimesh (mesh integration of the volume integrals) as an oracle for boxes and cylinders at
  offsets. trimesh's primitives take their volume as their mass (density 1), so every mesh is
  given the density mass / volume before its inertia is read.
- sympy (exact symbolic integration over each box) as an oracle with rational figures.
- Raymer, Aircraft Design: A Conceptual Approach, §16.7, eqs 16.52–16.54: Ixx = b²·M·Rx²/4,
  Iyy = L²·M·Ry²/4, Izz = ((b + L)/2)²·M·Rz²/4 (some copies divide Izz by 8 instead of 16).
- The body-axes convention of the domain notes (x forward, y right, z down: a 180° rotation
  about y, so Ixy and Iyz change sign and Ixx, Iyy, Izz, Ixz do not).

Every vehicle here is invented for the test.
"""

from __future__ import annotations

import csv
import io
import json
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ledger.analysis.inertia import MassItem, inertia_document, phase_tank_masses, plan_mass_items
from ledger.caution import CAUTION
from ledger.errors import InputError, MassPropertiesError
from ledger.report.inertia import CSV_LAYOUTS, csv_quantities, inertia_csv, inertia_text
from ledger.testing import assert_close
from ledger.typedata import (
    ConfigItem,
    Configuration,
    GyrationInertia,
    MeasuredInertia,
    Shape,
    VehicleType,
    WeightLimits,
)
from ledger.units import DisplayUnits

# Datum axes (x aft, y right, z up) -> body axes (x forward, y right, z down): diag(-1, 1, -1)
# on both sides of the tensor (domain notes, "Axes and signs").
FLIP = np.diag([-1.0, 1.0, -1.0])


def vtype(inertia, configurations=()) -> VehicleType:
    """An invented airplane type with the given inertia data."""
    return VehicleType(name="TEST-1", title="invented test type", kind="airplane",
                       units=DisplayUnits("kg", "m", "L"), datum="test datum",
                       limits=WeightLimits(max_takeoff_kg=10000.0), inertia=inertia,
                       configurations=tuple(configurations))


def measured_from_datum_tensor(t_datum: np.ndarray) -> MeasuredInertia:
    """MeasuredInertia (body axes, positive products) of a datum-axes tensor."""
    b = FLIP @ t_datum @ FLIP
    return MeasuredInertia(b[0, 0], b[1, 1], b[2, 2], ixz_kg_m2=-b[0, 2], ixy_kg_m2=-b[0, 1],
                           iyz_kg_m2=-b[1, 2])


def flatten(text: str) -> str:
    """Terminal text without box-drawing characters, whitespace collapsed (for phrases that
    wrap across lines of a panel)."""
    return " ".join("".join(" " if "\u2500" <= ch <= "\u257f" else ch for ch in text).split())


def report_tensor(doc) -> np.ndarray:
    return np.array(doc["tensor_kgm2"]["rows"])


# --- trimesh as the oracle ----------------------------------------------------------------------

trimesh = pytest.importorskip("trimesh")


def _mesh(kind: str, mass: float, at, *, dims, axis="z", rotate_y_deg: float = 0.0):
    if kind == "box":
        m = trimesh.creation.box(extents=dims)
    else:
        r, h = dims
        m = trimesh.creation.cylinder(radius=r, height=h, sections=512)  # along z
        if axis == "x":
            m.apply_transform(trimesh.transformations.rotation_matrix(math.pi / 2, [0, 1, 0]))
        elif axis == "y":
            m.apply_transform(trimesh.transformations.rotation_matrix(math.pi / 2, [1, 0, 0]))
    if rotate_y_deg:
        m.apply_transform(trimesh.transformations.rotation_matrix(math.radians(rotate_y_deg),
                                                                  [0, 1, 0]))
    m.apply_translation(at)
    m.density = mass / m.volume  # trimesh takes the volume as the mass otherwise
    return m


def _oracle(meshes):
    """(mass, CG, datum-axes tensor about the CG) of meshes, by trimesh."""
    scene = trimesh.Scene(meshes)
    mass = sum(m.mass for m in meshes)
    cg = sum(m.mass * m.center_mass for m in meshes) / mass
    t = trimesh.transformations.translation_matrix(cg)
    return mass, cg, trimesh.inertia.scene_inertia(scene, t)


def test_boxes_and_cylinders_at_offsets_match_trimesh():
    # The empty vehicle: a box tilted 12° about y (so it has a product Ixz), "measured" by
    # trimesh; the loads: a box and three cylinders along x, y and z at offsets.
    empty = _mesh("box", 800.0, [2.0, 0.1, 0.5], dims=[4.0, 1.2, 1.0], rotate_y_deg=12.0)
    e_tensor = empty.moment_inertia  # about its own CG, datum-parallel axes
    parts = [
        ("crate", "box", 60.0, [1.0, -0.5, 0.8], {"kind": "box", "length_m": 0.6,
                                                   "width_m": 0.4, "height_m": 0.3}),
        ("drum", "cyl", 45.0, [3.5, 0.4, 0.2], {"kind": "cylinder", "radius_m": 0.3,
                                                "length_m": 1.0, "axis": "y"}),
        ("pipe", "cyl", 25.0, [0.5, 0.0, 1.4], {"kind": "cylinder", "radius_m": 0.15,
                                                "length_m": 2.0, "axis": "x"}),
        ("plate", "cyl", 10.0, [2.5, 0.6, -0.2], {"kind": "cylinder", "radius_m": 0.4,
                                                  "length_m": 0.1, "axis": "z"}),
    ]
    meshes = [empty]
    loads = []
    for name, kind, m, at, shape in parts:
        if kind == "box":
            meshes.append(_mesh("box", m, at, dims=[shape["length_m"], shape["width_m"],
                                                    shape["height_m"]]))
        else:
            meshes.append(_mesh("cyl", m, at, dims=(shape["radius_m"], shape["length_m"]),
                                axis=shape["axis"]))
        loads.append(MassItem(name, "cargo", m, *at, shape=shape))
    doc = inertia_document(vtype(measured_from_datum_tensor(e_tensor)), 800.0,
                           tuple(empty.center_mass), loads=loads)
    mass, cg, t_datum = _oracle(meshes)
    expected_body = FLIP @ t_datum @ FLIP
    src = "trimesh scene_inertia about the combined CG"
    assert_close(doc["mass_kg"], mass, unit="kg", rtol=1e-12, what="mass", source=src)
    assert_close([doc["cg_m"][a] for a in "xyz"], cg, unit="m", atol=1e-9, what="CG",
                 source=src)
    # Cylinders are 512-sided prisms in trimesh: their inertia differs from the round
    # cylinder's by about (2π/512)²/6 ≈ 3e-5 relative, hence the tolerance.
    scale = float(np.abs(expected_body).max())
    assert_close(report_tensor(doc), expected_body, unit="kg*m2", atol=2e-4 * scale,
                 what="tensor, body axes", source=src)
    # The labelled products are the negated off-diagonal terms (positive-product convention).
    p = doc["products_kgm2"]
    assert_close([p["Ixy"], p["Ixz"], p["Iyz"]],
                 [-expected_body[0, 1], -expected_body[0, 2], -expected_body[1, 2]],
                 unit="kg*m2", atol=2e-4 * scale, what="products", source=src)
    assert abs(p["Ixz"]) > 1.0  # the tilted empty box makes a product worth checking
    w = np.linalg.eigvalsh(expected_body)
    assert_close(doc["principal"]["moments_kgm2"], w, unit="kg*m2", atol=2e-4 * scale,
                 what="principal moments", source="numpy eigvalsh of the trimesh tensor")


def test_configuration_removal_takes_the_item_out_of_the_measured_tensor():
    # As weighed the vehicle is a box plus a seat block; the type's "measured" tensor is that of
    # the pair. A remove configuration takes the seat out: what is left must be the box alone.
    body = _mesh("box", 900.0, [2.2, 0.0, 0.6], dims=[5.0, 1.4, 1.2])
    seat = _mesh("box", 40.0, [3.1, -0.4, 0.9], dims=[0.5, 0.5, 0.9])
    m_pair, cg_pair, t_pair = _oracle([body, seat])
    cfg = Configuration("seat out", "remove", "invented", items=(
        ConfigItem("seat", 40.0, 3.1, -0.4, 0.9,
                   Shape("box", length_m=0.5, width_m=0.5, height_m=0.9)),))
    doc = inertia_document(vtype(measured_from_datum_tensor(t_pair), [cfg]), m_pair,
                           tuple(cg_pair), configuration=cfg)
    mass, cg, t_body = _oracle([body])
    src = "trimesh: the box alone"
    assert_close(doc["mass_kg"], mass, unit="kg", rtol=1e-12, what="mass", source=src)
    assert_close([doc["cg_m"][a] for a in "xyz"], cg, unit="m", atol=1e-9, what="CG",
                 source=src)
    assert_close(report_tensor(doc), FLIP @ t_body @ FLIP, unit="kg*m2", atol=1e-7,
                 what="tensor after removal", source=src)


# --- sympy as the oracle ------------------------------------------------------------------------

sympy = pytest.importorskip("sympy")


def test_boxes_and_a_point_mass_match_exact_integration():
    S = sympy.Rational
    x, y, z = sympy.symbols("x y z", real=True)
    # (mass, centre, extents) with rational figures; one point mass (a person)
    boxes = [(S(500), (S(3, 2), S(0), S(1, 2)), (S(3), S(1), S(1))),
             (S(80), (S(1, 2), S(-1, 2), S(1)), (S(1, 2), S(1, 2), S(2, 5))),
             (S(35), (S(12, 5), S(7, 10), S(-1, 5)), (S(2, 5), S(3, 5), S(1, 5)))]
    point = (S(77), (S(1), S(3, 10), S(9, 10)))
    total = sum(b[0] for b in boxes) + point[0]
    cg = [(sum(b[0] * b[1][k] for b in boxes) + point[0] * point[1][k]) / total
          for k in range(3)]
    X, Y, Z = x - cg[0], y - cg[1], z - cg[2]
    integrands = {"Ixx": Y**2 + Z**2, "Iyy": X**2 + Z**2, "Izz": X**2 + Y**2,
                  "Pxy": X * Y, "Pxz": X * Z, "Pyz": Y * Z}  # datum axes
    exact = {k: S(0) for k in integrands}
    for m, c, e in boxes:
        rho = m / (e[0] * e[1] * e[2])
        lim = [(v, c[k] - e[k] / 2, c[k] + e[k] / 2) for k, v in enumerate((x, y, z))]
        for k, f in integrands.items():
            exact[k] += rho * sympy.integrate(f, *lim)
    for k, f in integrands.items():
        exact[k] += point[0] * f.subs({x: point[1][0], y: point[1][1], z: point[1][2]})
    # The first box is the empty vehicle: its own (measured) tensor about its centre.
    m0, c0, e0 = boxes[0]
    own0 = MeasuredInertia(float(m0 * (e0[1]**2 + e0[2]**2) / 12),
                           float(m0 * (e0[0]**2 + e0[2]**2) / 12),
                           float(m0 * (e0[0]**2 + e0[1]**2) / 12))
    loads = [MassItem(f"box {i}", "cargo", float(m), *map(float, c),
                      shape={"kind": "box", "length_m": float(e[0]), "width_m": float(e[1]),
                             "height_m": float(e[2])})
             for i, (m, c, e) in enumerate(boxes[1:], 1)]
    loads.append(MassItem("person", "person", float(point[0]), *map(float, point[1])))
    doc = inertia_document(vtype(own0), float(m0), tuple(map(float, c0)), loads=loads)
    src = "sympy exact integration"
    assert_close([doc["cg_m"][a] for a in "xyz"], [float(v) for v in cg], unit="m",
                 rtol=1e-13, atol=1e-15, what="CG", source=src)
    m = doc["moments_kgm2"]
    for k in ("Ixx", "Iyy", "Izz"):
        assert_close(m[k], float(exact[k]), unit="kg*m2", rtol=1e-12, what=k, source=src)
    # Body axes: Ixy and Iyz change sign, Ixz does not (positive-product convention).
    p = doc["products_kgm2"]
    assert_close(p["Ixy"], -float(exact["Pxy"]), unit="kg*m2", rtol=1e-12, what="Ixy",
                 source=src)
    assert_close(p["Ixz"], float(exact["Pxz"]), unit="kg*m2", rtol=1e-12, what="Ixz",
                 source=src)
    assert_close(p["Iyz"], -float(exact["Pyz"]), unit="kg*m2", rtol=1e-12, what="Iyz",
                 source=src)
    assert all(abs(float(exact[k])) > 1.0 for k in ("Pxy", "Pxz", "Pyz"))
    # Radii of gyration k = √(I/M)
    kk = doc["radii_of_gyration_m"]
    assert_close(kk["kx"], math.sqrt(float(exact["Ixx"] / total)), unit="m", rtol=1e-12,
                 what="kx", source="k = √(Ixx/M)")
    # Inclination ε = ½·atan2(2·Ixz, Izz − Ixx) (domain notes)
    eps = 0.5 * math.atan2(2 * float(exact["Pxz"]), float(exact["Izz"] - exact["Ixx"]))
    assert_close(doc["inclination"]["rad"], eps, unit="rad", rtol=1e-12, what="ε",
                 source="½·atan2(2·Ixz, Izz − Ixx)")


# --- Raymer §16.7 ------------------------------------------------------------------------------

def test_gyration_estimate_is_raymer_16_7_with_the_sixteen():
    # Radii of gyration for a single-engine propeller aircraft, Raymer table 16.1 (values from
    # memory): Rx 0.25, Ry 0.38, Rz 0.39. Invented span, length and mass.
    M, b, L = 1050.0, 11.0, 8.3
    rx, ry, rz = 0.25, 0.38, 0.39
    doc = inertia_document(vtype(GyrationInertia(rx, ry, rz, b, L)), M, (2.1, 0.0, 0.9))
    m = doc["moments_kgm2"]
    src = "Raymer §16.7 eqs 16.52–16.54"
    assert_close(m["Ixx"], b**2 * M * rx**2 / 4, unit="kg*m2", rtol=1e-12, what="Ixx",
                 source=src)
    assert_close(m["Iyy"], L**2 * M * ry**2 / 4, unit="kg*m2", rtol=1e-12, what="Iyy",
                 source=src)
    assert_close(m["Izz"], ((b + L) / 2) ** 2 * M * rz**2 / 4, unit="kg*m2", rtol=1e-12,
                 what="Izz", source=src)
    # ... which is (b + L)²·M·Rz²/16, not the /8 of the faulty copies (twice as large).
    assert_close(m["Izz"], (b + L) ** 2 * M * rz**2 / 16, unit="kg*m2", rtol=1e-12,
                 what="Izz (/16 form)", source=src)
    assert not math.isclose(m["Izz"], (b + L) ** 2 * M * rz**2 / 8, rel_tol=0.1)
    ei = doc["empty_inertia"]
    assert ei["estimate"] is True and ei["basis"] == "gyration"
    assert "Raymer" in ei["source"]
    assert any("ESTIMATE" in w for w in doc["warnings"])
    text = inertia_text(doc)
    assert "ESTIMATE" in text
    rows = dict((r[0], r[1]) for r in csv_quantities(doc))
    assert rows["empty_inertia_source"] == "estimate"


# --- properties (Hypothesis) --------------------------------------------------------------------

_coord = st.floats(-5.0, 5.0, allow_nan=False)
_mass = st.floats(0.5, 200.0, allow_nan=False)
_load = st.tuples(_mass, _coord, _coord, _coord,
                  st.sampled_from([None, ("box", 0.4, 0.3, 0.2), ("cyl", 0.2, 1.0, "y")]))


def _items(spec):
    out = []
    for i, (m, x, y, z, sh) in enumerate(spec):
        shape = None
        if sh and sh[0] == "box":
            shape = {"kind": "box", "length_m": sh[1], "width_m": sh[2], "height_m": sh[3]}
        elif sh:
            shape = {"kind": "cylinder", "radius_m": sh[1], "length_m": sh[2], "axis": sh[3]}
        out.append(MassItem(f"load {i}", "cargo", m, x, y, z, shape=shape))
    return out


_TYPE = vtype(MeasuredInertia(300.0, 500.0, 700.0, ixz_kg_m2=20.0))


@settings(max_examples=60, deadline=None)
@given(st.lists(_load, min_size=1, max_size=6), st.randoms(use_true_random=False))
def test_item_order_does_not_matter(spec, rnd):
    a = inertia_document(_TYPE, 900.0, (1.0, 0.0, 0.5), loads=_items(spec))
    shuffled = _items(spec)
    rnd.shuffle(shuffled)
    b = inertia_document(_TYPE, 900.0, (1.0, 0.0, 0.5), loads=shuffled)
    scale = max(abs(v) for row in a["tensor_kgm2"]["rows"] for v in row)
    assert_close(report_tensor(b), report_tensor(a), unit="kg*m2", atol=1e-9 * scale,
                 what="tensor (order)")


@settings(max_examples=60, deadline=None)
@given(st.lists(_load, min_size=0, max_size=5), _coord, _coord, _coord)
def test_moving_everything_moves_the_cg_and_keeps_the_inertia(spec, dx, dy, dz):
    base = inertia_document(_TYPE, 900.0, (1.0, 0.0, 0.5), loads=_items(spec))
    moved = [MassItem(i.name, i.group, i.mass_kg, i.x_m + dx, i.y_m + dy, i.z_m + dz,
                      shape=i.shape) for i in _items(spec)]
    doc = inertia_document(_TYPE, 900.0, (1.0 + dx, dy, 0.5 + dz), loads=moved)
    assert_close([doc["cg_m"][a] for a in "xyz"],
                 [base["cg_m"]["x"] + dx, base["cg_m"]["y"] + dy, base["cg_m"]["z"] + dz],
                 unit="m", atol=1e-9, what="CG moved by d")
    scale = max(abs(v) for row in base["tensor_kgm2"]["rows"] for v in row)
    assert_close(report_tensor(doc), report_tensor(base), unit="kg*m2", atol=1e-9 * scale,
                 what="tensor (translation)")


@settings(max_examples=60, deadline=None)
@given(st.lists(_load, min_size=0, max_size=5), _coord, _coord, _coord)
def test_a_zero_mass_item_changes_nothing_and_shares_add_up(spec, x, y, z):
    base = inertia_document(_TYPE, 900.0, (1.0, 0.0, 0.5), loads=_items(spec))
    doc = inertia_document(_TYPE, 900.0, (1.0, 0.0, 0.5),
                           loads=_items(spec) + [MassItem("nothing", "cargo", 0.0, x, y, z)])
    scale = max(abs(v) for row in base["tensor_kgm2"]["rows"] for v in row)
    assert_close(report_tensor(doc), report_tensor(base), unit="kg*m2", atol=1e-9 * scale,
                 what="tensor (zero mass)")
    for k in ("Ixx", "Iyy", "Izz"):
        ranked = doc["ranking"][k]
        assert [r["kgm2"] for r in ranked] == sorted((r["kgm2"] for r in ranked), reverse=True)
        assert_close(sum(r["kgm2"] for r in ranked), doc["moments_kgm2"][k], unit="kg*m2",
                     atol=1e-9 * scale, what=f"shares of {k}")


def test_installed_items_are_listed_without_changing_mass_or_cg():
    class Installed:  # what the ledger's InstalledItem offers
        def __init__(self, name, m, x, y, z, shape=None):
            self.name, self.mass_kg, self.x_m, self.y_m, self.z_m = name, m, x, y, z
            self.shape = shape

    t = vtype(MeasuredInertia(300.0, 500.0, 700.0))
    inst = [Installed("radio", 4.0, 1.2, 0.2, 0.8, {"kind": "box", "length_m": 0.3,
                                                     "width_m": 0.2, "height_m": 0.1}),
            Installed("antenna", 0.5, 5.0, 0.0, 1.5)]
    doc = inertia_document(t, 900.0, (1.0, 0.1, 0.5), installed=inst)
    assert_close(doc["mass_kg"], 900.0, unit="kg", rtol=1e-14, what="mass")
    assert_close([doc["cg_m"][a] for a in "xyz"], [1.0, 0.1, 0.5], unit="m", atol=1e-12,
                 what="CG")
    rest = doc["items"][0]
    assert rest["name"] == "empty vehicle (rest)"
    assert_close(rest["mass_kg"], 895.5, unit="kg", rtol=1e-14, what="rest mass")
    assert [i["own_inertia"] for i in doc["items"][1:]] == ["shape", "point mass"]


def test_a_configuration_removing_an_installed_item_takes_it_out_once():
    class Installed:
        name, mass_kg, x_m, y_m, z_m = "rear seat", 15.0, 3.0, 0.0, 0.5
        shape = {"kind": "box", "length_m": 0.5, "width_m": 1.0, "height_m": 0.8}

    class Item:  # a configuration item resolved from the ledger (ConfigItemView)
        name, action, mass_kg, x_m, y_m, z_m = "rear seat", "remove", 15.0, 3.0, 0.0, 0.5
        shape = Installed.shape

    class Cfg:
        name, items = "seat out", (Item(),)

    t = vtype(MeasuredInertia(300.0, 500.0, 700.0))
    doc = inertia_document(t, 900.0, (1.0, 0.0, 0.5), installed=[Installed()],
                           configuration=Cfg())
    # CG after removing 15 kg at x = 3.0 (FAA-H-8083-1: removing weight)
    assert_close(doc["mass_kg"], 885.0, unit="kg", rtol=1e-14, what="mass",
                 source="900 kg less the 15 kg seat")
    assert_close(doc["cg_m"]["x"], (900.0 * 1.0 - 15.0 * 3.0) / 885.0, unit="m", rtol=1e-13,
                 what="CG x", source="Σm·x / Σm after the removal")
    assert [i["name"] for i in doc["items"]] == ["empty vehicle (rest)"]
    # The rest is the vehicle the measured tensor describes: its own tensor as recorded.
    assert_close(doc["moments_kgm2"]["Ixx"], 300.0, unit="kg*m2", rtol=1e-13, what="Ixx")


# --- the document and its renderings -------------------------------------------------------------

def _sample_doc():
    t = vtype(MeasuredInertia(300.0, 500.0, 700.0, ixz_kg_m2=20.0))
    loads = [MassItem("pilot", "person", 80.0, 1.5, -0.3, 0.9),
             MassItem("bag", "cargo", 20.0, 3.0, 0.2, 0.6,
                      shape={"kind": "box", "length_m": 0.5, "width_m": 0.4,
                             "height_m": 0.3})]
    return inertia_document(t, 900.0, (1.0, 0.0, 0.5), loads=loads,
                            vehicle={"registration": "T-1", "type": "TEST-1"},
                            condition={"configuration": None, "plan": "p.toml"})


def test_document_states_axes_convention_and_caution_and_is_json():
    doc = _sample_doc()
    text = json.dumps(doc, allow_nan=False)
    assert json.loads(text)["schema"] == "wbledger.inertia/1"
    assert doc["caution"] == CAUTION
    assert doc["axes"]["x"] == "forward" and doc["axes"]["z"] == "down"
    assert "Ixy and Iyz change sign" in doc["axes"]["statement"]
    assert "positive-product" in doc["products_kgm2"]["convention"]
    assert "−products" in doc["tensor_kgm2"]["convention"]
    t = report_tensor(doc)
    p = doc["products_kgm2"]
    assert t[0, 1] == -p["Ixy"] and t[0, 2] == -p["Ixz"] and t[1, 2] == -p["Iyz"]


def test_terminal_report_fits_80_columns_with_convention_and_caution():
    text = inertia_text(_sample_doc(), width=80)
    assert max(len(line) for line in text.splitlines()) <= 80
    flat = flatten(text)
    assert "x forward, y right, z down" in flat
    assert "positive-product convention" in flat
    for part in ("CAUTION: these figures are computed", "A qualified person must verify"):
        assert part in flat
    assert "Ixx roll" in text and "Iyy pitch" in text and "Izz yaw" in text


@pytest.mark.parametrize("layout", CSV_LAYOUTS)
def test_csv_layouts_carry_the_documented_quantities(layout):
    doc = _sample_doc()
    rows = list(csv.reader(io.StringIO(inertia_csv(doc, layout))))
    names = ["registration", "type", "configuration", "plan", "mass", "cg_x", "cg_y", "cg_z",
             "Ixx", "Iyy", "Izz", "Ixy", "Ixz", "Iyz", "J_xx", "J_yy", "J_zz", "J_xy",
             "J_xz", "J_yz", "I1", "I2", "I3"] + \
        [f"e{n}_{c}" for n in (1, 2, 3) for c in "xyz"] + \
        ["kx", "ky", "kz", "inclination", "empty_inertia_source"]
    if layout == "long":
        assert rows[0] == ["quantity", "value", "unit", "axes", "note"]
        got = {r[0]: r for r in rows[1:]}
        assert [r[0] for r in rows[1:]] == names
        assert float(got["Ixy"][1]) == doc["products_kgm2"]["Ixy"]
        assert float(got["J_xy"][1]) == -doc["products_kgm2"]["Ixy"]
        assert got["Ixx"][2] == "kg*m2" and "x fwd" in got["Ixx"][3]
    else:
        assert len(rows) == 2
        assert [h.split(" [")[0] for h in rows[0]] == names
        vals = dict(zip([h.split(" [")[0] for h in rows[0]], rows[1]))
        assert float(vals["mass"]) == doc["mass_kg"]
        assert rows[0][names.index("Izz")] == "Izz [kg*m2]"


# --- refusals ----------------------------------------------------------------------------------

def test_missing_vertical_cg_is_refused_unless_assumed():
    t = vtype(MeasuredInertia(300.0, 500.0, 700.0))
    with pytest.raises(InputError) as e:
        inertia_document(t, 900.0, (1.0, 0.0, None))
    assert str(e.value) == (
        "empty vehicle z = (missing): the vertical CG of the empty vehicle, which inertia "
        "needs (Ixx, Iyy and Ixz depend on it). Record it with `wbledger cg-height REG …` "
        "(road vehicles) or a weighing that gives it, or pass --assume-z LENGTH to take one "
        "height (the report says so)")
    with pytest.raises(InputError, match=r"^z = \(missing\): a vertical arm for every item; "
                                         r"none is recorded for 'bag'"):
        inertia_document(t, 900.0, (1.0, 0.0, 0.5),
                         loads=[MassItem("bag", "cargo", 20.0, 3.0, 0.0, None)])
    doc = inertia_document(t, 900.0, (1.0, 0.0, None), assume_z_m=0.4,
                           loads=[MassItem("bag", "cargo", 20.0, 3.0, 0.0, None)])
    assert [i["z_assumed"] for i in doc["items"]] == [True, True]
    assert len(doc["warnings"]) == 2


def test_type_without_inertia_data_is_refused():
    with pytest.raises(InputError) as e:
        inertia_document(vtype(None), 900.0, (1.0, 0.0, 0.5))
    assert str(e.value).startswith(
        "inertia = (missing): inertia data of the empty vehicle in type TEST-1: an [inertia] "
        "table with basis = \"measured\"")


def test_removing_more_than_the_empty_mass_is_refused():
    cfg = Configuration("all out", "remove", "x", items=(ConfigItem("everything", 950.0, 1.0,
                                                                    0.0, 0.5),))
    with pytest.raises(MassPropertiesError, match=r"^empty vehicle = 900: more mass than the "
                                                  r"950\.000 kg of items"):
        inertia_document(vtype(MeasuredInertia(300.0, 500.0, 700.0)), 900.0, (1.0, 0.0, 0.5),
                         configuration=cfg)


# --- with a plan: fuel as the loading sheet draws it ---------------------------------------------

PLAN_TYPE = """
format_version = 1
[vehicle]
name = "TEST-2"
title = "invented twin for the inertia tests"
kind = "airplane"
[units]
mass = "kg"
length = "m"
volume = "L"
[datum]
description = "invented"
[limits]
max_takeoff = 3000
max_ramp = 3020
max_landing = 2900
[[station]]
name = "pilot"
kind = "crew"
x = 2.0
y = -0.3
z = 1.0
[[station]]
name = "hold"
kind = "cargo"
x = 4.0
z = 0.8
max_mass = 300
[[tank]]
name = "left"
fluid = "jet"
capacity = 400
unusable = 10
arm_table = [
  { quantity = 0,   x = 3.0, y = -1.0, z = 1.2 },
  { quantity = 200, x = 3.1, y = -1.6, z = 1.2 },
  { quantity = 400, x = 3.3, y = -2.2, z = 1.3 },
]
[[tank]]
name = "right"
fluid = "jet"
capacity = 400
unusable = 10
arm_table = [
  { quantity = 0,   x = 3.0, y = 1.0, z = 1.2 },
  { quantity = 200, x = 3.1, y = 1.6, z = 1.2 },
  { quantity = 400, x = 3.3, y = 2.2, z = 1.3 },
]
[[envelope]]
name = "normal"
category = "normal"
axis = "longitudinal"
points = [[2.5, 1500], [2.5, 3020], [3.5, 3020], [3.5, 1500]]
[inertia]
basis = "gyration"
rx = 0.30
ry = 0.35
rz = 0.44
span = "14 m"
length = "11 m"
"""

PLAN = """
plan_format = 1
vehicle = "T-2"
[[person]]
seat = "pilot"
mass = 85
[[cargo]]
station = "hold"
mass = 120
what = "bags"
[fuel]
tanks = { left = "300 L", right = "300 L" }
taxi = "20 kg"
trip = "250 kg"
"""


@pytest.mark.parametrize("phase", ["zero_fuel", "ramp", "takeoff", "landing"])
def test_plan_loads_give_the_loading_sheet_mass_and_cg(phase):
    from ledger.loadsheet.build import EmptyWeight, build_sheet
    from ledger.typedata import parse_type_text
    from ledger.typedata.plan import parse_plan, read_plan_text

    t = parse_type_text(PLAN_TYPE, source="test-2.toml")
    plan = parse_plan(read_plan_text(PLAN, "plan.toml"), t, source="plan.toml")
    empty = EmptyWeight(2000.0, 2000.0 * 2.9, 0.0, 2000.0 * 1.1, True)
    sheet = build_sheet(t, empty, plan, with_fixes=False, samples=2)
    loads = plan_mass_items(plan, t, tank_masses=phase_tank_masses(sheet, phase, t))
    doc = inertia_document(t, 2000.0, (2.9, 0.0, 1.1), loads=loads)
    ph = next(p for p in sheet["phases"] if p["name"] == phase)
    src = "the loading sheet of the same plan (ledger.loadsheet.build)"
    assert_close(doc["mass_kg"], ph["mass_kg"], unit="kg", rtol=1e-12, what="mass",
                 source=src)
    assert_close([doc["cg_m"][a] for a in "xyz"], [ph["cg_m"][a] for a in "xyz"], unit="m",
                 atol=1e-9, what="CG", source=src)
    fuel = [i for i in doc["items"] if i["group"] == "fuel"]
    assert len(fuel) == (0 if phase == "zero_fuel" else 2)
    assert doc["empty_inertia"]["estimate"] is True


def test_phase_must_fit_the_vehicle_kind():
    from ledger.typedata import parse_type_text

    t = parse_type_text(PLAN_TYPE, source="test-2.toml")
    with pytest.raises(InputError) as e:
        phase_tank_masses({"fuel": []}, "departure", t)
    assert str(e.value) == ("--phase = 'departure': one of zero_fuel, ramp, takeoff, landing "
                            "for an aircraft")
