"""Envelope polygons: validation, inclusive containment, margins to the limits, path checks.

An envelope is a polygon of (CG arm, mass) or (CG moment, mass) points (FAA-H-8083-1). Every
function here works in **the polygon's own coordinates**: pass (arm, mass) points for an
arm–mass envelope and (moment, mass) points for a moment–mass envelope. "Forward" means the
smaller first coordinate (smaller arm or smaller moment); "max/min mass" are along the second.

Limits are **inclusive**: a point on an edge or a vertex is in limits. An envelope need not be
convex, so a straight path between two points in limits can still leave it (see
:func:`path_inside`).

Tolerance
---------
``tol`` is an absolute distance in the polygon's units: a point within ``tol`` of the boundary
(Euclidean distance in the polygon's plane) counts as on it. The default,
:func:`default_tolerance`, is 1e-9 × the smaller side of the polygon's bounding box, which only
absorbs floating-point rounding; pass ``tol=0`` for no slack.

Modules
-------
:mod:`~ledger.core.envelope.polygon`
    :func:`validate_polygon` and :func:`default_tolerance`.
:mod:`~ledger.core.envelope.prepared`
    :func:`prepare_envelope`: a checked polygon with its edges as lines, cached per envelope.
:mod:`~ledger.core.envelope.scan`
    :func:`scan_points`: the exact chunked crossing-number scan (verdicts and margins).
:mod:`~ledger.core.envelope.table`
    :func:`prepare_sweep`: the envelope as a mass-indexed table for very many points.
:mod:`~ledger.core.envelope.containment`
    :func:`covers` and :func:`assess`, which pick the scan or the table.
:mod:`~ledger.core.envelope.sections`
    The envelope's section by a horizontal or vertical line.
:mod:`~ledger.core.envelope.margins`
    :func:`margins`: limits and margins of a point.
:mod:`~ledger.core.envelope.paths`
    :func:`path_inside`: a whole CG path against the envelope.
"""

from __future__ import annotations

from ledger.core.envelope.containment import TABLE_MIN_POINTS, assess, covers
from ledger.core.envelope.margins import MacMargins, Margins, margins
from ledger.core.envelope.paths import PathCheck, path_inside
from ledger.core.envelope.polygon import default_tolerance, validate_polygon
from ledger.core.envelope.prepared import PreparedEnvelope, prepare_envelope
from ledger.core.envelope.scan import Assessment, scan_points
from ledger.core.envelope.table import SweepEnvelope, prepare_sweep

__all__ = [
    "validate_polygon",
    "default_tolerance",
    "covers",
    "assess",
    "Assessment",
    "prepare_sweep",
    "SweepEnvelope",
    "margins",
    "Margins",
    "MacMargins",
    "path_inside",
    "PathCheck",
    "prepare_envelope",
    "PreparedEnvelope",
    "scan_points",
    "TABLE_MIN_POINTS",
]
