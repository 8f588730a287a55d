"""Reading the loads of a type file: stations, tanks with their arm tables, standard masses."""

from __future__ import annotations

from ledger import units as U
from ledger.bounds import item_field
from ledger.errors import TypeDataError
from ledger.typedata import type_keys as K
from ledger.typedata._messages import _MISSING, _a, _disp, _listing, _typename
from ledger.typedata._toml import _err, _named_path, _Table, _tables
from ledger.typedata.model import (
    FLUIDS,
    OCCUPANT_CLASSES,
    SEAT_KINDS,
    STANDARD_MASS_SETS,
    STATION_KINDS,
    Extent,
    StandardMassSet,
    Station,
    Tank,
    TankArmPoint,
)


class _LoadsReader:
    def _stations(self) -> list[Station]:
        out = []
        for i, raw in enumerate(_tables(self.data, "station")):
            path = _named_path("station", i, raw)
            t = _Table(raw, path, K.STATION_KEYS)
            name = t.name()
            kind = t.string("kind", required=True, what=f"one of {_listing(STATION_KINDS)}",
                            choices=STATION_KINDS)
            x = self.length(t, "x", required=True, what="the arm x")
            y = self.length(t, "y") or 0.0
            z = self.length(t, "z")
            max_mass = self.mass(t, "max_mass", positive=True,
                                 what=f"the maximum mass of {_a(kind)} station",
                                 required=kind in ("cargo", "ballast"))
            seat = kind in SEAT_KINDS
            for key in ("persons", "occupant"):
                if t.has(key) and not seat:
                    raise _err(t.field(key), t.get(key), "allowed only on crew and passenger "
                               "stations")
            for key in ("x_range", "floor_area", "floor_load_limit"):
                if t.has(key) and kind != "cargo":
                    raise _err(t.field(key), t.get(key), "allowed only on cargo stations")
            persons = t.integer("persons", default=1 if seat else 0, minimum=1,
                                what="a whole number of persons, 1 or more")
            occupant = None
            if seat:
                occupant = t.string("occupant", choices=OCCUPANT_CLASSES,
                                    what=f"one of {_listing(OCCUPANT_CLASSES)}",
                                    default="flight_crew" if kind == "crew" else "adult")
            extent = self._extent(t, x) if kind == "cargo" else None
            out.append(Station(name=name, kind=kind, x_m=x, y_m=y, z_m=z,
                               max_mass_kg=max_mass, persons=persons, occupant_class=occupant,
                               extent=extent, note=t.string("note", default="")))
        return out

    def _extent(self, t: _Table, x: float) -> Extent | None:
        rng = t.array("x_range", what="[forward, aft] arms")
        area = self._qty(t, "floor_area", "area", None, positive=True, what="an area")
        limit = self._qty(t, "floor_load_limit", "area_density", None, positive=True,
                          what="a mass per area")
        if limit is not None and area is None:
            raise _err(t.field("floor_load_limit"), t.get("floor_load_limit"),
                       f"needs {t.field('floor_area')}, the loaded floor area")
        if rng is None:
            if area is not None:
                raise _err(t.field("floor_area"), t.get("floor_area"),
                           f"needs {t.field('x_range')}, the compartment's [forward, aft] arms")
            return None
        if len(rng) != 2:
            raise _err(t.field("x_range"), rng, "expected [forward, aft]: two arms")
        fwd = self.length(t, "", value=rng[0], field=f"{t.field('x_range')}[0]")
        aft = self.length(t, "", value=rng[1], field=f"{t.field('x_range')}[1]")
        if aft <= fwd:
            raise _err(f"{t.field('x_range')}[1]", rng[1],
                       f"expected an arm aft of the forward end ({_disp(fwd, self.units.length)})")
        if not fwd <= x <= aft:
            raise _err(t.field("x"), t.get("x"), f"expected an arm within x_range "
                       f"({_disp(fwd, self.units.length)} to {_disp(aft, self.units.length)})")
        return Extent(fwd, aft, area, limit)

    def _tanks(self) -> list[Tank]:
        out = []
        du = self.units
        for i, raw in enumerate(_tables(self.data, "tank")):
            path = _named_path("tank", i, raw)
            t = _Table(raw, path, K.TANK_KEYS)
            name = t.name()
            fluid = t.string("fluid", required=True, what=f"one of {_listing(FLUIDS)}",
                             choices=tuple(FLUIDS))
            cap_raw = t.require("capacity", "the tank capacity, a volume or a mass")
            capacity, dim = U.parse_quantity_of(cap_raw, ("volume", "mass"), du.volume,
                                                field=t.field("capacity"))
            if capacity <= 0:
                raise _err(t.field("capacity"), cap_raw, f"expected a {dim} greater than 0")
            dunit = du.volume if dim == "volume" else du.mass
            unusable = 0.0
            if t.has("unusable"):
                unusable = self._qty(t, "unusable", dim, dunit, what=f"a {dim}",
                                     minimum=0.0)
                if unusable >= capacity:
                    raise _err(t.field("unusable"), t.get("unusable"),
                               f"expected less than the capacity ({_disp(capacity, dunit)})")
            density = self._qty(t, "density", "density", None, positive=True,
                                what="a density")
            from_file = density is not None
            if density is None:
                density = FLUIDS[fluid].nominal_density_kg_m3
            table = self._arm_table(t, dim, dunit, capacity, unusable)
            if table:
                if t.has("x"):
                    raise _err(t.field("x"), t.get("x"), "give the arms either as x, y, z or "
                               "in arm_table, not both")
                x, y, z = table[-1].x_m, table[-1].y_m, table[-1].z_m
            else:
                x = self.length(t, "x", required=True,
                                what="the arm x (or an arm_table)")
                y = self.length(t, "y") or 0.0
                z = self.length(t, "z")
            out.append(Tank(name=name, fluid=fluid, basis=dim, capacity=capacity,
                            unusable=unusable, density_kg_m3=density,
                            density_from_file=from_file, x_m=x, y_m=y, z_m=z,
                            arm_table=table, note=t.string("note", default="")))
        return out

    def _arm_table(self, t: _Table, dim: str, dunit: str, capacity: float,
                   unusable: float) -> tuple[TankArmPoint, ...]:
        rows = t.array("arm_table", what="an array of rows {quantity, x, y, z}")
        if rows is None:
            return ()
        base = t.field("arm_table")
        if len(rows) < 2:
            raise _err(base, rows, "expected at least two rows {quantity, x, y, z}")
        lu = self.units.length
        out = []
        axes_in_rows = None
        for j, row in enumerate(rows):
            where = item_field(base, j)
            if not isinstance(row, dict):
                raise _err(where, row, f"expected a row {{quantity = ..., x = ...}}, got "
                           f"{_typename(row)}")
            r = _Table(row, where, K.ARM_ROW_KEYS)
            q = self._qty(r, "quantity", dim, dunit, required=True, minimum=0.0,
                          what=f"a {dim}")
            x = self.length(r, "x", required=True, what="the arm x")
            axes = tuple(k for k in ("y", "z") if r.has(k))
            if axes_in_rows is None:
                axes_in_rows = axes
                for k in axes:
                    if t.has(k):
                        raise _err(t.field(k), t.get(k), f"given in arm_table too; give {k} "
                                   "in every row or once for the tank, not both")
            elif axes != axes_in_rows:
                missing = sorted(set(axes_in_rows) ^ set(axes))[0]
                raise _err(r.field(missing), r.get(missing, _MISSING),
                           f"expected {missing} in every row of arm_table or in none")
            y = self.length(r, "y") if "y" in axes else (self.length(t, "y") or 0.0)
            z = self.length(r, "z") if "z" in axes else self.length(t, "z")
            if out and q <= out[-1].quantity:
                raise _err(r.field("quantity"), r.get("quantity"),
                           f"expected more than the row before ({_disp(out[-1].quantity, dunit)})"
                           "; rows must be in strictly increasing quantity")
            out.append(TankArmPoint(q, x, y, z))
        if out[0].quantity > unusable:
            raise _err(f"{item_field(base, 0)}.quantity", rows[0]["quantity"],
                       f"expected at most the unusable quantity ({_disp(unusable, dunit)}); "
                       "the table must cover the tank from unusable to capacity")
        if out[-1].quantity < capacity:
            raise _err(f"{item_field(base, len(rows) - 1)}.quantity", rows[-1]["quantity"],
                       f"expected at least the capacity ({_disp(capacity, dunit)}); "
                       "the table must cover the tank from unusable to capacity")
        del lu
        return tuple(out)

    def _mass_sets(self) -> list[StandardMassSet]:
        out = []
        for i, raw in enumerate(_tables(self.data, "mass_set")):
            t = _Table(raw, _named_path("mass_set", i, raw), K.MASS_SET_KEYS)
            name = t.name()
            if name in STANDARD_MASS_SETS:
                raise _err(t.field("name"), name, "the name of a built-in set; choose "
                           f"another name (built-in: {_listing(STANDARD_MASS_SETS)})")
            masses = []
            for cls in OCCUPANT_CLASSES:
                m = self.mass(t, cls, positive=True, what="a mass")
                if m is not None:
                    masses.append((cls, m))
            if not masses:
                raise TypeDataError(t.field("adult"), _MISSING, "required: a mass for at "
                                    f"least one of {_listing(OCCUPANT_CLASSES)}")
            out.append(StandardMassSet(name, t.string("description", default=""),
                                       t.string("source", default="type file"),
                                       tuple(masses)))
        self._unique("mass_set", out, "mass set names")
        return out


