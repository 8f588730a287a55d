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
  Approach, §16.7, eqs 16.52–16.54 (after Roska
Modules: :mod:`~ledger.core.inertia.shapes` (own inertia of item shapes),
:mod:`~ledger.core.inertia.axes` (body axes, principal axes), :mod:`~ledger.core.inertia.buildup`
(the build-up about the combined CG) and :mod:`~ledger.core.inertia.gyration` (the estimate
from radii of gyration).
"""

from __future__ import annotations

from ledger.core.inertia.axes import (
    BODY_AXES,
    DATUM_AXES,
    PRODUCT_CONVENTION,
    principal_axes,
    to_body_axes,
    x_axis_inclination,
)
from ledger.core.inertia.buildup import CONTRIBUTION_COLUMNS, InertiaResult, combined_inertia
from ledger.core.inertia.gyration import RAYMER_SOURCE, GyrationEstimate, estimate_from_gyration
from ledger.core.inertia.shapes import SHAPES, shape_inertia

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
