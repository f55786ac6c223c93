"""Published tables and the computations over them.

Pure functions over numbers in SI base units (volts, amperes, volt-amperes,
watts, seconds); parsing and printing units happens elsewhere. Every table
names its source beside it. Where a value was written down from memory
rather than from a document at hand, the comment says "from memory"; a fact
of the trade that no document states says "common practice".

Lookups that fall outside a table return None: the caller reports that as a
finding. Nothing here guesses or interpolates a table value.
"""
from __future__ import annotations

import functools
import math
from dataclasses import dataclass
from decimal import ROUND_HALF_UP, Decimal
from fractions import Fraction

__all__ = [
    "HP_W",
    "VACUUM_THRESHOLD_A",
    "THREE_PHASE_FLC",
    "SINGLE_PHASE_FLC",
    "NEMA_SIZE_CURRENT",
    "NEMA_SIZE_HP",
    "DEFAULT_TRIP_MULTIPLE",
    "STANDARD_RATINGS",
    "STANDARD_FUSE_ONLY_RATINGS",
    "PILOT_DUTY",
    "PilotDuty",
    "PilotLimits",
    "motor_full_load_current",
    "heater_current",
    "load_current",
    "overload_limit",
    "pilot_duty",
    "pilot_duty_limits",
    "category_limits",
    "voltage_covered",
    "nema_size_current",
    "nema_size_horsepower",
    "controller_full_load_current",
    "ultimate_trip_current",
    "next_standard_rating",
    "primary_fuse_required",
    "transformer_primary_limit",
    "transformer_secondary_limit",
    "coil_voltage_ok",
]

# One mechanical horsepower in watts (550 ft*lbf/s), the conversion NEC
# motor tables are read with.
HP_W = 745.7

# Relative tolerance for comparing voltages and limits that arrive as floats.
_EPS = 1e-9

# A motor's power matches a table horsepower when within 1 %: this accepts
# exact hp ratings and metric kW ratings equal to hp * 0.7457 within 1 %
# (7.5 kW for 10 hp). No two table rows are within 1 % of each other, so a
# match is never ambiguous.
_HP_MATCH_TOLERANCE = 0.01


def _close(a: float, b: float) -> bool:
    return math.isclose(a, b, rel_tol=_EPS, abs_tol=_EPS)


def _at_most(a: float, b: float) -> bool:
    """a <= b, forgiving float error."""
    return a <= b or _close(a, b)


def _positive(*values: float) -> bool:
    return all(v is not None and v > 0 and math.isfinite(v) for v in values)


# ---------------------------------------------------------------------------
# Motor full-load current
# ---------------------------------------------------------------------------

# NEC (NFPA 70) Table 430.250, full-load current of three-phase AC motors,
# amperes: hp -> (208 V, 230 V, 460 V). Transcribed from the project's
# CHECK-VALUES.md. The table's other columns (115, 200, 575, 2300 V) are not
# held here, so those voltages return None rather than a guess.
THREE_PHASE_FLC: dict[Fraction, tuple[float, float, float]] = {
    Fraction(1, 2): (2.4, 2.2, 1.1),
    Fraction(3, 4): (3.5, 3.2, 1.6),
    Fraction(1): (4.6, 4.2, 2.1),
    Fraction(3, 2): (6.6, 6.0, 3.0),
    Fraction(2): (7.5, 6.8, 3.4),
    Fraction(3): (10.6, 9.6, 4.8),
    Fraction(5): (16.7, 15.2, 7.6),
    Fraction(15, 2): (24.2, 22.0, 11.0),
    Fraction(10): (30.8, 28.0, 14.0),
    Fraction(15): (46.2, 42.0, 21.0),
    Fraction(20): (59.4, 54.0, 27.0),
    Fraction(25): (74.8, 68.0, 34.0),
    Fraction(30): (88.0, 80.0, 40.0),
    Fraction(40): (114.0, 104.0, 52.0),
    Fraction(50): (143.0, 130.0, 65.0),
    Fraction(60): (169.0, 154.0, 77.0),
    Fraction(75): (211.0, 192.0, 96.0),
    Fraction(100): (273.0, 248.0, 124.0),
    Fraction(125): (343.0, 312.0, 156.0),
    Fraction(150): (396.0, 360.0, 180.0),
    Fraction(200): (528.0, 480.0, 240.0),
}

# NEC (NFPA 70) Table 430.248, full-load current of single-phase AC motors,
# amperes: hp -> (115 V, 230 V). Transcribed from CHECK-VALUES.md; the 200 V
# and 208 V columns are not held here.
SINGLE_PHASE_FLC: dict[Fraction, tuple[float, float]] = {
    Fraction(1, 6): (4.4, 2.2),
    Fraction(1, 4): (5.8, 2.9),
    Fraction(1, 3): (7.2, 3.6),
    Fraction(1, 2): (9.8, 4.9),
    Fraction(3, 4): (13.8, 6.9),
    Fraction(1): (16.0, 8.0),
    Fraction(3, 2): (20.0, 10.0),
    Fraction(2): (24.0, 12.0),
    Fraction(3): (34.0, 17.0),
    Fraction(5): (56.0, 28.0),
    Fraction(15, 2): (80.0, 40.0),
    Fraction(10): (100.0, 50.0),
}

# Which column of each table a nameplate voltage reads, as inclusive ranges:
# (low V, high V, column index). NEC 430.250 and 430.248 headings: motors
# rated 440-480 V use the 460 V column, 220-240 V the 230 V column,
# 110-120 V the 115 V column; 208 V reads only its own column.
_THREE_PHASE_COLUMNS = ((208.0, 208.0, 0), (220.0, 240.0, 1), (440.0, 480.0, 2))
_SINGLE_PHASE_COLUMNS = ((110.0, 120.0, 0), (220.0, 240.0, 1))


def _column(volts: float, columns: tuple[tuple[float, float, int], ...]) -> int | None:
    for low, high, index in columns:
        if _at_most(low, volts) and _at_most(volts, high):
            return index
    return None


def _table_hp(power_w: float, table_hps) -> Fraction | None:
    hp = power_w / HP_W
    best: Fraction | None = None
    best_error = _HP_MATCH_TOLERANCE
    for table_hp in table_hps:
        error = abs(hp - float(table_hp)) / float(table_hp)
        if error <= best_error + _EPS:
            best, best_error = table_hp, error
    return best


@functools.lru_cache(maxsize=4096)  # a panel repeats the same few motor sizes
def motor_full_load_current(power_w: float, volts: float, phases: int) -> float | None:
    """Full-load current of a motor from NEC Table 430.250 or 430.248.

    Three-phase motors read Table 430.250, single-phase motors Table 430.248.
    ``power_w`` is the motor's rated output in watts; it matches a table row
    when ``power_w / HP_W`` is within 1 % of the row's horsepower. Returns
    None when the voltage, the power or the number of phases is not in the
    table (never interpolated).
    """
    if not _positive(power_w, volts):
        return None
    if phases == 3:
        table, columns = THREE_PHASE_FLC, _THREE_PHASE_COLUMNS
    elif phases == 1:
        table, columns = SINGLE_PHASE_FLC, _SINGLE_PHASE_COLUMNS
    else:
        return None
    index = _column(volts, columns)
    if index is None:
        return None
    hp = _table_hp(power_w, table)
    if hp is None:
        return None
    return table[hp][index]


def heater_current(power_w: float, volts: float, phases: int) -> float:
    """Line current of a resistive load: P / V single-phase, P / (sqrt(3) V)
    three-phase balanced, with V the line-to-line voltage (physics)."""
    if not _positive(volts):
        raise ValueError(f"voltage must be positive, not {volts!r}")
    if phases == 1:
        return power_w / volts
    if phases == 3:
        return power_w / (math.sqrt(3) * volts)
    raise ValueError(f"phases must be 1 or 3, not {phases!r}")


def load_current(va_or_w: float, volts: float) -> float:
    """Current of a single-phase load or coil: VA / V, or W / V for a
    resistive load or DC coil (physics)."""
    if not _positive(volts):
        raise ValueError(f"voltage must be positive, not {volts!r}")
    return va_or_w / volts


# ---------------------------------------------------------------------------
# Motor overload
# ---------------------------------------------------------------------------

# NEC (NFPA 70) 430.32(A)(1): overload not above 125 % of nameplate
# full-load current for a marked service factor of 1.15 or more or a marked
# temperature rise of 40 C or less; 115 % for all other motors.
OVERLOAD_FRACTION_HIGH = 1.25
OVERLOAD_FRACTION_LOW = 1.15
# NEC 430.32(C): where the 430.32(A)(1) setting will not start the motor or
# carry its load, the next higher size or setting is allowed up to 140 %
# (service factor >= 1.15 or rise <= 40 C) or 130 % (all others).
STARTING_FRACTION_HIGH = 1.40
STARTING_FRACTION_LOW = 1.30
_SERVICE_FACTOR_HIGH = 1.15
_TEMP_RISE_LOW_C = 40.0

# The limit is on the trip current, not the dial. IEC 60947-4-1 (from
# memory): a thermal or electronic overload relay must not trip at 1.05 x
# its current setting and must trip at 1.20 x within its class time, so the
# ultimate trip current is taken as 1.20 x the setting unless the relay says
# otherwise (``trip_multiple``).
DEFAULT_TRIP_MULTIPLE = 1.20


def overload_limit(
    fla: float, service_factor: float | None, temp_rise_c: float | None, starting_allowance: bool = False
) -> tuple[float, float]:
    """The highest overload trip current NEC 430.32 allows.

    Returns (limit in amperes, fraction of full-load current): 1.25 where the
    service factor is 1.15 or more or the temperature rise is 40 C or less,
    else 1.15 (an unmarked motor takes 115 %), 430.32(A)(1); with the
    starting allowance of 430.32(C), 1.40 and 1.30.
    """
    high = (service_factor is not None and _at_most(_SERVICE_FACTOR_HIGH, service_factor)) or (
        temp_rise_c is not None and _at_most(temp_rise_c, _TEMP_RISE_LOW_C)
    )
    if starting_allowance:
        fraction = STARTING_FRACTION_HIGH if high else STARTING_FRACTION_LOW
    else:
        fraction = OVERLOAD_FRACTION_HIGH if high else OVERLOAD_FRACTION_LOW
    return fla * fraction, fraction


def ultimate_trip_current(setting: float, trip_multiple: float | None = None) -> float:
    """The current an overload relay set at ``setting`` trips at in the end:
    setting x trip multiple (default 1.20, IEC 60947-4-1)."""
    return setting * (DEFAULT_TRIP_MULTIPLE if trip_multiple is None else trip_multiple)


# ---------------------------------------------------------------------------
# NEMA ICS 5 pilot-duty contact ratings
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class PilotDuty:
    """One NEMA ICS 5 pilot-duty designation.

    ``columns`` holds (volts, make A, break A) for each voltage column that
    applies to this designation, lowest first. For DC, make equals break, and
    a designation also holds the letter's column just above its own number
    where its number falls between columns (N150 at 150 V reads the 250 V
    column), since DC reads the column at or above the supply voltage.
    """

    designation: str
    current_kind: str  # "AC" or "DC"
    max_volts: float  # 150, 300 or 600
    continuous: float  # A
    make_va: float
    break_va: float
    columns: tuple[tuple[float, float, float], ...]


@dataclass(frozen=True)
class PilotLimits:
    """What a contact may do at one supply voltage, amperes.

    ``break_`` carries a trailing underscore because ``break`` is a Python
    keyword.
    """

    continuous: float
    make: float
    break_: float


# NEMA ICS 5 (Table 1-1, AC pilot duty), from CHECK-VALUES.md: letter ->
# (continuous A, {column V: (make A, break A)}, make VA, break VA). The 240 V
# figures apply to 300 and 600 designations only, the 480 V figures to 600
# designations only.
_AC_LETTERS: dict[str, tuple[float, dict[float, tuple[float, float]], float, float]] = {
    "A": (10.0, {120.0: (60.0, 6.0), 240.0: (30.0, 3.0), 480.0: (15.0, 1.5)}, 7200.0, 720.0),
    "B": (5.0, {120.0: (30.0, 3.0), 240.0: (15.0, 1.5), 480.0: (7.5, 0.75)}, 3600.0, 360.0),
    "C": (2.5, {120.0: (15.0, 1.5), 240.0: (7.5, 0.75), 480.0: (3.75, 0.375)}, 1800.0, 180.0),
    "D": (1.0, {120.0: (3.6, 0.6), 240.0: (1.8, 0.3)}, 432.0, 72.0),
    "E": (0.5, {120.0: (1.8, 0.3)}, 216.0, 36.0),
}

# NEMA ICS 5 (DC pilot duty): letter -> (continuous A, {column V: make = break
# A}, VA at 300 V or less). Columns are 125 V, 250 V and 301-600 V (held as
# 600). The continuous currents and the N and P VA figures were confirmed in
# a published summary of the standard; the ampere columns and the Q and R VA
# figures are from memory (as given in CHECK-VALUES.md).
_DC_LETTERS: dict[str, tuple[float, dict[float, float], float]] = {
    "N": (10.0, {125.0: 2.2, 250.0: 1.1, 600.0: 0.4}, 275.0),
    "P": (5.0, {125.0: 1.1, 250.0: 0.55, 600.0: 0.2}, 138.0),
    "Q": (2.5, {125.0: 0.55, 250.0: 0.27, 600.0: 0.1}, 69.0),
    "R": (1.0, {125.0: 0.22, 250.0: 0.11}, 28.0),
}

# NEMA ICS 5 designations in use (the list in FORMAT.md "Ratings").
_DESIGNATIONS = (
    "A600", "A300", "A150", "B600", "B300", "B150", "C600", "C300", "C150",
    "D300", "D150", "E150", "N600", "N300", "N150", "P600", "P300", "P150",
    "Q600", "Q300", "Q150", "R300", "R150",
)


def _build_pilot_duty(designation: str) -> PilotDuty:
    letter, max_volts = designation[0], float(designation[1:])
    if letter in _AC_LETTERS:
        continuous, columns, make_va, break_va = _AC_LETTERS[letter]
        held = tuple((v, mk, bk) for v, (mk, bk) in sorted(columns.items()) if v <= max_volts)
        return PilotDuty(designation, "AC", max_volts, continuous, make_va, break_va, held)
    continuous, columns, va = _DC_LETTERS[letter]
    held_dc: list[tuple[float, float, float]] = []
    for v, amps in sorted(columns.items()):
        held_dc.append((v, amps, amps))
        if v >= max_volts:  # this column already covers the top of the rating
            break
    return PilotDuty(designation, "DC", max_volts, continuous, va, va, tuple(held_dc))


PILOT_DUTY: dict[str, PilotDuty] = {d: _build_pilot_duty(d) for d in _DESIGNATIONS}


def pilot_duty(designation: str) -> PilotDuty | None:
    """The NEMA ICS 5 pilot-duty designation named, or None if unknown."""
    return PILOT_DUTY.get(designation.strip().upper())


_DC_VA_UP_TO_V = 300.0


def pilot_duty_limits(designation: str, volts: float, current_kind: str) -> PilotLimits | None:
    """Continuous, make and break current a pilot-duty contact allows.

    AC (letters A-E): below 120 V the make current as at 120 V and the break
    current = break VA / V, not above the continuous current; at a column
    voltage that column's figures; between columns the VA figures divided by
    the voltage. DC (letters N-R): up to 300 V make = break = VA / V, not
    above the continuous current (the 125 V and 250 V columns are exactly
    that); above 300 V the 301-600 V column. A designation covers voltages
    up to its number. Returns None for an unknown designation, a voltage
    above the designation's, or an AC designation on DC (or DC on AC).
    Readings below and between the columns: CHECK-VALUES.md, as makers'
    tables restate UL 508 / ICS 5 (from memory, medium confidence).
    """
    duty = pilot_duty(designation)
    if duty is None or not _positive(volts):
        return None
    if duty.current_kind != current_kind.strip().upper():
        return None
    if not _at_most(volts, duty.max_volts):
        return None
    if duty.current_kind == "AC":
        for column_v, make, brk in duty.columns:
            if _close(volts, column_v):
                return PilotLimits(duty.continuous, make, brk)
        lowest_v, make, _ = duty.columns[0]
        if volts < lowest_v:
            # below 120 V: the make current as at 120 V; the break current is
            # the break VA over the voltage, but never above the continuous
            # current (B300 at 24 VAC breaks 5 A, not 3 A)
            return PilotLimits(duty.continuous, make, min(duty.break_va / volts, duty.continuous))
        return PilotLimits(duty.continuous, duty.make_va / volts, duty.break_va / volts)
    for column_v, make, brk in duty.columns:
        if _close(volts, column_v):  # at a column voltage, the published column figure
            return PilotLimits(duty.continuous, make, brk)
    if _at_most(volts, _DC_VA_UP_TO_V):
        # up to 300 V (the VA figure's range; the 125 V and 250 V columns are
        # that VA over their voltage): make = break = VA / V, never above the
        # continuous current (N at 24 VDC: 10 A; R: 1.0 A)
        amps = min(duty.make_va / volts, duty.continuous)
        return PilotLimits(duty.continuous, amps, amps)
    for column_v, make, brk in duty.columns:
        if _at_most(volts, column_v):
            return PilotLimits(duty.continuous, make, brk)
    return None


# ---------------------------------------------------------------------------
# IEC utilisation categories
# ---------------------------------------------------------------------------

# IEC 60947-5-1 utilisation categories of control-circuit contacts (from
# memory): category -> (make multiple of Ie, break multiple of Ie). AC-15
# makes 10 x Ie and breaks 1 x Ie (cos phi 0.3); AC-14 makes 6 x Ie; DC-13
# makes and breaks 1 x Ie (T0.95 = 6 x P ms, at most 300 ms); DC-14 makes
# 10 x Ie. Any other category (AC-12, DC-12 ...) is read as make = break =
# Ie (RULES.md).
_CATEGORY_MULTIPLES: dict[str, tuple[float, float]] = {
    "AC-15": (10.0, 1.0),
    "AC-14": (6.0, 1.0),   # small electromagnetic loads (<= 72 VA): makes 6 x Ie
    "DC-13": (1.0, 1.0),
    "DC-14": (10.0, 1.0),  # makes 10 x Ie
}


def _category_name(category: str) -> str:
    name = category.strip().upper().replace(" ", "")
    if "-" not in name and len(name) > 2:
        name = f"{name[:2]}-{name[2:]}"
    return name


def category_limits(category: str, ie: float) -> tuple[float, float]:
    """(make A, break A) of an IEC 60947-5-1 category rating of current Ie."""
    make_multiple, break_multiple = _CATEGORY_MULTIPLES.get(_category_name(category), (1.0, 1.0))
    return make_multiple * ie, break_multiple * ie


def voltage_covered(rated_v: float, volts: float) -> bool:
    """A rating covers voltages up to its own (RULES.md "Rating meanings")."""
    return _at_most(volts, rated_v)


# ---------------------------------------------------------------------------
# NEMA contactor sizes
# ---------------------------------------------------------------------------

# NEMA ICS 2 continuous current of magnetic controllers by size, amperes
# (from memory, as listed in RULES.md).
NEMA_SIZE_CURRENT: dict[str, float] = {
    "00": 9.0,
    "0": 18.0,
    "1": 27.0,
    "2": 45.0,
    "3": 90.0,
    "4": 135.0,
    "5": 270.0,
    "6": 540.0,
    # Sizes 7 to 9: NEMA ICS 2 (from memory; not listed in RULES.md).
    "7": 810.0,
    "8": 1215.0,
    "9": 2250.0,
}


def nema_size_current(size: str | int) -> float | None:
    """Continuous current of a NEMA size (``"00"``, ``0``, ``"1"`` ...), or None."""
    return NEMA_SIZE_CURRENT.get(str(size).strip())


# NEMA ICS 2, three-phase magnetic controllers: the largest motor of each
# size in horsepower at 200 V, 230 V and 460-575 V (None: no rating at that
# voltage). Controllers are selected by horsepower at the motor's voltage
# (NEC 430.83(A)); the continuous current above serves non-motor loads.
# From memory, as CHECK-VALUES.md gives them (sizes 00-6 high confidence,
# 7-9 medium, checked against a published summary by a second reader).
NEMA_SIZE_HP: dict[str, tuple[float | None, float | None, float | None]] = {
    "00": (1.5, 1.5, 2.0),
    "0": (3.0, 3.0, 5.0),
    "1": (7.5, 7.5, 10.0),
    "2": (10.0, 15.0, 25.0),
    "3": (25.0, 30.0, 50.0),
    "4": (40.0, 50.0, 100.0),
    "5": (75.0, 100.0, 200.0),
    "6": (150.0, 200.0, 400.0),
    "7": (None, 300.0, 600.0),
    "8": (None, 450.0, 900.0),
    "9": (None, 800.0, 1600.0),
}

# Which NEMA horsepower column a motor voltage reads, as inclusive ranges:
# 200-208 V the 200 V column (a 208 V system motor is a 200 V motor, common
# practice), 220-240 V the 230 V column, 440-600 V the 460/575 V column.
_NEMA_HP_COLUMNS = ((200.0, 208.0, 0, "200 V"), (220.0, 240.0, 1, "230 V"), (440.0, 600.0, 2, "460-575 V"))


# NEMA ICS 2, single-phase magnetic controllers: the largest motor of each
# size in horsepower at 115 V and 230 V. From memory, medium confidence (not
# in CHECK-VALUES.md; a second reading is wanted); sizes above 3 are not
# held, so such a motor is reported as not verified rather than guessed.
NEMA_SIZE_HP_SINGLE_PHASE: dict[str, tuple[float, float]] = {
    "00": (1 / 3, 1.0),
    "0": (1.0, 2.0),
    "1": (2.0, 3.0),
    "2": (3.0, 7.5),
    "3": (7.5, 15.0),
}
_NEMA_HP_SINGLE_PHASE_COLUMNS = ((110.0, 120.0, 0, "115 V single-phase"), (220.0, 240.0, 1, "230 V single-phase"))


def nema_size_horsepower(size: str | int, volts: float, phases: int = 3) -> tuple[float | None, str]:
    """(largest motor in hp, column name) of a NEMA size at a motor voltage;
    (None, "") where the voltage reads no column or the size's single-phase
    rating is not held, (None, column) where the size has no rating in that
    column."""
    if phases == 1:
        row1 = NEMA_SIZE_HP_SINGLE_PHASE.get(str(size).strip())
        if row1 is None or not _positive(volts):
            return None, ""
        for low, high, index, name in _NEMA_HP_SINGLE_PHASE_COLUMNS:
            if _at_most(low, volts) and _at_most(volts, high):
                return row1[index], name
        return None, ""
    row = NEMA_SIZE_HP.get(str(size).strip())
    if row is None or not _positive(volts):
        return None, ""
    for low, high, index, name in _NEMA_HP_COLUMNS:
        if _at_most(low, volts) and _at_most(volts, high):
            return row[index], name
    return None, ""


def controller_full_load_current(table_a: float | None, nameplate_a: float | None) -> float | None:
    """The full-load current a controller is sized with (NEC 430.6(A)(1)):
    the table value, or the nameplate where larger or where the table has
    no row."""
    if table_a is None:
        return nameplate_a
    if nameplate_a is None:
        return table_a
    return max(table_a, nameplate_a)


# ---------------------------------------------------------------------------
# Standard ratings of overcurrent devices
# ---------------------------------------------------------------------------

# NEC (NFPA 70) 240.6(A): standard ampere ratings of fuses and inverse-time
# circuit breakers (from memory), plus the additional standard ratings for
# fuses only: 1, 3, 6, 10 and 601 A (from memory).
STANDARD_FUSE_ONLY_RATINGS: tuple[float, ...] = (1.0, 3.0, 6.0, 10.0, 601.0)
STANDARD_RATINGS: tuple[float, ...] = tuple(
    sorted(
        {
            15.0, 20.0, 25.0, 30.0, 35.0, 40.0, 45.0, 50.0, 60.0, 70.0, 80.0, 90.0,
            100.0, 110.0, 125.0, 150.0, 175.0, 200.0, 225.0, 250.0, 300.0, 350.0,
            400.0, 450.0, 500.0, 600.0, 700.0, 800.0, 1000.0, 1200.0, 1600.0,
            2000.0, 2500.0, 3000.0, 4000.0, 5000.0, 6000.0,
        }
        | set(STANDARD_FUSE_ONLY_RATINGS)
    )
)


def next_standard_rating(amps: float) -> float:
    """The smallest NEC 240.6(A) standard rating at or above ``amps``.

    Above the largest standard rating there is nothing to round up to, and
    ``amps`` itself is returned.
    """
    for rating in STANDARD_RATINGS:
        if _at_most(amps, rating):
            return rating
    return amps


# ---------------------------------------------------------------------------
# Control transformer protection
# ---------------------------------------------------------------------------

# NEC (NFPA 70) 430.72(C) and Table 450.3(B), from CHECK-VALUES.md.
# 430.72(C)(3): a transformer under 50 VA integral to the controller may go
# without primary devices. 430.72(C)(4): rated primary current under 2 A,
# primary device up to 500 % (and then the 450.3(B) primary limits do not
# apply). Table 450.3(B): primary only 125 % (>= 9 A, next standard rating
# allowed) or 167 % (2 A to 9 A); primary and secondary: primary 250 %,
# secondary 125 % (>= 9 A, next standard rating allowed) or 167 % (< 9 A).
_SMALL_TRANSFORMER_VA = 50.0
_SMALL_PRIMARY_A = 2.0
_LARGE_CURRENT_A = 9.0
_SMALL_PRIMARY_FRACTION = 5.00
_PRIMARY_WITH_SECONDARY_FRACTION = 2.50
_FRACTION_AT_OR_ABOVE_9A = 1.25
_FRACTION_BELOW_9A = 1.67


def _amps(value: float) -> str:
    """Amperes to three significant figures, halves rounded up (3.125 -> 3.13)."""
    if value == 0:
        return "0"
    exponent = math.floor(math.log10(abs(value)))
    quantum = Decimal(1).scaleb(exponent - 2)
    text = format(Decimal(repr(value)).quantize(quantum, rounding=ROUND_HALF_UP), "f")
    if "." in text:
        text = text.rstrip("0").rstrip(".")  # 20.0 -> 20, 2.60 -> 2.6
    return text


def _percent(fraction: float) -> str:
    return f"{fraction * 100:.0f} %"


def primary_fuse_required(rating_va: float, class2: bool = False, integral: bool = False) -> bool:
    """Whether a control transformer needs primary protection.

    Not where it is Class 2 or Class 1 power-limited (NEC 430.72(C)(1)), nor
    where it is under 50 VA AND integral to the controller within its
    enclosure (430.72(C)(3)); a transformer marked as neither needs it,
    whatever its size.
    """
    if class2:
        return False
    return not (integral and rating_va < _SMALL_TRANSFORMER_VA)


def transformer_primary_limit(
    rating_va: float, primary_v: float, secondary_fused: bool
) -> tuple[float | None, str]:
    """Largest primary overcurrent device for a control transformer.

    Returns (limit in amperes, the clause and arithmetic behind it). Where
    the primary current is under 2 A, NEC 430.72(C)(4) allows 500 % on its
    own. Otherwise Table 450.3(B): 250 % with a secondary fuse; without one
    125 % where Ip >= 9 A (the next standard rating up allowed) and 167 %
    where 2 A <= Ip < 9 A. The 500 %, 250 % and 167 % limits do not round.
    Returns (None, reason) when the rating or voltage is not positive.
    """
    if not _positive(rating_va, primary_v):
        return None, "no primary limit: the transformer rating and primary voltage must be positive"
    ip = rating_va / primary_v
    if ip < _SMALL_PRIMARY_A:
        limit = _SMALL_PRIMARY_FRACTION * ip
        return limit, f"NEC 430.72(C)(4), {_percent(_SMALL_PRIMARY_FRACTION)} of {_amps(ip)} A"
    if secondary_fused:
        limit = _PRIMARY_WITH_SECONDARY_FRACTION * ip
        return limit, (
            f"NEC Table 450.3(B), primary and secondary protection, "
            f"{_percent(_PRIMARY_WITH_SECONDARY_FRACTION)} of {_amps(ip)} A"
        )
    return _primary_or_secondary_limit(ip, "primary only protection")


def transformer_secondary_limit(rating_va: float, secondary_v: float) -> tuple[float, str]:
    """Largest secondary overcurrent device for a control transformer,
    NEC Table 450.3(B): 125 % of Is where Is >= 9 A (the next standard rating
    up allowed), 167 % where Is < 9 A. Returns (limit A, clause)."""
    if not _positive(rating_va, secondary_v):
        raise ValueError("the transformer rating and secondary voltage must be positive")
    return _primary_or_secondary_limit(rating_va / secondary_v, "secondary")


def _primary_or_secondary_limit(current: float, which: str) -> tuple[float, str]:
    if current >= _LARGE_CURRENT_A:
        exact = _FRACTION_AT_OR_ABOVE_9A * current
        limit = next_standard_rating(exact)
        clause = (
            f"NEC Table 450.3(B), {which}, {_percent(_FRACTION_AT_OR_ABOVE_9A)} "
            f"of {_amps(current)} A = {_amps(exact)} A"
        )
        if not _close(limit, exact):
            clause += f", next standard rating {_amps(limit)} A (NEC 240.6(A))"
        return limit, clause
    limit = _FRACTION_BELOW_9A * current
    return limit, (
        f"NEC Table 450.3(B), {which}, {_percent(_FRACTION_BELOW_9A)} of {_amps(current)} A"
    )


# ---------------------------------------------------------------------------
# Coils and contactors
# ---------------------------------------------------------------------------

# IEC 60947-4-1 operating limits of electromagnets (from memory): a coil
# picks up and holds between 85 % and 110 % of its rated control voltage.
COIL_MIN_FRACTION = 0.85
COIL_MAX_FRACTION = 1.10


def coil_voltage_ok(supply_v: float, rated_v: float) -> bool:
    """Whether a coil rated ``rated_v`` operates on ``supply_v`` (85-110 %,
    inclusive)."""
    return _at_most(COIL_MIN_FRACTION * rated_v, supply_v) and _at_most(
        supply_v, COIL_MAX_FRACTION * rated_v
    )


# Above about 400 A of load current vacuum contactors are preferred, since
# switching in air risks arc flash (common practice, no standard clause).
VACUUM_THRESHOLD_A = 400.0
