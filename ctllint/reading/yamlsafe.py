"""Read YAML 1.2 safely into small located nodes, within resource limits.

We take only the parser's event stream (libyaml's C parser through
ruamel.yaml.clib when installed, ruamel.yaml's pure parser otherwise) and
build the tree ourselves: no object is ever constructed from a tag, so
nothing in a file can execute; scalars are resolved by the YAML 1.2 core
schema (``on``, ``yes``, ``NO`` stay text); duplicate keys, unknown tags,
alias expansion and nesting depth are checked as the tree is built, in
linear time, with 1-based positions. Skipping ruamel.yaml's composer and
resolver makes this several times faster than ``YAML.compose`` and keeps
a far smaller tree in memory.
"""
from __future__ import annotations

import math
import re
from dataclasses import dataclass
from typing import Any, Callable

from ruamel.yaml import events as ev
from ruamel.yaml.error import MarkedYAMLError, YAMLError

try:  # the C extension that ruamel.yaml.clib installs
    from _ruamel_yaml import CParser

    HAVE_C_PARSER = True
except ImportError:  # pragma: no cover - depends on the install
    CParser = None
    HAVE_C_PARSER = False


@dataclass(frozen=True)
class Limits:
    """Resource limits for one file; all configurable under ``limits``."""

    max_file_bytes: int = 32 * 1024 * 1024
    max_depth: int = 64
    max_nodes: int = 0  # after alias expansion; 0: a third of max_file_bytes (see __post_init__)
    max_elements: int = 1_000_000
    plugin_seconds: float = 60.0  # per file for all rules together; a stopped rule gives the rest one more period
    command_seconds: float = 300.0  # per drawing, per file's diff, per simulation (draw, report, diff, simulate)

    def __post_init__(self) -> None:
        # A file of ordinary rungs holds a value for every 7 bytes or so, and plain YAML
        # cannot be denser than one for every 2 ("a,"): a third of the bytes admits every
        # file max_file_bytes admits short of the densest, and still stops an alias bomb.
        if not self.max_nodes:
            object.__setattr__(self, "max_nodes", max(1, self.max_file_bytes // 3))


STD = "tag:yaml.org,2002:"
_SCALAR_TAGS = {STD + t for t in ("str", "int", "float", "bool", "null")} | {"!"}
_MAP_TAGS = {STD + "map", "!"}
_SEQ_TAGS = {STD + "seq", "!"}
_INT = re.compile(r"^[-+]?[0-9]+$")
_INT_OCT = re.compile(r"^0o[0-7]+$")
_INT_HEX = re.compile(r"^0x[0-9a-fA-F]+$")
_FLOAT = re.compile(r"^[-+]?(?:\.[0-9]+|[0-9]+(?:\.[0-9]*)?)(?:[eE][-+]?[0-9]+)?$")
_INF = re.compile(r"^[-+]?\.(?:inf|Inf|INF)$")
_NAN = re.compile(r"^\.(?:nan|NaN|NAN)$")
_BOOL = {"true": True, "True": True, "TRUE": True, "false": False, "False": False, "FALSE": False}
_NULL = {"", "~", "null", "Null", "NULL"}
_NUMERIC_START = set("0123456789+-.")
_SHARED_TEXT = 32  # scalars up to this length are shared between equal occurrences (see compose)


class Node:
    __slots__ = ("line", "column", "tag")

    def __init__(self, line: int, column: int, tag: str | None):
        self.line = line
        self.column = column
        self.tag = tag


class ScalarNode(Node):
    __slots__ = ("value", "plain")
    size = 1  # values it stands for; a class constant, so a scalar carries no slot for it

    def __init__(self, value: str, line: int, column: int, tag: str | None, plain: bool):
        self.line = line
        self.column = column
        self.tag = tag
        self.value = value
        self.plain = plain

    def __repr__(self) -> str:
        return f"ScalarNode({self.value!r} @{self.line}:{self.column})"


class SequenceNode(Node):
    __slots__ = ("value", "size", "anchored", "streamed")

    def __init__(self, line: int, column: int, tag: str | None):
        super().__init__(line, column, tag)
        self.value: list[Node] = []
        self.size = 1  # values below it once aliases are expanded
        self.anchored = False  # an alias may name it, so it can have more than one parent
        self.streamed: SectionReader | None = None  # the reader its items went to as they were read (see compose)


class MappingNode(Node):
    __slots__ = ("value", "size", "anchored", "streamed")

    def __init__(self, line: int, column: int, tag: str | None):
        super().__init__(line, column, tag)
        self.value: list[tuple[Node, Node]] = []
        self.size = 1  # values below it once aliases are expanded
        self.anchored = False  # an alias may name it, so it can have more than one parent
        self.streamed: SectionReader | None = None  # the reader its entries went to as they were read (see compose)


class YamlProblem(Exception):
    """A problem at a 1-based line and column."""

    def __init__(self, line: int, column: int, message: str):
        super().__init__(message)
        self.line = line
        self.column = column
        self.message = message


def pos(node: Node) -> tuple[int, int]:
    return node.line, node.column


def _event_source(text: str):
    """A function returning the next parser event of ``text`` on each call."""
    if CParser is not None:
        return CParser(text).get_event
    from ruamel.yaml import YAML  # pragma: no cover - without the C extension

    return iter(YAML(typ="safe", pure=True).parse(text)).__next__  # pragma: no cover


# A section reader: called with (key node, value node) for each entry of a
# streamed mapping, or (None, item node) for each item of a streamed list.
SectionReader = Callable[["ScalarNode | None", "Node"], None]


def compose(text: str, limits: Limits, sections: dict[str, tuple[type, SectionReader]] | None = None) -> Node | None:
    """Build the first document of ``text`` as located nodes, or raise YamlProblem.

    Returns None for a document with no content. A second document is an error.

    ``sections`` streams the large parts of a file: when the document is a
    mapping and the value of its top-level key ``name`` is a node of the
    given class (MappingNode or SequenceNode) with no anchor, each entry of
    that value goes to the reader as soon as it is complete and is not kept:
    the value is left empty, its ``streamed`` set to the reader. The reader sees the file's
    entries in file order, checked as every node is (tags, limits, duplicate
    keys); only one entry's nodes are alive at a time, so a large file is
    never held as a whole tree. A YAML error later in the file still raises
    YamlProblem: the caller discards what its readers built.
    """
    stack: list[Node] = []
    keys: list[dict] = []         # per open mapping: resolved key -> its line
    pending: list[Node | None] = []  # per open mapping: the key waiting for its value
    anchors: dict[str, Node] = {}
    open_ids: set[int] = set()
    roots: list[Node] = []  # the document's root, once complete
    documents = 0

    def problem(node_or_event: Any, message: str) -> YamlProblem:
        mark = getattr(node_or_event, "start_mark", None)
        if mark is not None:
            return YamlProblem(mark.line + 1, mark.column + 1, message)
        return YamlProblem(node_or_event.line, node_or_event.column, message)

    attach = _attacher(limits, stack, keys, pending, roots)

    # Nodes on one line share one int for it, and equal short texts share one
    # string: most of a large file's scalars are short and repeated, and every
    # Location and model field built from them keeps them alive.
    shared: dict[str, str] = {}
    mark_line, line = -1, 0  # the parser's 0-based line of the last node, and our 1-based int for it

    next_event = _event_source(text)
    ScalarEvent, MappingStartEvent, SequenceStartEvent = ev.ScalarEvent, ev.MappingStartEvent, ev.SequenceStartEvent
    MappingEndEvent, SequenceEndEvent, AliasEvent, StreamEndEvent = ev.MappingEndEvent, ev.SequenceEndEvent, ev.AliasEvent, ev.StreamEndEvent
    try:
        while True:
            event = next_event()
            cls = event.__class__
            if cls is ScalarEvent:
                mark = event.start_mark
                tag = event.tag
                if tag is not None and tag not in _SCALAR_TAGS:
                    raise problem(event, _tag_message(tag))
                value = event.value
                if len(value) <= _SHARED_TEXT:
                    # Tags, wire names, keys and units repeat throughout a file:
                    # one string each, shared by the nodes and the model built on them.
                    value = shared.setdefault(value, value)
                if mark.line != mark_line:
                    mark_line, line = mark.line, mark.line + 1
                node = ScalarNode(value, line, mark.column + 1, tag, bool(event.implicit[0]) and tag is None)
                if event.anchor:
                    anchors[event.anchor] = node
                attach(node)
            elif cls is MappingStartEvent or cls is SequenceStartEvent:
                mark = event.start_mark
                tag = event.tag
                allowed = _MAP_TAGS if cls is MappingStartEvent else _SEQ_TAGS
                if tag is not None and tag not in allowed:
                    raise problem(event, _tag_message(tag))
                if len(stack) + 1 > limits.max_depth:
                    raise problem(event, f"nesting deeper than {limits.max_depth} levels; limit max_depth")
                if mark.line != mark_line:
                    mark_line, line = mark.line, mark.line + 1
                node = (MappingNode if cls is MappingStartEvent else SequenceNode)(line, mark.column + 1, tag)
                if event.anchor:
                    anchors[event.anchor] = node
                    node.anchored = True
                elif sections and len(stack) == 1 and pending and pending[0] is not None and stack[0].__class__ is MappingNode:
                    # The value of a top-level key: streamed when it is a section asked for.
                    name = scalar_value(pending[0])
                    wanted = sections.get(name) if isinstance(name, str) else None
                    if wanted is not None and node.__class__ is wanted[0]:
                        node.streamed = wanted[1]
                stack.append(node)
                open_ids.add(id(node))
                if cls is MappingStartEvent:
                    keys.append({})
                    pending.append(None)
            elif cls is MappingEndEvent or cls is SequenceEndEvent:
                node = stack.pop()
                open_ids.discard(id(node))
                if cls is MappingEndEvent:
                    keys.pop()
                    pending.pop()
                attach(node)
            elif cls is AliasEvent:
                target = anchors.get(event.anchor)
                if target is None:
                    raise problem(event, f"alias *{event.anchor} names no anchor")
                if id(target) in open_ids:
                    raise problem(event, f"alias *{event.anchor} refers to the value that contains it")
                attach(target)
            elif cls is StreamEndEvent:
                break
            elif cls is ev.DocumentStartEvent:
                documents += 1
                if documents > 1:
                    raise problem(event, "a schematic file holds one YAML document; remove the second '---'")
    except YamlProblem:
        raise
    except (YAMLError, RecursionError) as exc:
        raise _parser_problem(text, exc, limits) from None
    root = roots[0] if roots else None
    if root is not None and isinstance(root, ScalarNode) and root.plain and root.value in _NULL:
        return None
    return root


def _attacher(limits: Limits, stack: list[Node], keys: list[dict], pending: list[Node | None], roots: list[Node]) -> Callable[[Node], None]:
    """``attach(node)``: put a complete node into the open collection (``stack[-1]``), or make it the root.

    Counts values against ``max_nodes`` and refuses duplicate and non-scalar
    keys; a streamed collection's entries go to its reader instead of into it.
    ``keys`` and ``pending`` hold, per open mapping, the keys read and the key
    waiting for its value. A closure over compose's lists, as fast as one
    written inside it.
    """
    def attach(node: Node) -> None:
        if not stack:
            roots.append(node)
            return
        parent = stack[-1]
        parent.size += node.size
        if parent.size > limits.max_nodes:
            raise YamlProblem(node.line, node.column, f"document expands to more than {limits.max_nodes} values (aliases included); limit max_nodes")
        if isinstance(parent, SequenceNode):
            if parent.streamed:
                parent.streamed(None, node)
            else:
                parent.value.append(node)
            return
        key = pending[-1]
        if key is None:
            if not isinstance(node, ScalarNode):
                raise YamlProblem(node.line, node.column, "a key must be a plain value, not a list or mapping")
            resolved = scalar_value(node)
            if isinstance(resolved, float) and math.isnan(resolved):
                resolved = "nan"
            hkey = resolved if isinstance(resolved, str) else (type(resolved).__name__, resolved)
            seen = keys[-1]
            if hkey in seen:
                raise YamlProblem(node.line, node.column, f"duplicate key '{_short(node.value)}' (first at line {seen[hkey]})")
            seen[hkey] = node.line  # the line only: a large mapping's key nodes need not stay alive
            pending[-1] = node
        else:
            pending[-1] = None
            if parent.streamed:
                parent.streamed(key, node)
            else:
                parent.value.append((key, node))

    return attach


def _parser_problem(text: str, exc: Exception, limits: Limits) -> YamlProblem:
    """The YamlProblem for an error the parser raised: where it is, in plain words for the common mistakes."""
    if isinstance(exc, MarkedYAMLError):
        mark = exc.problem_mark or exc.context_mark
        line, col = (mark.line + 1, mark.column + 1) if mark is not None else (1, 1)
        what = (exc.problem or exc.context or "invalid YAML").strip()
        from ctllint.reading.yamlhints import explain  # only when a file is broken: the common mistakes in plain words

        cmark = exc.context_mark
        line, col, message = explain(text, what, line, col, exc.context, cmark and cmark.line + 1, cmark and cmark.column + 1)
        return YamlProblem(line, col, message)
    if isinstance(exc, YAMLError):
        first = str(exc).splitlines()[0] if str(exc) else "invalid YAML"
        line, col = _reader_position(text, exc)
        return YamlProblem(line, col, f"YAML: {first}")
    return YamlProblem(1, 1, f"YAML nesting is too deep to read (limit {limits.max_depth} levels)")  # RecursionError


def _reader_position(text: str, exc: Exception) -> tuple[int, int]:
    """Line and column (1-based, in characters) of the character a reader error is about.

    The reader reports an offset, not a mark: in UTF-8 bytes from the C
    parser, in characters from the pure-Python one. The offset is taken as
    the one that points at the character named; 1:1 when neither does.
    """
    position, character = getattr(exc, "position", None), getattr(exc, "character", None)
    if not isinstance(position, int) or position < 0:
        return 1, 1
    index = None
    try:
        head = len(text.encode("utf-8", "surrogatepass")[:position].decode("utf-8", "surrogatepass"))
    except UnicodeDecodeError:  # not at a character boundary: not a byte offset
        head = -1
    for candidate in (head, position):
        if 0 <= candidate < len(text) and (character is None or not isinstance(character, int) or ord(text[candidate]) == character):
            index = candidate
            break
    if index is None:
        return 1, 1
    line_start = text.rfind("\n", 0, index) + 1
    return text.count("\n", 0, index) + 1, index - line_start + 1


def check_tree(root: Node, limits: Limits) -> None:
    """Kept for callers of the older two-step API: ``compose`` now checks as it builds."""
    if root.size > limits.max_nodes:
        raise YamlProblem(root.line, root.column, f"document expands to more than {limits.max_nodes} values (aliases included); limit max_nodes")


def _tag_message(tag: str) -> str:
    return f"tag '{_short(tag.replace(STD, '!!'))}' is not allowed: schematics hold plain data only"


def _short(text: str, limit: int = 20) -> str:
    """At most ``limit`` characters of a value quoted in a message (the file may not be a schematic at all)."""
    text = str(text)
    return text if len(text) <= limit else text[:limit] + "..."


def scalar_value(node: ScalarNode) -> Any:
    """The value of a scalar by the YAML 1.2 core schema (dates stay text).

    Quoted scalars are text; an explicit standard tag (``!!str 12``) is obeyed.
    """
    text = node.value
    tag = node.tag
    if not node.plain:
        if tag is None or tag == "!" or tag == STD + "str":
            return text
        return _resolve(text, tag)
    if not text:
        return None
    first = text[0]
    if first in _NUMERIC_START:
        if _INT.match(text):
            try:
                return int(text)
            except ValueError:  # more digits than Python converts (4300): stays text, for the loader to refuse
                return text
        if _FLOAT.match(text):
            return float(text)
        if _INF.match(text):
            return -math.inf if first == "-" else math.inf
        if _NAN.match(text):
            return math.nan
        if _INT_OCT.match(text):
            return int(text[2:], 8)
        if _INT_HEX.match(text):
            return int(text[2:], 16)
        return text
    if first in "tTfF" and text in _BOOL:
        return _BOOL[text]
    if first in "~nN" and text in _NULL:
        return None
    return text


def _resolve(text: str, tag: str) -> Any:
    """An explicitly tagged scalar: the tag's type, or the text when it does not parse."""
    try:
        if tag == STD + "int":
            return int(text, 0) if not _INT.match(text) else int(text)
        if tag == STD + "float":
            return float(text.replace(".inf", "inf").replace(".nan", "nan"))
        if tag == STD + "bool":
            return _BOOL.get(text, text)
        if tag == STD + "null":
            return None
    except ValueError:
        return text
    return text


def within(lines: list[str], line: int, column: int) -> tuple[int, int]:
    """Clamp a position to the file: a parser's mark at the very end points past the last line."""
    if not lines:
        return 1, 1
    if line > len(lines):
        line = len(lines)
        column = len(lines[-1]) + 1
    line = max(1, line)
    return line, max(1, min(column, len(lines[line - 1]) + 1))
