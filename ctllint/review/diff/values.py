"""Values as written: a schematic's field values shown as in its file, and compared as values.

``Source`` finds the YAML text of a value by the position the model keeps;
``render_node``/``render_value`` show a value on one line; ``same_value``
says whether two parsed values are electrically the same (units and spelling
aside). Its own module because devices, supplies, rungs and scenarios all
show and compare values the same way.
"""
from __future__ import annotations

from dataclasses import fields, is_dataclass
from typing import Any

from ctllint.reading.model import Location, Quantity, Schematic
from ctllint.reading.yamlsafe import Limits, MappingNode, Node, ScalarNode, SequenceNode, YamlProblem, compose, pos


class Source:
    """The YAML nodes of a schematic's own text, found by the positions the model keeps."""

    def __init__(self, sch: Schematic | None):
        self.path = sch.path if sch else None
        self.at: dict[tuple[int, int], Node] = {}
        self.value_of_key: dict[tuple[int, int], Node] = {}
        self.root: Node | None = None
        if sch is None or not sch.text:
            return
        try:
            self.root = compose("\n".join(sch.text_lines) + "\n", Limits())
        except (YamlProblem, RecursionError, ValueError):  # only for display: parsed values stand in
            return
        stack = [self.root] if self.root is not None else []
        seen: set[int] = set()
        while stack:
            node = stack.pop()
            if id(node) in seen:  # aliases
                continue
            seen.add(id(node))
            self.at.setdefault(pos(node), node)
            if isinstance(node, MappingNode):
                for k, v in node.value:
                    self.value_of_key[pos(k)] = v
                    stack.extend((k, v))
            elif isinstance(node, SequenceNode):
                stack.extend(node.value)

    def written(self, loc: Location | None) -> str | None:
        if loc is None or loc.path != self.path:
            return None
        node = self.at.get((loc.line, loc.column))
        return render_node(node) if node is not None else None

    def written_after_key(self, loc: Location) -> str | None:
        if loc.path != self.path:
            return None
        node = self.value_of_key.get((loc.line, loc.column))
        return render_node(node) if node is not None else None

    def top(self, key: str) -> Node | None:
        if isinstance(self.root, MappingNode):
            for k, v in self.root.value:
                if isinstance(k, ScalarNode) and k.value == key:
                    return v
        return None


def render_node(node: Node) -> str:
    """A YAML value as written, in flow style on one line."""
    if isinstance(node, ScalarNode):
        return node.value
    if isinstance(node, SequenceNode):
        return "[" + ", ".join(render_node(n) for n in node.value) + "]"
    if isinstance(node, MappingNode):
        return "{" + ", ".join(f"{render_node(k)}: {render_node(v)}" for k, v in node.value) + "}"
    return str(node.value)


def render_value(value: Any) -> str:
    """A parsed value, for when its text is not at hand (defaults, used files)."""
    if value is None:
        return "(none)"
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, float):
        return f"{value:g}"
    if isinstance(value, Quantity):
        return value.text
    if isinstance(value, (list, tuple)):
        return "[" + ", ".join(render_value(v) for v in value) + "]"
    name = type(value).__name__
    if name == "ContactRating":
        return value.text or str(value.designation or value.current)
    if name == "ContactCount":
        if value.changeover:
            return f"{{poles: {value.changeover}, throw: double}}"
        return "{" + ", ".join(f"{k}: {n}" for k, n in (("NO", value.no), ("NC", value.nc)) if n) + "}"
    if name == "PowerRating":
        if value.nema_size is not None:
            return f"{{size: {value.nema_size}}}"
        return "[" + ", ".join(f"{{category: {c.category}, current: {c.current:g} A, voltage: {c.voltage:g} V}}" for c in value.categories) + "]"
    return str(value)


def same_value(a: Any, b: Any) -> bool:
    return value_key(a) == value_key(b)


def value_key(value: Any) -> Any:
    """What makes two parsed values electrically the same (units and spelling aside)."""
    if isinstance(value, bool) or value is None or isinstance(value, (str, int)):
        return value
    if isinstance(value, float):
        return float(f"{value:.9g}")
    if isinstance(value, Quantity):
        return ("quantity", float(f"{value.value:.9g}"), value.dimension, value.current_kind)
    if isinstance(value, (list, tuple)):
        return tuple(value_key(v) for v in value)
    if isinstance(value, dict):
        return tuple(sorted((k, value_key(v)) for k, v in value.items()))
    if is_dataclass(value):
        return (type(value).__name__,) + tuple(value_key(getattr(value, f.name)) for f in fields(value) if f.name != "text")
    return repr(value)
