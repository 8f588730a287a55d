"""Checking the fuel of a raw plan: loads per tank, densities, taxi and trip fuel, burn order."""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from functools import partial

from ledger import units as U
from ledger.bounds import item_field
from ledger.errors import InputError, NotFoundError
from ledger.typedata._messages import _MISSING, _disp
from ledger.typedata.plan.model import BURN_PROPORTIONAL, BURN_TANK_ORDER, TankLoad
from ledger.typedata.plan.raw import _FUEL_KEYS, _TANK_KEYS

#: A figure in a display unit for a plan's messages: '26 USgal', '1156.66 kg'.
_q = partial(_disp, digits=6)


class _FuelChecker:
    """The fuel section of :class:`~ledger.typedata.plan.check._Checker`."""

    def fuel(self):
        fuel = self.raw.get("fuel", {})
        if not isinstance(fuel, dict):
            raise self.err("fuel", fuel, "expected a table [fuel]")
        self.keys(fuel, "fuel", _FUEL_KEYS)
        tanks_raw = fuel.get("tanks", {})
        if not isinstance(tanks_raw, dict):
            raise self.err("fuel.tanks", tanks_raw,
                           "expected a table [fuel.tanks] of TANK = QUANTITY")
        loads: list[TankLoad] = []
        for name, spec in tanks_raw.items():
            loads.append(self.tank(name, spec))
        seen: dict[str, str] = {}
        for tl in loads:
            if tl.tank in seen:
                raise self.err(f"fuel.tanks[{tl.tank!r}]", tl.tank,
                               "each tank once (two spellings name the same tank)")
            seen[tl.tank] = tl.tank
        order_tanks = [t for t in self.t.tanks if t.is_fuel]
        seq, order = self.burn(fuel.get("burn", BURN_PROPORTIONAL), loads, order_tanks)
        feeding = [tl for tl in loads if tl.tank in order]
        usable = math.fsum(tl.mass_kg for tl in feeding)
        vol = math.fsum(tl.volume_m3 for tl in feeding)
        density = usable / vol if vol > 0 else None
        taxi = self.burn_mass(fuel, "taxi", density)
        trip = self.burn_mass(fuel, "trip", density)
        fed = "the feeding tanks" if seq == BURN_TANK_ORDER else "the fuel tanks"
        unit = self.du.volume if density is not None and self._volume_basis() else self.du.mass

        def show(kg):
            return _q(kg / density, unit) if unit == self.du.volume else _q(kg, unit)

        if trip > usable * (1 + 1e-12):
            raise self.err("fuel.trip", self._raw_value(fuel.get("trip")),
                           f"at most the usable fuel on board in {fed}, {show(usable)}",
                           hint="Add fuel or reduce the trip fuel", entry=fuel.get("trip"))
        if taxi + trip > usable * (1 + 1e-12):
            raise self.err("fuel.taxi", self._raw_value(fuel.get("taxi")),
                           f"taxi and trip fuel together ({show(taxi + trip)}) at most the "
                           f"usable fuel on board in {fed}, {show(usable)}",
                           hint="Add fuel or reduce the taxi or trip fuel",
                           entry=fuel.get("taxi"))
        return loads, taxi, trip, seq, order

    def _volume_basis(self) -> bool:
        return any(t.basis == "volume" for t in self.t.tanks)

    @staticmethod
    def _raw_value(v):
        if isinstance(v, dict) and "_value" in v:
            return v["_value"]
        return v

    def burn_mass(self, fuel: Mapping, key: str, density: float | None) -> float:
        entry = fuel.get(key)
        if entry is None:
            return 0.0
        value = self._raw_value(entry)
        field = f"fuel.{key}"
        default = self.du.volume if self._volume_basis() else self.du.mass
        try:
            q, dim = U.parse_quantity_of(value, ("volume", "mass"), default, field=field)
        except InputError as exc:
            raise self._unit(exc, field, entry) from None
        if q < 0:
            raise self.err(field, value, f"expected a {dim} of 0 or more", entry=entry)
        if dim == "mass":
            return q
        if density is None:
            if q == 0:
                return 0.0
            raise self.err(field, value, "a fuel quantity needs fuel on board in the tanks "
                           "that feed", entry=entry)
        return q * density

    def tank(self, name, spec) -> TankLoad:
        entry = spec if isinstance(spec, dict) else None
        path = f"fuel.tanks[{name!r}]"
        try:
            tank = self.t.tank(name)
        except NotFoundError:
            known = ", ".join(t.name for t in self.t.tanks) or "none"
            raise self.err("fuel.tanks", name, f"unknown tank; type {self.t.name} has: {known}",
                           entry=entry) from None
        path = f"fuel.tanks[{tank.name!r}]"
        if isinstance(spec, dict):
            self.keys(spec, path, _TANK_KEYS)
            if "quantity" not in spec:
                raise self.err(f"{path}.quantity", _MISSING, "required: the usable fuel "
                               "loaded, a volume or a mass", entry=entry)
            qty_raw = spec["quantity"]
        else:
            qty_raw, spec = spec, {}
        qfield = f"{path}.quantity" if entry is not None else path
        default = self.du.volume if tank.basis == "volume" else self.du.mass
        try:
            qty, dim = U.parse_quantity_of(qty_raw, ("volume", "mass"), default, field=qfield)
        except InputError as exc:
            raise self._unit(exc, qfield, entry) from None
        if qty < 0:
            raise self.err(qfield, qty_raw, f"expected a {dim} of 0 or more", entry=entry)
        density, source, temp, rho15 = self.density(tank, spec, path, entry)
        if dim == "mass":
            mass, volume = qty, qty / density
        else:
            mass, volume = qty * density, qty
        # Capacity in the tank's own basis; the unusable fuel is in the empty weight already.
        if tank.basis == "volume":
            room = tank.capacity - tank.unusable
            loaded, unit = volume, self.du.volume
        else:
            room = tank.capacity - tank.unusable
            loaded, unit = mass, self.du.mass
        if loaded > room * (1 + 1e-12):
            extra = (f" (capacity {_q(tank.capacity, unit)} less {_q(tank.unusable, unit)} "
                     f"unusable, which the empty weight includes)" if tank.unusable else "")
            raise self.err(qfield, qty_raw,
                           f"at most the usable capacity of tank '{tank.name}', "
                           f"{_q(room, unit)}{extra}",
                           hint=f"Reduce the fuel by {_q(loaded - room, unit)}", entry=entry)
        return TankLoad(tank.name, mass, volume, density, source, temp, rho15)

    def density(self, tank, spec: Mapping, path: str, entry):
        if "density" in spec and "temperature" in spec:
            raise self.err(f"{path}.temperature", spec["temperature"],
                           "either density or temperature, not both", entry=entry)
        if "density_15c" in spec and "temperature" not in spec:
            raise self.err(f"{path}.density_15c", spec["density_15c"],
                           "only with temperature (the density at 15 °C is corrected to it)",
                           entry=entry)
        if "density" in spec:
            f = f"{path}.density"
            try:
                rho = U.parse_density(spec["density"], self.du.density_unit, field=f)
            except InputError as exc:
                raise self._unit(exc, f, entry) from None
            if rho <= 0:
                raise self.err(f, spec["density"], "expected a density greater than 0",
                               entry=entry)
            return rho, "given", None, None
        if "temperature" in spec:
            from ledger.core.fuel import density_at_temperature
            from ledger.typedata.model import FLUIDS

            f = f"{path}.temperature"
            try:
                t_c = U.parse_temperature(spec["temperature"], "degC", field=f)
            except InputError as exc:
                raise self._unit(exc, f, entry) from None
            group = FLUIDS[tank.fluid].vcf_group
            if group is None:
                raise self.err(f, spec["temperature"], f"a density instead: no temperature "
                               f"correction is known for {tank.fluid}", entry=entry)
            rho15 = tank.density_kg_m3
            if "density_15c" in spec:
                f15 = f"{path}.density_15c"
                try:
                    rho15 = U.parse_density(spec["density_15c"], self.du.density_unit,
                                            field=f15)
                except InputError as exc:
                    raise self._unit(exc, f15, entry) from None
            try:
                rho = float(density_at_temperature(rho15, t_c, group))
            except InputError as exc:
                bad = spec["temperature"] if exc.field.startswith("t_c") else \
                    spec.get("density_15c", _q(rho15, "kg/m3"))
                raise self.err(f if exc.field.startswith("t_c") else f"{path}.density_15c",
                               bad, exc.allowed, exc.hint, entry) from None
            return rho, "temperature", t_c, rho15
        return tank.density_kg_m3, ("type" if tank.density_from_file else "nominal"), None, None

    def burn(self, value, loads: Sequence[TankLoad], fuel_tanks) -> tuple[str, list[str]]:
        with_fuel = [tl.tank for tl in loads if tl.mass_kg > 0
                     and any(t.name == tl.tank for t in fuel_tanks)]
        entry = value if isinstance(value, dict) else None
        value = self._raw_value(value)
        if value == BURN_PROPORTIONAL:
            return BURN_PROPORTIONAL, with_fuel
        if isinstance(value, str) or not isinstance(value, list) or not value:
            raise self.err("fuel.burn", value, "expected 'proportional' or a list of tanks "
                           "drained in order, e.g. [\"left\", \"right\"]", entry=entry)
        order: list[str] = []
        names = [t.name for t in fuel_tanks]
        for i, name in enumerate(value):
            f = item_field("fuel.burn", i)
            match = [t.name for t in fuel_tanks
                     if isinstance(name, str) and t.name.casefold() == name.strip().casefold()]
            if not match:
                raise self.err(f, name, f"a fuel tank of type {self.t.name}: "
                               f"{', '.join(names) or 'none'}", entry=entry)
            if match[0] in order:
                raise self.err(f, name, "each tank once in the burn order", entry=entry)
            order.append(match[0])
        return BURN_TANK_ORDER, order

