"""What the motor-control rules ask about devices and the loads and contacts they have.

Which loads are coils the rules govern (relay, timer, contactor and starter
coils; a drive's or soft starter's run and stop inputs; a safety relay's
inputs), which contacts a device has, what a stop button, a momentary
pushbutton or a mechanical switch is, which NO contacts of a stop only signal
"pressed", and which contactors are declared interlocked. Also the devices of
a three-wire starter that several rules' examples declare. Its own module
because most rules of the plugin ask some of these questions and none owns
them.
"""
from __future__ import annotations

from ctllint.api import CheckContext
from ctllint.reading.kinds import BUILTIN_KINDS, LOAD
from ctllint.reading.model import Element


KINDS = {k.name: k for k in BUILTIN_KINDS}
COIL_KINDS = ("relay", "timer", "contactor", "starter", "alternating-relay")
CONTACTOR_KINDS = ("contactor", "starter")
STOP_FUNCTIONS = ("stop", "emergency-stop")
DRIVE_KINDS = ("drive", "soft-starter")
SIGNAL_KINDS = ("pilot-light", "horn", "plc-input")


def device_of(ctx: CheckContext, tag: str):
    return ctx.schematic.devices.get(tag)


def is_stop_device(dev) -> bool:
    return dev is not None and dev.kind == "pushbutton" and dev.get("function") in STOP_FUNCTIONS


def is_momentary_pushbutton(dev) -> bool:
    return dev is not None and dev.kind == "pushbutton" and (dev.get("action") or "momentary") == "momentary"


def is_mechanical(dev) -> bool:
    kind = KINDS.get(dev.kind) if dev is not None else None
    return bool(kind and kind.mechanical)


def coils_of(ctx: CheckContext, tag: str) -> list[Element]:
    return [e for e in ctx.circuit.elements_of(tag) if e.part == "coil" and e.role == LOAD]


def contacts_of(ctx: CheckContext, tag: str, part: str | None = None) -> list[Element]:
    return [e for e in ctx.circuit.elements_of(tag) if e.role == "contact" and (part is None or e.part == part)]


def safety_loads(ctx: CheckContext, *parts: str) -> list[Element]:
    """The named inputs (``power``, ``ch1``, ``ch2``, ``feedback``) of every safety relay, file order."""
    return [load for load in ctx.circuit.loads if load.part in parts and getattr(device_of(ctx, load.tag), "kind", None) == "safety-relay"]


def coil_loads(ctx: CheckContext) -> list[Element]:
    """Coil elements of relays, timers, contactors and starters, in file order."""
    out = []
    for load in ctx.circuit.loads:
        dev = device_of(ctx, load.tag)
        if load.part == "coil" and dev is not None and dev.kind in COIL_KINDS:
            out.append(load)
    return out


def drive_command_inputs(ctx: CheckContext, *parts: str) -> list[Element]:
    """The named command inputs (``run``, ``stop``) of every drive and soft starter, file order."""
    return [load for load in ctx.circuit.loads if load.part in parts and getattr(device_of(ctx, load.tag), "kind", None) in DRIVE_KINDS]


def signal_only(ctx: CheckContext, el: Element) -> bool:
    """``el`` is an auxiliary NO of a stop device that only signals "pressed".

    The device stops through an NC contact used in the rungs, and this NO
    serves only pilot lights, horns and PLC inputs (an e-stop's auxiliary
    contact telling the PLC, say): it starts or holds nothing, so a broken
    wire on it cannot keep anything running.
    """
    if not any(e.part == "NC" for e in contacts_of(ctx, el.tag)):
        return False
    loads = ctx.circuit.served_loads(el)
    return bool(loads) and all(getattr(device_of(ctx, x.tag), "kind", None) in SIGNAL_KINDS for x in loads)


def interlock_pairs(ctx: CheckContext) -> list[tuple[str, str]]:
    """Declared interlock pairs (each once, in file order), both devices known and of contactor kind."""
    seen = set()
    pairs = []
    for tag, dev in ctx.schematic.devices.items():
        other = dev.get("interlock") if dev.kind in CONTACTOR_KINDS else None
        other_dev = device_of(ctx, other) if other else None
        if other_dev is None or other_dev.kind not in CONTACTOR_KINDS or other == tag:
            continue
        key = frozenset((tag, other))
        if key not in seen:
            seen.add(key)
            pairs.append((tag, other))
    return pairs


STARTER_EXAMPLE = """\
devices:
  PB1: {kind: pushbutton, function: stop}
  PB2: {kind: pushbutton, function: start}
  M1: {kind: starter, coil: 120 VAC, overload: OL1, feeds: MTR1}
"""
