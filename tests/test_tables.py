"""Tests of ctllint.circuit.tables against published values.

Every expected number below is transcribed from the project's check values
(/work/shared/CHECK-VALUES.md) or the published source named beside it, not
taken from the code's output. The tables are copied here independently of
ctllint/circuit/tables.py, so a typo in either one fails a test.
"""
from __future__ import annotations

import math

import pytest

from ctllint.circuit import tables
from ctllint.circuit.tables import (
    HP_W,
    NEMA_SIZE_CURRENT,
    STANDARD_RATINGS,
    VACUUM_THRESHOLD_A,
    category_limits,
    coil_voltage_ok,
    heater_current,
    load_current,
    motor_full_load_current,
    next_standard_rating,
    overload_limit,
    pilot_duty,
    pilot_duty_limits,
    primary_fuse_required,
    transformer_primary_limit,
    transformer_secondary_limit,
)


def hp(value: float) -> float:
    """Horsepower to watts, 1 hp = 745.7 W."""
    return value * 745.7


# ---------------------------------------------------------------------------
# NEC (NFPA 70) Table 430.250, three-phase motor full-load current
# ---------------------------------------------------------------------------

# NEC Table 430.250 as printed in CHECK-VALUES.md: hp, 208 V, 230 V, 460 V.
NEC_430_250 = """
1/2     2.4   2.2   1.1
3/4     3.5   3.2   1.6
1       4.6   4.2   2.1
1-1/2   6.6   6.0   3.0
2       7.5   6.8   3.4
3       10.6  9.6   4.8
5       16.7  15.2  7.6
7-1/2   24.2  22    11
10      30.8  28    14
15      46.2  42    21
20      59.4  54    27
25      74.8  68    34
30      88    80    40
40      114   104   52
50      143   130   65
60      169   154   77
75      211   192   96
100     273   248   124
125     343   312   156
150     396   360   180
200     528   480   240
"""

# NEC Table 430.248 as printed in CHECK-VALUES.md: hp 115 V / 230 V.
NEC_430_248 = (
    "1/6 4.4/2.2; 1/4 5.8/2.9; 1/3 7.2/3.6; 1/2 9.8/4.9; 3/4 13.8/6.9; 1 16/8.0; "
    "1-1/2 20/10; 2 24/12; 3 34/17; 5 56/28; 7-1/2 80/40; 10 100/50"
)


def parse_hp(text: str) -> float:
    """'7-1/2' -> 7.5, '1/6' -> 0.1667, '30' -> 30.0."""
    whole, _, fraction = text.rpartition("-") if "-" in text else ("0", "", text)
    if "/" in fraction:
        num, den = fraction.split("/")
        return float(whole) + int(num) / int(den)
    return float(whole) + float(fraction)


THREE_PHASE_ROWS = [line.split() for line in NEC_430_250.strip().splitlines()]
THREE_PHASE_CASES = [
    pytest.param(parse_hp(row[0]), volts, float(amps), id=f"NEC-430.250-{row[0]}hp-{volts:g}V")
    for row in THREE_PHASE_ROWS
    for volts, amps in zip((208.0, 230.0, 460.0), row[1:])
]

SINGLE_PHASE_ROWS = [item.split() for item in NEC_430_248.split("; ")]
SINGLE_PHASE_CASES = [
    pytest.param(parse_hp(size), volts, float(amps), id=f"NEC-430.248-{size}hp-{volts:g}V")
    for size, pair in SINGLE_PHASE_ROWS
    for volts, amps in zip((115.0, 230.0), pair.split("/"))
]


def test_transcription_is_complete():
    # 21 rows x 3 columns in 430.250, 12 sizes x 2 columns in 430.248.
    assert len(THREE_PHASE_CASES) == 63
    assert len(SINGLE_PHASE_CASES) == 24


@pytest.mark.parametrize(("horsepower", "volts", "amps"), THREE_PHASE_CASES)
def test_three_phase_table_row(horsepower, volts, amps):
    assert motor_full_load_current(hp(horsepower), volts, 3) == pytest.approx(amps)


@pytest.mark.parametrize(("horsepower", "volts", "amps"), SINGLE_PHASE_CASES)
def test_single_phase_table_entry(horsepower, volts, amps):
    assert motor_full_load_current(hp(horsepower), volts, 1) == pytest.approx(amps)


@pytest.mark.parametrize(
    ("volts", "amps"),
    [
        # NEC 430.250 headings: 440-480 V motors read the 460 V column,
        # 220-240 V the 230 V column. 30 hp: 80 A at 230 V, 40 A at 460 V.
        (440.0, 40.0),
        (460.0, 40.0),
        (480.0, 40.0),
        (220.0, 80.0),
        (230.0, 80.0),
        (240.0, 80.0),
        (208.0, 88.0),
    ],
)
def test_three_phase_voltage_ranges(volts, amps):
    assert motor_full_load_current(hp(30), volts, 3) == pytest.approx(amps)


@pytest.mark.parametrize(
    ("volts", "amps"),
    [
        # NEC 430.248: 110-120 V the 115 V column, 220-240 V the 230 V
        # column. 1 hp: 16 A at 115 V, 8.0 A at 230 V.
        (110.0, 16.0),
        (120.0, 16.0),
        (220.0, 8.0),
        (240.0, 8.0),
    ],
)
def test_single_phase_voltage_ranges(volts, amps):
    assert motor_full_load_current(hp(1), volts, 1) == pytest.approx(amps)


def test_worked_30hp_460v():
    # CHECK-VALUES.md, NEC 430.250 / 430.32(A)(1): 30 hp 460 V -> 40 A.
    assert motor_full_load_current(30 * HP_W, 460.0, 3) == pytest.approx(40.0)


@pytest.mark.parametrize(
    ("power_w", "volts", "amps"),
    [
        # Metric ratings within 1 % of a table horsepower (hp x 0.7457 kW),
        # NEC 430.250 460 V column: 7.5 kW ~ 10 hp -> 14 A; 37 kW ~ 50 hp -> 65 A;
        # 0.75 kW ~ 1 hp -> 2.1 A; 15 kW ~ 20 hp -> 27 A.
        (7500.0, 460.0, 14.0),
        (37000.0, 460.0, 65.0),
        (750.0, 460.0, 2.1),
        (15000.0, 480.0, 27.0),
    ],
)
def test_kw_motor_matches_table_hp(power_w, volts, amps):
    assert motor_full_load_current(power_w, volts, 3) == pytest.approx(amps)


@pytest.mark.parametrize(
    ("power_w", "volts", "phases"),
    [
        pytest.param(hp(37), 480.0, 3, id="37hp-not-a-table-size"),
        pytest.param(hp(12), 460.0, 3, id="12hp-not-a-table-size"),
        pytest.param(5500.0, 460.0, 3, id="5.5kW-1.7pct-from-7.5hp"),
        pytest.param(hp(250), 460.0, 3, id="250hp-beyond-the-rows-held"),
        pytest.param(hp(10), 400.0, 3, id="400V-no-column"),
        pytest.param(hp(10), 380.0, 3, id="380V-no-column"),
        pytest.param(hp(10), 200.0, 3, id="200V-only-208V-reads-208-column"),
        pytest.param(hp(10), 575.0, 3, id="575V-column-not-held"),
        pytest.param(hp(1), 208.0, 1, id="single-phase-208V-column-not-held"),
        pytest.param(hp(1), 460.0, 1, id="single-phase-460V"),
        pytest.param(hp(15), 230.0, 1, id="single-phase-15hp-not-in-430.248"),
        pytest.param(hp(10), 460.0, 2, id="two-phase"),
        pytest.param(0.0, 460.0, 3, id="zero-power"),
    ],
)
def test_motor_not_in_table_is_none(power_w, volts, phases):
    assert motor_full_load_current(power_w, volts, phases) is None


def test_hp_constant():
    # 1 hp = 550 ft.lbf/s = 745.7 W.
    assert HP_W == pytest.approx(745.7)


# ---------------------------------------------------------------------------
# Physics: resistive loads and coils
# ---------------------------------------------------------------------------


def test_heater_three_phase_worked():
    # CHECK-VALUES.md "Physics": 15 kW at 480 V three-phase -> 18.04 A.
    assert heater_current(15000.0, 480.0, 3) == pytest.approx(18.04, abs=0.005)


def test_heater_single_phase():
    # I = P / V: 1500 W at 120 V -> 12.5 A.
    assert heater_current(1500.0, 120.0, 1) == pytest.approx(12.5)


def test_heater_rejects_other_phase_counts():
    with pytest.raises(ValueError):
        heater_current(1000.0, 240.0, 2)


def test_load_current():
    # Coil current = VA / V (CHECK-VALUES.md "Physics"): 120 VA at 120 V -> 1 A;
    # DC coil W / V: 6 W at 24 V -> 0.25 A.
    assert load_current(120.0, 120.0) == pytest.approx(1.0)
    assert load_current(6.0, 24.0) == pytest.approx(0.25)


# ---------------------------------------------------------------------------
# NEC 430.32(A)(1) overload settings
# ---------------------------------------------------------------------------


def test_overload_worked_125_percent():
    # CHECK-VALUES.md: 30 hp, 460 V, table 40 A: 125 % -> 50 A.
    assert overload_limit(40.0, 1.15, None) == (pytest.approx(50.0), pytest.approx(1.25))


def test_overload_worked_115_percent():
    # CHECK-VALUES.md: 30 hp, 460 V, table 40 A: 115 % -> 46 A.
    assert overload_limit(40.0, 1.0, None) == (pytest.approx(46.0), pytest.approx(1.15))


@pytest.mark.parametrize(
    ("service_factor", "temp_rise", "fraction"),
    [
        # NEC 430.32(A)(1): 125 % for SF >= 1.15 or rise <= 40 C, else 115 %.
        (1.15, None, 1.25),
        (1.25, None, 1.25),
        (None, 40.0, 1.25),
        (None, 39.0, 1.25),
        (1.0, 40.0, 1.25),
        (1.0, 41.0, 1.15),
        (1.1, None, 1.15),
        (None, 50.0, 1.15),
        (None, None, 1.15),
    ],
)
def test_overload_fraction(service_factor, temp_rise, fraction):
    limit, got = overload_limit(10.0, service_factor, temp_rise)
    assert got == pytest.approx(fraction)
    assert limit == pytest.approx(10.0 * fraction)


# ---------------------------------------------------------------------------
# NEMA ICS 5 pilot duty
# ---------------------------------------------------------------------------

# CHECK-VALUES.md "Contact ratings", NEMA ICS 5 AC: letter -> (continuous,
# {volts: (make, break)}, (make VA, break VA)).
NEMA_AC = {
    "A": (10, {120: (60, 6), 240: (30, 3), 480: (15, 1.5)}, (7200, 720)),
    "B": (5, {120: (30, 3), 240: (15, 1.5), 480: (7.5, 0.75)}, (3600, 360)),
    "C": (2.5, {120: (15, 1.5), 240: (7.5, 0.75), 480: (3.75, 0.375)}, (1800, 180)),
    "D": (1.0, {120: (3.6, 0.6), 240: (1.8, 0.3)}, (432, 72)),
    "E": (0.5, {120: (1.8, 0.3)}, (216, 36)),
}
# The 240 V figures apply to 300 and 600 designations only, the 480 V figures
# to 600 designations only (CHECK-VALUES.md).
AC_DESIGNATIONS = ["A600", "A300", "A150", "B600", "B300", "B150", "C600", "C300",
                   "C150", "D300", "D150", "E150"]

AC_COLUMN_CASES = [
    pytest.param(d, volts, NEMA_AC[d[0]][0], mk, bk, id=f"NEMA-ICS5-{d}-{volts}V")
    for d in AC_DESIGNATIONS
    for volts, (mk, bk) in NEMA_AC[d[0]][1].items()
    if volts <= int(d[1:])
]


@pytest.mark.parametrize(("designation", "volts", "continuous", "make", "brk"), AC_COLUMN_CASES)
def test_pilot_duty_ac_columns(designation, volts, continuous, make, brk):
    limits = pilot_duty_limits(designation, float(volts), "AC")
    assert limits is not None
    assert limits.continuous == pytest.approx(continuous)
    assert limits.make == pytest.approx(make)
    assert limits.break_ == pytest.approx(brk)


def test_a600_at_120v():
    # RULES.md / CHECK-VALUES.md: A600 at 120 V: 10 A continuous, 60 A make
    # (7200 VA), 6 A break (720 VA).
    limits = pilot_duty_limits("A600", 120.0, "AC")
    assert (limits.continuous, limits.make, limits.break_) == (
        pytest.approx(10.0), pytest.approx(60.0), pytest.approx(6.0))


def test_a600_at_480v():
    # NEMA ICS 5 A600 at 480 V: make 15 A, break 1.5 A.
    limits = pilot_duty_limits("A600", 480.0, "AC")
    assert (limits.make, limits.break_) == (pytest.approx(15.0), pytest.approx(1.5))


def test_a600_between_columns_uses_va():
    # RULES.md "Rating meanings": between columns the VA figures divided by
    # the voltage. A600 at 208 V: 7200/208 make, 720/208 break.
    limits = pilot_duty_limits("A600", 208.0, "AC")
    assert limits.make == pytest.approx(7200 / 208)
    assert limits.break_ == pytest.approx(720 / 208)
    assert limits.continuous == pytest.approx(10.0)


def test_b600_between_240_and_480():
    # B600 at 277 V: 3600/277 make, 360/277 break (VA / V between columns).
    limits = pilot_duty_limits("B600", 277.0, "AC")
    assert limits.make == pytest.approx(3600 / 277)
    assert limits.break_ == pytest.approx(360 / 277)


def test_a150_at_its_top_voltage():
    # A150 covers up to 150 V; 150 V lies between the 120 V and 240 V columns.
    limits = pilot_duty_limits("A150", 150.0, "AC")
    assert limits.make == pytest.approx(7200 / 150)
    assert limits.break_ == pytest.approx(720 / 150)


def test_c150_at_24vac_makes_as_at_120v_and_breaks_va_over_v_up_to_continuous():
    # CHECK-VALUES.md (makers' restatement of UL 508 / ICS 5, from memory):
    # below 120 V AC the make current is as at 120 V (C: 15 A) and the break
    # current is break VA / V (180 / 24 = 7.5 A) but not above the 2.5 A
    # continuous current.
    limits = pilot_duty_limits("C150", 24.0, "AC")
    assert (limits.continuous, limits.make, limits.break_) == (
        pytest.approx(2.5), pytest.approx(15.0), pytest.approx(2.5))


def test_b300_at_24vac_breaks_5a_not_3a():
    # CHECK-VALUES.md worked example: B300 at 24 VAC breaks 5 A, not 3 A.
    assert pilot_duty_limits("B300", 24.0, "AC").break_ == pytest.approx(5.0)


def test_a600_at_48vac_break_is_va_over_v():
    # 720 VA / 48 V = 15 A, capped at A's 10 A continuous; make 60 A as at 120 V.
    limits = pilot_duty_limits("A600", 48.0, "AC")
    assert (limits.make, limits.break_) == (pytest.approx(60.0), pytest.approx(10.0))


def test_d300_at_100vac_break_below_continuous():
    # D: 72 VA / 100 V = 0.72 A, below its 1.0 A continuous: not capped.
    assert pilot_duty_limits("D300", 100.0, "AC").break_ == pytest.approx(0.72)


@pytest.mark.parametrize(
    ("designation", "volts", "kind"),
    [
        pytest.param("B300", 480.0, "AC", id="B300-above-300V"),
        pytest.param("A150", 240.0, "AC", id="A150-above-150V"),
        pytest.param("A300", 301.0, "AC", id="A300-above-300V"),
        pytest.param("D300", 480.0, "AC", id="D300-above-300V"),
        pytest.param("E150", 240.0, "AC", id="E150-above-150V"),
        pytest.param("A600", 24.0, "DC", id="AC-designation-on-DC"),
        pytest.param("N600", 120.0, "AC", id="DC-designation-on-AC"),
        pytest.param("N150", 250.0, "DC", id="N150-above-150V"),
        pytest.param("R300", 480.0, "DC", id="R300-above-300V"),
        pytest.param("Z600", 120.0, "AC", id="unknown-designation"),
    ],
)
def test_pilot_duty_not_covered(designation, volts, kind):
    assert pilot_duty_limits(designation, volts, kind) is None


# CHECK-VALUES.md NEMA ICS 5 DC: letter -> (continuous, make = break at
# 125 V / 250 V / 301-600 V, VA). Continuous and N, P VA from a published
# summary; the rest from memory.
NEMA_DC = {
    "N": (10, (2.2, 1.1, 0.4), 275),
    "P": (5, (1.1, 0.55, 0.2), 138),
    "Q": (2.5, (0.55, 0.27, 0.1), 69),
    "R": (1.0, (0.22, 0.11, None), 28),
}


def test_n600_at_24vdc():
    # CHECK-VALUES.md: DC up to 250 V make = break = VA / V, not above the
    # continuous current: N at 24 VDC 275 / 24 = 11.5 A -> 10 A.
    limits = pilot_duty_limits("N600", 24.0, "DC")
    assert (limits.continuous, limits.make, limits.break_) == (
        pytest.approx(10.0), pytest.approx(10.0), pytest.approx(10.0))


def test_r300_at_24vdc():
    # CHECK-VALUES.md worked: R at 24 VDC: 28 / 24 = 1.17 A -> 1.0 A continuous.
    assert pilot_duty_limits("R300", 24.0, "DC").make == pytest.approx(1.0)


@pytest.mark.parametrize("letter", sorted(NEMA_DC))
@pytest.mark.parametrize(("volts", "column"), [(125.0, 0), (250.0, 1), (301.0, 2), (600.0, 2)])
def test_pilot_duty_dc_columns(letter, volts, column):
    # At the column voltages and above 300 V, the published columns (same
    # transcription as ctllint.circuit.tables: both from CHECK-VALUES.md; second
    # reading: the 125 V and 250 V columns agree with VA / V to the figures'
    # rounding, checked in test_dc_columns_agree_with_va_over_v).
    continuous, columns, _va = NEMA_DC[letter]
    expected = columns[column]
    designation = f"{letter}600" if letter != "R" else f"{letter}300"
    limits = pilot_duty_limits(designation, volts, "DC")
    if expected is None or volts > int(designation[1:]):
        assert limits is None
        return
    assert limits.continuous == pytest.approx(continuous)
    assert limits.make == pytest.approx(expected)
    assert limits.break_ == pytest.approx(expected)


@pytest.mark.parametrize("letter", sorted(NEMA_DC))
def test_dc_columns_agree_with_va_over_v(letter):
    # An independent reading of the same table: the 125 V and 250 V columns
    # are the VA figure over the voltage, rounded to two figures.
    _, columns, va = NEMA_DC[letter]
    for volts, amps in zip((125.0, 250.0), columns[:2]):
        assert amps == pytest.approx(va / volts, rel=0.03)


@pytest.mark.parametrize("letter", sorted(NEMA_DC))
@pytest.mark.parametrize("volts", [24.0, 48.0, 126.0, 200.0, 280.0])
def test_pilot_duty_dc_between_columns_is_va_over_v_up_to_continuous(letter, volts):
    continuous, _, va = NEMA_DC[letter]
    limits = pilot_duty_limits(f"{letter}300", volts, "DC")
    assert limits.make == limits.break_ == pytest.approx(min(va / volts, continuous))


def test_pilot_duty_record():
    # FORMAT.md "Ratings" / CHECK-VALUES.md: A600 is AC, up to 600 V, 10 A,
    # 7200 VA make, 720 VA break; N300 DC, 300 V, 10 A, 275 VA.
    a600 = pilot_duty("A600")
    assert (a600.designation, a600.current_kind, a600.max_volts) == ("A600", "AC", 600)
    assert (a600.continuous, a600.make_va, a600.break_va) == (10, 7200, 720)
    n300 = pilot_duty("N300")
    assert (n300.current_kind, n300.max_volts, n300.continuous) == ("DC", 300, 10)
    assert n300.make_va == n300.break_va == 275
    assert pilot_duty("a600") == a600
    assert pilot_duty("X999") is None


def test_every_format_designation_is_known():
    # FORMAT.md "Ratings" lists these designations.
    listed = ("A600 A300 A150 B600 B300 B150 C600 C300 C150 D300 D150 E150 "
              "N600 N300 N150 P600 P300 P150 Q600 Q300 Q150 R300 R150").split()
    for designation in listed:
        duty = pilot_duty(designation)
        assert duty is not None, designation
        assert duty.max_volts == int(designation[1:])
        assert duty.current_kind == ("AC" if designation[0] in "ABCDE" else "DC")
        letter_table = NEMA_AC if duty.current_kind == "AC" else NEMA_DC
        assert duty.continuous == pytest.approx(letter_table[designation[0]][0])


def test_pilot_duty_is_frozen():
    with pytest.raises(Exception):
        pilot_duty("A600").continuous = 99.0  # type: ignore[misc]


# ---------------------------------------------------------------------------
# IEC 60947-5-1 utilisation categories (from memory)
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("category", "ie", "make", "brk"),
    [
        # IEC 60947-5-1 (from memory): AC-15 makes 10 x Ie, breaks Ie.
        pytest.param("AC-15", 3.0, 30.0, 3.0, id="IEC60947-5-1-AC-15"),
        # DC-13 makes and breaks Ie.
        pytest.param("DC-13", 0.22, 0.22, 0.22, id="IEC60947-5-1-DC-13"),
        # IEC 60947-5-1 (from memory): AC-14 makes 6 x Ie, DC-14 makes 10 x Ie.
        pytest.param("AC-14", 1.0, 6.0, 1.0, id="IEC60947-5-1-AC-14"),
        pytest.param("DC-14", 0.5, 5.0, 0.5, id="IEC60947-5-1-DC-14"),
        # RULES.md: other categories make = break = Ie.
        pytest.param("AC-12", 6.0, 6.0, 6.0, id="AC-12"),
        pytest.param("DC-12", 2.0, 2.0, 2.0, id="DC-12"),
    ],
)
def test_category_limits(category, ie, make, brk):
    got_make, got_break = category_limits(category, ie)
    assert got_make == pytest.approx(make)
    assert got_break == pytest.approx(brk)


# ---------------------------------------------------------------------------
# NEMA ICS 2 sizes, NEC 240.6(A) standard ratings
# ---------------------------------------------------------------------------


def test_nema_sizes():
    # RULES.md "Rating meanings", NEMA ICS 2 (from memory).
    assert {k: v for k, v in NEMA_SIZE_CURRENT.items() if k not in ("7", "8", "9")} == {
        "00": 9, "0": 18, "1": 27, "2": 45, "3": 90, "4": 135, "5": 270, "6": 540}
    # Sizes 7-9, NEMA ICS 2 (from memory): 810, 1215, 2250 A.
    assert (NEMA_SIZE_CURRENT["7"], NEMA_SIZE_CURRENT["8"], NEMA_SIZE_CURRENT["9"]) == (810, 1215, 2250)
    assert tables.nema_size_current(0) == 18
    assert tables.nema_size_current("00") == 9
    assert tables.nema_size_current(10) is None


def test_standard_ratings():
    # NEC 240.6(A): fuses and inverse-time breakers, plus fuse-only 1, 3, 6,
    # 10 and 601 A (from memory).
    expected = [1, 3, 6, 10, 15, 20, 25, 30, 35, 40, 45, 50, 60, 70, 80, 90, 100, 110,
                125, 150, 175, 200, 225, 250, 300, 350, 400, 450, 500, 600, 601, 700,
                800, 1000, 1200, 1600, 2000, 2500, 3000, 4000, 5000, 6000]
    assert sorted(STANDARD_RATINGS) == expected


@pytest.mark.parametrize(
    ("amps", "rating"),
    [(0.5, 1), (2.0, 3), (10.0, 10), (11.25, 15), (15.6, 20), (110.1, 125),
     (600.5, 601), (650.0, 700), (6000.0, 6000)],
)
def test_next_standard_rating(amps, rating):
    # NEC 240.6(A).
    assert next_standard_rating(amps) == rating


# ---------------------------------------------------------------------------
# Control transformers: NEC 430.72(C), Table 450.3(B)
# ---------------------------------------------------------------------------


def test_primary_100va_480v():
    # CHECK-VALUES.md, NEC 430.72(C)(4): 100 VA at 480 V -> Ip 0.208 A ->
    # 1.04 A limit.
    limit, clause = transformer_primary_limit(100.0, 480.0, secondary_fused=True)
    assert limit == pytest.approx(1.04, abs=0.005)
    assert "430.72(C)(4)" in clause
    assert "500 %" in clause
    assert "0.208 A" in clause


def test_primary_250va_480v_stands_alone():
    # CHECK-VALUES.md, NEC 430.72(C)(4) stands on its own: 250 VA at 480 V ->
    # Ip 0.521 A -> 2.60 A limit, so 2 A primary fuses pass, with or
    # without a secondary fuse.
    for secondary_fused in (True, False):
        limit, clause = transformer_primary_limit(250.0, 480.0, secondary_fused)
        assert limit == pytest.approx(2.60, abs=0.005)
        assert 2.0 <= limit
        assert "430.72(C)(4)" in clause


def test_primary_1500va_480v_with_secondary_fuse():
    # CHECK-VALUES.md, NEC Table 450.3(B): 1.5 kVA at 480 V -> Ip 3.13 A ->
    # 250 % = 7.81 A.
    limit, clause = transformer_primary_limit(1500.0, 480.0, secondary_fused=True)
    assert limit == pytest.approx(7.81, abs=0.005)
    assert "450.3(B)" in clause
    assert "250 %" in clause
    assert "3.13 A" in clause


def test_primary_1500va_480v_without_secondary_fuse():
    # NEC Table 450.3(B) primary only, 2 A <= Ip < 9 A: 167 % of 3.125 A =
    # 5.22 A, not rounded up to a standard rating.
    limit, clause = transformer_primary_limit(1500.0, 480.0, secondary_fused=False)
    assert limit == pytest.approx(1.67 * 1500 / 480)
    assert "167 %" in clause


def test_primary_large_without_secondary_fuse_rounds_up():
    # NEC Table 450.3(B) primary only, Ip >= 9 A: 125 %, next standard
    # rating allowed (NEC 240.6(A)). 5 kVA at 480 V -> Ip 10.4 A -> 13.0 A
    # -> 15 A.
    limit, clause = transformer_primary_limit(5000.0, 480.0, secondary_fused=False)
    assert limit == 15.0
    assert "125 %" in clause


def test_primary_large_with_secondary_fuse_does_not_round():
    # NEC Table 450.3(B) primary and secondary: 250 %, not rounded.
    # 5 kVA at 480 V -> 2.5 x 10.42 A = 26.04 A.
    limit, _ = transformer_primary_limit(5000.0, 480.0, secondary_fused=True)
    assert limit == pytest.approx(2.5 * 5000 / 480)


def test_secondary_small():
    # NEC Table 450.3(B), secondary < 9 A: 167 %. 100 VA at 120 V -> Is
    # 0.833 A -> 1.39 A.
    limit, clause = transformer_secondary_limit(100.0, 120.0)
    assert limit == pytest.approx(1.39, abs=0.005)
    assert "167 %" in clause


def test_secondary_large_rounds_up():
    # NEC Table 450.3(B), secondary >= 9 A: 125 %, next standard rating
    # allowed. 1.5 kVA at 120 V -> Is 12.5 A -> 15.6 A -> 20 A.
    limit, clause = transformer_secondary_limit(1500.0, 120.0)
    assert limit == 20.0
    assert "125 %" in clause


def test_secondary_at_standard_rating_stays():
    # 125 % landing on a standard rating: 1.44 kVA at 120 V -> Is 12 A ->
    # 15 A exactly.
    limit, _ = transformer_secondary_limit(1440.0, 120.0)
    assert limit == pytest.approx(15.0)


@pytest.mark.parametrize(("va", "class2", "integral", "required"), [
    (25.0, False, False, True),    # 430.72(C)(3) needs BOTH under 50 VA and integral: unmarked needs it
    (49.9, False, True, False),    # under 50 VA, integral to the controller: may go without
    (50.0, False, True, True),     # 50 VA is not under 50 VA
    (100.0, True, False, False),   # 430.72(C)(1): Class 2 needs nothing beyond its listing
    (100.0, False, False, True),
])
def test_primary_fuse_required(va, class2, integral, required):
    # NEC 430.72(C)(1) and (C)(3), as CHECK-VALUES.md reads them.
    assert primary_fuse_required(va, class2, integral) is required


# ---------------------------------------------------------------------------
# Coils, contactors
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("supply", "rated", "ok"),
    [
        # IEC 60947-4-1 (from memory): coils operate at 85 %-110 % of rated.
        (120.0, 120.0, True),
        (102.0, 120.0, True),
        (132.0, 120.0, True),
        (101.9, 120.0, False),
        (132.1, 120.0, False),
        (20.4, 24.0, True),
        (26.4, 24.0, True),
        (24.0, 120.0, False),
        (240.0, 120.0, False),
    ],
)
def test_coil_voltage_ok(supply, rated, ok):
    assert coil_voltage_ok(supply, rated) is ok


def test_vacuum_threshold():
    # CHECK-VALUES.md, common practice: above about 400 A, vacuum contactors.
    assert VACUUM_THRESHOLD_A == 400.0


# ---------------------------------------------------------------------------
# The source rule: every table names its source beside it
# ---------------------------------------------------------------------------


def test_sources_named_in_module():
    source = open(tables.__file__, encoding="utf-8").read()
    for citation in ("Table 430.250", "Table 430.248", "430.32(A)(1)", "NEMA ICS 5",
                     "IEC 60947-5-1", "NEMA ICS 2", "240.6(A)", "430.72(C)",
                     "450.3(B)", "IEC 60947-4-1", "common practice"):
        assert citation in source, citation
    assert source.count("from memory") >= 5
    assert not math.isnan(HP_W)


# ---------------------------------------------------------------------------
# NEMA ICS 2 sizes by horsepower at the motor's voltage
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(("size", "volts", "hp"), [
    # CHECK-VALUES.md, NEMA ICS 2 table (from memory, second reader checked):
    ("1", 460.0, 10.0), ("2", 460.0, 25.0), ("2", 230.0, 15.0), ("3", 208.0, 25.0),
    ("00", 575.0, 2.0), ("6", 460.0, 400.0), ("9", 230.0, 800.0),
])
def test_nema_size_horsepower(size, volts, hp):
    assert tables.nema_size_horsepower(size, volts)[0] == hp


def test_nema_worked_examples():
    # CHECK-VALUES.md worked: 20 hp at 460 V needs size 2; 15 hp at 460 V on
    # size 1 (10 hp) is undersized although 21 A < 27 A.
    assert tables.nema_size_horsepower("1", 460.0)[0] < 15 < tables.nema_size_horsepower("2", 460.0)[0]
    assert 20 <= tables.nema_size_horsepower("2", 460.0)[0]
    assert tables.motor_full_load_current(15 * tables.HP_W, 460.0, 3) < tables.nema_size_current("1")


@pytest.mark.parametrize(("size", "volts", "index"), [
    (size, 230.0, 1) for size in ("0", "1", "2", "3", "4", "5", "6")
] + [
    (size, 460.0, 2) for size in ("0", "1", "2", "3", "4", "5")  # size 6 at 460 V is 400 hp: beyond the held table
])
def test_nema_sizes_agree_with_nec_currents(size, volts, index):
    # A second, independent reading: the NEC Table 430.250 current of a
    # size's largest motor stays within the size's continuous current (two
    # tables from two documents that must agree).
    hp = tables.NEMA_SIZE_HP[size][index]
    flc = tables.motor_full_load_current(hp * tables.HP_W, volts, 3)
    assert flc is not None and flc <= tables.nema_size_current(size)


def test_nema_voltage_outside_the_columns_is_not_read():
    # NEMA ICS 2 columns are 200, 230 and 460-575 V: 400 V reads none.
    assert tables.nema_size_horsepower("2", 400.0) == (None, "")
    assert tables.nema_size_horsepower("7", 200.0)[0] is None


def test_controller_current_is_the_larger_of_table_and_nameplate():
    # NEC 430.6(A)(1): table value, or the nameplate where larger or where no row.
    assert tables.controller_full_load_current(40.0, 38.0) == 40.0
    assert tables.controller_full_load_current(40.0, 44.0) == 44.0
    assert tables.controller_full_load_current(None, 44.0) == 44.0


def test_ultimate_trip_is_1_2_times_the_dial():
    # IEC 60947-4-1 (from memory) trips at 1.20 x setting; CHECK-VALUES.md:
    # a dial at 125 % of FLA trips near 150 %.
    assert tables.ultimate_trip_current(1.25) == pytest.approx(1.5)
    assert tables.ultimate_trip_current(10.0, 1.05) == pytest.approx(10.5)


def test_starting_allowance_fractions():
    # NEC 430.32(C): 140 % (SF >= 1.15) and 130 % (others); worked 38 A.
    assert overload_limit(38.0, 1.15, None, True)[0] == pytest.approx(53.2)
    assert overload_limit(38.0, 1.0, None, True)[0] == pytest.approx(49.4)
