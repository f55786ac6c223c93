"""``Simulator``: the behaviour model as rules and commands use it, its queries and actions.

The model itself is built up in layers (``devices``, ``state``, ``coils``,
``settle``, ``timing``, ``scenario``; the package's docstring describes
it); this class adds what a caller asks of it: whether a load is
energized, what a check reads, and the actions on devices (press, release,
set, trip, reset).
"""
from __future__ import annotations

from typing import Any

from ctllint.circuit.paths import _gc_paused
from ctllint.circuit.simulate.scenario import ScenarioRunner
from ctllint.circuit.simulate.settle import StepResult
from ctllint.circuit.simulate.timing import Timing


class Simulator(ScenarioRunner, Timing):
    """The state of a circuit and the actions of FORMAT.md "Behaviour checks"."""

    def __init__(self, circuit):
        super().__init__(circuit)
        if self._three_wire:
            # The rest state as its three-wire drives see it before any action: without it the
            # first action would count as power-up, and a start pressed then would be no start.
            self._settle()

    # -- queries --------------------------------------------------------------
    def energized(self, tag: str) -> bool:
        """Whether load ``tag`` (a device's coil, or a bare load) is energized."""
        return self._energized.get(tag, False)

    def states(self) -> dict[str, bool]:
        """Every load tag, file order, and whether it is energized; for a latching relay whether it is set,
        for a safety relay whether its outputs are on, for a drive whether it runs (what ``check`` reads)."""
        held = {**self.latched, **self.started, **self.running}
        return {t: held[t] if t in held else self._energized.get(t, False) for t in self._load_tags}

    def state_of(self, tag: str) -> bool:
        """What a ``check`` of ``tag`` reads: a load's energization; for other
        devices, whether they are actuated (a switch pressed, a PLC output on,
        an overload or fuse tripped, a selector out of its first position);
        for a latching relay, whether it is set."""
        if tag in self.latched:
            return self.latched[tag]
        if tag in self.started:
            return self.started[tag]
        if tag in self._drive_set:
            return self._running(tag)
        if tag in self._energized:
            return self._energized[tag]
        if tag in self.actuated:
            return self.actuated[tag]
        if tag in self.outputs_on:
            return self.outputs_on[tag]
        if tag in self.tripped:
            return self.tripped[tag]
        if tag in self.position:
            positions = self._positions[tag]
            return bool(positions) and self.position[tag] != positions[0]
        return False

    # -- actions --------------------------------------------------------------
    @_gc_paused
    def reset(self) -> StepResult:
        """Return to the rest state (power on, nothing actuated) and settle."""
        self._rest_state()
        return self._settle()

    def _apply(self, action: str, tag: str, value: Any = None) -> None:
        """Change one device's state without settling; unknown or unsuitable tags are ignored."""
        if action == "press":
            if tag in self.actuated:
                self.actuated[tag] = True
        elif action == "release":
            if tag in self.actuated:
                self.actuated[tag] = False
            elif tag in self.position:
                positions = self._positions[tag]
                self.position[tag] = positions[0] if positions else ""
        elif action == "set":
            if tag in self.position:
                if str(value) in self._positions[tag]:
                    self.position[tag] = str(value)
            else:
                on = value is True or (isinstance(value, str) and value.lower() == "on")
                if tag in self.actuated:
                    self.actuated[tag] = on
                elif tag in self.outputs_on:
                    self.outputs_on[tag] = on
        elif action == "trip":
            if tag in self.tripped:
                self.tripped[tag] = True
        elif action == "reset":
            if tag in self.tripped:
                self.tripped[tag] = False

    @_gc_paused
    def press(self, tag: str) -> StepResult:
        """Actuate a switch (held until ``release``)."""
        self._apply("press", tag)
        return self._settle()

    @_gc_paused
    def release(self, tag: str) -> StepResult:
        """Return a switch to rest, or a selector to its first position."""
        self._apply("release", tag)
        return self._settle()

    @_gc_paused
    def set(self, tag: str, value: Any) -> StepResult:
        """Set a selector's position, or a switch or PLC output ``on``/``off``."""
        self._apply("set", tag, value)
        return self._settle()

    @_gc_paused
    def trip(self, tag: str) -> StepResult:
        """Trip an overload, or blow a fuse or breaker."""
        self._apply("trip", tag)
        return self._settle()

    @_gc_paused
    def reset_device(self, tag: str) -> StepResult:
        """Reset a tripped overload, fuse or breaker."""
        self._apply("reset", tag)
        return self._settle()
