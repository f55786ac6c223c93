"""A safety relay can only refuse a restart over a welded contactor if it sees the contactor: the NC
auxiliary (mirror) contact of every contactor or starter its safety outputs switch belongs in series
in its feedback (reset) loop, so a contactor whose main contacts welded keeps the loop open and the
outputs off (external device monitoring). A safety relay whose outputs switch contactors and whose
feedback loop is not drawn is reported too.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.kinds import LOAD
from ctllint.reading.model import Element, Severity
from ctllint_plugins.motor_control._devices import CONTACTOR_KINDS, contacts_of, device_of
from ctllint_plugins.motor_control._paths import subject_of


def check(ctx: CheckContext) -> Iterator[Finding]:
    """Every contactor a safety relay's NO outputs serve has an NC contact in series with its feedback input."""
    circuit = ctx.circuit
    for tag, dev in ctx.schematic.devices.items():
        if dev.kind != "safety-relay":
            continue
        switched: list[Element] = []
        for out in contacts_of(ctx, tag, "NO"):
            for load in circuit.served_loads(out):
                load_dev = device_of(ctx, load.tag)
                if load.part == "coil" and load_dev is not None and load_dev.kind in CONTACTOR_KINDS and load not in switched:
                    switched.append(load)
        if not switched:
            continue
        feedback = [load for load in circuit.elements_of(tag) if load.part == "feedback" and load.role == LOAD]
        if not feedback:
            yield Finding(dev.loc, f"safety relay {tag} switches {', '.join(c.tag for c in switched)}, but its feedback loop ({tag}.feedback) is drawn "
                                   "nowhere: wire the NC mirror contact of each in series in it, so a welded contactor blocks the restart", tag)
            continue
        loop = feedback[0]
        missing = [coil for coil in switched
                   if not any(circuit.in_series(nc, loop) for nc in contacts_of(ctx, coil.tag, "NC"))]
        if missing:
            yield Finding(
                loop.loc,
                f"the feedback loop of safety relay {tag} lacks an NC mirror contact of {', '.join(c.tag for c in missing)} in series: "
                f"{'it is' if len(missing) == 1 else 'they are'} switched by its safety outputs, and a welded contactor "
                "would not block the restart; wire an NC auxiliary contact of each in series in the loop",
                subject_of(ctx, loop),
            )


RULE = Rule(
    name="safety-relay-feedback",
    severity=Severity.ERROR,
    summary="a contactor switched by a safety relay's outputs lacks an NC mirror contact in series in its feedback loop",
    doc=reflow(__doc__),
    source="common practice (external device monitoring, as ISO 13849-1 categories 3 and 4 ask for)",
    check=check,
    failing=Example("K2's mirror contact missing", "rungs:\n  - paths:\n      - ['+24', K1.NC, 21, PB3.NO, 22, SR1.feedback, 0V]\n  - paths:\n      - [L1, SR1.NO, 5, K1.coil, X2]\n      - [5, K2.coil, X2]\n"),
    passing=Example("both mirror contacts in the loop", "rungs:\n  - paths:\n      - ['+24', K1.NC, 21, K2.NC, 22, PB3.NO, 23, SR1.feedback, 0V]\n  - paths:\n      - [L1, SR1.NO, 5, K1.coil, X2]\n      - [5, K2.coil, X2]\n"),
)
