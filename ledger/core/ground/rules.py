"""Axle-group weight rules as data, and the advisory check of a vehicle against them."""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field

import numpy as np

from ledger.core._common import finite_float
from ledger.core.factors import FOOT, INCH, LB
from ledger.core.ground._inputs import _axle_positions, _vec
from ledger.errors import InputError

__all__ = ["ADVISORY", "bridge_formula_lb", "RuleSet", "Finding", "check_axle_groups"]

ADVISORY = ("Advisory only: figures from the recorded data checked against the selected rule "
            "set; this is not a legal determination. Local regulations, permits and the "
            "manufacturer's ratings govern; a qualified person verifies before operation.")


def bridge_formula_lb(length_ft: float, n_axles: int) -> float:
    """US bridge formula, ``W = 500·[L·N/(N − 1) + 12N + 36]`` lb, to the nearest 500 lb.

    An exact half (for example 44,250 lb) goes to the lower 500 lb, as the FHWA bridge table
    prints it (from memory).

    Parameters
    ----------
    length_ft : float
        Distance between the outer axles of the group, ft (measured to the nearest foot).
    n_axles : int
        Number of axles in the group, 2 or more.

    Returns
    -------
    float
        Maximum load on the group, lb.

    Examples
    --------
    >>> bridge_formula_lb(8, 2), bridge_formula_lb(36, 4), bridge_formula_lb(38, 4)
    (38000.0, 66000.0, 67500.0)
    """
    L = finite_float(length_ft, "length_ft", "a finite length in ft of 0 or more")
    if L < 0:
        raise InputError("length_ft", L, "a finite length in ft of 0 or more")
    try:
        N = int(n_axles)
    except (TypeError, ValueError):
        raise InputError("n_axles", n_axles, "an integer of 2 or more") from None
    if N < 2 or N != n_axles:
        raise InputError("n_axles", n_axles, "an integer of 2 or more")
    units = L * N / (N - 1) + 12 * N + 36  # in 500 lb
    return 500.0 * math.ceil(round(units - 0.5, 9))


_MASS_UNITS = {"kg": 1.0, "lb": LB}
_LENGTH_UNITS = {"m": 1.0, "in": INCH, "ft": FOOT}
_MASS_KEYS = ("single_axle", "tandem", "gross")
_LENGTH_KEYS = ("single_spread", "tandem_spread", "tandem_pair_spread")


@dataclass(frozen=True)
class RuleSet:
    """Axle-group weight rules, as data (limits in kg, spreads in m).

    Attributes
    ----------
    name : str
    single_axle_max : float
        Limit on one axle (all axles within ``single_spread``), kg.
    tandem_max : float
        Limit on a tandem (consecutive axles spread more than ``single_spread`` and at most
        ``tandem_spread``), kg.
    gross_max : float
        Limit on the whole vehicle or combination, kg.
    bridge_formula : bool
        Whether the US bridge formula applies to groups spread more than ``tandem_spread``.
    single_spread, tandem_spread : float
        Spreads defining a single axle and a tandem, m.
    tandem_pair_spread : float or None
        Two consecutive tandems at least this far apart (outer axles) may carry
        ``tandem_max`` each even above the bridge formula, m; None for no such exception.
    source : str
        Where the figures come from.
    """

    name: str
    single_axle_max: float
    tandem_max: float
    gross_max: float
    bridge_formula: bool
    single_spread: float
    tandem_spread: float
    tandem_pair_spread: float | None = None
    source: str = ""

    @classmethod
    def from_dict(cls, data: Mapping[str, object]) -> RuleSet:
        """Build a rule set from a mapping (the rule-set files of :mod:`ledger.rules` give one).

        Keys: ``name``; ``single_axle``, ``tandem``, ``gross`` each with a unit suffix ``_kg`` or
        ``_lb``; ``single_spread``, ``tandem_spread`` and optionally ``tandem_pair_spread`` with
        ``_m``, ``_in`` or ``_ft``; optional ``bridge_formula`` (bool) and ``source``.

        Examples
        --------
        >>> rs = RuleSet.from_dict({"name": "example", "single_axle_kg": 10000,
        ...                         "tandem_kg": 18000, "gross_kg": 40000,
        ...                         "single_spread_m": 1.0, "tandem_spread_m": 2.5})
        >>> rs.tandem_max, rs.bridge_formula
        (18000.0, False)
        """
        if not isinstance(data, Mapping):
            raise InputError("rule set", data, "a table of keys and values")
        known = {"name", "bridge_formula", "source"}
        known |= {f"{k}_{u}" for k in _MASS_KEYS for u in _MASS_UNITS}
        known |= {f"{k}_{u}" for k in _LENGTH_KEYS for u in _LENGTH_UNITS}
        for key in data:
            if key not in known:
                raise InputError(f"rule set.{key}", data[key],
                                 "no such key; known keys are " + ", ".join(sorted(known)))
        name = data.get("name")
        if not isinstance(name, str) or not name.strip():
            raise InputError("rule set.name", name, "a non-empty name")

        def pick(base: str, units: dict[str, float], required: bool, what: str):
            given = [u for u in units if f"{base}_{u}" in data]
            if len(given) > 1:
                raise InputError(f"{name}.{base}", [f"{base}_{u}" for u in given],
                                 "one unit suffix only")
            if not given:
                if required:
                    raise InputError(f"{name}.{base}", None,
                                     f"a {what} with one of the suffixes " +
                                     ", ".join("_" + u for u in units))
                return None
            key = f"{base}_{given[0]}"
            v = finite_float(data[key], f"{name}.{key}", f"a finite {what} greater than 0")
            if v <= 0:
                raise InputError(f"{name}.{key}", v, f"a finite {what} greater than 0")
            return v * units[given[0]]

        masses = {k: pick(k, _MASS_UNITS, True, "mass") for k in _MASS_KEYS}
        single = pick("single_spread", _LENGTH_UNITS, True, "length")
        tandem = pick("tandem_spread", _LENGTH_UNITS, True, "length")
        pair = pick("tandem_pair_spread", _LENGTH_UNITS, False, "length")
        if tandem <= single:
            raise InputError(f"{name}.tandem_spread", tandem,
                             f"a spread longer than the single-axle spread {single:g} m")
        bridge = data.get("bridge_formula", False)
        if not isinstance(bridge, bool):
            raise InputError(f"{name}.bridge_formula", bridge, "true or false")
        return cls(name=name.strip(), single_axle_max=masses["single_axle"],
                   tandem_max=masses["tandem"], gross_max=masses["gross"],
                   bridge_formula=bridge, single_spread=single, tandem_spread=tandem,
                   tandem_pair_spread=pair, source=str(data.get("source", "")))


@dataclass(frozen=True)
class Finding:
    """One advisory finding of :func:`check_axle_groups`.

    ``margin = limit − load`` (kg); ``ok`` when the load is at most the limit (inclusive).
    ``axles`` are the 0-based indices (front first) the rule applies to; :attr:`text` numbers
    axles from 1 as a driver would.
    """

    rule: str
    axles: tuple[int, ...]
    load: float
    limit: float
    margin: float
    ok: bool
    detail: str = ""
    advisory: str = field(default=ADVISORY, repr=False)

    @property
    def text(self) -> str:
        """The finding in one line: rule, axles, load against limit, within or over."""
        who = ("axle " if len(self.axles) == 1 else "axles ") + \
              ", ".join(str(i + 1) for i in self.axles)
        state = "within" if self.ok else f"over by {-self.margin:.0f} kg"
        extra = f" ({self.detail})" if self.detail else ""
        return (f"{self.rule}, {who}{extra}: {self.load:.0f} kg against {self.limit:.0f} kg, "
                f"{state}")


def _partition(x: np.ndarray, spread: float, start_units: list[list[int]]) -> list[list[int]]:
    """Greedy front-to-rear grouping of consecutive units whose outer axles are within spread."""
    out: list[list[int]] = []
    i = 0
    while i < len(start_units):
        group = list(start_units[i])
        j = i + 1
        while j < len(start_units) and x[start_units[j][-1]] - x[group[0]] <= spread + 1e-9:
            group += start_units[j]
            j += 1
        out.append(group)
        i = j
    return out


def _tandem_windows(x: np.ndarray, units: list[list[int]], single: float,
                    tandem: float) -> list[list[int]]:
    """Every maximal run of consecutive units spread more than ``single``, at most ``tandem``.

    Runs may overlap (three axles 4.5 ft apart give two tandems, axles 1–2 and 2–3); checking
    the maximal runs covers every shorter run, since loads are not negative.
    """
    out: list[list[int]] = []
    last_end = -1
    for i in range(len(units)):
        j = i
        while j + 1 < len(units) and x[units[j + 1][-1]] - x[units[i][0]] <= tandem + 1e-9:
            j += 1
        if j > last_end:
            run = [a for u in units[i:j + 1] for a in u]
            if x[run[-1]] - x[run[0]] > single + 1e-9:
                out.append(run)
            last_end = j
    return out


def check_axle_groups(rules: RuleSet, axle_x, axle_load) -> tuple[Finding, ...]:
    """Check axle loads against a rule set: single axles, tandems, gross, bridge formula.

    Axles within ``single_spread`` of each other count as one single axle (grouped front to
    rear); every longest run of consecutive single axles whose outer axles are more than
    ``single_spread`` and at most ``tandem_spread`` apart is a tandem (runs may overlap).
    Every single axle is checked against the single-axle limit (including one inside a
    tandem), every tandem against the tandem limit, the sum against the gross limit, and, if the
    rule set uses it, every group of two or more consecutive axles spread more than
    ``tandem_spread`` against the bridge formula with L rounded to the nearest foot (two
    consecutive tandems at least ``tandem_pair_spread`` apart may carry the tandem limit each).
    Grandfather rights, permits and state rules are not modelled.

    Parameters
    ----------
    rules : RuleSet
    axle_x : array_like, shape (n,)
        Axle positions, m, strictly increasing (front first).
    axle_load : array_like, shape (n,)
        Axle loads, kg.

    Returns
    -------
    tuple of Finding
        All findings, the ones within limits too; filter on ``ok``. Advisory only.

    Examples
    --------
    A five-axle tractor-semitrailer (steer, drive tandem, trailer tandem):

    >>> x = [0.0, 5.0, 6.3, 15.5, 16.8]
    >>> lb = 0.45359237
    >>> loads = [12000 * lb, 16500 * lb, 16500 * lb, 17500 * lb, 17500 * lb]
    >>> us = RuleSet.from_dict({"name": "US federal", "single_axle_lb": 20000,
    ...     "tandem_lb": 34000, "gross_lb": 80000, "bridge_formula": True,
    ...     "single_spread_in": 40, "tandem_spread_in": 96, "tandem_pair_spread_ft": 36})
    >>> for f in check_axle_groups(us, x, loads):
    ...     if not f.ok:
    ...         print(f.text)
    tandem, axles 4, 5: 15876 kg against 15422 kg, over by 454 kg
    """
    ax = _axle_positions(axle_x)
    n = ax.size
    ld = _vec(axle_load, "axle_load", "finite loads in kg of 0 or more", n)
    if np.any(ld < 0):
        i = int(np.argmax(ld < 0))
        raise InputError(f"axle_load[{i}]", float(ld[i]), "a load in kg of 0 or more")
    findings: list[Finding] = []

    def add(rule: str, idx: Sequence[int], limit: float, detail: str = "") -> None:
        load = float(ld[list(idx)].sum())
        margin = limit - load
        findings.append(Finding(rule=rule, axles=tuple(int(i) for i in idx), load=load,
                                limit=limit, margin=margin, ok=margin >= -1e-9 * limit,
                                detail=detail))

    singles = _partition(ax, rules.single_spread, [[i] for i in range(n)])
    for unit in singles:
        add("single axle", unit, rules.single_axle_max)
    tandems = _tandem_windows(ax, singles, rules.single_spread, rules.tandem_spread)
    for g in tandems:
        add("tandem", g, rules.tandem_max)
    add("gross", range(n), rules.gross_max)
    if rules.bridge_formula:
        tandem_sets = [tuple(g) for g in tandems]
        for i in range(n):
            for j in range(i + 1, n):
                spread = ax[j] - ax[i]
                if spread <= rules.tandem_spread + 1e-9:
                    continue  # a single axle or tandem: those limits govern
                L_ft = math.floor(spread / FOOT + 0.5)
                N = j - i + 1
                limit = bridge_formula_lb(L_ft, N) * LB
                detail = f"L = {L_ft} ft, N = {N}"
                idx = tuple(range(i, j + 1))
                if rules.tandem_pair_spread is not None and spread >= rules.tandem_pair_spread:
                    for a in range(len(tandem_sets) - 1):
                        if tandem_sets[a] + tandem_sets[a + 1] == idx:
                            if 2 * rules.tandem_max > limit:
                                limit = 2 * rules.tandem_max
                                detail += ", two consecutive tandems"
                add("bridge formula", idx, limit, detail)
    return tuple(findings)
