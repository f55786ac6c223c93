"""A device has a fixed number of contacts. Drawing more NO or NC uses than it provides gives a
panel that cannot be wired as drawn; the missing contact is usually found at commissioning.
Changeover (double-throw) poles give one NO and one NC use each (FORMAT.md). Devices without
`contacts` are not checked. A selector is drawn by its positions, and a cam can close an NO or
an NC block in any position, so each position use takes one block of either type: a selector is
reported when its position uses outnumber its contact blocks.
"""
from __future__ import annotations

from typing import Iterator

import ctllint.reading.kinds as K
from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.model import Element, Severity
from ctllint.reading.terminals import assign as assign_terminals
from ctllint_plugins.wiring._schematic import kind_of, rung_text, subject_of


def _provides(count) -> str:
    given = [f"{n} {what}" for n, what in ((count.no, "NO"), (count.nc, "NC"), (count.instant_no, "instant-NO"), (count.instant_nc, "instant-NC")) if n]
    if count.changeover:
        given.append(f"{count.changeover} changeover (each one NO and one NC)")
    return " and ".join(given) or "no contacts"


def _excess(count, no_used: int, nc_used: int) -> int:
    """Uses beyond what ``count`` provides.

    FORMAT.md: changeover (double-throw) poles "each offer one NO and one
    NC", so each pole adds one NO use and one NC use (a form-C pole's NO and
    NC are both there to wire, sharing the pole's common).
    """
    return max(0, no_used - count.no - count.changeover) + max(0, nc_used - count.nc - count.changeover)


def check(ctx: CheckContext) -> Iterator[Finding]:
    """More NO or NC uses than ``contacts`` gives; for a selector, more position uses.

    A selector is drawn by its positions (``SS1.hand``), and a cam can make
    either an NO or an NC block close in a given position, so each position
    use takes one contact block of any type: a selector is reported when it
    has more position uses than contact blocks in all.
    """
    sch = ctx.schematic
    used: dict[str, list[int]] = {}
    instant_used: dict[tuple[str, str], int] = {}
    marks: dict = {}

    def pair(el: Element) -> str:
        """`` (terminals 23-24)`` of the exceeding use, worked out only once a finding needs it."""
        if not marks:
            marks.update(assign_terminals(sch, ctx.kinds) or {None: None})
        m = marks.get(el.index)
        return f" (terminals {m.pair})" if m is not None else ""

    for el in sch.elements:
        if el.role != K.CONTACT:
            continue
        dev = sch.devices.get(el.tag)
        count = dev.get("contacts") if dev is not None else None
        if count is None or not hasattr(count, "allows"):
            continue
        kind = kind_of(dev, ctx.kinds)
        if kind is not None and kind.positions and el.part in K.selector_parts(dev):
            tally = used.setdefault(el.tag, [0, 0, 0])
            tally[2] += 1
            blocks = count.no + count.nc + count.changeover
            if tally[2] > blocks:
                yield Finding(
                    el.loc,
                    f"{el.text}{pair(el)} in {rung_text(sch, el)} is position contact number {tally[2]} drawn for selector {el.tag}, "
                    f"which provides {_provides(count)} (line {dev.at('contacts').line}), {blocks} contact "
                    f"block{'s' if blocks != 1 else ''} in all; add a contact block, correct `contacts`, or use a relay",
                    subject_of(sch, el),
                )
            continue
        if el.part in K.INSTANT_PARTS:
            # a timer's instantaneous contacts are counted apart from its timed NO/NC
            key = (el.tag, el.part)
            instant_used[key] = instant_used.get(key, 0) + 1
            provided = count.instant_no if el.part == "instant-NO" else count.instant_nc
            if instant_used[key] > provided:
                yield Finding(
                    el.loc,
                    f"{el.text} in {rung_text(sch, el)} is {el.part} contact number {instant_used[key]} drawn for {el.tag}, "
                    f"which provides {provided} {el.part} (line {dev.at('contacts').line}); "
                    "add an instantaneous contact block, correct `contacts`, or use a relay",
                    subject_of(sch, el),
                )
            continue
        if el.part not in ("NO", "NC"):
            continue
        tally = used.setdefault(el.tag, [0, 0, 0])
        before = _excess(count, tally[0], tally[1])
        tally[0 if el.part == "NO" else 1] += 1
        # Only the use that goes beyond what is left is reported: once the
        # NCs are exhausted, a later NO within the NO count is no fault.
        if _excess(count, tally[0], tally[1]) > before:
            yield Finding(
                el.loc,
                f"{el.text}{pair(el)} in {rung_text(sch, el)} is {el.part} contact number {tally[0 if el.part == 'NO' else 1]} drawn for {el.tag}, "
                f"which provides {_provides(count)} (line {dev.at('contacts').line}) and {tally[0]} NO + {tally[1]} NC are drawn so far; "
                "add an auxiliary contact block, correct `contacts`, or use a relay",
                subject_of(sch, el),
            )


RULE = Rule(
    name="contact-count",
    severity=Severity.ERROR,
    summary="more NO (or NC) contacts used than the device's `contacts` provides",
    doc=reflow(__doc__),
    source="common practice",
    check=check,
    failing=Example("two NO uses of a 1 NO relay", "  CR1: {kind: relay, coil: 120 VAC, contacts: {NO: 1, NC: 1}}\n  ...\n      - [L1, CR1.NO, 5, SOL1, X2]\n      - [L1, CR1.NO, 6, SOL2, X2]"),
    passing=Example("one NO and one NC use", "  CR1: {kind: relay, coil: 120 VAC, contacts: {NO: 1, NC: 1}}\n  ...\n      - [L1, CR1.NO, 5, SOL1, X2]\n      - [L1, CR1.NC, 6, SOL2, X2]"),
)
