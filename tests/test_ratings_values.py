"""The ratings plugin's duty computations against published values.

Each expected number is transcribed from /work/shared/CHECK-VALUES.md or the
source named beside the check, not taken from the code's output. "from
memory" marks a figure CHECK-VALUES.md itself gives from memory.
"""
from __future__ import annotations

import math

import pytest

from ctllint.reading.model import CategoryRating, ContactRating, Device, Location, Severity
from ctllint.reading.quantities import parse_quantity
from ctllint.testing import check_text
from ctllint_plugins import ratings

LOC = Location("t.ctl.yaml", 1, 1)
_DIMENSIONS = {
    "inrush": "apparent_power", "sealed": "apparent_power", "rating": "apparent_power",
    "coil_power": "power", "power": "power", "current": "current", "fla": "current",
    "voltage": "voltage", "temp_rise": "temperature",
}


def device(tag: str, kind: str, **fields) -> Device:
    parsed = {}
    for name, value in fields.items():
        if name in _DIMENSIONS and isinstance(value, str):
            value = parse_quantity(value, _DIMENSIONS[name])
        parsed[name] = value
    return Device(tag, kind, LOC, parsed)


def approx(value: float, rel: float = 1e-3):
    return pytest.approx(value, rel=rel)


# ---------------------------------------------------------------------------
# Load currents and contact duty (physics: I = VA / V, DC coil I = W / V)
# ---------------------------------------------------------------------------


def test_coil_current_is_va_over_supply_voltage():
    # CHECK-VALUES.md "Physics": coil current = VA / V, inrush and sealed separately.
    fig = ratings.load_figures(device("M1", "contactor", inrush="218 VA", sealed="25 VA"), 120.0)
    assert fig.inrush_a == approx(218 / 120)  # 1.82 A
    assert fig.sealed_a == approx(25 / 120)  # 0.208 A


def test_dc_coil_current_is_watts_over_volts():
    # CHECK-VALUES.md "Physics": DC coil = W / V.
    fig = ratings.load_figures(device("CR1", "relay", coil_power="3 W"), 24.0)
    assert fig.inrush_a == fig.sealed_a == approx(0.125)


def test_pilot_light_is_resistive():
    # Single-phase resistive I = P / V (CHECK-VALUES.md "Physics").
    fig = ratings.load_figures(device("PL1", "pilot-light", power="40 W"), 120.0)
    assert fig.sealed_a == approx(1 / 3)


def test_one_figure_stands_for_both():
    # RULES.md "How to compute duty": a load giving only one of inrush and sealed uses it for both.
    fig = ratings.load_figures(device("SOL1", "solenoid", sealed="60 VA"), 120.0)
    assert fig.inrush_a == fig.sealed_a == approx(0.5)
    fig = ratings.load_figures(device("SOL2", "solenoid", inrush="600 VA"), 120.0)
    assert fig.inrush_a == fig.sealed_a == approx(5.0)


def test_load_without_figures_is_passed_by():
    # RULES.md: where a load gives neither, checks that need its current pass it by.
    assert ratings.load_figures(device("CR1", "relay"), 120.0) is None


def test_duty_sums_the_loads_served():
    # RULES.md: the duty of a contact is the sum over the loads it serves.
    figs = [
        ratings.load_figures(device("SOL1", "solenoid", inrush="600 VA", sealed="60 VA"), 120.0),
        ratings.load_figures(device("M2", "contactor", inrush="218 VA", sealed="25 VA"), 120.0),
    ]
    duty = ratings.contact_duty(figs)
    assert duty.make == approx(818 / 120)  # 6.82 A
    assert duty.break_ == duty.continuous == approx(85 / 120)  # 0.708 A


# ---------------------------------------------------------------------------
# Rating limits
# ---------------------------------------------------------------------------


def pilot(designation: str) -> ContactRating:
    return ContactRating("pilot-duty", designation=designation, text=designation)


def test_a600_at_120_v():
    # RULES.md / NEMA ICS 5: A600 at 120 V: 10 A continuous, 7200 VA make (60 A), 720 VA break (6 A).
    [lim], why = ratings.rating_limits(pilot("A600"), 120.0, "AC")
    assert (lim.continuous, lim.make, lim.break_) == (approx(10), approx(60), approx(6))


def test_b300_at_240_v():
    # CHECK-VALUES.md NEMA ICS 5 table: B at 240 V make 15 A, break 1.5 A, continuous 5 A.
    [lim], _ = ratings.rating_limits(pilot("B300"), 240.0, "AC")
    assert (lim.continuous, lim.make, lim.break_) == (approx(5), approx(15), approx(1.5))


def test_pilot_duty_below_120_v_makes_as_at_120_v():
    # CHECK-VALUES.md (from memory, medium confidence): below 120 V AC the make
    # current is as at 120 V (C: 15 A); break = 180 VA / 24 V = 7.5 A, not above
    # the 2.5 A continuous current.
    [lim], _ = ratings.rating_limits(pilot("C150"), 24.0, "AC")
    assert (lim.make, lim.break_) == (approx(15), approx(2.5))


def test_pilot_duty_between_columns_uses_va_over_volts():
    # RULES.md: between columns the VA figures divided by the voltage: A600 at 208 V, 7200/208, 720/208.
    [lim], _ = ratings.rating_limits(pilot("A600"), 208.0, "AC")
    assert (lim.make, lim.break_) == (approx(7200 / 208), approx(720 / 208))


def test_pilot_duty_dc_low_voltage():
    # CHECK-VALUES.md worked: N at 24 VDC 10 A (275 VA / 24 V capped at 10 A
    # continuous); at 125 V the column's 2.2 A (from memory).
    [lim], _ = ratings.rating_limits(pilot("N300"), 24.0, "DC")
    assert (lim.continuous, lim.make, lim.break_) == (approx(10), approx(10), approx(10))
    [lim], _ = ratings.rating_limits(pilot("N300"), 125.0, "DC")
    assert (lim.make, lim.break_) == (approx(2.2), approx(2.2))


def test_rating_list_covers_each_kind_by_its_own_designation():
    # FORMAT.md "Additions" / CHECK-VALUES.md: A600 and Q300 on the same block
    # each cover their own kind of supply.
    rating = ContactRating("list", designation="A600", designations=("A600", "Q300"), text="A600, Q300")
    [ac], _ = ratings.rating_limits(rating, 120.0, "AC")
    [dc], _ = ratings.rating_limits(rating, 24.0, "DC")
    assert (ac.make, ac.break_) == (approx(60), approx(6))      # NEMA ICS 5 A at 120 V
    assert (dc.make, dc.continuous) == (approx(2.5), approx(2.5))  # Q: 69 / 24 = 2.9 -> 2.5 A continuous


def test_pilot_duty_not_covering_voltage_or_kind():
    # RULES.md: a rating covers voltages up to its own; AC/DC not covered is a finding.
    limits, why = ratings.rating_limits(pilot("A150"), 240.0, "AC")
    assert limits == [] and "A150" in why
    limits, why = ratings.rating_limits(pilot("B300"), 24.0, "DC")
    assert limits == [] and "B300" in why


def test_ac15_makes_ten_times_ie():
    # IEC 60947-5-1 (from memory): AC-15 makes 10 x Ie, breaks Ie; 3 A at 240 V covers 120 V.
    rating = ContactRating("category", categories=(CategoryRating("AC-15", 3.0, 240.0, "AC"),))
    [lim], _ = ratings.rating_limits(rating, 120.0, "AC")
    assert (lim.make, lim.break_) == (approx(30), approx(3))


def test_dc13_makes_and_breaks_ie_and_picks_the_supply_kind():
    # IEC 60947-5-1 (from memory): DC-13 makes and breaks Ie; on DC only DC ratings count.
    rating = ContactRating(
        "category",
        categories=(CategoryRating("AC-15", 3.0, 240.0, "AC"), CategoryRating("DC-13", 0.22, 125.0, "DC")),
    )
    [lim], _ = ratings.rating_limits(rating, 24.0, "DC")
    assert (lim.make, lim.break_) == (approx(0.22), approx(0.22))
    assert ratings.rating_limits(rating, 250.0, "DC")[0] == []  # 125 V does not cover 250 V


def test_plain_current_is_a_resistive_rating():
    # RULES.md "contact-rating": a plain ampere rating is a resistive rating, make = break = continuous.
    [lim], _ = ratings.rating_limits(ContactRating("thermal", current=10.0, text="10 A"), 480.0, "AC")
    assert (lim.make, lim.break_, lim.continuous) == (10.0, 10.0, 10.0)


# ---------------------------------------------------------------------------
# Motor and heater currents, overload limits
# ---------------------------------------------------------------------------


def test_motor_fla_from_nec_table_430_250():
    # CHECK-VALUES.md NEC Table 430.250: 30 hp 460 V -> 40 A.
    fla, source = ratings.motor_full_load(device("MTR1", "motor", power="30 hp", voltage="460 V", phases=3))
    assert fla == 40.0 and "430.250" in source


def test_motor_fla_from_nec_table_430_248():
    # CHECK-VALUES.md NEC Table 430.248: 2 hp single-phase 230 V -> 12 A.
    fla, source = ratings.motor_full_load(device("MTR1", "motor", power="2 hp", voltage="230 V", phases=1))
    assert fla == 12.0 and "430.248" in source


def test_controller_current_is_the_table_unless_the_nameplate_is_larger():
    # NEC 430.6(A)(1): controllers from the table (30 hp 460 V -> 40 A), the
    # nameplate where larger or where the table has no row.
    fla, _ = ratings.motor_full_load(device("MTR1", "motor", power="30 hp", voltage="460 V", phases=3, fla="36 A"))
    assert fla == 40.0
    fla, source = ratings.motor_full_load(device("MTR1", "motor", power="30 hp", voltage="460 V", phases=3, fla="44 A"))
    assert fla == 44.0 and "nameplate" in source
    fla, _ = ratings.motor_full_load(device("MTR1", "motor", power="15 kW", voltage="400 V", phases=3, fla="29 A"))
    assert fla == 29.0


def test_motor_not_in_table_is_not_guessed():
    # CHECK-VALUES.md: a motor voltage or power not in the table with no nameplate fla is a finding.
    fla, why = ratings.motor_full_load(device("MTR1", "motor", power="15 kW", voltage="400 V", phases=3))
    assert fla is None and "400 V" in why and "430.250" in why and "fla" in why


def test_heater_current_three_phase():
    # CHECK-VALUES.md "Physics": 15 kW at 480 V three-phase -> 18.04 A.
    current, _ = ratings.feed_current(device("HTR1", "heater", power="15 kW", voltage="480 V", phases=3))
    assert current == approx(18.04)


def test_overload_warning_below_full_load_current():
    # RULES.md: overload-setting is an error above, a warning below 100 %.
    # NEC Table 430.250 30 hp 460 V -> 40 A; 38 A is below it.
    text = """ctllint: 1
supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
devices:
  PB1: {kind: pushbutton, function: stop}
  PB2: {kind: pushbutton, function: start}
  M1: {kind: starter, coil: 120 VAC, overload: OL1, feeds: MTR1}
  OL1: {kind: overload, setting: SETTING}
  MTR1: {kind: motor, power: 30 hp, voltage: 460 V, phases: 3, fla: 38 A}
rungs:
  - paths:
      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]
      - [2, M1.NO, 3]
"""
    # Trip = 1.2 x dial (IEC 60947-4-1, from memory); nameplate 38 A.
    # 31 A -> 37.2 A < 38 A: a warning.
    [low] = [d for d in check_text(text.replace("SETTING", "31 A")) if d.rule == "overload-setting"]
    assert low.severity == Severity.WARNING and "38 A" in low.message
    # NEC 430.32(A)(1), no service factor: 115 % of 38 A = 43.7 A (CHECK-VALUES.md
    # worked value); 37 A -> 44.4 A trips above it.
    [high] = [d for d in check_text(text.replace("SETTING", "37 A")) if d.rule == "overload-setting"]
    assert high.severity == Severity.ERROR and "43.7 A" in high.message and "115 %" in high.message
    # 36 A -> 43.2 A: within.
    assert not [d for d in check_text(text.replace("SETTING", "36 A")) if d.rule == "overload-setting"]
    # Without a nameplate: never a silent pass, an info finding at the least.
    [info] = [d for d in check_text(text.replace("SETTING", "34 A").replace(", fla: 38 A", "")) if d.rule == "overload-setting"]
    assert info.severity == Severity.INFO and "not verified" in info.message


# ---------------------------------------------------------------------------
# Control transformers
# ---------------------------------------------------------------------------


def test_transformer_sealed_sum_and_group_inrush():
    # CHECK-VALUES.md sizing practice (common practice): sealed 60 + 10 + 50 =
    # 120 VA; one contact making 600 + 300 VA while 10 VA is held: 910 VA.
    load = ratings.SourceLoad(
        {"M1": [60.0, 600.0, 0.5], "CR1": [10.0, 40.0, 0.08], "SOL1": [50.0, 300.0, 0.42]},
        [["M1", "SOL1"]],
        ["a.ctl.yaml"],
    )
    assert sum(f[0] for f in load.loads.values()) == approx(120)
    inrush, group = ratings.worst_inrush(load)
    assert inrush == approx(910) and sorted(group) == ["M1", "SOL1"]
    # With no group, the largest single inrush plus the others sealed: 600 + 10 + 50.
    alone = ratings.SourceLoad(dict(load.loads), [], ["a.ctl.yaml"])
    assert ratings.worst_inrush(alone)[0] == approx(660)


def test_transformer_primary_under_2_a():
    # CHECK-VALUES.md 430.72(C)(4): 100 VA at 480 V -> Ip 0.208 A -> 1.04 A limit.
    limit, clause = ratings.transformer_fuse_limits(100.0, 480.0, 120.0, True)["primary"]
    assert limit == approx(1.04, rel=5e-3) and "430.72(C)(4)" in clause


def test_transformer_primary_500_percent_stands_alone():
    # CHECK-VALUES.md: 250 VA at 480 V -> Ip 0.521 A -> 2.60 A limit, so 2 A primary fuses pass.
    for secondary_fused in (True, False):
        limit, _ = ratings.transformer_fuse_limits(250.0, 480.0, 120.0, secondary_fused)["primary"]
        assert limit == approx(2.60, rel=5e-3) and 2.0 < limit


def test_transformer_primary_with_secondary_fuse():
    # CHECK-VALUES.md Table 450.3(B): 1.5 kVA at 480 V -> Ip 3.13 A -> 250 % = 7.81 A.
    limit, clause = ratings.transformer_fuse_limits(1500.0, 480.0, 120.0, True)["primary"]
    assert limit == approx(7.81, rel=5e-3) and "450.3(B)" in clause


def test_transformer_primary_only_167_percent():
    # NEC Table 450.3(B) primary only, 2 A <= Ip < 9 A: 167 %; 1.5 kVA at 480 V -> 3.125 x 1.67 = 5.22 A.
    limit, _ = ratings.transformer_fuse_limits(1500.0, 480.0, 120.0, False)["primary"]
    assert limit == approx(5.22, rel=5e-3)


def test_transformer_primary_only_125_percent_rounds_up():
    # NEC Table 450.3(B) primary only, Ip >= 9 A: 125 %, next standard rating (NEC 240.6(A)) allowed.
    # 3 kVA at 240 V -> Ip 12.5 A -> 15.6 A -> 20 A.
    limit, _ = ratings.transformer_fuse_limits(3000.0, 240.0, 120.0, False)["primary"]
    assert limit == 20.0


def test_transformer_secondary_limits():
    # NEC Table 450.3(B) secondary: Is 12.5 A (1.5 kVA / 120 V) -> 125 % = 15.6 A -> 20 A standard;
    # Is 2.08 A (250 VA / 120 V) -> 167 % = 3.48 A.
    assert ratings.transformer_fuse_limits(1500.0, 480.0, 120.0, True)["secondary"][0] == 20.0
    assert ratings.transformer_fuse_limits(250.0, 480.0, 120.0, True)["secondary"][0] == approx(3.48, rel=5e-3)


def test_vacuum_threshold():
    # CHECK-VALUES.md "Facts of the trade" (common practice): above about 400 A, vacuum contactors.
    # NEC Table 430.250: 200 hp 230 V -> 480 A (above), 150 hp 230 V -> 360 A (below).
    big, _ = ratings.feed_current(device("MTR1", "motor", power="200 hp", voltage="230 V", phases=3))
    small, _ = ratings.feed_current(device("MTR2", "motor", power="150 hp", voltage="230 V", phases=3))
    assert big == 480.0 and small == 360.0
    assert big > ratings.VACUUM_THRESHOLD_A > small
    assert math.isclose(ratings.VACUUM_THRESHOLD_A, 400.0)
