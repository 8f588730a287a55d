"""The exact containment scan: inclusive verdicts and signed CG margins, point by point.

The scan needs no compiled code and no table; :func:`~ledger.core.envelope.covers` and
:func:`~ledger.core.envelope.assess` use it below some 65,000 points (or without numba), and the
table prepared for sweeps hands it the points near the boundary. It is also the reference the
benchmarks and tests compare the faster paths with.
"""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from ledger.core.envelope.prepared import PreparedEnvelope
from ledger.core.envelope.sections import _section, _snap

__all__ = ["Assessment", "scan_points"]

# Points per chunk in the containment scan: the working set (a few float64 and bool arrays of
# this length) stays in the L2 cache, while numpy calls per chunk stay few enough that their
# fixed cost is small. Measured on a 2-core Xeon: 16k-32k best, 8k and 64k+ 10-30 % slower.
_CHUNK = 32768


# Non-finite points are valid input here (never covered): no warnings for their NaNs.
@np.errstate(invalid="ignore")
def _covers_exact(P: np.ndarray, qx: np.ndarray, qy: np.ndarray, tol: float) -> np.ndarray:
    """Reference test: crossing-number parity, or distance to the boundary <= tol."""
    x1, y1 = P[:, 0], P[:, 1]
    x2, y2 = np.roll(x1, -1), np.roll(y1, -1)
    dx, dy = x2 - x1, y2 - y1
    L2 = dx * dx + dy * dy
    out = np.empty(qx.shape, dtype=bool)
    step = max(1, 262144 // len(P))
    for s in range(0, qx.size, step):
        X = qx[s:s + step, None]
        Y = qy[s:s + step, None]
        t = np.clip(((X - x1) * dx + (Y - y1) * dy) / L2, 0.0, 1.0)
        dist = np.hypot(X - (x1 + t * dx), Y - (y1 + t * dy)).min(axis=1)
        straddle = (y1 > Y) != (y2 > Y)
        with np.errstate(divide="ignore", invalid="ignore"):
            xint = x1 + (Y - y1) * dx / np.where(dy == 0, 1.0, dy)
        parity = np.logical_xor.reduce(straddle & (X < xint), axis=1)
        out[s:s + step] = parity | (dist <= tol)
    return out


def scan_points(prepared: PreparedEnvelope, x: np.ndarray, y: np.ndarray, *,
                want_margin: bool = False) -> tuple[np.ndarray, np.ndarray | None]:
    """Verdicts (and signed CG margins) of points by the exact chunked scan.

    The same verdicts and margins as :func:`~ledger.core.envelope.assess`, without the
    prepared table or the compiled kernel whatever the number of points: the reference for
    those faster paths.

    A non-horizontal edge lies on the line ``x = k·y + m``; for a point, ``e = x − k·y`` is
    compared with ``m``: ``e < m`` on an edge straddling the point's level is a crossing to
    the right (parity odd = inside). Points with ``e`` within ``w`` of ``m`` are within ``tol``
    of that edge's line, and points within ``tol`` of a horizontal edge's level: only those few
    are tested again exactly for the inclusive verdict.

    With ``want_margin`` the scan also keeps ``|e − m|`` minimised over straddling edges: the
    horizontal distance to the nearest limit at the point's mass. Points within ``tol`` of a
    vertex level get it from the envelope's section by the line through them, which handles
    vertices and horizontal edges on the line.

    Parameters
    ----------
    prepared : PreparedEnvelope
        From :func:`~ledger.core.envelope.prepare_envelope`.
    x, y : ndarray, shape (n,)
        Flat float arrays of the points' coordinates.
    want_margin : bool
        Also compute the signed margins.

    Returns
    -------
    inside : ndarray of bool, shape (n,)
    margin : ndarray, shape (n,), or None
        None unless ``want_margin``.

    Examples
    --------
    >>> from ledger.core.envelope import prepare_envelope
    >>> prep = prepare_envelope([[2.0, 600.0], [2.6, 600.0], [2.6, 1100.0], [2.0, 1100.0]])
    >>> inside, margin = scan_points(prep, np.array([2.5, 2.7]), np.array([800.0, 800.0]),
    ...                              want_margin=True)
    >>> inside.tolist(), [round(v, 9) for v in margin.tolist()]
    ([True, False], [0.1, -0.1])
    """
    n = x.size
    inside = np.empty(n, dtype=bool)
    margin = np.empty(n) if want_margin else None
    near_idx, level_idx = _scan_chunks(prepared, x, y, inside, margin)
    if near_idx:
        _settle_near(prepared, x, y, np.concatenate(near_idx), inside, margin)
    if margin is not None and level_idx:
        _settle_levels(prepared, x, y, np.concatenate(level_idx), inside, margin)
    return inside, margin


def _scan_chunks(prep: PreparedEnvelope, X: np.ndarray, Y: np.ndarray, inside: np.ndarray,
                 margin: np.ndarray | None) -> tuple[list, list]:
    """The crossing-number pass, chunk by chunk, into ``inside`` (and ``margin`` signed by
    the parity verdict); returns the indices of the points near an edge and (with margins)
    of the points near a vertex level, chunk by chunk."""
    want_margin = margin is not None
    n = X.size
    C = max(1, min(_CHUNK, n))
    bufs = {
        "e": np.empty(C), "d": np.empty(C),
        "st": np.empty(C, dtype=bool), "cr": np.empty(C, dtype=bool),
        "b2": np.empty(C, dtype=bool), "near": np.empty(C, dtype=bool),
        "lv": np.empty(C, dtype=bool),
    }
    above_full = [np.empty(C, dtype=bool) for _ in prep.levels]
    # Covers only needs the bands of horizontal edges; the margin needs every vertex level.
    bands = prep.lbands if want_margin else prep.hbands
    # In margin mode e is taken relative to the line (e − m), which the margin needs anyway.
    edges = [(i, j, k, m, -w, w) if want_margin else (i, j, k, m, m - w, m + w)
             for (i, j, k, m, w) in prep.edges]
    near_idx = []
    level_idx = []
    with np.errstate(divide="ignore", invalid="ignore"):
        for s in range(0, n, C):
            c = min(C, n - s)
            b = bufs if c == C else {key: a[:c] for key, a in bufs.items()}
            above = above_full if c == C else [a[:c] for a in above_full]
            e, d = b["e"], b["d"]
            st, cr, b2, near, lv = b["st"], b["cr"], b["b2"], b["near"], b["lv"]
            Xc = X[s:s + c]
            Yc = Y[s:s + c]
            for buf, yv in zip(above, prep.levels):
                np.greater(Yc, yv, out=buf)
            # The first edge writes the accumulators (and the output slices) directly.
            acc = inside[s:s + c]
            if margin is not None:
                dist = margin[s:s + c]
            for n_e, (i, j, k, m, lo, hi) in enumerate(edges):
                first = n_e == 0
                np.multiply(Yc, k, out=e)
                np.subtract(Xc, e, out=e)
                np.not_equal(above[i], above[j], out=st)
                if want_margin:
                    np.subtract(e, m, out=e)
                    np.abs(e, out=d)
                    # d / straddle: d where the edge straddles the level, +inf elsewhere; a
                    # masked minimum several times faster than np.minimum(..., where=st).
                    # 0/False is NaN, which fmin skips.
                    np.divide(d, st, out=dist if first else d)
                    if not first:
                        np.fmin(dist, d, out=dist)
                np.less(e, lo, out=cr)
                np.less_equal(e, hi, out=b2)
                np.not_equal(cr, b2, out=near if first else b2)   # lo <= e <= hi: near the line
                if not first:
                    np.logical_or(near, b2, out=near)
                np.logical_and(st, cr, out=acc if first else st)
                if not first:
                    np.logical_xor(acc, st, out=acc)
            target = lv if want_margin else near
            if want_margin:
                lv.fill(False)
            for (blo, bhi) in bands:
                np.greater_equal(Yc, blo, out=st)
                np.less_equal(Yc, bhi, out=b2)
                np.logical_and(st, b2, out=st)
                np.logical_or(target, st, out=target)
            if want_margin:
                np.logical_or(near, lv, out=near)
                # Sign by the parity verdict here, in cache (masked copies are ~10x slower
                # than this arithmetic); points near the boundary are re-signed below after
                # their exact test. No straddling edge: +inf, signed to -inf (outside).
                np.multiply(acc, 2.0, out=d)
                np.subtract(d, 1.0, out=d)
                np.multiply(dist, d, out=dist)
                if lv.any():
                    level_idx.append(np.flatnonzero(lv) + s)
            if near.any():
                near_idx.append(np.flatnonzero(near) + s)
    return near_idx, level_idx


def _settle_near(prep: PreparedEnvelope, X: np.ndarray, Y: np.ndarray, idx: np.ndarray,
                 inside: np.ndarray, margin: np.ndarray | None) -> None:
    """Exact inclusive verdicts of the points near an edge; their margins re-signed."""
    inside[idx] = _covers_exact(prep.P, X[idx], Y[idx], prep.tol)
    if margin is not None:
        margin[idx] = np.where(inside[idx], np.abs(margin[idx]), -np.abs(margin[idx]))


def _settle_levels(prep: PreparedEnvelope, X: np.ndarray, Y: np.ndarray, idx: np.ndarray,
                   inside: np.ndarray, margin: np.ndarray) -> None:
    """Margins of the points near a vertex level, from the section through them."""
    v = _snap(Y[idx], np.asarray(prep.levels), prep.tol)
    lo, hi = _section(prep.P, X[idx], v, prep.tol)
    m = np.abs(np.minimum(X[idx] - lo, hi - X[idx]))
    m[np.isnan(m)] = np.inf
    margin[idx] = np.where(inside[idx], m, -m)


class Assessment(NamedTuple):
    """Result of :func:`~ledger.core.envelope.assess`: verdict and signed CG margin at the
    point's mass."""

    inside: bool | np.ndarray
    margin: float | np.ndarray

