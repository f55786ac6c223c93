"""Three-wire control: a momentary start button energizes the coil and a NO auxiliary contact of the
same device, wired across the start contact, holds it in after the button is released. Without it
the motor runs only while the button is held; with a seal-in that also bypasses a stop or overload
contact, the motor can no longer be stopped by it. The rule looks at each coil a momentary start
button's NO contact serves, unless the rung sets jog: true. Coils started together by the same
button (the star, delta and timer coils of a star-delta starter, a starter and its run timer) may
share one seal-in: a NO contact of any coil that button energizes counts, as long as it bypasses
only the start contact.

A timer's timed contact never seals, not even its own coil: an on-delay NO is still open when the
button is released, so the coil drops out; an off-delay NO stays closed after stop and restarts the
coil when stop is released. Only a timer's instantaneous contact (instant-NO) seals. A contact of
another coil that this button does not start is no seal either: wired around the start button it
starts this coil whenever that one runs. The message says which of these the wrong seal does, and
the advice never suggests a timer's timed contact.

A drive's or soft starter's run input is a coil here: a two-wire drive (the default) runs only
while its run input is energized, so a momentary start straight to it needs a seal-in, such as its
run relay's NO across the start or an interposing relay. A drive set to control: three-wire latches
a start pulse itself until its stop input drops, so it is its own seal: a momentary start straight
to its run input passes (its stop input must be drawn; stop-in-series checks that the stops are
in it).
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.kinds import LOAD, three_wire
from ctllint.reading.model import Element, Severity
from ctllint_plugins.motor_control._devices import (
    COIL_KINDS, CONTACTOR_KINDS, DRIVE_KINDS, STARTER_EXAMPLE, device_of, is_momentary_pushbutton,
)
from ctllint_plugins.motor_control._paths import block_of, names_of, path_text
from ctllint_plugins.motor_control._seal_verdict import seal_verdict


def _is_drive_input(ctx: CheckContext, el: Element, *parts: str) -> bool:
    """``el`` is one of the named command inputs of a drive or soft starter."""
    return el.part in parts and el.role == LOAD and getattr(device_of(ctx, el.tag), "kind", None) in DRIVE_KINDS


def check(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    blocks: dict[int, int] | None = None
    # Copies of a contact or coil on the same two wires are the same thing
    # electrically: work each position out once (a pasted rung repeated many
    # times would otherwise multiply the work by the copies, to the fourth power).
    verdicts: dict[tuple, tuple[str, list[Element], list[Element] | None]] = {}
    keeps: dict[tuple, list[Element]] = {}
    for start in ctx.schematic.elements:
        dev = device_of(ctx, start.tag)
        if start.role != "contact" or start.part != "NO" or not is_momentary_pushbutton(dev) or dev.get("function") != "start":
            continue
        for coil in circuit.served_loads(start):
            coil_dev = device_of(ctx, coil.tag)
            if coil.part != "coil" or coil_dev is None or coil_dev.kind not in COIL_KINDS:
                if not _is_drive_input(ctx, coil, "run"):  # a drive runs only while its run input is energized
                    continue
                if three_wire(coil_dev):  # it latches the start pulse itself: its own seal
                    continue
            if ctx.schematic.rungs[coil.rung].jog:
                continue
            if blocks is None:
                blocks = block_of(ctx)
            key = (start.tag, start.left, start.right, coil.tag, coil.left, coil.right)
            if key not in verdicts:
                verdicts[key] = seal_verdict(ctx, circuit, blocks, keeps, start, coil)
            verdict, bypassed, path = verdicts[key]
            if verdict == "missing" and coil.part == "run":
                yield Finding(
                    start.loc,
                    f"start button {start.tag} ({start.text}) energizes the run input {coil.text} of {coil_dev.kind} {coil.tag}, "
                    f"but no NO contact is wired around it: the {coil_dev.kind} stops as soon as the button is released "
                    f"(set to two-wire control, it runs only while its run input is energized); "
                    f"add a seal-in in parallel with {start.text}: its run relay {coil.tag}.NO, or a control relay started by "
                    f"the button, sealed across it, whose NO gives the run command; or, if the {coil_dev.kind} is set to latch "
                    f"a start pulse itself, say control: three-wire on {coil.tag} and draw its stop input; "
                    f"or set jog: true on the rung if that is intended",
                    f"{start.text}@{coil.text}",
                )
                continue
            if verdict == "missing":
                yield Finding(
                    start.loc,
                    f"start button {start.tag} ({start.text}) energizes coil {coil.text}, but no NO contact of {coil.tag} "
                    f"is wired around it: {coil.tag} drops out as soon as the button is released; add a seal-in "
                    f"{_seal_advice(ctx, coil.tag)} in parallel with {start.text}, or set jog: true on the rung if that is intended",
                    f"{start.text}@{coil.text}",
                )
                continue
            if verdict == "wrong":
                yield Finding(start.loc, _wrong_seal_message(ctx, start, coil, bypassed), f"{start.text}@{coil.text}")
                continue
            if bypassed:
                yield Finding(
                    start.loc,
                    f"the seal-in of coil {coil.text} around start button {start.text} also bypasses {names_of(bypassed)} "
                    f"(path {path_text(path, coil, ctx)}): once sealed, {coil.tag} no longer drops when "
                    f"{' or '.join(c.tag for c in bypassed)} opens; wire the seal-in across {start.text} only",
                    f"{start.text}@{coil.text}",
                )


def _seal_advice(ctx: CheckContext, tag: str) -> str:
    """The contact to suggest as the seal-in of ``tag``'s coil: never a timer's timed contact."""
    if getattr(device_of(ctx, tag), "kind", None) == "timer":
        return f"{tag}.instant-NO (an instantaneous contact; its timed contacts do not seal)"
    return f"{tag}.NO"


def _wrong_seal_message(ctx: CheckContext, start: Element, coil: Element, wrong: list[Element]) -> str:
    """What the contact wired around the start button really does, and what to wire instead."""
    m = wrong[0]
    dev = device_of(ctx, m.tag)
    fix = f"wire {_seal_advice(ctx, coil.tag)} across {start.text} as the seal-in"
    head = f"the contact around start button {start.text} for coil {coil.text}, {names_of(wrong)}, is no seal-in: "
    if dev.kind == "timer":
        if dev.get("delay") == "off":
            q = dev.get("preset")
            preset = f"{q.number:g} {q.unit}" if q is not None else "its preset"
            what = (f"{m.text} is a timed contact of off-delay timer {m.tag}: it stays closed for {preset} after stop "
                    f"drops {coil.tag}, so releasing stop within that time restarts {coil.tag}")
        else:
            what = (f"{m.text} is a timed contact of on-delay timer {m.tag}: it is still open when the button is "
                    f"released, so {coil.tag} drops out then")
        return head + what + "; " + fix
    runs = "runs" if dev.kind in CONTACTOR_KINDS else "is energized"
    return (head + f"{m.text} belongs to {m.tag}, which this button does not start: it starts {coil.tag} whenever "
            f"{m.tag} {runs}, and does not hold {coil.tag} when {m.tag} is off; " + fix
            + ", or set jog: true on the rung if the button only jogs")


RULE = Rule(
    name="seal-in",
    severity=Severity.ERROR,
    summary="a momentary start button's coil has no seal-in of its own around the start contact",
    doc=reflow(__doc__),
    source="common practice (three-wire control, low-voltage protection; timed and instantaneous timer contacts); NFPA 79 7.5",
    check=check,
    failing=Example("no seal-in", STARTER_EXAMPLE + "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n"),
    passing=Example("seal-in across the start button", STARTER_EXAMPLE + "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n      - [2, M1.NO, 3]\n"),
)
