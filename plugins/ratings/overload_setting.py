"""A motor overload relay protects the windings from running overcurrent. NEC 430.32 limits its TRIP
current, sized from the motor's NAMEPLATE full-load current (430.6(A)(2)): at most 125 % for a
marked service factor of 1.15 or more or a marked temperature rise of 40 C or less, 115 % for any
other motor (430.32(A)(1)); with `starting_allowance: true`, 140 % / 130 % (430.32(C)), an allowance
that holds only where the lower setting cannot start the motor. The dial is not the trip current: a
relay does not trip at 1.05 x its setting and trips at 1.20 x (IEC 60947-4-1), so the ultimate trip
current is the setting x `trip_multiple` (default 1.20); a dial at the nameplate current suits an SF
1.15 motor (1.20 <= 1.25) and about 0.9 x for SF 1.0 (1.08 <= 1.15). A trip current below 100 % of
the full-load current trips in normal running (a warning). An overload with `in: phase` sits in the
phase leads of a wye-delta motor and is checked against FLA / sqrt(3); a multi-speed motor at the
speed its contactor names. A motor with no nameplate `fla` is never checked silently on the table: a
setting above the limit even on the table current is an error, otherwise an info finding says it is
not verified. These are US NEC figures; other codes (CEC, local rules) may differ.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import Example, Finding, Rule, reflow
from ctllint.reading.model import Device, Quantity, Severity
from ctllint.circuit.tables import OVERLOAD_FRACTION_LOW, STARTING_FRACTION_LOW, overload_limit, ultimate_trip_current
from ctllint_plugins.ratings._controllers import CONTACTOR_KINDS, SQRT3, motor_at_speed, table_current
from ctllint_plugins.ratings._figures import amps_text, exceeds


def _protected_motors(ctx) -> dict[str, list[tuple[Device, Device]]]:
    """Overload tag -> (contactor, motor) pairs for each contactor or starter
    naming it as its overload relay and feeding a motor, one per motor and
    speed. Built once per schematic, so the rule stays linear in the device
    count."""
    by_overload: dict[str, list[tuple[Device, Device]]] = {}
    seen: set[tuple[str, str, str | None]] = set()
    for device in ctx.devices.values():
        overload = device.tag if device.kind == "motor-breaker" else device.get("overload")  # its own overload
        if device.kind not in (*CONTACTOR_KINDS, "motor-breaker") or not isinstance(overload, str):
            continue
        motor = ctx.devices.get(device.get("feeds") or "")
        key = (overload, motor.tag if motor is not None else "", device.get("speed"))
        if motor is None or motor.kind != "motor" or key in seen:
            continue
        seen.add(key)
        by_overload.setdefault(overload, []).append((device, motor))
    return by_overload


def _why_fraction(motor: Device, fraction: float) -> str:
    service_factor, temp_rise = motor.get("service_factor"), motor.get("temp_rise")
    if fraction in (OVERLOAD_FRACTION_LOW, STARTING_FRACTION_LOW):
        return "no service factor of 1.15 or more and no temperature rise of 40 C or less marked"
    if isinstance(service_factor, (int, float)) and overload_limit(1.0, service_factor, None)[1] != OVERLOAD_FRACTION_LOW:
        return f"service factor {service_factor:g}"
    return f"temperature rise {temp_rise.text}"


def check_overload_setting(ctx) -> Iterator[Finding]:
    """NEC 430.32 limits the overload's TRIP current, sized from the motor's
    NAMEPLATE current (430.6(A)(2)); the dial is not the trip current."""
    index = _protected_motors(ctx)
    for overload in ctx.devices.values():
        setting = overload.get("setting")
        if overload.kind not in ("overload", "motor-breaker") or not isinstance(setting, Quantity):
            continue
        multiple = overload.get("trip_multiple")
        trip = ultimate_trip_current(setting.value, multiple if isinstance(multiple, float) else None)
        dial = (
            f"{'overload' if overload.kind == 'overload' else 'motor-protective breaker'} {overload.tag} is set at {amps_text(setting.value)}, an ultimate trip current of {amps_text(trip)} "
            f"({'x ' + format(multiple, 'g') + ' as given' if isinstance(multiple, float) else 'x 1.2, IEC 60947-4-1'})"
        )
        allowance = overload.get("starting_allowance") is True
        phase = overload.get("in") == "phase"
        for contactor, motor in index.get(overload.tag, []):
            yield from _check_one_overload(ctx, overload, contactor, motor, trip, dial, allowance, phase)


def _check_one_overload(ctx, overload, contactor, motor, trip, dial, allowance, phase) -> Iterator[Finding]:
    at = overload.at("setting")  # RULES.md: overload-setting findings are at the setting
    speed = contactor.get("speed")
    if motor.get("speeds") and speed is None:
        yield Finding(at, f"{dial}; motor {motor.tag} has several speeds and {contactor.tag} names none: not verified to NEC 430.32 (give the contactor's speed)", overload.tag, Severity.INFO)
        return
    power, fla, label = motor_at_speed(motor, speed)
    share, share_text = (1 / SQRT3, " x 1/sqrt(3) in the phase leads of a wye-delta motor") if phase else (1.0, "")
    service_factor, temp_rise = motor.get("service_factor"), motor.get("temp_rise")
    sf = service_factor if isinstance(service_factor, (int, float)) else None
    rise = temp_rise.value if isinstance(temp_rise, Quantity) else None
    clause = "NEC 430.32(C)" if allowance else "NEC 430.32(A)(1)"
    allowance_note = (
        "; the 430.32(C) allowance holds only where the 430.32(A)(1) setting cannot start the motor or carry its load"
        if allowance else ""
    )
    if isinstance(fla, Quantity):
        full = fla.value * share
        limit, fraction = overload_limit(full, sf, rise, allowance)
        base = f"{dial}; {label}'s nameplate full-load current is {amps_text(fla.value)}{share_text}"
        if exceeds(trip, limit):
            yield Finding(
                at,
                f"{base}, and {fraction * 100:.0f} % of {amps_text(full)} is {amps_text(limit)} ({_why_fraction(motor, fraction)}; {clause}): "
                f"set the dial at most {amps_text(limit / (trip / overload.get('setting').value))}{allowance_note}",
                overload.tag,
            )
        elif exceeds(full, trip):
            yield Finding(
                at,
                f"{base}: a trip current below 100 % of {amps_text(full)} trips in normal running; set the dial so that it trips between {amps_text(full)} and {amps_text(limit)}",
                overload.tag,
                Severity.WARNING,
            )
        return
    table, why = table_current(motor, power)
    if table is not None:
        full = table * share
        limit, fraction = overload_limit(full, sf, rise, allowance)
        if exceeds(trip, limit):
            yield Finding(
                at,
                f"{dial}, above {fraction * 100:.0f} % ({amps_text(limit)}) even of the table current {amps_text(full)} ({why}{share_text}; {clause}), "
                f"which usually lies above the nameplate: lower the setting and give {label}'s nameplate fla (NEC 430.6(A)(2) sizes overloads from the nameplate){allowance_note}",
                overload.tag,
            )
            return
    yield Finding(
        at,
        f"{dial}; not verified to NEC 430.32: {label} has no nameplate fla (NEC 430.6(A)(2) sizes overloads from the nameplate, not the table)",
        overload.tag,
        Severity.INFO,
    )


RULE = Rule(
    name="overload-setting",
    severity=Severity.ERROR,
    summary="an overload trips above NEC 430.32 (error), below full-load current (warning), or is unverified (info)",
    doc=reflow(__doc__),
    source="NEC (NFPA 70) 430.6(A)(2), 430.32(A)(1) and (C); IEC 60947-4-1 (trip at 1.20 x setting, from memory); NEC Tables 430.250 and 430.248",
    check=check_overload_setting,
    failing=Example(
        "30 hp 460 V motor, nameplate 38 A, no service factor: 115 % = 43.7 A; dial 40 A trips at 48 A",
        """devices:
  M1: {kind: starter, coil: 120 VAC, overload: OL1, feeds: MTR1}
  OL1: {kind: overload, setting: 40 A}
  MTR1: {kind: motor, power: 30 hp, voltage: 460 V, phases: 3, fla: 38 A}
""",
    ),
    passing=Example(
        "the same motor with the dial at 0.9 x FLA: 34.2 A trips at 41 A",
        """devices:
  M1: {kind: starter, coil: 120 VAC, overload: OL1, feeds: MTR1}
  OL1: {kind: overload, setting: 34.2 A}
  MTR1: {kind: motor, power: 30 hp, voltage: 460 V, phases: 3, fla: 38 A}
""",
    ),
)
