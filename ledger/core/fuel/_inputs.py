"""Checks and results every fuel calculation shares."""

from __future__ import annotations

import numpy as np

from ledger.errors import InputError


def _known(names) -> str:
    return ", ".join(repr(n) for n in names)


def _finite_array(value, field: str, allowed: str) -> np.ndarray:
    try:
        arr = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise InputError(field, value, allowed) from None
    if not np.all(np.isfinite(arr)):
        bad = arr[~np.isfinite(arr)].flat[0] if arr.ndim else float(arr)
        raise InputError(field, float(bad), allowed)
    return arr


def _out(arr: np.ndarray):
    """Plain float for a 0-d result, an array otherwise."""
    return float(arr) if np.ndim(arr) == 0 else arr


def _first_bad(arr: np.ndarray, mask: np.ndarray):
    """The first offending value and its label suffix ("" for a scalar, "[i]" for arrays)."""
    if arr.ndim == 0:
        return float(arr), ""
    idx = np.argwhere(mask)[0]
    label = "[" + ", ".join(str(int(i)) for i in idx) + "]"
    return float(arr[tuple(idx)]), label

