"""Reading one value of any section: mappings, lists, text, switches, wire names, tags, quantities.

Every section reads its values through one ``ValueReader``, which records a
refused value in the file's sink and keeps one object for equal texts and
quantities (a large panel repeats them thousands of times). Its own module
because every section uses the same rules for what a value may be.
"""
from __future__ import annotations

import re
from typing import Any, Iterator

from ctllint.reading.loader.sink import FormatSink, excerpt
from ctllint.reading.model import Quantity
from ctllint.reading.quantities import QuantityError, parse_quantity
from ctllint.reading.yamlsafe import MappingNode, Node, ScalarNode, SequenceNode, scalar_value

TAG_RE = re.compile(r"^[^.\s]+$")


class ValueReader:
    """Reads single values for every section, recording what it refuses in ``sink``."""

    def __init__(self, sink: FormatSink):
        self.sink = sink
        # Equal texts built here (wire numbers, tags split from TAG.PART) and
        # equal quantities share one object: a large panel repeats them
        # thousands of times. Quantity is frozen, so sharing is safe.
        self.texts: dict[str, str] = {}
        self._quantities: dict[tuple[str, str], Quantity] = {}
        self._frozen: dict[Any, Any] = {}  # equal ratings share one object (they are frozen)

    def mapping(self, node: Node, what: str) -> list[tuple[str, ScalarNode, Node]]:
        if not isinstance(node, MappingNode):
            self.sink.fail(node, f"{what} must be a mapping (key: value), not {describe(node)}")
        out = []
        seen: dict[str, int] = {}
        for knode, vnode in node.value:
            key = self.entry_key(knode, what, seen)
            if key is not None:
                out.append((key, knode, vnode))
        return out

    def entry_key(self, knode: ScalarNode, what: str, seen: dict[str, int]) -> str | None:
        """The text of a mapping key, or None (its error recorded); ``seen`` maps keys read so far to their lines."""
        key = scalar_value(knode)
        if isinstance(key, int) and not isinstance(key, bool):
            key = str(key)
        if not isinstance(key, str):
            self.sink.error(knode, f"key '{knode.value}' in {what} must be text")
            return None
        if key == "<<" and knode.plain:
            self.sink.error(knode, f"'<<' merge keys are not YAML 1.2: write the fields of {what} out, or make the whole value an alias (*name)")
            return None
        if key in seen:  # 10 and "10" are the same tag, supply or wire: a duplicate, not an overwrite
            self.sink.error(knode, f"duplicate key '{knode.value}' in {what} (first at line {seen[key]})")
            return None
        seen[key] = knode.line
        return key

    def sequence(self, node: Node, what: str) -> list[Node]:
        if not isinstance(node, SequenceNode):
            self.sink.fail(node, f"{what} must be a list, not {describe(node)}")
        return list(node.value)

    def scalar(self, node: Node, what: str) -> Any:
        if not isinstance(node, ScalarNode):
            self.sink.fail(node, f"{what} must be a single value, not {describe(node)}")
        return scalar_value(node)

    def text(self, node: Node, what: str, choices: tuple[str, ...] = ()) -> str:
        value = self.scalar(node, what)
        if not isinstance(value, str):
            self.sink.fail(node, f"{what} must be text, not {describe_value(value)}")
        if choices and value not in choices:
            self.sink.fail(node, f"{what} '{value}' is not one of: {', '.join(choices)}")
        return value

    def boolean(self, node: Node, what: str) -> bool:
        value = self.scalar(node, what)
        if not isinstance(value, bool):
            self.sink.fail(node, f"{what} must be true or false, not '{node.value}'")
        return value

    def wire(self, node: Node, what: str = "wire name") -> str:
        value = self.scalar(node, what)
        if isinstance(value, bool) or value is None or isinstance(value, float):
            self.sink.fail(node, f"{what} must be text or a whole number, not {describe_value(value)} '{node.value}'")
        text = value if isinstance(value, str) else str(value)
        if not text.strip() or any(c.isspace() for c in text):
            self.sink.fail(node, f"{what} '{text}' is empty or holds a space")
        return self.texts.setdefault(text, text)

    def tag(self, node: Node, what: str) -> str:
        value = self.scalar(node, what)
        if isinstance(value, int) and not isinstance(value, bool):
            value = str(value)
        if not isinstance(value, str) or not TAG_RE.match(value):
            self.sink.fail(node, f"{what} '{node.value}' is not a device tag (text with no dot and no space)")
        return value

    def quantity(self, node: Node, dimension: str, what: str):
        value = self.scalar(node, what)
        if isinstance(value, str):  # only text is a quantity: a bare number has no unit
            found = self._quantities.get((value, dimension))
            if found is not None:
                return found
        try:
            quantity = parse_quantity(value, dimension)
        except QuantityError as exc:
            self.sink.fail(node, f"{what}: {exc}")
        self._quantities[(value, dimension)] = quantity
        return quantity

    def shared(self, value: Any) -> Any:
        """One object for equal frozen values (ratings repeat on every device of a kind)."""
        return self._frozen.setdefault(value, value)


def consume(items: list, node: Node) -> Iterator:
    """Yield ``items`` (read from ``node``) in order, each let go before it is yielded.

    ``node`` gives up its children first, so once the reader is done with an
    item nothing holds its nodes any longer and they are freed while the rest
    are read. A node an alias may name elsewhere keeps its children: it is
    read again there.
    """
    if not node.anchored:
        node.value.clear()
    items.reverse()
    while items:
        yield items.pop()


def streamed(node: Node) -> bool:
    return isinstance(node, (MappingNode, SequenceNode)) and node.streamed is not None


def describe(node: Node) -> str:
    if isinstance(node, MappingNode):
        return "a mapping"
    if isinstance(node, SequenceNode):
        return "a list"
    return describe_value(scalar_value(node)) + f" '{excerpt(node.value)}'"


def describe_value(value: Any) -> str:
    if value is None:
        return "empty"
    if isinstance(value, bool):
        return "true/false"
    if isinstance(value, int):
        return "a whole number"
    if isinstance(value, float):
        return "a number"
    if isinstance(value, str):
        return "text"
    return type(value).__name__
