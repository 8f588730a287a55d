"""Compiled kernels for the prepared envelope, used when numba is installed.

The numpy kernels of :mod:`ledger.core.sweep` and :class:`ledger.core.envelope.SweepEnvelope`
make about twenty passes over each chunk of cases; these kernels read each case's masses once
(the masses of a large sweep do not fit in any cache) and make three or four simple passes over
each block of a few thousand cases while its figures are in cache: totals and CG; cell, margin
and verdict; the points for the exact scan. The compiler vectorises such simple loops across
cases, which it does not for one loop doing all of it per case (1.4 times the time on one
thread here). They give the numpy kernels' verdicts and margins (bit for bit for points, to
rounding in a sweep, whose sums may run in another order), and leave the same points to the
exact scan: a point whose computed margin is within ``thr`` of zero, in a mixed cell of the
table (NaN coefficients), or with a non-finite mass or CG.

numba is optional (``pip install 'wbledger[fast]'``). Without it, or with the environment
variable ``WBLEDGER_JIT=0``, :func:`kernels` returns None and callers use numpy.
"""

from __future__ import annotations

import os
from functools import lru_cache

import numpy as np

__all__ = ["kernels"]


@lru_cache(maxsize=1)
def kernels():
    """The compiled ``(sweep_range, assess_range)`` kernels, or None without numba."""
    if os.environ.get("WBLEDGER_JIT", "1").strip() == "0":
        return None
    try:
        import numba
    except ImportError:
        return None
    return _build(numba)


# Cases per block: each block's totals, CGs, margins, verdicts and cells (33 bytes a case) stay
# in L2 between the passes over it; 1024 to 8192 measured alike here.
_BLOCK = 4096


def _build(numba):
    # Re-association lets the per-case sums over the items vectorise; the sum's rounding stays
    # within the n·eps bound of any summation order of non-negative terms. NaN and infinity
    # keep their IEEE meaning (no 'nnan'/'ninf'), and a division by zero gives them as in
    # numpy (error_model) rather than raising: the screens below rely on both.
    jit = numba.njit(cache=True, nogil=True, error_model="numpy",
                     fastmath={"reassoc", "contract"})
    # Points alone (assess_range) are computed in strict IEEE order, with no fused
    # multiply-add: the operations of the numpy kernel and the exact scan, so that covers and
    # assess give the same margins to the last bit whichever path a point takes (a result does
    # not depend on how many points were given). numba applies a kernel's fastmath flags to
    # the functions it calls as well, so the sweep's margins (sweep_range) agree with the
    # scan's to rounding only, as its totals agree with mass_properties'.
    strict = numba.njit(cache=True, nogil=True, error_model="numpy")

    @strict
    def _verdicts(X, W, origin, inv, tabs, K, thr, points_finite, inside, margin, near, nn,
                  cell, offset):
        """Verdicts and margins of the points of one block (``X``, ``W``, ``inside`` and
        ``margin`` are the block's views; ``cell`` is scratch at least as long), and their
        indices plus ``offset`` in ``near`` (from ``nn`` on) where the margin is within ``thr``
        of 0 or NaN (a mixed cell, whose row is all NaN), or, unless ``points_finite`` (the
        caller has screened them), where a coordinate is not finite; returns the new count.
        Each pass is a simple loop over the block, which the compiler vectorises."""
        top = tabs.shape[0] - 1.0
        n = X.shape[0]
        for i in range(n):
            x = X[i]
            w = W[i]
            v = (w - origin) * inv
            if not v >= 0.0:            # below the grid, or NaN: the end cell, never out of range
                v = 0.0
            if v > top:
                v = top
            c = int(v)
            cell[i] = c
            t = min(x - tabs[c, 0] * w - tabs[c, 1],                # to the forward crossing
                    tabs[c, 3] - (x - tabs[c, 2] * w))              # to the aft crossing
            margin[i] = t
            inside[i] = t >= 0.0
        if K > 1:                       # further intervals of the row (a non-convex envelope)
            for q in range(1, K):
                for i in range(n):
                    c = cell[i]
                    x = X[i]
                    w = W[i]
                    margin[i] = max(margin[i],
                                    min(x - tabs[c, 4 * q] * w - tabs[c, 4 * q + 1],
                                        tabs[c, 4 * q + 3] - (x - tabs[c, 4 * q + 2] * w)))
            for i in range(n):
                inside[i] = margin[i] >= 0.0
        if points_finite:
            for i in range(n):
                if not abs(margin[i]) > thr:
                    near[nn] = offset + i
                    nn += 1
        else:
            for i in range(n):
                if not abs(margin[i]) > thr or not abs(X[i]) < np.inf or not abs(W[i]) < np.inf:
                    near[nn] = offset + i
                    nn += 1
        return nn

    @jit
    def sweep_range(M, arms, origin, inv, tabs, K, thr, mass, cg, inside, margin, near, s, e):
        """Cases ``s:e``: totals, CG, verdict and margin; returns (whether a mass is negative,
        whether the sum of the CGs is finite, number of points written to ``near`` for the
        exact scan)."""
        p = M.shape[1]
        negative = False
        total = 0.0
        nn = 0
        cell = np.empty(_BLOCK, dtype=np.intp)
        for b in range(s, e, _BLOCK):
            b_end = min(e, b + _BLOCK)
            for i in range(b, b_end):
                w = 0.0
                mo = 0.0
                for j in range(p):
                    m = M[i, j]
                    w += m
                    mo += m * arms[j]
                    negative |= m < 0.0
                x = mo / w
                mass[i] = w
                cg[i] = x
                total += x
            # A non-finite mass or CG fails the screens below, and the sweep raises.
            nn = _verdicts(cg[b:b_end], mass[b:b_end], origin, inv, tabs, K, thr, True,
                           inside[b:b_end], margin[b:b_end], near, nn, cell, b)
        # A NaN mass, a zero total, an infinite mass or moment: a non-finite sum of the CGs.
        return negative, abs(total) < np.inf, nn

    @strict
    def assess_range(X, Y, origin, inv, tabs, K, thr, inside, margin, near, s, e):
        """Points ``s:e``: verdict and margin; returns the number written to ``near``. With
        an empty ``margin`` only the verdicts are written (each block's margins go to
        scratch)."""
        nn = 0
        cell = np.empty(_BLOCK, dtype=np.intp)
        scratch = np.empty(_BLOCK if margin.shape[0] == 0 else 0)
        for b in range(s, e, _BLOCK):
            b_end = min(e, b + _BLOCK)
            mb = scratch[:b_end - b] if margin.shape[0] == 0 else margin[b:b_end]
            nn = _verdicts(X[b:b_end], Y[b:b_end], origin, inv, tabs, K, thr, False,
                           inside[b:b_end], mb, near, nn, cell, b)
        return nn

    return sweep_range, assess_range
