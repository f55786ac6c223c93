"""When a coil, solenoid or horn is switched off, its stored energy drives a voltage spike that can
break down a transistor or triac output, and its inrush stresses the output. Where such an output
serves an inductive load directly (no relay contact between them), the load or the output must be
`suppressed` (a diode, RC or varistor), or the output should drive an interposing relay whose
contact switches the load. Relay outputs are not covered.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import Example, Finding, Rule, reflow
from ctllint.reading.model import Element, Severity
from ctllint.circuit.wiresets import WireSets
from ctllint_plugins.ratings._figures import COIL_KINDS, element_subject, join_names


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
            if el.role == "contact" and device is not None and device.kind in COIL_KINDS:
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
                    f"{join_names(loads)} directly with no suppressor: the turn-off voltage spike can destroy the output; "
                    f"fit a suppressor (suppressed: true) or drive an interposing relay"
                ),
                subject=element_subject(ctx, element),
            )


RULE = Rule(
    name="inductive-on-electronic-output",
    severity=Severity.WARNING,
    summary="a transistor or triac PLC output switches an unsuppressed inductive load directly",
    doc=reflow(__doc__),
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
)
