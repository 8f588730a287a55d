"""Inclusive containment of points, with the signed CG margin for sweeps.

Both functions take the exact scan (:mod:`ledger.core.envelope.scan`) for few points, and the
table prepared for sweeps (:mod:`ledger.core.envelope.table`) for many when the compiled kernel
is there: the same verdicts and margins either way.
"""

from __future__ import annotations

import numpy as np

from ledger.core._jit import kernels
from ledger.core.envelope.prepared import (
    PreparedEnvelope,
    _points,
    _shape_out,
    prepare_envelope,
)
from ledger.core.envelope.scan import Assessment, scan_points
from ledger.core.envelope.table import prepare_sweep

__all__ = ["covers", "assess", "TABLE_MIN_POINTS"]

def covers(polygon, px, py=None, *, tol=None):
    """Inclusive containment: is each point inside the polygon or on its boundary?

    Works in the polygon's own coordinates (arm–mass or moment–mass; pass matching points).
    The polygon may be non-convex. A point within ``tol`` of an edge or vertex counts as
    covered; non-finite points are not covered.

    Parameters
    ----------
    polygon : array_like, shape (n, 2)
        Envelope vertices (checked by :func:`validate_polygon`; results are cached).
    px, py : float or array_like
        Point coordinates, broadcast together. Alternatively ``px`` of shape ``(..., 2)`` and
        ``py`` omitted.
    tol : float, optional
        Absolute tolerance in polygon units: a point at most ``tol`` (Euclidean distance) from
        an edge or vertex is covered. Default :func:`default_tolerance`, 1e-9 × the smaller
        side of the polygon's bounding box (rounding only).

    Returns
    -------
    bool or ndarray of bool

    Notes
    -----
    With numba installed, 65,536 points or more go through the envelope prepared for sweeps
    (:func:`prepare_sweep`, cached per envelope) on the cores this process may use: the same
    verdicts, in a fraction of the time.

    Examples
    --------
    >>> env = [[2.0, 600.0], [2.6, 600.0], [2.6, 1100.0], [2.2, 1100.0], [2.0, 900.0]]
    >>> covers(env, 2.6, 800.0)          # on the aft limit: in limits
    True
    >>> covers(env, 2.6 + 1e-3, 800.0)
    False
    >>> covers(env, [2.1, 2.1], [700.0, 1050.0]).tolist()
    [True, False]
    """
    prep = prepare_envelope(polygon, tol)
    X, Y, shape = _points(px, py)
    inside, _ = _scan_many(polygon, tol, prep, X, Y, want_margin=False)
    return _shape_out(inside, shape)



def assess(polygon, x, y, *, tol=None) -> Assessment:
    """Verdict and signed CG margin for many points in one pass (for sweeps).

    ``margin`` is the horizontal distance (first coordinate) from the point to the nearest
    limit on the line through it at its mass: positive when in limits, negative when out
    (by how much a limit is exceeded), ``-inf`` when no CG is in limits at that mass (the mass
    is outside the envelope's mass range). Where finite it equals ``min(to_fwd, to_aft)`` of
    :func:`margins`. Many points take the prepared envelope, as in :func:`covers`.

    Examples
    --------
    >>> env = [[2.0, 600.0], [2.6, 600.0], [2.6, 1100.0], [2.2, 1100.0], [2.0, 900.0]]
    >>> r = assess(env, [2.5, 2.7, 2.3], [800.0, 800.0, 1200.0])
    >>> r.inside.tolist(), [round(v, 9) for v in r.margin.tolist()]
    ([True, False, False], [0.1, -0.1, -inf])
    """
    prep = prepare_envelope(polygon, tol)
    X, Y, shape = _points(x, y, names=("x", "y"))
    inside, margin = _scan_many(polygon, tol, prep, X, Y, want_margin=True)
    return Assessment(_shape_out(inside, shape), _shape_out(margin, shape))


# From this many points on, covers and assess go through the envelope prepared for sweeps when
# the compiled kernel is there (its verdicts and margins are those of the scan). Its table is
# built once per envelope and cached; the build (0.3 ms here for an envelope of a few tens of
# vertices, more for thousands) costs about what this many points save on a first call, and
# later calls take a fifth to two thirds of the time (measured here).
#: From this many points on, :func:`covers` and :func:`assess` go through the table prepared
#: for sweeps when the compiled kernel is there.
TABLE_MIN_POINTS = 65536


def _scan_many(polygon, tol, prep: PreparedEnvelope, X: np.ndarray, Y: np.ndarray,
               want_margin: bool):
    if X.size >= TABLE_MIN_POINTS and kernels() is not None:
        env = prepare_sweep(polygon, tol)
        if env._grid:
            return env._run(X, Y, want_margin)
    return scan_points(prep, X, Y, want_margin=want_margin)


# --------------------------------------------------------------------------- prepared for sweeps
