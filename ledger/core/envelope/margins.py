"""Limits and margins of a point against an envelope, also in per cent of MAC."""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from ledger.core._common import plain
from ledger.core.envelope.prepared import _points, _shape_out, prepare_envelope
from ledger.core.envelope.scan import scan_points
from ledger.core.envelope.sections import _nearest_edge, _section, _snap
from ledger.core.massprops import percent_mac
from ledger.errors import InputError

__all__ = ["margins", "Margins", "MacMargins"]

class MacMargins(NamedTuple):
    """Longitudinal limits and margins in per cent of MAC (see :meth:`Margins.percent_mac`)."""

    fwd_limit: float | np.ndarray
    aft_limit: float | np.ndarray
    to_fwd: float | np.ndarray
    to_aft: float | np.ndarray


class Margins(NamedTuple):
    """Result of :func:`margins`; every field has the broadcast shape of the points.

    Attributes
    ----------
    inside : bool
        Covered by the envelope (:func:`~ledger.core.envelope.covers`).
    fwd_limit, aft_limit : float
        Ends of the envelope's section at the point's mass (the horizontal line through it)
        that contains the point, or the nearest section when the point is outside; NaN when
        the mass is outside the envelope's mass range.
    to_fwd, to_aft : float
        ``cg − fwd_limit`` and ``aft_limit − cg``: both 0 or more in limits; a negative value is
        how far that limit is exceeded.
    min_mass, max_mass, to_min_mass, to_max_mass : float
        The same along the vertical line through the point (constant first coordinate: the
        CG for an arm–mass envelope, the moment for a moment–mass one).
    edge : int
        Index of the nearest edge (from vertex ``edge`` to vertex ``edge + 1``).
    edge_start, edge_end : ndarray, shape (..., 2)
        Its end points.
    edge_distance : float
        Distance to it, measured with each axis divided by ``scale`` (see :func:`margins`).
    """

    inside: bool | np.ndarray
    fwd_limit: float | np.ndarray
    aft_limit: float | np.ndarray
    to_fwd: float | np.ndarray
    to_aft: float | np.ndarray
    min_mass: float | np.ndarray
    max_mass: float | np.ndarray
    to_min_mass: float | np.ndarray
    to_max_mass: float | np.ndarray
    edge: int | np.ndarray
    edge_start: np.ndarray
    edge_end: np.ndarray
    edge_distance: float | np.ndarray

    def percent_mac(self, lemac, mac) -> MacMargins:
        """Limits and margins in %MAC, for an arm–mass envelope (arms in the unit of ``mac``).

        Limits become (arm − LEMAC) ÷ MAC × 100; margins (distances) become Δ ÷ MAC × 100.

        Examples
        --------
        >>> env = [[2.0, 600.0], [2.6, 600.0], [2.6, 1100.0], [2.0, 1100.0]]
        >>> pm = margins(env, 2.3, 800.0).percent_mac(lemac=1.8, mac=1.0)
        >>> [round(float(v), 9) for v in pm]
        [20.0, 80.0, 30.0, 30.0]
        """
        per_unit = percent_mac(1.0, 0.0, mac)   # 100 / MAC (and MAC checked)
        return MacMargins(percent_mac(self.fwd_limit, lemac, mac),
                          percent_mac(self.aft_limit, lemac, mac),
                          plain(np.asarray(self.to_fwd) * per_unit),
                          plain(np.asarray(self.to_aft) * per_unit))


def margins(polygon, cg, mass, *, tol=None, scale=None) -> Margins:
    """Limits and margins of a point (CG, mass) against an envelope.

    At the point's mass the horizontal line through the envelope gives the forward and aft
    limits (for a non-convex envelope, the part of the line that contains the CG); at its CG
    the vertical line gives the minimum and maximum mass. The nearest edge is also reported.
    Work in the polygon's own coordinates (pass the moment as ``cg`` for a moment–mass
    envelope).

    Parameters
    ----------
    polygon : array_like, shape (n, 2)
    cg, mass : float or array_like
        The point(s), broadcast together.
    tol : float, optional
        Tolerance as in :func:`covers`.
    scale : (float, float), optional
        Divisors applied to each axis before measuring the distance to the nearest edge, so
        that arm and mass units do not decide which edge is nearest. Default: the polygon's
        bounding-box width and height (distance as a fraction of the envelope's size).
        ``(1, 1)`` measures in polygon units.

    Returns
    -------
    Margins

    Examples
    --------
    >>> env = [[2.0, 600.0], [2.6, 600.0], [2.6, 1100.0], [2.2, 1100.0], [2.0, 900.0]]
    >>> r = margins(env, 2.5, 1000.0)
    >>> r.inside, round(r.fwd_limit, 6), r.aft_limit, round(r.to_aft, 6), r.max_mass
    (True, 2.1, 2.6, 0.1, 1100.0)
    >>> r.edge, r.edge_start.tolist(), r.edge_end.tolist()
    (1, [2.6, 600.0], [2.6, 1100.0])
    """
    prep = prepare_envelope(polygon, tol)
    X, Y, shape = _points(cg, mass, names=("cg", "mass"))
    P = prep.P
    inside, _ = scan_points(prep, X, Y)
    v = _snap(Y, np.asarray(prep.levels), prep.tol)
    flo, ahi = _section(P, X, v, prep.tol)
    to_fwd, to_aft = X - flo, ahi - X
    u = _snap(X, prep.xlevels, prep.tol)
    mlo, mhi = _section(np.ascontiguousarray(P[:, ::-1]), Y, u, prep.tol)
    to_min, to_max = Y - mlo, mhi - Y
    # A covered point is at most `tol` outside; report it as on the limit, not a hair beyond.
    for a in (to_fwd, to_aft, to_min, to_max):
        np.copyto(a, 0.0, where=inside & (a < 0))
    if scale is None:
        sx, sy = (P.max(axis=0) - P.min(axis=0)).tolist()
    else:
        sx, sy = _scale(scale)
    which, dist = _nearest_edge(P, X, Y, sx, sy)
    start = P[which]
    end = P[(which + 1) % len(P)]
    return Margins(
        inside=_shape_out(inside, shape),
        fwd_limit=_shape_out(flo, shape), aft_limit=_shape_out(ahi, shape),
        to_fwd=_shape_out(to_fwd, shape), to_aft=_shape_out(to_aft, shape),
        min_mass=_shape_out(mlo, shape), max_mass=_shape_out(mhi, shape),
        to_min_mass=_shape_out(to_min, shape), to_max_mass=_shape_out(to_max, shape),
        edge=_shape_out(which, shape),
        edge_start=start.reshape(shape + (2,)), edge_end=end.reshape(shape + (2,)),
        edge_distance=_shape_out(dist, shape))


def _scale(scale) -> tuple[float, float]:
    """The two divisors of :func:`margins`' ``scale``, checked."""
    allowed = "two positive numbers (x divisor, y divisor)"
    try:
        sx, sy = (float(s) for s in scale)
    except (TypeError, ValueError):
        raise InputError("scale", scale, allowed) from None
    if not (np.isfinite(sx) and np.isfinite(sy) and sx > 0 and sy > 0):
        raise InputError("scale", scale, allowed)
    return sx, sy
