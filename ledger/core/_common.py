"""Small helpers every core module shares: one home for each (issue 12).

Private to :mod:`ledger.core`; the public functions of the core modules call them.
"""

from __future__ import annotations

import numpy as np

__all__ = ["plain"]


def plain(a):
    """0-d arrays become Python floats/bools; other arrays are returned as they are.

    Examples
    --------
    >>> plain(np.float64(2.5)), plain(np.array([1.0])).tolist()
    (2.5, [1.0])
    """
    a = np.asarray(a)
    return a.item() if a.ndim == 0 else a
