"""A wire number that appears at one element only goes nowhere: usually a mistyped wire number (3
for 8) that silently opens a branch, or a half-drawn path. An element with both ends on the same
wire ([3, CR1.NO, 3]) is the same mistake seen from the other side: it joins a wire to itself,
so open or closed it changes nothing; it is reported here too, at the element (a load so drawn
is open-circuit instead).
"""
from __future__ import annotations

from typing import Iterator

import ctllint.reading.kinds as K
from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.model import Element, Schematic, Severity
from ctllint_plugins.wiring._schematic import rail_wires, rung_text


def _wires_in_order(sch: Schematic) -> list[str]:
    seen: dict[str, None] = {}
    for rung in sch.rungs:
        for path in rung.paths:
            for wire in path.wires:
                seen.setdefault(wire, None)
    return list(seen)


def check(ctx: CheckContext) -> Iterator[Finding]:
    """Wires with one element on them, and elements whose two ends are one wire.

    A wire's connections are the elements on it, each counted once: an
    element with both ends on a wire found nowhere else ([7, CR1.NO, 7]) is
    that wire's only connection. An element with both ends on the same wire
    that has other connections ([3, CR1.NO, 3]) is joined across nothing, so
    it never changes the circuit: almost always one mistyped wire number (3
    for 2), the mistake this rule exists for; it is reported here, at the
    element. A load so drawn is left to ``open-circuit``, which already says
    it can never be energized; unknown elements to ``unknown-device`` and
    ``unknown-part``.
    """
    sch, circuit = ctx.schematic, ctx.circuit
    rails = rail_wires(sch) | set(circuit.rails)
    on_wire: dict[str, list[Element]] = {}
    for e in sch.elements:
        for wire in (e.left,) if e.left == e.right else (e.left, e.right):
            on_wire.setdefault(wire, []).append(e)
    reported: set[int] = set()
    for wire in _wires_in_order(sch):
        found = on_wire.get(wire, ())
        if wire in rails or len(found) != 1:
            continue
        el = found[0]
        reported.add(el.index)
        if el.left == el.right:
            why = f"both ends of {el.text} are on it, so {el.text} is connected to nothing else"
        else:
            why = f"{el.text} is connected on one side only"
        yield Finding(
            el.loc,
            f"wire {wire} ends at {el.text} in {rung_text(sch, el)} and goes nowhere else: {why}; "
            "correct the wire number or complete the path",
            f"wire {wire}",
        )
    for el in sch.elements:
        if el.left != el.right or el.index in reported or not el.role or el.role == K.LOAD:
            continue
        where = f"{'rail' if el.left in rails else 'wire'} {el.left}"
        yield Finding(
            el.loc,
            f"both ends of {el.text} in {rung_text(sch, el)} are on {where}: it joins a wire to itself, so whether it is open "
            "or closed changes nothing; one of its wire numbers is probably mistyped",
            f"wire {el.left}",
        )


RULE = Rule(
    name="dangling-wire",
    severity=Severity.WARNING,
    summary="a wire, not a rail, has only one connection",
    doc=reflow(__doc__),
    source="common practice",
    check=check,
    failing=Example("wire 8 ends at LS1", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [8, LS1.NO, 3]"),
    passing=Example("LS1 in parallel with PB1", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [L1, LS1.NO, 3]"),
)
