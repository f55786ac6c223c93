"""A circuit that does not settle after a step chatters: a coil that opens its own supply, or
relays that switch each other off in a ring, pull in and drop out as fast as their armatures
move, wearing contacts and loads. A step that joins a supply's hot and common rails through
closed contacts blows the control fuse. The scenario stops at such a step; the finding is at the
step and says why.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import Example, Finding, Rule, reflow
from ctllint.reading.model import Severity, Step
from ctllint_plugins.behaviour._scenario_runs import scenario_events, state_text


def _step_text(step: Step) -> str:
    """A step as the file writes it: ``press PB2``, ``set SS1 auto``, ``wait 5 s``."""
    if step.action == "power":
        return f"power {step.targets.get('', '')}".strip()
    if step.action == "wait":
        return f"wait {step.seconds:g} s"
    if step.action in ("set", "check"):
        return f"{step.action} " + ", ".join(f"{t} {state_text(v)}" for t, v in step.targets.items())
    return f"{step.action} " + ", ".join(step.targets)


def check(ctx) -> Iterator[Finding]:
    for scenario in ctx.schematic.expect:
        for event in scenario_events(ctx, scenario):
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


RULE = Rule(
    name="unsettled",
    severity=Severity.ERROR,
    summary="during an expect scenario the circuit oscillates or shorts a supply",
    doc=reflow(__doc__),
    source="common practice (a relay circuit must reach a steady state after every input change)",
    check=check,
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
)
