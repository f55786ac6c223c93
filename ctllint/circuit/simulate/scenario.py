"""Running an ``expect`` scenario (FORMAT.md "Behaviour checks") and what it finds.

``ScenarioRunner`` runs a scenario's steps from rest with the simulator's
own actions and reads its checks with ``state_of``; ``ScenarioEvent`` is a
finding (a check that does not hold, or a step after which the circuit does
not settle). Its own module: the file format's scenarios, apart from the
model they run on.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Iterator

from ctllint.circuit.paths import _gc_paused
from ctllint.circuit.simulate.settle import StepResult
from ctllint.reading.model import Location, Scenario, Step


@dataclass
class ScenarioEvent:
    """A finding of a scenario run.

    ``kind`` is "check" (a check that does not hold: ``tag``, ``expected``,
    ``actual``, ``location`` of the tag in the check) or "unsettled" (the step
    after which the circuit oscillates or shorts, ``why`` says which; the
    scenario stops there; ``step`` is None when the rest state itself does
    not settle). ``step`` is the model ``Step``, ``step_index`` its 0-based
    position.
    """

    kind: str
    step: Step | None
    step_index: int | None
    location: Location
    tag: str | None = None
    expected: bool | None = None
    actual: bool | None = None
    why: str = ""
    oscillating: list[str] = field(default_factory=list)
    shorts: list[tuple[str, list[str]]] = field(default_factory=list)


class ScenarioRunner:
    """Runs scenarios on a ``Simulator`` (a part of it: it uses the simulator's actions and queries)."""

    @_gc_paused
    def run_scenario(self, scenario: Scenario) -> list[ScenarioEvent]:
        """Run an ``expect`` scenario from rest; report failed checks and the first unsettled step."""
        return [ev for _, step_events in self.scenario_steps(scenario) for ev in step_events]

    def scenario_steps(self, scenario: Scenario) -> Iterator[tuple[int | None, list[ScenarioEvent]]]:
        """Run a scenario from rest one step at a time, as ``run_scenario`` does.

        Yields ``(None, events)`` once at rest, then ``(index, events)``
        after each step, the simulator left in the state after that step
        (``states()``); it stops after an unsettled step (or rest). A
        caller showing every step's states runs the scenario once, in time
        linear in its steps.
        """
        rest = self.reset()
        if not rest.settled:
            yield None, [self._unsettled(None, None, scenario.loc, rest)]
            return
        yield None, []
        for index, step in enumerate(scenario.steps):
            events: list[ScenarioEvent] = []
            action = step.action
            if action == "check":
                for tag, expected in step.targets.items():
                    actual = self.state_of(tag)
                    want = expected if isinstance(expected, bool) else str(expected).lower() == "on"
                    if actual != want:
                        events.append(
                            ScenarioEvent(
                                kind="check",
                                step=step,
                                step_index=index,
                                location=_check_location(step, tag),
                                tag=tag,
                                expected=want,
                                actual=actual,
                            )
                        )
                yield index, events
                continue
            if action == "wait":
                result = self.wait(step.seconds)
            elif action == "power":
                value = step.targets.get("", "on")
                on = value is True or (isinstance(value, str) and value.lower() == "on")
                result = self.power(on)
            else:
                for tag, value in step.targets.items():
                    self._apply(action, tag, value)
                result = self._settle()
            if not result.settled:
                events.append(self._unsettled(step, index, step.loc, result))
                yield index, events
                return
            yield index, events

    @staticmethod
    def _unsettled(step: Step | None, index: int | None, loc: Location, result: StepResult) -> ScenarioEvent:
        return ScenarioEvent(
            kind="unsettled",
            step=step,
            step_index=index,
            location=loc,
            why=result.why,
            oscillating=list(result.oscillating),
            shorts=list(result.shorts),
        )


def _check_location(step: Step, tag: str) -> Location:
    """Where a failed check is reported: on the check's line (FORMAT.md), at the tag when it stands there.

    A check written as a block mapping puts its tags on later lines; the
    finding stays on the line of ``check:`` itself.
    """
    at = step.target_locs.get(tag)
    return at if at is not None and at.line == step.loc.line else step.loc
