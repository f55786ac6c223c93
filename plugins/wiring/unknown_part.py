"""A pushbutton has contacts but no coil, a selector has only the positions it lists, a starter is
drawn by its coil and contacts, never bare, and motors, heaters, transformers and power supplies
belong to the power circuit, not to control rungs. Such an element cannot be built as drawn, so
ctllint cannot say what it does; the circuit rules leave it out.
"""
from __future__ import annotations

from typing import Iterator

import ctllint.reading.kinds as K
from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.model import Device, Severity
from ctllint_plugins.wiring._schematic import kind_of, rung_text, subject_of


def _article(word: str) -> str:
    return ("an " if word[:1] in "aeiou" else "a ") + word


def _valid_parts(dev: Device, kind: K.DeviceKind) -> list[str]:
    parts = [f"{dev.tag}.{p}" for p in kind.parts]
    if kind.positions:
        parts += [f"{dev.tag}.{p}" for p in K.selector_parts(dev)]  # positions, then cam blocks
    if kind.bare:
        parts.append(dev.tag)
    return parts


def check(ctx: CheckContext) -> Iterator[Finding]:
    sch = ctx.schematic
    for el in sch.elements:
        dev = sch.devices.get(el.tag)
        if dev is None or el.role:
            continue
        kind = kind_of(dev)
        what = _article(dev.kind)
        if kind is not None and not kind.used_in_rungs:
            why = (
                f"{dev.tag} is {what}, which is drawn in the power circuit, not in control rungs; "
                "use the coil or contacts of the device that switches it"
            )
        elif kind is None:
            why = f"{dev.kind} {dev.tag} has no part {el.part!r}" if el.part else f"{dev.kind} {dev.tag} cannot be used as a bare tag"
        else:
            valid = ", ".join(_valid_parts(dev, kind)) or "none"
            if el.part is None:
                why = f"{dev.tag} is {what}: name one of its parts ({valid}), not the bare tag"
            elif kind.positions:
                why = f"selector {dev.tag} has no position or cam block '{el.part}' (its parts: {valid})"
            else:
                why = f"{dev.tag} is {what} and has no part '{el.part}' (use {valid})"
        yield Finding(el.loc, f"{el.text} in {rung_text(sch, el)}: {why}", subject_of(sch, el))


RULE = Rule(
    name="unknown-part",
    severity=Severity.ERROR,
    summary="an element names a part its device's kind does not have, or a device never drawn in rungs",
    doc=reflow(__doc__),
    source="common practice",
    check=check,
    failing=Example("a pushbutton has no coil", "devices:\n  PB1: {kind: pushbutton, function: start}\nrungs:\n  - paths:\n      - [L1, PB1.coil, X2]"),
    passing=Example("a pushbutton's contact", "devices:\n  PB1: {kind: pushbutton, function: start}\nrungs:\n  - paths:\n      - [L1, PB1.NO, 3, CR1.coil, X2]"),
)
