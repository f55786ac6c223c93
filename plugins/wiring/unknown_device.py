"""Every tag a schematic names must be a declared device, in this file or a used device file. A
mistyped tag (CR12 for CR21) would otherwise draw a contact nobody can find in the panel, a
starter whose overload does not exist, or a scenario that checks nothing. Naming a device of the
wrong kind (a starter whose overload is a pushbutton) is a format error instead.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.model import Severity
from ctllint_plugins.wiring._schematic import rung_text, subject_of, tag_fields


def check(ctx: CheckContext) -> Iterator[Finding]:
    sch = ctx.schematic
    devices = sch.devices
    for el in sch.elements:
        if el.tag not in devices:
            yield Finding(
                el.loc,
                f"{el.text} in {rung_text(sch, el)}: device {el.tag} is not declared under 'devices'"
                + (" or in a used file" if sch.uses else "")
                + f"; declare it or correct the tag",
                subject_of(sch, el),
            )
    for dev in devices.values():
        if dev.origin != sch.path:
            continue
        for name, tags in tag_fields(dev, ctx.kinds):
            for i, tag in enumerate(tags):
                if tag not in devices:
                    yield Finding(
                        dev.field_locs.get(f"{name}.{i}", dev.at(name)),
                        f"{name} of {dev.tag} names {tag}, which is not declared under 'devices'; declare it or correct the tag",
                        f"{dev.tag}.{name}",
                    )
    for sup in sch.supplies.values():
        if sup.source and sup.source not in devices:
            yield Finding(
                sup.at("source"),
                f"source of supply {sup.name} names {sup.source}, which is not declared under 'devices'; declare the transformer or power supply",
                f"supply {sup.name}",
            )
    for scenario in sch.expect:
        for step in scenario.steps:
            for tag in step.targets:
                if tag and tag not in devices:
                    yield Finding(
                        step.target_locs.get(tag, step.loc),
                        f"scenario '{scenario.name}': {step.action} names {tag}, which is not declared under 'devices'",
                        f"expect {scenario.name}: {tag}",
                    )


RULE = Rule(
    name="unknown-device",
    severity=Severity.ERROR,
    summary="a tag in a path, a device field, a supply's source or an expect step is not declared",
    doc=reflow(__doc__),
    source="common practice (every reference designation on a drawing names a listed device)",
    check=check,
    failing=Example("CR2 is not declared", "devices:\n  CR1: {kind: relay, coil: 120 VAC}\nrungs:\n  - paths:\n      - [L1, CR2.NO, 3, SOL1, X2]"),
    passing=Example("every tag declared", "devices:\n  CR1: {kind: relay, coil: 120 VAC}\nrungs:\n  - paths:\n      - [L1, CR1.NO, 3, SOL1, X2]"),
)
