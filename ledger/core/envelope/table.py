"""The envelope prepared for loading-case sweeps: a table of edge lines indexed by mass.

Between two consecutive vertex levels the edges that a horizontal line crosses do not change,
so a point costs one table look-up and a few products; points near an edge or a vertex level go
back to the exact scan (:func:`~ledger.core.envelope.scan_points`), so verdicts and margins are
the scan's. With numba the compiled kernel (:mod:`ledger.core._jit`) runs the table on the cores
this process may use.
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np

from ledger.core._jit import kernels
from ledger.core._parallel import split, thread_count
from ledger.core.envelope.prepared import (
    PreparedEnvelope,
    _check_tol,
    _points,
    _prepare_cached,
    _shape_out,
)
from ledger.core.envelope.scan import Assessment, scan_points
from ledger.errors import EnvelopeError

__all__ = ["SweepEnvelope", "prepare_sweep"]

# the gathered coefficient rows) stay in L2, and per-call overhead stays small.
_SWEEP_CHUNK = 16384
# Cells of the mass lookup grid between the lowest and highest vertex level. A cell within one
# cell of a vertex level is "mixed" and sends its points to the exact scan; with 4096 cells that
# is a few hundredths of the mass range per level, while the table (4096 × 32 bytes per crossing
# pair) stays in L2.
_SWEEP_CELLS = 4096
_SWEEP_PAD = 4          # clean cells below the lowest and above the highest level
# Fewer points than this are not worth a second thread.
_THREAD_MIN = 4 * _SWEEP_CHUNK


class _SweepWork:
    """Scratch buffers for one chunk of the prepared kernel (one per thread)."""

    def __init__(self, size: int, width: int) -> None:
        self.v = np.empty(size)
        self.t1 = np.empty(size)
        self.t2 = np.empty(size)
        self.idx = np.empty(size, dtype=np.intp)
        self.coef = [np.empty(size) for _ in range(width)]
        self.far = np.empty(size, dtype=bool)


def _crossing_bands(prep: PreparedEnvelope) -> list[list[tuple]]:
    """The intervals in limits between each two consecutive vertex levels, as
    ``(k_fwd, m_fwd, k_aft, m_aft)`` of the edge lines bounding each.

    Between two consecutive vertex levels the edges crossing a horizontal line are fixed, and
    each crossing is x = k·y + m; sorted by x they pair up into the intervals in limits.
    """
    L = np.asarray(prep.levels)
    bands = []
    for b in range(1, L.size):
        ym = 0.5 * (L[b - 1] + L[b])
        cr = sorted((k * ym + m, k, m) for (i, j, k, m, _w) in prep.edges
                    if min(i, j) <= b - 1 and max(i, j) >= b)
        bands.append([(cr[2 * p][1], cr[2 * p][2], cr[2 * p + 1][1], cr[2 * p + 1][2])
                      for p in range(len(cr) // 2)])
    return bands


class SweepEnvelope:
    """An envelope prepared for verdicts and margins of many points; see :func:`prepare_sweep`.

    Attributes
    ----------
    polygon : ndarray, shape (n, 2)
        The validated vertices (read-only).
    tol : float
        The containment tolerance in use (the default resolved to a number).
    """

    def __init__(self, prep: PreparedEnvelope) -> None:
        self._prep = prep
        P, t = prep.P, prep.tol
        L = np.asarray(prep.levels)
        bands = _crossing_bands(prep)
        K = max(1, max((len(b) for b in bands), default=1))
        pad = [0.0, np.inf, 0.0, np.inf] * K        # no interval: margin −inf
        span = (L[-1] + t) - (L[0] - t)
        cw = span / _SWEEP_CELLS
        self._grid = bool(np.isfinite(cw) and cw > 1e-8 * float(np.max(np.abs(L))))
        nc = _SWEEP_CELLS + 2 * _SWEEP_PAD
        origin = (L[0] - t) - _SWEEP_PAD * cw
        # Band of each cell (by its centre) and whether the cell, widened by a whole cell on
        # both sides, meets a level's tolerance band: a point's cell index is computed in
        # floating point, and the widening keeps every point within tol of a level in a mixed
        # cell, whose NaN row sends it to the exact scan.
        c = np.arange(nc)
        band = np.searchsorted(L, origin + (c + 0.5) * cw, side="left")
        lo_band = np.array([lo for lo, _ in prep.lbands])
        hi_band = np.array([hi for _, hi in prep.lbands])
        c_lo = origin + (c - 1) * cw
        c_hi = origin + (c + 2) * cw
        mixed = ((lo_band[None, :] <= c_hi[:, None])
                 & (hi_band[None, :] >= c_lo[:, None])).any(axis=1)
        rows = np.array([pad] + [sum((list(coef) for coef in b), []) + pad[4 * len(b):]
                                 for b in bands] + [pad])
        tab = rows[band]
        tab[mixed] = np.nan
        # One contiguous table per coefficient: gathering each into a contiguous buffer is
        # faster than gathering whole rows and then working on strided columns.
        self._tabs = [np.ascontiguousarray(tab[:, j]) for j in range(4 * K)]
        # Whole rows for the compiled kernels (ledger.core._jit), which read one row per point.
        self._table = np.ascontiguousarray(tab)
        self._origin = float(origin)
        self._inv = float(1.0 / cw) if self._grid else 0.0
        self._K = K
        # A computed margin farther than thr from 0 is farther than tol from every edge (w is
        # tol measured horizontally), and its sign is beyond any rounding of this kernel or of
        # the exact scan; nearer points go to the exact scan.
        ws = [w for (_i, _j, _k, _m, w) in prep.edges]
        scale = max(abs(k) * float(np.max(np.abs(L))) + abs(m)
                    for (_i, _j, k, m, _w) in prep.edges)
        scale += float(np.max(np.abs(P[:, 0])))
        self._thr = float(max(ws) + 64.0 * np.finfo(float).eps * scale)

    @property
    def polygon(self) -> np.ndarray:
        """The validated vertices (read-only)."""
        return self._prep.P

    @property
    def tol(self) -> float:
        """The containment tolerance in use."""
        return self._prep.tol

    def __repr__(self) -> str:
        return f"SweepEnvelope({len(self._prep.P)} vertices, tol={self._prep.tol:g})"

    def _work(self, size: int = _SWEEP_CHUNK) -> _SweepWork:
        return _SweepWork(size, 4 * self._K)

    def _chunk(self, X, Y, inside, margin, work: _SweepWork, offset: int, near: list) -> None:
        """Verdict and margin of one chunk (length at most the work size) into ``inside`` and
        ``margin``; indices (plus ``offset``) of points left to the exact scan go to ``near``."""
        c = X.size
        if not self._grid:
            near.append(np.arange(offset, offset + c))
            return
        v, t1, t2 = work.v[:c], work.t1[:c], work.t2[:c]
        idx, far = work.idx[:c], work.far[:c]
        coef = [a[:c] for a in work.coef]
        np.subtract(Y, self._origin, out=v)
        np.multiply(v, self._inv, out=v)
        # Truncation is the floor for cells >= 0; a value below 0, beyond the index range or
        # NaN lands (after clipping) in an end cell, which has no interval, or in a cell below
        # or above the levels whose NaN product sends the point to the exact scan.
        np.copyto(idx, v, casting="unsafe")
        for tab, out in zip(self._tabs, coef):
            np.take(tab, idx, out=out, mode="clip")
        for p in range(self._K):
            k_lo, m_lo, k_hi, m_hi = coef[4 * p:4 * p + 4]
            # Same operations, in the same order, as the exact scan's x − k·y − m.
            np.multiply(k_lo, Y, out=t1)
            np.subtract(X, t1, out=t1)
            np.subtract(t1, m_lo, out=t1)                        # to the forward crossing
            np.multiply(k_hi, Y, out=t2)
            np.subtract(X, t2, out=t2)
            np.subtract(m_hi, t2, out=t2)                        # to the aft crossing
            if p == 0:
                np.minimum(t1, t2, out=margin)
            else:
                np.minimum(t1, t2, out=t1)
                np.maximum(margin, t1, out=margin)
        np.greater_equal(margin, 0.0, out=inside)
        np.abs(margin, out=t1)
        np.greater(t1, self._thr, out=far)                       # NaN: not far
        if not far.all():
            np.logical_not(far, out=far)
            near.append(np.flatnonzero(far) + offset)

    def _fix(self, X, Y, inside, margin, near: list) -> None:
        """Exact scan (as :func:`~ledger.core.envelope.assess`) for the points left over by
        :meth:`_chunk` or the compiled kernel; verdicts only when ``margin`` is None."""
        if not near:
            return
        idx = np.concatenate(near)
        if idx.size:
            ins, mar = scan_points(self._prep, X[idx], Y[idx], want_margin=margin is not None)
            inside[idx] = ins
            if margin is not None:
                margin[idx] = mar

    def _run(self, X, Y, want_margin: bool):
        """Verdicts (and margins) of flat point arrays: the compiled kernel on the cores this
        process may use, else numpy chunks on this thread."""
        n = X.size
        inside = np.empty(n, dtype=bool)
        jit = kernels() if self._grid else None
        margin = np.empty(n) if want_margin or jit is None else None
        if jit is not None:
            # Without margins the kernel keeps each block's margins in scratch.
            out = margin if margin is not None else np.empty(0)

            def run(lo: int, hi: int):
                idx = np.empty(hi - lo, dtype=np.intp)
                k = jit[1](X, Y, self._origin, self._inv, self._table, self._K, self._thr,
                           inside, out, idx, lo, hi)
                return idx[:k]

            k = thread_count(None, n, _SWEEP_CHUNK) if n >= _THREAD_MIN else 1
            near = split(run, n, k, _SWEEP_CHUNK)
        else:
            assert margin is not None       # allocated above for the numpy chunks
            near = []
            work = self._work(min(_SWEEP_CHUNK, max(n, 1)))
            with np.errstate(invalid="ignore", over="ignore"):
                for s in range(0, n, _SWEEP_CHUNK):
                    e = min(n, s + _SWEEP_CHUNK)
                    self._chunk(X[s:e], Y[s:e], inside[s:e], margin[s:e], work, s, near)
        self._fix(X, Y, inside, margin if want_margin else None, near)
        return inside, (margin if want_margin else None)

    def assess(self, x, y) -> Assessment:
        """Verdict and signed CG margin of each point: the same results as
        :func:`~ledger.core.envelope.assess` (with
        the compiled kernel, on the cores this process may use).

        Parameters
        ----------
        x, y : float or array_like
            Points in the polygon's coordinates, broadcast together.

        Returns
        -------
        Assessment
            ``inside`` (inclusive, within :attr:`tol`) and ``margin`` as defined in
            :func:`assess`.

        Examples
        --------
        >>> env = prepare_sweep([[2.0, 600.0], [2.6, 600.0], [2.6, 1100.0], [2.2, 1100.0],
        ...                      [2.0, 900.0]])
        >>> r = env.assess([2.5, 2.7, 2.3, 2.6], [800.0, 800.0, 1200.0, 1100.0])
        >>> r.inside.tolist(), [round(v, 9) for v in r.margin.tolist()]
        ([True, False, False, True], [0.1, -0.1, -inf, 0.0])
        """
        X, Y, shape = _points(x, y, names=("x", "y"))
        inside, margin = self._run(X, Y, want_margin=True)
        return Assessment(_shape_out(inside, shape), _shape_out(margin, shape))


@lru_cache(maxsize=16)
def _sweep_cached(data: bytes, shape: tuple, tol) -> SweepEnvelope:
    return SweepEnvelope(_prepare_cached(data, shape, tol, "envelope"))


def prepare_sweep(polygon, tol=None) -> SweepEnvelope:
    """Prepare an envelope for :func:`assess` on very many points (loading-case sweeps).

    Between two consecutive vertex levels (masses of the vertices) the edges that a horizontal
    line crosses do not change, and each crossing is a linear function of the mass. The
    prepared envelope keeps those functions in a table indexed by mass, so a point costs one
    table look-up and a few products instead of a pass over every edge. Points within ``tol``
    of an edge or close to a vertex level are re-tested by the same exact scan as
    :func:`assess`, so verdicts (inclusive boundary) and margins are those of :func:`assess`.

    Parameters
    ----------
    polygon : array_like, shape (n, 2)
        Envelope vertices (checked by :func:`validate_polygon`; results are cached).
    tol : float, optional
        Tolerance as in :func:`covers`.

    Returns
    -------
    SweepEnvelope
        Call its ``assess(x, y)``.

    Examples
    --------
    >>> env = prepare_sweep([[2.0, 600.0], [2.6, 600.0], [2.6, 1100.0], [2.2, 1100.0],
    ...                      [2.0, 900.0]])
    >>> r = env.assess([2.5, 2.6 + 1e-3], [800.0, 800.0])
    >>> r.inside.tolist(), [round(v, 9) for v in r.margin.tolist()]
    ([True, False], [0.1, -0.001])
    """
    try:
        raw = np.ascontiguousarray(polygon, dtype=float)
    except (TypeError, ValueError):
        raise EnvelopeError("envelope", polygon, "a list of [x, y] points (at least 3)") from None
    return _sweep_cached(raw.tobytes(), raw.shape, _check_tol(tol))
