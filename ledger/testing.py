"""Helpers for tests: comparison with explicit tolerances and units, small invented vehicle types
as TOML text, and a ledger database built through the migrations.

Used by the test suite and the benchmarks, and usable by anyone checking wbledger figures
against a reference.
"""

from __future__ import annotations

from collections.abc import Mapping

import numpy as np

__all__ = ["assert_close", "lb_in_type", "station", "tank", "envelope", "reaction_point",
           "new_ledger", "import_types"]


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


# --- small vehicle types as TOML text ----------------------------------------------------------
# Test fixtures, no real vehicle's data: each test that checks a figure says which published
# example or formula the figure comes from.

def lb_in_type(*, name: str = "TEST-LBIN", title: str | None = None,
               limits: str = "max_takeoff = 8000", stations: str = "", tanks: str = "",
               envelopes: str = "", extra: str = "", kind: str = "airplane") -> str:
    """TOML text of a test type in lb and in (moment index lb·in / 1000).

    The parts are TOML text too (:func:`station`, :func:`tank`, :func:`envelope`,
    :func:`reaction_point`); ``title`` defaults to ``"Test type NAME"``.
    """
    return f"""
format_version = 1
[vehicle]
name = "{name}"
title = "{title if title is not None else f'Test type {name}'}"
kind = "{kind}"
[units]
mass = "lb"
length = "in"
volume = "USgal"
moment_divisor = 1000
[datum]
description = "test datum"
[limits]
{limits}
{stations}
{tanks}
{envelopes}
{extra}
"""


def station(name: str, kind: str, x: float, *, max_mass: float | None = None,
            y: float | None = None, extra: str = "") -> str:
    """A ``[[station]]`` table; ``extra`` is TOML added to it (``persons = 2``)."""
    text = f'\n[[station]]\nname = "{name}"\nkind = "{kind}"\nx = {x}\n'
    if y is not None:
        text += f"y = {y}\n"
    if max_mass is not None:
        text += f"max_mass = {max_mass}\n"
    return text + extra


def tank(name: str, fluid: str, x: float, *, capacity: float, unusable: float = 0) -> str:
    """A ``[[tank]]`` table at a fixed arm; capacity and unusable in the type's volume unit."""
    return (f'\n[[tank]]\nname = "{name}"\nfluid = "{fluid}"\ncapacity = {capacity}\n'
            f"unusable = {unusable}\nx = {x}\n")


def envelope(points, *, name: str = "normal", category: str = "normal",
             axis: str = "longitudinal") -> str:
    """An ``[[envelope]]`` table of ``(cg, mass)`` points."""
    pts = ", ".join(f"[{a}, {b}]" for a, b in points)
    return (f'\n[[envelope]]\nname = "{name}"\ncategory = "{category}"\naxis = "{axis}"\n'
            f"points = [{pts}]\n")


def reaction_point(name: str, x: float) -> str:
    """A ``[[reaction_point]]`` table (a scale under the vehicle)."""
    return f'\n[[reaction_point]]\nname = "{name}"\nx = {x}\n'


# --- a ledger database for tests and benchmarks ------------------------------------------------

def new_ledger(url: str):
    """An engine on a new ledger database at ``url``, built through the migrations."""
    from ledger.store.db import make_engine, upgrade

    engine = make_engine(url)
    upgrade(engine)
    return engine


def import_types(session, texts: Mapping[str, str]) -> None:
    """Import types given as ``{source name: TOML text}`` in ``session``."""
    from ledger.store.catalog import import_type
    from ledger.typedata import parse_type_text

    for source, text in texts.items():
        import_type(session, parse_type_text(text, source=source), source, text)
