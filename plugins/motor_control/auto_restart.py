"""After a power failure a machine must not start by itself: two-wire control (a maintained switch,
a float or pressure switch straight to the coil) restarts the motor when power returns. The rule
finds, as a least fixpoint from every coil off, which coils can come on with no button pressed:
through momentary buttons' NC contacts, maintained and process switches, NC contacts of any coil, NO
contacts of coils that can come on, fuses and overload NC contacts. PLC outputs count as open. Where
restarting is intended (a sump pump on its float), set restart: automatic on the rung. A drive or
soft starter set to control: three-wire never restarts by itself (its latch is lost with power and
it starts only on a new rising of its run input), so it is not reported and its run relay is open
at power return; a two-wire one is reported as a starter is.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import CheckContext, Example, Finding, Rule, reflow
import ctllint.reading.kinds as K
from ctllint.reading.kinds import LOAD, three_wire
from ctllint.reading.model import Element, Severity
from ctllint_plugins.motor_control._devices import (
    COIL_KINDS, CONTACTOR_KINDS, DRIVE_KINDS, coil_loads, device_of, is_mechanical, safety_loads,
)
from ctllint_plugins.motor_control._paths import path_text, subject_of


def _closable_at_power_return(ctx: CheckContext, el: Element) -> bool | None:
    """Whether ``el`` can be closed when power returns; None for a coil's NO contact (decided by the fixpoint)."""
    dev = device_of(ctx, el.tag)
    if dev is None or el.role in ("", LOAD, "output"):
        return False  # unknown, a load (never a conductor here), or a PLC output (the program owns restart)
    if el.role == "conductor":
        return True
    if dev.kind == "latching-relay":
        return True  # it holds through the outage whatever state it was in: either contact may be closed
    if dev.kind == "safety-relay":
        return None if el.part == "NO" else True  # its outputs come on when its feedback loop can (the fixpoint)
    if dev.kind in COIL_KINDS:
        return True if el.part == "NC" else None
    if three_wire(dev):  # it does not run at power return: its latch is lost
        return {"NC": True, "fault-NC": True}.get(el.part or "", False)
    if dev.kind in DRIVE_KINDS:  # its run relay follows its run input (the fixpoint); no fault at power return
        return {"NO": None, "NC": True, "fault-NO": False, "fault-NC": True}.get(el.part or "", False)
    if dev.kind == "motor-breaker":  # closed, not tripped, at power return
        return {"NO": True, "NC": False, "trip-NO": False, "trip-NC": True}.get(el.part or "", False)
    if dev.kind == "overload":
        return el.part == "NC"
    if dev.kind == "pushbutton":
        return (dev.get("action") or "momentary") == "maintained" or el.part == "NC"
    if dev.kind == "selector":
        if (dev.get("action") or "maintained") == "spring-return":
            positions = dev.get("positions") or []
            return bool(positions) and str(positions[0]) in K.selector_parts(dev).get(el.part, ())
        return True
    return is_mechanical(dev)


def check(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    blocked: list[Element] = []
    coil_no: dict[str, list[Element]] = {}
    for el in ctx.schematic.elements:
        if el.role == LOAD:
            continue
        closable = _closable_at_power_return(ctx, el)
        if closable is None:
            coil_no.setdefault(el.tag, []).append(el)
        elif not closable:
            blocked.append(el)
    # A drive or soft starter runs its motor while its run input is energized: a motor starter too.
    # A three-wire drive never restarts by itself: not one of them.
    drives = [load for load in ctx.circuit.loads if load.part == "run" and getattr(device_of(ctx, load.tag), "kind", None) in DRIVE_KINDS
              and not three_wire(device_of(ctx, load.tag))]
    coils = coil_loads(ctx) + drives
    # A safety relay restarts by itself when its feedback loop closes with no reset button pressed.
    starters = coils + safety_loads(ctx, "feedback")
    on: set[int] = set()
    changed = True
    while changed:
        changed = False
        still_blocked = [e for nos in coil_no.values() for e in nos]
        cut = circuit.cut(blocked + still_blocked)
        for coil in starters:
            if coil.index not in on and circuit.has_energizing_path(coil, without=cut):
                on.add(coil.index)
                changed = True
        for coil in starters:
            if coil.index in on:
                coil_no.pop(coil.tag, None)
    cut = circuit.cut(blocked + [e for nos in coil_no.values() for e in nos])
    for coil in coils:
        dev = device_of(ctx, coil.tag)
        if coil.index not in on or (dev.kind not in CONTACTOR_KINDS and dev.kind not in DRIVE_KINDS):
            continue
        fed = dev.get("feeds")
        fed_dev = device_of(ctx, fed) if fed else None
        if fed_dev is None or fed_dev.kind != "motor":
            continue
        if ctx.schematic.rungs[coil.rung].restart == "automatic":
            continue
        path = circuit.energizing_path(coil, without=cut)
        yield Finding(
            coil.loc,
            f"{dev.kind} {coil.text if dev.kind in DRIVE_KINDS else coil.tag} (motor {fed}) can "
            f"{'run' if dev.kind in DRIVE_KINDS else 'energize'} when power returns with no button pressed "
            f"(path {path_text(path, coil, ctx)}): use three-wire control (momentary start with seal-in"
            f"{', or the drive set to control: three-wire with its stop input drawn' if dev.kind in DRIVE_KINDS else ''}) "
            f"so the motor stays off until started, or set restart: automatic on the rung if that is intended",
            subject_of(ctx, coil),
        )


RULE = Rule(
    name="auto-restart",
    severity=Severity.WARNING,
    summary="a motor contactor can energize when power returns with no button pressed",
    doc=reflow(__doc__),
    source="NFPA 79 7.5 / IEC 60204-1 7.5 (protection against unexpected restart)",
    check=check,
    failing=Example("maintained switch straight to the starter", "rungs:\n  - paths:\n      - [L1, SS1.run, 2, M1.coil, 3, OL1.NC, X2]\n"),
    passing=Example("intended two-wire control", "rungs:\n  - restart: automatic\n    paths:\n      - [L1, FS1.NO, 2, M1.coil, 3, OL1.NC, X2]\n"),
)
