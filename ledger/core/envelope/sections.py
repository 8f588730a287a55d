"""Sections of an envelope by a horizontal or vertical line, and the nearest edge.

The section at a point's mass gives its forward and aft limits, the section at its CG the
minimum and maximum mass (:func:`~ledger.core.envelope.margins`); the scan takes margins of
points on a vertex level from here too.
"""

from __future__ import annotations

from typing import NamedTuple

import numpy as np


def _snap(v: np.ndarray, levels: np.ndarray, tol: float) -> np.ndarray:
    """Values within ``tol`` of a level become that level (so a mass a hair above a horizontal
    limit edge is read at the edge, where the point is covered)."""
    if levels.size == 0 or v.size == 0:
        return v
    i = np.clip(np.searchsorted(levels, v), 1, max(levels.size - 1, 1))
    lo = levels[i - 1]
    hi = levels[np.minimum(i, levels.size - 1)]
    near = np.where(np.abs(v - lo) <= np.abs(hi - v), lo, hi)
    return np.where(np.abs(v - near) <= tol, near, v)


# Non-finite points are valid input here (never covered): no warnings for their NaNs.
@np.errstate(invalid="ignore")
def _section(P: np.ndarray, u: np.ndarray, v: np.ndarray, tol: float):
    """Section of the closed polygon by the line y = v: the component [lo, hi] that contains u,
    or else the nearest one (the forward one on a tie); NaN where the line misses the polygon.

    The closed section is the union of the sections just above (crossing rule ``y > v``) and
    just below (``y >= v``) the line; merging them keeps horizontal edges and vertices lying on
    the line, e.g. a point on a maximum-mass edge.
    """
    x1, y1 = P[:, 0], P[:, 1]
    x2, y2 = np.roll(x1, -1), np.roll(y1, -1)
    keep = y1 != y2
    x1, y1, x2, y2 = x1[keep], y1[keep], x2[keep], y2[keep]
    out_lo = np.full(u.shape, np.nan)
    out_hi = np.full(u.shape, np.nan)
    if u.size == 0:
        return out_lo, out_hi
    xmin, xmax = np.minimum(x1, x2), np.maximum(x1, x2)
    step = max(1, 131072 // max(1, len(x1)))
    for s in range(0, u.size, step):
        U = u[s:s + step]
        V = v[s:s + step, None]
        xi = np.clip(x1 + (V - y1) / (y2 - y1) * (x2 - x1), xmin, xmax)
        los, his = [], []
        for rule in (np.greater, np.greater_equal):
            st = rule(y1, V) != rule(y2, V)
            xs = np.where(st, xi, np.inf)
            xs.sort(axis=1)
            if xs.shape[1] % 2:
                xs = np.concatenate([xs, np.full((xs.shape[0], 1), np.inf)], axis=1)
            los.append(xs[:, 0::2])
            his.append(xs[:, 1::2])
        lo = np.concatenate(los, axis=1)
        hi = np.concatenate(his, axis=1)
        order = np.argsort(lo, axis=1, kind="stable")
        lo = np.take_along_axis(lo, order, axis=1)
        hi = np.take_along_axis(hi, order, axis=1)
        out_lo[s:s + step], out_hi[s:s + step] = _nearest_interval(U, lo, hi, tol)
    return out_lo, out_hi


def _nearest_interval(U: np.ndarray, lo: np.ndarray, hi: np.ndarray, tol: float):
    """Per row, the union of intervals ``[lo, hi]`` (sorted by ``lo``; gaps up to ``tol``
    closed) that contains ``U``, or else the nearest one (the forward one on a tie)."""
    best = _Best(np.full(U.shape, np.nan), np.full(U.shape, np.nan), np.full(U.shape, np.inf))
    cur_lo = lo[:, 0].copy()
    cur_hi = hi[:, 0].copy()
    for k in range(1, lo.shape[1]):
        nl, nh = lo[:, k], hi[:, k]
        join = nl <= cur_hi + tol
        best.consider(U, cur_lo, cur_hi, ~join)
        cur_lo = np.where(join, cur_lo, nl)
        cur_hi = np.where(join, np.maximum(cur_hi, nh), nh)
    best.consider(U, cur_lo, cur_hi, np.ones(U.shape, dtype=bool))
    return best.lo, best.hi


class _Best(NamedTuple):
    """The nearest interval so far of each point, and its distance (updated in place)."""

    lo: np.ndarray
    hi: np.ndarray
    d: np.ndarray

    def consider(self, U: np.ndarray, clo: np.ndarray, chi: np.ndarray, mask: np.ndarray) -> None:
        """Keep ``[clo, chi]`` where ``mask`` holds and it is nearer than the best so far."""
        valid = mask & np.isfinite(clo)
        dd = np.maximum(clo - U, 0.0) + np.maximum(U - chi, 0.0)
        better = valid & (dd < self.d)
        self.lo[better] = clo[better]
        self.hi[better] = chi[better]
        self.d[better] = dd[better]


def _nearest_edge(P: np.ndarray, X: np.ndarray, Y: np.ndarray, sx: float, sy: float):
    """Index of each point's nearest edge and the distance, with the axes divided by
    ``sx`` and ``sy``."""
    x1, y1 = P[:, 0] / sx, P[:, 1] / sy
    x2, y2 = np.roll(x1, -1), np.roll(y1, -1)
    dx, dy = x2 - x1, y2 - y1
    L2 = dx * dx + dy * dy
    best = np.full(X.shape, np.inf)
    which = np.zeros(X.shape, dtype=np.intp)
    qx, qy = X / sx, Y / sy
    for k in range(len(P)):
        t = np.clip(((qx - x1[k]) * dx[k] + (qy - y1[k]) * dy[k]) / L2[k], 0.0, 1.0)
        dist = np.hypot(qx - (x1[k] + t * dx[k]), qy - (y1[k] + t * dy[k]))
        better = dist < best
        best = np.where(better, dist, best)
        which = np.where(better, k, which)
    return which, best
