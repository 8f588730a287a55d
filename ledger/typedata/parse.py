"""Read vehicle type files (TOML) into a validated :class:`~ledger.typedata.model.VehicleType`.

The format is described key by key in ``demo_fleet/FORMAT.md``. Every problem is reported as
one line naming the file, the field (a dotted path such as ``station['pilot'].max_mass``), the
value as written and what would be accepted: :class:`~ledger.errors.TypeDataError`,
:class:`~ledger.errors.UnitError` or :class:`~ledger.errors.EnvelopeError`, each located with
``.with_source(file)``.

Importing this module loads neither numpy nor the core: envelope polygons are checked by
:func:`ledger.core.envelope.validate_polygon`, imported when a file is parsed.
"""

from __future__ import annotations

import os
import re
import tomllib

from ledger import units as U
from ledger.bounds import SOURCE_NAME_MAX, item_field, load_toml, shown
from ledger.errors import InputError, TypeDataError
from ledger.files import INPUT_LIMIT, read_input_text
from ledger.typedata import type_keys as K
from ledger.typedata._messages import _MISSING, _listing, _typename
from ledger.typedata._read_inertia import _InertiaReader
from ledger.typedata._read_limits import _LimitsReader
from ledger.typedata._read_loads import _LoadsReader
from ledger.typedata._toml import _err, _named_path, _Table, _tables
from ledger.typedata.model import (
    VEHICLE_KINDS,
    Mac,
    ReactionPoint,
    VehicleType,
)

__all__ = ["FORMAT_VERSION", "load_type_file", "parse_type", "parse_type_text", "read_type_file"]

FORMAT_VERSION = 1
"""The ``format_version`` this parser reads."""

_TYPE_NAME_RE = re.compile(r"^[A-Za-z0-9][A-Za-z0-9._-]{0,39}\Z")
_TYPE_NAME_RULE = "expected 1-40 letters, digits, '.', '_' or '-', starting with a letter or digit"


class _Reader(_LoadsReader, _LimitsReader, _InertiaReader):
    """Reads a type file's document section by section into a :class:`VehicleType`."""

    def __init__(self, data: dict) -> None:
        self.data = data
        self.units: U.DisplayUnits | None = None
        self.kind = ""

    # --- quantities ---------------------------------------------------------------------------
    def _qty(self, tbl: _Table, key: str, dimension: str, default_unit: str | None, *,
             required: bool = False, what: str, minimum: float | None = None,
             positive: bool = False, value=None, field: str | None = None) -> float | None:
        if value is None:
            if not tbl.has(key):
                if required:
                    raise TypeDataError(tbl.field(key), _MISSING, f"required: {what}")
                return None
            value = tbl.get(key)
        f = field or tbl.field(key)
        if isinstance(value, (bool, list, dict)) or not isinstance(value, (int, float, str)):
            raise _err(f, value, f"expected {what}: a number or a string such as "
                       f"'{U.EXAMPLES[dimension]}', got {_typename(value)}")
        q = U.parse_quantity(value, dimension, default_unit, field=f)
        if positive and q <= 0:
            raise _err(f, value, f"expected {what} greater than 0")
        if minimum is not None and q < minimum:
            raise _err(f, value, f"expected {what} of 0 or more")
        return q

    def mass(self, tbl, key, *, required=False, positive=False, nonnegative=True,
             what="a mass", value=None, field=None):
        return self._qty(tbl, key, "mass", self.units.mass, required=required, what=what,
                         positive=positive, minimum=0.0 if nonnegative else None,
                         value=value, field=field)

    def length(self, tbl, key, *, required=False, positive=False, what="a length",
               value=None, field=None):
        return self._qty(tbl, key, "length", self.units.length, required=required, what=what,
                         positive=positive, value=value, field=field)

    # --- sections -----------------------------------------------------------------------------
    def parse(self) -> VehicleType:
        top = _Table(self.data, "", K.TOP_KEYS)
        version = top.require("format_version", f"format_version = {FORMAT_VERSION} at the top "
                              "of the file")
        if isinstance(version, bool) or version != FORMAT_VERSION:
            raise _err("format_version", version, f"expected {FORMAT_VERSION}; this wbledger "
                       f"reads format_version {FORMAT_VERSION}")

        veh = top.sub("vehicle", K.VEHICLE_KEYS, required=True,
                      what="a [vehicle] table with name, title and kind")
        name = veh.string("name", required=True, what="a type name, e.g. \"KV-P4\"")
        if not _TYPE_NAME_RE.match(name):
            raise _err("vehicle.name", name, _TYPE_NAME_RULE)
        title = veh.string("title", required=True, what="a title (one line)")
        self.kind = veh.string("kind", required=True, what=f"one of {_listing(VEHICLE_KINDS)}",
                               choices=VEHICLE_KINDS)
        note = veh.string("note", default="")

        self.units = self._units(top)
        datum_t = top.sub("datum", K.DATUM_KEYS, required=True,
                          what="a [datum] table with a description of the datum")
        datum = datum_t.string("description", required=True,
                               what="a description of the datum (where x = 0 is)")
        mac = self._mac(top)
        limits = self._limits(top)
        stations = self._stations()
        tanks = self._tanks()
        self._unique_names("station", stations, "tank", tanks)
        envelopes = self._envelopes()
        reaction_points = self._reaction_points()
        inertia = self._inertia(top)
        axles, groups = self._axles()
        configurations = self._configurations(stations)
        tolerances = self._tolerances(top, mac)
        mass_sets = self._mass_sets()
        return VehicleType(
            name=name, title=title, kind=self.kind, units=self.units, datum=datum,
            limits=limits, note=note, mac=mac, stations=tuple(stations), tanks=tuple(tanks),
            envelopes=tuple(envelopes), reaction_points=tuple(reaction_points), inertia=inertia,
            axles=tuple(axles), axle_groups=tuple(groups),
            configurations=tuple(configurations), tolerances=tolerances,
            mass_sets=tuple(mass_sets))

    def _units(self, top: _Table) -> U.DisplayUnits:
        t = top.sub("units", K.UNITS_KEYS, required=True,
                    what="a [units] table with the display mass and length units")
        mass = t.string("mass", required=True, what=f"a mass unit ({U.describe_units('mass')})")
        length = t.string("length", required=True,
                          what=f"a length unit ({U.describe_units('length')})")
        has_tanks = bool(self.data.get("tank"))
        volume = t.string("volume", required=has_tanks,
                          what=f"a volume unit ({U.describe_units('volume')}) when there are tanks",
                          default="L")
        divisor = t.get("moment_divisor", 1.0)
        return U.DisplayUnits(mass, length, volume, divisor)

    def _mac(self, top: _Table) -> Mac | None:
        t = top.sub("mac", K.MAC_KEYS)
        if t is None:
            return None
        lemac = self.length(t, "lemac", required=True, what="the arm of the MAC leading edge")
        length = self.length(t, "length", required=True, positive=True,
                             what="the MAC length")
        return Mac(lemac, length)

    def _unique_names(self, kind_a: str, items_a: list, kind_b: str, items_b: list) -> None:
        seen: dict[str, str] = {}
        for kind, items in ((kind_a, items_a), (kind_b, items_b)):
            for i, it in enumerate(items):
                key = it.name.casefold()
                if key in seen:
                    raise _err(f"{item_field(kind, i)}.name", it.name,
                               f"already used by {seen[key]}; station and tank names must "
                               "differ (ignoring case)")
                seen[key] = item_field(kind, i)

    def _unique(self, base: str, items: list, what: str = "names") -> None:
        seen: dict[str, int] = {}
        for i, it in enumerate(items):
            key = it.name.casefold()
            if key in seen:
                raise _err(f"{item_field(base, i)}.name", it.name,
                           f"already used by {item_field(base, seen[key])}; {what} must differ "
                           "(ignoring case)")
            seen[key] = i

    def _reaction_points(self) -> list[ReactionPoint]:
        out = []
        for i, raw in enumerate(_tables(self.data, "reaction_point")):
            t = _Table(raw, _named_path("reaction_point", i, raw), K.REACTION_KEYS)
            name = t.name()
            x = self.length(t, "x", required=True, what="the arm x")
            y = self.length(t, "y") or 0.0
            out.append(ReactionPoint(name, x, y))
        self._unique("reaction_point", out, "reaction point names")
        return out



def parse_type(data: dict, *, source: str) -> VehicleType:
    """Validate a type file already read as TOML and build the :class:`VehicleType`.

    Parameters
    ----------
    data : dict
        The TOML document (as :func:`tomllib.loads` returns it).
    source : str
        Where it came from, used to locate errors ("kv-p4.toml").

    Raises
    ------
    TypeDataError, UnitError, EnvelopeError
        The first problem found, as one line ``source: field = value: what is allowed``.
    """
    try:
        if not isinstance(data, dict):
            raise _err("(document)", data, "expected a TOML table")
        return _Reader(data).parse()
    except InputError as exc:
        raise exc.with_source(source) from None


_POSITION_RE = re.compile(r"^(.*?)\s*\(at line (\d+), column (\d+)\)\s*$")


def parse_type_text(text: str, *, source: str) -> VehicleType:
    """Parse the text of a type file (TOML). See :func:`parse_type`.

    A TOML syntax error is reported with its line and column:
    ``source: line 3 = 'the line': not valid TOML: <reason> (column 7)``. Nesting, numbers and
    texts out of the bounds of :mod:`ledger.bounds` are refused before the file is read as a
    type.
    """
    try:
        data = load_toml(text)
    except InputError as exc:
        raise exc.with_source(source) from None
    except tomllib.TOMLDecodeError as exc:
        msg = str(exc)
        m = _POSITION_RE.match(msg)
        if m:
            reason, line, col = m.group(1), int(m.group(2)), int(m.group(3))
            lines = text.splitlines()
            shown = lines[line - 1].strip() if 0 < line <= len(lines) else ""
            err = TypeDataError(f"line {line}", shown,
                                f"not valid TOML: {reason} (column {col})")
        else:
            reason = msg.replace(" (at end of document)", "")
            err = TypeDataError("end of file", "", f"not valid TOML: {reason}")
        raise err.with_source(source) from None
    return parse_type(data, source=source)


def read_type_file(path: str | os.PathLike, *,
                   max_size: int | None = None) -> tuple[VehicleType, str]:
    """Read and parse one type file; return the type and the text it was parsed from.

    The file is read once, by :func:`ledger.files.read_input_text`: a regular file of at most
    ``max_size`` bytes (default :data:`ledger.files.INPUT_LIMIT`, 1 MiB), UTF-8. Errors name
    the file as ``path`` was given; that path is kept with an imported revision, so it may have
    at most :data:`ledger.bounds.SOURCE_NAME_MAX` characters.

    Raises
    ------
    TypeDataError, UnitError, EnvelopeError, InputError
        The file cannot be read, or is not a valid type file.
    """
    source = os.fspath(path)
    if len(source) > SOURCE_NAME_MAX:
        raise TypeDataError("file", shown(source), f"a path of at most {SOURCE_NAME_MAX} "
                            "characters (it is recorded with the type revision); give a shorter "
                            "(relative) path")
    text = read_input_text(source, field="file", what="a type file",
                           limit=INPUT_LIMIT if max_size is None else max_size,
                           error=TypeDataError)
    return parse_type_text(text, source=source), text


def load_type_file(path: str | os.PathLike, *, max_size: int | None = None) -> VehicleType:
    """Read and parse one type file (see :func:`read_type_file`); return the type."""
    return read_type_file(path, max_size=max_size)[0]
