"""Reading the inertia data of a type file and its configurations (items with shapes)."""

from __future__ import annotations

from ledger.bounds import item_field
from ledger.errors import TypeDataError
from ledger.typedata import type_keys as K
from ledger.typedata._messages import _MISSING, _disp, _listing, _typename
from ledger.typedata._toml import _err, _named_path, _Table, _tables
from ledger.typedata.model import (
    CONFIGURATION_ACTIONS,
    SHAPE_AXES,
    SHAPE_DIMENSIONS,
    SHAPE_KINDS,
    ConfigItem,
    Configuration,
    GyrationInertia,
    MeasuredInertia,
    Shape,
    Station,
)


class _InertiaReader:
    def _inertia(self, top: _Table):
        raw = top.get("inertia")
        if raw is None:
            return None
        if not isinstance(raw, dict):
            raise _err("inertia", raw, f"expected a table [inertia], got {_typename(raw)}")
        basis = raw.get("basis")
        if basis not in K.INERTIA_KEYS:
            if "basis" not in raw:
                raise TypeDataError("inertia.basis", _MISSING,
                                    "required: measured or gyration")
            raise _err("inertia.basis", basis, "expected one of measured, gyration")
        allowed = K.INERTIA_KEYS[basis]
        for key, value in raw.items():
            if key not in allowed:
                raise _err(f"inertia.{key}", value, f"unknown key for basis = \"{basis}\"; "
                           f"allowed here: {_listing(allowed)}")
        t = _Table(raw, "inertia", allowed)
        note = t.string("note", default="")
        if basis == "measured":
            iu = self.units.inertia_unit
            req = {k: self._qty(t, k, "inertia", None, required=True, minimum=0.0,
                                what=f"a moment of inertia, e.g. '1500 kg*m2' or "
                                f"'1200 {iu}'") for k in ("ixx", "iyy", "izz")}
            prod = {k: self._qty(t, k, "inertia", None, what="a product of inertia") or 0.0
                    for k in ("ixz", "ixy", "iyz")}
            # Every inertia tensor obeys the triangle inequality on its diagonal
            # (Ixx = ∫(y²+z²) dm <= Iyy + Izz, and cyclic).
            for a, b, c in (("ixx", "iyy", "izz"), ("iyy", "izz", "ixx"),
                            ("izz", "ixx", "iyy")):
                if req[a] > (req[b] + req[c]) * (1 + 1e-12):
                    raise _err(f"inertia.{a}", t.get(a), f"expected at most {b} + {c} "
                               f"({_disp(req[b] + req[c], 'kg*m2')}); no body has a larger one")
            return MeasuredInertia(req["ixx"], req["iyy"], req["izz"], prod["ixz"],
                                   prod["ixy"], prod["iyz"], note)
        r = {k: t.number(k, required=True, above=0.0, below=2.0,
                         what="a nondimensional radius of gyration between 0 and 2")
             for k in ("rx", "ry", "rz")}
        span = self.length(t, "span", required=True, positive=True, what="the span")
        length = self.length(t, "length", required=True, positive=True,
                             what="the overall length")
        return GyrationInertia(r["rx"], r["ry"], r["rz"], span, length, note)

    def _configurations(self, stations: list[Station]) -> list[Configuration]:
        out = []
        station_names = [s.name for s in stations]
        for i, raw in enumerate(_tables(self.data, "configuration")):
            path = _named_path("configuration", i, raw)
            t = _Table(raw, path, K.CONFIG_KEYS)
            name = t.name()
            action = t.string("action", required=True, choices=CONFIGURATION_ACTIONS,
                              what=f"one of {_listing(CONFIGURATION_ACTIONS)}")
            description = t.string("description", default="")
            disabled = t.array("disables_stations", what="an array of station names") or []
            for j, s in enumerate(disabled):
                if not isinstance(s, str) or s not in station_names:
                    raise _err(item_field(t.field("disables_stations"), j), s,
                               f"expected a station name: {_listing(station_names) or 'none'}")
            items = []
            for j, iraw in enumerate(_tables(raw, "item", f"{path}.item")):
                it = _Table(iraw, _named_path(f"{path}.item", j, iraw), K.ITEM_KEYS)
                iname = it.name()
                mass = self.mass(it, "mass", required=True, positive=True,
                                 what="the item's mass")
                x = self.length(it, "x", required=True, what="the arm x")
                y = self.length(it, "y") or 0.0
                z = self.length(it, "z")
                shape = self._shape(it)
                items.append(ConfigItem(iname, mass, x, y, z, shape))
            self._unique(f"{path}.item", items, "item names")
            if not items and not disabled:
                raise _err(path, raw, "expected at least one [[configuration.item]] or "
                           "disables_stations")
            out.append(Configuration(name, action, description, tuple(items), tuple(disabled)))
        self._unique("configuration", out, "configuration names")
        return out

    def _shape(self, it: _Table) -> Shape | None:
        raw = it.get("shape")
        if raw is None:
            return None
        where = it.field("shape")
        if not isinstance(raw, dict):
            raise _err(where, raw, f"expected an inline table {{kind = ...}}, got "
                       f"{_typename(raw)}")
        kind = raw.get("kind")
        if kind not in SHAPE_KINDS:
            if "kind" not in raw:
                raise TypeDataError(f"{where}.kind", _MISSING,
                                    f"required: one of {_listing(SHAPE_KINDS)}")
            raise _err(f"{where}.kind", kind, f"expected one of {_listing(SHAPE_KINDS)}")
        dims = SHAPE_DIMENSIONS[kind]
        for key, value in raw.items():
            if key != "kind" and key not in dims:
                allowed = _listing(("kind",) + dims)
                raise _err(f"{where}.{key}", value,
                           f"unknown key for a {kind}; allowed here: {allowed}")
        s = _Table(raw, where, ("kind",) + dims)
        vals = {}
        for d in dims:
            if d == "axis":
                vals["axis"] = s.string("axis", required=True, choices=SHAPE_AXES,
                                        what="the axis: x, y or z")
            else:
                vals[f"{d}_m"] = self.length(s, d, required=True, positive=True,
                                             what=f"the {d.replace('_', ' ')}")
        if kind == "hollow_cylinder" and vals["inner_radius_m"] >= vals["radius_m"]:
            radius = _disp(vals["radius_m"], self.units.length)
            raise _err(f"{where}.inner_radius", raw["inner_radius"],
                       f"expected less than the radius ({radius})")
        return Shape(kind=kind, **vals)

