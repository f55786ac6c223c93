"""Ratings and protection: contacts, overloads, control transformers.

These rules compare what a device is rated for with what the circuit asks of
it. The figures come from the schematic (coil VA, lamp watts, nameplate
currents, fuse ratings) and from published tables held in
``ctllint.tables`` (NEC Tables 430.250 and 430.248, NEC 430.32, 430.72 and
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
  a contactor's main poles below the motor's full-load current (AC-3), a
  heater's current (AC-1) or a NEMA size's continuous current.
- ``overload-setting``: an overload relay set above NEC 430.32(A)(1) (error)
  or below the motor's full-load current (warning).
- ``control-transformer``: the loads of a transformer's supply beyond its VA
  rating, sealed and (with ``inrush_rating``) at inrush.
- ``transformer-protection``: control-transformer fuses missing or above
  NEC 430.72(C) and Table 450.3(B).
- ``vacuum-contactor``: a contactor switching more than 400 A in air.
- ``inductive-on-electronic-output``: a transistor or triac output driving an
  unsuppressed inductive load.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Iterator

from ctllint import hookimpl
from ctllint.api import Example, Finding, Rule
from ctllint.model import ContactRating, Device, Element, Quantity, Severity, Supply
from ctllint.quantities import format_si
from ctllint.wiresets import WireSets
from ctllint.tables import (
    OVERLOAD_FRACTION_LOW,
    VACUUM_THRESHOLD_A,
    category_limits,
    heater_current,
    motor_full_load_current,
    nema_size_current,
    overload_limit,
    pilot_duty_limits,
    primary_fuse_required,
    transformer_primary_limit,
    transformer_secondary_limit,
    voltage_covered,
)

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

    Pilot duty: NEMA ICS 5 figures at that voltage (``pilot_duty_limits``).
    Category list: each rating of the supply's AC/DC kind whose voltage
    covers the supply's (IEC 60947-5-1: AC-15 makes 10 x Ie and breaks Ie,
    DC-13 makes and breaks Ie, other categories make = break = Ie), any one
    of which may carry the duty. A plain current: continuous only. An empty
    list comes with the reason the rating does not cover the supply. A
    supply whose voltage leaves AC/DC open accepts either kind.
    """
    supply_text = format_si(volts, "V") + (f" {current_kind}" if current_kind else "")
    if rating.form == "thermal" and rating.current is not None:
        return [Limits(None, None, rating.current, f"{format_si(rating.current, 'A')} thermal")], ""
    if rating.form == "pilot-duty" and rating.designation:
        designation = rating.designation
        kinds = [current_kind] if current_kind else ["AC", "DC"]
        for kind in kinds:
            limits = pilot_duty_limits(designation, volts, kind)
            if limits is not None:
                return [Limits(limits.make, limits.break_, limits.continuous, f"{designation} at {format_si(volts, 'V')}")], ""
        return [], f"pilot-duty rating {designation} does not cover a {supply_text} supply (NEMA ICS 5: {_pilot_scope(designation)})"
    if rating.form == "category":
        found = []
        for cat in rating.categories:
            if current_kind and cat.current_kind != current_kind:
                continue
            if not voltage_covered(cat.voltage, volts):
                continue
            make, brk = category_limits(cat.category, cat.current)
            found.append(Limits(make, brk, cat.current, f"{_category(cat.category)} {format_si(cat.current, 'A')} at {format_si(cat.voltage, 'V')}"))
        if found:
            return found, ""
        return [], f"category rating {rating.text} has none for a {supply_text} supply (IEC 60947-5-1: a rating covers its own AC/DC kind up to its voltage)"
    return [], ""


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


def motor_full_load(motor: Device) -> tuple[float | None, str]:
    """A motor's full-load current and where it came from.

    The nameplate ``fla`` first, else NEC Table 430.250 (three-phase) or
    430.248 (single-phase) by power and voltage. Returns (None, why) where
    neither gives a figure: a finding, never a guess.
    """
    fla = motor.get("fla")
    if isinstance(fla, Quantity):
        return fla.value, "nameplate"
    power, volts, phases = motor.get("power"), motor.get("voltage"), motor.get("phases")
    table = "NEC Table 430.250" if phases == 3 else "NEC Table 430.248"
    if not isinstance(power, Quantity) or not isinstance(volts, Quantity):
        missing = " and ".join(n for n, v in (("power", power), ("voltage", volts)) if not isinstance(v, Quantity))
        return None, f"it has no nameplate fla and no {missing} to read {table} with"
    value = motor_full_load_current(power.value, volts.value, phases)
    if value is None:
        return None, f"{power.text} {volts.text} {phases}-phase is not in {table} and it has no nameplate fla"
    return value, f"{table}, {power.text} {volts.text}"


def feed_current(device: Device) -> tuple[float | None, str]:
    """Line current of what a contactor feeds: a motor's full-load current,
    or a heater's P / V (single-phase) or P / (sqrt(3) V) (three-phase)."""
    if device.kind == "motor":
        return motor_full_load(device)
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


def _check_contact(ctx, element: Element, device: Device) -> Iterator[Finding]:
    rating = device.get("rating")
    if not isinstance(rating, ContactRating):
        return
    for supply, figures in _served_figures(ctx, element):
        duty = contact_duty(figures)

        def duty_text() -> str:  # worded only for a finding: most contacts pass
            loads = _names([f.tag for f in figures])
            return (
                f"contact {element.text} serves {loads} on supply {supply.name} ({_volts_text(supply)}): "
                f"make {_amps(duty.make)}, break {_amps(duty.break_)}, continuous {_amps(duty.continuous)}"
            )

        candidates, why_not = rating_limits(rating, supply.voltage.value, supply.current_kind)
        if not candidates:
            if why_not:
                yield Finding(
                    at=element.loc,
                    message=f"{duty_text()}; {device.tag}'s {why_not}: use a contact rated for this supply",
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
                f"{duty_text()}; {device.tag}'s rating {_limits_text(best)} ({'; '.join(over)}): "
                f"drive the loads through an interposing relay or use a contact of higher rating"
            ),
            subject=_subject(ctx, element),
        )


def _check_plc_output(ctx, element: Element, device: Device) -> Iterator[Finding]:
    rating = device.get("rating")
    if not isinstance(rating, Quantity):
        return
    for supply, figures in _served_figures(ctx, element):
        sealed = sum(f.sealed_a for f in figures)
        if _exceeds(sealed, rating.value):
            yield Finding(
                at=element.loc,
                message=(
                    f"PLC output {element.text} rated {_amps(rating.value)} serves {_names([f.tag for f in figures])} "
                    f"on supply {supply.name} ({_volts_text(supply)}), sealed current {_amps(sealed)}: "
                    f"drive an interposing relay or use an output of higher rating"
                ),
                subject=_subject(ctx, element),
            )


def _categories_text(categories) -> str:
    return ", ".join(f"{_category(c.category)} {_amps(c.current)} at {format_si(c.voltage, 'V')}" for c in categories)


def _check_power_poles(ctx, contactor: Device) -> Iterator[Finding]:
    power_rating = contactor.get("power_rating")
    target = ctx.devices.get(contactor.get("feeds") or "")
    if power_rating is None or target is None or target.kind not in ("motor", "heater"):
        return
    current, source = feed_current(target)
    if current is None:
        return  # overload-setting reports a motor whose current cannot be told
    what = f"{_amps(current)} of {target.kind} {target.tag} ({source})"
    if power_rating.nema_size is not None:
        size_current = nema_size_current(power_rating.nema_size)
        if size_current is not None and _exceeds(current, size_current):
            yield Finding(
                at=contactor.loc,
                message=(
                    f"{contactor.kind} {contactor.tag} is NEMA size {power_rating.nema_size}, "
                    f"{_amps(size_current)} continuous (NEMA ICS 2), below the {what}: use a larger size"
                ),
                subject=contactor.tag,
            )
        return
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
    naming it as its overload relay and feeding a motor, one per motor.
    Built once per schematic, so the rule stays linear in the device count."""
    by_overload: dict[str, list[tuple[Device, Device]]] = {}
    seen: set[tuple[str, str]] = set()
    for device in ctx.devices.values():
        overload = device.get("overload")
        if device.kind not in _CONTACTOR_KINDS or not isinstance(overload, str):
            continue
        motor = ctx.devices.get(device.get("feeds") or "")
        if motor is None or motor.kind != "motor" or (overload, motor.tag) in seen:
            continue
        seen.add((overload, motor.tag))
        by_overload.setdefault(overload, []).append((device, motor))
    return by_overload


def _motors_protected_by(ctx, overload: Device, index: dict | None = None) -> list[tuple[Device, Device]]:
    """(contactor, motor) pairs for each contactor or starter naming
    ``overload`` as its overload relay and feeding a motor, one per motor."""
    return (index if index is not None else _protected_motors(ctx)).get(overload.tag, [])


def check_overload_setting(ctx) -> Iterator[Finding]:
    index = _protected_motors(ctx)
    for overload in ctx.devices.values():
        setting = overload.get("setting")
        if overload.kind != "overload" or not isinstance(setting, Quantity):
            continue
        for contactor, motor in _motors_protected_by(ctx, overload, index):
            fla, source = motor_full_load(motor)
            if fla is None:
                yield Finding(
                    at=overload.at("setting"),  # RULES.md: overload-setting findings are at the setting
                    message=(
                        f"overload {overload.tag} (set {_amps(setting.value)}) protects motor {motor.tag}, whose "
                        f"full-load current cannot be told: {source}; the setting cannot be checked against "
                        f"NEC 430.32(A)(1): give the motor's nameplate fla"
                    ),
                    subject=motor.tag,
                )
                continue
            service_factor = motor.get("service_factor")
            temp_rise = motor.get("temp_rise")
            limit, fraction = overload_limit(
                fla,
                service_factor if isinstance(service_factor, (int, float)) else None,
                temp_rise.value if isinstance(temp_rise, Quantity) else None,
            )
            if fraction == OVERLOAD_FRACTION_LOW:
                why = "no service factor of 1.15 or more and no temperature rise of 40 C or less marked"
            elif isinstance(service_factor, (int, float)) and overload_limit(fla, service_factor, None)[1] != OVERLOAD_FRACTION_LOW:
                why = f"service factor {service_factor:g}"
            else:
                why = f"temperature rise {temp_rise.text}"
            base = (
                f"overload {overload.tag} of {contactor.tag} is set at {_amps(setting.value)}; motor {motor.tag}'s "
                f"full-load current is {_amps(fla)} ({source})"
            )
            if _exceeds(setting.value, limit):
                yield Finding(
                    at=overload.at("setting"),
                    message=(
                        f"{base}, and {fraction * 100:.0f} % of it is {_amps(limit)} ({why}; NEC 430.32(A)(1)): "
                        f"set it at most {_amps(limit)}"
                    ),
                    subject=overload.tag,
                )
            elif _exceeds(fla, setting.value):
                yield Finding(
                    at=overload.at("setting"),
                    message=f"{base}: below 100 %, it will trip in normal running; set it between {_amps(fla)} and {_amps(limit)}",
                    subject=overload.tag,
                    severity=Severity.WARNING,
                )


# ---------------------------------------------------------------------------
# control-transformer
# ---------------------------------------------------------------------------


def transformer_load(figures: list[LoadFigures]) -> tuple[float, LoadFigures | None, float]:
    """(sealed VA of all loads, the load with the largest inrush, that
    inrush plus the other loads' sealed VA)."""
    sealed = sum(f.sealed_va for f in figures)
    if not figures:
        return sealed, None, 0.0
    largest = figures[0]
    for f in figures[1:]:
        if f.inrush_va > largest.inrush_va:
            largest = f
    return sealed, largest, sealed - largest.sealed_va + largest.inrush_va


def _loads_of_transformer(ctx, transformer: Device) -> list[LoadFigures]:
    names = [s.name for s in ctx.schematic.supplies.values() if s.source == transformer.tag]
    figures, seen = [], set()
    for load in ctx.circuit.loads:
        supply = ctx.circuit.supply_of(load)
        device = ctx.devices.get(load.tag)
        if supply is None or supply.name not in names or device is None or load.tag in seen:
            continue
        found = load_figures(device, supply.voltage.value)
        if found is not None:
            seen.add(load.tag)
            figures.append(found)
    return figures


def check_control_transformer(ctx) -> Iterator[Finding]:
    for transformer in ctx.devices.values():
        if transformer.kind != "transformer":
            continue
        rating = transformer.get("rating")
        inrush_rating = transformer.get("inrush_rating")
        if not isinstance(rating, Quantity) and not isinstance(inrush_rating, Quantity):
            continue
        figures = _loads_of_transformer(ctx, transformer)
        if not figures:
            continue
        sealed, largest, inrush = transformer_load(figures)
        loads = _names([f"{f.tag} {format_si(f.sealed_va, 'VA')}" for f in figures])
        if isinstance(rating, Quantity) and _exceeds(sealed, rating.value):
            yield Finding(
                at=transformer.loc,
                message=(
                    f"transformer {transformer.tag} rated {format_si(rating.value, 'VA')} carries "
                    f"{format_si(sealed, 'VA')} sealed ({loads}): use a larger transformer or move loads to another supply"
                ),
                subject=transformer.tag,
            )
        if isinstance(inrush_rating, Quantity) and largest is not None and _exceeds(inrush, inrush_rating.value):
            yield Finding(
                at=transformer.loc,
                message=(
                    f"transformer {transformer.tag} inrush rating {format_si(inrush_rating.value, 'VA')} is below "
                    f"{format_si(inrush, 'VA')}: {largest.tag} pulling in at {format_si(largest.inrush_va, 'VA')} "
                    f"while the other loads hold {format_si(inrush - largest.inrush_va, 'VA')} sealed: "
                    f"use a transformer with a higher inrush rating"
                ),
                subject=transformer.tag,
            )


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
    for transformer in ctx.devices.values():
        if transformer.kind != "transformer":
            continue
        rating = transformer.get("rating")
        if not isinstance(rating, Quantity) or rating.value <= 0:
            continue
        fuses = [ctx.devices[t] for t in transformer.get("fuses") or [] if t in ctx.devices]
        primary = [f for f in fuses if f.get("side") == "primary"]
        secondary = [f for f in fuses if f.get("side") == "secondary"]
        if transformer.tag in sources and not primary and primary_fuse_required(rating.value):
            yield Finding(
                at=transformer.loc,
                message=(
                    f"control transformer {transformer.tag} ({format_si(rating.value, 'VA')}) has no primary fuse; "
                    f"only a transformer under 50 VA may go without (NEC 430.72(C)(3)): list its primary fuses "
                    f"under 'fuses' with side: primary"
                ),
                subject=transformer.tag,
            )
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
        current, source = feed_current(target)
        if current is not None and _exceeds(current, VACUUM_THRESHOLD_A):
            yield Finding(
                at=contactor.loc,
                message=(
                    f"{contactor.kind} {contactor.tag} switches the {_amps(current)} of {target.kind} {target.tag} ({source}), above "
                    f"{_amps(VACUUM_THRESHOLD_A)} in air: arc-flash hazard when switching; use a vacuum contactor "
                    f"(vacuum: true)"
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
            "rating (NEMA ICS 5) gives make, break and continuous current at the supply voltage; a "
            "category list (IEC 60947-5-1) uses the ratings of the supply's AC/DC kind whose voltage covers "
            "the supply's (AC-15 makes 10 x Ie and breaks Ie, DC-13 makes and breaks Ie); a plain current is "
            "a thermal rating and limits continuous current only. A PLC output's rating is compared with the "
            "sealed current it serves. A contactor's main poles need an AC-3 rating of at least the motor's "
            "full-load current (nameplate, else NEC Table 430.250/430.248), an AC-1 rating of at least a "
            "heater's current, or a NEMA size whose continuous current covers the load."
        ),
        source="NEMA ICS 5 (pilot duty); IEC 60947-5-1 (AC-15, DC-13); IEC 60947-4-1 (AC-1, AC-3); NEMA ICS 2 (sizes); NEC Tables 430.250 and 430.248",
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
        summary="an overload relay set above NEC 430.32(A)(1), or (warning) below the motor's full-load current",
        doc=(
            "A motor overload relay protects the motor's windings from running overcurrent. Set too high it "
            "lets the motor burn; NEC 430.32(A)(1) allows at most 125 % of the motor's full-load current for "
            "a marked service factor of 1.15 or more or a marked temperature rise of 40 C or less, and 115 % "
            "for any other motor (an error). Set below 100 % it trips in normal running (a warning). The "
            "full-load current is the motor's nameplate `fla`, else NEC Table 430.250 (three-phase) or "
            "430.248 (single-phase) by power and voltage; the motor is the one fed by the contactor or "
            "starter that names the overload. A motor that is in neither table and has no nameplate `fla` "
            "is reported rather than guessed."
        ),
        source="NEC (NFPA 70) 430.32(A)(1); NEC Tables 430.250 and 430.248",
        check=check_overload_setting,
        failing=Example(
            "30 hp 460 V motor (NEC Table 430.250: 40 A), no service factor marked: 115 % = 46 A, set 50 A",
            """devices:
  M1: {kind: starter, coil: 120 VAC, overload: OL1, feeds: MTR1}
  OL1: {kind: overload, setting: 50 A}
  MTR1: {kind: motor, power: 30 hp, voltage: 460 V, phases: 3}
""",
        ),
        passing=Example(
            "the same motor with service factor 1.15: 125 % = 50 A allowed",
            """devices:
  M1: {kind: starter, coil: 120 VAC, overload: OL1, feeds: MTR1}
  OL1: {kind: overload, setting: 50 A}
  MTR1: {kind: motor, power: 30 hp, voltage: 460 V, phases: 3, service_factor: 1.15}
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
            "coils), all on together, must not exceed its `rating`; where the transformer gives an "
            "`inrush_rating`, the largest inrush plus the other loads' sealed VA must not exceed it."
        ),
        source="common practice (control transformer sizing: sum of sealed VA, largest inrush plus sealed)",
        check=check_control_transformer,
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
            "the same loads on a 150 VA transformer",
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
            "feeds a supply needs primary fuses unless it is rated under 50 VA (NEC 430.72(C)(3)). Where the "
            "rated primary current Ip = VA / V is under 2 A, each primary fuse may be up to 500 % of Ip "
            "(430.72(C)(4)), and that limit stands on its own. Otherwise Table 450.3(B): with a secondary "
            "fuse the primary may be up to 250 % of Ip; without one, 125 % where Ip >= 9 A (the next "
            "standard rating up allowed) and 167 % where Ip is 2 A to 9 A. A secondary fuse may be up to "
            "125 % of Is where Is >= 9 A (next standard rating allowed), 167 % where Is < 9 A. Fuses are "
            "the transformer's `fuses` list, each with its `side`."
        ),
        source="NEC (NFPA 70) 430.72(C)(3) and (4), Table 450.3(B), 240.6(A)",
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
        severity=Severity.WARNING,
        summary="a contactor switches more than 400 A in air",
        doc=(
            "Switching large currents in air draws a large arc in the contactor's arc chutes; above about "
            "400 A of load current a vacuum contactor is preferred, since it contains the arc and lowers "
            "the arc-flash hazard. The load current is the motor's full-load current (nameplate, else NEC "
            "Table 430.250/430.248) or the heater's current. Set `vacuum: true` on a vacuum contactor."
        ),
        source="common practice (arc-flash hazard of air-break contactors above about 400 A)",
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
