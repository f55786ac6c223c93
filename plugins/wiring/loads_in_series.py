"""Loads in series share the supply voltage: neither gets its rated voltage, a coil may not pick up
or may chatter, and one load failing open drops the other. Every load belongs between its
switching elements and the common rail, in parallel with the others.
"""
from __future__ import annotations

from typing import Callable, Iterator

from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.model import Element, Severity
from ctllint_plugins.wiring._schematic import rail_reach, rung_text, subject_of, tainted_wires


def _fed_from_hot(ctx: CheckContext, load: Element, rails_of: Callable[[str], list[str]]) -> bool:
    """Whether a side of ``load`` reaches a hot rail without passing another load."""
    hots = {s.hot for s in ctx.schematic.supplies.values()}
    return any(r in hots for wire in (load.left, load.right) for r in rails_of(wire))


def check(ctx: CheckContext) -> Iterator[Finding]:
    sch, circuit = ctx.schematic, ctx.circuit
    tainted = tainted_wires(sch)
    # The second load of a pair is the one farther from hot: the one that
    # does not reach a hot rail without passing a load; file order breaks ties.
    rails_of = rail_reach(sch)
    order = {load.index: (0 if _fed_from_hot(ctx, load, rails_of) else 1, load.index) for load in circuit.loads}
    partners: dict[int, list[Element]] = {}
    seconds: dict[int, Element] = {}
    for load in circuit.loads:
        if load.left in tainted or load.right in tainted:
            continue
        for other in circuit.reaches_rail_only_through_loads(load):
            if other is load:
                continue
            first, second = sorted((load, other), key=lambda e: order.get(e.index, (1, e.index)))
            seconds[second.index] = second
            if all(p is not first for p in partners.setdefault(second.index, [])):
                partners[second.index].append(first)
    for index in sorted(seconds):
        second = seconds[index]
        firsts = sorted(partners[index], key=lambda e: e.index)
        supply = circuit.supply_of(firsts[0]) or circuit.supply_of(second)
        volts = f" of supply {supply.name} ({supply.voltage.text})" if supply else ""
        names = ", ".join(f"{e.text} ({rung_text(sch, e)})" for e in firsts)
        yield Finding(
            second.loc,
            f"{second.text} in {rung_text(sch, second)} is in series with {names}: it reaches the rail only through "
            f"{'that load' if len(firsts) == 1 else 'those loads'}, so they share the voltage{volts} and none gets its rating; "
            "connect each load between its own contacts and the common rail",
            subject_of(sch, second),
        )


RULE = Rule(
    name="loads-in-series",
    severity=Severity.ERROR,
    summary="a load reaches a rail only through another load",
    doc=reflow(__doc__),
    source="common practice",
    check=check,
    failing=Example("coil then light to common", "      - [L1, PB1.NO, 3, CR1.coil, 4, PL1, X2]"),
    passing=Example("light in parallel, switched by a contact", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [L1, CR1.NO, 4, PL1, X2]"),
)
