"""A device has one coil. Drawing it twice means two branches are meant to drive it; as drawn they
are two coils, and the panel builder cannot wire both. Join the branches in parallel ahead of
one coil.
"""
from __future__ import annotations

from typing import Iterator

import ctllint.reading.kinds as K
from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.model import Element, Severity
from ctllint_plugins.wiring._schematic import kind_of, rung_text, subject_of


def check(ctx: CheckContext) -> Iterator[Finding]:
    sch = ctx.schematic
    first: dict[tuple[str, str], Element] = {}
    for el in sch.elements:
        if el.role != K.LOAD or el.part is None or el.part not in K.coil_parts(kind_of(sch.devices.get(el.tag)) if el.tag in sch.devices else None):
            continue
        if (el.tag, el.part) not in first:
            first[(el.tag, el.part)] = el
            continue
        one = first[(el.tag, el.part)]
        yield Finding(
            el.loc,
            f"{el.text} in {rung_text(sch, el)} is drawn a second time (first in {rung_text(sch, one)}, line {one.loc.line}); "
            f"a device has one coil: join the branches that drive it to one {el.text}, or use a second relay",
            subject_of(sch, el),
        )


RULE = Rule(
    name="coil-duplicate",
    severity=Severity.ERROR,
    summary="the same coil is drawn twice",
    doc=reflow(__doc__),
    source="common practice",
    check=check,
    failing=Example("CR1.coil twice", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [L1, LS1.NO, 4, CR1.coil, X2]"),
    passing=Example("branches in parallel ahead of one coil", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [L1, LS1.NO, 3]"),
)
