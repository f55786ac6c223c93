"""The ``expect`` section: scenarios of steps, and which devices each step may work.

A step is one action (press, release, set, trip, reset, power, wait, check);
once every device is read, a step naming a device its action cannot work is a
format error (``check_step_targets``). Its own module because scenarios are
read apart from the circuit they exercise.
"""
from __future__ import annotations

from typing import Any

from ctllint.reading import kinds as K
from ctllint.reading.kinds import DeviceKind
from ctllint.reading.loader.sink import Stop, article
from ctllint.reading.loader.state import FileState
from ctllint.reading.loader.values import TAG_RE
from ctllint.reading.model import Device, Scenario, Schematic, Step
from ctllint.reading.yamlsafe import Node, SequenceNode

STEP_ACTIONS = ("press", "release", "set", "trip", "reset", "power", "wait", "check")


def read_expect(st: FileState, node: Node, sch: Schematic) -> None:
    names: set[str] = set()
    for snode in st.values.sequence(node, "expect"):
        try:
            entries = st.values.mapping(snode, "a scenario")
        except Stop:
            continue
        keys = {k: (kn, vn) for k, kn, vn in entries}
        for key, kn, _ in entries:
            if key not in ("name", "steps"):
                st.sink.unknown_key(kn, key, "a scenario", ("name", "steps"))
        if "name" not in keys or "steps" not in keys:
            st.sink.error(snode, "a scenario needs 'name' and 'steps'")
            continue
        try:
            name = st.values.text(keys["name"][1], "scenario name")
        except Stop:
            continue
        if name in names:
            st.sink.error(keys["name"][1], f"scenario name '{name}' is used twice")
        names.add(name)
        scen = Scenario(name=name, loc=st.sink.loc(snode))
        try:
            for stnode in st.values.sequence(keys["steps"][1], "steps"):
                try:
                    scen.steps.append(read_step(st, stnode))
                except Stop:
                    pass
        except Stop:
            pass
        sch.expect.append(scen)


def read_step(st: FileState, node: Node) -> Step:
    entries = st.values.mapping(node, "a step")
    if len(entries) != 1:
        st.sink.fail(node, f"a step has exactly one action ({', '.join(STEP_ACTIONS)})")
    action, knode, vnode = entries[0]
    if action not in STEP_ACTIONS:
        st.sink.unknown_key(knode, action, "a step", STEP_ACTIONS)
        raise Stop
    step = Step(action=action, loc=st.sink.loc(knode))
    if action in ("press", "release", "trip", "reset"):
        tnodes = vnode.value if isinstance(vnode, SequenceNode) else [vnode]
        if not tnodes:
            st.sink.fail(vnode, f"{action} names no device")
        for tn in tnodes:
            t = st.values.tag(tn, f"{action} target")
            step.targets[t] = None
            step.target_locs[t] = st.sink.loc(tn)
    elif action == "power":
        value = st.values.text(vnode, "power", ("on", "off"))
        step.targets[""] = value
        step.target_locs[""] = st.sink.loc(vnode)
    elif action == "wait":
        step.seconds = st.values.quantity(vnode, K.TIME, "wait").value
    else:  # set, check
        for t, kn, vn in st.values.mapping(vnode, action):
            if not TAG_RE.match(t):
                st.sink.fail(kn, f"'{t}' is not a device tag")
            v = st.values.scalar(vn, f"{action} {t}")
            if action == "check":
                if v not in ("on", "off"):
                    st.sink.fail(vn, f"check {t}: expected on or off, not '{vn.value}'")
                step.targets[t] = v == "on"
            else:
                if isinstance(v, int) and not isinstance(v, bool):
                    v = str(v)
                if not isinstance(v, str):
                    st.sink.fail(vn, f"set {t}: expected a position name or on/off, not '{vn.value}'")
                step.targets[t] = v
            step.target_locs[t] = st.sink.loc(kn)
    return step


def check_step_targets(st: FileState, sch: Schematic) -> None:
    """An ``expect`` step naming a device of a kind the action cannot work is a format error.

    press: a hand- or process-worked switch; release: the same or a
    selector; set: a selector (one of its positions), a switch or a PLC
    output (on/off); trip and reset: an overload, fuse or breaker; check: a
    load (a coil, solenoid, light, horn or PLC input). An undeclared tag is
    left to the unknown-device rule.
    """
    for scenario in sch.expect:
        for step in scenario.steps:
            for tag, value in step.targets.items():
                dev = sch.devices.get(tag)
                kind = st.kinds.get(dev.kind) if dev is not None else None
                if kind is None:
                    continue
                where = step.target_locs.get(tag, step.loc)
                problem = _step_problem(step.action, kind, dev, value)
                if problem:
                    st.sink.error(where, f"{step.action} {tag}: {tag} is {article(dev.kind)}; {problem}")


_TRIPPABLE = ("overload", "fuse", "breaker", "drive", "soft-starter", "motor-breaker")  # a drive's trip: its fault relay


def _step_problem(action: str, kind: DeviceKind, dev: Device, value: Any) -> str | None:
    """Why ``action`` cannot work a device of ``kind`` (None when it can)."""
    switch = kind.mechanical and not kind.positions
    if action == "press":
        return None if switch else "press works a pushbutton or another hand- or process-worked switch"
    if action == "release":
        return None if kind.mechanical else "release works a pushbutton, switch or selector"
    if action in ("trip", "reset"):
        return None if kind.name in _TRIPPABLE else f"{action} works an overload, fuse, breaker, motor breaker, drive or soft starter"
    if action == "check":
        readable = kind.coil or kind.bare in (K.LOAD, K.OUTPUT)  # loads, and what a PLC output is told
        return None if readable else "check reads a load (a coil, solenoid, pilot light, horn or PLC input) or a PLC output"
    if action == "set":
        if kind.positions:
            positions = [str(p) for p in (dev.get("positions") or [])]
            return None if str(value) in positions else f"'{value}' is not one of its positions ({', '.join(positions)})"
        if switch or kind.bare == K.OUTPUT:
            return None if value in ("on", "off") else f"set a switch or PLC output to on or off, not '{value}'"
        return "set works a selector, a switch or a PLC output"
    return None
