"""How the devices of a simulated circuit follow their coils, one kind at a time.

Relays and contactors move with their coil; drives run while their run
input (and stop input, where drawn) is on and they are not tripped; safety
relays start when power, both channels and the feedback loop are on
together and stop when power or a channel drops; latching relays are set
and reset by their two coils; alternating relays pass the turn when their
coil drops out; timers time (FORMAT.md "Behaviour model"). A drive set to
three-wire control starts on the rising of its run input while its stop
input is on, and runs until the stop input drops, it trips or control power
is lost; a run input already on at power-up (or at rest) is no start. Its own module:
the behaviour of each kind of device, apart from the state it acts on
(``state``) and the order of evaluation (``settle``).
"""
from __future__ import annotations

from ctllint.circuit.simulate.devices import EPS
from ctllint.circuit.simulate.state import NetworkState


class CoilResponses(NetworkState):
    """Moves every device after the coils energized in the present state."""

    def _update(self) -> bool:
        """Move contacts after the coils; True when anything changed."""
        changed = False
        for tag in self._relays:
            on = self._energized.get(tag, False)
            if self.moved[tag] != on:
                self.moved[tag] = on
                changed = True
        three = self._latching_drives
        for tag in self._drive_tags:  # runs: run input on, stop input on where drawn, not tripped
            on = self._latch_coils
            run_in = (tag, "run") in on
            if tag in three:  # latched: started by a rising of the run input, kept while the stop input is on
                run_in = self.running[tag] or (run_in and self.run_seen[tag] is False)
            run = (run_in and (tag not in self._drive_stop or (tag, "stop") in on)
                   and not self.tripped.get(tag, False) and self.power_on)
            if run != self.running[tag]:
                self.running[tag] = run
                changed = True
        for tag in self._safety_tags:
            on = self._latch_coils
            if not ((tag, "power") in on and (tag, "ch1") in on and (tag, "ch2") in on):
                started = False
            elif (tag, "feedback") in on:
                started = True
            else:
                continue
            if started != self.started[tag]:
                self.started[tag] = started
                changed = True
        for tag in self._latch_tags:
            if (tag, "reset") in self._latch_coils:
                latched = False
            elif (tag, "set") in self._latch_coils:
                latched = True
            else:
                continue
            if latched != self.latched[tag]:
                self.latched[tag] = latched
                changed = True
        for tag, state in self._alternators.items():
            on = self._energized.get(tag, False)
            if on != state[0]:
                if state[0]:  # dropped out: the cycle is over, the other output has the next turn
                    state[1] ^= 1
                state[0] = on
                changed = True
        for timer in self._timers.values():
            on = self._energized.get(timer.tag, False)
            if on != timer.coil:
                timer.coil, timer.elapsed = on, 0.0
                changed = True
            if timer.off_delay:
                out = True if on else (timer.out and self.power_on and timer.preset > EPS)
            else:
                out = on and (timer.out or timer.preset <= EPS)
            if out != timer.out:
                timer.out = out
                changed = True
        return changed

    def _drives_see(self) -> None:
        """After settling: what each three-wire drive's run input is now, for the next rising.

        Without control power the latch is lost and the input unknown (None):
        after power-up, a run input already on when the circuit settles is no
        start, and the drive starts on the next rising of it.
        """
        for tag in self._three_wire:
            self.run_seen[tag] = (tag, "run") in self._latch_coils if self.power_on else None
