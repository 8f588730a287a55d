"""Plan files and quick command-line plans: units, densities, standard masses, exact errors.

Sources: NIST SP 811 appendix B (1 lb = 0.45359237 kg, 1 US gal = 3.785411784 L, exact);
FAA-H-8083-30 ch. 4 (avgas 6.0 lb/US gal; 170 lb per person for light aircraft);
AC 120-27E (average child 82 lb in summer, read in a secondary source); ASTM D1250 / API MPMS
11.1 table 54B (VCF 1 at 15 °C by definition; jet fuel ρ15 = 800 kg/m³ at −40 °C: VCF 1.0502,
the printed table value quoted in ledger/core/fuel.py).
"""

from __future__ import annotations

import pytest

from ledger.core.fuel import density_at_temperature
from ledger.errors import PlanError
from ledger.testing import assert_close
from ledger.typedata.plan import (
    Plan,
    QuickOptions,
    merge_options,
    parse_plan,
    plan_from_options,
    read_plan_file,
    read_plan_text,
)
from tests.loadsheet.common import LB, USGAL, envelope, lb_in_type, make_type, plan_of, station

TANKS = ('\n[[tank]]\nname = "left"\nfluid = "avgas"\ncapacity = 26\nunusable = 1\nx = 48\n'
         '\n[[tank]]\nname = "right"\nfluid = "avgas"\ncapacity = 26\nunusable = 1\nx = 48\n'
         '\n[[tank]]\nname = "aux"\nfluid = "jet"\ncapacity = "300 lb"\nx = 60\n')


@pytest.fixture(scope="module")
def vt():
    return make_type(lb_in_type(
        name="TEST-PLAN", limits="max_takeoff = 2450",
        stations=(station("pilot", "crew", 37) + station("front passenger", "passenger", 37)
                  + station("rear bench", "passenger", 73, extra="persons = 2\n")
                  + station("baggage", "cargo", 95, max_mass=120,
                            extra="x_range = [82.0, 108.0]\n")),
        tanks=TANKS, envelopes=envelope([(35, 1500), (35, 2450), (47, 2450), (47, 1500)])))


def test_masses_with_units_and_bare_numbers_in_display_units(vt):
    plan = plan_of(vt, '[[person]]\nseat = "pilot"\nmass = 180\nname = "A. Pilot"\n'
                       '[[person]]\nseat = "front passenger"\nmass = "82 kg"\n'
                       '[[cargo]]\nstation = "baggage"\nmass = "40 lb"\nwhat = "bags"\n')
    pilot, pax = plan.persons
    # 180 lb (the type's display unit) = 180 × 0.45359237 kg (NIST SP 811).
    assert_close(pilot.mass_kg, 81.6466266, unit="kg", rtol=1e-15, source="NIST SP 811")
    assert (pilot.name, pilot.mass_source) == ("A. Pilot", "actual")
    assert pax.mass_kg == 82.0
    assert plan.cargo[0].what == "bags"
    assert_close(plan.cargo[0].mass_kg, 40 * LB, unit="kg", rtol=1e-15)
    assert plan.standard_masses == "actual" and plan.category == "normal"


def test_fuel_volume_mass_and_density_sources(vt):
    plan = plan_of(vt, '[fuel.tanks]\nleft = 25\nright = { quantity = "20 USgal", '
                       'density = "6.1 lb/USgal" }\naux = "120 lb"\n')
    left, right, aux = (plan.tank_load(n) for n in ("left", "right", "aux"))
    # 25 US gal of avgas at the standard 6.0 lb/US gal is 150 lb (FAA-H-8083-30 ch. 4).
    assert_close(left.mass_kg / LB, 150.0, unit="lb", rtol=1e-12, source="FAA-H-8083-30")
    assert left.density_source == "nominal"
    assert_close(left.volume_m3, 25 * USGAL, unit="m3", rtol=1e-15)
    assert_close(right.mass_kg / LB, 122.0, unit="lb", rtol=1e-12)
    assert right.density_source == "given"
    # A mass for a mass-based tank of jet fuel: its volume at 6.7 lb/US gal (FAA-H-8083-30).
    assert_close(aux.volume_m3 / USGAL, 120 / 6.7, unit="USgal", rtol=1e-12)


def test_density_from_the_fuel_temperature(vt):
    plan = plan_of(vt, '[fuel.tanks]\nleft = { quantity = 20, temperature = "15 degC" }\n'
                       'right = { quantity = 20, temperature = "35 degC" }\n'
                       'aux = { quantity = "30 USgal", temperature = "-40 degC", '
                       'density_15c = "800 kg/m3" }\n')
    left, right, aux = (plan.tank_load(n) for n in ("left", "right", "aux"))
    # At 15 °C the correction factor is 1 by definition: the density stays nominal.
    assert_close(left.density_kg_m3, 6.0 * LB / USGAL, unit="kg/m3", rtol=1e-12)
    assert left.density_source == "temperature" and left.temperature_c == 15.0
    assert right.density_kg_m3 < left.density_kg_m3  # warmer fuel is lighter
    assert right.density_kg_m3 == density_at_temperature(6.0 * LB / USGAL, 35.0, "gasoline")
    # Table 54B, jet fuel ρ15 = 800 kg/m³ at −40 °C: VCF 1.0502 (printed table value).
    assert_close(aux.density_kg_m3, 800 * 1.0502, unit="kg/m3", rtol=1e-4, source="table 54B")
    assert aux.density_15c_kg_m3 == 800.0


def test_standard_masses_chosen_by_the_operator(vt):
    plan = plan_of(vt, 'standard_masses = "faa-light-170lb"\n'
                       '[[person]]\nseat = "pilot"\n'
                       '[[person]]\nseat = "rear bench"\n'
                       '[[person]]\nseat = "rear bench"\nmass = 150\n')
    pilot, std, actual = plan.persons
    # FAA-H-8083-30 ch. 4: 170 lb per crew member or passenger (light aircraft).
    assert_close(pilot.mass_kg / LB, 170.0, unit="lb", rtol=1e-12, source="FAA-H-8083-30")
    assert (pilot.mass_source, pilot.occupant_class) == ("standard", "flight_crew")
    assert (std.mass_source, std.occupant_class) == ("standard", "adult")
    assert actual.mass_source == "actual"
    child = plan_of(vt, 'standard_masses = "faa-ac120-27e-summer"\n'
                        '[[person]]\nseat = "rear bench"\nclass = "child"\n').persons[0]
    assert_close(child.mass_kg / LB, 82.0, unit="lb", rtol=1e-12, source="AC 120-27E")


def test_taxi_trip_burn_order_and_cargo_arm(vt):
    plan = plan_of(vt, '[[cargo]]\nstation = "baggage"\nmass = 30\nx = 100\n'
                       '[fuel]\ntaxi = "1 USgal"\ntrip = "60 lb"\nburn = ["right", "LEFT"]\n'
                       '[fuel.tanks]\nleft = 20\nright = 20\n')
    assert_close(plan.taxi_fuel_kg / LB, 6.0, unit="lb", rtol=1e-12)  # 1 US gal at 6.0 lb
    assert_close(plan.trip_fuel_kg / LB, 60.0, unit="lb", rtol=1e-12)
    assert (plan.burn_sequence, plan.burn_order) == ("tank order", ("right", "left"))
    assert_close(plan.cargo[0].x_m, 100 * 0.0254, unit="m", rtol=1e-15)
    assert Plan.from_dict(plan.to_dict()) == plan


def test_quick_options_and_merging_over_a_file(vt):
    opts = QuickOptions(persons=("pilot=80 kg", "rear bench=adult", "rear bench=70 kg"),
                        cargo=("baggage=10 kg",), fuel=("left=20 USgal@6.2 lb/USgal",),
                        trip="10 USgal", standard_masses="faa-light-170lb")
    plan = parse_plan(plan_from_options("T-1", opts), vt, source="command line")
    assert [p.seat for p in plan.persons] == ["pilot", "rear bench", "rear bench"]
    assert plan.persons[1].mass_source == "standard"
    assert plan.tank_load("left").density_source == "given"
    raw = read_plan_text('plan_format = 1\nvehicle = "T-1"\n'
                         '[[person]]\nseat = "pilot"\nmass = 180\n'
                         '[[person]]\nseat = "front passenger"\nmass = 150\n'
                         '[[cargo]]\nstation = "baggage"\nmass = 40\n'
                         '[fuel.tanks]\nleft = 20\nright = 20\n', "p.toml")
    merged = merge_options(raw, QuickOptions(persons=("pilot=170",), vacate=("front passenger",),
                                             cargo=("baggage=0",), fuel=("right=10",)))
    plan = parse_plan(merged, vt, source="p.toml")
    assert [(p.seat, round(p.mass_kg / LB, 9)) for p in plan.persons] == [("pilot", 170.0)]
    assert plan.cargo == ()
    assert_close(plan.tank_load("right").volume_m3 / USGAL, 10.0, unit="USgal", rtol=1e-12)
    assert_close(plan.tank_load("left").volume_m3 / USGAL, 20.0, unit="USgal", rtol=1e-12)
    assert "person" in raw and len(raw["person"]) == 2  # the original raw plan is unchanged


BAD = {
    "unknown seat": ('[[person]]\nseat = "co-pilot"\nmass = 170\n',
                     "plan.toml: person[1].seat = 'co-pilot': unknown seat; type TEST-PLAN has: "
                     "pilot, front passenger, rear bench"),
    "unknown compartment": ('[[cargo]]\nstation = "nose locker"\nmass = 20\n',
                            "plan.toml: cargo[1].station = 'nose locker': unknown cargo, "
                            "equipment or ballast station; type TEST-PLAN has: baggage"),
    "two people in one seat": (
        '[[person]]\nseat = "pilot"\nmass = 170\n[[person]]\nseat = "pilot"\nmass = 150\n',
        "plan.toml: person[2].seat = 'pilot': a free seat: 'pilot' takes 1 person and "
        "person[1] is already there. Two people cannot share one seat; put one in another "
        "seat"),
    "bench over its persons": (
        '[[person]]\nseat = "rear bench"\nmass = 170\n' * 3,
        "plan.toml: person[3].seat = 'rear bench': a free seat: 'rear bench' takes 2 persons "
        "and person[1] and person[2] are already there. Put the others in another seat"),
    "person in a compartment": (
        '[[person]]\nseat = "baggage"\nmass = 170\n',
        "plan.toml: person[1].seat = 'baggage': a seat; 'baggage' is a cargo station, so put "
        "it under [[cargo]]. Seats of type TEST-PLAN: pilot, front passenger, rear bench"),
    "fuel over tank capacity": (
        '[fuel.tanks]\nleft = "26 USgal"\n',
        "plan.toml: fuel.tanks['left'] = '26 USgal': at most the usable capacity of tank "
        "'left', 25 USgal (capacity 26 USgal less 1 USgal unusable, which the empty weight "
        "includes). Reduce the fuel by 1 USgal"),
    "trip fuel over the fuel on board": (
        '[fuel]\ntrip = "45 USgal"\n[fuel.tanks]\nleft = "20 USgal"\nright = "20 USgal"\n',
        "plan.toml: fuel.trip = '45 USgal': at most the usable fuel on board in the fuel "
        "tanks, 40 USgal. Add fuel or reduce the trip fuel"),
    "taxi and trip over the fuel": (
        '[fuel]\ntaxi = "2 USgal"\ntrip = "39 USgal"\n[fuel.tanks]\nleft = "20 USgal"\n'
        'right = "20 USgal"\n',
        "plan.toml: fuel.taxi = '2 USgal': taxi and trip fuel together (41 USgal) at most the "
        "usable fuel on board in the fuel tanks, 40 USgal. Add fuel or reduce the taxi or "
        "trip fuel"),
    "non-finite mass": ('[[person]]\nseat = "pilot"\nmass = nan\n',
                        "plan.toml: person[1].mass = nan: not a finite number; a mass must be "
                        "a finite number"),
    "infinite mass text": ('[[person]]\nseat = "pilot"\nmass = "inf lb"\n',
                           "plan.toml: person[1].mass = 'inf lb': not a finite number; a mass "
                           "must be a finite number"),
    "negative mass": ('[[cargo]]\nstation = "baggage"\nmass = "-5 lb"\n',
                      "plan.toml: cargo[1].mass = '-5 lb': expected a mass of 0 or more"),
    "unknown tank": ('[fuel.tanks]\ncenter = 10\n',
                     "plan.toml: fuel.tanks = 'center': unknown tank; type TEST-PLAN has: "
                     "left, right, aux"),
    "unknown standard set": (
        'standard_masses = "heavy"\n',
        "plan.toml: standard_masses = 'heavy': expected 'actual' or a standard mass set; "
        "available: faa-light-170lb, faa-ac120-27e-summer, faa-ac120-27e-winter, easa-crew"),
    "no mass with actual masses": (
        '[[person]]\nseat = "pilot"\n',
        "plan.toml: person[1].mass = (missing): required: the person's actual mass, since "
        "standard_masses is 'actual'. Or name a standard mass set with standard_masses"),
    "misspelt key": ('vehicel = "x"\n',
                     "plan.toml: vehicel = 'x': unknown key; allowed here: plan_format, vehicle, "
                     "configuration, category, standard_masses, prepared_by, axle_rules, note, "
                     "person, cargo, fuel. Did you mean 'vehicle'?"),
    "ambiguous gallon": ('[fuel.tanks]\nleft = "20 gal"\n',
                         "plan.toml: fuel.tanks['left'] = '20 gal': 'gal' is ambiguous; volume "
                         "units: m3, L, USgal, impgal, ft3, in3; mass units: kg, g, t, lb, slug. "
                         "Write USgal (3.785411784 L) or impgal (4.54609 L)"),
    "cargo arm outside the compartment": (
        '[[cargo]]\nstation = "baggage"\nmass = 10\nx = 120\n',
        "plan.toml: cargo[1].x = 120: an arm within station 'baggage', from 82 in to 108 in"),
}


@pytest.mark.parametrize("case", list(BAD))
def test_bad_plans_name_the_field_value_and_what_is_allowed(vt, case):
    body, message = BAD[case]
    with pytest.raises(PlanError) as err:
        plan_of(vt, body)
    assert str(err.value) == message
    assert err.value.exit_code == 2


@pytest.mark.parametrize("opts, message", [
    (QuickOptions(persons=("pilot",)),
     "--person = 'pilot': expected SEAT=MASS or SEAT=CLASS, e.g. 'pilot=82 kg' or "
     "'row 2 left=adult'"),
    (QuickOptions(persons=("pilot=170", "pilot=150")),
     "--person = 'pilot=150': a free seat: 'pilot' takes 1 person and another person is "
     "already there. Two people cannot share one seat; put one in another seat"),
    (QuickOptions(fuel=("left=30 USgal",)),
     "--fuel = 'left=30 USgal': at most the usable capacity of tank 'left', 25 USgal "
     "(capacity 26 USgal less 1 USgal unusable, which the empty weight includes). Reduce the "
     "fuel by 5 USgal"),
    (QuickOptions(fuel=("left=10 USgal@fast",)),
     "--fuel = 'left=10 USgal@fast': after '@' a density such as '6.1 lb/USgal' or a "
     "temperature such as '25 degC'"),
    (QuickOptions(fuel=("left=10 USgal",), trip="20 USgal"),
     "--trip = '20 USgal': at most the usable fuel on board in the fuel tanks, 10 USgal. Add "
     "fuel or reduce the trip fuel"),
])
def test_bad_quick_options_name_the_option(vt, opts, message):
    with pytest.raises(PlanError) as err:
        parse_plan(plan_from_options("T-1", opts), vt, source="command line")
    assert str(err.value) == message


def test_plan_file_errors(tmp_path):
    with pytest.raises(PlanError) as err:
        read_plan_file(tmp_path / "none.toml")
    assert str(err.value) == f"plan file = '{tmp_path / 'none.toml'}': no such file"
    f = tmp_path / "p.toml"
    f.write_text('vehicle = "KV-101"\n', encoding="utf-8")
    with pytest.raises(PlanError) as err:
        read_plan_file(f)
    assert str(err.value) == (f"{f}: plan_format = (missing): required: plan_format = 1 at the "
                              "top of the plan")
    f.write_text('plan_format = 2\nvehicle = "KV-101"\n', encoding="utf-8")
    with pytest.raises(PlanError) as err:
        read_plan_file(f)
    assert str(err.value) == (f"{f}: plan_format = 2: expected 1; this wbledger reads "
                              "plan_format 1")
    f.write_text('plan_format = 1\nvehicle = KV-101\n', encoding="utf-8")
    with pytest.raises(PlanError) as err:
        read_plan_file(f)
    assert str(err.value).startswith(f"plan file = '{f}': not valid TOML: Invalid value")
