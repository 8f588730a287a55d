"""Empty-vehicle inertia estimated from nondimensional radii of gyration (Raymer, §16.7)."""

from __future__ import annotations

import math
from dataclasses import dataclass

from ledger.errors import InputError, MassPropertiesError

__all__ = ["RAYMER_SOURCE", "GyrationEstimate", "estimate_from_gyration"]

RAYMER_SOURCE = ("estimate from nondimensional radii of gyration: Raymer, Aircraft Design: "
                 "A Conceptual Approach, §16.7, eqs 16.52–16.54 (after Roskam): "
                 "Ixx = b²·M·Rx²/4, Iyy = L²·M·Ry²/4, Izz = ((b + L)/2)²·M·Rz²/4")


@dataclass(frozen=True)
class GyrationEstimate:
    """Moments of inertia estimated from nondimensional radii of gyration (body axes).

    ``estimated`` is always True: these are not measured or built-up figures. Products of
    inertia are not estimated.
    """

    Ixx: float
    Iyy: float
    Izz: float
    mass: float
    span: float
    length: float
    rx: float
    ry: float
    rz: float
    estimated: bool = True
    frame: str = "body"
    source: str = RAYMER_SOURCE


def estimate_from_gyration(mass: float, span: float, length: float, rx: float, ry: float,
                           rz: float) -> GyrationEstimate:
    """Estimate Ixx, Iyy, Izz of a whole aircraft from nondimensional radii of gyration.

    ``Ixx = b²·M·Rx²/4``, ``Iyy = L²·M·Ry²/4``, ``Izz = ((b + L)/2)²·M·Rz²/4``, that is
    ``(b + L)²·M·Rz²/16`` (Raymer §16.7, eqs 16.52–16.54, in SI with mass instead of W/g).
    Some copies print the last with /8 instead of /16; this is the /16 form. Typical R values
    come from a table for the aircraft class (Raymer table 16.1); such a build-up is rough,
    so report it as an estimate.

    Parameters
    ----------
    mass : float
        Mass, kg, greater than 0.
    span, length : float
        Wing span b and overall length L, m, greater than 0.
    rx, ry, rz : float
        Nondimensional radii of gyration, greater than 0.

    Returns
    -------
    GyrationEstimate

    Examples
    --------
    >>> e = estimate_from_gyration(1000.0, 10.0, 8.0, 0.25, 0.38, 0.39)
    >>> round(e.Ixx, 6), round(e.Iyy, 6), round(e.Izz, 6), e.estimated
    (1562.5, 2310.4, 3080.025, True)
    """
    vals = {}
    for name, v in (("mass", mass), ("span", span), ("length", length), ("rx", rx), ("ry", ry),
                    ("rz", rz)):
        try:
            f = float(v)
        except (TypeError, ValueError):
            f = float("nan")
        if not math.isfinite(f) or f <= 0:
            allowed = ("a finite mass in kg greater than 0" if name == "mass" else
                       "a finite length in m greater than 0" if name in ("span", "length") else
                       "a finite nondimensional radius of gyration greater than 0")
            err = MassPropertiesError if name == "mass" else InputError
            raise err(name, v, allowed)
        vals[name] = f
    b, L, M = vals["span"], vals["length"], vals["mass"]
    return GyrationEstimate(
        Ixx=b * b * M * vals["rx"] ** 2 / 4.0,
        Iyy=L * L * M * vals["ry"] ** 2 / 4.0,
        Izz=((b + L) / 2.0) ** 2 * M * vals["rz"] ** 2 / 4.0,
        mass=M, span=b, length=L, rx=vals["rx"], ry=vals["ry"], rz=vals["rz"])
