"""The scenario runs both behaviour rules read, simulated once per file; a state as text.

``expectation`` and ``unsettled`` report on the same runs of the same
scenarios: the events of the last circuit's runs are kept here, in one
place, so that each scenario is simulated once per file, not once per rule.
Its own module because both rule modules use it and neither owns it.
"""
from __future__ import annotations

from typing import TYPE_CHECKING, Any

from ctllint.reading.model import Scenario

if TYPE_CHECKING:  # pragma: no cover
    from ctllint.circuit.simulate import ScenarioEvent


def state_text(value: Any) -> str:
    if isinstance(value, bool):
        return "on" if value else "off"
    return str(value)


# Both rules read the same scenario runs: keep the last circuit's events so
# that each scenario is simulated once per file, not once per rule.
_LAST_RUN: dict[str, Any] = {"circuit": None, "events": {}}


def scenario_events(ctx, scenario: Scenario) -> list["ScenarioEvent"]:
    if _LAST_RUN["circuit"] is not ctx.circuit:
        _LAST_RUN["circuit"], _LAST_RUN["events"] = ctx.circuit, {}
    events = _LAST_RUN["events"]
    if id(scenario) not in events:
        events[id(scenario)] = (scenario, list(ctx.circuit.simulator().run_scenario(scenario) or ()))
    return events[id(scenario)][1]
