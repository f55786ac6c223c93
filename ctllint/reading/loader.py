"""Load schematic files (FORMAT.md version 1) into located model objects.

Every value the file holds keeps its 1-based line and column. Every breach
of the format becomes a ``format`` diagnostic at the offending value; the
loader reports all of a file's format errors it can find, not only the
first, and returns no schematic when there were any.
"""
from __future__ import annotations

import math
import os
import re
import stat
from dataclasses import dataclass, field
from typing import Any, Callable, Iterator



from ctllint.reading import kinds as K
from ctllint.reading.kinds import DeviceKind, KindRegistry
from ctllint.reading.model import (
    CategoryRating,
    ContactCount,
    ContactRating,
    Device,
    Diagnostic,
    Element,
    Location,
    MotorSpeed,
    Path,
    PowerRating,
    Quantity,
    Rung,
    Scenario,
    Schematic,
    Severity,
    Step,
    Supply,
)
from ctllint.reading.quantities import QuantityError, parse_quantity
from ctllint.reading.terminals import assign as assign_terminals, conflicts as terminal_conflicts, parse as parse_terminals
from ctllint.reading.yamlsafe import STD, Limits, MappingNode, Node, ScalarNode, SequenceNode, YamlProblem, check_tree, compose, pos, scalar_value, within

FORMAT_VERSION = 1
SCHEMATIC_SUFFIXES = (".ctl.yaml", ".ctl.yml")
TOP_KEYS = ("ctllint", "title", "supplies", "devices", "rungs", "expect", "use")
REQUIRED_TOP = ("ctllint", "supplies", "devices", "rungs")
DEVICE_FILE_KEYS = ("ctllint", "title", "devices")
RUNG_KEYS = ("title", "number", "paths", "jog", "restart", "note")
SUPPLY_KEYS = ("hot", "common", "voltage", "grounded", "source")
STEP_ACTIONS = ("press", "release", "set", "trip", "reset", "power", "wait", "check")
TAG_RE = re.compile(r"^[^.\s]+$")
REF_RE = re.compile(r"^(?P<tag>[^.\s]+)(?:\.(?P<part>[^.\s]+))?$")
PILOT_DUTY = re.compile(r"^[ABCDE](?:150|300|600)$|^[NPQR](?:150|300|600)$")
PILOT_DUTY_VALID = {
    "A600", "A300", "A150", "B600", "B300", "B150", "C600", "C300", "C150", "D300", "D150", "E150",
    "N600", "N300", "N150", "P600", "P300", "P150", "Q600", "Q300", "Q150", "R300", "R150",
}
CATEGORY_RE = re.compile(r"^(AC|DC)-[0-9]+[a-z]?$")
NEMA_SIZES = ("00", "0", "1", "2", "3", "4", "5", "6", "7", "8", "9")


class _Stop(Exception):
    """Abandon the value being read; its error is already recorded."""


@dataclass
class LoadResult:
    schematic: Schematic | None
    diagnostics: list[Diagnostic]
    used_files: list[str] = field(default_factory=list)


def format_error(path: str, line: int, column: int, message: str) -> Diagnostic:
    return Diagnostic(path, line, column, "format", Severity.ERROR, message)


def find_repository_root(path: str) -> str:
    """The nearest folder above ``path`` holding ``.git``, else the file's own folder."""
    folder = os.path.dirname(os.path.abspath(path))
    probe = folder
    while True:
        if os.path.exists(os.path.join(probe, ".git")):
            return probe
        parent = os.path.dirname(probe)
        if parent == probe:
            return folder
        probe = parent


def _link_out_of_repository(path: str) -> str | None:
    """The repository root when ``path`` is (or passes through) a symbolic link leading out of it, else None.

    A pull request can commit a link named like a schematic to any file of
    the machine that checks it (a key, a token); such a file is never read,
    so none of it can reach a report or a log.
    """
    try:
        if not os.path.isfile(path):  # a device, pipe, folder or dangling link: read_text refuses it and says why
            return None
        root = os.path.realpath(find_repository_root(path))
        real = os.path.realpath(path)
        return None if os.path.commonpath([root, real]) == root else root
    except (OSError, ValueError):  # a NUL in the path, another drive: read_text says why
        return None


def excerpt(text: str, limit: int = 20) -> str:
    """A short, escaped excerpt of a value for a message: at most ``limit`` characters, control characters escaped."""
    text = str(text)
    short = text[:limit]
    short = "".join(c if c.isprintable() else c.encode("unicode_escape").decode("ascii") for c in short)
    return short + ("..." if len(text) > limit else "")


# Real paths of the files whose ``use`` is being followed right now: a used
# file that uses one of them back is a cycle, refused instead of recursed into.
_USE_CHAIN: set[str] = set()


class DeviceFileCache:
    """Parsed shared device files, keyed by real path and modification time."""

    def __init__(self) -> None:
        self._cache: dict[str, tuple[float, "LoadResult"]] = {}

    def get(self, real: str, loader: Callable[[], "LoadResult"]) -> "LoadResult":
        try:
            mtime = os.stat(real).st_mtime_ns
        except OSError:
            mtime = -1
        hit = self._cache.get(real)
        if hit and hit[0] == mtime:
            return hit[1]
        result = loader()
        self._cache[real] = (mtime, result)
        return result


def read_text(path: str, limits: Limits) -> tuple[str | None, Diagnostic | None]:
    """Read a file as UTF-8 (a byte-order mark allowed), or say why not."""
    try:
        # Non-blocking open, then fstat: a named pipe, a socket or a device
        # (a link to /dev/zero, say) is refused instead of blocking or reading forever.
        fd = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
        try:
            info = os.fstat(fd)
        except OSError:
            os.close(fd)
            raise
        if not stat.S_ISREG(info.st_mode):
            os.close(fd)
            if stat.S_ISDIR(info.st_mode):
                try:
                    os.scandir(path).close()
                except OSError as exc:  # discovery could not list it either: say so
                    return None, format_error(path, 1, 1, f"folder cannot be read ({exc.strerror or exc}): the schematics in it are not checked")
                return None, format_error(path, 1, 1, "is a folder, not a schematic file")
            return None, format_error(path, 1, 1, "is not a regular file (a pipe, socket or device), so it is not read")
        if info.st_size > limits.max_file_bytes:
            os.close(fd)
            return None, format_error(path, 1, 1, f"file is {info.st_size / 1e6:.1f} MB, above the limit of {limits.max_file_bytes / 1e6:.1f} MB (limits.max_file_bytes)")
        with os.fdopen(fd, "rb") as handle:
            # Asked for the size fstat gave (plus one byte, to see growth) rather
            # than the limit: read(n) sets aside n bytes before it reads, which
            # for the limit is tens of megabytes for a file of one.
            data = handle.read(info.st_size + 1)
            if len(data) > info.st_size:  # grown since fstat: read on, up to the limit
                data += handle.read(max(0, limits.max_file_bytes + 1 - len(data)))
        if len(data) > limits.max_file_bytes:
            return None, format_error(path, 1, 1, f"file is above the limit of {limits.max_file_bytes / 1e6:.1f} MB (limits.max_file_bytes)")
    except IsADirectoryError:
        return None, format_error(path, 1, 1, "is a folder, not a schematic file")
    except OSError as exc:
        return None, format_error(path, 1, 1, f"cannot read file: {exc.strerror or exc}")
    except ValueError as exc:  # a path holding a NUL character
        return None, format_error(path, 1, 1, f"cannot read file: {exc}")
    if data.startswith(b"\xef\xbb\xbf"):
        data = data[3:]
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = data[: exc.start].count(b"\n") + 1
        col = exc.start - (data.rfind(b"\n", 0, exc.start) + 1) + 1
        return None, format_error(path, line, col, f"not UTF-8: byte 0x{data[exc.start]:02x} cannot be decoded")
    if "\x00" in text:
        i = text.index("\x00")
        return None, format_error(path, text.count("\n", 0, i) + 1, 1, "file holds a NUL character; schematics are text")
    return text, None


def load_file(
    path: str,
    kinds: KindRegistry | None = None,
    limits: Limits | None = None,
    device_cache: DeviceFileCache | None = None,
    display_path: str | None = None,
) -> LoadResult:
    """Load the schematic at ``path``; ``display_path`` is how messages name it."""
    limits = limits or Limits()
    shown = display_path or path
    outside = _link_out_of_repository(path)
    if outside is not None:
        return LoadResult(None, [format_error(shown, 1, 1, f"is a symbolic link to a file outside the repository ({outside}), so it is not read")])
    text, problem = read_text(path, limits)
    if problem is not None:
        return LoadResult(None, [Diagnostic(shown, problem.line, problem.column, "format", Severity.ERROR, problem.message)])
    return load_text(text, shown, kinds=kinds, limits=limits, device_cache=device_cache, real_path=path)


def load_text(
    text: str,
    path: str = "t.ctl.yaml",
    kinds: KindRegistry | None = None,
    limits: Limits | None = None,
    device_cache: DeviceFileCache | None = None,
    real_path: str | None = None,
) -> LoadResult:
    """Load schematic text. ``path`` names the file in diagnostics and resolves ``use``."""
    loader = _Loader(path, real_path or path, kinds or KindRegistry.builtin(), limits or Limits(), device_cache)
    return loader.load(text)


class _Loader:
    def __init__(self, path: str, real_path: str, kinds: KindRegistry, limits: Limits, cache: DeviceFileCache | None):
        self.path = path
        self.real_path = real_path
        self.kinds = kinds
        self.limits = limits
        self.cache = cache
        self.errors: list[Diagnostic] = []
        self.used: list[str] = []
        self.source = ""  # the file's text
        self.line_count = 0
        # Equal texts built here (wire numbers, tags split from TAG.PART) and
        # equal quantities share one object: a large panel repeats them
        # thousands of times. Quantity is frozen, so sharing is safe.
        self._texts: dict[str, str] = {}
        self._quantities: dict[tuple[str, str], Quantity] = {}
        self._shapes: dict[tuple[str, ...], tuple[str, ...]] = {}
        self._frozen: dict[Any, Any] = {}  # equal ratings share one object (they are frozen)  # field-name tuples shared by devices written alike
        # State of the sections read entry by entry (device_entry, rung_item).
        self.sch: Schematic | None = None
        self.streamed_errors: list[Diagnostic] = []
        self.device_keys: dict[str, int] = {}  # device tag -> line, for duplicates
        self.rung_numbers: dict[int, int] = {}  # rung number -> line of its rung
        self.rung_count = 0
        self.element_count = 0
        self.rungs_stopped = False

    # -- helpers -------------------------------------------------------
    def text_lines(self) -> list[str]:
        """The file's lines, for the rare position past the end (not kept: a large file has many)."""
        return self.source.splitlines()

    def loc(self, node: Node) -> Location:
        return Location(self.path, *self.position(node))

    def position(self, node: Node) -> tuple[int, int]:
        """Where ``node`` stands as (line, column); the model keeps many of these packed."""
        line, col = node.line, node.column
        if line > self.line_count:  # an empty value at the very end of the file
            line, col = within(self.text_lines(), line, col)
        return line, col

    def error(self, node: Node | Location, message: str) -> None:
        loc = node if isinstance(node, Location) else self.loc(node)
        self.errors.append(Diagnostic(loc.path, loc.line, loc.column, "format", Severity.ERROR, message))

    def fail(self, node: Node, message: str):
        self.error(node, message)
        raise _Stop

    def mapping(self, node: Node, what: str) -> list[tuple[str, ScalarNode, Node]]:
        if not isinstance(node, MappingNode):
            self.fail(node, f"{what} must be a mapping (key: value), not {_describe(node)}")
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
            self.error(knode, f"key '{knode.value}' in {what} must be text")
            return None
        if key == "<<" and knode.plain:
            self.error(knode, f"'<<' merge keys are not YAML 1.2: write the fields of {what} out, or make the whole value an alias (*name)")
            return None
        if key in seen:  # 10 and "10" are the same tag, supply or wire: a duplicate, not an overwrite
            self.error(knode, f"duplicate key '{knode.value}' in {what} (first at line {seen[key]})")
            return None
        seen[key] = knode.line
        return key

    def sequence(self, node: Node, what: str) -> list[Node]:
        if not isinstance(node, SequenceNode):
            self.fail(node, f"{what} must be a list, not {_describe(node)}")
        return list(node.value)

    def scalar(self, node: Node, what: str) -> Any:
        if not isinstance(node, ScalarNode):
            self.fail(node, f"{what} must be a single value, not {_describe(node)}")
        return scalar_value(node)

    def text(self, node: Node, what: str, choices: tuple[str, ...] = ()) -> str:
        value = self.scalar(node, what)
        if not isinstance(value, str):
            self.fail(node, f"{what} must be text, not {_describe_value(value)}")
        if choices and value not in choices:
            self.fail(node, f"{what} '{value}' is not one of: {', '.join(choices)}")
        return value

    def boolean(self, node: Node, what: str) -> bool:
        value = self.scalar(node, what)
        if not isinstance(value, bool):
            self.fail(node, f"{what} must be true or false, not '{node.value}'")
        return value

    def wire(self, node: Node, what: str = "wire name") -> str:
        value = self.scalar(node, what)
        if isinstance(value, bool) or value is None or isinstance(value, float):
            self.fail(node, f"{what} must be text or a whole number, not {_describe_value(value)} '{node.value}'")
        text = value if isinstance(value, str) else str(value)
        if not text.strip() or any(c.isspace() for c in text):
            self.fail(node, f"{what} '{text}' is empty or holds a space")
        return self._texts.setdefault(text, text)

    def tag(self, node: Node, what: str) -> str:
        value = self.scalar(node, what)
        if isinstance(value, int) and not isinstance(value, bool):
            value = str(value)
        if not isinstance(value, str) or not TAG_RE.match(value):
            self.fail(node, f"{what} '{node.value}' is not a device tag (text with no dot and no space)")
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
            self.fail(node, f"{what}: {exc}")
        self._quantities[(value, dimension)] = quantity
        return quantity

    def shared(self, value: Any) -> Any:
        """One object for equal frozen values (ratings repeat on every device of a kind)."""
        return self._frozen.setdefault(value, value)

    def unknown_key(self, knode: Node, key: str, where: str, allowed: tuple[str, ...]) -> None:
        hint = _closest(key, allowed)
        if hint is None:  # text cut off by a comma in a {...} mapping (FORMAT.md, "Additions"): say to quote it
            from ctllint.reading.yamlhints import comma_in_text, lines_of

            state = getattr(self, "_hints", None)
            if state is None:  # the file split once, however many such keys; at most 50 hints a file,
                state = self._hints = [lines_of(self.source), 50]  # each reads its whole line
            lines = state[0]
            state[1] -= 1
            cut = state[1] >= 0 and comma_in_text(lines[knode.line - 1] if 0 < knode.line <= len(lines) else "", knode.column)
            if cut:
                self.error(knode, f"{cut} (in {where})")
                return
        self.error(knode, f"unknown key '{key}' in {where}" + (f" (did you mean '{hint}'?)" if hint else f"; allowed: {', '.join(allowed)}"))

    # -- the file ------------------------------------------------------
    def load(self, text: str) -> LoadResult:
        self.source = text
        self.line_count = count_lines(text)
        sch = self.sch = Schematic(path=self.path, loc=Location(self.path, 1, 1), line_count=self.line_count)
        sch.text = text
        # The two large sections are read entry by entry while the file is
        # parsed (see yamlsafe.compose): the whole file is never a tree in memory.
        sections = {"devices": (MappingNode, self.device_entry), "rungs": (SequenceNode, self.rung_item)}
        try:
            root = compose(text, self.limits, sections)
            if root is None or (isinstance(root, ScalarNode) and str(root.tag) == STD + "null" and not root.value):
                return self._done(None, [format_error(self.path, 1, 1, "file is empty: a schematic needs ctllint, supplies, devices and rungs")])
            check_tree(root, self.limits)
        except YamlProblem as exc:
            return self._done(None, [format_error(self.path, *within(self.text_lines(), exc.line, exc.column), exc.message)])
        sch.loc = self.loc(root)
        # Errors of the streamed sections count only once the file is known to
        # be a schematic of this version (read_top puts them back).
        self.streamed_errors, self.errors = self.errors, []
        try:
            self.read_top(root, sch)
        except _Stop:
            pass
        except RecursionError:
            self.error(root, "structure nested too deeply to read")
        if self.errors:
            return self._done(None, self.errors)
        return self._done(sch, [])

    def _done(self, sch: Schematic | None, diags: list[Diagnostic]) -> LoadResult:
        return LoadResult(sch, sorted(set(diags)), self.used)

    def read_top(self, root: Node, sch: Schematic) -> None:
        # A file that is not a schematic at all (a key, a token, a configuration
        # file named like one) gives one finding that quotes nothing of it.
        if not isinstance(root, MappingNode):
            self.fail(root, f"not a ctllint schematic: the file is {_describe_value(scalar_value(root)) if isinstance(root, ScalarNode) else 'a list'}, "
                            "not a mapping starting with 'ctllint: 1' (its text is not shown)")
        if not any(isinstance(k, ScalarNode) and k.value == "ctllint" for k, _ in root.value):
            self.fail(root, "missing 'ctllint: 1' (the format version) at the top level: not a ctllint schematic (its keys are not shown)")
        entries = self.mapping(root, "a schematic file")
        keys = {k: (kn, vn) for k, kn, vn in entries}
        for key, knode, _ in entries:
            if key not in TOP_KEYS:
                self.unknown_key(knode, key, "the top level", TOP_KEYS)
        # From here ``keys`` holds the only references to the sections, and
        # each is let go once read (``keys.pop``): the readers of the large
        # ones drop each item's nodes as they go, so the node tree shrinks
        # while the model grows instead of both being alive in full.
        root.value.clear()
        del entries
        if "ctllint" not in keys:
            self.fail(root, "missing 'ctllint: 1' (the format version) at the top level")
        vnode = keys["ctllint"][1]
        version = self.scalar(vnode, "ctllint")
        # Only the whole number 1 as written: 1.0, 01 or 0x1 are other values
        if version != FORMAT_VERSION or type(version) is not int or vnode.value.strip() != str(FORMAT_VERSION):
            self.fail(vnode, f"format version '{excerpt(vnode.value, 12)}' is not supported: this ctllint reads version {FORMAT_VERSION}")
        self.errors.extend(self.streamed_errors)
        device_file = "supplies" not in keys and "rungs" not in keys and "expect" not in keys and "use" not in keys and "devices" in keys
        sch.device_file = device_file
        if not device_file:
            for req in REQUIRED_TOP:
                if req not in keys:
                    self.error(root, f"missing top-level key '{req}'")
        if "title" in keys:
            self._guard(lambda: setattr(sch, "title", self.text(keys["title"][1], "title")))
        if "devices" in keys and not _streamed(keys["devices"][1]):
            self._guard(lambda: self.read_devices(keys.pop("devices")[1], sch))
        if "use" in keys:
            self._guard(lambda: self.read_use(keys.pop("use")[1], sch))
        if "supplies" in keys:
            self._guard(lambda: self.read_supplies(keys.pop("supplies")[1], sch))
        if "rungs" in keys and not _streamed(keys["rungs"][1]):
            self._guard(lambda: self.read_rungs(keys.pop("rungs")[1], sch))
        if "expect" in keys:
            self._guard(lambda: self.read_expect(keys.pop("expect")[1], sch))
        if not self.errors:
            self.check_device_references(sch)

    def _guard(self, fn: Callable[[], Any]) -> None:
        try:
            fn()
        except _Stop:
            pass

    # -- devices -------------------------------------------------------
    def read_devices(self, node: Node, sch: Schematic) -> None:
        """The ``devices`` section when it was not streamed (not a mapping, or an alias)."""
        if isinstance(node, ScalarNode) and scalar_value(node) is None:
            return
        if not isinstance(node, MappingNode):
            self.fail(node, f"devices must be a mapping (key: value), not {_describe(node)}")
        for knode, vnode in _consume(list(node.value), node):
            self.device_entry(knode, vnode)

    def device_entry(self, knode: ScalarNode | None, vnode: Node) -> None:
        """One entry of ``devices``, read as soon as the parser has it."""
        tag = self.entry_key(knode, "devices", self.device_keys)
        if tag is None:
            return
        tag = self._texts.setdefault(tag, tag)  # one string for the tag and every element naming it
        if not TAG_RE.match(tag):
            self.error(knode, f"device tag '{tag}' holds a dot or a space")
            return
        try:
            dev = self.read_device(tag, knode, vnode)
        except _Stop:
            return
        self.sch.devices[tag] = dev

    def read_device(self, tag: str, knode: Node, vnode: Node) -> Device:
        entries = self.mapping(vnode, f"device {tag}")
        fields = {k: (kn, vn) for k, kn, vn in entries}
        if "kind" not in fields:
            self.fail(knode, f"device {tag} has no 'kind' (one of: {', '.join(self.kinds.names())})")
        kind_node = fields["kind"][1]
        kind_name = self.text(kind_node, f"kind of {tag}")
        kind = self.kinds.get(kind_name)
        if kind is None:
            hint = _closest(kind_name, tuple(self.kinds.names()))
            self.fail(kind_node, f"unknown device kind '{kind_name}' for {tag}" + (f" (did you mean '{hint}'?)" if hint else ""))
        dev = Device(tag, kind_name, self.loc(knode), origin=self.path)
        names = ["kind"]  # where each field's value stands, packed into the device at the end
        positions = [(kind_node.line, kind_node.column)]
        allowed = ("kind", *kind.fields)
        ok = True
        for name, kn, vn in entries:
            if name == "kind":
                continue
            spec = kind.fields.get(name)
            if spec is None:
                self.unknown_key(kn, name, f"{kind_name} {tag}", allowed)
                ok = False
                continue
            try:
                dev.fields[name] = self.read_field(vn, spec, f"{name} of {tag}", kind)
                names.append(name)
                positions.append(self.position(vn))
                if spec.type == K.TAGS and isinstance(vn, SequenceNode):
                    for i, item in enumerate(vn.value):  # each tag of a list, e.g. fuses.1
                        names.append(f"{name}.{i}")
                        positions.append(self.position(item))
            except _Stop:
                ok = False
        for req in kind.required:
            if req not in fields:
                self.error(knode, f"{kind_name} {tag} needs '{req}'")
                ok = False
        if "speeds" in dev.fields:
            for single in ("power", "fla"):
                if single in dev.fields:
                    self.error(fields[single][0], f"{kind_name} {tag} gives 'speeds': its {single} goes under each speed, not on the motor itself")
                    ok = False
        if "cams" in dev.fields and "cams" in fields:
            ok = self.check_cams(dev, fields["cams"][1]) and ok
        for name, spec in kind.fields.items():
            if name not in dev.fields and spec.default is not None:
                dev.fields[name] = spec.default
        if not ok:
            raise _Stop
        shape = tuple(names)
        dev.set_positions(self._shapes.setdefault(shape, shape), positions)
        return dev

    def read_field(self, node: Node, spec: K.FieldSpec, what: str, kind: DeviceKind) -> Any:
        t = spec.type
        if t in (K.VOLTAGE, K.CURRENT, K.APPARENT, K.POWER, K.TIME, K.TEMPERATURE):
            return self.quantity(node, t, what)
        if t == K.BOOL:
            return self.boolean(node, what)
        if t == K.NUMBER:
            value = self.scalar(node, what)
            if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value) or value <= 0:
                self.fail(node, f"{what} must be a positive number, not '{node.value}'")
            if spec.maximum is not None and value > spec.maximum:
                self.fail(node, f"{what} is {spec.doc.split(' (')[0]}, at most {spec.maximum:g}, not '{node.value}'")
            return float(value)
        if t == K.COUNT:
            value = self.scalar(node, what)
            if isinstance(value, bool) or not isinstance(value, int) or value <= 0:
                self.fail(node, f"{what} must be a positive whole number, not '{node.value}'")
            if spec.choices and str(value) not in spec.choices:
                self.fail(node, f"{what} must be one of: {', '.join(spec.choices)}")
            return value
        if t == K.TEXT:
            value = self.scalar(node, what)
            if spec.choices and isinstance(value, bool):
                # 'on'/'off' are text in YAML 1.2; true/false are not choices
                self.fail(node, f"{what} must be one of: {', '.join(spec.choices)}")
            if not isinstance(value, str):
                self.fail(node, f"{what} must be text, not {_describe_value(value)}")
            if spec.choices and value not in spec.choices:
                self.fail(node, f"{what} '{value}' is not one of: {', '.join(spec.choices)}")
            if spec.required_text and not value.strip():
                self.fail(node, f"{what} must give {spec.required_text}")
            return value
        if t == K.TAG:
            return self.tag(node, what)
        if t == K.TAGS:
            items = self.sequence(node, what)
            return [self.tag(n, what) for n in items]
        if t == K.POSITIONS:
            items = self.sequence(node, what)
            names = []
            for n in items:
                name = self.wire(n, "position name")
                if "." in name:
                    self.fail(n, f"position name '{name}' holds a dot: it is used as a part name (TAG.{name})")
                if name in names:
                    self.fail(n, f"position '{name}' is listed twice")
                names.append(name)
            if len(names) < 2:
                self.fail(node, f"{what} needs at least two positions")
            return names
        if t == K.CAMS:
            cams = {}
            for name, kn, vn in self.mapping(node, what):
                if not TAG_RE.match(name):
                    self.fail(kn, f"contact block name '{name}' holds a dot or a space: it is used as a part name (TAG.{name})")
                items = self.sequence(vn, f"positions of block {name}")
                if not items:
                    self.fail(vn, f"block {name} of the cam table is closed in no position")
                cams[name] = tuple(self.wire(n, "position name") for n in items)
            return cams
        if t == K.CONTACTS:
            return self.read_contacts(node, what, kind)
        if t == K.SPEEDS:
            return self.read_speeds(node, what)
        if t == K.RATING:
            return self.shared(self.read_rating(node, what))
        if t == K.POWER_RATING:
            return self.shared(self.read_power_rating(node, what))
        self.fail(node, f"{what}: field type '{t}' is not known to this ctllint")

    def check_cams(self, dev: Device, node: Node) -> bool:
        """Each cam block names positions the selector has, and no block is named as a position."""
        positions = [str(p) for p in (dev.get("positions") or ())]
        ok = True
        for name, kn, vn in self.mapping(node, f"cams of {dev.tag}"):
            if name in positions:
                self.error(kn, f"block {name} of {dev.tag}'s cam table has the name of a position; {dev.tag}.{name} already means "
                               "the contact closed in that position alone: name the block otherwise (e.g. HA for hand and auto)")
                ok = False
                continue
            seen: set[str] = set()
            for item in vn.value if isinstance(vn, SequenceNode) else ():
                value = str(scalar_value(item))
                if value not in positions:
                    self.error(item, f"block {name} of {dev.tag} is closed in '{value}', which is not one of its positions ({', '.join(positions)})")
                    ok = False
                elif value in seen:
                    self.error(item, f"block {name} of {dev.tag} lists position '{value}' twice")
                    ok = False
                seen.add(value)
        return ok

    def read_speeds(self, node: Node, what: str) -> tuple[MotorSpeed, ...]:
        """``speeds: {low: {power: 10 hp, fla: 14 A}, high: {...}}`` (FORMAT.md "Additions")."""
        speeds = []
        for name, kn, vn in self.mapping(node, what):
            if not name or "." in name or any(c.isspace() for c in name):
                self.fail(kn, f"speed name '{name}' must be one word without dots")
            fields = {}
            for key, fkn, fvn in self.mapping(vn, f"speed {name}"):
                if key not in ("power", "fla"):
                    self.unknown_key(fkn, key, f"speed {name}", ("power", "fla"))
                    raise _Stop
                fields[key] = self.quantity(fvn, K.POWER if key == "power" else K.CURRENT, f"{key} of speed {name}")
            speeds.append(MotorSpeed(name, fields.get("power"), fields.get("fla")))
        if len(speeds) < 2:
            self.fail(node, f"{what} needs at least two speeds (a one-speed motor gives power and fla directly)")
        return tuple(speeds)

    def read_contacts(self, node: Node, what: str, kind: DeviceKind | None = None) -> ContactCount:
        entries = self.mapping(node, what)
        keys = {k: vn for k, _, vn in entries}
        instant = tuple(p for p in K.INSTANT_PARTS if kind is not None and p in kind.parts)
        allowed = ("NO", "NC", *instant, "poles", "throw")
        for key, kn, _ in entries:
            if key not in allowed:
                self.unknown_key(kn, key, what, allowed)
                raise _Stop
        def count(vn: Node, name: str) -> int:
            v = self.scalar(vn, name)
            if isinstance(v, bool) or not isinstance(v, int) or v < 0:
                self.fail(vn, f"{name} must be a whole number of contacts, not '{vn.value}'")
            return v
        if "poles" in keys or "throw" in keys:
            if "NO" in keys or "NC" in keys:
                self.fail(node, f"{what}: give either NO/NC counts or poles/throw, not both")
            if "poles" not in keys:
                self.fail(node, f"{what}: 'throw' needs 'poles'")
            poles = count(keys["poles"], "poles")
            throw = self.text(keys["throw"], "throw", ("single", "double")) if "throw" in keys else "single"
            return ContactCount(no=0 if throw == "double" else poles, nc=0, changeover=poles if throw == "double" else 0)
        return ContactCount(
            no=count(keys["NO"], "NO") if "NO" in keys else 0,
            nc=count(keys["NC"], "NC") if "NC" in keys else 0,
            instant_no=count(keys["instant-NO"], "instant-NO") if "instant-NO" in keys else 0,
            instant_nc=count(keys["instant-NC"], "instant-NC") if "instant-NC" in keys else 0,
        )

    def read_category(self, node: Node, what: str, power: bool = False) -> CategoryRating:
        entries = self.mapping(node, what)
        keys = {k: vn for k, _, vn in entries}
        for key, kn, _ in entries:
            if key not in ("category", "current", "voltage"):
                self.unknown_key(kn, key, what, ("category", "current", "voltage"))
                raise _Stop
        for req in ("category", "current", "voltage"):
            if req not in keys:
                self.fail(node, f"{what} needs '{req}'")
        cat = self.text(keys["category"], "category")
        if not CATEGORY_RE.match(cat):
            self.fail(keys["category"], f"category '{cat}' is not a utilisation category such as AC-15, DC-13, AC-3 or AC-1")
        cur = self.quantity(keys["current"], K.CURRENT, "current")
        volt = self.quantity(keys["voltage"], K.VOLTAGE, "voltage")
        return CategoryRating(cat, cur.value, volt.value, cat[:2])

    def read_rating(self, node: Node, what: str) -> ContactRating:
        if isinstance(node, SequenceNode):
            if not node.value:
                self.fail(node, f"{what} is an empty list")
            cats, designations, texts = [], [], []
            for n in node.value:
                if isinstance(n, ScalarNode):  # a NEMA letter beside category entries: [A600, Q300]
                    d = self.designation(n, what)
                    if d in designations:
                        self.fail(n, f"{what}: {d} is listed twice")
                    designations.append(d)
                    texts.append(d)
                else:
                    c = self.read_category(n, what)
                    cats.append(c)
                    texts.append(f"{c.category} {c.current:g} A {c.voltage:g} V")
            if not designations:
                return ContactRating("category", categories=tuple(cats), text=", ".join(texts))
            return ContactRating("list", designation=designations[0], categories=tuple(cats), text=", ".join(texts), designations=tuple(designations))
        value = self.scalar(node, what)
        if isinstance(value, str) and value.strip() in PILOT_DUTY_VALID:
            return ContactRating("pilot-duty", designation=value.strip(), text=value.strip())
        if isinstance(value, str) and PILOT_DUTY.match(value.strip()):
            self.fail(node, f"{what}: '{value}' is not a NEMA ICS 5 pilot-duty designation")
        try:
            q = parse_quantity(value, K.CURRENT)
        except QuantityError as exc:
            self.fail(node, f"{what}: expected a pilot-duty designation (A600 ... R150), a list of category ratings, or a current: {exc}")
        return ContactRating("thermal", current=q.value, text=q.text)

    def designation(self, node: Node, what: str) -> str:
        """One NEMA ICS 5 pilot-duty designation in a rating list."""
        value = self.scalar(node, what)
        text = value.strip() if isinstance(value, str) else ""
        if text not in PILOT_DUTY_VALID:
            self.fail(node, f"{what}: '{node.value}' in a rating list must be a pilot-duty designation (A600 ... R150) or a category entry {{category, current, voltage}}")
        return text

    def read_power_rating(self, node: Node, what: str) -> PowerRating:
        if isinstance(node, SequenceNode):
            cats = tuple(self.read_category(n, what) for n in node.value)
            if not cats:
                self.fail(node, f"{what} is an empty list")
            return PowerRating(categories=cats)
        entries = self.mapping(node, what)
        keys = {k: vn for k, _, vn in entries}
        for key, kn, _ in entries:
            if key != "size":
                self.unknown_key(kn, key, what, ("size",))
                raise _Stop
        if "size" not in keys:
            self.fail(node, f"{what}: give a list of category ratings or {{size: N}}")
        size = self.scalar(keys["size"], "size")
        if isinstance(size, int) and not isinstance(size, bool):
            if keys["size"].value.strip() != str(size):  # a bare 00 is read as 0: a different, larger size
                self.fail(keys["size"], f"NEMA size '{keys['size'].value}' is read as {size} by YAML; write size 00 as \"00\" and other sizes as plain numbers")
            size = str(size)
        if size not in NEMA_SIZES:
            self.fail(keys["size"], f"NEMA size '{keys['size'].value}' is not one of {', '.join(NEMA_SIZES)} (write size 00 as \"00\")")
        return PowerRating(nema_size=size)

    # -- use -------------------------------------------------------------
    def read_use(self, node: Node, sch: Schematic) -> None:
        items = [node] if isinstance(node, ScalarNode) else self.sequence(node, "use")
        here = os.path.dirname(os.path.abspath(self.real_path))
        root = os.path.realpath(find_repository_root(self.real_path))
        for item in items:
            try:
                rel = self.text(item, "use entry")
            except _Stop:
                continue
            if any(ord(c) < 32 for c in rel):
                self.error(item, f"use path {rel!r} holds a control character")
                continue
            if os.path.isabs(rel):
                self.error(item, f"use path '{rel}' must be relative to this file")
                continue
            if not rel.endswith(SCHEMATIC_SUFFIXES):
                self.error(item, f"use path '{rel}' must name a *.ctl.yaml device file")
                continue
            target = os.path.normpath(os.path.join(here, rel))
            real = os.path.realpath(target)
            if os.path.commonpath([root, real]) != root:
                self.error(item, f"use path '{rel}' leaves the repository ({root})")
                self.used.append(target)  # recorded for the cache: a later fix must be seen
                continue
            if not os.path.isfile(real):
                self.used.append(target)  # missing today: creating it later changes the result
                if os.path.lexists(target) and not os.path.exists(target):
                    self.error(item, f"use path '{rel}' is a broken or looping symbolic link")
                else:
                    self.error(item, f"use path '{rel}' does not exist" if not os.path.exists(target) else f"use path '{rel}' is not a readable file")
                continue
            me = os.path.realpath(self.real_path)
            if real == me or real in _USE_CHAIN:
                self.error(item, f"use path '{rel}' leads back to a file that uses it; a used file holds only ctllint and devices, never use")
                continue
            shown = _display_path(self.path, rel)
            loader = lambda: load_file(real, self.kinds, self.limits, None, display_path=shown)  # noqa: E731
            outermost = me not in _USE_CHAIN
            _USE_CHAIN.add(me)
            try:
                result = self.cache.get(real, loader) if self.cache else loader()
            finally:
                if outermost:
                    _USE_CHAIN.discard(me)
            self.used.append(real)
            if result.schematic is None:
                first = result.diagnostics[0] if result.diagnostics else None
                detail = f": {first.line}:{first.column}: {first.message}" if first else ""
                self.error(item, f"used file '{rel}' does not load{detail}")
                continue
            used = result.schematic
            if not used.device_file:
                self.error(item, f"used file '{rel}' must hold only 'ctllint' and 'devices' (it has supplies or rungs)")
                continue
            sch.uses.append(real)
            for tag, dev in used.devices.items():
                if tag in sch.devices:
                    mine = sch.devices[tag]
                    if mine.origin == self.path:
                        self.error(mine.loc, f"device {tag} is also defined in {shown} line {dev.loc.line}")
                    else:
                        self.error(item, f"device {tag} is defined both in {mine.origin} line {mine.loc.line} and in {shown} line {dev.loc.line}")
                    continue
                sch.devices[tag] = dev

    # -- supplies ------------------------------------------------------
    def read_supplies(self, node: Node, sch: Schematic) -> None:
        rails: dict[str, tuple[str, Location]] = {}
        for name, knode, vnode in self.mapping(node, "supplies"):
            try:
                entries = self.mapping(vnode, f"supply {name}")
            except _Stop:
                continue
            keys = {k: (kn, vn) for k, kn, vn in entries}
            ok = True
            for key, kn, _ in entries:
                if key not in SUPPLY_KEYS:
                    self.unknown_key(kn, key, f"supply {name}", SUPPLY_KEYS)
                    ok = False
            for req in ("hot", "common", "voltage"):
                if req not in keys:
                    self.error(knode, f"supply {name} needs '{req}'")
                    ok = False
            if not ok:
                continue
            try:
                hot = self.wire(keys["hot"][1], f"hot rail of {name}")
                common = self.wire(keys["common"][1], f"common rail of {name}")
                voltage = self.quantity(keys["voltage"][1], K.VOLTAGE, f"voltage of supply {name}")
                grounded = self.boolean(keys["grounded"][1], "grounded") if "grounded" in keys else True
                source = self.tag(keys["source"][1], "source") if "source" in keys else None
            except _Stop:
                continue
            if hot == common:
                self.error(keys["common"][1], f"supply {name}: hot and common are the same wire '{hot}'")
                continue
            sup = Supply(name=name, hot=hot, common=common, voltage=voltage, loc=self.loc(knode), grounded=grounded, source=source)
            for key, (_, vn) in keys.items():
                sup.field_locs[key] = self.loc(vn)
            clash = False
            for rail, key in ((hot, "hot"), (common, "common")):
                if rail in rails:
                    other, where = rails[rail]
                    self.error(keys[key][1], f"rail '{rail}' of supply {name} is already a rail of supply {other} (line {where.line})")
                    clash = True
                else:
                    rails[rail] = (name, self.loc(keys[key][1]))
            if not clash:
                sch.supplies[name] = sup

    # -- rungs ---------------------------------------------------------
    def read_rungs(self, node: Node, sch: Schematic) -> None:
        """The ``rungs`` section when it was not streamed (not a list, or an alias)."""
        if isinstance(node, ScalarNode) and scalar_value(node) is None:
            return
        for rnode in _consume(self.sequence(node, "rungs"), node):
            self.rung_item(None, rnode)

    def rung_item(self, _key: None, rnode: Node) -> None:
        """One rung, read as soon as the parser has it."""
        if self.rungs_stopped:
            return
        i = self.rung_count
        self.rung_count += 1
        try:
            entries = self.mapping(rnode, f"rung {i + 1}")
        except _Stop:
            return
        errors_before = len(self.errors)
        keys = {k: (kn, vn) for k, kn, vn in entries}
        rung = Rung(index=i, number=i + 1, loc=self.loc(rnode))
        for key, kn, vn in entries:
            if key not in RUNG_KEYS:
                self.unknown_key(kn, key, f"rung {i + 1}", RUNG_KEYS)
                continue
            try:
                if key == "title":
                    rung.title = self.text(vn, "rung title")
                elif key == "note":
                    rung.note = self.text(vn, "rung note")
                elif key == "jog":
                    rung.jog = self.boolean(vn, "jog")
                elif key == "restart":
                    rung.restart = self.text(vn, "restart", ("automatic",))
                elif key == "number":
                    num = self.scalar(vn, "rung number")
                    if isinstance(num, bool) or not isinstance(num, int) or num < 0:
                        self.fail(vn, f"rung number must be a whole number, not '{vn.value}'")
                    rung.number = num
            except _Stop:
                pass
        numbers = self.rung_numbers
        if rung.number in numbers:
            where = keys["number"][1] if "number" in keys else rnode
            self.error(where, f"rung number {rung.number} is already used by the rung at line {numbers[rung.number]}")
        numbers[rung.number] = rung.loc.line
        if "paths" not in keys:
            self.error(rnode, f"rung {rung.number} has no 'paths'")
        else:
            try:
                for pnode in self.sequence(keys["paths"][1], "paths"):
                    try:
                        path, self.element_count = self.read_path(pnode, rung, self.element_count)
                        rung.paths.append(path)
                    except _Stop:
                        pass
            except _Stop:
                pass
            if not rung.paths and len(self.errors) == errors_before:  # not when its paths were refused
                self.error(keys["paths"][1], f"rung {rung.number} has no paths")
        self.sch.rungs.append(rung)

    def read_path(self, node: Node, rung: Rung, counter: int) -> tuple[Path, int]:
        items = self.sequence(node, "a path")
        if len(items) < 3 or len(items) % 2 == 0:
            self.fail(node, "a path alternates wires and elements, beginning and ending with a wire: [wire, element, wire, ...]")
        if self.rungs_stopped:
            raise _Stop
        if counter + len(items) // 2 > self.limits.max_elements:  # refused before the elements are built
            self.rungs_stopped = True  # said once; the rest of the rungs are not read
            self.fail(node, f"more than {self.limits.max_elements} elements; limit max_elements")
        wires: list[str] = []
        wire_pos: list[tuple[int, int]] = []
        refs: list[tuple[str, str | None, Node]] = []
        ok = True
        share = self._texts.setdefault
        for j, item in enumerate(items):
            try:
                if j % 2 == 0:
                    wires.append(self.wire(item))
                    wire_pos.append(self.position(item))
                else:
                    value = self.scalar(item, "an element")
                    if not isinstance(value, str):
                        self.fail(item, f"'{item.value}' stands where an element belongs: expected TAG or TAG.PART between two wires")
                    m = REF_RE.match(value)
                    terms = None
                    if not m and " " in value.strip():  # terminal numbers after a space: CR1.NO 13-14
                        ref, _, written = value.strip().partition(" ")
                        m, terms = REF_RE.match(ref), parse_terminals(written.strip())
                        if m and terms is None:
                            self.fail(item, f"'{value}': terminal numbers are written after the reference as LEFT-RIGHT, "
                                            f"two different names of letters, digits, '+', '_' or '/' (e.g. '{ref} 13-14')")
                    if not m:
                        self.fail(item, f"'{value}' is not an element reference (TAG or TAG.PART, optionally followed by terminal numbers such as 13-14)")
                    tag, part = m.group("tag", "part")
                    refs.append((share(tag, tag), part and share(part, part), item, terms))
            except _Stop:
                ok = False
        if not ok:
            raise _Stop
        elements = []
        located, path, index = Element.located, self.path, rung.index
        for j, (tag, part, item, terms) in enumerate(refs):
            elements.append(located(counter, tag, part, path, *self.position(item), index, wires[j], wires[j + 1]))
            if terms is not None:
                elements[-1].terminals = terms
            counter += 1
        return Path.packed(wires, wire_pos, elements, self.loc(node)), counter

    # -- expect ----------------------------------------------------------
    def read_expect(self, node: Node, sch: Schematic) -> None:
        names: set[str] = set()
        for snode in self.sequence(node, "expect"):
            try:
                entries = self.mapping(snode, "a scenario")
            except _Stop:
                continue
            keys = {k: (kn, vn) for k, kn, vn in entries}
            for key, kn, _ in entries:
                if key not in ("name", "steps"):
                    self.unknown_key(kn, key, "a scenario", ("name", "steps"))
            if "name" not in keys or "steps" not in keys:
                self.error(snode, "a scenario needs 'name' and 'steps'")
                continue
            try:
                name = self.text(keys["name"][1], "scenario name")
            except _Stop:
                continue
            if name in names:
                self.error(keys["name"][1], f"scenario name '{name}' is used twice")
            names.add(name)
            scen = Scenario(name=name, loc=self.loc(snode))
            try:
                for stnode in self.sequence(keys["steps"][1], "steps"):
                    try:
                        scen.steps.append(self.read_step(stnode))
                    except _Stop:
                        pass
            except _Stop:
                pass
            sch.expect.append(scen)

    def read_step(self, node: Node) -> Step:
        entries = self.mapping(node, "a step")
        if len(entries) != 1:
            self.fail(node, f"a step has exactly one action ({', '.join(STEP_ACTIONS)})")
        action, knode, vnode = entries[0]
        if action not in STEP_ACTIONS:
            self.unknown_key(knode, action, "a step", STEP_ACTIONS)
            raise _Stop
        step = Step(action=action, loc=self.loc(knode))
        if action in ("press", "release", "trip", "reset"):
            tnodes = vnode.value if isinstance(vnode, SequenceNode) else [vnode]
            if not tnodes:
                self.fail(vnode, f"{action} names no device")
            for tn in tnodes:
                t = self.tag(tn, f"{action} target")
                step.targets[t] = None
                step.target_locs[t] = self.loc(tn)
        elif action == "power":
            value = self.text(vnode, "power", ("on", "off"))
            step.targets[""] = value
            step.target_locs[""] = self.loc(vnode)
        elif action == "wait":
            step.seconds = self.quantity(vnode, K.TIME, "wait").value
        else:  # set, check
            for t, kn, vn in self.mapping(vnode, action):
                if not TAG_RE.match(t):
                    self.fail(kn, f"'{t}' is not a device tag")
                v = self.scalar(vn, f"{action} {t}")
                if action == "check":
                    if v not in ("on", "off"):
                        self.fail(vn, f"check {t}: expected on or off, not '{vn.value}'")
                    step.targets[t] = v == "on"
                else:
                    if isinstance(v, int) and not isinstance(v, bool):
                        v = str(v)
                    if not isinstance(v, str):
                        self.fail(vn, f"set {t}: expected a position name or on/off, not '{vn.value}'")
                    step.targets[t] = v
                step.target_locs[t] = self.loc(kn)
        return step

    # -- cross-references that are format errors ----------------------
    def check_step_targets(self, sch: Schematic) -> None:
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
                    kind = self.kinds.get(dev.kind) if dev is not None else None
                    if kind is None:
                        continue
                    where = step.target_locs.get(tag, step.loc)
                    problem = _step_problem(step.action, kind, dev, value)
                    if problem:
                        self.error(where, f"{step.action} {tag}: {tag} is {_article(dev.kind)}; {problem}")

    def check_device_references(self, sch: Schematic) -> None:
        """Fill element roles; a field naming a device of the wrong kind is a format error."""
        for dev in sch.devices.values():
            if dev.origin != self.path:
                continue
            kind = self.kinds.get(dev.kind)
            for name, spec in kind.fields.items():
                if spec.type not in (K.TAG, K.TAGS) or not spec.tag_kinds or name not in dev.fields:
                    continue
                tags = dev.fields[name] if spec.type == K.TAGS else [dev.fields[name]]
                for t in tags:
                    other = sch.devices.get(t)
                    if other is not None and other.kind not in spec.tag_kinds:
                        self.error(dev.at(name), f"{name} of {dev.tag} names {t}, {_article(other.kind)}; it must be {' or '.join(_article(k) for k in spec.tag_kinds)}")
            speed = dev.get("speed")
            motor = sch.devices.get(dev.get("feeds") or "") if speed is not None else None
            if motor is not None and motor.kind == "motor":
                names = [s.name for s in motor.get("speeds") or ()]
                if speed not in names:
                    have = f"its speeds are {', '.join(names)}" if names else "it gives no speeds"
                    self.error(dev.at("speed"), f"speed of {dev.tag} names '{speed}', not a speed of motor {motor.tag} ({have})")
        for sup in sch.supplies.values():
            if sup.source and sup.source in sch.devices:
                other = sch.devices[sup.source]
                if other.kind not in ("transformer", "power-supply"):
                    self.error(sup.at("source"), f"source of supply {sup.name} names {sup.source}, {_article(other.kind)}; it must be a transformer or power-supply")
        for dev in sch.devices.values():
            if dev.kind != "transformer" or dev.origin != self.path:
                continue
            for i, t in enumerate(dev.get("fuses") or []):
                fuse = sch.devices.get(t)
                if fuse is not None and fuse.kind in ("fuse", "breaker") and fuse.get("side") is None:
                    self.error(fuse.loc, f"{fuse.kind} {t} is listed in the fuses of transformer {dev.tag} and needs 'side: primary' or 'side: secondary'")
        self.check_step_targets(sch)
        for el in sch.elements:
            dev = sch.devices.get(el.tag)
            if dev is None:
                continue
            kind = self.kinds.get(dev.kind)
            role = kind.part_role(el.part)
            if role is None and kind.positions and el.part in K.selector_parts(dev):
                role = K.CONTACT
            el.role = role or ""
            el.inductive = bool(role == K.LOAD and kind.inductive)
        self.check_terminals(sch)

    def check_terminals(self, sch: Schematic) -> None:
        """Written terminal numbers of one device that put two wires on one terminal."""
        if any(el.terminals for el in sch.elements):
            for el, message in terminal_conflicts(sch, assign_terminals(sch, self.kinds)):
                self.error(el.loc, message)


def _consume(items: list, node: Node) -> Iterator:
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


# Characters other than "\n" that str.splitlines takes for a line break.
_OTHER_BREAKS = re.compile("[\r\x0b\x0c\x1c\x1d\x1e\x85\u2028\u2029]")


def count_lines(text: str) -> int:
    """``len(text.splitlines())`` without building the list (for the usual file, broken by "\n" only)."""
    if _OTHER_BREAKS.search(text):
        return len(text.splitlines())
    return text.count("\n") + (1 if text and not text.endswith("\n") else 0)


def _streamed(node: Node) -> bool:
    return isinstance(node, (MappingNode, SequenceNode)) and node.streamed is not None


def _display_path(base: str, rel: str) -> str:
    folder = os.path.dirname(base)
    return os.path.normpath(os.path.join(folder, rel)) if folder else os.path.normpath(rel)


def _describe(node: Node) -> str:
    if isinstance(node, MappingNode):
        return "a mapping"
    if isinstance(node, SequenceNode):
        return "a list"
    return _describe_value(scalar_value(node)) + f" '{excerpt(node.value)}'"


def _describe_value(value: Any) -> str:
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


def _closest(word: str, options: tuple[str, ...]) -> str | None:
    import difflib

    found = difflib.get_close_matches(word, list(options), n=1, cutoff=0.75)
    return found[0] if found else None


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


def _article(word: str) -> str:
    return ("an " if word[:1] in "aeiou" else "a ") + word
