"""A coil picks up and holds between 85 % and 110 % of its rated voltage: below that it may not
close or may chatter, above it overheats. AC and DC coils are not interchangeable: a DC coil on
AC hums and overheats, an AC coil on DC burns out. The same holds for solenoids, pilot lights,
horns and PLC inputs with a rated voltage. A transistor output cannot switch AC. Loads without a
rated voltage are not checked.
"""
from __future__ import annotations

from typing import Iterator

import ctllint.reading.kinds as K
from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.circuit.tables import COIL_MAX_FRACTION, COIL_MIN_FRACTION, coil_voltage_ok
from ctllint.reading.model import Device, Element, Severity
from ctllint.reading.quantities import format_si
from ctllint_plugins.wiring._schematic import kind_of, rung_text, subject_of


def _rated_voltage(dev: Device, el: Element):
    if el.part is not None and el.part in K.coil_parts(kind_of(dev)):  # coil, or a latching relay's set and reset
        return dev.get("coil")
    return dev.get("voltage")


def check(ctx: CheckContext) -> Iterator[Finding]:
    sch, circuit = ctx.schematic, ctx.circuit
    for load in circuit.loads:
        dev = sch.devices.get(load.tag)
        if dev is None or not load.role:
            continue
        rated = _rated_voltage(dev, load)
        supply = circuit.supply_of(load)
        if rated is None or supply is None or not rated.value:
            continue
        problems = []
        if not coil_voltage_ok(supply.voltage.value, rated.value):
            low, high = COIL_MIN_FRACTION * rated.value, COIL_MAX_FRACTION * rated.value
            problems.append(
                f"{format_si(supply.voltage.value, 'V')} is outside {format_si(low, 'V')} to {format_si(high, 'V')} "
                f"(85 % to 110 % of its rating)"
            )
        rated_kind = rated.current_kind or supply.current_kind
        if rated_kind and supply.current_kind and rated_kind != supply.current_kind:
            problems.append(f"it is rated for {rated_kind} and the supply is {supply.current_kind}")
        if problems:
            part = "coil" if load.part == "coil" else dev.kind
            yield Finding(
                load.loc,
                f"{load.text} in {rung_text(sch, load)} is rated {rated.text} but is on supply {supply.name} ({supply.voltage.text}): "
                f"{'; '.join(problems)}; fit a {part} rated for {supply.voltage.text} or move it to a matching supply",
                subject_of(sch, load),
            )
    for el in sch.elements:
        if el.role != K.OUTPUT:
            continue
        dev = sch.devices.get(el.tag)
        if dev is None or dev.get("output") != "transistor":
            continue
        supplies = []
        for load in circuit.served_loads(el):
            sup = circuit.supply_of(load)
            if sup is not None and sup not in supplies:
                supplies.append(sup)
        ac = next((s for s in supplies if s.current_kind == "AC"), None)
        if ac is not None:
            yield Finding(
                el.loc,
                f"{el.text} in {rung_text(sch, el)} is a transistor output on AC supply {ac.name} ({ac.voltage.text}): "
                "a transistor switches DC only; use a relay or triac output, or an interposing relay",
                subject_of(sch, el),
            )


RULE = Rule(
    name="voltage-mismatch",
    severity=Severity.ERROR,
    summary="a load's rated voltage does not match its supply, or a transistor output is on AC",
    doc=reflow(__doc__),
    source="IEC 60947-4-1 operating limits of electromagnets, 85 % to 110 % of rated control voltage (from memory)",
    check=check,
    failing=Example("a 24 VDC coil on 120 VAC", "  CR1: {kind: relay, coil: 24 VDC}\n  ...\n      - [L1, PB1.NO, 3, CR1.coil, X2]"),
    passing=Example("a 120 VAC coil on 120 VAC", "  CR1: {kind: relay, coil: 120 VAC}\n  ...\n      - [L1, PB1.NO, 3, CR1.coil, X2]"),
)
