"""The `expect` scenarios are the designer's own statement of what the circuit does: a start button
latches the motor, a stop or an overload trip drops it out, an interlock keeps two contactors
apart. Each scenario runs on the simulator from the rest state; a `check` whose device is not in
the stated state means the drawing does not do what its designer meant. The finding names the
scenario, the step and the states, at the tag of the failing check.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import Example, Finding, Rule, reflow
from ctllint.reading.model import Severity
from ctllint_plugins.behaviour._scenario_runs import scenario_events, state_text


def check(ctx) -> Iterator[Finding]:
    for scenario in ctx.schematic.expect:
        for event in scenario_events(ctx, scenario):
            if event.kind != "check" or event.tag not in ctx.devices:
                continue  # an undeclared tag is unknown-device's finding, not a failed expectation
            where = f"after step {event.step_index + 1}" if event.step_index is not None else "at rest"
            yield Finding(
                at=event.location,
                message=(
                    f"scenario '{scenario.name}': {where}, {event.tag} is {state_text(event.actual)}, "
                    f"expected {state_text(event.expected)}"
                ),
                subject=f"{scenario.name}:{event.tag}@step{(event.step_index or 0) + 1}",
            )


_CIRCUIT = """supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
devices:
  PB1: {kind: pushbutton, function: stop}
  PB2: {kind: pushbutton, function: start}
  M1: {kind: contactor, coil: 120 VAC}
rungs:
  - paths:
      - [L1, PB1.NC, 1, PB2.NO, 2, M1.coil, X2]
"""

RULE = Rule(
    name="expectation",
    severity=Severity.ERROR,
    summary="a check of an expect scenario does not hold",
    doc=reflow(__doc__),
    source="the schematic's own expect scenarios (FORMAT.md \"Behaviour checks\")",
    check=check,
    failing=Example(
        "no seal-in: M1 drops out when the start button is released",
        _CIRCUIT
        + """expect:
  - name: start latches
    steps:
      - press: PB2
      - release: PB2
      - check: {M1: on}
""",
    ),
    passing=Example(
        "a seal-in contact M1.NO around the start button keeps M1 on",
        _CIRCUIT
        + """      - [1, M1.NO, 2]
expect:
  - name: start latches
    steps:
      - press: PB2
      - release: PB2
      - check: {M1: on}
""",
    ),
)
