"""A contact that makes more inrush current than it is rated for welds; one that breaks more than its
rating draws an arc that burns it away; one that carries more than its continuous rating overheats.
The duty of one contact is the sum over the loads it serves, all assumed on together: inrush (VA / V
of its supply) to make, sealed current to break and carry. A pilot-duty rating (NEMA ICS 5) gives
make, break and continuous current at the supply voltage (below 120 VAC the make current as at 120 V
and break VA / V up to the continuous current; DC up to 300 V VA / V up to the continuous current);
category entries (IEC 60947-5-1) of the supply's AC/DC kind whose voltage covers the supply's (AC-15
makes 10 x Ie and breaks Ie, AC-14 makes 6 x Ie, DC-13 makes and breaks Ie, DC-14 makes 10 x Ie); a
rating list such as [A600, Q300] covers each kind of supply by its own designation; a plain current
is a resistive rating (make = break = continuous). A PLC output's rated current must make the inrush
and carry the sealed current, at no more than its rated voltage. A contactor's main poles: a NEMA
size is rated in horsepower at the motor's voltage (NEMA ICS 2, NEC 430.83(A)), its continuous
current serving non-motor loads; an AC-3 rating must cover the controller full-load current (NEC
Table 430.250/430.248, or the nameplate where larger, 430.6(A)(1)); an AC-1 rating a heater's
current. The line and delta contactors of a wye-delta starter carry FLA / sqrt(3), its star
contactor FLA / 3. These are US NEC/NEMA and IEC figures, partly from memory; other codes (CEC,
local rules) may differ.
"""
from __future__ import annotations

import math
from typing import Iterator

from ctllint.api import Example, Finding, Rule, reflow
from ctllint.reading.model import ContactRating, Device, Element, Quantity, Severity, Supply
from ctllint.reading.quantities import format_si
from ctllint_plugins.ratings._contact_duty import contact_duty, limits_text, over_limits, rating_limits
from ctllint_plugins.ratings._controllers import CONTACTOR_KINDS
from ctllint_plugins.ratings._figures import LoadFigures, amps_text, element_subject, exceeds, join_names, load_figures
from ctllint_plugins.ratings._power_poles import check_power_poles


def _volts_text(supply: Supply) -> str:
    return format_si(supply.voltage.value, "V") + (supply.current_kind or "")


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
    # A breaker's ``rating`` is its frame current; its auxiliary contacts have ``contact_rating``.
    field = "contact_rating" if device.kind in ("motor-breaker", "breaker") else "rating"
    rating = device.get(field)
    if not isinstance(rating, ContactRating):
        return
    for supply, figures in _served_figures(ctx, element):
        duty = contact_duty(figures)

        def duty_text() -> str:  # worded only for a finding: most contacts pass
            loads = join_names([f.tag for f in figures])
            return (
                f"{what} {element.text} serves {loads} on supply {supply.name} ({_volts_text(supply)}): "
                f"make {amps_text(duty.make)}, break {amps_text(duty.break_)}, continuous {amps_text(duty.continuous)}"
            )

        candidates, why_not = rating_limits(rating, supply.voltage.value, supply.current_kind)
        if not candidates:
            if why_not:
                yield Finding(
                    at=element.loc,
                    message=f"{duty_text()}; {device.tag}'s {'contact ' if field == 'contact_rating' else ''}{why_not}: "
                            f"use {_article_of(what)} {what} rated for this supply",
                    subject=element_subject(ctx, element),
                )
            continue
        if any(not over_limits(duty, limits) for limits in candidates):
            continue
        best = max(candidates, key=lambda lim: (lim.break_ if lim.break_ is not None else math.inf, lim.make or 0.0))
        over = over_limits(duty, best)
        yield Finding(
            at=element.loc,
            message=(
                f"{duty_text()}; {device.tag}'s {field.replace('_', ' ')} {limits_text(best)} ({'; '.join(over)}): "
                f"drive the loads through an interposing relay or use {_article_of(what)} {what} of higher rating"
            ),
            subject=element_subject(ctx, element),
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
            if exceeds(supply.voltage.value, rated_v.value):
                yield Finding(
                    at=element.loc,
                    message=(
                        f"PLC output {element.text} is rated {rated_v.text} and switches {join_names([f.tag for f in figures])} "
                        f"on supply {supply.name} ({_volts_text(supply)}): use an output rated for that voltage or an interposing relay"
                    ),
                    subject=element_subject(ctx, element),
                )
    yield from _check_contact(ctx, element, device, "PLC output")


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
        if device.kind in CONTACTOR_KINDS:
            yield from check_power_poles(ctx, device)


_SUPPLY = """supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
"""


RULE = Rule(
    name="contact-rating",
    severity=Severity.ERROR,
    summary="a contact, PLC output or contactor's main poles carry more than their rating",
    doc=reflow(__doc__),
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
)
