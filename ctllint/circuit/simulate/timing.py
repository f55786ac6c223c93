"""Time and control power in a simulated circuit: ``wait`` and ``power``.

``wait(seconds)`` jumps from one timer event to the next within the time
given and settles after each; a circuit that cycles through timers (a
flasher) is recognised when a state with the same times returns, and whole
periods are skipped. ``power`` switches control power (off-delay timers
return at once without it, ``state`` says). Its own module: the two actions
that work no device, and the only ones in which time passes.
"""
from __future__ import annotations

import math

from ctllint.circuit.paths import _gc_paused
from ctllint.circuit.simulate.devices import EPS
from ctllint.circuit.simulate.settle import Settling, StepResult

_MAX_TIMER_EVENTS = 100_000


class Timing(Settling):
    """Lets time pass for the timers, and switches control power."""

    @_gc_paused
    def power(self, on: bool) -> StepResult:
        """Switch control power off or on."""
        self.power_on = bool(on)
        return self._settle()

    @_gc_paused
    def wait(self, seconds: float) -> StepResult:
        """Let ``seconds`` pass: timers reaching their preset move their contacts."""
        remaining = max(0.0, float(seconds))
        result = self._settle()  # after an unsettled step, time settles nothing
        if not result.settled:
            return result
        history: dict[tuple, float] = {}
        for _ in range(_MAX_TIMER_EVENTS):
            due = [(d, tm) for tm in self._timers.values() if (d := tm.due_in()) is not None]
            step = min((d for d, _ in due), default=None)
            if step is None or step > remaining + EPS:
                self._advance(remaining)
                return result
            self._advance(step)
            remaining = max(0.0, remaining - step)
            for timer in self._timers.values():
                if timer.due_in() is not None and timer.elapsed >= timer.preset - EPS:
                    timer.out = timer.off_delay is False
            result = self._settle()
            if not result.settled:
                return result
            # elapsed time matters only to timers that are timing
            key = self._key() + tuple(
                round(tm.elapsed, 9) if tm.due_in() is not None else -1.0 for tm in self._timers.values()
            )
            if key in history:
                period = history[key] - remaining
                if period > EPS:
                    remaining -= math.floor(remaining / period) * period
                history.clear()
            history[key] = remaining
        self._advance(remaining)  # pragma: no cover - bounded for safety
        return result

    def _advance(self, dt: float) -> None:
        self.time += dt
        for timer in self._timers.values():
            timer.elapsed += dt
