"""Plain data for a loaded schematic.

Everything here is data with positions; no behaviour beyond small accessors.
The loader builds these objects, the circuit graph and the rules read them.
Electrical values are held in SI base units (volts, amperes, volt-amperes,
watts, seconds); units are parsed and printed only at the edges.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from enum import IntEnum
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
    """A contact's rating, one of three forms (FORMAT.md "Ratings").

    ``form`` is "pilot-duty" (``designation`` set), "category" (``categories``
    set) or "thermal" (``current`` set).
    """

    form: str
    designation: str | None = None
    categories: tuple[CategoryRating, ...] = ()
    current: float | None = None
    text: str = ""


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

    def available(self) -> tuple[int, int]:
        """(NO, NC) uses this device provides."""
        return self.no + self.changeover, self.nc + self.changeover

    def allows(self, no_used: int, nc_used: int) -> bool:
        no_max, nc_max = self.available()
        return no_used <= no_max and nc_used <= nc_max


@dataclass(slots=True)
class Device:
    """One entry of ``devices``: its tag, kind and parsed fields.

    ``fields`` maps field names to parsed values (Quantity, ContactRating,
    str, bool, numbers, lists); ``field_locs`` maps the same names to the
    position of each value. ``origin`` is the file that defines the device.
    """

    tag: str
    kind: str
    loc: Location
    fields: dict[str, Any] = field(default_factory=dict)
    field_locs: dict[str, Location] = field(default_factory=dict)
    origin: str = ""

    def get(self, name: str, default: Any = None) -> Any:
        return self.fields.get(name, default)

    def at(self, name: str) -> Location:
        """Position of field ``name``'s value, or of the tag when absent."""
        return self.field_locs.get(name, self.loc)


@dataclass(eq=False, slots=True)
class Element:
    """One element of a path: ``TAG.PART`` or a bare ``TAG``.

    It joins wire ``left`` to wire ``right``. ``index`` is its order in the
    file (0-based, unique), ``rung`` the index of its rung in ``rungs``.
    ``role`` is filled in by the loader from the device kind: "load",
    "contact", "output", "conductor" or "" when unknown.
    """

    index: int
    tag: str
    part: str | None
    text: str
    loc: Location
    rung: int
    left: str
    right: str
    role: str = ""
    inductive: bool = False

    @property
    def ref(self) -> str:
        return self.text

    def __repr__(self) -> str:
        return f"<Element {self.text} {self.left}-{self.right} @{self.loc.line}>"


@dataclass(slots=True)
class Path:
    """One path of a rung: wires alternating with elements."""

    wires: list[str]
    wire_locs: list[Location]
    elements: list[Element]
    loc: Location


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
    text_lines: list[str] = field(default_factory=list)
    _elements: tuple[int, list[Element]] | None = field(default=None, repr=False, compare=False)

    @property
    def elements(self) -> list[Element]:
        """Every element in file order (built once: rules ask for it many times)."""
        count = len(self.rungs)
        if self._elements is None or self._elements[0] != count:
            self._elements = (count, [e for r in self.rungs for p in r.paths for e in p.elements])
        return self._elements[1]

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
