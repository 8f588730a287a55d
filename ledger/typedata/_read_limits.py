"""Reading the limits of a type file: weights, envelopes, axles and the ledger's tolerances."""

from __future__ import annotations

import math

from ledger import units as U
from ledger.bounds import counted_from_one, item_field
from ledger.errors import InputError, TypeDataError
from ledger.typedata import type_keys as K
from ledger.typedata._messages import _MISSING, _a, _disp, _listing, _Shown
from ledger.typedata._toml import _err, _named_path, _Table, _tables
from ledger.typedata.model import (
    AIRCRAFT_KINDS,
    ENVELOPE_AXES,
    ENVELOPE_CATEGORIES,
    ENVELOPE_COORDINATES,
    Axle,
    AxleGroup,
    Envelope,
    Mac,
    Tolerances,
    WeightLimits,
)


class _LimitsReader:
    def _limits(self, top: _Table) -> WeightLimits:
        aircraft = self.kind in AIRCRAFT_KINDS
        t = top.sub("limits", K.LIMIT_KEYS, required=True, what="a [limits] table (max_takeoff "
                    "for aircraft, gross_rating for ground vehicles)")
        if aircraft and t.has("gross_rating"):
            raise _err("limits.gross_rating", t.get("gross_rating"),
                       f"allowed only for kind ground_vehicle; {_a(self.kind)} uses "
                       f"{_listing(K.AIR_LIMITS)}")
        if not aircraft:
            for k in K.AIR_LIMITS:
                if t.has(k):
                    raise _err(f"limits.{k}", t.get(k), "not for a ground vehicle; use "
                               "gross_rating and the axle ratings")
        v = {k: self.mass(t, k, positive=True, what="a mass") for k in K.LIMIT_KEYS}
        if aircraft and v["max_takeoff"] is None:
            raise TypeDataError("limits.max_takeoff", _MISSING,
                                f"required: the maximum take-off mass of {_a(self.kind)}")
        if not aircraft and v["gross_rating"] is None:
            raise TypeDataError("limits.gross_rating", _MISSING,
                                "required: the gross vehicle mass rating")
        mu = self.units.mass

        def at_most(key, other):
            if v[key] is not None and v[other] is not None and v[key] > v[other]:
                raise _err(f"limits.{key}", t.get(key),
                           f"expected at most {other} ({_disp(v[other], mu)})")

        at_most("max_takeoff", "max_ramp")
        at_most("max_landing", "max_takeoff")
        at_most("max_zero_fuel", "max_takeoff")
        if v["min_flight"] is not None and v["min_flight"] >= v["max_takeoff"]:
            raise _err("limits.min_flight", t.get("min_flight"),
                       f"expected less than max_takeoff ({_disp(v['max_takeoff'], mu)})")
        return WeightLimits(max_ramp_kg=v["max_ramp"], max_takeoff_kg=v["max_takeoff"],
                            max_landing_kg=v["max_landing"], max_zero_fuel_kg=v["max_zero_fuel"],
                            min_flight_kg=v["min_flight"], gross_rating_kg=v["gross_rating"])

    def _envelopes(self) -> list[Envelope]:
        from ledger.core.envelope import validate_polygon  # numpy only when parsing

        du = self.units
        out = []
        for i, raw in enumerate(_tables(self.data, "envelope")):
            path = _named_path("envelope", i, raw)
            t = _Table(raw, path, K.ENVELOPE_KEYS)
            name = t.name()
            category = t.string("category", required=True,
                                what=f"one of {_listing(ENVELOPE_CATEGORIES)}",
                                choices=ENVELOPE_CATEGORIES)
            axis = t.string("axis", required=True, what=f"one of {_listing(ENVELOPE_AXES)}",
                            choices=ENVELOPE_AXES)
            coords = t.string("coordinates", default="arm", choices=ENVELOPE_COORDINATES,
                              what=f"one of {_listing(ENVELOPE_COORDINATES)}")
            raw_points = t.array("points", required=True,
                                 what="an array of [cg, mass] points")
            points = []  # SI
            shown = []  # the same points in display units, for the polygon check's messages
            for j, p in enumerate(raw_points):
                where = item_field(t.field("points"), j)
                if not isinstance(p, list) or len(p) != 2:
                    raise _err(where, p, "expected a point [cg, mass]")
                if coords == "arm":
                    cg = self.length(t, "", value=p[0], field=item_field(where, 0))
                else:
                    cg = U.parse_moment(p[0], du.moment_unit, field=item_field(where, 0))
                    if U.is_bare_number(p[0]):  # a bare number is a moment index
                        cg *= du.moment_divisor
                m = self.mass(t, "", value=p[1], field=item_field(where, 1), positive=True)
                points.append((cg, m))
                shown.append((du.moment_index(cg) if coords == "moment" else
                               U.to_unit(cg, du.length), U.to_unit(m, du.mass)))
            # Checked in display units so that a message shows the points as written; scaling
            # each axis does not change whether edges cross. The check drops a closing point
            # equal to the first, so an open and a closed ring give the same type and hash.
            try:
                ring = validate_polygon(shown, field=t.field("points"))
            except InputError as exc:  # the core counts points from 0
                raise counted_from_one(exc, t.field("points")) from None
            kept = tuple(points[:len(ring)])
            out.append(Envelope(name=name, category=category, axis=axis, coordinates=coords,
                                points=kept, note=t.string("note", default="")))
        self._unique("envelope", out, "envelope names")
        axes = [e.axis for e in out]
        if self.kind in AIRCRAFT_KINDS and "longitudinal" not in axes:
            raise _err("envelope[*].axis", _Shown(repr(axes)), f"{_a(self.kind)} needs at "
                       "least one [[envelope]] with axis = \"longitudinal\"")
        if self.kind == "helicopter" and "lateral" not in axes:
            raise _err("envelope[*].axis", _Shown(repr(axes)), "a helicopter needs at least one "
                       "[[envelope]] with axis = \"lateral\" as well as a longitudinal one")
        return out

    def _axles(self) -> tuple[list[Axle], list[AxleGroup]]:
        raws = _tables(self.data, "axle")
        graws = _tables(self.data, "axle_group")
        ground = self.kind == "ground_vehicle"
        if not ground and (raws or graws):
            key = "axle" if raws else "axle_group"
            raise _err(key, (raws or graws)[0], f"allowed only for kind ground_vehicle; "
                       f"{_a(self.kind)} is weighed on its [[reaction_point]]s")
        if ground and len(raws) < 2:
            raise _err("axle", _Shown(f"({len(raws)} given)"),
                       "a ground vehicle needs at least two [[axle]] tables")
        axles = []
        for i, raw in enumerate(raws):
            t = _Table(raw, _named_path("axle", i, raw), K.AXLE_KEYS)
            name = t.name()
            x = self.length(t, "x", required=True, what="the axle centreline arm x")
            rating = self.mass(t, "rating", required=True, positive=True,
                               what="the axle rating, a mass")
            track = self.length(t, "track", positive=True, what="the track width")
            for j, other in enumerate(axles):
                if other.x_m == x:
                    raise _err(t.field("x"), t.get("x"), f"expected a different arm from "
                               f"{item_field('axle', j)} ({other.name})")
            axles.append(Axle(name, x, rating, track))
        self._unique("axle", axles, "axle names")
        groups = []
        member_of: dict[str, str] = {}
        by_name = {a.name: a for a in axles}
        for i, raw in enumerate(graws):
            t = _Table(raw, _named_path("axle_group", i, raw), K.AXLE_GROUP_KEYS)
            name = t.name()
            members = t.array("axles", required=True, what="an array of axle names")
            if len(members) < 2:
                raise _err(t.field("axles"), members, "expected at least two axle names")
            for j, m in enumerate(members):
                if not isinstance(m, str) or m not in by_name:
                    raise _err(item_field(t.field("axles"), j), m,
                               f"expected one of the axles: {_listing(by_name)}")
                if m in member_of:
                    raise _err(item_field(t.field("axles"), j), m,
                               f"already in axle group {member_of[m]!r}")
                member_of[m] = name
            shares_raw = t.array("load_share", what="an array of load-share ratios")
            if shares_raw is None:
                shares = tuple(1.0 / len(members) for _ in members)
            else:
                if len(shares_raw) != len(members):
                    raise _err(t.field("load_share"), shares_raw,
                               f"expected {len(members)} ratios, one per axle")
                for j, s in enumerate(shares_raw):
                    if isinstance(s, bool) or not isinstance(s, (int, float)) \
                            or not math.isfinite(s) or s <= 0:
                        raise _err(item_field(t.field("load_share"), j), s,
                                   "expected a ratio greater than 0")
                shares = tuple(float(s) for s in shares_raw)
                if abs(math.fsum(shares) - 1.0) > 1e-6:
                    raise _err(t.field("load_share"), shares_raw, "expected ratios that sum "
                               f"to 1 (these sum to {math.fsum(shares):.10g})")
            rating = self.mass(t, "rating", positive=True, what="the group rating, a mass")
            groups.append(AxleGroup(name, tuple(members), shares, rating))
        self._unique("axle_group", groups, "axle group names")
        axles = [Axle(a.name, a.x_m, a.rating_kg, a.track_m, member_of.get(a.name))
                 for a in axles]
        return axles, groups

    def _tolerances(self, top: _Table, mac: Mac | None) -> Tolerances:
        t = top.sub("tolerances", K.TOLERANCE_KEYS)
        if t is None:
            return Tolerances()
        lm = self.mass(t, "last_minute_mass", what="a mass") or 0.0
        lp = t.integer("last_minute_persons", default=0, minimum=0,
                       what="a whole number of persons, 0 or more")
        rm = t.number("reweigh_mass_percent", minimum=0.0, what="a percentage of 0 or more")
        rc = t.number("reweigh_cg_percent_mac", minimum=0.0, what="a percentage of 0 or more")
        if rc is not None and mac is None:
            raise _err("tolerances.reweigh_cg_percent_mac", t.get("reweigh_cg_percent_mac"),
                       "needs a [mac] table; without one use reweigh_cg_shift (a length)")
        rs = self.length(t, "reweigh_cg_shift", positive=True, what="a length")
        return Tolerances(lm, lp, rm, rc, rs)

