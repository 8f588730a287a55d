"""An envelope prepared for containment: checked vertices, edges as lines, tolerance bands.

Preparing is the part of every containment call that depends on the polygon alone; it is cached
per (polygon, tolerance), so repeated calls on one envelope pay for it once.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from ledger.core.envelope.polygon import _default_tolerance, validate_polygon
from ledger.errors import EnvelopeError, InputError

__all__ = ["PreparedEnvelope", "prepare_envelope"]

@dataclass(frozen=True)
class PreparedEnvelope:
    """A checked envelope with its edges as lines; made by :func:`prepare_envelope`.

    Attributes
    ----------
    P : ndarray, shape (n, 2)
        The validated vertices (read-only).
    tol : float
        The containment tolerance in use (the default resolved to a number).
    levels : tuple of float
        The distinct vertex y values (masses), sorted.
    edges : tuple
        The non-horizontal edges as ``(level_i, level_j, k, m, w)``: the edge lies on the line
        ``x = k·y + m`` between levels ``i`` and ``j``, and a point within ``tol`` of that line
        has ``|x − k·y − m| <= w``.
    hbands, lbands : tuple of (float, float)
        The y-bands (y ± tol) of the horizontal edges, and of every vertex level.
    xlevels : ndarray
        The distinct vertex x values, sorted.
    """

    P: np.ndarray            # validated vertices, (n, 2)
    tol: float
    levels: tuple            # distinct vertex y values (sorted)
    edges: tuple             # non-horizontal edges: (level_i, level_j, k, m, w), x = k·y + m
    hbands: tuple            # y-bands (y ± tol) of horizontal edges
    lbands: tuple            # y-bands of all vertex levels
    xlevels: np.ndarray      # distinct vertex x values (sorted)


def _check_tol(tol) -> float | None:
    if tol is None:
        return None
    try:
        value = float(tol)
    except (TypeError, ValueError):
        value = float("nan")
    if not (np.isfinite(value) and value >= 0):
        raise InputError("tol", tol, "a finite tolerance of 0 or more (in the polygon's units)")
    return value


def _tolerance(tol: float | None, P: np.ndarray) -> float:
    if tol is None:
        return _default_tolerance(P)
    return tol


def _distinct(values: np.ndarray) -> np.ndarray:
    """The distinct values, sorted: ``np.unique`` for finite floats, without the import of
    ``numpy.ma`` that ``np.unique`` makes on first use (a command checking one plan would pay
    for it)."""
    v = np.sort(values)
    keep = np.empty(len(v), dtype=bool)
    keep[:1] = True
    np.not_equal(v[1:], v[:-1], out=keep[1:])
    return v[keep]


@lru_cache(maxsize=64)
def _prepare_cached(data: bytes, shape: tuple, tol, field: str) -> PreparedEnvelope:
    raw = np.frombuffer(data, dtype=float).reshape(shape)
    P = validate_polygon(raw.tolist(), field=field)   # a list shows plainly in messages
    P.setflags(write=False)
    t = _tolerance(tol, P)
    levels = _distinct(P[:, 1])
    inv = np.searchsorted(levels, P[:, 1])
    n = len(P)
    edges = []
    hb = set()
    for i in range(n):
        j = (i + 1) % n
        x1, y1 = P[i]
        x2, y2 = P[j]
        if y1 == y2:
            hb.add(float(y1))
            continue
        k = (x2 - x1) / (y2 - y1)
        m = x1 - k * y1
        # Points within `t` of the edge's line have |x - k·y - m| <= w (horizontal distance).
        w = t * np.hypot(x2 - x1, y2 - y1) / abs(y2 - y1)
        edges.append((int(inv[i]), int(inv[j]), float(k), float(m), float(w)))
    return PreparedEnvelope(
        P=P, tol=t, levels=tuple(float(v) for v in levels), edges=tuple(edges),
        hbands=tuple((y - t, y + t) for y in sorted(hb)),
        lbands=tuple((float(y) - t, float(y) + t) for y in levels),
        xlevels=_distinct(P[:, 0]))


def prepare_envelope(polygon, tol=None, *, field: str = "envelope") -> PreparedEnvelope:
    """Check an envelope and prepare it for :func:`~ledger.core.envelope.scan_points`.

    Parameters
    ----------
    polygon : array_like, shape (n, 2)
        Envelope vertices (checked by :func:`validate_polygon`; results are cached).
    tol : float, optional
        Tolerance as in :func:`~ledger.core.envelope.covers`; default
        :func:`default_tolerance`.
    field : str
        Name of the polygon in error messages.

    Returns
    -------
    PreparedEnvelope

    Raises
    ------
    EnvelopeError
        The polygon is not a valid envelope.
    InputError
        ``tol`` is not a finite number of 0 or more.

    Examples
    --------
    >>> prep = prepare_envelope([[0, 0], [2, 0], [2, 1], [0, 1]])
    >>> prep.levels, prep.tol
    ((0.0, 1.0), 1e-09)
    """
    try:
        raw = np.ascontiguousarray(polygon, dtype=float)
    except (TypeError, ValueError):
        raise EnvelopeError(field, polygon, "a list of [x, y] points (at least 3)") from None
    return _prepare_cached(raw.tobytes(), raw.shape, _check_tol(tol), field)


def _points(px, py, names=("px", "py")):
    """Flat contiguous x and y arrays of the points, and the shape to give results."""
    try:
        if py is None:
            a = np.asarray(px, dtype=float)
            if a.shape[-1:] != (2,):
                raise InputError(names[0], px,
                                 "an array of (x, y) points with last axis of length 2")
            X, Y = a[..., 0], a[..., 1]
        else:
            X, Y = np.broadcast_arrays(np.asarray(px, dtype=float), np.asarray(py, dtype=float))
    except (TypeError, ValueError) as exc:
        if isinstance(exc, InputError):
            raise
        raise InputError(f"{names[0]}, {names[1]}", px,
                         "numbers or arrays of numbers of matching shapes") from None
    shape = X.shape
    return (np.ascontiguousarray(X, dtype=float).reshape(-1),
            np.ascontiguousarray(Y, dtype=float).reshape(-1), shape)


def _shape_out(a: np.ndarray, shape):
    """``a`` in the points' shape; a 0-d result becomes a Python scalar."""
    a = a.reshape(shape)
    return a.item() if a.ndim == 0 else a
