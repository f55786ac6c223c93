"""Cross-references that are format errors, checked once every section is read.

A field naming a device of the wrong kind, a speed the motor lacks, a supply's
source that is no transformer, a transformer fuse without its side, an
``expect`` step that cannot work its device, and written terminal numbers
that put two wires on one terminal; element roles are filled in on the way.
Its own module because these need the whole file, not one section.
"""
from __future__ import annotations

from ctllint.reading import kinds as K
from ctllint.reading.loader.expect import check_step_targets
from ctllint.reading.loader.sink import article
from ctllint.reading.loader.state import FileState
from ctllint.reading.model import Schematic
from ctllint.reading.terminals import assign as assign_terminals, conflicts as terminal_conflicts


def check_device_references(st: FileState, sch: Schematic) -> None:
    """Fill element roles; a field naming a device of the wrong kind is a format error."""
    for dev in sch.devices.values():
        if dev.origin != st.path:
            continue
        kind = st.kinds.get(dev.kind)
        for name, spec in kind.fields.items():
            if spec.type not in (K.TAG, K.TAGS) or not spec.tag_kinds or name not in dev.fields:
                continue
            tags = dev.fields[name] if spec.type == K.TAGS else [dev.fields[name]]
            for t in tags:
                other = sch.devices.get(t)
                if other is not None and other.kind not in spec.tag_kinds:
                    st.sink.error(dev.at(name), f"{name} of {dev.tag} names {t}, {article(other.kind)}; it must be {' or '.join(article(k) for k in spec.tag_kinds)}")
        speed = dev.get("speed")
        motor = sch.devices.get(dev.get("feeds") or "") if speed is not None else None
        if motor is not None and motor.kind == "motor":
            names = [s.name for s in motor.get("speeds") or ()]
            if speed not in names:
                have = f"its speeds are {', '.join(names)}" if names else "it gives no speeds"
                st.sink.error(dev.at("speed"), f"speed of {dev.tag} names '{speed}', not a speed of motor {motor.tag} ({have})")
    for sup in sch.supplies.values():
        if sup.source and sup.source in sch.devices:
            other = sch.devices[sup.source]
            if other.kind not in ("transformer", "power-supply"):
                st.sink.error(sup.at("source"), f"source of supply {sup.name} names {sup.source}, {article(other.kind)}; it must be a transformer or power-supply")
    for dev in sch.devices.values():
        if dev.kind != "transformer" or dev.origin != st.path:
            continue
        for i, t in enumerate(dev.get("fuses") or []):
            fuse = sch.devices.get(t)
            if fuse is not None and fuse.kind in ("fuse", "breaker") and fuse.get("side") is None:
                st.sink.error(fuse.loc, f"{fuse.kind} {t} is listed in the fuses of transformer {dev.tag} and needs 'side: primary' or 'side: secondary'")
    check_step_targets(st, sch)
    for el in sch.elements:
        dev = sch.devices.get(el.tag)
        if dev is None:
            continue
        kind = st.kinds.get(dev.kind)
        role = kind.part_role(el.part)
        if role is None and kind.positions and el.part in K.selector_parts(dev):
            role = K.CONTACT
        el.role = role or ""
        el.inductive = bool(role == K.LOAD and kind.inductive)
    check_three_wire_stops(st, sch)
    check_terminals(st, sch)


def check_three_wire_stops(st: FileState, sch: Schematic) -> None:
    """A three-wire drive whose run input is drawn and whose stop input is not: nothing could stop it.

    It latches its run command until its stop input drops, so without one the
    control circuit can start it but never stop it (only a trip or a loss of
    control power would). Reported at its first run input, in the file that
    draws it (the device may come from a shared device file).
    """
    runs: dict[str, object] = {}
    stops: set[str] = set()
    for el in sch.elements:
        if el.part == "run" and el.role == K.LOAD:
            runs.setdefault(el.tag, el)
        elif el.part == "stop" and el.role == K.LOAD:
            stops.add(el.tag)
    for tag, el in runs.items():
        dev = sch.devices.get(tag)
        if tag not in stops and K.three_wire(dev):
            st.sink.error(el.loc, f"{dev.kind} {tag} is set to control: three-wire (it latches its run command until its stop "
                                  f"input drops), but its stop input {tag}.stop is drawn in no rung, so nothing in the control "
                                  f"circuit could stop it: draw {tag}.stop through the stop button's NC contact, or set "
                                  f"control: two-wire")


def check_terminals(st: FileState, sch: Schematic) -> None:
    """Written terminal numbers of one device that put two wires on one terminal."""
    if any(el.terminals for el in sch.elements):
        for el, message in terminal_conflicts(sch, assign_terminals(sch, st.kinds)):
            st.sink.error(el.loc, message)
