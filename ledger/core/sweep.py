"""Loading-case sweeps: mass, CG, envelope verdict and CG margin of very many cases at once.

A sweep evaluates many loading cases of the same items (for instance every combination of
occupants, baggage and fuel on a grid, or random cases) against one envelope. Per case it gives
what :func:`ledger.core.massprops.mass_properties` and :func:`ledger.core.envelope.assess` give
(CG = Σ m·arm ÷ Σ m, FAA-H-8083-1), in one pass over the masses: the cases are processed in
chunks that stay in the CPU cache, each chunk's total mass and moment come from one matrix
product, and the verdict and margin from an envelope prepared with
:func:`ledger.core.envelope.prepare_sweep`. With numba installed (``wbledger[fast]``) one
compiled pass per case replaces the chunks' numpy passes (:mod:`ledger.core._jit`), with the
same verdicts and the same figures to rounding; ``WBLEDGER_JIT=0`` turns it off.
"""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from ledger.core._jit import kernels
from ledger.core._parallel import split, thread_count
from ledger.core.envelope import prepare_sweep
from ledger.core.massprops import mass_properties
from ledger.errors import MassPropertiesError

__all__ = ["SweepResult", "sweep_cases"]

# Cases per chunk: the chunk's masses (12 items: 1.5 MB) and the envelope kernel's buffers stay
# in L2. Below OpenBLAS's threading threshold for this product shape, so each product runs on
# the calling thread and the chunks of two threads do not compete for BLAS threads.
_CHUNK = 8192
# Fewer cases than this are not worth a second thread.
_THREAD_MIN = 4 * _CHUNK


class SweepResult(NamedTuple):
    """Result of :func:`sweep_cases`; every field has shape ``masses.shape[:-1]``.

    Attributes
    ----------
    mass : ndarray
        Total mass of each case.
    cg : ndarray
        Longitudinal CG (first coordinate of the envelope's plane) of each case.
    inside : ndarray of bool
        In limits (inclusive, as :func:`ledger.core.envelope.covers`).
    margin : ndarray
        Signed CG margin at the case's mass, as :func:`ledger.core.envelope.assess`.
    """

    mass: np.ndarray
    cg: np.ndarray
    inside: np.ndarray
    margin: np.ndarray


def sweep_cases(masses, arms, polygon, *, tol=None, threads=None) -> SweepResult:
    """Mass, CG, envelope verdict and signed CG margin of many loading cases of the same items.

    The same results as ``mass_properties(masses, arms)`` followed by ``assess(polygon, cg,
    mass)`` (an arm–mass envelope), in one chunked pass over the masses.

    Parameters
    ----------
    masses : array_like, shape (..., n_items)
        Item masses of each case, 0 or more and finite; the last axis runs over the items.
    arms : array_like, shape (n_items,)
        Arm of each item, shared by every case. Arms that differ per case are accepted too
        (broadcast as in :func:`~ledger.core.massprops.mass_properties`) on a slower path.
    polygon : array_like, shape (n, 2)
        Arm–mass envelope (checked by :func:`~ledger.core.envelope.validate_polygon`).
    tol : float, optional
        Tolerance as in :func:`~ledger.core.envelope.covers`.
    threads : int, optional
        Threads to share the cases (the kernels release the GIL); default: the cores this
        process may use. More than that or than the number of chunks is reduced to that.

    Returns
    -------
    SweepResult

    Raises
    ------
    MassPropertiesError
        As :func:`~ledger.core.massprops.mass_properties` (negative or non-finite mass, zero
        total mass, non-finite arm, arms not matching the items).

    Examples
    --------
    An empty mass of 600 kg at 2.3 m and one seat at 2.0 m loaded with 0, 100, 400 and 500 kg
    (at 1,000 kg the forward limit is 2.1 m; at 1,100 kg it is 2.2 m):

    >>> env = [[2.0, 600.0], [2.6, 600.0], [2.6, 1100.0], [2.2, 1100.0], [2.0, 900.0]]
    >>> r = sweep_cases([[600.0, 0.0], [600.0, 100.0], [600.0, 400.0], [600.0, 500.0]],
    ...                 [2.3, 2.0], env)
    >>> r.mass.tolist(), [round(v, 6) for v in r.cg.tolist()]
    ([600.0, 700.0, 1000.0, 1100.0], [2.3, 2.257143, 2.18, 2.163636])
    >>> r.inside.tolist(), [round(v, 6) for v in r.margin.tolist()]
    ([True, True, True, False], [0.3, 0.257143, 0.08, -0.036364])
    """
    try:
        m = np.asarray(masses, dtype=float)
        a = np.asarray(arms, dtype=float)
    except (TypeError, ValueError):
        mass_properties(masses, arms)     # raises, naming the field
        raise
    env = prepare_sweep(polygon, tol)
    thread_count(threads, 1, 1)             # refuse a bad value before any work
    if m.ndim == 0 or a.ndim != 1 or m.shape[-1] == 0 or a.shape[0] != m.shape[-1]:
        return _sweep_general(m, a, env)
    if not np.all(np.isfinite(a)):
        mass_properties(m, a)             # raises for the first non-finite arm
    shape = m.shape[:-1]
    n_items = m.shape[-1]
    M = np.ascontiguousarray(m.reshape(-1, n_items))
    n = M.shape[0]
    # One product per chunk gives the total mass and the moment together.
    A = np.ascontiguousarray(np.column_stack([np.ones(n_items), a]))
    # Mass and CG rows of one array: each chunk's product (cases × 2) is written straight into
    # them as a column-major block with a leading dimension of n, and the CG divided in place.
    out = np.empty((2, n))
    mass, cg = out[0], out[1]
    inside = np.empty(n, dtype=bool)
    margin = np.empty(n)

    jit = kernels() if env._grid else None
    a_c = np.ascontiguousarray(a)

    def run_jit(start: int, stop: int):
        # One compiled pass (ledger.core._jit); the same screens and the same exact-scan
        # points as the numpy chunks below.
        assert jit is not None
        idx = np.empty(stop - start, dtype=np.intp)
        negative, finite, k = jit[0](M, a_c, env._origin, env._inv, env._table, env._K,
                                     env._thr, mass, cg, inside, margin, idx, start, stop)
        return finite and not negative, [idx[:k]]

    def run_numpy(start: int, stop: int):
        work = env._work(_CHUNK)
        near: list = []
        ok = True
        with np.errstate(invalid="ignore", over="ignore", divide="ignore"):
            for s in range(start, stop, _CHUNK):
                e = min(stop, s + _CHUNK)
                block = M[s:e]
                np.matmul(block, A, out=out[:, s:e].T)
                W = mass[s:e]
                X = cg[s:e]
                np.divide(X, W, out=X)
                # Screens (one reduction each, in cache): a NaN or negative mass gives a NaN or
                # negative minimum; an infinite mass, a zero total or an overflowing moment a
                # non-finite CG, so a non-finite CG sum.
                ok = ok and block.min() >= 0.0 and np.isfinite(np.add.reduce(X))
                env._chunk(X, W, inside[s:e], margin[s:e], work, s, near)
        return ok, near

    run = run_numpy if jit is None else run_jit
    parts = split(run, n, thread_count(threads, n, _CHUNK) if n >= _THREAD_MIN else 1, _CHUNK)
    if not all(ok for ok, _ in parts):
        mass_properties(m, a)             # raises, naming the case and the item
        if not (np.all(np.isfinite(cg))):
            raise MassPropertiesError("moment about x", float(cg[~np.isfinite(cg)][0]),
                                      "a finite moment; masses or arms are too large")
    near = [idx for _, part in parts for idx in part]
    env._fix(cg, mass, inside, margin, near)
    return SweepResult(mass.reshape(shape), cg.reshape(shape), inside.reshape(shape),
                       margin.reshape(shape))


def _sweep_general(m: np.ndarray, a: np.ndarray, env) -> SweepResult:
    """Shapes the chunked kernel does not take (arms per case, a single item, no items):
    :func:`mass_properties` and the prepared envelope's ``assess``, whose errors name the
    field."""
    mp = mass_properties(m, a)
    r = env.assess(mp.cg.x, mp.mass)
    shape = np.shape(mp.mass)
    return SweepResult(np.asarray(mp.mass).reshape(shape), np.asarray(mp.cg.x).reshape(shape),
                       np.asarray(r.inside).reshape(shape), np.asarray(r.margin).reshape(shape))
