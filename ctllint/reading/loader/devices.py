"""The ``devices`` section: each device's tag, kind and fields, checked against its kind.

The section is read entry by entry while the file is parsed (``device_entry``)
when it is a plain mapping, whole (``read_devices``) otherwise. Field values
are read by their type here; the contact ratings they may hold are in
``ratings``. Its own module because a device's fields are the bulk of the
format and follow the device-kind table, not the file's layout.
"""
from __future__ import annotations

import math
from typing import Any

from ctllint.reading import kinds as K
from ctllint.reading.kinds import DeviceKind
from ctllint.reading.loader.ratings import read_power_rating, read_rating
from ctllint.reading.loader.sink import Stop, closest
from ctllint.reading.loader.state import FileState
from ctllint.reading.loader.values import TAG_RE, consume, describe, describe_value
from ctllint.reading.model import ContactCount, Device, MotorSpeed, Schematic
from ctllint.reading.yamlsafe import MappingNode, Node, ScalarNode, SequenceNode, scalar_value


def read_devices(st: FileState, node: Node, sch: Schematic) -> None:
    """The ``devices`` section when it was not streamed (not a mapping, or an alias)."""
    if isinstance(node, ScalarNode) and scalar_value(node) is None:
        return
    if not isinstance(node, MappingNode):
        st.sink.fail(node, f"devices must be a mapping (key: value), not {describe(node)}")
    for knode, vnode in consume(list(node.value), node):
        device_entry(st, knode, vnode)


def device_entry(st: FileState, knode: ScalarNode | None, vnode: Node) -> None:
    """One entry of ``devices``, read as soon as the parser has it."""
    tag = st.values.entry_key(knode, "devices", st.device_keys)
    if tag is None:
        return
    tag = st.values.texts.setdefault(tag, tag)  # one string for the tag and every element naming it
    if not TAG_RE.match(tag):
        st.sink.error(knode, f"device tag '{tag}' holds a dot or a space")
        return
    try:
        dev = read_device(st, tag, knode, vnode)
    except Stop:
        return
    st.sch.devices[tag] = dev


def read_device(st: FileState, tag: str, knode: Node, vnode: Node) -> Device:
    entries = st.values.mapping(vnode, f"device {tag}")
    fields = {k: (kn, vn) for k, kn, vn in entries}
    if "kind" not in fields:
        st.sink.fail(knode, f"device {tag} has no 'kind' (one of: {', '.join(st.kinds.names())})")
    kind_node = fields["kind"][1]
    kind_name = st.values.text(kind_node, f"kind of {tag}")
    kind = st.kinds.get(kind_name)
    if kind is None:
        hint = closest(kind_name, tuple(st.kinds.names()))
        st.sink.fail(kind_node, f"unknown device kind '{kind_name}' for {tag}" + (f" (did you mean '{hint}'?)" if hint else ""))
    dev = Device(tag, kind_name, st.sink.loc(knode), origin=st.path)
    names = ["kind"]  # where each field's value stands, packed into the device at the end
    positions = [(kind_node.line, kind_node.column)]
    allowed = ("kind", *kind.fields)
    ok = True
    for name, kn, vn in entries:
        if name == "kind":
            continue
        spec = kind.fields.get(name)
        if spec is None:
            st.sink.unknown_key(kn, name, f"{kind_name} {tag}", allowed)
            ok = False
            continue
        try:
            dev.fields[name] = read_field(st, vn, spec, f"{name} of {tag}", kind)
            names.append(name)
            positions.append(st.sink.position(vn))
            if spec.type == K.TAGS and isinstance(vn, SequenceNode):
                for i, item in enumerate(vn.value):  # each tag of a list, e.g. fuses.1
                    names.append(f"{name}.{i}")
                    positions.append(st.sink.position(item))
        except Stop:
            ok = False
    for req in kind.required:
        if req not in fields:
            st.sink.error(knode, f"{kind_name} {tag} needs '{req}'")
            ok = False
    if "speeds" in dev.fields:
        for single in ("power", "fla"):
            if single in dev.fields:
                st.sink.error(fields[single][0], f"{kind_name} {tag} gives 'speeds': its {single} goes under each speed, not on the motor itself")
                ok = False
    if "cams" in dev.fields and "cams" in fields:
        ok = check_cams(st, dev, fields["cams"][1]) and ok
    for name, spec in kind.fields.items():
        if name not in dev.fields and spec.default is not None:
            dev.fields[name] = spec.default
    if not ok:
        raise Stop
    shape = tuple(names)
    dev.set_positions(st.shapes.setdefault(shape, shape), positions)
    return dev


def read_field(st: FileState, node: Node, spec: K.FieldSpec, what: str, kind: DeviceKind) -> Any:
    t = spec.type
    if t in (K.VOLTAGE, K.CURRENT, K.APPARENT, K.POWER, K.TIME, K.TEMPERATURE):
        return st.values.quantity(node, t, what)
    if t == K.BOOL:
        return st.values.boolean(node, what)
    if t == K.NUMBER:
        value = st.values.scalar(node, what)
        if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value) or value <= 0:
            st.sink.fail(node, f"{what} must be a positive number, not '{node.value}'")
        if spec.maximum is not None and value > spec.maximum:
            st.sink.fail(node, f"{what} is {spec.doc.split(' (')[0]}, at most {spec.maximum:g}, not '{node.value}'")
        return float(value)
    if t == K.COUNT:
        value = st.values.scalar(node, what)
        if isinstance(value, bool) or not isinstance(value, int) or value <= 0:
            st.sink.fail(node, f"{what} must be a positive whole number, not '{node.value}'")
        if spec.choices and str(value) not in spec.choices:
            st.sink.fail(node, f"{what} must be one of: {', '.join(spec.choices)}")
        return value
    if t == K.TEXT:
        value = st.values.scalar(node, what)
        if spec.choices and isinstance(value, bool):
            # 'on'/'off' are text in YAML 1.2; true/false are not choices
            st.sink.fail(node, f"{what} must be one of: {', '.join(spec.choices)}")
        if not isinstance(value, str):
            st.sink.fail(node, f"{what} must be text, not {describe_value(value)}")
        if spec.choices and value not in spec.choices:
            st.sink.fail(node, f"{what} '{value}' is not one of: {', '.join(spec.choices)}")
        if spec.required_text and not value.strip():
            st.sink.fail(node, f"{what} must give {spec.required_text}")
        return value
    if t == K.TAG:
        return st.values.tag(node, what)
    if t == K.TAGS:
        items = st.values.sequence(node, what)
        return [st.values.tag(n, what) for n in items]
    if t == K.POSITIONS:
        items = st.values.sequence(node, what)
        names = []
        for n in items:
            name = st.values.wire(n, "position name")
            if "." in name:
                st.sink.fail(n, f"position name '{name}' holds a dot: it is used as a part name (TAG.{name})")
            if name in names:
                st.sink.fail(n, f"position '{name}' is listed twice")
            names.append(name)
        if len(names) < 2:
            st.sink.fail(node, f"{what} needs at least two positions")
        return names
    if t == K.CAMS:
        cams = {}
        for name, kn, vn in st.values.mapping(node, what):
            if not TAG_RE.match(name):
                st.sink.fail(kn, f"contact block name '{name}' holds a dot or a space: it is used as a part name (TAG.{name})")
            items = st.values.sequence(vn, f"positions of block {name}")
            if not items:
                st.sink.fail(vn, f"block {name} of the cam table is closed in no position")
            cams[name] = tuple(st.values.wire(n, "position name") for n in items)
        return cams
    if t == K.CONTACTS:
        return read_contacts(st, node, what, kind)
    if t == K.SPEEDS:
        return read_speeds(st, node, what)
    if t == K.RATING:
        return st.values.shared(read_rating(st, node, what))
    if t == K.POWER_RATING:
        return st.values.shared(read_power_rating(st, node, what))
    st.sink.fail(node, f"{what}: field type '{t}' is not known to this ctllint")


def check_cams(st: FileState, dev: Device, node: Node) -> bool:
    """Each cam block names positions the selector has, and no block is named as a position."""
    positions = [str(p) for p in (dev.get("positions") or ())]
    ok = True
    for name, kn, vn in st.values.mapping(node, f"cams of {dev.tag}"):
        if name in positions:
            st.sink.error(kn, f"block {name} of {dev.tag}'s cam table has the name of a position; {dev.tag}.{name} already means "
                              "the contact closed in that position alone: name the block otherwise (e.g. HA for hand and auto)")
            ok = False
            continue
        seen: set[str] = set()
        for item in vn.value if isinstance(vn, SequenceNode) else ():
            value = str(scalar_value(item))
            if value not in positions:
                st.sink.error(item, f"block {name} of {dev.tag} is closed in '{value}', which is not one of its positions ({', '.join(positions)})")
                ok = False
            elif value in seen:
                st.sink.error(item, f"block {name} of {dev.tag} lists position '{value}' twice")
                ok = False
            seen.add(value)
    return ok


def read_speeds(st: FileState, node: Node, what: str) -> tuple[MotorSpeed, ...]:
    """``speeds: {low: {power: 10 hp, fla: 14 A}, high: {...}}`` (FORMAT.md "Additions")."""
    speeds = []
    for name, kn, vn in st.values.mapping(node, what):
        if not name or "." in name or any(c.isspace() for c in name):
            st.sink.fail(kn, f"speed name '{name}' must be one word without dots")
        fields = {}
        for key, fkn, fvn in st.values.mapping(vn, f"speed {name}"):
            if key not in ("power", "fla"):
                st.sink.unknown_key(fkn, key, f"speed {name}", ("power", "fla"))
                raise Stop
            fields[key] = st.values.quantity(fvn, K.POWER if key == "power" else K.CURRENT, f"{key} of speed {name}")
        speeds.append(MotorSpeed(name, fields.get("power"), fields.get("fla")))
    if len(speeds) < 2:
        st.sink.fail(node, f"{what} needs at least two speeds (a one-speed motor gives power and fla directly)")
    return tuple(speeds)


def read_contacts(st: FileState, node: Node, what: str, kind: DeviceKind | None = None) -> ContactCount:
    entries = st.values.mapping(node, what)
    keys = {k: vn for k, _, vn in entries}
    instant = tuple(p for p in K.INSTANT_PARTS if kind is not None and p in kind.parts)
    allowed = ("NO", "NC", *instant, "poles", "throw")
    for key, kn, _ in entries:
        if key not in allowed:
            st.sink.unknown_key(kn, key, what, allowed)
            raise Stop
    def count(vn: Node, name: str) -> int:
        v = st.values.scalar(vn, name)
        if isinstance(v, bool) or not isinstance(v, int) or v < 0:
            st.sink.fail(vn, f"{name} must be a whole number of contacts, not '{vn.value}'")
        return v
    if "poles" in keys or "throw" in keys:
        if "NO" in keys or "NC" in keys:
            st.sink.fail(node, f"{what}: give either NO/NC counts or poles/throw, not both")
        if "poles" not in keys:
            st.sink.fail(node, f"{what}: 'throw' needs 'poles'")
        poles = count(keys["poles"], "poles")
        throw = st.values.text(keys["throw"], "throw", ("single", "double")) if "throw" in keys else "single"
        return ContactCount(no=0 if throw == "double" else poles, nc=0, changeover=poles if throw == "double" else 0)
    return ContactCount(
        no=count(keys["NO"], "NO") if "NO" in keys else 0,
        nc=count(keys["NC"], "NC") if "NC" in keys else 0,
        instant_no=count(keys["instant-NO"], "instant-NO") if "instant-NO" in keys else 0,
        instant_nc=count(keys["instant-NC"], "instant-NC") if "instant-NC" in keys else 0,
    )
