"""A whole path of points against an envelope: the CG path while fuel burns."""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from ledger.core.envelope.containment import covers
from ledger.core.envelope.polygon import _Point
from ledger.core.envelope.prepared import _points, prepare_envelope
from ledger.errors import InputError

__all__ = ["path_inside", "PathCheck"]


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
    prep = prepare_envelope(polygon, tol)
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
    T = _meeting_parameters(prep.P, X, Y)
    Ax, Ay = X[:-1, None], Y[:-1, None]
    rx, ry = (X[1:] - X[:-1])[:, None], (Y[1:] - Y[:-1])[:, None]
    rn = np.hypot(rx, ry)
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


def _meeting_parameters(P: np.ndarray, X: np.ndarray, Y: np.ndarray) -> np.ndarray:
    """Per segment of the path, the sorted parameters (0 to 1 along it) of its ends and of
    the points where it meets the polygon's edges; between two consecutive ones a piece of the
    segment is wholly in or wholly out."""
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
        collinear = (parallel & (np.abs(wr) <= 1e-12 * rn * np.maximum(np.hypot(wx, wy), qn))
                     & (rn > 0))
        r2 = rn * rn
        tc = (wx * rx + wy * ry) / r2
        td = ((wx + qx) * rx + (wy + qy) * ry) / r2
    S = X.size - 1
    cols = [np.zeros((S, 1)), np.where(hit, t, 1.0),
            np.where(collinear, tc, 1.0), np.where(collinear, td, 1.0), np.ones((S, 1))]
    T = np.clip(np.concatenate(cols, axis=1), 0.0, 1.0)
    T = np.where(np.isfinite(T), T, 1.0)
    T.sort(axis=1)
    return T
