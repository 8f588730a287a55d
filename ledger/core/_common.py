"""Small helpers every core module shares: one home for each (issue 12).

Private to :mod:`ledger.core`; the public functions of the core modules call them.
"""

from __future__ import annotations

import math

import numpy as np

from ledger.errors import InputError

__all__ = ["plain", "finite_float", "index_text"]


def plain(a):
    """0-d arrays become Python floats/bools; other arrays are returned as they are.

    Examples
    --------
    >>> plain(np.float64(2.5)), plain(np.array([1.0])).tolist()
    (2.5, [1.0])
    """
    a = np.asarray(a)
    return a.item() if a.ndim == 0 else a


def finite_float(value, field: str, allowed: str, error: type[InputError] = InputError) -> float:
    """``value`` as a finite float, else ``error(field, value, allowed)``.

    ``error`` is the narrow :class:`~ledger.errors.InputError` subclass of the calling module
    (for example :class:`~ledger.errors.MassPropertiesError`).

    Examples
    --------
    >>> finite_float("2.5", "wheelbase", "a finite length in m")
    2.5
    >>> finite_float(float("nan"), "wheelbase", "a finite length in m")
    Traceback (most recent call last):
    ...
    ledger.errors.InputError: wheelbase = nan: a finite length in m
    """
    try:
        v = float(value)
    except (TypeError, ValueError):
        raise error(field, value, allowed) from None
    if not math.isfinite(v):
        raise error(field, v, allowed)
    return v


def index_text(idx) -> str:
    """An array index as error messages show it: ``(2, 0)`` becomes ``"2, 0"``.

    Examples
    --------
    >>> index_text((np.int64(2), 0)), index_text(())
    ('2, 0', '')
    """
    return ", ".join(str(int(i)) for i in idx)
