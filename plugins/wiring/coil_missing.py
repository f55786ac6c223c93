"""A relay's contacts move only when its coil is energized. A contact whose coil is drawn nowhere
never changes state, so the logic that depends on it is dead or always on; usually the coil was
left off the drawing or the contact carries the wrong tag.
"""
from __future__ import annotations

from typing import Iterator

import ctllint.reading.kinds as K
from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.model import Device, Severity
from ctllint_plugins.wiring._schematic import kind_of, rung_text


def _has_coil(dev: Device) -> bool:
    kind = kind_of(dev)
    return bool(kind and kind.coil)


def check(ctx: CheckContext) -> Iterator[Finding]:
    sch = ctx.schematic
    coils = {el.tag for el in sch.elements if el.part == "coil" and el.role == K.LOAD}
    # A kind with coils of its own names (a latching relay's set and reset) needs every one of them drawn.
    drawn = {(el.tag, el.part) for el in sch.elements if el.role == K.LOAD}
    for tag in {el.tag for el in sch.elements if el.role == K.LOAD and el.part != "coil"}:
        kind = kind_of(sch.devices.get(tag)) if tag in sch.devices else None
        named = tuple(p for p in K.coil_parts(kind) if p not in kind.optional_coils) if kind else ()
        if named and named != ("coil",) and all((tag, part) in drawn for part in named):
            coils.add(tag)
    # A coil drawn as a part the kind lacks (the bare tag M1, or M1.Coil) is
    # reported once, by unknown-part; its contacts are not reported again.
    coils |= {
        el.tag
        for el in sch.elements
        if not el.role and el.tag in sch.devices and (el.part is None or "coil" in el.part.lower())
    }
    reported: set[str] = set()
    for el in sch.elements:
        if el.role != K.CONTACT or el.tag in coils or el.tag in reported:
            continue
        dev = sch.devices.get(el.tag)
        if dev is None or not _has_coil(dev):
            continue
        reported.add(el.tag)
        named = tuple(p for p in K.coil_parts(kind_of(dev)) if p not in kind_of(dev).optional_coils)
        if named and named != ("coil",):
            missing = [f"{el.tag}.{p}" for p in named if (el.tag, p) not in drawn]
            yield Finding(
                el.loc,
                f"{el.text} in {rung_text(sch, el)} is a contact of {dev.kind} {el.tag}, but {' and '.join(missing)} "
                f"{'is' if len(missing) == 1 else 'are'} in no rung: the contact "
                + ("never changes state" if len(missing) == len(named) else "can never return")
                + "; draw the missing coil or use another device's contact",
                el.tag,
            )
            continue
        yield Finding(
            el.loc,
            f"{el.text} in {rung_text(sch, el)} is a contact of {dev.kind} {el.tag}, but {el.tag}.coil is in no rung: "
            "the contact never changes state; draw the coil or use another device's contact",
            el.tag,
        )


RULE = Rule(
    name="coil-missing",
    severity=Severity.ERROR,
    summary="contacts of a relay, timer, contactor or starter are used but its coil is in no rung",
    doc=reflow(__doc__),
    source="common practice",
    check=check,
    failing=Example("CR2's contact, no CR2 coil", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [L1, CR2.NO, 4, SOL1, X2]"),
    passing=Example("the contact's coil is drawn", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [L1, CR1.NO, 4, SOL1, X2]"),
)
