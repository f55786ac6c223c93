"""A stop button stops only the paths it is on. Where the seal-in, a second start station or a
parallel branch reaches the coil without passing the stop, pressing stop leaves the motor running.
For every coil a stop button's contact serves, the rule asks whether the coil can be energized with
all of that button's contacts taken out, and names such a path. Several stop stations belong in
series; a stop wired in parallel with another is bypassed by it. A drive's or soft starter's run and
stop inputs are coils here: they start and hold its motor.

A drive set to control: three-wire latches its run command itself and stops only when its stop
input drops, so a stop button serving either of its inputs must be on every path to its stop input:
one wired only in the run input blocks a start but does not stop the running drive, and is reported.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.circuit.wiresets import WireSets
from ctllint.reading.kinds import LOAD, three_wire
from ctllint.reading.model import Element, Severity
from ctllint_plugins.motor_control._devices import STARTER_EXAMPLE, coil_loads, device_of, drive_command_inputs, is_stop_device
from ctllint_plugins.motor_control._paths import path_walk


def _wire_groups(ctx: CheckContext) -> dict[str, str]:
    """Wires joined through non-load elements: wire -> representative of its group."""
    elements = ctx.schematic.elements
    groups = WireSets((el.left, el.right) for el in elements if el.role and el.role != LOAD)
    return {w: groups.find(w) for el in elements for w in (el.left, el.right)}


def _side_text(path: list[Element], load: Element, near: Element, ctx: CheckContext, groups: dict[str, str]) -> str:
    """The part of ``path`` on the same side of ``load`` as element ``near``.

    Two sides of a coil are joined only through loads, so the wires of each
    side fall in different groups of non-load wiring; the side whose group
    holds ``near`` is the one that matters to the reader.
    """
    items = path_walk(path, load, ctx)
    if load.text not in items:
        return "-".join(items)
    at = items.index(load.text)
    hot_side, common_side = items[:at], items[at + 1:]
    group = groups.get(near.left)
    if group is not None and any(groups.get(w) == group for w in hot_side[0::2]):
        return "-".join(hot_side)
    if group is not None and any(groups.get(w) == group for w in common_side[0::2]):
        return "-".join(common_side)
    return "-".join(items)


def _load_words(ctx: CheckContext, load: Element) -> str:
    """``coil M1`` for a coil, ``drive input VFD1.run`` for a drive's or soft starter's command input."""
    if load.part == "coil":
        return f"coil {load.tag}"
    return f"{device_of(ctx, load.tag).kind} input {load.text}"


def check(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    # A drive's run and stop inputs start and hold its motor as a coil does.
    coil_by_index = {c.index: c for c in coil_loads(ctx) + drive_command_inputs(ctx, "run", "stop")}
    groups: dict[str, str] | None = None
    # A three-wire drive stops only by its stop input: every stop serving it must be on every path to that.
    stop_inputs: dict[str, list[Element]] = {}
    for load in drive_command_inputs(ctx, "stop"):
        if three_wire(device_of(ctx, load.tag)):
            stop_inputs.setdefault(load.tag, []).append(load)
    for tag, dev in ctx.schematic.devices.items():
        if not is_stop_device(dev):
            continue
        stop_elements = circuit.elements_of(tag)
        if not stop_elements:
            continue
        served: dict[int, Element] = {}  # coil index -> the first of the stop's contacts serving it
        for el in stop_elements:
            for load in circuit.served_loads(el):
                served.setdefault(load.index, el)
        drives_done: set[str] = set()
        for index in sorted(served):  # only the coils this stop serves, file order: linear overall
            coil = coil_by_index.get(index)
            if coil is None:
                continue
            stop = served[index]
            what = "emergency stop" if dev.get("function") == "emergency-stop" else "stop button"
            if coil.tag in stop_inputs:
                if coil.tag not in drives_done:
                    drives_done.add(coil.tag)
                    yield from _three_wire_finding(ctx, coil, stop, stop_elements, stop_inputs[coil.tag], served, f"{what} {tag}")
                continue
            path = circuit.energizing_path(coil, without=stop_elements)
            if path is None:
                continue
            if groups is None:
                groups = _wire_groups(ctx)
            yield Finding(
                stop.loc,
                f"{_load_words(ctx, coil)} can be energized without passing {what} {tag} "
                f"(path {_side_text(path, coil, stop, ctx, groups)}): wire every path to the coil through "
                f"{tag}, with the seal-in and other start contacts after it",
                f"{stop.text}@{coil.text}",
            )


def _three_wire_finding(ctx: CheckContext, served_input: Element, stop: Element, stop_elements: list[Element],
                        stop_loads: list[Element], served: dict[int, Element], what: str) -> Iterator[Finding]:
    """A stop serving a three-wire drive that does not drop its stop input: it cannot stop the latched drive."""
    kind = device_of(ctx, served_input.tag).kind
    for load in stop_loads:
        path = ctx.circuit.energizing_path(load, without=stop_elements)
        if path is None:
            continue
        where = _side_text(path, load, path[0], ctx, _wire_groups(ctx))
        if not any(s.index in served for s in stop_loads):
            yield Finding(
                stop.loc,
                f"{what} is only in the run input {served_input.text} of {kind} {served_input.tag}, which is set to "
                f"three-wire control and latches its run command: {stop.tag} can block a start but cannot stop it "
                f"(its stop input {load.text} stays energized: path {where}); wire {stop.tag} in series with {load.text}",
                f"{stop.text}@{load.text}",
            )
        else:
            yield Finding(
                stop.loc,
                f"the stop input {load.text} of three-wire {kind} {served_input.tag} can be energized without passing "
                f"{what} (path {where}): the drive latches its run command and stops only when that input drops, so "
                f"wire every path to {load.text} through {stop.tag}",
                f"{stop.text}@{load.text}",
            )
        return


RULE = Rule(
    name="stop-in-series",
    severity=Severity.ERROR,
    summary="a coil served by a stop button has a path that avoids every contact of it",
    doc=reflow(__doc__),
    source="common practice (stop buttons normally closed and in series); NFPA 79 9.2.5.3",
    check=check,
    failing=Example("seal-in wired around the stop", STARTER_EXAMPLE + "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n      - [L1, M1.NO, 3]\n"),
    passing=Example("seal-in around the start only", STARTER_EXAMPLE + "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n      - [2, M1.NO, 3]\n"),
)
