"""A coil whose energizing path passes its own NC contact switches itself off as soon as it pulls
in, and on again when it drops: it chatters, burns its contacts and the loads it drives. Timers are
left out, since a timer with its own timed NC contact is a recycling pulse timer. The circuit is
also simulated from rest, and a loop of several relays that switch each other off is reported at a
coil in the loop.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.model import Element, Severity
from ctllint_plugins.motor_control._devices import coil_loads, contacts_of, device_of
from ctllint_plugins.motor_control._paths import block_of, names_of, subject_of


def check(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    reported: set[str] = set()
    blocks: dict[int, int] | None = None
    for coil in coil_loads(ctx):
        dev = device_of(ctx, coil.tag)
        if dev.kind == "timer":
            continue
        own_nc = [e for e in contacts_of(ctx, coil.tag, "NC") if circuit.serves(e, coil)]
        if not own_nc:
            continue
        if blocks is None:
            blocks = block_of(ctx)
        own_no = [m for m in contacts_of(ctx, coil.tag, "NO") if circuit.serves(m, coil)]
        # An own NO contact on a common loop with the NC takes over as the NC opens (a changeover): no chatter.
        chattering = [c for c in own_nc if not any(blocks.get(m.index) is not None and blocks.get(m.index) == blocks.get(c.index) for m in own_no)]
        if not chattering:
            continue
        nc = chattering[0]
        reported.add(coil.tag)
        yield Finding(
            coil.loc,
            f"coil {coil.text} is fed through its own NC contact {nc.text}: as the coil pulls in the contact opens "
            f"and drops it again, so it chatters; take {nc.text} out of the coil's circuit",
            subject_of(ctx, coil),
        )
    yield from _oscillation_at_rest(ctx, reported)


def _oscillation_at_rest(ctx: CheckContext, reported: set[str]) -> Iterator[Finding]:
    """Run the simulator from rest; a circuit that hunts there is reported at a coil involved."""
    result = ctx.circuit.simulator().reset()
    if result is None or not getattr(result, "oscillating", False):
        return
    involved = _hunting_coils(ctx, result.oscillating)
    if not involved or any(c.tag in reported for c in involved):
        return
    first = involved[0]
    yield Finding(
        first.loc,
        f"from rest the circuit does not settle: coils {names_of(involved)} switch each other on and off in a loop; "
        f"break the loop (a seal-in, or an interlock that holds one state)",
        subject_of(ctx, first),
    )


def _hunting_coils(ctx: CheckContext, tags) -> list[Element]:
    """The coil elements of the simulator's oscillating tags, file order (all coils if it names none)."""
    names = set(tags) if isinstance(tags, (list, tuple, set, frozenset)) else set()
    coils = coil_loads(ctx)
    return [c for c in coils if c.tag in names] if names else coils


RULE = Rule(
    name="oscillation",
    severity=Severity.ERROR,
    summary="a coil is fed through its own NC contact and chatters",
    doc=reflow(__doc__),
    source="common practice",
    check=check,
    failing=Example("relay through its own NC", "rungs:\n  - paths:\n      - [L1, PB1.NO, 2, CR1.NC, 3, CR1.coil, X2]\n"),
    passing=Example("relay sealed through its own NO", "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, CR1.coil, X2]\n      - [2, CR1.NO, 3]\n"),
)
