"""Plain data for a loaded schematic.

Everything here is data with positions; no behaviour beyond small accessors.
The loader builds these objects, the circuit graph and the rules read them.
Electrical values are held in SI base units (volts, amperes, volt-amperes,
watts, seconds); units are parsed and printed only at the edges.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from enum import IntEnum
import struct
import zlib
from typing import Any


class Severity(IntEnum):
    """Finding severities, ordered so that ``>=`` means "at least as severe"."""

    INFO = 1
    WARNING = 2
    ERROR = 3

    @classmethod
    def parse(cls, text: str) -> "Severity":
        return cls[text.upper()]

    def __str__(self) -> str:  # "error", "warning", "info"
        return self.name.lower()


@dataclass(frozen=True, slots=True, order=True)
class Location:
    """A 1-based line and column in a file."""

    path: str
    line: int
    column: int

    def __str__(self) -> str:
        return f"{self.path}:{self.line}:{self.column}"


@dataclass(frozen=True, slots=True)
class Quantity:
    """An electrical or physical value parsed from text such as ``120 VAC``.

    ``value`` is in SI base units (V, A, VA, W, s, kelvin of rise);
    ``dimension`` is one of voltage, current, apparent_power, power, time,
    temperature; ``current_kind`` is "AC", "DC" or None when the text leaves
    it open; ``number`` and ``unit`` are as written.
    """

    value: float
    dimension: str
    current_kind: str | None
    number: float
    unit: str
    text: str

    def __str__(self) -> str:
        return self.text


@dataclass(frozen=True, slots=True)
class CategoryRating:
    """One utilisation-category rating: ``{category: AC-15, current: 3 A, voltage: 240 V}``."""

    category: str
    current: float
    voltage: float
    current_kind: str  # "AC" or "DC", from the category's prefix


@dataclass(frozen=True, slots=True)
class ContactRating:
    """A contact's rating (FORMAT.md "Ratings" and "Additions").

    ``form`` is "pilot-duty" (one ``designation``), "category" (``categories``
    only), "thermal" (``current`` set) or "list" (a list mixing NEMA
    designations and category entries, e.g. ``[A600, Q300]``). Every
    designation of the rating is in ``designations``; each designation and
    category covers its own kind of supply (AC or DC).
    """

    form: str
    designation: str | None = None
    categories: tuple[CategoryRating, ...] = ()
    current: float | None = None
    text: str = ""
    designations: tuple[str, ...] = ()

    def all_designations(self) -> tuple[str, ...]:
        """The NEMA designations of the rating, a single one included."""
        if self.designations:
            return self.designations
        return (self.designation,) if self.designation else ()


@dataclass(frozen=True, slots=True)
class MotorSpeed:
    """One speed of a multi-speed motor: its power (W) and nameplate current (A), either may be absent."""

    name: str
    power: "Quantity | None" = None
    fla: "Quantity | None" = None


@dataclass(frozen=True, slots=True)
class PowerRating:
    """A contactor's main-pole rating: category ratings or a NEMA size."""

    categories: tuple[CategoryRating, ...] = ()
    nema_size: str | None = None


@dataclass(frozen=True, slots=True)
class ContactCount:
    """How many contacts a device provides: ``{NO: 2, NC: 1}`` or changeover poles."""

    no: int
    nc: int
    changeover: int = 0  # double-throw poles: each offers one NO and one NC (FORMAT.md)
    instant_no: int = 0  # a timer's instantaneous contacts (FORMAT.md "Additions")
    instant_nc: int = 0

    def available(self) -> tuple[int, int]:
        """(NO, NC) uses this device provides."""
        return self.no + self.changeover, self.nc + self.changeover

    def allows(self, no_used: int, nc_used: int) -> bool:
        no_max, nc_max = self.available()
        return no_used <= no_max and nc_used <= nc_max


class Device:
    """One entry of ``devices``: its tag, kind and parsed fields.

    ``fields`` maps field names to parsed values (Quantity, ContactRating,
    str, bool, numbers, lists); ``at(name)`` and ``field_locs`` give the
    position of each value. ``origin`` is the file that defines the device.

    A large panel has thousands of devices, so positions are kept packed
    (two 32-bit numbers per field in one bytes object, the names in a tuple
    shared by devices written alike) and a Location is made only when asked
    for.
    """

    __slots__ = ("tag", "kind", "fields", "origin", "_path", "_line", "_column", "_names", "_pos")

    def __init__(self, tag: str, kind: str, loc: "Location", fields: dict[str, Any] | None = None,
                 field_locs: dict[str, "Location"] | None = None, origin: str = ""):
        self.tag = tag
        self.kind = kind
        self.fields: dict[str, Any] = {} if fields is None else fields
        self.origin = origin
        self._path, self._line, self._column = loc.path, loc.line, loc.column
        self._names: tuple[str, ...] = ()
        self._pos = b""
        if field_locs:
            self.set_positions(tuple(field_locs), [(at.line, at.column) for at in field_locs.values()])

    @property
    def loc(self) -> "Location":
        """Position of the device's tag."""
        return Location(self._path, self._line, self._column)

    @loc.setter
    def loc(self, loc: "Location") -> None:
        self._path, self._line, self._column = loc.path, loc.line, loc.column

    def set_positions(self, names: tuple[str, ...], positions: list[tuple[int, int]]) -> None:
        """Set where each field's value stands: ``names[i]`` at ``positions[i]`` (line, column)."""
        self._names = names
        self._pos = _pack(positions)

    @property
    def field_locs(self) -> dict[str, "Location"]:
        """Position of every field's value written in the file (a new dict on each call)."""
        path = self._path
        return {name: Location(path, *_unpack(self._pos, i)) for i, name in enumerate(self._names)}

    def get(self, name: str, default: Any = None) -> Any:
        return self.fields.get(name, default)

    def at(self, name: str) -> "Location":
        """Position of field ``name``'s value, or of the tag when absent."""
        try:
            i = self._names.index(name)
        except ValueError:
            return self.loc
        return Location(self._path, *_unpack(self._pos, i))

    def __repr__(self) -> str:
        return f"Device(tag={self.tag!r}, kind={self.kind!r}, loc={self.loc!r}, fields={self.fields!r})"


_POS = struct.Struct("<II")
_PACK_TEXT_ABOVE = 64 * 1024  # characters; smaller files keep their text as it is


def _pack(positions: list[tuple[int, int]]) -> bytes:
    return b"".join(_POS.pack(line, column) for line, column in positions)


def _unpack(packed: bytes, i: int) -> tuple[int, int]:
    return _POS.unpack_from(packed, 8 * i)


class Element:
    """One element of a path: ``TAG.PART`` or a bare ``TAG``.

    It joins wire ``left`` to wire ``right``. ``index`` is its order in the
    file (0-based, unique), ``rung`` the index of its rung in ``rungs``.
    ``role`` is filled in by the loader from the device kind: "load",
    "contact", "output", "conductor" or "" when unknown. ``text`` is the
    reference as written; ``line`` and ``column`` its position, ``loc`` the
    same as a Location (made when asked for: a panel has many elements).
    ``terminals`` is the (left, right) pair of terminal numbers written in
    the file (``CR1.NO 13-14``), or None (see ``ctllint.reading.terminals``).
    """

    __slots__ = ("index", "tag", "part", "_path", "line", "column", "rung", "left", "right", "role", "inductive", "terminals")

    def __init__(self, index: int, tag: str, part: str | None, text: str | None, loc: "Location", rung: int,
                 left: str, right: str, role: str = "", inductive: bool = False,
                 terminals: tuple[str, str] | None = None):
        if text is not None and text != (tag if part is None else f"{tag}.{part}"):
            raise ValueError(f"element text {text!r} is not TAG or TAG.PART of {tag!r} and {part!r}")
        self.index = index
        self.tag = tag
        self.part = part
        self._path, self.line, self.column = loc.path, loc.line, loc.column
        self.rung = rung
        self.left = left
        self.right = right
        self.role = role
        self.inductive = inductive
        self.terminals = terminals

    @classmethod
    def located(cls, index: int, tag: str, part: str | None, path: str, line: int, column: int, rung: int, left: str, right: str) -> "Element":
        """An element at ``line``, ``column`` of ``path`` (the loader's way: no Location made)."""
        el = cls.__new__(cls)
        el.index, el.tag, el.part, el._path, el.line, el.column = index, tag, part, path, line, column
        el.rung, el.left, el.right, el.role, el.inductive = rung, left, right, "", False
        el.terminals = None
        return el

    @property
    def text(self) -> str:
        return self.tag if self.part is None else f"{self.tag}.{self.part}"

    @property
    def ref(self) -> str:
        return self.text

    @property
    def loc(self) -> "Location":
        return Location(self._path, self.line, self.column)

    @loc.setter
    def loc(self, loc: "Location") -> None:
        self._path, self.line, self.column = loc.path, loc.line, loc.column

    def __repr__(self) -> str:
        return f"<Element {self.text} {self.left}-{self.right} @{self.line}>"


class Path:
    """One path of a rung: wires alternating with elements.

    ``wire_locs`` gives each wire's position (made when asked for; kept packed).
    """

    __slots__ = ("wires", "elements", "loc", "_wire_pos")

    def __init__(self, wires: list[str], wire_locs: list["Location"], elements: list[Element], loc: "Location"):
        self.wires = wires
        self.elements = elements
        self.loc = loc
        self._wire_pos = _pack([(at.line, at.column) for at in wire_locs])

    @classmethod
    def packed(cls, wires: list[str], wire_positions: list[tuple[int, int]], elements: list[Element], loc: "Location") -> "Path":
        """A path from wire positions as (line, column) pairs, in ``loc``'s file."""
        path = cls(wires, [], elements, loc)
        path._wire_pos = _pack(wire_positions)
        return path

    @property
    def wire_locs(self) -> list["Location"]:
        where = self.loc.path
        return [Location(where, *_unpack(self._wire_pos, i)) for i in range(len(self._wire_pos) // 8)]

    def __repr__(self) -> str:
        return f"Path({self.wires!r}, {self.elements!r})"


@dataclass(slots=True)
class Rung:
    index: int
    number: int
    loc: Location
    paths: list[Path] = field(default_factory=list)
    title: str | None = None
    jog: bool = False
    restart: str | None = None
    note: str | None = None

    @property
    def elements(self) -> list[Element]:
        return [e for p in self.paths for e in p.elements]


@dataclass(slots=True)
class Supply:
    name: str
    hot: str
    common: str
    voltage: Quantity
    loc: Location
    grounded: bool = True
    source: str | None = None
    field_locs: dict[str, Location] = field(default_factory=dict)

    @property
    def current_kind(self) -> str | None:
        return self.voltage.current_kind

    def at(self, name: str) -> Location:
        return self.field_locs.get(name, self.loc)


@dataclass(slots=True)
class Step:
    """One step of an ``expect`` scenario.

    ``action`` is press, release, set, trip, reset, power, wait or check.
    ``targets`` maps device tags to the step's value for them (None for
    press/release/trip/reset, a position or "on"/"off" for set, True/False
    for check, the power state for ``power`` under the key ""), with
    ``target_locs`` giving each tag's position. ``seconds`` is set for wait.
    """

    action: str
    loc: Location
    targets: dict[str, Any] = field(default_factory=dict)
    target_locs: dict[str, Location] = field(default_factory=dict)
    seconds: float = 0.0


@dataclass(slots=True)
class Scenario:
    name: str
    loc: Location
    steps: list[Step] = field(default_factory=list)


@dataclass(slots=True)
class Schematic:
    """A loaded schematic file, with the devices of the files it uses."""

    path: str
    loc: Location
    title: str | None = None
    supplies: dict[str, Supply] = field(default_factory=dict)
    devices: dict[str, Device] = field(default_factory=dict)
    rungs: list[Rung] = field(default_factory=list)
    expect: list[Scenario] = field(default_factory=list)
    uses: list[str] = field(default_factory=list)  # resolved paths of used files
    device_file: bool = False  # holds only devices (a shared device file)
    line_count: int = 0  # lines in ``text``, as ``str.splitlines`` counts them
    _text: str | bytes = field(default="", repr=False, compare=False)  # see ``text``
    _elements: tuple[int, list[Element]] | None = field(default=None, repr=False, compare=False)

    @property
    def elements(self) -> list[Element]:
        """Every element in file order (built once: rules ask for it many times)."""
        count = len(self.rungs)
        if self._elements is None or self._elements[0] != count:
            self._elements = (count, [e for r in self.rungs for p in r.paths for e in p.elements])
        return self._elements[1]

    @property
    def text(self) -> str:
        """The file as read.

        A large file's text is kept compressed (zlib, fastest level: about a
        tenth of its size) while the rules run, and unpacked on each call.
        """
        held = self._text
        return zlib.decompress(held).decode("utf-8") if isinstance(held, bytes) else held

    @text.setter
    def text(self, text: str) -> None:
        self._text = zlib.compress(text.encode("utf-8"), 1) if len(text) > _PACK_TEXT_ABOVE else text

    @property
    def text_lines(self) -> list[str]:
        """The file's lines (built on each call from ``text``: a large file's lines are not kept)."""
        return self.text.splitlines()

    def supply_of_rail(self, wire: str) -> Supply | None:
        for s in self.supplies.values():
            if wire in (s.hot, s.common):
                return s
        return None


@dataclass(frozen=True, slots=True, order=True)
class Diagnostic:
    """One finding. Sorts by path, line, column, rule, then message.

    ``subject`` identifies what the finding is about independent of its
    line (a device tag, an element such as ``M1.coil`` in rung 3), so that
    baselines survive edits that move lines.
    """

    path: str
    line: int
    column: int
    rule: str
    severity: Severity = field(compare=False)
    message: str
    subject: str = field(default="", compare=False)

    @classmethod
    def at(cls, loc: Location, rule: str, severity: Severity, message: str, subject: str = "") -> "Diagnostic":
        return cls(loc.path, loc.line, loc.column, rule, severity, message, subject)

    def as_dict(self) -> dict[str, Any]:
        return {
            "path": self.path,
            "line": self.line,
            "column": self.column,
            "rule": self.rule,
            "severity": str(self.severity),
            "message": self.message,
        }
