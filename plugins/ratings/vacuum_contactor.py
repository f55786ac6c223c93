"""Above about 400 A of load current vacuum contactors are often preferred for contact life and arc
interruption; no code requires them, and air-break starters are made up to NEMA size 9, so this is
information, not a warning. The load current is the controller full-load current (NEC Table
430.250/430.248, or the nameplate where larger) times the contactor's share in a wye-delta starter,
or the heater's current. Set `vacuum: true` on a vacuum contactor.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import Example, Finding, Rule, reflow
from ctllint.reading.model import Severity
from ctllint.circuit.tables import VACUUM_THRESHOLD_A
from ctllint_plugins.ratings._controllers import CONTACTOR_KINDS, feed_current
from ctllint_plugins.ratings._figures import amps_text, exceeds


def check_vacuum_contactor(ctx) -> Iterator[Finding]:
    for contactor in ctx.devices.values():
        if contactor.kind not in CONTACTOR_KINDS or contactor.get("vacuum") is True:
            continue
        target = ctx.devices.get(contactor.get("feeds") or "")
        if target is None:
            continue
        current, source = feed_current(target, contactor)
        if current is not None and exceeds(current, VACUUM_THRESHOLD_A):
            yield Finding(
                at=contactor.loc,
                message=(
                    f"{contactor.kind} {contactor.tag} switches the {amps_text(current)} of {target.kind} {target.tag} ({source}), above "
                    f"{amps_text(VACUUM_THRESHOLD_A)}: a vacuum contactor is often preferred there for contact life and arc "
                    f"interruption (common practice, no code requirement; air-break starters are made up to NEMA size 9); "
                    f"set vacuum: true if it is one"
                ),
                subject=contactor.tag,
            )


RULE = Rule(
    name="vacuum-contactor",
    severity=Severity.INFO,
    summary="a contactor switches more than 400 A in air (a preference, not a code requirement)",
    doc=reflow(__doc__),
    source="common practice (contact life and arc interruption at high current)",
    check=check_vacuum_contactor,
    failing=Example(
        "200 hp 230 V motor: 480 A (NEC Table 430.250) through an air-break contactor",
        """devices:
  M1: {kind: starter, coil: 120 VAC, overload: OL1, feeds: MTR1}
  MTR1: {kind: motor, power: 200 hp, voltage: 230 V, phases: 3}
""",
    ),
    passing=Example(
        "the same motor through a vacuum contactor",
        """devices:
  M1: {kind: starter, coil: 120 VAC, overload: OL1, feeds: MTR1, vacuum: true}
  MTR1: {kind: motor, power: 200 hp, voltage: 230 V, phases: 3}
""",
    ),
)
