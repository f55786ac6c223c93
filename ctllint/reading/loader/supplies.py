"""The ``supplies`` section: each control supply's hot and common rails, voltage, grounding and source.

Its own module because a supply is read once, with its own keys and its own
check that no wire is the rail of two supplies.
"""
from __future__ import annotations

from ctllint.reading import kinds as K
from ctllint.reading.loader.sink import Stop
from ctllint.reading.loader.state import FileState
from ctllint.reading.model import Location, Schematic, Supply
from ctllint.reading.yamlsafe import Node

SUPPLY_KEYS = ("hot", "common", "voltage", "grounded", "source")


def read_supplies(st: FileState, node: Node, sch: Schematic) -> None:
    rails: dict[str, tuple[str, Location]] = {}
    for name, knode, vnode in st.values.mapping(node, "supplies"):
        try:
            entries = st.values.mapping(vnode, f"supply {name}")
        except Stop:
            continue
        keys = {k: (kn, vn) for k, kn, vn in entries}
        ok = True
        for key, kn, _ in entries:
            if key not in SUPPLY_KEYS:
                st.sink.unknown_key(kn, key, f"supply {name}", SUPPLY_KEYS)
                ok = False
        for req in ("hot", "common", "voltage"):
            if req not in keys:
                st.sink.error(knode, f"supply {name} needs '{req}'")
                ok = False
        if not ok:
            continue
        try:
            hot = st.values.wire(keys["hot"][1], f"hot rail of {name}")
            common = st.values.wire(keys["common"][1], f"common rail of {name}")
            voltage = st.values.quantity(keys["voltage"][1], K.VOLTAGE, f"voltage of supply {name}")
            grounded = st.values.boolean(keys["grounded"][1], "grounded") if "grounded" in keys else True
            source = st.values.tag(keys["source"][1], "source") if "source" in keys else None
        except Stop:
            continue
        if hot == common:
            st.sink.error(keys["common"][1], f"supply {name}: hot and common are the same wire '{hot}'")
            continue
        sup = Supply(name=name, hot=hot, common=common, voltage=voltage, loc=st.sink.loc(knode), grounded=grounded, source=source)
        for key, (_, vn) in keys.items():
            sup.field_locs[key] = st.sink.loc(vn)
        clash = False
        for rail, key in ((hot, "hot"), (common, "common")):
            if rail in rails:
                other, where = rails[rail]
                st.sink.error(keys[key][1], f"rail '{rail}' of supply {name} is already a rail of supply {other} (line {where.line})")
                clash = True
            else:
                rails[rail] = (name, st.sink.loc(keys[key][1]))
        if not clash:
            sch.supplies[name] = sup
