"""Envelope polygons: checking the vertices, and the default containment tolerance."""

from __future__ import annotations

import numpy as np

from ledger.errors import EnvelopeError

__all__ = ["validate_polygon", "default_tolerance"]

# Normalised-coordinate slack for collinearity in polygon validation (coordinates scaled to the
# unit box, so products of lengths are at most 2).
_ZERO = 1e-12


# --------------------------------------------------------------------------- error display
class _Point(tuple):
    """A point shown as ``(x, y)`` in messages."""

    def __str__(self) -> str:
        return "(" + ", ".join(f"{float(c):g}" for c in self) + ")"

    __repr__ = __str__


class _PointList(list):
    """A list of points shown as ``[(x, y), ...]`` in messages."""

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
    P, shown = _distinct_vertices(points, field)
    lo = P.min(axis=0)
    ext = P.max(axis=0) - lo
    if ext[0] == 0 or ext[1] == 0:
        raise EnvelopeError(field, shown, "points that enclose an area; these all lie on one line")
    Q = (P - lo) / ext
    Qn = np.roll(Q, -1, axis=0)
    sv = np.linalg.svd(Q - Q.mean(axis=0), compute_uv=False)
    if sv[-1] <= _ZERO * max(sv[0], 1.0):
        raise EnvelopeError(field, shown, "points that enclose an area; these all lie on one line")
    _check_no_fold(P, Q, Qn, field, shown)
    if len(Q) >= 4:
        _check_no_crossing(P, Q, Qn, field, shown)
    # A simple ring of points not all on one line encloses an area; this guards rounding.
    area = 0.5 * float(np.sum(Q[:, 0] * Qn[:, 1] - Qn[:, 0] * Q[:, 1]))
    if abs(area) <= _ZERO:
        raise EnvelopeError(field, shown, "points that enclose an area; these all lie on one line")
    return P


def _distinct_vertices(points, field: str) -> tuple[np.ndarray, _PointList]:
    """The vertices as a contiguous ``(n, 2)`` array without the closing point, and the input
    as it is shown in messages; refuses non-finite, too few or repeated points."""
    try:
        raw = np.array(points, dtype=float)
    except (TypeError, ValueError):
        raise EnvelopeError(field, points, "a list of [x, y] points (at least 3)") from None
    if raw.ndim != 2 or raw.shape[1] != 2:
        raise EnvelopeError(
            field, points,
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
    return np.ascontiguousarray(P), shown


def _check_no_fold(P: np.ndarray, Q: np.ndarray, Qn: np.ndarray, field: str, shown) -> None:
    """Neighbouring edges may only share their vertex: one folding back over the other is a
    spike. ``Q`` is ``P`` scaled to the unit box, ``Qn`` the next vertex of each."""
    n = len(Q)
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


def _orient(p, q, r):
    """Orientation of each triple (p, q, r): its cross product, 0 within the slack."""
    o = (q[:, 0] - p[:, 0]) * (r[:, 1] - p[:, 1]) - (q[:, 1] - p[:, 1]) * (r[:, 0] - p[:, 0])
    return np.where(np.abs(o) <= _ZERO, 0.0, o)


def _within(p, q, r):
    """Whether each r lies in the bounding box of the segment p-q (within the slack)."""
    return ((np.minimum(p[:, 0], q[:, 0]) - _ZERO <= r[:, 0])
            & (r[:, 0] <= np.maximum(p[:, 0], q[:, 0]) + _ZERO)
            & (np.minimum(p[:, 1], q[:, 1]) - _ZERO <= r[:, 1])
            & (r[:, 1] <= np.maximum(p[:, 1], q[:, 1]) + _ZERO))


def _check_no_crossing(P: np.ndarray, Q: np.ndarray, Qn: np.ndarray, field: str, shown) -> None:
    """No two edges that are not neighbours may cross, touch or overlap."""
    n = len(Q)
    ii, jj = np.triu_indices(n, k=2)
    keep = ~((ii == 0) & (jj == n - 1))
    ii, jj = ii[keep], jj[keep]
    a, b = Q[ii], Qn[ii]
    c, d = Q[jj], Qn[jj]
    o1, o2, o3, o4 = _orient(c, d, a), _orient(c, d, b), _orient(a, b, c), _orient(a, b, d)
    proper = (o1 * o2 < 0) & (o3 * o4 < 0)
    t1 = (o1 == 0) & _within(c, d, a)
    t2 = (o2 == 0) & _within(c, d, b)
    t3 = (o3 == 0) & _within(a, b, c)
    t4 = (o4 == 0) & _within(a, b, d)
    bad = proper | t1 | t2 | t3 | t4
    if not bad.any():
        return
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


def default_tolerance(polygon) -> float:
    """Default containment tolerance: 1e-9 × the smaller side of the polygon's bounding box.

    The smaller side, so that on an arm–mass envelope (say 0.6 m by 600 kg) the slack stays
    negligible along both axes; it only absorbs floating-point rounding.

    Examples
    --------
    >>> default_tolerance([[2.0, 500.0], [2.5, 500.0], [2.4, 1100.0]])  # 1e-9 × 0.5 m
    5e-10
    """
    return _default_tolerance(validate_polygon(polygon))


def _default_tolerance(P: np.ndarray) -> float:
    """:func:`default_tolerance` of vertices already checked."""
    return float(1e-9 * np.min(P.max(axis=0) - P.min(axis=0)))
