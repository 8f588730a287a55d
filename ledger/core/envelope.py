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
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
from typing import NamedTuple

import numpy as np

from ledger.core._jit import kernels
from ledger.core._parallel import split, thread_count
from ledger.errors import EnvelopeError, InputError

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
]

# Points per chunk in the containment scan: the working set (a few float64 and bool arrays of
# this length) stays in the L2 cache, while numpy calls per chunk stay few enough that their
# fixed cost is small. Measured on a 2-core Xeon: 16k-32k best, 8k and 64k+ 10-30 % slower.
_CHUNK = 32768
# Normalised-coordinate slack for collinearity in polygon validation (coordinates scaled to the
# unit box, so products of lengths are at most 2).
_ZERO = 1e-12


# --------------------------------------------------------------------------- error display
class _Point(tuple):
    def __str__(self) -> str:
        return "(" + ", ".join(f"{float(c):g}" for c in self) + ")"

    __repr__ = __str__


class _PointList(list):
    def __str__(self) -> str:
        return "[" + ", ".join(str(_Point(p)) for p in self) + "]"

    __repr__ = __str__


def _pt(p) -> str:
    return str(_Point((float(p[0]), float(p[1]))))


# --------------------------------------------------------------------------- validation
def validate_polygon(points, *, field: str = "envelope") -> np.ndarray:
    """Check an envelope polygon and return it as an ``(n, 2)`` float array.

    Accepts either orientation and an open or closed ring (a last point equal to the first is
    dropped). Requires at least 3 distinct points, finite coordinates, no repeated vertex, a
    simple boundary (no two edges cross or touch, except neighbours at their shared vertex)
    and a non-zero area. The points keep their given order, so edge ``k`` runs from point
    ``k`` to point ``k + 1`` (the last edge back to point 0), numbered as in the input.

    Parameters
    ----------
    points : array_like, shape (n, 2)
        The vertices, e.g. ``[[arm, mass], ...]``.
    field : str
        Name of the field in error messages, e.g. ``"envelopes.normal.points"``.

    Returns
    -------
    ndarray, shape (n, 2)

    Raises
    ------
    EnvelopeError
        Naming the field, the offending point(s) and what is allowed.

    Examples
    --------
    >>> validate_polygon([[0, 0], [2, 0], [2, 1], [0, 1], [0, 0]]).tolist()
    [[0.0, 0.0], [2.0, 0.0], [2.0, 1.0], [0.0, 1.0]]
    >>> validate_polygon([[0, 0], [1, 1], [1, 0], [0, 1]], field="envelopes.normal.points")
    Traceback (most recent call last):
    ...
    ledger.errors.EnvelopeError: envelopes.normal.points = [(0, 0), (1, 1), (1, 0), (0, 1)]: \
a simple polygon; edge 0 (0, 0)-(1, 1) and edge 2 (1, 0)-(0, 1) cross at (0.5, 0.5). \
List the points in order round the boundary
    """
    try:
        raw = np.array(points, dtype=float)
    except (TypeError, ValueError):
        raise EnvelopeError(field, points, "a list of [x, y] points (at least 3)") from None
    if raw.ndim != 2 or raw.shape[1] != 2:
        raise EnvelopeError(field, points,
                            f"a list of [x, y] points (at least 3); got an array of shape {raw.shape}")
    shown = _PointList(raw.tolist())
    finite = np.isfinite(raw).all(axis=1)
    if not finite.all():
        i = int(np.argmin(finite))
        raise EnvelopeError(f"{field}[{i}]", _Point(raw[i].tolist()),
                            "a point with finite coordinates (no NaN or infinity)")
    P = raw
    if len(P) >= 2 and np.array_equal(P[0], P[-1]):
        P = P[:-1]
    rows = list(map(tuple, P.tolist()))
    distinct = len(set(rows))
    if distinct < 3:
        raise EnvelopeError(field, shown,
                            f"at least 3 distinct points; got {distinct} "
                            "(a closing point equal to the first is not counted)")
    seen: dict[tuple[float, float], int] = {}
    for j, p in enumerate(rows):
        if p in seen:
            raise EnvelopeError(
                f"{field}[{j}]", _Point(p),
                f"a point different from {field}[{seen[p]}]; a vertex may appear only once "
                "(only a closing point may repeat the first)")
        seen[p] = j
    P = np.ascontiguousarray(P)
    lo = P.min(axis=0)
    ext = P.max(axis=0) - lo
    if ext[0] == 0 or ext[1] == 0:
        raise EnvelopeError(field, shown, "points that enclose an area; these all lie on one line")
    Q = (P - lo) / ext
    n = len(Q)
    Qn = np.roll(Q, -1, axis=0)
    sv = np.linalg.svd(Q - Q.mean(axis=0), compute_uv=False)
    if sv[-1] <= _ZERO * max(sv[0], 1.0):
        raise EnvelopeError(field, shown, "points that enclose an area; these all lie on one line")

    # Neighbouring edges may only share their vertex: one folding back over the other is a spike.
    u = Q - np.roll(Q, 1, axis=0)          # edge (k-1) direction, ending at vertex k
    v = Qn - Q                             # edge k direction, starting at vertex k
    fold = (np.abs(u[:, 0] * v[:, 1] - u[:, 1] * v[:, 0]) <= _ZERO) & (np.sum(u * v, axis=1) < 0)
    if fold.any():
        k = int(np.argmax(fold))
        a = (k - 1) % n
        raise EnvelopeError(
            field, shown,
            f"a simple polygon; edge {a} {_pt(P[a])}-{_pt(P[k])} and edge {k} "
            f"{_pt(P[k])}-{_pt(P[(k + 1) % n])} overlap (the boundary folds back at {_pt(P[k])})",
            hint="List the points in order round the boundary")

    if n >= 4:
        ii, jj = np.triu_indices(n, k=2)
        keep = ~((ii == 0) & (jj == n - 1))
        ii, jj = ii[keep], jj[keep]
        a, b = Q[ii], Qn[ii]
        c, d = Q[jj], Qn[jj]

        def orient(p, q, r):
            o = (q[:, 0] - p[:, 0]) * (r[:, 1] - p[:, 1]) - (q[:, 1] - p[:, 1]) * (r[:, 0] - p[:, 0])
            return np.where(np.abs(o) <= _ZERO, 0.0, o)

        def within(p, q, r):
            return ((np.minimum(p[:, 0], q[:, 0]) - _ZERO <= r[:, 0])
                    & (r[:, 0] <= np.maximum(p[:, 0], q[:, 0]) + _ZERO)
                    & (np.minimum(p[:, 1], q[:, 1]) - _ZERO <= r[:, 1])
                    & (r[:, 1] <= np.maximum(p[:, 1], q[:, 1]) + _ZERO))

        o1, o2, o3, o4 = orient(c, d, a), orient(c, d, b), orient(a, b, c), orient(a, b, d)
        proper = (o1 * o2 < 0) & (o3 * o4 < 0)
        t1 = (o1 == 0) & within(c, d, a)
        t2 = (o2 == 0) & within(c, d, b)
        t3 = (o3 == 0) & within(a, b, c)
        t4 = (o4 == 0) & within(a, b, d)
        bad = proper | t1 | t2 | t3 | t4
        if bad.any():
            k = int(np.argmax(bad))
            i, j = int(ii[k]), int(jj[k])
            pa, pb, pc, pd = P[i], P[(i + 1) % n], P[j], P[(j + 1) % n]
            if proper[k]:
                r, s = pb - pa, pd - pc
                t = ((pc[0] - pa[0]) * s[1] - (pc[1] - pa[1]) * s[0]) / (r[0] * s[1] - r[1] * s[0])
                what = f"cross at {_pt(pa + t * r)}"
            elif o1[k] == 0 and o2[k] == 0 and int(t1[k]) + int(t2[k]) + int(t3[k]) + int(t4[k]) >= 2:
                what = "overlap"
            else:
                where = pa if t1[k] else pb if t2[k] else pc if t3[k] else pd
                what = f"touch at {_pt(where)}"
            raise EnvelopeError(
                field, shown,
                f"a simple polygon; edge {i} {_pt(pa)}-{_pt(pb)} and edge {j} "
                f"{_pt(pc)}-{_pt(pd)} {what}",
                hint="List the points in order round the boundary")
    # A simple ring of points not all on one line encloses an area; this guards rounding.
    area = 0.5 * float(np.sum(Q[:, 0] * Qn[:, 1] - Qn[:, 0] * Q[:, 1]))
    if abs(area) <= _ZERO:
        raise EnvelopeError(field, shown, "points that enclose an area; these all lie on one line")
    return P


def default_tolerance(polygon) -> float:
    """Default containment tolerance: 1e-9 × the smaller side of the polygon's bounding box.

    The smaller side, so that on an arm–mass envelope (say 0.6 m by 600 kg) the slack stays
    negligible along both axes; it only absorbs floating-point rounding.

    Examples
    --------
    >>> default_tolerance([[2.0, 500.0], [2.5, 500.0], [2.4, 1100.0]])  # 1e-9 × 0.5 m
    5e-10
    """
    P = validate_polygon(polygon)
    return float(1e-9 * np.min(P.max(axis=0) - P.min(axis=0)))


# --------------------------------------------------------------------------- preparation
@dataclass(frozen=True)
class _Prepared:
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
        return float(1e-9 * np.min(P.max(axis=0) - P.min(axis=0)))
    return tol


@lru_cache(maxsize=64)
def _prepare_cached(data: bytes, shape: tuple, tol, field: str) -> _Prepared:
    raw = np.frombuffer(data, dtype=float).reshape(shape)
    P = validate_polygon(raw.tolist(), field=field)   # a list shows plainly in messages
    P.setflags(write=False)
    t = _tolerance(tol, P)
    levels, inv = np.unique(P[:, 1], return_inverse=True)
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
    return _Prepared(
        P=P, tol=t, levels=tuple(float(v) for v in levels), edges=tuple(edges),
        hbands=tuple((y - t, y + t) for y in sorted(hb)),
        lbands=tuple((float(y) - t, float(y) + t) for y in levels),
        xlevels=np.unique(P[:, 0]))


def _prepare(polygon, tol, field: str = "envelope") -> _Prepared:
    try:
        raw = np.ascontiguousarray(polygon, dtype=float)
    except (TypeError, ValueError):
        raise EnvelopeError(field, polygon, "a list of [x, y] points (at least 3)") from None
    return _prepare_cached(raw.tobytes(), raw.shape, _check_tol(tol), field)


def _points(px, py, names=("px", "py")):
    try:
        if py is None:
            a = np.asarray(px, dtype=float)
            if a.shape[-1:] != (2,):
                raise InputError(names[0], px, "an array of (x, y) points with last axis of length 2")
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
    a = a.reshape(shape)
    return a.item() if a.ndim == 0 else a


# --------------------------------------------------------------------------- containment
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


def _scan(prep: _Prepared, X: np.ndarray, Y: np.ndarray, want_margin: bool):
    """Chunked crossing-number scan.

    A non-horizontal edge lies on the line ``x = k·y + m``; for a point, ``e = x − k·y`` is
    compared with ``m``: ``e < m`` on an edge straddling the point's level is a crossing to
    the right (parity odd = inside). Points with ``e`` within ``w`` of ``m`` are within ``tol``
    of that edge's line, and points within ``tol`` of a horizontal edge's level: only those few
    are tested again exactly (:func:`_covers_exact`) for the inclusive verdict.

    With ``want_margin`` the scan also keeps ``|e − m|`` minimised over straddling edges: the
    horizontal distance to the nearest limit at the point's mass. Points within ``tol`` of a
    vertex level get it from :func:`_section`, which handles vertices and horizontal edges
    on the line.
    """
    n = X.size
    inside = np.empty(n, dtype=bool)
    margin = np.empty(n) if want_margin else None
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
            if want_margin:
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
    if near_idx:
        idx = np.concatenate(near_idx)
        inside[idx] = _covers_exact(prep.P, X[idx], Y[idx], prep.tol)
        if want_margin:
            margin[idx] = np.where(inside[idx], np.abs(margin[idx]), -np.abs(margin[idx]))
    if want_margin:
        if level_idx:
            idx = np.concatenate(level_idx)
            v = _snap(Y[idx], np.asarray(prep.levels), prep.tol)
            lo, hi = _section(prep.P, X[idx], v, prep.tol)
            m = np.abs(np.minimum(X[idx] - lo, hi - X[idx]))
            m[np.isnan(m)] = np.inf
            margin[idx] = np.where(inside[idx], m, -m)
    return inside, margin


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
    prep = _prepare(polygon, tol)
    X, Y, shape = _points(px, py)
    inside, _ = _scan_many(polygon, tol, prep, X, Y, want_margin=False)
    return _shape_out(inside, shape)


class Assessment(NamedTuple):
    """Result of :func:`assess`: verdict and signed CG margin at the point's mass."""

    inside: bool | np.ndarray
    margin: float | np.ndarray


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
    prep = _prepare(polygon, tol)
    X, Y, shape = _points(x, y, names=("x", "y"))
    inside, margin = _scan_many(polygon, tol, prep, X, Y, want_margin=True)
    return Assessment(_shape_out(inside, shape), _shape_out(margin, shape))


# From this many points on, covers and assess go through the envelope prepared for sweeps when
# the compiled kernel is there (its verdicts and margins are those of the scan). Its table is
# built once per envelope and cached; the build (0.3 ms here for an envelope of a few tens of
# vertices, more for thousands) costs about what this many points save on a first call, and
# later calls take a fifth to two thirds of the time (measured here).
_TABLE_MIN = 65536


def _scan_many(polygon, tol, prep: _Prepared, X: np.ndarray, Y: np.ndarray, want_margin: bool):
    if X.size >= _TABLE_MIN and kernels() is not None:
        env = prepare_sweep(polygon, tol)
        if env._grid:
            return env._run(X, Y, want_margin)
    return _scan(prep, X, Y, want_margin)


# --------------------------------------------------------------------------- prepared for sweeps
# Points per chunk of the prepared kernel: its buffers (a few float arrays of this length and
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


class SweepEnvelope:
    """An envelope prepared for verdicts and margins of many points; see :func:`prepare_sweep`.

    Attributes
    ----------
    polygon : ndarray, shape (n, 2)
        The validated vertices (read-only).
    tol : float
        The containment tolerance in use (the default resolved to a number).
    """

    def __init__(self, prep: _Prepared) -> None:
        self._prep = prep
        P, t = prep.P, prep.tol
        L = np.asarray(prep.levels)
        q = L.size
        # Between two consecutive vertex levels the edges crossing a horizontal line are fixed,
        # and each crossing is x = k·y + m; sorted by x they pair up into the intervals in limits.
        bands = []
        for b in range(1, q):
            ym = 0.5 * (L[b - 1] + L[b])
            cr = sorted((k * ym + m, k, m) for (i, j, k, m, _w) in prep.edges
                        if min(i, j) <= b - 1 and max(i, j) >= b)
            bands.append([(cr[2 * p][1], cr[2 * p][2], cr[2 * p + 1][1], cr[2 * p + 1][2])
                          for p in range(len(cr) // 2)])
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
        mixed = ((lo_band[None, :] <= c_hi[:, None]) & (hi_band[None, :] >= c_lo[:, None])).any(axis=1)
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
        scale = max(abs(k) * float(np.max(np.abs(L))) + abs(m) for (_i, _j, k, m, _w) in prep.edges)
        scale += float(np.max(np.abs(P[:, 0])))
        self._thr = float(max(ws) + 64.0 * np.finfo(float).eps * scale)

    @property
    def polygon(self) -> np.ndarray:
        return self._prep.P

    @property
    def tol(self) -> float:
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
        """Exact scan (as :func:`assess`) for the points left over by :meth:`_chunk` or the
        compiled kernel; verdicts only when ``margin`` is None."""
        if not near:
            return
        idx = np.concatenate(near)
        if idx.size:
            ins, mar = _scan(self._prep, X[idx], Y[idx], want_margin=margin is not None)
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
            near = []
            work = self._work(min(_SWEEP_CHUNK, max(n, 1)))
            with np.errstate(invalid="ignore", over="ignore"):
                for s in range(0, n, _SWEEP_CHUNK):
                    e = min(n, s + _SWEEP_CHUNK)
                    self._chunk(X[s:e], Y[s:e], inside[s:e], margin[s:e], work, s, near)
        self._fix(X, Y, inside, margin if want_margin else None, near)
        return inside, (margin if want_margin else None)

    def assess(self, x, y) -> Assessment:
        """Verdict and signed CG margin of each point: the same results as :func:`assess` (with
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


# --------------------------------------------------------------------------- sections, margins
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
        best_lo = np.full(U.shape, np.nan)
        best_hi = np.full(U.shape, np.nan)
        best_d = np.full(U.shape, np.inf)

        def consider(clo, chi, mask):
            valid = mask & np.isfinite(clo)
            dd = np.maximum(clo - U, 0.0) + np.maximum(U - chi, 0.0)
            better = valid & (dd < best_d)
            best_lo[better] = clo[better]
            best_hi[better] = chi[better]
            best_d[better] = dd[better]

        cur_lo = lo[:, 0].copy()
        cur_hi = hi[:, 0].copy()
        for k in range(1, lo.shape[1]):
            nl, nh = lo[:, k], hi[:, k]
            join = nl <= cur_hi + tol
            consider(cur_lo, cur_hi, ~join)
            cur_lo = np.where(join, cur_lo, nl)
            cur_hi = np.where(join, np.maximum(cur_hi, nh), nh)
        consider(cur_lo, cur_hi, np.ones(U.shape, dtype=bool))
        out_lo[s:s + step] = best_lo
        out_hi[s:s + step] = best_hi
    return out_lo, out_hi


def _nearest_edge(P: np.ndarray, X: np.ndarray, Y: np.ndarray, sx: float, sy: float):
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
        Covered by the envelope (:func:`covers`).
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
        from ledger.core.massprops import percent_mac

        per_unit = percent_mac(1.0, 0.0, mac)   # 100 / MAC (and MAC checked)
        return MacMargins(percent_mac(self.fwd_limit, lemac, mac),
                          percent_mac(self.aft_limit, lemac, mac),
                          _plain(np.asarray(self.to_fwd) * per_unit),
                          _plain(np.asarray(self.to_aft) * per_unit))


def _plain(a):
    a = np.asarray(a)
    return a.item() if a.ndim == 0 else a


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
    prep = _prepare(polygon, tol)
    X, Y, shape = _points(cg, mass, names=("cg", "mass"))
    P = prep.P
    inside, _ = _scan(prep, X, Y, want_margin=False)
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
        try:
            sx, sy = (float(s) for s in scale)
        except (TypeError, ValueError):
            raise InputError("scale", scale, "two positive numbers (x divisor, y divisor)") from None
        if not (np.isfinite(sx) and np.isfinite(sy) and sx > 0 and sy > 0):
            raise InputError("scale", scale, "two positive numbers (x divisor, y divisor)")
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


# --------------------------------------------------------------------------- paths
class PathCheck(NamedTuple):
    """Result of :func:`path_inside`.

    ``first_exit`` is the last covered point before the path first leaves the envelope (on the
    boundary, or the start point if it is already outside) and ``segment`` the index of the
    segment (from point ``segment`` to ``segment + 1``) where that happens; both ``None`` when
    the whole path is inside.
    """

    inside: bool
    first_exit: tuple[float, float] | None
    segment: int | None


def path_inside(polygon, px, py, *, tol=None) -> PathCheck:
    """Is every point of a polyline covered by the envelope, not only its vertices?

    Each segment is split where it meets the polygon's edges and the midpoint of every piece
    is tested with :func:`covers`; between two consecutive meeting points a piece is either
    wholly in or wholly out. Use it for the CG path while fuel burns (ramp → take-off →
    landing), in the polygon's own coordinates.

    Parameters
    ----------
    polygon : array_like, shape (n, 2)
    px, py : array_like, shape (k,)
        The path's points in order (at least one).
    tol : float, optional
        Tolerance as in :func:`covers`.

    Returns
    -------
    PathCheck

    Examples
    --------
    A notch in the top of the envelope: both ends are in limits, the straight path is not.

    >>> env = [[0, 0], [4, 0], [4, 3], [3, 3], [2, 1], [1, 3], [0, 3]]
    >>> path_inside(env, [0.5, 3.5], [2.5, 2.5])
    PathCheck(inside=False, first_exit=(1.25, 2.5), segment=0)
    >>> path_inside(env, [0.5, 2.0, 3.5], [2.5, 0.5, 2.5]).inside
    True
    """
    prep = _prepare(polygon, tol)
    X, Y, _ = _points(px, py)
    if X.size == 0:
        raise InputError("path", [], "at least one point")
    finite = np.isfinite(X) & np.isfinite(Y)
    if not finite.all():
        i = int(np.argmin(finite))
        raise InputError(f"path[{i}]", _Point((float(X[i]), float(Y[i]))),
                         "a point with finite coordinates")
    if not covers(polygon, X[0], Y[0], tol=tol):
        return PathCheck(False, (float(X[0]), float(Y[0])), 0)
    if X.size == 1:
        return PathCheck(True, None, None)
    P = prep.P
    Ax, Ay = X[:-1, None], Y[:-1, None]
    rx, ry = (X[1:] - X[:-1])[:, None], (Y[1:] - Y[:-1])[:, None]
    Cx, Cy = P[:, 0], P[:, 1]
    qx, qy = np.roll(Cx, -1) - Cx, np.roll(Cy, -1) - Cy
    wx, wy = Cx - Ax, Cy - Ay
    den = rx * qy - ry * qx
    rn = np.hypot(rx, ry)
    qn = np.hypot(qx, qy)
    wr = wx * ry - wy * rx                      # cross(w, r)
    with np.errstate(divide="ignore", invalid="ignore"):
        t = (wx * qy - wy * qx) / den
        s = wr / den
        parallel = np.abs(den) <= 1e-12 * rn * qn
        slack = 1e-9
        hit = ~parallel & (s >= -slack) & (s <= 1 + slack) & (t >= -slack) & (t <= 1 + slack)
        collinear = parallel & (np.abs(wr) <= 1e-12 * rn * np.maximum(np.hypot(wx, wy), qn)) & (rn > 0)
        r2 = rn * rn
        tc = (wx * rx + wy * ry) / r2
        td = ((wx + qx) * rx + (wy + qy) * ry) / r2
    S = X.size - 1
    cols = [np.zeros((S, 1)), np.where(hit, t, 1.0),
            np.where(collinear, tc, 1.0), np.where(collinear, td, 1.0), np.ones((S, 1))]
    T = np.clip(np.concatenate(cols, axis=1), 0.0, 1.0)
    T = np.where(np.isfinite(T), T, 1.0)
    T.sort(axis=1)
    mid = 0.5 * (T[:, :-1] + T[:, 1:])
    length = T[:, 1:] - T[:, :-1]
    mx = Ax + mid * rx
    my = Ay + mid * ry
    cov = covers(polygon, mx, my, tol=tol)
    fail = ~cov & (length > 0) & (rn > 0)
    if not fail.any():
        return PathCheck(True, None, None)
    flat = int(np.argmax(fail.reshape(-1)))
    seg, k = divmod(flat, fail.shape[1])
    te = T[seg, k]
    return PathCheck(False, (float(X[seg] + te * (X[seg + 1] - X[seg])),
                             float(Y[seg] + te * (Y[seg + 1] - Y[seg]))), int(seg))
