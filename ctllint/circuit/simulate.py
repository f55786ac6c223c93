"""The behaviour model (FORMAT.md "Behaviour model"): states, settling, timers.

One model serves the ``expect`` scenarios, the rules that simulate, and any
command that shows states. ``Simulator(circuit)`` holds:

- power on or off;
- for each mechanical switch (pushbutton, limit, pressure, temperature,
  float, flow, foot switch): actuated or not (``press``/``release``,
  ``set: {TAG: on|off}``);
- for each selector: its position (the first at rest; ``set: {SS1: auto}``;
  ``release`` returns it to its first position);
- overloads tripped or not, fuses and breakers blown or not (``trip`` and
  ``reset``);
- PLC outputs on or off (``set: {Q0_3: on}``);
- for each relay, contactor and starter: whether its contacts are moved;
  for each timer: its coil state, the time spent in it, and whether its
  timed contacts are moved;
- for each latching relay: whether it is set (its NO closed): its set coil
  sets it, its reset coil resets it (reset wins when both are on), and it
  holds its state without power;
- for each safety relay: whether its safety outputs are on: they come on
  when its power, both channels and its feedback (reset) loop are on
  together, and go off as soon as power or a channel drops (a reset button
  in the feedback loop: the restart waits for it, and for the mirror
  contacts in the loop);
- for each alternating relay: its coil state and whose turn it is (A at
  rest): A is closed while the coil is on in A's turn, B in B's, and the
  turn passes to the other output each time the coil drops out.

Conduction: a NO contact is closed when its device is actuated (switch
pressed or on, overload tripped, coil energized), a NC contact when it is
not; a selector part is closed in its own position (a block of its cam
table in each position the table lists); a fuse or breaker unless
tripped; a PLC output when on. Timer contacts: on-delay, they move once the
coil has been energized continuously for ``preset`` and return as soon as it
drops; off-delay, they move as soon as the coil energizes and return once it
has been de-energized for ``preset``. A preset of zero acts at once.
Elements whose role is unknown never conduct.

A load is energized when one terminal connects to a supply's hot rail and the
other to the same supply's common rail through closed non-load elements
(union-find over the closed elements: linear in the circuit per evaluation).
With power off nothing is energized, and off-delay timers return at once
(their timing needs control power, as in most timing relays).

Settling is synchronous: evaluate every load, then move every coil's
contacts, and repeat until nothing changes. A state (the vector of contact
positions) seen before means an oscillation: it is reported with the coils
that change within the cycle, never looped on. Two coils racing each other
after the same input change therefore show as an oscillation too, which is
what a race is worth on a drawing. After settling, hot and common of a
supply joined through closed non-load elements is a short circuit, reported
with its path. ``settled`` is false for either.

``wait(seconds)`` jumps from one timer event to the next within the time
given and settles after each; a circuit that cycles through timers (a
flasher) is recognised when a state with the same times returns, and whole
periods are skipped.
"""
from __future__ import annotations

import math
from collections import deque
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any, Iterator

from ctllint.circuit.paths import _gc_paused, path_text
from ctllint.reading.kinds import INSTANT_PARTS, contact_sense
from ctllint.reading.model import Element, Location, Scenario, Step
from ctllint.circuit.wiresets import WireSets

if TYPE_CHECKING:  # pragma: no cover
    from ctllint.circuit.analysis import Circuit

_SWITCH_KINDS = {
    "pushbutton",
    "limit-switch",
    "pressure-switch",
    "temperature-switch",
    "float-switch",
    "flow-switch",
    "foot-switch",
}
_TRIPPABLE = {"overload", "fuse", "breaker", "drive", "soft-starter", "motor-breaker"}
_DRIVES = ("drive", "soft-starter")  # run while run (and stop, where drawn) inputs are on and not tripped
# Kinds whose contacts are never worked by hand (a relay whose coil is in no
# rung keeps its contacts at rest).
_NOT_SWITCHES = {"selector", "overload", "relay", "timer", "contactor", "starter", "alternating-relay", "latching-relay",
                 "safety-relay", *_DRIVES, "breaker", "motor-breaker"}
_EPS = 1e-9
_MAX_ITERATIONS = 10_000
_MAX_TIMER_EVENTS = 100_000


@dataclass
class StepResult:
    """What one action did: whether the circuit settled, and why not.

    ``oscillating`` names the coils that keep changing (file order);
    ``shorts`` lists (supply name, element texts from hot to common) for
    each supply shorted in the final state. ``settled`` is false when either
    is non-empty.
    """

    settled: bool = True
    oscillating: list[str] = field(default_factory=list)
    shorts: list[tuple[str, list[str]]] = field(default_factory=list)
    why: str = ""


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


class _Timer:
    __slots__ = ("tag", "off_delay", "preset", "coil", "elapsed", "out")

    def __init__(self, tag: str, off_delay: bool, preset: float):
        self.tag = tag
        self.off_delay = off_delay
        self.preset = preset
        self.coil = False
        self.elapsed = 0.0
        self.out = False

    def due_in(self) -> float | None:
        """Time to this timer's next change of contacts, if it is timing."""
        if self.coil != self.out and self.coil != self.off_delay:
            # on-delay: coil on, contacts not yet moved; off-delay: coil off, contacts still moved
            return max(0.0, self.preset - self.elapsed)
        return None


class Simulator:
    """The state of a circuit and the actions of FORMAT.md "Behaviour checks"."""

    def __init__(self, circuit: "Circuit"):
        self.circuit = circuit
        sch = circuit.schematic
        self._supplies = [s for s in sch.supplies.values() if s.hot != s.common]
        known = [el for el in sch.elements if el.role]
        self._loads = [el for el in known if el.role == "load"]
        coil_tags = {el.tag for el in self._loads if el.part == "coil"}
        self._load_tags: list[str] = list(dict.fromkeys(el.tag for el in self._loads))  # file order, once each
        self._kind = {tag: dev.kind for tag, dev in sch.devices.items()}
        self._positions: dict[str, list[str]] = {}
        self._cams: dict[str, dict[str, frozenset[str]]] = {}  # selector -> cam block -> positions it is closed in
        self._switches: list[str] = []
        self._trippable: list[str] = []
        self._outputs: list[str] = []
        self._relays: list[str] = []  # coil devices that are not timers, file order
        self._timers: dict[str, _Timer] = {}
        self._alternators: dict[str, list] = {}
        # Latching relays: whether each is set. Its set coil sets it, its reset coil resets it (reset wins
        # when both are on), and power off changes nothing.
        self._latch_tags = [t for t in self._load_tags if self._kind.get(t) == "latching-relay"]
        # Safety relays: whether the outputs are on (started). They start when power, both channels
        # and the feedback loop are on together, and stop as soon as power or a channel drops.
        self._safety_tags = [t for t in self._load_tags if self._kind.get(t) == "safety-relay"]
        self._latch_coils: set[tuple[str, str | None]] = set()
        self._drive_tags = [t for t in self._load_tags if self._kind.get(t) in _DRIVES]
        self._drive_stop = {el.tag for el in self._loads if el.tag in self._drive_tags and el.part == "stop"}
        for tag, dev in sch.devices.items():
            kind = dev.kind
            if kind == "selector":
                self._positions[tag] = [str(p) for p in (dev.get("positions") or [])]
                if dev.get("cams"):
                    self._cams[tag] = {name: frozenset(closed) for name, closed in dev.get("cams").items()}
            elif kind in _SWITCH_KINDS:
                self._switches.append(tag)
            elif kind in _TRIPPABLE:
                self._trippable.append(tag)
            elif kind == "plc-output":
                self._outputs.append(tag)
        for tag in self._load_tags:
            if tag not in coil_tags:
                continue
            dev = sch.devices.get(tag)
            if dev is not None and dev.kind == "timer":
                preset = dev.get("preset")
                seconds = float(getattr(preset, "value", preset) or 0.0)
                self._timers[tag] = _Timer(tag, dev.get("delay") == "off", seconds)
            elif dev is not None and dev.kind == "alternating-relay":
                self._alternators[tag] = [False, 0]  # coil on, whose turn (0: A, 1: B)
            else:
                self._relays.append(tag)
        # Contacts of a kind a plugin adds: coil-driven when the device has a
        # coil in the rungs, else worked by hand like a switch.
        switches = set(self._switches)
        for el in known:
            if el.role == "contact" and el.tag not in coil_tags and el.tag in self._kind:
                kind = self._kind[el.tag]
                if kind not in _SWITCH_KINDS and kind not in _NOT_SWITCHES and el.tag not in switches:
                    switches.add(el.tag)
                    self._switches.append(el.tag)
        self._switchable = [el for el in known if el.role != "load" and el.left != el.right]
        self._coil_tags = [t for t in self._load_tags if t in coil_tags]
        self.power_on = True
        self.actuated: dict[str, bool] = {}
        self.position: dict[str, str] = {}
        self.tripped: dict[str, bool] = {}
        self.outputs_on: dict[str, bool] = {}
        self.moved: dict[str, bool] = {}
        self.time = 0.0
        self._energized: dict[str, bool] = {}
        self._short_texts: dict[str, str] = {}
        self._rest_state()

    # -- state ---------------------------------------------------------------
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
        self.time = 0.0
        self._energized = {t: False for t in self._load_tags}

    def _key(self) -> tuple:
        return (tuple(self.moved[t] for t in self._relays) + tuple((tm.coil, tm.out) for tm in self._timers.values())
                + tuple(tuple(st) for st in self._alternators.values()) + tuple(self.latched[t] for t in self._latch_tags)
                + tuple(self.started[t] for t in self._safety_tags) + tuple(self.running[t] for t in self._drive_tags))

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
        elif kind in _DRIVES:
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

    def _union(self) -> tuple[dict[str, str], Any]:
        """Wires joined through closed non-load elements in the present state."""
        sets = WireSets((el.left, el.right) for el in self._switchable if self._closed(el))
        return sets.parent, sets.find

    def _evaluate(self) -> None:
        """Which loads are energized in the present contact state."""
        state = {t: False for t in self._load_tags}
        coils: set[tuple[str, str | None]] = set()
        if self.power_on:
            _, find = self._union()
            pairs = {(find(s.hot), find(s.common)) for s in self._supplies}
            for el in self._loads:
                a, b = find(el.left), find(el.right)
                if (a, b) in pairs or (b, a) in pairs:
                    state[el.tag] = True
                    if el.tag in self.latched or el.tag in self.started or el.tag in self._drive_stop or el.tag in self._drive_tags:
                        coils.add((el.tag, el.part))
        self._energized = state
        self._latch_coils = coils

    def _update(self) -> bool:
        """Move contacts after the coils; True when anything changed."""
        changed = False
        for tag in self._relays:
            on = self._energized.get(tag, False)
            if self.moved[tag] != on:
                self.moved[tag] = on
                changed = True
        for tag in self._drive_tags:  # runs: run input on, stop input on where drawn, not tripped
            on = self._latch_coils
            run = ((tag, "run") in on and (tag not in self._drive_stop or (tag, "stop") in on)
                   and not self.tripped.get(tag, False))
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
                out = True if on else (timer.out and self.power_on and timer.preset > _EPS)
            else:
                out = on and (timer.out or timer.preset <= _EPS)
            if out != timer.out:
                timer.out = out
                changed = True
        return changed

    def _settle(self) -> StepResult:
        seen = {self._key(): 0}
        states = [self._key()]
        energized = [dict(self._energized)]
        result = StepResult()
        for _ in range(_MAX_ITERATIONS):
            self._evaluate()
            energized[-1] = dict(self._energized)
            if not self._update():
                break
            key = self._key()
            if key in seen:
                cycle = energized[seen[key]:]
                result.oscillating = [t for t in self._coil_tags if len({e.get(t) for e in cycle}) > 1]
                if not result.oscillating:  # pragma: no cover - a cycle moves some coil
                    result.oscillating = list(self._coil_tags)
                result.settled = False
                self._evaluate()
                break
            seen[key] = len(states)
            states.append(key)
            energized.append(dict(self._energized))
        else:
            result.settled = False
            result.oscillating = list(self._coil_tags)
        result.shorts = self._shorts()
        if result.shorts:
            result.settled = False
        result.why = self._why(result)
        return result

    def _why(self, result: StepResult) -> str:
        parts = []
        if result.oscillating:
            parts.append(f"oscillation: {', '.join(result.oscillating)} {'keeps' if len(result.oscillating) == 1 else 'keep'} switching on and off")
        for name, texts in result.shorts:
            parts.append(f"short circuit of supply {name}: {self._short_texts.get(name, '-'.join(texts))}")
        return "; ".join(parts)

    def _shorts(self) -> list[tuple[str, list[str]]]:
        self._short_texts: dict[str, str] = {}
        if not self.power_on:
            return []
        _, find = self._union()
        out = []
        adj: dict[str, list[Element]] | None = None
        for s in self._supplies:
            if find(s.hot) != find(s.common):
                continue
            if adj is None:
                adj = {}
                for el in self._switchable:
                    if self._closed(el):
                        adj.setdefault(el.left, []).append(el)
                        adj.setdefault(el.right, []).append(el)
            back: dict[str, Element | None] = {s.hot: None}
            queue = deque([s.hot])
            while queue and s.common not in back:
                w = queue.popleft()
                for el in adj.get(w, ()):
                    x = el.right if el.left == w else el.left
                    if x not in back:
                        back[x] = el
                        queue.append(x)
            path: list[Element] = []
            w = s.common
            while back.get(w) is not None:
                el = back[w]
                path.append(el)  # type: ignore[arg-type]
                w = el.right if el.left == w else el.left  # type: ignore[union-attr]
            path.reverse()
            self._short_texts[s.name] = path_text(s.hot, path)
            out.append((s.name, [el.text for el in path]))
        return out

    # -- queries --------------------------------------------------------------
    def energized(self, tag: str) -> bool:
        """Whether load ``tag`` (a device's coil, or a bare load) is energized."""
        return self._energized.get(tag, False)

    def states(self) -> dict[str, bool]:
        """Every load tag, file order, and whether it is energized."""
        held = {**self.latched, **self.started}
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
        if tag in self._drive_tags:
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
            if step is None or step > remaining + _EPS:
                self._advance(remaining)
                return result
            self._advance(step)
            remaining = max(0.0, remaining - step)
            for timer in self._timers.values():
                if timer.due_in() is not None and timer.elapsed >= timer.preset - _EPS:
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
                if period > _EPS:
                    remaining -= math.floor(remaining / period) * period
                history.clear()
            history[key] = remaining
        self._advance(remaining)  # pragma: no cover - bounded for safety
        return result

    def _advance(self, dt: float) -> None:
        self.time += dt
        for timer in self._timers.values():
            timer.elapsed += dt

    # -- scenarios ------------------------------------------------------------
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
