"""Ratings and protection: contacts, overloads, control transformers.

These rules compare what a device is rated for with what the circuit asks of
it. The figures come from the schematic (coil VA, lamp watts, nameplate
currents, fuse ratings) and from published tables held in
``ctllint.circuit.tables`` (NEC Tables 430.250 and 430.248, NEC 430.32, 430.72 and
450.3(B), NEMA ICS 5 pilot duty, IEC 60947 utilisation categories, NEMA
ICS 2 sizes); each table names its source beside it.

How duty is computed (RULES.md "How to compute duty"): the current of a load
is VA / V for inrush and sealed, W / V for resistive loads (pilot lights,
horns) and DC coils, with V the voltage of the supply the load is on; a PLC
input draws its rated ``current``. A load that gives only one of inrush and
sealed uses it for both; a load that gives neither is passed by. The duty of
a contact is the sum over every load it serves, all assumed on together (the
worst case): inrush currents for make, sealed currents for break and for
continuous current.

Rules:

- ``contact-rating``: one contact's (or PLC output's) duty beyond its rating;
  a contactor's main poles below the motor's horsepower at its voltage (NEMA
  size), its controller current (AC-3), a heater's current (AC-1).
- ``overload-setting``: an overload relay whose trip current (dial x trip
  multiple) is above NEC 430.32 of the nameplate current (error), below it
  (warning), or cannot be verified for want of a nameplate (info).
- ``motor-overload``: a contactor feeding a motor with no overload protection.
- ``control-transformer``: the loads of a transformer's supplies (over every
  schematic of the run for a shared transformer) beyond its VA rating,
  sealed and at inrush; a DC power supply's loads beyond its rating.
- ``transformer-protection``: control-transformer fuses missing or above
  NEC 430.72(C) and Table 450.3(B).
- ``vacuum-contactor``: a contactor switching more than 400 A in air (info).
- ``inductive-on-electronic-output``: a transistor or triac output driving an
  unsuppressed inductive load.

The tables are US (NEC, NEMA) and IEC figures, partly from memory; other
codes (CEC, local rules) may differ.
"""
from __future__ import annotations

import math
import os
from dataclasses import dataclass
from typing import Iterator

from ctllint import hookimpl
from ctllint.api import Example, Finding, Rule
from ctllint.reading.model import ContactRating, Device, Element, Location, Quantity, Severity, Supply
from ctllint.reading.quantities import format_si
from ctllint.circuit.wiresets import WireSets
from ctllint.circuit.tables import (
    HP_W,
    OVERLOAD_FRACTION_LOW,
    STARTING_FRACTION_LOW,
    VACUUM_THRESHOLD_A,
    category_limits,
    controller_full_load_current,
    heater_current,
    motor_full_load_current,
    nema_size_current,
    nema_size_horsepower,
    overload_limit,
    ultimate_trip_current,
    pilot_duty_limits,
    primary_fuse_required,
    transformer_primary_limit,
    transformer_secondary_limit,
    voltage_covered,
)

# A motor's power matches a NEMA size's horsepower when within 1 % (7.5 kW
# for 10 hp), as the NEC tables are read (ctllint.circuit.tables).
_HP_TOLERANCE = 0.01

# Relative slack when comparing a duty with a limit, so that a duty equal to
# its limit (computed through a different float route) is not a finding.
_SLACK = 1e-9

_COIL_KINDS = ("relay", "timer", "contactor", "starter", "alternating-relay", "latching-relay")
_CONTACTOR_KINDS = ("contactor", "starter")
# IEC 60947-4-1 categories that rate main poles for a cage motor (AC-4, the
# plugging and inching duty, is the harsher one and covers AC-3 duty too).
_MOTOR_CATEGORIES = ("AC-3", "AC-4")
# Categories that rate main poles for a resistive load: AC-1 is the one for
# it; an AC-3 or AC-4 rating at Ie carries Ie resistive as well.
_HEATER_CATEGORIES = ("AC-1", "AC-3", "AC-4")


def _exceeds(value: float, limit: float) -> bool:
    return value > limit and not math.isclose(value, limit, rel_tol=_SLACK, abs_tol=_SLACK)


def _amps(value: float) -> str:
    return format_si(value, "A")


def _volts_text(supply: Supply) -> str:
    return format_si(supply.voltage.value, "V") + (supply.current_kind or "")


def _category(name: str) -> str:
    text = name.strip().upper().replace(" ", "")
    if "-" not in text and len(text) > 2:
        text = f"{text[:2]}-{text[2:]}"
    return text


def _subject(ctx, element: Element) -> str:
    rungs = ctx.schematic.rungs
    number = rungs[element.rung].number if 0 <= element.rung < len(rungs) else element.rung + 1
    return f"{element.text}@rung{number}"


def _names(items: list[str]) -> str:
    return ", ".join(items)


# ---------------------------------------------------------------------------
# Load figures
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class LoadFigures:
    """What one load draws: apparent power (VA, W standing for VA where the
    load is resistive or a DC coil) and current at its supply's voltage."""

    tag: str
    inrush_va: float
    sealed_va: float
    inrush_a: float
    sealed_a: float


def load_power(device: Device, volts: float) -> tuple[float, float] | None:
    """(inrush VA, sealed VA) of a load device on a supply of ``volts``.

    VA figures where given; else W (``coil_power`` of a DC coil, ``power`` of
    a solenoid, pilot light or horn), which stands for both; else a PLC
    input's rated ``current`` times the voltage. One of inrush and sealed
    stands for both; None when the device gives no figure.
    """
    inrush, sealed = device.get("inrush"), device.get("sealed")
    if isinstance(inrush, Quantity) or isinstance(sealed, Quantity):
        inrush_va = inrush.value if isinstance(inrush, Quantity) else sealed.value
        sealed_va = sealed.value if isinstance(sealed, Quantity) else inrush.value
        return inrush_va, sealed_va
    watts = device.get("coil_power") if device.kind in _COIL_KINDS else device.get("power")
    if isinstance(watts, Quantity):
        return watts.value, watts.value
    current = device.get("current")
    if isinstance(current, Quantity) and volts > 0:
        return current.value * volts, current.value * volts
    return None


def load_figures(device: Device, volts: float) -> LoadFigures | None:
    """Inrush and sealed VA and current of a load on a supply of ``volts``
    (current = VA / V, or W / V), or None when it cannot be told."""
    if not volts or volts <= 0:
        return None
    power = load_power(device, volts)
    if power is None:
        return None
    inrush_va, sealed_va = power
    return LoadFigures(device.tag, inrush_va, sealed_va, inrush_va / volts, sealed_va / volts)


@dataclass(frozen=True)
class Duty:
    """The duty of a contact, amperes: make (summed inrush), break and
    continuous (summed sealed)."""

    make: float
    break_: float
    continuous: float


def contact_duty(figures: list[LoadFigures]) -> Duty:
    """Sum the loads a contact serves, all assumed on together (worst case)."""
    make = sum(f.inrush_a for f in figures)
    sealed = sum(f.sealed_a for f in figures)
    return Duty(make, sealed, sealed)


@dataclass(frozen=True)
class Limits:
    """What a contact rating allows at one supply voltage, amperes; a None
    figure is not limited by the rating (a thermal rating limits only
    continuous current). ``text`` describes the rating for messages."""

    make: float | None
    break_: float | None
    continuous: float | None
    text: str


def rating_limits(rating: ContactRating, volts: float, current_kind: str | None) -> tuple[list[Limits], str]:
    """The limits a contact rating gives on a supply, and why none apply.

    A plain current is a resistive rating: make = break = continuous.
    Pilot duty: NEMA ICS 5 figures at that voltage (``pilot_duty_limits``),
    each designation of a list for its own kind of supply ([A600, Q300]).
    Category entries: each of the supply's AC/DC kind whose voltage covers
    the supply's (IEC 60947-5-1: AC-15 makes 10 x Ie and breaks Ie, AC-14
    makes 6 x Ie, DC-13 makes and breaks Ie, DC-14 makes 10 x Ie, other
    categories make = break = Ie). Any one of the limits found may carry
    the duty. An empty list comes with the reason the rating does not cover
    the supply. A supply whose voltage leaves AC/DC open accepts either kind.
    """
    supply_text = format_si(volts, "V") + (f" {current_kind}" if current_kind else "")
    if rating.form == "thermal" and rating.current is not None:
        amps = rating.current
        return [Limits(amps, amps, amps, f"{format_si(amps, 'A')} (a plain current: a resistive rating)")], ""
    found: list[Limits] = []
    kinds = [current_kind] if current_kind else ["AC", "DC"]
    for designation in rating.all_designations():
        for kind in kinds:
            limits = pilot_duty_limits(designation, volts, kind)
            if limits is not None:
                found.append(Limits(limits.make, limits.break_, limits.continuous, f"{designation} at {format_si(volts, 'V')}"))
                break
    for cat in rating.categories:
        if current_kind and cat.current_kind != current_kind:
            continue
        if not voltage_covered(cat.voltage, volts):
            continue
        make, brk = category_limits(cat.category, cat.current)
        found.append(Limits(make, brk, cat.current, f"{_category(cat.category)} {format_si(cat.current, 'A')} at {format_si(cat.voltage, 'V')}"))
    if found:
        return found, ""
    scopes = [_pilot_scope(d) for d in rating.all_designations()]
    if rating.categories:
        scopes.append("a category rating covers its own AC/DC kind up to its voltage, IEC 60947-5-1")
    return [], f"rating {rating.text} has none for a {supply_text} supply ({'; '.join(scopes)})"


def _pilot_scope(designation: str) -> str:
    kind = "DC" if designation[:1].upper() in "NPQR" else "AC"
    article = "an" if kind == "AC" else "a"
    return f"{designation} is {article} {kind} rating up to {designation[1:]} V"


def over_limits(duty: Duty, limits: Limits) -> list[str]:
    """The figures of ``duty`` above ``limits``, as words for a message."""
    over = []
    for name, value, limit in (("make", duty.make, limits.make), ("break", duty.break_, limits.break_), ("continuous", duty.continuous, limits.continuous)):
        if limit is not None and _exceeds(value, limit):
            over.append(f"{name} {_amps(value)} > {_amps(limit)}")
    return over


def _limits_text(limits: Limits) -> str:
    parts = [f"{name} {_amps(v)}" for name, v in (("make", limits.make), ("break", limits.break_), ("continuous", limits.continuous)) if v is not None]
    return f"{limits.text} allows {', '.join(parts)}"


# ---------------------------------------------------------------------------
# Motors and heaters
# ---------------------------------------------------------------------------


_SQRT3 = math.sqrt(3.0)


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
        table = _table_current(motor, sp.power)[0]
        return max(sp.fla.value if sp.fla else 0.0, table or 0.0)

    chosen = max(speeds, key=size)
    return chosen.power, chosen.fla, f"motor {motor.tag} at its largest speed ({chosen.name})"


def _table_current(motor: Device, power: Quantity | None) -> tuple[float | None, str]:
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
    table, why = _table_current(motor, power)
    nameplate = fla.value if isinstance(fla, Quantity) else None
    value = controller_full_load_current(table, nameplate)
    if value is None:
        return None, f"it has no nameplate fla and {why}"
    if table is None or (nameplate is not None and nameplate > table):
        return value, "nameplate" + (f", above {why} ({_amps(table)})" if table is not None else "")
    return value, why


def role_factor(contactor: Device) -> tuple[float, str]:
    """Share of the motor's line current a contactor of a wye-delta starter
    carries (common practice): line and delta contactors the phase current
    FLA / sqrt(3), the star contactor FLA / 3."""
    role = contactor.get("role")
    if role in ("line", "delta"):
        return 1 / _SQRT3, f"{role} contactor of a wye-delta starter: FLA / sqrt(3)"
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
        return current * factor, f"{_amps(current)} ({source}) x {factor:.3f}, {why}"
    if device.kind == "heater":
        power, volts, phases = device.get("power"), device.get("voltage"), device.get("phases")
        if not isinstance(power, Quantity) or not isinstance(volts, Quantity) or phases not in (1, 3) or volts.value <= 0:
            return None, "it lacks power, voltage or phases"
        current = heater_current(power.value, volts.value, phases)
        return current, f"{power.text} at {volts.text} {phases}-phase"
    return None, ""


# ---------------------------------------------------------------------------
# contact-rating
# ---------------------------------------------------------------------------


def _served_figures(ctx, element: Element) -> list[tuple[Supply, list[LoadFigures]]]:
    """The loads ``element`` serves, with their figures, grouped by supply in
    file order; loads with no supply or no figures are passed by."""
    groups: dict[str, tuple[Supply, list[LoadFigures]]] = {}
    for load in ctx.circuit.served_loads(element):
        device = ctx.devices.get(load.tag)
        supply = ctx.circuit.supply_of(load)
        if device is None or supply is None:
            continue
        figures = load_figures(device, supply.voltage.value)
        if figures is None:
            continue
        if any(f.tag == figures.tag for f in groups.get(supply.name, (None, []))[1]):
            continue  # the same device twice (two coils) counts once; coil-duplicate reports it
        groups.setdefault(supply.name, (supply, []))[1].append(figures)
    return list(groups.values())


def _check_contact(ctx, element: Element, device: Device, what: str = "contact") -> Iterator[Finding]:
    # A motor-protective breaker's ``rating`` is its frame current; its contacts have ``contact_rating``.
    field = "contact_rating" if device.kind == "motor-breaker" else "rating"
    rating = device.get(field)
    if not isinstance(rating, ContactRating):
        return
    for supply, figures in _served_figures(ctx, element):
        duty = contact_duty(figures)

        def duty_text() -> str:  # worded only for a finding: most contacts pass
            loads = _names([f.tag for f in figures])
            return (
                f"{what} {element.text} serves {loads} on supply {supply.name} ({_volts_text(supply)}): "
                f"make {_amps(duty.make)}, break {_amps(duty.break_)}, continuous {_amps(duty.continuous)}"
            )

        candidates, why_not = rating_limits(rating, supply.voltage.value, supply.current_kind)
        if not candidates:
            if why_not:
                yield Finding(
                    at=element.loc,
                    message=f"{duty_text()}; {device.tag}'s {why_not}: use {_article_of(what)} {what} rated for this supply",
                    subject=_subject(ctx, element),
                )
            continue
        if any(not over_limits(duty, limits) for limits in candidates):
            continue
        best = max(candidates, key=lambda lim: (lim.break_ if lim.break_ is not None else math.inf, lim.make or 0.0))
        over = over_limits(duty, best)
        yield Finding(
            at=element.loc,
            message=(
                f"{duty_text()}; {device.tag}'s {field.replace('_', ' ')} {_limits_text(best)} ({'; '.join(over)}): "
                f"drive the loads through an interposing relay or use {_article_of(what)} {what} of higher rating"
            ),
            subject=_subject(ctx, element),
        )


def _article_of(what: str) -> str:
    return "an" if what[:1].lower() in "aeio" else "a"


def _check_plc_output(ctx, element: Element, device: Device) -> Iterator[Finding]:
    """A PLC output is checked as a contact: a plain current is a resistive
    rating (it must make the loads' inrush and carry their sealed current),
    a relay output may give its pilot-duty or category rating instead; and
    the supply may not be above its rated voltage."""
    rated_v = device.get("voltage")
    if isinstance(rated_v, Quantity):
        for supply, figures in _served_figures(ctx, element):
            if _exceeds(supply.voltage.value, rated_v.value):
                yield Finding(
                    at=element.loc,
                    message=(
                        f"PLC output {element.text} is rated {rated_v.text} and switches {_names([f.tag for f in figures])} "
                        f"on supply {supply.name} ({_volts_text(supply)}): use an output rated for that voltage or an interposing relay"
                    ),
                    subject=_subject(ctx, element),
                )
    yield from _check_contact(ctx, element, device, "PLC output")


def _categories_text(categories) -> str:
    return ", ".join(f"{_category(c.category)} {_amps(c.current)} at {format_si(c.voltage, 'V')}" for c in categories)


def _check_power_poles(ctx, contactor: Device) -> Iterator[Finding]:
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
    what = f"{_amps(current)} of {target.kind} {target.tag} ({source})"
    if not power_rating.categories:
        return
    wanted = _MOTOR_CATEGORIES if target.kind == "motor" else _HEATER_CATEGORIES
    volts = target.get("voltage")
    applicable = [
        c for c in power_rating.categories
        if _category(c.category) in wanted and c.current_kind == "AC"
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
    if _exceeds(current, best.current):
        yield Finding(
            at=contactor.loc,
            message=(
                f"{contactor.kind} {contactor.tag} main poles rated {_category(best.category)} {_amps(best.current)} "
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
        if current is not None and size_current is not None and _exceeds(current, size_current):
            yield Finding(
                at=contactor.loc,
                message=f"{name}, {_amps(size_current)} continuous (NEMA ICS 2), below the {_amps(current)} of heater {target.tag} ({source}): use a larger size",
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
    if _exceeds(current, size_amps):
        yield Finding(
            at=contactor.loc,
            message=(
                f"{name}, rated {max_hp:g} hp at {column} (NEMA ICS 2; {_amps(size_amps)} by NEC Table 430.250), "
                f"below the {_amps(current)} of {label} ({source}): use a larger size"
            ),
            subject=contactor.tag,
        )


def check_contact_rating(ctx) -> Iterator[Finding]:
    for element in ctx.schematic.elements:
        device = ctx.devices.get(element.tag)
        if device is None:
            continue
        if element.role == "contact":
            yield from _check_contact(ctx, element, device)
        elif element.role == "output" and device.kind == "plc-output":
            yield from _check_plc_output(ctx, element, device)
    for device in ctx.devices.values():
        if device.kind in _CONTACTOR_KINDS:
            yield from _check_power_poles(ctx, device)


# ---------------------------------------------------------------------------
# overload-setting
# ---------------------------------------------------------------------------


def _protected_motors(ctx) -> dict[str, list[tuple[Device, Device]]]:
    """Overload tag -> (contactor, motor) pairs for each contactor or starter
    naming it as its overload relay and feeding a motor, one per motor and
    speed. Built once per schematic, so the rule stays linear in the device
    count."""
    by_overload: dict[str, list[tuple[Device, Device]]] = {}
    seen: set[tuple[str, str, str | None]] = set()
    for device in ctx.devices.values():
        overload = device.tag if device.kind == "motor-breaker" else device.get("overload")  # its own overload
        if device.kind not in (*_CONTACTOR_KINDS, "motor-breaker") or not isinstance(overload, str):
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
            f"{'overload' if overload.kind == 'overload' else 'motor-protective breaker'} {overload.tag} is set at {_amps(setting.value)}, an ultimate trip current of {_amps(trip)} "
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
    share, share_text = (1 / _SQRT3, " x 1/sqrt(3) in the phase leads of a wye-delta motor") if phase else (1.0, "")
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
        base = f"{dial}; {label}'s nameplate full-load current is {_amps(fla.value)}{share_text}"
        if _exceeds(trip, limit):
            yield Finding(
                at,
                f"{base}, and {fraction * 100:.0f} % of {_amps(full)} is {_amps(limit)} ({_why_fraction(motor, fraction)}; {clause}): "
                f"set the dial at most {_amps(limit / (trip / overload.get('setting').value))}{allowance_note}",
                overload.tag,
            )
        elif _exceeds(full, trip):
            yield Finding(
                at,
                f"{base}: a trip current below 100 % of {_amps(full)} trips in normal running; set the dial so that it trips between {_amps(full)} and {_amps(limit)}",
                overload.tag,
                Severity.WARNING,
            )
        return
    table, why = _table_current(motor, power)
    if table is not None:
        full = table * share
        limit, fraction = overload_limit(full, sf, rise, allowance)
        if _exceeds(trip, limit):
            yield Finding(
                at,
                f"{dial}, above {fraction * 100:.0f} % ({_amps(limit)}) even of the table current {_amps(full)} ({why}{share_text}; {clause}), "
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


# ---------------------------------------------------------------------------
# motor-overload
# ---------------------------------------------------------------------------

# Device kinds that protect the motor they feed (a drive or soft starter
# with its own motor overload function, a motor-protective breaker).
PROTECTIVE_FEEDERS = ("drive", "soft-starter", "motor-breaker")
# Of those, the ones whose protection also covers a contactor feeding the
# same motor: a motor breaker sits in series with its contactor, and a soft
# starter's bypass contactor is wired back through the starter's protection
# (common practice). A drive's bypass contactor runs the motor with the
# drive out of circuit, so it needs an overload relay of its own.
_COVERS_CONTACTORS = ("soft-starter", "motor-breaker")


def _alternative(contactor: Device, feeders: list[Device]) -> bool:
    """Whether ``contactor`` runs the motor instead of another feeder (the
    other direction of a reversing pair, another speed) rather than in
    series with it. The format draws no power circuit; alternatives are
    interlocked (``interlock`` names one or the other), series contactors
    (the redundant pair of a safety circuit) are not."""
    if contactor.get("interlock") or contactor.get("speed"):
        return True
    return any(d.get("interlock") == contactor.tag for d in feeders)


def check_motor_overload(ctx) -> Iterator[Finding]:
    """A contactor or starter that feeds a motor has an overload relay, or
    the motor is protected otherwise (NEC 430.32)."""
    feeders: dict[str, list[Device]] = {}
    for device in ctx.devices.values():
        fed = device.get("feeds")
        if isinstance(fed, str):
            feeders.setdefault(fed, []).append(device)
    for contactor in ctx.devices.values():
        if contactor.kind not in _CONTACTOR_KINDS or isinstance(contactor.get("overload"), str):
            continue
        motor = ctx.devices.get(contactor.get("feeds") or "")
        if motor is None or motor.kind != "motor" or motor.get("protection") == "integral":
            continue
        others = feeders.get(motor.tag, [])
        if any(d.kind in _COVERS_CONTACTORS for d in others):
            continue
        bypass = any(d.kind in PROTECTIVE_FEEDERS for d in others)
        protected = any(isinstance(d.get("overload"), str) for d in others)
        if protected and contactor.get("role") in ("star", "delta"):
            continue  # a wye-delta starter's overload sits with its line contactor
        if protected and not _alternative(contactor, others):
            continue  # a second contactor in series (a monitored safety pair): the overload drops the first

        if bypass:
            yield Finding(
                at=contactor.loc,
                message=(
                    f"{contactor.kind} {contactor.tag} feeds motor {motor.tag}, which a drive also feeds, and names no overload "
                    f"relay: running through {contactor.tag} (a bypass) the drive is out of circuit and does not protect the "
                    f"motor (NEC 430.32); fit an overload relay for the bypass path (overload: OL..)"
                ),
                subject=contactor.tag,
            )
            continue
        yield Finding(
            at=contactor.loc,
            message=(
                f"{contactor.kind} {contactor.tag} feeds motor {motor.tag} and names no overload relay, and the motor is "
                f"not marked protection: integral: an unprotected motor burns on a stall or a lost phase (NEC 430.32); "
                f"fit an overload relay (overload: OL..) in series with the coil"
            ),
            subject=contactor.tag,
        )


# ---------------------------------------------------------------------------
# control-transformer
# ---------------------------------------------------------------------------


# Output / input power of a DC power supply where it gives no efficiency
# (common practice, CHECK-VALUES.md).
DEFAULT_EFFICIENCY = 0.85


@dataclass
class SourceLoad:
    """What one source device (a control transformer or a DC power supply)
    carries in one file, or summed over the files of a run: each load by a
    key that is the same for a device of a shared file wherever it is drawn
    ((sealed VA, inrush VA, sealed A)), and the groups of loads that close
    together (one contact's served loads, the loads on at power return)."""

    loads: dict[str, list[float]]
    groups: list[list[str]]
    files: list[str]

    def merge(self, other: "SourceLoad") -> None:
        for key, figures in other.loads.items():
            self.loads.setdefault(key, figures)
        self.groups.extend(other.groups)
        self.files.extend(f for f in other.files if f not in self.files)


def worst_inrush(load: SourceLoad) -> tuple[float, list[str]]:
    """The largest inrush the source must deliver: over every group of loads
    that close together (every single load being one too), the group's
    inrush plus the sealed VA of every other load (common practice)."""
    sealed = sum(f[0] for f in load.loads.values())
    best, best_group = 0.0, []
    for group in [*load.groups, *([k] for k in load.loads)]:
        members = [k for k in dict.fromkeys(group) if k in load.loads]
        if not members:
            continue
        total = sealed + sum(load.loads[k][1] - load.loads[k][0] for k in members)
        if total > best:
            best, best_group = total, members
    return best, best_group


def _load_key(ctx, device: Device) -> str:
    """A load's key: the device's own file and tag, so that a device of a
    shared device file is one load wherever it is drawn."""
    return f"{device.origin or ctx.schematic.path}\0{device.tag}"


def _label(key: str) -> str:
    return key.rsplit("\0", 1)[-1]


def _supplies_fed_by(ctx, tag: str) -> list[Supply]:
    return [s for s in ctx.schematic.supplies.values() if s.source == tag]


def _source_load(ctx, source: Device, with_groups: bool) -> SourceLoad:
    """The loads of this file on the supplies ``source`` feeds; for a
    transformer also the input of each DC power supply it feeds
    (output / efficiency, 0.85 where not given)."""
    supplies = {s.name for s in _supplies_fed_by(ctx, source.tag)}
    loads: dict[str, list[float]] = {}
    keys_by_index: dict[int, str] = {}
    if supplies:
        for load in ctx.circuit.loads:
            supply = ctx.circuit.supply_of(load)
            device = ctx.devices.get(load.tag)
            if supply is None or supply.name not in supplies or device is None:
                continue
            found = load_figures(device, supply.voltage.value)
            if found is None:
                continue
            key = _load_key(ctx, device)
            keys_by_index[load.index] = key
            loads.setdefault(key, [found.sealed_va, found.inrush_va, found.sealed_a])
    if source.kind == "transformer":
        for ps in ctx.devices.values():
            if ps.kind != "power-supply" or ps.get("source") != source.tag:
                continue
            output = _source_load(ctx, ps, False)
            watts = sum(f[0] for f in output.loads.values())
            if watts > 0:
                efficiency = ps.get("efficiency")
                va = watts / (efficiency if isinstance(efficiency, float) else DEFAULT_EFFICIENCY)
                loads[f"{ctx.schematic.path}\0{ps.tag} input"] = [va, va, 0.0]
    groups: list[list[str]] = []
    if with_groups and keys_by_index:
        seen: set[tuple[str, ...]] = set()
        for element in ctx.schematic.elements:
            if element.role not in ("contact", "output"):
                continue
            group = tuple(sorted({keys_by_index[l.index] for l in ctx.circuit.served_loads(element) if l.index in keys_by_index}))
            if len(group) > 1 and group not in seen:
                seen.add(group)
                groups.append(list(group))
        simulator = ctx.circuit.simulator()
        if simulator.reset().settled:  # the loads that come on together at power return
            on = tuple(sorted({keys_by_index[l.index] for l in ctx.circuit.loads if l.index in keys_by_index and simulator.state_of(l.tag)}))
            if len(on) > 1 and on not in seen:
                groups.append(list(on))
    return SourceLoad(loads, groups, [ctx.schematic.path])


def _source_findings(source_kind: str, tag: str, at: Location, rating, inrush_rating, load: SourceLoad, output_v: float | None = None) -> Iterator[Finding]:
    """Findings of one source device against its summed load."""
    if not load.loads:
        return
    where = f" across {len(load.files)} schematics ({_names([os.path.basename(f) for f in load.files])})" if len(load.files) > 1 else ""
    if source_kind == "power-supply":
        amps = sum(f[2] for f in load.loads.values())
        if rating is not None and _exceeds(amps, rating):
            loads = _names([f"{_label(k)} {_amps(f[2])}" for k, f in load.loads.items()])
            yield Finding(
                at=at,
                message=f"power supply {tag} rated {_amps(rating)} carries {_amps(amps)}{where} ({loads}): use a larger power supply or split its loads",
                subject=tag,
            )
        return
    sealed = sum(f[0] for f in load.loads.values())
    if rating is not None and _exceeds(sealed, rating):
        loads = _names([f"{_label(k)} {format_si(f[0], 'VA')}" for k, f in load.loads.items()])
        yield Finding(
            at=at,
            message=(
                f"transformer {tag} rated {format_si(rating, 'VA')} carries {format_si(sealed, 'VA')} sealed{where} "
                f"({loads}): use a larger transformer or move loads to another supply"
            ),
            subject=tag,
        )
    if inrush_rating is not None:
        inrush, group = worst_inrush(load)
        if _exceeds(inrush, inrush_rating):
            making = sum(load.loads[k][1] for k in group)
            yield Finding(
                at=at,
                message=(
                    f"transformer {tag} inrush rating {format_si(inrush_rating, 'VA')} is below {format_si(inrush, 'VA')}{where}: "
                    f"{_names([_label(k) for k in group])} pulling in together at {format_si(making, 'VA')} while the other loads "
                    f"hold {format_si(inrush - making, 'VA')} sealed: use a transformer with a higher inrush rating"
                ),
                subject=tag,
            )


def _sources(ctx) -> Iterator[Device]:
    for device in ctx.devices.values():
        if device.kind in ("transformer", "power-supply"):
            yield device


def _figure(device: Device, name: str) -> float | None:
    value = device.get(name)
    return value.value if isinstance(value, Quantity) else None


def check_control_transformer(ctx) -> Iterator[Finding]:
    """Sources defined in this file; those of a shared device file are
    summed over the run by ``combine_control_transformer``."""
    for source in _sources(ctx):
        if source.origin and source.origin != ctx.schematic.path:
            continue
        rating, inrush_rating = _figure(source, "rating"), _figure(source, "inrush_rating")
        if rating is None and inrush_rating is None:
            continue
        load = _source_load(ctx, source, inrush_rating is not None and source.kind == "transformer")
        yield from _source_findings(source.kind, source.tag, source.loc, rating, inrush_rating, load)


def collect_control_transformer(ctx) -> dict | None:
    """Per file, the loads on sources defined in a shared device file."""
    out = {}
    for source in _sources(ctx):
        if not source.origin or source.origin == ctx.schematic.path:
            continue
        rating, inrush_rating = _figure(source, "rating"), _figure(source, "inrush_rating")
        if rating is None and inrush_rating is None:
            continue
        load = _source_load(ctx, source, inrush_rating is not None and source.kind == "transformer")
        if not load.loads:
            continue
        at = source.loc
        out[f"{source.origin}\0{source.tag}"] = {
            "kind": source.kind, "tag": source.tag, "path": at.path, "line": at.line, "column": at.column,
            "rating": rating, "inrush_rating": inrush_rating,
            "loads": load.loads, "groups": load.groups, "files": load.files,
        }
    if not out:
        return None
    return {"sources": out, "device_files": sorted({k.rsplit("\0", 1)[0] for k in out}), "path": ctx.schematic.path}


def combine_control_transformer(data: list[dict]) -> Iterator[Finding]:
    summed: dict[str, tuple[dict, SourceLoad]] = {}
    for item in data:
        for key, src in item.get("sources", {}).items():
            load = SourceLoad(dict(src["loads"]), [list(g) for g in src["groups"]], list(src["files"]))
            if key in summed:
                summed[key][1].merge(load)
            else:
                summed[key] = (src, load)
    for key in sorted(summed):
        src, load = summed[key]
        at = Location(src["path"], src["line"], src["column"])
        yield from _source_findings(src["kind"], src["tag"], at, src["rating"], src["inrush_rating"], load)


# ---------------------------------------------------------------------------
# transformer-protection
# ---------------------------------------------------------------------------


def transformer_fuse_limits(rating_va: float, primary_v: float | None, secondary_v: float | None, secondary_fused: bool) -> dict[str, tuple[float | None, str]]:
    """Largest primary and secondary fuse of a control transformer, with the
    clause behind each (NEC 430.72(C)(4), Table 450.3(B))."""
    limits: dict[str, tuple[float | None, str]] = {}
    if primary_v:
        limits["primary"] = transformer_primary_limit(rating_va, primary_v, secondary_fused)
    if secondary_v and rating_va > 0 and secondary_v > 0:
        limits["secondary"] = transformer_secondary_limit(rating_va, secondary_v)
    return limits


def check_transformer_protection(ctx) -> Iterator[Finding]:
    sources = {s.source for s in ctx.schematic.supplies.values() if s.source}
    sources |= {d.get("source") for d in ctx.devices.values() if d.kind == "power-supply" and d.get("source")}
    for transformer in ctx.devices.values():
        if transformer.kind != "transformer":
            continue
        if transformer.origin and transformer.origin != ctx.schematic.path and transformer.tag not in sources:
            continue  # a shared transformer is checked where a schematic uses it
        rating = transformer.get("rating")
        if not isinstance(rating, Quantity) or rating.value <= 0:
            continue
        fuses = [ctx.devices[t] for t in transformer.get("fuses") or [] if t in ctx.devices]
        primary = [f for f in fuses if f.get("side") == "primary"]
        secondary = [f for f in fuses if f.get("side") == "secondary"]
        class2, integral = transformer.get("class2") is True, transformer.get("integral") is True
        if transformer.tag in sources and not primary and primary_fuse_required(rating.value, class2, integral):
            small = rating.value < 50
            yield Finding(
                at=transformer.loc,
                message=(
                    f"control transformer {transformer.tag} ({format_si(rating.value, 'VA')}) has no primary fuse and is "
                    + ("marked integral, but only one under 50 VA may go without (NEC 430.72(C)(3))" if integral else
                       "not marked class2: true (NEC 430.72(C)(1))" + (" nor integral: true (under 50 VA, integral to the controller and inside its enclosure, 430.72(C)(3))" if small else ""))
                    + ": list its primary fuses under 'fuses' with side: primary"
                ),
                subject=transformer.tag,
            )
        if class2:
            continue  # protected as its listing says (430.72(C)(1))
        primary_v, secondary_v = transformer.get("primary"), transformer.get("secondary")
        limits = transformer_fuse_limits(
            rating.value,
            primary_v.value if isinstance(primary_v, Quantity) else None,
            secondary_v.value if isinstance(secondary_v, Quantity) else None,
            bool(secondary),
        )
        for side, side_fuses in (("primary", primary), ("secondary", secondary)):
            limit, clause = limits.get(side, (None, ""))
            if limit is None:
                continue
            for fuse in side_fuses:
                fuse_rating = fuse.get("rating")
                if isinstance(fuse_rating, Quantity) and _exceeds(fuse_rating.value, limit):
                    yield Finding(
                        at=fuse.loc,
                        message=(
                            f"{side} {fuse.kind} {fuse.tag} of transformer {transformer.tag} "
                            f"({format_si(rating.value, 'VA')}) is rated {_amps(fuse_rating.value)}, above the "
                            f"{_amps(limit)} allowed ({clause}): fit a smaller {fuse.kind}"
                        ),
                        subject=fuse.tag,
                    )


# ---------------------------------------------------------------------------
# vacuum-contactor
# ---------------------------------------------------------------------------


def check_vacuum_contactor(ctx) -> Iterator[Finding]:
    for contactor in ctx.devices.values():
        if contactor.kind not in _CONTACTOR_KINDS or contactor.get("vacuum") is True:
            continue
        target = ctx.devices.get(contactor.get("feeds") or "")
        if target is None:
            continue
        current, source = feed_current(target, contactor)
        if current is not None and _exceeds(current, VACUUM_THRESHOLD_A):
            yield Finding(
                at=contactor.loc,
                message=(
                    f"{contactor.kind} {contactor.tag} switches the {_amps(current)} of {target.kind} {target.tag} ({source}), above "
                    f"{_amps(VACUUM_THRESHOLD_A)}: a vacuum contactor is often preferred there for contact life and arc "
                    f"interruption (common practice, no code requirement; air-break starters are made up to NEMA size 9); "
                    f"set vacuum: true if it is one"
                ),
                subject=contactor.tag,
            )


# ---------------------------------------------------------------------------
# inductive-on-electronic-output
# ---------------------------------------------------------------------------


class _DirectLinks:
    """Which wires join without a load, a relay contact or a rail between them.

    RULES.md: an output drives a load *directly* when no relay contact lies
    between them. Between the output and the load on an energizing path
    there is no other load and no rail (a simple path meets each rail only
    at its end), so the output reaches the load directly when one of its
    non-rail terminals joins one of the load's non-rail terminals through
    elements that are none of: loads, contacts of a relay, timer, contactor
    or starter, elements touching a rail, and PLC outputs (the output
    itself must not count as its own link). One union-find over the
    circuit, built once: linear in its size.
    """

    def __init__(self, ctx):
        self.rails = ctx.circuit.rails
        self.sets = WireSets()
        for el in ctx.schematic.elements:
            if el.role in ("", None, "load", "output") or el.left in self.rails or el.right in self.rails:
                continue
            device = ctx.devices.get(el.tag)
            if el.role == "contact" and device is not None and device.kind in _COIL_KINDS:
                continue
            self.sets.join(el.left, el.right)
        self.find = self.sets.find

    def direct(self, output: Element, load: Element) -> bool:
        ends = {self.find(w) for w in (load.left, load.right) if w not in self.rails}
        return any(self.find(w) in ends for w in (output.left, output.right) if w not in self.rails)


def check_inductive_on_electronic_output(ctx) -> Iterator[Finding]:
    links: _DirectLinks | None = None
    for element in ctx.schematic.elements:
        device = ctx.devices.get(element.tag)
        if element.role != "output" or device is None or device.kind != "plc-output":
            continue
        if device.get("output") not in ("transistor", "triac") or device.get("suppressed") is True:
            continue
        loads = []
        for load in ctx.circuit.served_loads(element):
            load_device = ctx.devices.get(load.tag)
            if not load.inductive or load_device is None or load_device.get("suppressed") is True:
                continue
            if links is None:
                links = _DirectLinks(ctx)
            if not links.direct(element, load):
                continue  # a relay contact lies between the output and this load (RULES.md)
            if load.text not in loads:
                loads.append(load.text)
        if loads:
            yield Finding(
                at=element.loc,
                message=(
                    f"{device.get('output')} output {element.text} switches inductive load{'s' if len(loads) > 1 else ''} "
                    f"{_names(loads)} directly with no suppressor: the turn-off voltage spike can destroy the output; "
                    f"fit a suppressor (suppressed: true) or drive an interposing relay"
                ),
                subject=_subject(ctx, element),
            )


# ---------------------------------------------------------------------------
# Registration
# ---------------------------------------------------------------------------

_SUPPLY = """supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
"""

RULES = [
    Rule(
        name="contact-rating",
        severity=Severity.ERROR,
        summary="a contact, PLC output or contactor's main poles carry more than their rating",
        doc=(
            "A contact that makes more inrush current than it is rated for welds; one that breaks more "
            "than its rating draws an arc that burns it away; one that carries more than its continuous "
            "rating overheats. The duty of one contact is the sum over the loads it serves, all assumed on "
            "together: inrush (VA / V of its supply) to make, sealed current to break and carry. A pilot-duty "
            "rating (NEMA ICS 5) gives make, break and continuous current at the supply voltage (below 120 VAC "
            "the make current as at 120 V and break VA / V up to the continuous current; DC up to 300 V VA / V "
            "up to the continuous current); category entries (IEC 60947-5-1) of the supply's AC/DC kind whose "
            "voltage covers the supply's (AC-15 makes 10 x Ie and breaks Ie, AC-14 makes 6 x Ie, DC-13 makes "
            "and breaks Ie, DC-14 makes 10 x Ie); a rating list such as [A600, Q300] covers each kind of supply "
            "by its own designation; a plain current is a resistive rating (make = break = continuous). A PLC "
            "output's rated current must make the inrush and carry the sealed current, at no more than its "
            "rated voltage. A contactor's main poles: a NEMA size is rated in horsepower at the motor's voltage "
            "(NEMA ICS 2, NEC 430.83(A)), its continuous current serving non-motor loads; an AC-3 rating must "
            "cover the controller full-load current (NEC Table 430.250/430.248, or the nameplate where larger, "
            "430.6(A)(1)); an AC-1 rating a heater's current. The line and delta contactors of a wye-delta "
            "starter carry FLA / sqrt(3), its star contactor FLA / 3. These are US NEC/NEMA and IEC figures, "
            "partly from memory; other codes (CEC, local rules) may differ."
        ),
        source="NEMA ICS 5 (pilot duty); IEC 60947-5-1 (AC-14, AC-15, DC-13, DC-14); IEC 60947-4-1 (AC-1, AC-3); NEMA ICS 2 (sizes by horsepower); NEC 430.6(A)(1), 430.83(A), Tables 430.250 and 430.248",
        check=check_contact_rating,
        failing=Example(
            "a D150 pushbutton contact makes a 600 VA solenoid: 5 A inrush, D150 makes 3.6 A at 120 V",
            _SUPPLY + """devices:
  PB1: {kind: pushbutton, rating: D150}
  SOL1: {kind: solenoid, voltage: 120 VAC, inrush: 600 VA, sealed: 60 VA}
rungs:
  - paths: [[L1, PB1.NO, 1, SOL1, X2]]
""",
        ),
        passing=Example(
            "a B600 relay contact drives the solenoid: B600 makes 30 A, breaks 3 A at 120 V",
            _SUPPLY + """devices:
  CR1: {kind: relay, coil: 120 VAC, sealed: 10 VA, rating: B600}
  SOL1: {kind: solenoid, voltage: 120 VAC, inrush: 600 VA, sealed: 60 VA}
rungs:
  - paths: [[L1, CR1.NO, 1, SOL1, X2]]
""",
        ),
    ),
    Rule(
        name="overload-setting",
        severity=Severity.ERROR,
        summary="an overload trips above NEC 430.32 (error), below full-load current (warning), or is unverified (info)",
        doc=(
            "A motor overload relay protects the windings from running overcurrent. NEC 430.32 limits its TRIP "
            "current, sized from the motor's NAMEPLATE full-load current (430.6(A)(2)): at most 125 % for a marked "
            "service factor of 1.15 or more or a marked temperature rise of 40 C or less, 115 % for any other motor "
            "(430.32(A)(1)); with `starting_allowance: true`, 140 % / 130 % (430.32(C)), an allowance that holds "
            "only where the lower setting cannot start the motor. The dial is not the trip current: a relay "
            "does not trip at 1.05 x its setting and trips at 1.20 x (IEC 60947-4-1), so the ultimate trip "
            "current is the setting x `trip_multiple` (default 1.20); a dial at the nameplate current suits an SF "
            "1.15 motor (1.20 <= 1.25) and about 0.9 x for SF 1.0 (1.08 <= 1.15). A trip current below 100 % of "
            "the full-load current trips in normal running (a warning). An overload with `in: phase` sits in the "
            "phase leads of a wye-delta motor and is checked against FLA / sqrt(3); a multi-speed motor at the "
            "speed its contactor names. A motor with no nameplate `fla` is never checked silently on the table: "
            "a setting above the limit even on the table current is an error, otherwise an info finding says it "
            "is not verified. These are US NEC figures; other codes (CEC, local rules) may differ."
        ),
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
    ),
    Rule(
        name="motor-overload",
        severity=Severity.ERROR,
        summary="a contactor feeds a motor that has no overload protection",
        doc=(
            "A motor without running overload protection burns on a stall, an overload or a lost phase; NEC "
            "430.32 requires it for continuous-duty motors. A contactor or starter that `feeds` a motor must name "
            "its `overload` relay, unless the motor is marked `protection: integral` (a thermal protector in the "
            "motor, 430.32(A)(2)) or is fed through a device that protects it. A motor-protective breaker or a soft "
            "starter covers the contactor with it; a drive does not cover a bypass contactor, which runs the motor with "
            "the drive out of circuit and needs its own overload relay. In a wye-delta starter "
            "the overload sits with the line contactor, so the star and delta contactors need none of their own; "
            "a second contactor in series with a protected one (the redundant pair of a safety circuit) needs "
            "none either. One that runs the motor instead of another (interlocked: the other direction, "
            "another speed) needs its own, so that a trip drops it. "
            "Changing `starter` to `contactor` does not take a motor out of this rule. These are US NEC figures; "
            "other codes (CEC, local rules) may differ."
        ),
        source="NEC (NFPA 70) 430.32(A)(1) and (A)(2)",
        check=check_motor_overload,
        failing=Example(
            "a contactor feeds a 30 hp motor with no overload relay",
            """devices:
  M1: {kind: contactor, coil: 120 VAC, feeds: MTR1}
  MTR1: {kind: motor, power: 30 hp, voltage: 460 V, phases: 3}
""",
        ),
        passing=Example(
            "a thermally protected motor",
            """devices:
  M1: {kind: contactor, coil: 120 VAC, feeds: MTR1}
  MTR1: {kind: motor, power: 1 hp, voltage: 460 V, phases: 3, protection: integral}
""",
        ),
    ),
    Rule(
        name="control-transformer",
        severity=Severity.ERROR,
        summary="a control transformer's loads exceed its VA rating, sealed or at inrush",
        doc=(
            "A control transformer sized below its loads overheats, and one that cannot deliver the inrush "
            "of a coil pulling in sags so far that the coil does not close (and other relays drop out). "
            "The sealed VA of every load on the supplies the transformer feeds (W for resistive loads and DC "
            "coils), all on together, plus the input of each DC power supply it feeds (`source` on the power "
            "supply; output / `efficiency`, 0.85 where not given), must not exceed its `rating`. Where it gives an "
            "`inrush_rating` (a maker's figure at about 40 % power factor), the inrush of the largest group of "
            "loads that close together (the loads one contact serves, or those that come on together at power "
            "return) plus the sealed VA of all the others must not exceed it. A transformer defined in a shared "
            "device file sums the loads of every schematic of the run that names it (a run on one file brings in "
            "the other schematics using that device file); its findings stand at its tag there. A DC power "
            "supply's loads above its `rating` (A) are a finding of this rule at the power supply."
        ),
        source="common practice (control transformer sizing: sum of sealed VA, largest inrush plus sealed)",
        check=check_control_transformer,
        collect=collect_control_transformer,
        combine=combine_control_transformer,
        failing=Example(
            "three loads of 60 + 10 + 50 = 120 VA sealed on a 100 VA transformer",
            """supplies:
  ctl: {hot: X1, common: X2, voltage: 120 VAC, source: T1}
devices:
  T1: {kind: transformer, primary: 480 V, secondary: 120 V, rating: 100 VA}
  M1: {kind: contactor, coil: 120 VAC, inrush: 600 VA, sealed: 60 VA}
  CR1: {kind: relay, coil: 120 VAC, inrush: 40 VA, sealed: 10 VA}
  SOL1: {kind: solenoid, voltage: 120 VAC, inrush: 300 VA, sealed: 50 VA}
""",
        ),
        passing=Example(
            "the same loads on a 150 VA transformer (with an inrush_rating, one contact making 600 + 300 VA while 10 VA is held needs 910 VA)",
            """devices:
  T1: {kind: transformer, primary: 480 V, secondary: 120 V, rating: 150 VA}
""",
        ),
    ),
    Rule(
        name="transformer-protection",
        severity=Severity.ERROR,
        summary="a control transformer lacks its primary fuse, or a fuse is above NEC 430.72(C) / 450.3(B)",
        doc=(
            "A control transformer's fuses protect the transformer and its wiring. A transformer that "
            "feeds a supply needs primary fuses unless it is marked `class2: true` (Class 2 or Class 1 "
            "power-limited, NEC 430.72(C)(1)) or `integral: true` with a rating under 50 VA (integral to the "
            "controller and inside its enclosure, 430.72(C)(3)); a small transformer marked neither needs them "
            "too. Where the "
            "rated primary current Ip = VA / V is under 2 A, each primary fuse may be up to 500 % of Ip "
            "(430.72(C)(4)), and that limit stands on its own. Otherwise Table 450.3(B): with a secondary "
            "fuse the primary may be up to 250 % of Ip; without one, 125 % where Ip >= 9 A (the next "
            "standard rating up allowed) and 167 % where Ip is 2 A to 9 A. A secondary fuse may be up to "
            "125 % of Is where Is >= 9 A (next standard rating allowed), 167 % where Is < 9 A. Fuses are "
            "the transformer's `fuses` list, each with its `side`."
        ),
        source="NEC (NFPA 70) 430.72(C)(1), (3) and (4), Table 450.3(B), 240.6(A); US NEC figures, other codes may differ",
        check=check_transformer_protection,
        failing=Example(
            "100 VA at 480 V: Ip 0.208 A, 500 % = 1.04 A; 2 A primary fuses are too large",
            """devices:
  T1: {kind: transformer, primary: 480 V, secondary: 120 V, rating: 100 VA, fuses: [FU1, FU2]}
  FU1: {kind: fuse, rating: 2 A, side: primary}
  FU2: {kind: fuse, rating: 2 A, side: primary}
""",
        ),
        passing=Example(
            "250 VA at 480 V: Ip 0.521 A, 500 % = 2.60 A; 2 A primary fuses pass",
            """devices:
  T1: {kind: transformer, primary: 480 V, secondary: 120 V, rating: 250 VA, fuses: [FU1, FU2]}
  FU1: {kind: fuse, rating: 2 A, side: primary}
  FU2: {kind: fuse, rating: 2 A, side: primary}
""",
        ),
    ),
    Rule(
        name="vacuum-contactor",
        severity=Severity.INFO,
        summary="a contactor switches more than 400 A in air (a preference, not a code requirement)",
        doc=(
            "Above about 400 A of load current vacuum contactors are often preferred for contact life and arc "
            "interruption; no code requires them, and air-break starters are made up to NEMA size 9, so this is "
            "information, not a warning. The load current is the controller full-load current (NEC Table "
            "430.250/430.248, or the nameplate where larger) times the contactor's share in a wye-delta starter, "
            "or the heater's current. Set `vacuum: true` on a vacuum contactor."
        ),
        source="common practice (contact life and arc interruption at high current)",
        check=check_vacuum_contactor,
        failing=Example(
            "200 hp 230 V motor: 480 A (NEC Table 430.250) through an air-break contactor",
            """devices:
  M1: {kind: starter, coil: 120 VAC, overload: OL1, feeds: MTR1}
  MTR1: {kind: motor, power: 200 hp, voltage: 230 V, phases: 3}
""",
        ),
        passing=Example(
            "the same motor through a vacuum contactor",
            """devices:
  M1: {kind: starter, coil: 120 VAC, overload: OL1, feeds: MTR1, vacuum: true}
  MTR1: {kind: motor, power: 200 hp, voltage: 230 V, phases: 3}
""",
        ),
    ),
    Rule(
        name="inductive-on-electronic-output",
        severity=Severity.WARNING,
        summary="a transistor or triac PLC output switches an unsuppressed inductive load directly",
        doc=(
            "When a coil, solenoid or horn is switched off, its stored energy drives a voltage spike that "
            "can break down a transistor or triac output, and its inrush stresses the output. Where such an "
            "output serves an inductive load directly (no relay contact between them), the load or the "
            "output must be `suppressed` (a diode, RC or varistor), or the output should drive an "
            "interposing relay whose contact switches the load. Relay outputs are not covered."
        ),
        source="common practice (relays isolate electronic outputs from inductive loads)",
        check=check_inductive_on_electronic_output,
        failing=Example(
            "a transistor output drives a solenoid valve",
            """supplies:
  dc: {hot: "+24", common: "0V", voltage: 24 VDC}
devices:
  Q0_1: {kind: plc-output, output: transistor, voltage: 24 VDC, rating: 0.5 A}
  SOL1: {kind: solenoid, voltage: 24 VDC, power: 8 W}
rungs:
  - paths: [["+24", Q0_1, 1, SOL1, "0V"]]
""",
        ),
        passing=Example(
            "the solenoid has a suppressor diode",
            """devices:
  SOL1: {kind: solenoid, voltage: 24 VDC, power: 8 W, suppressed: true}
""",
        ),
    ),
]


@hookimpl
def ctllint_rules():
    return RULES
