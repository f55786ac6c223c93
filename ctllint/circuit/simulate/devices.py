"""The devices a simulator works, read once from the circuit: kinds, timers, what a hand moves.

Which tags are switches, trip devices, PLC outputs, relays, timers,
alternating, latching and safety relays and drives, selectors' positions and
cam tables, the loads and the elements that can conduct. Fixed for a
simulator's life; its own module so that the state and its settling
(``state``, ``settle``) read apart from this sorting of the schematic.
"""
from __future__ import annotations

from typing import TYPE_CHECKING

from ctllint.reading.kinds import three_wire

if TYPE_CHECKING:  # pragma: no cover
    from ctllint.circuit.graph import CircuitGraph

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
DRIVES = ("drive", "soft-starter")  # run while run (and stop, where drawn) inputs are on and not tripped; three-wire: latched
# Kinds whose contacts are never worked by hand (a relay whose coil is in no
# rung keeps its contacts at rest).
_NOT_SWITCHES = {"selector", "overload", "relay", "timer", "contactor", "starter", "alternating-relay", "latching-relay",
                 "safety-relay", *DRIVES, "breaker", "motor-breaker"}
EPS = 1e-9


class Timer:
    """A timer's state: coil on, time spent in that state, contacts moved."""

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


class DeviceTables:
    """The devices of a circuit as the simulator sorts them (FORMAT.md "Behaviour model")."""

    def __init__(self, circuit: "CircuitGraph"):
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
        self._timers: dict[str, Timer] = {}
        self._alternators: dict[str, list] = {}
        # Latching relays: whether each is set. Its set coil sets it, its reset coil resets it (reset wins
        # when both are on), and power off changes nothing.
        self._latch_tags = [t for t in self._load_tags if self._kind.get(t) == "latching-relay"]
        # Safety relays: whether the outputs are on (started). They start when power, both channels
        # and the feedback loop are on together, and stop as soon as power or a channel drops.
        self._safety_tags = [t for t in self._load_tags if self._kind.get(t) == "safety-relay"]
        self._drive_tags = [t for t in self._load_tags if self._kind.get(t) in DRIVES]
        self._drive_set = set(self._drive_tags)  # for membership: a panel may hold hundreds of drives
        self._drive_stop = {el.tag for el in self._loads if el.tag in self._drive_set and el.part == "stop"}
        # Drives set to three-wire control latch a start pulse themselves (``coils``).
        self._three_wire = [t for t in self._drive_tags if three_wire(sch.devices.get(t))]
        self._latching_drives = frozenset(self._three_wire)
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
                self._timers[tag] = Timer(tag, dev.get("delay") == "off", seconds)
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
