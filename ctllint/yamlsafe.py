"""Read YAML 1.2 safely into located nodes, within resource limits.

Only the composer runs (C parser when available): no object is ever
constructed from a tag, so nothing in a file can execute. The walk over the
nodes is ours, so duplicate keys, unknown tags, alias expansion and nesting
depth are all checked here, with 1-based positions.
"""
from __future__ import annotations

import math
import re
from dataclasses import dataclass
from typing import Any

from ruamel.yaml import YAML
from ruamel.yaml.error import MarkedYAMLError, YAMLError
from ruamel.yaml.nodes import MappingNode, Node, ScalarNode, SequenceNode

try:  # the C parser is about five times faster than the pure one
    from ruamel.yaml.clib._ruamel_yaml import CParser  # noqa: F401

    HAVE_C_PARSER = True
except ImportError:  # pragma: no cover - depends on the install
    HAVE_C_PARSER = False


@dataclass(frozen=True)
class Limits:
    """Resource limits for one file; all configurable under ``limits``."""

    max_file_bytes: int = 32 * 1024 * 1024
    max_depth: int = 64
    max_nodes: int = 4_000_000  # after alias expansion
    max_elements: int = 1_000_000
    plugin_seconds: float = 60.0  # per file, for all rules together


STD = "tag:yaml.org,2002:"
_ALLOWED_TAGS = {STD + t for t in ("str", "int", "float", "bool", "null", "map", "seq", "timestamp")}
_INT = re.compile(r"^[-+]?[0-9]+$")
_INT_OCT = re.compile(r"^0o[0-7]+$")
_INT_HEX = re.compile(r"^0x[0-9a-fA-F]+$")
_FLOAT = re.compile(r"^[-+]?(?:\.[0-9]+|[0-9]+(?:\.[0-9]*)?)(?:[eE][-+]?[0-9]+)?$")
_INF = re.compile(r"^[-+]?\.(?:inf|Inf|INF)$")
_NAN = re.compile(r"^\.(?:nan|NaN|NAN)$")
_BOOL = {"true": True, "True": True, "TRUE": True, "false": False, "False": False, "FALSE": False}
_NULL = {"", "~", "null", "Null", "NULL"}


class YamlProblem(Exception):
    """A problem at a 1-based line and column."""

    def __init__(self, line: int, column: int, message: str):
        super().__init__(message)
        self.line = line
        self.column = column
        self.message = message


def pos(node: Node) -> tuple[int, int]:
    return node.start_mark.line + 1, node.start_mark.column + 1


def compose(text: str, limits: Limits) -> Node | None:
    """Compose ``text`` into nodes or raise YamlProblem. None for an empty document."""
    yaml = YAML(typ="safe", pure=not HAVE_C_PARSER)
    yaml.version = (1, 2)
    try:
        node = yaml.compose(text)
    except MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        line, col = (mark.line + 1, mark.column + 1) if mark is not None else (1, 1)
        what = (exc.problem or exc.context or "invalid YAML").strip()
        if "duplicate" in what.lower():
            what = "duplicate key"
        raise YamlProblem(line, col, f"YAML: {what}") from None
    except RecursionError:
        raise YamlProblem(1, 1, f"YAML nesting is too deep to read (limit {limits.max_depth} levels)") from None
    except YAMLError as exc:
        raise YamlProblem(1, 1, f"YAML: {str(exc).splitlines()[0] if str(exc) else 'invalid YAML'}") from None
    return node


def check_tree(root: Node, limits: Limits) -> None:
    """Refuse unknown tags, duplicate keys, alias bombs and deep nesting.

    Walks iteratively, counting every visit (aliases included, so a
    "billion laughs" document stops at ``max_nodes`` in linear time).
    """
    visits = 0
    stack: list[tuple[Node, int]] = [(root, 1)]
    while stack:
        node, depth = stack.pop()
        visits += 1
        if visits > limits.max_nodes:
            raise YamlProblem(*pos(node), f"document expands to more than {limits.max_nodes} values (aliases included); limit max_nodes")
        if depth > limits.max_depth:
            raise YamlProblem(*pos(node), f"nesting deeper than {limits.max_depth} levels; limit max_depth")
        tag = str(node.tag)
        if tag not in _ALLOWED_TAGS:
            raise YamlProblem(*pos(node), f"tag '{tag.replace(STD, '!!')}' is not allowed: schematics hold plain data only")
        if isinstance(node, MappingNode):
            seen: dict[Any, Node] = {}
            for knode, vnode in node.value:
                if not isinstance(knode, ScalarNode):
                    raise YamlProblem(*pos(knode), "a key must be a plain value, not a list or mapping")
                key = scalar_value(knode)
                if isinstance(key, float) and math.isnan(key):
                    key = "nan"
                hkey = (type(key).__name__, key) if not isinstance(key, str) else key
                if hkey in seen:
                    first = pos(seen[hkey])
                    raise YamlProblem(*pos(knode), f"duplicate key '{knode.value}' (first at line {first[0]})")
                seen[hkey] = knode
                stack.append((vnode, depth + 1))
                stack.append((knode, depth + 1))
        elif isinstance(node, SequenceNode):
            stack.extend((child, depth + 1) for child in reversed(node.value))


def scalar_value(node: ScalarNode) -> Any:
    """The value of a scalar by the YAML 1.2 core schema (dates stay text)."""
    tag = str(node.tag)
    text = node.value
    if tag == STD + "str" or tag == STD + "timestamp":
        return text
    if tag == STD + "null":
        return None
    if tag == STD + "bool":
        if text in _BOOL:
            return _BOOL[text]
        return text
    if tag == STD + "int":
        if _INT.match(text):
            return int(text)
        if _INT_OCT.match(text):
            return int(text[2:], 8)
        if _INT_HEX.match(text):
            return int(text[2:], 16)
        return text
    if tag == STD + "float":
        if _INF.match(text):
            return -math.inf if text.startswith("-") else math.inf
        if _NAN.match(text):
            return math.nan
        if _FLOAT.match(text):
            return float(text)
        return text
    return text
