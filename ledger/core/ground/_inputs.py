"""Checks of the inputs every road-vehicle calculation shares."""

from __future__ import annotations

import numpy as np

from ledger.errors import InputError


def _vec(value, field: str, allowed: str, n: int | None = None) -> np.ndarray:
    try:
        arr = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise InputError(field, value, allowed) from None
    if n is not None and arr.ndim == 0:
        arr = np.full(n, float(arr))
    if arr.ndim != 1 or (n is not None and arr.size != n) or arr.size == 0:
        want = f"{n} values" if n is not None else "a non-empty list"
        raise InputError(field, value, f"{want}: {allowed}")
    bad = ~np.isfinite(arr)
    if np.any(bad):
        i = int(np.argmax(bad))
        raise InputError(f"{field}[{i}]", float(arr[i]), allowed)
    return arr


def _axle_positions(axle_x) -> np.ndarray:
    """Axle positions as an array, checked finite and strictly increasing (front to rear)."""
    ax = _vec(axle_x, "axle_x", "finite axle positions in m")
    steps = np.diff(ax)
    if np.any(steps <= 0):
        i = int(np.argmax(steps <= 0)) + 1
        raise InputError(f"axle_x[{i}]", float(ax[i]),
                         f"a position aft of axle {i - 1} ({ax[i - 1]:g} m); list axles front "
                         f"to rear")
    return ax

