"""The state of a simulated circuit: every device's state, and what conducts in it.

A state is the contact positions of FORMAT.md "Behaviour model": switches
actuated, selectors' positions, devices tripped, PLC outputs on, relays
moved, timers timing, latching and safety relays set, alternating relays'
turns, drives running. ``_closed`` says whether an element conducts in the
state. Its own module: what a state is, apart from how it changes
(``coils``, ``settle``).
"""
from __future__ import annotations

from typing import TYPE_CHECKING

from ctllint.circuit.simulate.devices import DRIVES, DeviceTables
from ctllint.reading.kinds import INSTANT_PARTS, contact_sense
from ctllint.reading.model import Element

if TYPE_CHECKING:  # pragma: no cover
    from ctllint.circuit.graph import CircuitGraph


class NetworkState(DeviceTables):
    """The state of every device of a circuit, at rest to begin with."""

    def __init__(self, circuit: "CircuitGraph"):
        super().__init__(circuit)
        self.power_on = True
        self.actuated: dict[str, bool] = {}
        self.position: dict[str, str] = {}
        self.tripped: dict[str, bool] = {}
        self.outputs_on: dict[str, bool] = {}
        self.moved: dict[str, bool] = {}
        self.time = 0.0
        self._energized: dict[str, bool] = {}
        self._short_texts: dict[str, str] = {}
        self._latch_coils: set[tuple[str, str | None]] = set()
        self._rest_state()

    def _rest_state(self) -> None:
        self.power_on = True
        self.actuated = {t: False for t in self._switches}
        self.position = {t: (p[0] if p else "") for t, p in self._positions.items()}
        self.tripped = {t: False for t in self._trippable}
        self.outputs_on = {t: False for t in self._outputs}
        self.moved = {t: False for t in self._relays}
        for timer in self._timers.values():
            timer.coil, timer.elapsed, timer.out = False, 0.0, False
        for state in self._alternators.values():
            state[0], state[1] = False, 0
        self.latched = {t: False for t in self._latch_tags}
        self.started = {t: False for t in self._safety_tags}
        self.running = {t: False for t in self._drive_tags}
        # A three-wire drive's run input as the drive saw it in the last settled state with control
        # power on; None after power-up (and at rest) until a state has settled: a run input that is
        # already on then is no start (``coils``).
        self.run_seen: dict[str, bool | None] = {t: None for t in self._three_wire}
        self.time = 0.0
        self._energized = {t: False for t in self._load_tags}

    def _key(self) -> tuple:
        return (tuple(self.moved[t] for t in self._relays) + tuple((tm.coil, tm.out) for tm in self._timers.values())
                + tuple(tuple(st) for st in self._alternators.values()) + tuple(self.latched[t] for t in self._latch_tags)
                + tuple(self.started[t] for t in self._safety_tags) + tuple(self.running[t] for t in self._drive_tags)
                + tuple(self.run_seen[t] for t in self._three_wire))

    def _closed(self, el: Element) -> bool:
        role, tag, part = el.role, el.tag, el.part
        kind = self._kind.get(tag)
        if role == "conductor":
            return not self.tripped.get(tag, False)
        if role == "output":
            return self.outputs_on.get(tag, False)
        if role != "contact":
            return False
        if kind == "selector":
            position = self.position.get(tag)
            if position == part:
                return True
            cams = self._cams.get(tag)
            return bool(cams) and position in cams.get(part, ())
        if tag in self._alternators:
            on, turn = self._alternators[tag]
            return on and part == ("A", "B")[turn]
        if kind in ("breaker", "motor-breaker"):  # auxiliary contacts follow the handle; trip-alarm only a trip
            tripped = self.tripped.get(tag, False)
            active = tripped if part in ("trip-NO", "trip-NC") else not tripped
        elif kind in DRIVES:
            if part in ("fault-NO", "fault-NC"):
                active = self.tripped.get(tag, False)
            else:
                active = self._running(tag)
        elif tag in self.latched:
            active = self.latched[tag]
        elif tag in self.started:
            active = self.started[tag]
        elif kind == "overload":
            active = self.tripped.get(tag, False)
        elif tag in self._timers:
            timer = self._timers[tag]
            # an instantaneous contact follows the coil at once (FORMAT.md "Additions")
            active = timer.coil if part in INSTANT_PARTS else timer.out
        elif tag in self.moved:
            active = self.moved[tag]
        else:
            active = self.actuated.get(tag, False)
        sense = contact_sense(part)
        return active if sense == "NO" else not active if sense == "NC" else False

    def _running(self, tag: str) -> bool:
        """Whether a drive or soft starter runs (its run relay's contacts moved)."""
        return self.running.get(tag, False)
