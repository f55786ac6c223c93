"""An overload relay protects the motor only by dropping the starter's coil: its NC contact must be
on every energizing path of the coil. The rule checks starters, and contactors that name an
overload, for a path to the coil that avoids every NC contact of that overload relay (or for an
overload whose NC contact is used nowhere).
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.model import Severity
from ctllint_plugins.motor_control._devices import CONTACTOR_KINDS, coils_of, contacts_of, device_of
from ctllint_plugins.motor_control._paths import path_text, subject_of


def check(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    for tag, dev in ctx.schematic.devices.items():
        if dev.kind not in CONTACTOR_KINDS:
            continue
        ol = dev.get("overload")
        ol_dev = device_of(ctx, ol) if ol else None
        if ol_dev is None or ol_dev.kind != "overload":
            continue
        ol_nc = contacts_of(ctx, ol, "NC")
        for coil in coils_of(ctx, tag):
            path = circuit.energizing_path(coil, without=ol_nc)
            if path is None:
                continue
            if ol_nc:
                why = f"without an NC contact of its overload relay {ol} (path {path_text(path, coil, ctx)})"
            else:
                why = f"and no NC contact of its overload relay {ol} is used in any rung"
            yield Finding(
                coil.loc,
                f"{dev.kind} coil {coil.text} can be energized {why}: wire {ol}.NC in series with the coil, "
                f"so that an overload trip drops the {dev.kind}",
                subject_of(ctx, coil),
            )


RULE = Rule(
    name="overload-in-coil-path",
    severity=Severity.ERROR,
    summary="a starter's coil can be energized without its overload relay's NC contact",
    doc=reflow(__doc__),
    source="NEC 430.32 / NFPA 79 7.3 (motor overload protection); common practice",
    check=check,
    failing=Example("overload contact missing", "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, X2]\n      - [2, M1.NO, 3]\n"),
    passing=Example("overload contact in series", "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n      - [2, M1.NO, 3]\n"),
)
