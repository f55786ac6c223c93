"""A device that no rung, supply, other device or expect step names is a leftover of an edit or a
part of the drawing that was never finished. Devices from used shared files are not reported. A
transformer whose fuses are drawn in the rungs counts as used even where no supply names it as
`source`: its secondary fuse is what feeds them.
"""
from __future__ import annotations

from typing import Iterator

import ctllint.reading.kinds as K
from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.model import Schematic, Severity
from ctllint_plugins.wiring._schematic import tag_fields


def _used_tags(sch: Schematic, kinds: K.KindRegistry) -> set[str]:
    used = {el.tag for el in sch.elements}
    drawn = set(used)
    for dev in sch.devices.values():
        for name, tags in tag_fields(dev, kinds):
            used.update(tags)
            # A transformer whose own fuses are drawn in the rungs is in the
            # drawing (its secondary fuse feeds them) even where no supply
            # names it as `source`.
            if name == "fuses" and any(t in drawn for t in tags):
                used.add(dev.tag)
    used.update(s.source for s in sch.supplies.values() if s.source)
    for scenario in sch.expect:
        for step in scenario.steps:
            used.update(t for t in step.targets if t)
    return used


def check(ctx: CheckContext) -> Iterator[Finding]:
    sch = ctx.schematic
    used = _used_tags(sch, ctx.kinds)
    for dev in sch.devices.values():
        if dev.origin != sch.path or dev.tag in used:
            continue
        yield Finding(
            dev.loc,
            f"{dev.kind} {dev.tag} is declared but used nowhere: in no rung, no supply's source, no other device's field "
            "and no expect step; draw it or remove it",
            dev.tag,
        )


RULE = Rule(
    name="unused-device",
    severity=Severity.INFO,
    summary="a device declared in this file is used nowhere",
    doc=reflow(__doc__),
    source="common practice",
    check=check,
    failing=Example("PB9 declared, never drawn", "devices:\n  PB9: {kind: pushbutton}"),
    passing=Example("every device drawn", "devices:\n  PB1: {kind: pushbutton}\nrungs:\n  - paths:\n      - [L1, PB1.NO, 3, CR1.coil, X2]"),
)
