"""A stop button must stop the machine by opening the circuit, so that a broken wire, a loose
terminal or a burnt contact stops it too. Wired through its NO contact, the same faults make the
button do nothing when it is pressed. The rule flags every NO contact of a pushbutton whose function
is stop or emergency-stop, except an auxiliary NO that only signals the button is pressed (it serves
only pilot lights, horns or PLC inputs, and the button stops through an NC contact).
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.model import Severity
from ctllint_plugins.motor_control._devices import STARTER_EXAMPLE, device_of, is_stop_device, signal_only
from ctllint_plugins.motor_control._paths import subject_of


def check(ctx: CheckContext) -> Iterator[Finding]:
    for el in ctx.schematic.elements:
        dev = device_of(ctx, el.tag)
        if el.role != "contact" or el.part != "NO" or not is_stop_device(dev):
            continue
        if signal_only(ctx, el):
            continue
        what = "emergency stop" if dev.get("function") == "emergency-stop" else "stop button"
        yield Finding(
            el.loc,
            f"{what} {el.tag} is used through its NO contact {el.text}: a broken wire or a dirty contact "
            f"would keep it from stopping; wire its NC contact in series with the coils it stops",
            subject_of(ctx, el),
        )


RULE = Rule(
    name="stop-normally-closed",
    severity=Severity.ERROR,
    summary="a stop or emergency-stop button used through an NO contact",
    doc=reflow(__doc__),
    source="NFPA 79 9.2.5.3 / IEC 60204-1 9.4.1 (stop functions by de-energization); common practice",
    check=check,
    failing=Example("stop button through its NO contact", STARTER_EXAMPLE + "rungs:\n  - paths:\n      - [L1, PB1.NO, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n      - [2, M1.NO, 3]\n"),
    passing=Example("stop button through its NC contact", STARTER_EXAMPLE + "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n      - [2, M1.NO, 3]\n"),
)
