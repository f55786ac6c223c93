"""A path of contacts, outputs or fuses from hot to common with no load shorts the supply when its
contacts close, tripping the protection or welding the contacts. The path counts if it exists on
paper, for any combination of contact states, since the drawing is what gets wired. One short
reached from hot through several parallel branches (hand and auto, two start buttons) is
reported once, at the first element of its first path.
"""
from __future__ import annotations

from typing import Iterator

import ctllint.reading.kinds as K
from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.circuit.analysis import path_text
from ctllint.reading.model import Severity
from ctllint_plugins.wiring._schematic import subject_of


def _and(words: list[str]) -> str:
    return words[0] if len(words) == 1 else ", ".join(words[:-1]) + " and " + words[-1]


def check(ctx: CheckContext) -> Iterator[Finding]:
    sch = ctx.schematic
    # One finding per short: the circuit gives one path per element leaving
    # hot, so a short reached from hot through several parallel elements (the
    # hand and auto branches of a selector, two start buttons) comes back
    # once per branch, all ending at the same element on common; and several
    # common-side elements in parallel come back from the same first element.
    # A path is reported only when both its ends are new.
    reported: set[int] = set()
    for supply, path in ctx.circuit.short_circuits():
        if not path or any(not el.role for el in path):
            continue
        first, last = path[0], path[-1]
        if first.index in reported or last.index in reported:
            continue
        reported.update((first.index, last.index))
        closing = [el.text for el in path if el.role in (K.CONTACT, K.OUTPUT)]
        when = f"when {_and(closing)} {'close' if len(closing) > 1 else 'closes'}" if closing else "as soon as power is on"
        yield Finding(
            first.loc,
            f"short circuit of supply {supply.name} ({supply.voltage.text}): {path_text(supply.hot, path)} "
            f"joins hot to common with no load, {when}; put the load in this path or correct the wire numbers",
            subject_of(sch, first),
        )


RULE = Rule(
    name="short-circuit",
    severity=Severity.ERROR,
    summary="hot and common of a supply are joined by a path with no load in it",
    doc=reflow(__doc__),
    source="common practice",
    check=check,
    failing=Example("contact straight across the supply", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [3, CR1.NO, X2]"),
    passing=Example("seal-in around the start button", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [L1, CR1.NO, 3]"),
)
