"""The drawing's layout model: where each rung, row, element, wire number, cross-reference and
mark goes, as plain data.

Its own module because it is the contract between the two halves of the drawing: the layout
(``columns``, ``rows``, ``wires``, ``lanes``, ``sheet``) fills these in, in drawing
coordinates, with every text already fitted to its room; the SVG writer (``writer``, with
``symbols``) only turns them into SVG text, deciding nothing about places. Nothing here writes
SVG.
"""
from __future__ import annotations

from dataclasses import dataclass, field

from ctllint.output.draw.measures import TERMINAL_INSET
from ctllint.output.draw.xref import CoilUse
from ctllint.reading.model import Diagnostic, Element, Rung, Supply
from ctllint.reading.terminals import Marks


@dataclass(frozen=True)
class Mark:
    """A change to show on one element of a drawing of one revision.

    ``change`` is "removed" or "moved-from" (on the old revision's drawing),
    "added" or "moved-to" (on the new one's); ``label`` is written under the
    element ("removed", "moved to wires 2\u20135").
    """

    change: str
    label: str


@dataclass
class Placed:
    """An element placed in the drawing."""

    element: Element
    row: int                 # row index within the rung
    left: str                # node on the drawing's left side (after orientation)
    right: str
    slot: int                # the symbol sits between columns slot and slot + 1
    kind: str = ""
    anchor: str = ""         # SVG id
    findings: list[Diagnostic] = field(default_factory=list)
    cx: float = 0.0
    y: float = 0.0
    mark: Mark | None = None
    terminals: Marks | None = None  # the element's terminal numbers (its left wire's first)
    closed_in: tuple[str, ...] = ()  # a selector part: the positions it is closed in
    operator: str = ""               # how a contact is worked: see symbols.OPERATORS
    positions: tuple[str, ...] = ()  # a selector's positions, for its position marks
    label: str = ""                  # its tag label, fitted to the column
    half: float = 0.0                # half the width of its outline (SYMBOL_HALF when it has none)
    terminal_text: tuple[str, str] | None = None  # terminal numbers under its drawn left and right leads


@dataclass
class RowPath:
    """One path as drawn: its row and its oriented nodes and elements."""

    nodes: list[str]
    placed: list[Placed]
    row: int = 0


@dataclass
class Label:
    """A rule name (or a change mark's words) under an element, in a lane of its row."""

    x0: float
    x1: float
    text: str
    diag: Diagnostic | None        # None for a change mark's label
    placed: Placed
    lane: int = 0
    y: float = 0.0                 # its baseline, once its lane is known


@dataclass
class Junction:
    """What is drawn at one node of a rung: the vertical connector between its rows (top and
    bottom line), the junction dots, and the terminal mark of a wire end (its row line, the
    wire, the words of its tooltip)."""

    x: float
    connector: tuple[float, float] | None = None
    dots: list[float] = field(default_factory=list)
    terminal: tuple[float, str, str] | None = None


@dataclass
class XrefRow:
    """The cross-reference margin of one row: its line and the coils' lines (coil tag, text)."""

    y: float
    coils: list[CoilUse]
    lines: list[tuple[str, str]]


@dataclass
class RungLayout:
    rung: Rung
    supply: Supply | None
    hot: str | None
    common: str | None
    paths: list[RowPath]
    column: dict[str, int]          # node -> column
    wire_of: dict[str, str]         # node -> wire name shown (nodes made for loops differ)
    rows: int = 1
    row_y: list[float] = field(default_factory=list)
    top: float = 0.0
    bottom: float = 0.0
    caption: str = ""               # title and note, fitted
    wires: list[tuple[float, float, float]] = field(default_factory=list)    # wire runs: x from, x to, y
    numbers: list[tuple[float, float, str]] = field(default_factory=list)    # wire numbers: x, y (row line), wire
    junctions: list[Junction] = field(default_factory=list)
    labels: list[Label] = field(default_factory=list)                        # rule names, row by row
    xrefs: list[XrefRow] = field(default_factory=list)


@dataclass
class Section:
    """Consecutive rungs on one supply, drawn between one pair of rails."""

    supply: Supply | None
    rungs: list[RungLayout]
    top: float = 0.0
    bottom: float = 0.0
    findings: list[Diagnostic] = field(default_factory=list)
    head: float = 0.0               # height of its head (rail names, supply, the supply's findings)
    anchor: str = ""                # its id: the supply's, on the supply's first section only
    label: str = ""                 # the supply's name and voltage, fitted


@dataclass
class Grid:
    """The horizontal measures: the rails, the columns between them, the sheet's width."""

    rail_l: float
    rail_r: float
    col_w: float
    last: int                       # the common rail's column
    width: float

    def node_x(self, lay: RungLayout, node: str) -> float:
        c = lay.column[node]
        x = self.rail_l + c * self.col_w
        if c == 0 and node != lay.hot:
            x += TERMINAL_INSET
        if c == self.last and node != lay.common:
            x -= TERMINAL_INSET
        return x


@dataclass
class LegendLine:
    x: float
    y: float
    text: str
    cls: str
    finding: Diagnostic | None = None   # on the first line of a finding


@dataclass
class Legend:
    """Under the drawing: a rule, every finding, and the safety note."""

    x0: float
    x1: float
    rule_y: float
    heading_y: float | None             # "Findings", when there are any
    lines: list[LegendLine]


@dataclass
class Sheet:
    """The whole drawing laid out: what the SVG writer needs and nothing it must work out."""

    path: str
    title: str
    heading: tuple[str, str] | None     # the fitted title and sub-title, when the header is drawn
    empty: tuple[float, str] | None     # where there are no rungs: the caption's row line and words
    grid: Grid
    sections: list[Section]
    legend: Legend | None
    height: float
    prefix: str
    links: dict[Diagnostic, str]
    marked: bool                        # change marks are drawn (their style is written)
    anchors: dict[Diagnostic, str]
    unplaced: list[Diagnostic]
    element_ids: dict[int, str]


@dataclass
class Drawing:
    """A laid-out schematic; ``svg`` is the drawing as text."""

    svg: str
    width: float
    height: float
    anchors: dict[Diagnostic, str]     # finding -> id of the thing it is drawn on
    unplaced: list[Diagnostic]         # findings with nothing to mark in the drawing
    element_ids: dict[int, str]        # Element.index -> SVG id
    columns: int = 0                   # the drawing's width in columns (rail to rail)
