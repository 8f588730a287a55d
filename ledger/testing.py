"""Comparison helpers for tests: explicit tolerances and failure messages with units.

Used by the test suite and usable by anyone checking wbledger figures against a reference.
"""

from __future__ import annotations

import numpy as np

__all__ = ["assert_close"]


def assert_close(actual, expected, *, unit: str, rtol: float = 1e-9, atol: float = 0.0,
                 what: str = "value", source: str | None = None) -> None:
    """Assert that ``actual`` equals ``expected`` within ``atol + rtol·|expected|``.

    Parameters
    ----------
    actual, expected : float or array_like
        The computed figure and the reference figure, in the same unit.
    unit : str
        Unit of both, shown in the failure message ("kg", "in", "kg·m²").
    rtol, atol : float
        Relative and absolute tolerances. Say in the test why a tolerance is what it is.
    what : str
        Name of the quantity, shown in the message ("CG", "Ixx").
    source : str, optional
        Where the expected figure comes from, shown in the message.

    Examples
    --------
    >>> assert_close(81.4, 81.40000001, unit="in", rtol=1e-6, what="CG")
    >>> assert_close(81.4, 81.5, unit="in", atol=0.01, what="CG")
    Traceback (most recent call last):
    ...
    AssertionError: CG: got 81.4 in, expected 81.5 in (difference 0.1 in; allowed 0.01 in)
    """
    a = np.asarray(actual, dtype=float)
    e = np.asarray(expected, dtype=float)
    diff = np.abs(a - e)
    allowed = atol + rtol * np.abs(e)
    if not np.all(diff <= allowed) or a.shape != np.broadcast(a, e).shape:
        if a.ndim == 0 and e.ndim == 0:
            msg = (f"{what}: got {float(a):.10g} {unit}, expected {float(e):.10g} {unit} "
                   f"(difference {float(diff):.3g} {unit}; allowed {float(allowed):.3g} {unit})")
        else:
            worst = int(np.argmax(np.broadcast_to(diff - allowed, np.broadcast(a, e).shape)))
            msg = (f"{what}: arrays differ; worst at flat index {worst}: "
                   f"got {np.broadcast_to(a, diff.shape).flat[worst]:.10g} {unit}, expected "
                   f"{np.broadcast_to(e, diff.shape).flat[worst]:.10g} {unit}")
        if source:
            msg += f" [reference: {source}]"
        raise AssertionError(msg)
