"""Behaviour: the schematic's own ``expect`` scenarios, run on the simulator.

An ``expect`` scenario states what the circuit must do: press a start
button, release it, and the motor stays on; trip the overload and it stops.
Each scenario starts from the rest state (power on, every device
unactuated, maintained devices in their first position, overloads reset,
settled) and runs its steps in order on the same behaviour model that every
other command uses (FORMAT.md "Behaviour model").

Rules:

- ``expectation``: a ``check`` step whose state does not hold, reported at
  the tag of the check that failed.
- ``unsettled``: a step after which the circuit does not settle (it
  oscillates) or shorts a supply; the scenario stops there.
"""
from __future__ import annotations

from typing import TYPE_CHECKING, Any, Iterator

from ctllint import hookimpl
from ctllint.api import Example, Finding, Rule
from ctllint.reading.model import Scenario, Severity, Step

if TYPE_CHECKING:  # pragma: no cover
    from ctllint.circuit.simulate import ScenarioEvent


def _state(value: Any) -> str:
    if isinstance(value, bool):
        return "on" if value else "off"
    return str(value)


def _step_text(step: Step) -> str:
    """A step as the file writes it: ``press PB2``, ``set SS1 auto``, ``wait 5 s``."""
    if step.action == "power":
        return f"power {step.targets.get('', '')}".strip()
    if step.action == "wait":
        return f"wait {step.seconds:g} s"
    if step.action in ("set", "check"):
        return f"{step.action} " + ", ".join(f"{t} {_state(v)}" for t, v in step.targets.items())
    return f"{step.action} " + ", ".join(step.targets)


# Both rules read the same scenario runs: keep the last circuit's events so
# that each scenario is simulated once per file, not once per rule.
_LAST_RUN: dict[str, Any] = {"circuit": None, "events": {}}


def _events(ctx, scenario: Scenario) -> list["ScenarioEvent"]:
    if _LAST_RUN["circuit"] is not ctx.circuit:
        _LAST_RUN["circuit"], _LAST_RUN["events"] = ctx.circuit, {}
    events = _LAST_RUN["events"]
    if id(scenario) not in events:
        events[id(scenario)] = (scenario, list(ctx.circuit.simulator().run_scenario(scenario) or ()))
    return events[id(scenario)][1]


def check_expectation(ctx) -> Iterator[Finding]:
    for scenario in ctx.schematic.expect:
        for event in _events(ctx, scenario):
            if event.kind != "check" or event.tag not in ctx.devices:
                continue  # an undeclared tag is unknown-device's finding, not a failed expectation
            where = f"after step {event.step_index + 1}" if event.step_index is not None else "at rest"
            yield Finding(
                at=event.location,
                message=(
                    f"scenario '{scenario.name}': {where}, {event.tag} is {_state(event.actual)}, "
                    f"expected {_state(event.expected)}"
                ),
                subject=f"{scenario.name}:{event.tag}@step{(event.step_index or 0) + 1}",
            )


def check_unsettled(ctx) -> Iterator[Finding]:
    for scenario in ctx.schematic.expect:
        for event in _events(ctx, scenario):
            if event.kind != "unsettled":
                continue
            if event.step is not None and event.step_index is not None:
                what = f"step {event.step_index + 1} ({_step_text(event.step)}) does not settle"
                subject = f"{scenario.name}@step{event.step_index + 1}"
            else:
                what = "the rest state (power on, nothing pressed) does not settle"
                subject = f"{scenario.name}@rest"
            why = event.why or "the circuit does not settle"
            yield Finding(
                at=event.location,
                message=f"scenario '{scenario.name}': {what}: {why}; the scenario stops there",
                subject=subject,
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

RULES = [
    Rule(
        name="expectation",
        severity=Severity.ERROR,
        summary="a check of an expect scenario does not hold",
        doc=(
            "The `expect` scenarios are the designer's own statement of what the circuit does: a start "
            "button latches the motor, a stop or an overload trip drops it out, an interlock keeps two "
            "contactors apart. Each scenario runs on the simulator from the rest state; a `check` whose "
            "device is not in the stated state means the drawing does not do what its designer meant. "
            "The finding names the scenario, the step and the states, at the tag of the failing check."
        ),
        source="the schematic's own expect scenarios (FORMAT.md \"Behaviour checks\")",
        check=check_expectation,
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
    ),
    Rule(
        name="unsettled",
        severity=Severity.ERROR,
        summary="during an expect scenario the circuit oscillates or shorts a supply",
        doc=(
            "A circuit that does not settle after a step chatters: a coil that opens its own supply, or "
            "relays that switch each other off in a ring, pull in and drop out as fast as their armatures "
            "move, wearing contacts and loads. A step that joins a supply's hot and common rails through "
            "closed contacts blows the control fuse. The scenario stops at such a step; the finding is at "
            "the step and says why."
        ),
        source="common practice (a relay circuit must reach a steady state after every input change)",
        check=check_unsettled,
        failing=Example(
            "CR1 opens its own coil through its NC contact: pressing PB2 starts it chattering",
            """supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
devices:
  PB2: {kind: pushbutton, function: start}
  CR1: {kind: relay, coil: 120 VAC}
rungs:
  - paths: [[L1, PB2.NO, 1, CR1.NC, 2, CR1.coil, X2]]
expect:
  - name: pulse
    steps:
      - press: PB2
""",
        ),
        passing=Example(
            "the coil is driven through its NO seal-in instead",
            """rungs:
  - paths:
      - [L1, PB2.NO, 1, CR1.coil, X2]
      - [L1, CR1.NO, 1]
""",
        ),
    ),
]


@hookimpl
def ctllint_rules():
    return RULES
