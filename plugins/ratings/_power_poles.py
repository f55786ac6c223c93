"""contact-rating's check of a contactor's main poles against what it feeds.

An IEC AC-3 (motor) or AC-1 (heater) rating against the controller full-load current, or a NEMA
size by horsepower at the motor's voltage (NEMA ICS 2, NEC 430.83(A)). Apart from
contact_rating.py because it is a check of its own on devices, not on contacts in rungs, and
long enough to crowd the rule's module.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import Finding
from ctllint.reading.model import Device, Quantity, Severity
from ctllint.reading.quantities import format_si
from ctllint.circuit.tables import HP_W, motor_full_load_current, nema_size_current, nema_size_horsepower, voltage_covered
from ctllint_plugins.ratings._contact_duty import category_name
from ctllint_plugins.ratings._controllers import feed_current, motor_at_speed, role_factor
from ctllint_plugins.ratings._figures import amps_text, exceeds

# A motor's power matches a NEMA size's horsepower when within 1 % (7.5 kW
# for 10 hp), as the NEC tables are read (ctllint.circuit.tables).
_HP_TOLERANCE = 0.01

# IEC 60947-4-1 categories that rate main poles for a cage motor (AC-4, the
# plugging and inching duty, is the harsher one and covers AC-3 duty too).
_MOTOR_CATEGORIES = ("AC-3", "AC-4")
# Categories that rate main poles for a resistive load: AC-1 is the one for
# it; an AC-3 or AC-4 rating at Ie carries Ie resistive as well.
_HEATER_CATEGORIES = ("AC-1", "AC-3", "AC-4")


def _categories_text(categories) -> str:
    return ", ".join(f"{category_name(c.category)} {amps_text(c.current)} at {format_si(c.voltage, 'V')}" for c in categories)


def check_power_poles(ctx, contactor: Device) -> Iterator[Finding]:
    power_rating = contactor.get("power_rating")
    target = ctx.devices.get(contactor.get("feeds") or "")
    if power_rating is None or target is None or target.kind not in ("motor", "heater"):
        return
    current, source = feed_current(target, contactor)
    if power_rating.nema_size is not None:
        yield from _check_nema_size(ctx, contactor, target, power_rating.nema_size, current, source)
        return
    if current is None:
        return  # overload-setting and motor-overload report a motor whose current cannot be told
    what = f"{amps_text(current)} of {target.kind} {target.tag} ({source})"
    if not power_rating.categories:
        return
    wanted = _MOTOR_CATEGORIES if target.kind == "motor" else _HEATER_CATEGORIES
    volts = target.get("voltage")
    applicable = [
        c for c in power_rating.categories
        if category_name(c.category) in wanted and c.current_kind == "AC"
        and (not isinstance(volts, Quantity) or voltage_covered(c.voltage, volts.value))
    ]
    duty = "AC-3" if target.kind == "motor" else "AC-1"
    if not applicable:
        at_volts = f" at {volts.text}" if isinstance(volts, Quantity) else ""
        yield Finding(
            at=contactor.loc,
            message=(
                f"{contactor.kind} {contactor.tag} has no {duty} power rating{at_volts} to switch the {what}; "
                f"power_rating gives {_categories_text(power_rating.categories)}: "
                f"give the main poles' {duty} rating (IEC 60947-4-1)"
            ),
            subject=contactor.tag,
        )
        return
    best = max(applicable, key=lambda c: c.current)
    if exceeds(current, best.current):
        yield Finding(
            at=contactor.loc,
            message=(
                f"{contactor.kind} {contactor.tag} main poles rated {category_name(best.category)} {amps_text(best.current)} "
                f"at {format_si(best.voltage, 'V')}, below the {what}; IEC 60947-4-1 {duty} duty: "
                f"use a larger {contactor.kind}"
            ),
            subject=contactor.tag,
        )


def _check_nema_size(ctx, contactor: Device, target: Device, size: str, current: float | None, source: str) -> Iterator[Finding]:
    """A NEMA size is rated in horsepower at the motor's voltage (NEMA ICS 2,
    NEC 430.83(A)); its continuous current serves non-motor loads. A
    contactor of a wye-delta starter carries a share of the line current:
    it is held to the full-load current of the size's largest motor."""
    name = f"{contactor.kind} {contactor.tag} is NEMA size {size}"
    if target.kind == "heater":
        size_current = nema_size_current(size)
        if current is not None and size_current is not None and exceeds(current, size_current):
            yield Finding(
                at=contactor.loc,
                message=f"{name}, {amps_text(size_current)} continuous (NEMA ICS 2), below the {amps_text(current)} of heater {target.tag} ({source}): use a larger size",
                subject=contactor.tag,
            )
        return
    volts, phases = target.get("voltage"), target.get("phases")
    power, _, label = motor_at_speed(target, contactor.get("speed"))

    def unverified(why: str) -> Finding:
        return Finding(
            at=contactor.loc,
            message=f"{name}; it cannot be checked against {label}: {why}",
            subject=contactor.tag,
            severity=Severity.INFO,
        )

    if not isinstance(volts, Quantity) or phases not in (1, 3):
        yield unverified("the motor gives no voltage")
        return
    max_hp, column = nema_size_horsepower(size, volts.value, phases)
    if not column:
        columns = "115 and 230 V single-phase, sizes 00-3" if phases == 1 else "200, 230 and 460-575 V"
        yield unverified(f"the NEMA ICS 2 ratings held here are at {columns}, not {volts.text}; give an IEC AC-3 power_rating or check the size by hand")
        return
    if max_hp is None:
        yield Finding(
            at=contactor.loc,
            message=f"{name}, which has no horsepower rating at {column} (NEMA ICS 2), and switches {label} at {volts.text}: use a size rated at that voltage",
            subject=contactor.tag,
        )
        return
    factor, role_why = role_factor(contactor)
    if factor == 1.0:
        if not isinstance(power, Quantity):
            yield unverified("the motor gives no power to compare with the size's horsepower")
            return
        hp = power.value / HP_W
        if hp > max_hp * (1 + _HP_TOLERANCE):
            yield Finding(
                at=contactor.loc,
                message=(
                    f"{name}, rated {max_hp:g} hp at {column} (NEMA ICS 2), below the {power.text} at {volts.text} "
                    f"of {label}; controllers are selected by horsepower at the motor's voltage (NEC 430.83(A)), "
                    f"not by continuous current: use a larger size"
                ),
                subject=contactor.tag,
            )
            return
    # the current the size may switch in motor duty: the full-load current of its largest motor
    size_amps = motor_full_load_current(max_hp * HP_W, volts.value, phases)
    if current is None or size_amps is None:
        if factor != 1.0:
            yield unverified(f"the full-load current of the size's {max_hp:g} hp at {volts.text} is not in NEC Table 430.250 here")
        return
    if exceeds(current, size_amps):
        yield Finding(
            at=contactor.loc,
            message=(
                f"{name}, rated {max_hp:g} hp at {column} (NEMA ICS 2; {amps_text(size_amps)} by NEC Table 430.250), "
                f"below the {amps_text(current)} of {label} ({source}): use a larger size"
            ),
            subject=contactor.tag,
        )
