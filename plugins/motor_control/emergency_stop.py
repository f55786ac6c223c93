"""An emergency stop must latch when pressed (releasing it must not restart anything), must open its
circuit through NC contacts (so a broken wire also stops), and must drop every contactor and starter
on its control supply, either directly in series with each coil or through a master control relay
whose coil it drops and whose NO contacts are in series with the others. Where it drops starters on
another supply through a relay (a 24 VDC safety relay switching 120 VAC starters), that supply's
contactors and starters must all be governed too. An auxiliary NO that only signals the button is
pressed (to a PLC input or a light) is not an NO use.

A contactor or starter whose device gives a reason in estop_exempt (a freeze-protection heater,
panel cooling: no motion hazard, and the risk assessment keeps it on) is left out (an empty reason
is a format error). The message names each coil that is not dropped with its own supply, never a
supply on which the emergency stop drops everything it must.

A drive's or soft starter's run input is its motor's start command and counts as its coil: the
emergency stop must drop it directly, through a relay it drops, or by dropping the drive's stop
input where one is drawn (the drive runs only while that is energized). Dropping the run command
gives a stop by command (common practice for stop category 1); whether the drive's power or its safe
torque off must also be removed is for the machine's risk assessment and stop category, which
ctllint does not see. A drive may give estop_exempt as a contactor does. A drive set to
control: three-wire latches its run command and stops only when its stop input drops: the emergency
stop must drop its stop input (directly or through a relay it drops; dropping the run and stop
inputs' common feed does both), and dropping its run input alone is not enough.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.kinds import three_wire
from ctllint.reading.model import Element, Severity
from ctllint_plugins.motor_control._devices import (
    CONTACTOR_KINDS, DRIVE_KINDS, coil_loads, coils_of, contacts_of, device_of, drive_command_inputs, safety_loads,
    signal_only,
)
from ctllint_plugins.motor_control._paths import names_of


def _governed(ctx: CheckContext, tag: str) -> set[int]:
    """Coils governed by emergency stop ``tag``: its contacts, or NO contacts of relays it governs, in series.

    A least fixpoint: a coil is governed when every energizing path passes a
    contact of the stop or a NO contact of a device whose coils are all
    governed (a master control relay, possibly in a chain).
    """
    circuit = ctx.circuit
    cut = list(circuit.elements_of(tag))
    coils = coil_loads(ctx)
    # A safety relay drops its outputs when its power or either channel drops: it is governed
    # when one of those is (the stop in one channel of a dual-channel circuit is enough here;
    # both channels are the safety relay's own business).
    inputs = safety_loads(ctx, "power", "ch1", "ch2")
    # A drive stops when its run input drops, or its stop input where drawn. Its run relay is not
    # taken as governing what it serves (it may be set to signal something other than "running").
    drives = drive_command_inputs(ctx, "run", "stop")
    governed: set[int] = set()
    done_devices: set[str] = set()
    changed = True
    while changed:
        changed = False
        for coil in coils + inputs + drives:
            if coil.index in governed or not circuit.has_energizing_path(coil):
                continue
            if not circuit.has_energizing_path(coil, without=cut):
                governed.add(coil.index)
                changed = True
        for coil in coils:
            if coil.tag in done_devices:
                continue
            if all(c.index in governed for c in coils_of(ctx, coil.tag)):
                done_devices.add(coil.tag)
                cut.extend(contacts_of(ctx, coil.tag, "NO"))
                changed = True
        for load in inputs:
            if load.tag not in done_devices and load.index in governed:
                done_devices.add(load.tag)
                cut.extend(contacts_of(ctx, load.tag, "NO"))
                changed = True
    return governed


def check(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    for tag, dev in ctx.schematic.devices.items():
        if dev.kind != "pushbutton" or dev.get("function") != "emergency-stop":
            continue
        problems = []
        if (dev.get("action") or "momentary") != "maintained":
            problems.append("it is momentary, not maintained (latching): releasing it must not restart anything, so use a latching device (action: maintained)")
        elements = circuit.elements_of(tag)
        no = [e for e in elements if e.part == "NO" and not signal_only(ctx, e)]
        if no:
            problems.append(f"it is used through its NO contact {names_of(no)}: an emergency stop must open its circuit, so use NC contacts")
        supplies = []
        for el in elements:
            if el.part == "NO" and signal_only(ctx, el):
                continue  # an auxiliary "pressed" signal, perhaps to a PLC on another supply
            for load in circuit.served_loads(el):
                supply = circuit.supply_of(load)
                if supply is not None and supply.name not in supplies:
                    supplies.append(supply.name)
        if supplies:
            governed = _governed(ctx, tag)
            # A supply whose contactors it drops through a relay (a 24 VDC safety
            # relay switching 120 VAC starters) is its supply too.
            # A drive's or soft starter's run input starts its motor as a starter's coil does: it is
            # one of the "coils" to drop, and dropped when its run input or its stop input is.
            drive_inputs = drive_command_inputs(ctx, "run", "stop")
            # A three-wire drive latches its run command: only its stop input stops it.
            stopped_drives = {load.tag for load in drive_inputs if load.index in governed
                              and (load.part == "stop" or not three_wire(device_of(ctx, load.tag)))}
            for coil in coil_loads(ctx) + drive_inputs:
                supply = circuit.supply_of(coil) if coil.index in governed else None
                if supply is not None and supply.name not in supplies and device_of(ctx, coil.tag).kind in (*CONTACTOR_KINDS, *DRIVE_KINDS):
                    supplies.append(supply.name)
            missed: dict[str, list[Element]] = {}  # supply name -> coils it does not drop there
            for coil in coil_loads(ctx) + [load for load in drive_inputs if load.part == "run"]:
                coil_dev = device_of(ctx, coil.tag)
                supply = circuit.supply_of(coil)
                if coil_dev.kind not in (*CONTACTOR_KINDS, *DRIVE_KINDS) or supply is None or supply.name not in supplies:
                    continue
                latched = coil.part == "run" and three_wire(coil_dev)  # its run input dropped does not stop it
                if (coil.index in governed and not latched) or coil.tag in stopped_drives or not circuit.has_energizing_path(coil):
                    continue
                reason = coil_dev.get("estop_exempt")
                if isinstance(reason, str) and reason.strip():
                    continue  # left running on purpose, for the reason given (an empty one is a format error)
                if latched:  # named by the input that would stop it, which stays energized
                    coil = next((s for s in drive_inputs if s.tag == coil.tag and s.part == "stop"), coil)
                missed.setdefault(supply.name, []).append(coil)
            if missed:
                # Each coil with its own supply: never a supply where nothing is missed.
                where = "; ".join(f"{names_of(coils)} on supply {name}" for name, coils in missed.items())
                drives_missed = [c for coils in missed.values() for c in coils if c.part in ("run", "stop")]
                runs = keeps = ""
                if drives_missed:
                    runs = " and drive run input" if any(c.part == "run" for c in drives_missed) else ""
                    runs += " and three-wire drive stop input" if any(c.part == "stop" for c in drives_missed) else ""
                    keeps = "".join(
                        f"; {device_of(ctx, c.tag).kind} {c.tag} keeps "
                        + (f"motor {device_of(ctx, c.tag).get('feeds')}" if device_of(ctx, c.tag).get("feeds") else "its motor") + " running"
                        + (f" (it is set to three-wire control and latches its run command: {tag} must drop its stop input)"
                           if three_wire(device_of(ctx, c.tag)) else "")
                        for c in drives_missed)
                problems.append(
                    f"it does not govern {where} (each can be energized with "
                    f"{tag} pressed{keeps}): put it in series with every "
                    f"contactor and starter coil{runs}, directly or through a master control relay it drops, "
                    f"or give a device that must stay on its reason in estop_exempt"
                )
        if problems:
            yield Finding(dev.loc, f"emergency stop {tag}: " + "; ".join(problems), tag)


RULE = Rule(
    name="emergency-stop",
    severity=Severity.ERROR,
    summary="an emergency stop that does not latch, is not NC, or does not drop every contactor",
    doc=reflow(__doc__),
    source="NFPA 79 9.2.5.4 / IEC 60204-1 10.7 (emergency stop devices), ISO 13850; drive run inputs: IEC 60204-1 9.2.2 stop categories, from memory, and common practice",
    check=check,
    failing=Example("momentary emergency stop", "devices:\n  ES1: {kind: pushbutton, function: emergency-stop}\n"),
    passing=Example("latching emergency stop through an MCR", "devices:\n  ES1: {kind: pushbutton, function: emergency-stop, action: maintained}\nrungs:\n  - paths:\n      - [L1, ES1.NC, 2, MCR.coil, X2]\n      - [L1, MCR.NO, 3, PB1.NC, 4, PB2.NO, 5, M1.coil, 6, OL1.NC, X2]\n"),
)
