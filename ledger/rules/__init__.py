"""Axle-group rule sets as data: TOML files a user may choose for an advisory check.

A rule set is one TOML file; its name is the file name without ``.toml``. wbledger ships
``us-federal-interstate`` (23 CFR 658.17) in this package. More rule sets are found, in this
order, in every folder named by ``$WBLEDGER_RULES`` (separated by ``os.pathsep``) and in the
``rules`` folder of the user's wbledger configuration directory; a name defined in two folders
is refused rather than silently shadowed. The checks these rule sets drive are advisory, never a
legal determination: the local road rules, permits and the manufacturer's ratings govern.

File format (``format = "wbledger.axle-rules/1"``); every mass and length takes its unit::

    format = "wbledger.axle-rules/1"

    [rule_set]
    title = "…"             # one line, shown in lists
    jurisdiction = "…"      # where and to what the limits apply
    source = "…"            # the regulation the figures come from
    note = "…"              # optional

    [limits]
    single_axle = "20000 lb"
    tandem = "34000 lb"
    gross = "80000 lb"

    [definitions]
    single_spread = "40 in"     # axles within this spread count as one axle
    tandem_spread = "96 in"     # consecutive axles more than single_spread and at most this

    [bridge_formula]            # optional: the US bridge formula W = 500·[LN/(N−1) + 12N + 36]
    applies = true
    two_tandem_exception_spread = "36 ft"   # optional

The checking itself is :func:`ledger.core.ground.check_axle_groups` on the
:class:`ledger.core.ground.RuleSet` that :meth:`RuleSetFile.rule_set` builds.
"""

from __future__ import annotations

import os
import re
import tomllib
from dataclasses import dataclass
from pathlib import Path

from ledger.bounds import load_toml
from ledger.errors import ConflictError, InputError, NotFoundError
from ledger.files import read_input_text


class _Missing:
    def __str__(self) -> str:
        return "(missing)"


MISSING = _Missing()

__all__ = [
    "FORMAT",
    "RULES_ENV",
    "RuleSetFile",
    "builtin_rules_dir",
    "user_rules_dir",
    "rule_dirs",
    "parse_rule_set_text",
    "load_rule_set_file",
    "list_rule_sets",
    "load_rule_set",
    "bridge_table",
]

FORMAT = "wbledger.axle-rules/1"
RULES_ENV = "WBLEDGER_RULES"
NAME_PATTERN = re.compile(r"^[a-z0-9][a-z0-9._-]{0,59}$")

_TOP = ("format", "rule_set", "limits", "definitions", "bridge_formula")
_META = ("title", "jurisdiction", "source", "note")
_LIMITS = ("single_axle", "tandem", "gross")
_DEFS = ("single_spread", "tandem_spread")
_BRIDGE = ("applies", "two_tandem_exception_spread")


@dataclass(frozen=True)
class RuleSetFile:
    """One rule set as read from its file, SI inside (kg, m).

    ``rule_set()`` gives the :class:`ledger.core.ground.RuleSet` the checks use.
    """

    name: str
    title: str
    jurisdiction: str
    source: str
    note: str
    path: str
    builtin: bool
    single_axle_kg: float
    tandem_kg: float
    gross_kg: float
    single_spread_m: float
    tandem_spread_m: float
    bridge_formula: bool
    two_tandem_exception_spread_m: float | None

    def rule_set(self):
        """The core rule set (imports numpy)."""
        from ledger.core.ground import RuleSet

        data = {"name": self.name, "single_axle_kg": self.single_axle_kg,
                "tandem_kg": self.tandem_kg, "gross_kg": self.gross_kg,
                "single_spread_m": self.single_spread_m, "tandem_spread_m": self.tandem_spread_m,
                "bridge_formula": self.bridge_formula, "source": self.source}
        if self.two_tandem_exception_spread_m is not None:
            data["tandem_pair_spread_m"] = self.two_tandem_exception_spread_m
        return RuleSet.from_dict(data)

    def to_dict(self) -> dict:
        """JSON-able form, SI with the unit in each key."""
        return {"name": self.name, "title": self.title, "jurisdiction": self.jurisdiction,
                "source": self.source, "note": self.note, "path": self.path,
                "builtin": self.builtin,
                "limits_kg": {"single_axle": self.single_axle_kg, "tandem": self.tandem_kg,
                              "gross": self.gross_kg},
                "definitions_m": {"single_spread": self.single_spread_m,
                                  "tandem_spread": self.tandem_spread_m},
                "bridge_formula": {
                    "applies": self.bridge_formula,
                    "formula": "W = 500·[L·N/(N − 1) + 12N + 36] lb, L in ft between the outer "
                               "axles of the group (nearest foot), N axles; W to the nearest "
                               "500 lb" if self.bridge_formula else None,
                    "two_tandem_exception_spread_m": self.two_tandem_exception_spread_m},
                "advisory": ADVISORY}


ADVISORY = ("Advisory check, not a legal determination: local road rules, permits and the "
            "manufacturer's ratings govern.")


def builtin_rules_dir() -> Path:
    """The folder of the rule sets shipped with wbledger (this package)."""
    return Path(__file__).resolve().parent


def user_rules_dir() -> Path:
    """``rules`` in the user's wbledger configuration folder (it may not exist)."""
    import platformdirs

    return Path(platformdirs.user_config_dir("wbledger", appauthor=False)) / "rules"


def rule_dirs() -> list[tuple[Path, bool]]:
    """Folders searched for rule sets, as (folder, is_builtin), in search order."""
    out: list[tuple[Path, bool]] = []
    env = os.environ.get(RULES_ENV)
    if env:
        out += [(Path(p).expanduser(), False) for p in env.split(os.pathsep) if p.strip()]
    out.append((user_rules_dir(), False))
    out.append((builtin_rules_dir(), True))
    return out


def _qty(table: dict, key: str, where: str, dimension: str, source: str,
         required: bool = True) -> float | None:
    from ledger.units import parse_quantity

    field = f"{where}.{key}"
    if key not in table:
        if not required:
            return None
        example = "'20000 lb'" if dimension == "mass" else "'96 in'"
        raise InputError(field, MISSING, f"a {dimension} with its unit, e.g. {example}",
                         source=source)
    value = table[key]
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        raise InputError(field, value, f"a {dimension} with its unit, e.g. "
                         f"'{value:g} {'lb' if dimension == 'mass' else 'in'}'; rule files "
                         "take no bare numbers", source=source)
    try:
        v = parse_quantity(value, dimension, None, field=field)
    except InputError as exc:
        raise exc.with_source(source) from None
    if v <= 0:
        raise InputError(field, value, f"a {dimension} greater than 0", source=source)
    return v


def _table(data: dict, key: str, keys: tuple[str, ...], source: str,
           required: bool = True) -> dict:
    raw = data.get(key)
    if raw is None:
        if required:
            raise InputError(key, MISSING, f"a table [{key}] with " + ", ".join(keys),
                             source=source)
        return {}
    if not isinstance(raw, dict):
        raise InputError(key, raw, f"a table [{key}]", source=source)
    for k in raw:
        if k not in keys:
            raise InputError(f"{key}.{k}", raw[k], "no such key; known keys are " +
                             ", ".join(keys), source=source)
    return raw


def parse_rule_set_text(text: str, name: str, *, source: str = "<text>",
                        builtin: bool = False) -> RuleSetFile:
    """Parse the TOML text of a rule set called ``name``.

    Raises
    ------
    InputError
        Not TOML, wrong ``format``, unknown keys, quantities without units or not positive,
        a tandem spread not longer than the single-axle spread.

    Examples
    --------
    >>> rs = parse_rule_set_text('''format = "wbledger.axle-rules/1"
    ... [rule_set]
    ... title = "example"
    ... jurisdiction = "nowhere"
    ... source = "invented for this example"
    ... [limits]
    ... single_axle = "10 t"
    ... tandem = "18 t"
    ... gross = "40 t"
    ... [definitions]
    ... single_spread = "1 m"
    ... tandem_spread = "2.5 m"
    ... ''', "example")
    >>> rs.tandem_kg, rs.bridge_formula
    (18000.0, False)
    """
    if not NAME_PATTERN.match(name):
        raise InputError("rule set", name, "a name of lower-case letters, digits, '.', '_' or "
                         "'-' (the file name without .toml)", source=source)
    try:
        data = load_toml(text, source=source)
    except tomllib.TOMLDecodeError as exc:
        raise InputError("rule set file", source, f"not valid TOML ({exc})") from None
    for k in data:
        if k not in _TOP:
            raise InputError(k, data[k], "no such key; known keys are " + ", ".join(_TOP),
                             source=source)
    if data.get("format") != FORMAT:
        raise InputError("format", data.get("format"), f"'{FORMAT}'", source=source)
    meta = _table(data, "rule_set", _META, source)
    for k in ("title", "jurisdiction", "source"):
        v = meta.get(k)
        if not isinstance(v, str) or not v.strip():
            raise InputError(f"rule_set.{k}", v, "a non-empty text", source=source)
    note = meta.get("note", "")
    if not isinstance(note, str):
        raise InputError("rule_set.note", note, "a text", source=source)
    limits = _table(data, "limits", _LIMITS, source)
    defs = _table(data, "definitions", _DEFS, source)
    bridge = _table(data, "bridge_formula", _BRIDGE, source, required=False)
    masses = {k: _qty(limits, k, "limits", "mass", source) for k in _LIMITS}
    single = _qty(defs, "single_spread", "definitions", "length", source)
    tandem = _qty(defs, "tandem_spread", "definitions", "length", source)
    if tandem <= single:
        raise InputError("definitions.tandem_spread", defs["tandem_spread"],
                         f"a spread longer than single_spread ({defs['single_spread']})",
                         source=source)
    applies = bridge.get("applies", False)
    if not isinstance(applies, bool):
        raise InputError("bridge_formula.applies", applies, "true or false", source=source)
    pair = _qty(bridge, "two_tandem_exception_spread", "bridge_formula", "length", source,
                required=False)
    return RuleSetFile(name=name, title=meta["title"].strip(),
                       jurisdiction=meta["jurisdiction"].strip(), source=meta["source"].strip(),
                       note=note.strip(), path=source, builtin=builtin,
                       single_axle_kg=masses["single_axle"], tandem_kg=masses["tandem"],
                       gross_kg=masses["gross"], single_spread_m=single, tandem_spread_m=tandem,
                       bridge_formula=applies, two_tandem_exception_spread_m=pair)


def load_rule_set_file(path: str | os.PathLike, *, builtin: bool = False) -> RuleSetFile:
    """Read one rule-set file; its name is the file name without ``.toml``.

    The file is read by :func:`ledger.files.read_input_text`: a regular UTF-8 file of at most
    :data:`ledger.files.INPUT_LIMIT` (1 MiB; a rule set is a few hundred bytes).
    """
    p = Path(path)
    text = read_input_text(p, field="rule set file", what="a rule set file (TOML)", option=None)
    return parse_rule_set_text(text, p.stem, source=str(p), builtin=builtin)


def _found() -> dict[str, list[tuple[Path, bool]]]:
    found: dict[str, list[tuple[Path, bool]]] = {}
    for folder, builtin in rule_dirs():
        if not folder.is_dir():
            continue
        for f in sorted(folder.glob("*.toml")):
            found.setdefault(f.stem, []).append((f, builtin))
    return found


def _one(name: str, places: list[tuple[Path, bool]]) -> RuleSetFile:
    if len(places) > 1:
        raise ConflictError(f"rule set {name!r} is defined in more than one folder (" +
                            ", ".join(str(p) for p, _ in places) + "); rename or remove one")
    path, builtin = places[0]
    return load_rule_set_file(path, builtin=builtin)


def list_rule_sets() -> list[RuleSetFile]:
    """Every rule set found (see the module notes), by name."""
    return [_one(name, places) for name, places in sorted(_found().items())]


def load_rule_set(name: str) -> RuleSetFile:
    """The rule set ``name``, or the file ``name`` if it is a path to a ``.toml`` file.

    Raises
    ------
    NotFoundError
        No rule set of that name (the message lists the known ones).
    ConflictError
        The name is defined in more than one folder.

    Examples
    --------
    >>> rs = load_rule_set("us-federal-interstate")
    >>> round(rs.single_axle_kg, 4), rs.builtin
    (9071.8474, True)
    """
    if name.endswith(".toml") and Path(name).is_file():
        return load_rule_set_file(name)
    found = _found()
    if name not in found:
        known = ", ".join(sorted(found)) or "none"
        raise NotFoundError("axle rule set", name, f"Known rule sets: {known} (see "
                            "`wbledger axle-rules list`)")
    return _one(name, found[name])


def bridge_table(rules: RuleSetFile, lengths_ft, axle_counts=(2, 3, 4, 5, 6, 7)) -> dict:
    """The most a group of N consecutive axles L ft apart (outer axles) may carry, in lb.

    For a spread within the tandem spread the tandem limit applies; beyond it, the bridge
    formula (:func:`ledger.core.ground.bridge_formula_lb`). The single-axle and gross limits
    apply as well and are not folded in. Needs ``rules.bridge_formula``.

    Returns
    -------
    dict
        ``{"axles": [...], "rows": [{"length_ft": L, "max_lb": [... or None]}]}``; None where
        N axles do not fit within L (each gap more than the single spread) and, for two axles,
        where the two single-axle limits are lower than the formula.

    Examples
    --------
    >>> t = bridge_table(load_rule_set("us-federal-interstate"), [8, 10, 36], (2, 4))
    >>> [r["max_lb"] for r in t["rows"]]
    [[34000.0, None], [40000.0, 48500.0], [None, 66000.0]]
    """
    from ledger.core.ground import FOOT, LB, bridge_formula_lb

    if not rules.bridge_formula:
        raise InputError("rule set", rules.name, "a rule set that uses the bridge formula")
    rows = []
    for L in lengths_ft:
        row = []
        spread_m = float(L) * FOOT
        for n in axle_counts:
            # A spread read to the nearest foot may be up to half a foot longer: N axles fit
            # when N − 1 gaps of more than the single-axle spread can lie within it.
            if (float(L) + 0.5) * FOOT <= (n - 1) * rules.single_spread_m:
                row.append(None)
            elif spread_m <= rules.tandem_spread_m + 1e-9:
                row.append(round(rules.tandem_kg / LB, 6))
            elif n == 2 and 2 * rules.single_axle_kg < bridge_formula_lb(L, 2) * LB:
                row.append(None)  # two single axles: the single-axle limit governs
            else:
                row.append(bridge_formula_lb(L, n))
        rows.append({"length_ft": L, "max_lb": row})
    return {"axles": list(axle_counts), "rows": rows,
            "note": "single-axle and gross limits apply as well"}
