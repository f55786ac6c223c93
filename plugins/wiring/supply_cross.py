"""Separate supplies (a 120 VAC control transformer and a 24 VDC power supply) must never be
joined: a path between them puts one supply's voltage on the other's devices, damages
electronics and defeats each supply's protection. Pass signals between supplies through a relay
whose coil is on one and whose contact is on the other.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.model import Severity
from ctllint_plugins.wiring._schematic import rung_text, subject_of


def check(ctx: CheckContext) -> Iterator[Finding]:
    sch = ctx.schematic
    for el, first, second in ctx.circuit.supply_cross():
        rail = next((w for w in (el.left, el.right) if w in (second.hot, second.common)), None)
        touches = f"rail {rail} of supply {second.name}" if rail else f"supply {second.name}"
        yield Finding(
            el.loc,
            f"{el.text} in {rung_text(sch, el)} connects {touches} ({second.voltage.text}) to the circuit of supply "
            f"{first.name} ({first.voltage.text}); separate supplies must never be joined: use a relay whose coil "
            "is on one supply and contact on the other",
            subject_of(sch, el),
        )


RULE = Rule(
    name="supply-cross",
    severity=Severity.ERROR,
    summary="elements connect the rails of two different supplies",
    doc=reflow(__doc__),
    source="common practice",
    check=check,
    failing=Example("a 24 V contact fed from L1", "      - [L1, PB1.NO, 3, CR1.coil, \"0V\"]"),
    passing=Example("an interposing relay", "      - [\"+24\", Q0_1, 3, CR1.coil, \"0V\"]\n      - [L1, CR1.NO, 4, SOL1, X2]"),
)
