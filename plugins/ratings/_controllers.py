"""Controller sizing: the current a contactor's main poles carry for what it feeds.

A motor's controller full-load current (NEC Table 430.250/430.248 or the nameplate, at the speed
its contactor names), a wye-delta contactor's share of it, a heater's current. contact-rating
sizes main poles with it, vacuum-contactor compares it with 400 A, overload-setting reads a
motor's figures at a speed and its table current; so it is one module they all import.
"""
from __future__ import annotations

import math

from ctllint.reading.model import Device, Quantity
from ctllint.circuit.tables import controller_full_load_current, heater_current, motor_full_load_current
from ctllint_plugins.ratings._figures import amps_text

CONTACTOR_KINDS = ("contactor", "starter")

SQRT3 = math.sqrt(3.0)


def motor_at_speed(motor: Device, speed: str | None) -> tuple[Quantity | None, Quantity | None, str]:
    """(power, nameplate fla, label) of a motor, at ``speed`` for a
    multi-speed motor (FORMAT.md "Additions"). A multi-speed motor named
    without a speed is taken at its speed of largest current (the worst
    case for a controller), and the label says so."""
    speeds = motor.get("speeds") or ()
    if not speeds:
        return motor.get("power"), motor.get("fla"), f"motor {motor.tag}"
    chosen = next((sp for sp in speeds if sp.name == speed), None)
    if chosen is not None:
        return chosen.power, chosen.fla, f"motor {motor.tag} at speed {chosen.name}"

    def size(sp) -> float:
        table = table_current(motor, sp.power)[0]
        return max(sp.fla.value if sp.fla else 0.0, table or 0.0)

    chosen = max(speeds, key=size)
    return chosen.power, chosen.fla, f"motor {motor.tag} at its largest speed ({chosen.name})"


def table_current(motor: Device, power: Quantity | None) -> tuple[float | None, str]:
    """NEC Table 430.250 (three-phase) or 430.248 (single-phase) current
    for ``power`` at the motor's voltage, or (None, why)."""
    volts, phases = motor.get("voltage"), motor.get("phases")
    table = "NEC Table 430.250" if phases == 3 else "NEC Table 430.248"
    if not isinstance(power, Quantity) or not isinstance(volts, Quantity):
        missing = " and ".join(n for n, v in (("power", power), ("voltage", volts)) if not isinstance(v, Quantity))
        return None, f"no {missing} to read {table} with"
    value = motor_full_load_current(power.value, volts.value, phases)
    if value is None:
        return None, f"{power.text} {volts.text} {phases}-phase is not in {table}"
    return value, f"{table}, {power.text} {volts.text}"


def motor_full_load(motor: Device, speed: str | None = None) -> tuple[float | None, str]:
    """The full-load current a controller is sized with, and where it came
    from (NEC 430.6(A)(1)): the table value by power and voltage, or the
    nameplate ``fla`` where larger or where the table has no row. Returns
    (None, why) where neither gives a figure: a finding, never a guess."""
    power, fla, _ = motor_at_speed(motor, speed)
    table, why = table_current(motor, power)
    nameplate = fla.value if isinstance(fla, Quantity) else None
    value = controller_full_load_current(table, nameplate)
    if value is None:
        return None, f"it has no nameplate fla and {why}"
    if table is None or (nameplate is not None and nameplate > table):
        return value, "nameplate" + (f", above {why} ({amps_text(table)})" if table is not None else "")
    return value, why


def role_factor(contactor: Device) -> tuple[float, str]:
    """Share of the motor's line current a contactor of a wye-delta starter
    carries (common practice): line and delta contactors the phase current
    FLA / sqrt(3), the star contactor FLA / 3."""
    role = contactor.get("role")
    if role in ("line", "delta"):
        return 1 / SQRT3, f"{role} contactor of a wye-delta starter: FLA / sqrt(3)"
    if role == "star":
        return 1 / 3, "star contactor of a wye-delta starter: FLA / 3"
    return 1.0, ""


def feed_current(device: Device, contactor: Device | None = None) -> tuple[float | None, str]:
    """Current the main poles of ``contactor`` carry for what it feeds: a
    motor's controller full-load current (at its speed, times its wye-delta
    share), or a heater's P / V (single-phase) or P / (sqrt(3) V)."""
    if device.kind == "motor":
        current, source = motor_full_load(device, contactor.get("speed") if contactor is not None else None)
        factor, why = role_factor(contactor) if contactor is not None else (1.0, "")
        if current is None or factor == 1.0:
            return current, source
        return current * factor, f"{amps_text(current)} ({source}) x {factor:.3f}, {why}"
    if device.kind == "heater":
        power, volts, phases = device.get("power"), device.get("voltage"), device.get("phases")
        if not isinstance(power, Quantity) or not isinstance(volts, Quantity) or phases not in (1, 3) or volts.value <= 0:
            return None, "it lacks power, voltage or phases"
        current = heater_current(power.value, volts.value, phases)
        return current, f"{power.text} at {volts.text} {phases}-phase"
    return None, ""
