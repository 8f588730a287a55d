"""Compiled kernels for the prepared-envelope sweep, used when numba is installed.

The numpy kernels of :mod:`ledger.core.sweep` and :class:`ledger.core.envelope.SweepEnvelope`
make about twenty passes over each chunk of cases; these kernels make one, reading each case's
masses once (the masses of a large sweep do not fit in any cache, so memory traffic sets the
pace). They give the numpy kernels' verdicts, their totals and margins to rounding (the sums
may run in another order), and leave the same points to the exact scan: a point whose
computed margin is within ``thr`` of zero, in a mixed cell of the table (NaN coefficients), or
with a non-finite mass or CG.

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


def _build(numba):
    # Re-association lets the per-case sums over the items vectorise; the sum's rounding stays
    # within the n·eps bound of any summation order of non-negative terms. NaN and infinity
    # keep their IEEE meaning (no 'nnan'/'ninf'), and a division by zero gives them as in
    # numpy (error_model) rather than raising: the screens below rely on both.
    jit = numba.njit(cache=True, nogil=True, error_model="numpy",
                     fastmath={"reassoc", "contract"})

    @jit
    def _verdict(x, w, origin, inv, top, tabs, K):
        """Margin of one point from the table; NaN in a mixed cell (whose row is all NaN)."""
        v = (w - origin) * inv
        if not v >= 0.0:            # below the grid, or NaN: the end cell, never out of range
            v = 0.0
        if v > top:
            v = top
        c = int(v)
        best = min(x - tabs[c, 0] * w - tabs[c, 1],         # to the forward crossing
                   tabs[c, 3] - (x - tabs[c, 2] * w))       # to the aft crossing
        for q in range(1, K):
            best = max(best, min(x - tabs[c, 4 * q] * w - tabs[c, 4 * q + 1],
                                 tabs[c, 4 * q + 3] - (x - tabs[c, 4 * q + 2] * w)))
        return best

    @jit
    def sweep_range(M, arms, origin, inv, tabs, K, thr, mass, cg, inside, margin, near, s, e):
        """Cases ``s:e``: totals, CG, verdict and margin; returns (whether a mass is negative,
        whether the sum of the CGs is finite, number of points written to ``near`` for the
        exact scan)."""
        p = M.shape[1]
        top = tabs.shape[0] - 1.0
        negative = False
        total = 0.0
        nn = 0
        for i in range(s, e):
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
            t = _verdict(x, w, origin, inv, top, tabs, K)
            margin[i] = t
            inside[i] = t >= 0.0
            if not abs(t) > thr:
                near[nn] = i
                nn += 1
        # A NaN mass, a zero total, an infinite mass or moment: a non-finite sum of the CGs.
        return negative, abs(total) < np.inf, nn

    @jit
    def assess_range(X, Y, origin, inv, tabs, K, thr, inside, margin, near, s, e):
        """Points ``s:e``: verdict and margin; returns the number written to ``near``."""
        top = tabs.shape[0] - 1.0
        nn = 0
        for i in range(s, e):
            x = X[i]
            w = Y[i]
            t = _verdict(x, w, origin, inv, top, tabs, K)
            margin[i] = t
            inside[i] = t >= 0.0
            if not abs(t) > thr or not abs(x) < np.inf or not abs(w) < np.inf:
                near[nn] = i
                nn += 1
        return nn

    return sweep_range, assess_range
