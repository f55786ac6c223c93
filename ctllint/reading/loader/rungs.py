"""The ``rungs`` section: each rung's keys and its paths of wires and elements.

Read rung by rung while the file is parsed (``rung_item``) when the section
is a plain list, whole (``read_rungs``) otherwise. A path alternates wire
numbers and element references (TAG or TAG.PART, optionally with terminal
numbers). Its own module because paths are the other bulk of a file and the
reading the element limit (``max_elements``) stops.
"""
from __future__ import annotations

import re

from ctllint.reading.loader.sink import Stop
from ctllint.reading.loader.state import FileState
from ctllint.reading.loader.values import consume
from ctllint.reading.model import Element, Path, Rung, Schematic
from ctllint.reading.terminals import parse as parse_terminals
from ctllint.reading.yamlsafe import Node, ScalarNode, scalar_value

RUNG_KEYS = ("title", "number", "paths", "jog", "restart", "note")
REF_RE = re.compile(r"^(?P<tag>[^.\s]+)(?:\.(?P<part>[^.\s]+))?$")


def read_rungs(st: FileState, node: Node, sch: Schematic) -> None:
    """The ``rungs`` section when it was not streamed (not a list, or an alias)."""
    if isinstance(node, ScalarNode) and scalar_value(node) is None:
        return
    for rnode in consume(st.values.sequence(node, "rungs"), node):
        rung_item(st, None, rnode)


def rung_item(st: FileState, _key: None, rnode: Node) -> None:
    """One rung, read as soon as the parser has it."""
    if st.rungs_stopped:
        return
    i = st.rung_count
    st.rung_count += 1
    try:
        entries = st.values.mapping(rnode, f"rung {i + 1}")
    except Stop:
        return
    errors_before = len(st.sink.errors)
    keys = {k: (kn, vn) for k, kn, vn in entries}
    rung = Rung(index=i, number=i + 1, loc=st.sink.loc(rnode))
    for key, kn, vn in entries:
        if key not in RUNG_KEYS:
            st.sink.unknown_key(kn, key, f"rung {i + 1}", RUNG_KEYS)
            continue
        try:
            if key == "title":
                rung.title = st.values.text(vn, "rung title")
            elif key == "note":
                rung.note = st.values.text(vn, "rung note")
            elif key == "jog":
                rung.jog = st.values.boolean(vn, "jog")
            elif key == "restart":
                rung.restart = st.values.text(vn, "restart", ("automatic",))
            elif key == "number":
                num = st.values.scalar(vn, "rung number")
                if isinstance(num, bool) or not isinstance(num, int) or num < 0:
                    st.sink.fail(vn, f"rung number must be a whole number, not '{vn.value}'")
                rung.number = num
        except Stop:
            pass
    numbers = st.rung_numbers
    if rung.number in numbers:
        where = keys["number"][1] if "number" in keys else rnode
        st.sink.error(where, f"rung number {rung.number} is already used by the rung at line {numbers[rung.number]}")
    numbers[rung.number] = rung.loc.line
    if "paths" not in keys:
        st.sink.error(rnode, f"rung {rung.number} has no 'paths'")
    else:
        try:
            for pnode in st.values.sequence(keys["paths"][1], "paths"):
                try:
                    path, st.element_count = read_path(st, pnode, rung, st.element_count)
                    rung.paths.append(path)
                except Stop:
                    pass
        except Stop:
            pass
        if not rung.paths and len(st.sink.errors) == errors_before:  # not when its paths were refused
            st.sink.error(keys["paths"][1], f"rung {rung.number} has no paths")
    st.sch.rungs.append(rung)


def read_path(st: FileState, node: Node, rung: Rung, counter: int) -> tuple[Path, int]:
    items = st.values.sequence(node, "a path")
    if len(items) < 3 or len(items) % 2 == 0:
        st.sink.fail(node, "a path alternates wires and elements, beginning and ending with a wire: [wire, element, wire, ...]")
    if st.rungs_stopped:
        raise Stop
    if counter + len(items) // 2 > st.limits.max_elements:  # refused before the elements are built
        st.rungs_stopped = True  # said once; the rest of the rungs are not read
        st.sink.fail(node, f"more than {st.limits.max_elements} elements; limit max_elements")
    wires: list[str] = []
    wire_pos: list[tuple[int, int]] = []
    refs: list[tuple[str, str | None, Node]] = []
    ok = True
    share = st.values.texts.setdefault
    wire, scalar, position = st.values.wire, st.values.scalar, st.sink.position
    for j, item in enumerate(items):
        try:
            if j % 2 == 0:
                wires.append(wire(item))
                wire_pos.append(position(item))
            else:
                value = scalar(item, "an element")
                if not isinstance(value, str):
                    st.sink.fail(item, f"'{item.value}' stands where an element belongs: expected TAG or TAG.PART between two wires")
                m = REF_RE.match(value)
                terms = None
                if not m and " " in value.strip():  # terminal numbers after a space: CR1.NO 13-14
                    ref, _, written = value.strip().partition(" ")
                    m, terms = REF_RE.match(ref), parse_terminals(written.strip())
                    if m and terms is None:
                        st.sink.fail(item, f"'{value}': terminal numbers are written after the reference as LEFT-RIGHT, "
                                           f"two different names of letters, digits, '+', '_' or '/' (e.g. '{ref} 13-14')")
                if not m:
                    st.sink.fail(item, f"'{value}' is not an element reference (TAG or TAG.PART, optionally followed by terminal numbers such as 13-14)")
                tag, part = m.group("tag", "part")
                refs.append((share(tag, tag), part and share(part, part), item, terms))
        except Stop:
            ok = False
    if not ok:
        raise Stop
    elements = []
    located, path, index = Element.located, st.path, rung.index
    for j, (tag, part, item, terms) in enumerate(refs):
        elements.append(located(counter, tag, part, path, *position(item), index, wires[j], wires[j + 1]))
        if terms is not None:
            elements[-1].terminals = terms
        counter += 1
    return Path.packed(wires, wire_pos, elements, st.sink.loc(node)), counter
