"""Draw a schematic's ladder as plain SVG.

The drawing is built in two steps. ``layout`` places everything on a grid
of columns and rows and measures text; ``Drawing.svg`` writes the result.
No drawing library is used: the SVG is a few hundred lines of plain
elements, written in a fixed order with rounded coordinates, so the same
schematic and findings always give the same bytes.

Layout, rung by rung:

- Rungs keep the file's order, top to bottom. Consecutive rungs on the same
  supply share one pair of rails (hot at left, common at right), headed by
  the rail wire names and the supply's name and voltage.
- Inside a rung each wire is a node and each element an edge. Nodes get a
  column: the longest run of elements from the hot rail (contacts pack to
  the left), except that a load and whatever follows it pack to the right,
  next to the common rail, as loads sit on a ladder diagram.
- The rung's first path is its top row. Each further path goes to the first
  row below where it overlaps nothing and its vertical connectors cross no
  other line; it joins the wires it bridges with vertical connectors, with
  a dot where three or more conductors meet.
- Each coil's row carries, right of the common rail, the rungs where the
  coil's contacts are used: ``NO 2, 5  NC 7``.
- Each element's terminal numbers (written in the file, or assigned as
  ``ctllint.reading.terminals`` says) stand in small type under its two leads,
  each beside the wire that lands on it.
- A finding is matched to what it points at by file, line and column: an
  element, or every rung element of a device whose tag or field it names.
  The element gets an outline in the colour of its worst finding, and each
  rule name is written under it, in lanes that never overlap.

For a review of changes, ``layout`` can draw only some rungs (``rungs``:
each keeps its number, supply and cross-references) and mark elements as
removed, added or moved (``marks``, see ``Mark``): a dashed or solid
outline in the change's colour, a minus or plus badge, and words under
the element, in the same lanes as rule names.

All text uses a monospaced face, so a label's width is known exactly
(``text_width``) and the layout can keep labels apart.
"""
from __future__ import annotations

import os
import re
from dataclasses import dataclass, field
from typing import Iterable
from xml.sax.saxutils import escape as _escape, quoteattr as _quoteattr

from ctllint.reading.kinds import INSTANT_PARTS, contact_sense
from ctllint.reading.budget import work
from ctllint.reading.model import Diagnostic, Element, Location, Rung, Schematic, Severity, Supply
from ctllint.reading.kinds import selector_parts
from ctllint.reading.terminals import Marks, assign as assign_terminals

# -- fonts and measures -----------------------------------------------------------

MONO = "'DejaVu Sans Mono', Menlo, Consolas, 'Liberation Mono', monospace"
SANS = "'DejaVu Sans', 'Helvetica Neue', Helvetica, Arial, sans-serif"
# Advance width of one character of DejaVu Sans Mono, in ems (1233/2048).
MONO_ADVANCE = 0.602

SIZE_TITLE = 16
SIZE_SUB = 11
SIZE_TAG = 11       # element labels
SIZE_WIRE = 10      # wire numbers
SIZE_RUNG = 12      # rung numbers
SIZE_XREF = 10
SIZE_RULE = 9       # rule names under marked elements
SIZE_CAPTION = 10
SIZE_TERMINAL = 8   # terminal numbers under an element's leads
TERMINAL_BELOW = 19  # their baseline below the row line
TERMINAL_GAP = 4     # each ends (left) or starts (right) this far from the element's centre
OUTLINE_HEIGHT = 52  # a marked element's outline, from 29 above its row line to 23 below (terminal numbers inside)
SIZE_RAIL = 12

LEFT_MARGIN = 64        # room for rung numbers left of the hot rail
XREF_WIDTH = 196        # margin right of the common rail
RIGHT_PAD = 16
SYMBOL_HALF = 14        # every symbol fits in [cx - 14, cx + 14]
TERMINAL_INSET = 14     # a wire end that is not a rail stays clear of it
LABEL_ABOVE = 17        # element label baseline above the row line
WIRE_ABOVE = 4          # wire number baseline above the row line
ROW_TOP = 32            # from a row's top to its line
ROW_BOTTOM = 18         # from a row's line to its bottom, without rule lanes
LANE_FIRST = 33         # first rule-name baseline below the row line (under the terminal numbers)
LANE_STEP = 11
XREF_STEP = 13
RUNG_GAP = 8
CAPTION_HEIGHT = 16
SECTION_HEAD = 40
MIN_COLUMNS = 5
TARGET_WIDTH = 1480
MIN_COLUMN_WIDTH = 84
MAX_COLUMN_WIDTH = 124

# Font size by text class; written on every text element so that its box can be computed.
TEXT_SIZE = {
    "title": SIZE_TITLE, "sub": SIZE_SUB, "tag": SIZE_TAG, "letter": SIZE_TAG, "wire": SIZE_WIRE,
    "rungno": SIZE_RUNG, "xref": SIZE_XREF, "caption": SIZE_CAPTION, "railname": SIZE_RAIL,
    "supply": SIZE_SUB, "rule": SIZE_RULE, "legend": SIZE_SUB, "changelabel": SIZE_RULE,
    "termno": SIZE_TERMINAL,
}

INK = "#1b1f24"
WIRE_INK = "#1d5fa6"
MUTED = "#5c6670"
SEVERITY_COLOUR = {Severity.ERROR: "#c62828", Severity.WARNING: "#b26a00", Severity.INFO: "#1565c0"}
SEVERITY_TINT = {Severity.ERROR: "#fdecea", Severity.WARNING: "#fff4e0", Severity.INFO: "#e8f1fb"}

# Change marks (see ``Mark``): one colour for what left the drawing of the old
# revision, another for what arrived in the new one, both clear of the
# severity colours and told apart by line style and words as well as hue
# (dashed "gone from here", solid "new here"; reddish purple and bluish
# green stay distinct with the common colour-vision deficiencies).
CHANGE_COLOUR = {"removed": "#a8336f", "moved-from": "#a8336f", "added": "#00785a", "moved-to": "#00785a"}
CHANGE_TINT = {"removed": "#f9e8f1", "moved-from": "#f9e8f1", "added": "#e3f4ee", "moved-to": "#e3f4ee"}
CHANGE_DASH = {"removed": "6 3", "moved-from": "6 3", "added": "", "moved-to": ""}

# A safety relay's inputs, written in their box.
SAFETY_INPUT_TEXT = {"power": "PWR", "ch1": "CH1", "ch2": "CH2", "feedback": "FB"}
# A drive's or soft starter's command inputs: a box marked with the input and the kind (a drive's
# box carries a sine-wave tilde as IEC 60617 marks a converter, a soft starter's a ramp, our own sketch).
DRIVE_INPUT_TEXT = {"run": "RUN", "stop": "STP"}

# Resistive loads, drawn as a rectangle (heaters with a zigzag inside).
RESISTIVE_KINDS = ("space-heater", "panel-heater", "resistor")

# Letters for loads that are neither coils nor lamps (a circle with a letter).
LOAD_LETTER = {"solenoid": "S", "horn": "H", "plc-input": "I"}


# What a schematic's text may hold that must not reach the SVG as it is: characters
# XML does not allow (the drawing would not open), other control characters and
# bidirectional overrides (they would reorder or hide what is drawn). Shown
# escaped, as Python writes them (``\x1b``).
_UNSHOWN = re.compile("[\x00-\x1f\x7f-\x9f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069\ud800-\udfff\ufffe\uffff]")


def _visible(text: str) -> str:
    return _UNSHOWN.sub(lambda m: m.group().encode("unicode_escape", "backslashreplace").decode("ascii"), text)


def escape(text: str) -> str:
    """``text`` for an SVG element's content."""
    return _escape(_visible(text))


def quoteattr(text: str) -> str:
    """``text`` as a quoted SVG attribute value."""
    return _quoteattr(_visible(text))


def text_width(text: str, size: float) -> float:
    """Width in pixels of ``text`` set in the monospaced face at ``size``."""
    return len(text) * size * MONO_ADVANCE


def fit(text: str, size: float, width: float) -> str:
    """``text`` shortened with an ellipsis so that it fits ``width``."""
    if text_width(text, size) <= width:
        return text
    keep = max(1, int(width / (size * MONO_ADVANCE)) - 1)
    return text[:keep] + "\u2026"


def _n(value: float) -> str:
    """A coordinate as short, stable text."""
    text = f"{value:.1f}"
    return text[:-2] if text.endswith(".0") else text


# -- layout data -------------------------------------------------------------------

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
    operator: str = ""               # how a contact is worked: see OPERATORS
    positions: tuple[str, ...] = ()  # a selector's positions, for its position marks


@dataclass
class RowPath:
    """One path as drawn: its row and its oriented nodes and elements."""

    nodes: list[str]
    placed: list[Placed]
    row: int = 0


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


@dataclass
class Section:
    """Consecutive rungs on one supply, drawn between one pair of rails."""

    supply: Supply | None
    rungs: list[RungLayout]
    top: float = 0.0
    bottom: float = 0.0
    findings: list[Diagnostic] = field(default_factory=list)


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


# -- finding matching ----------------------------------------------------------------

def _key(loc: Location) -> tuple[str, int, int]:
    return (os.path.normpath(loc.path), loc.line, loc.column)


def match_findings(sch: Schematic, diagnostics: Iterable[Diagnostic]) -> tuple[dict[int, list[Diagnostic]], dict[str, list[Diagnostic]], list[Diagnostic]]:
    """Match findings to elements (by index) and supplies (by name).

    A finding at an element's position marks that element; at a device's tag
    or one of its fields (or a scenario step's tag), every rung element of
    that device; at a supply, that supply's rails. The rest are returned as
    unplaced.
    """
    by_element: dict[int, list[Diagnostic]] = {}
    by_supply: dict[str, list[Diagnostic]] = {}
    unplaced: list[Diagnostic] = []
    elements_of: dict[str, list[Element]] = {}
    targets: dict[tuple[str, int, int], list[tuple[str, object]]] = {}
    for el in sch.elements:
        elements_of.setdefault(el.tag, []).append(el)
        targets.setdefault(_key(el.loc), []).append(("element", el))
    for dev in sch.devices.values():
        for loc in [dev.loc, *dev.field_locs.values()]:
            targets.setdefault(_key(loc), []).append(("device", dev.tag))
    for sup in sch.supplies.values():
        for loc in [sup.loc, *sup.field_locs.values()]:
            targets.setdefault(_key(loc), []).append(("supply", sup.name))
    for scen in sch.expect:
        for step in scen.steps:
            for tag, loc in step.target_locs.items():
                if tag:
                    targets.setdefault(_key(loc), []).append(("device", tag))
    for d in sorted(set(diagnostics)):
        hits = targets.get((os.path.normpath(d.path), d.line, d.column), [])
        marked: list[Element] = []
        supplies: list[str] = []
        for what, obj in hits:
            if what == "element":
                marked.append(obj)  # type: ignore[arg-type]
            elif what == "device":
                # once on the drawing: the device's coil (where a contactor's power poles or a
                # device's rating are at fault), else its first element, never every contact
                drawn = elements_of.get(obj, [])  # type: ignore[arg-type]
                coils = [e for e in drawn if e.role == "load"]
                marked.extend(coils[:1] or drawn[:1])
            else:
                supplies.append(obj)  # type: ignore[arg-type]
        if not marked and not supplies:
            unplaced.append(d)
            continue
        seen: set[int] = set()
        for el in marked:
            if el.index not in seen:
                seen.add(el.index)
                by_element.setdefault(el.index, []).append(d)
        for name in supplies:
            by_supply.setdefault(name, []).append(d)
    return by_element, by_supply, unplaced


# -- coil cross-references -------------------------------------------------------------

@dataclass
class CoilUse:
    """Where a coil device's contacts are used, by rung number."""

    tag: str
    no: list[int]
    nc: list[int]
    other: dict[str, list[int]] = field(default_factory=dict)  # contacts of other names (an alternating relay's A, B)

    def text(self) -> str:
        parts = []
        if self.no:
            parts.append("NO " + ", ".join(map(str, self.no)))
        if self.nc:
            parts.append("NC " + ", ".join(map(str, self.nc)))
        for name, rungs in self.other.items():
            parts.append(f"{name} " + ", ".join(map(str, rungs)))
        return "  ".join(parts) if parts else "no contacts used"


def coil_uses(sch: Schematic) -> dict[str, CoilUse]:
    """For each device whose kind has a coil: rung numbers of its NO and NC contacts.

    A contact used twice in one rung is listed twice: each entry is one
    contact.
    """
    numbers = {r.index: r.number for r in sch.rungs}
    uses: dict[str, CoilUse] = {}
    for el in sch.elements:
        sense = contact_sense(el.part) if el.part not in ("fault-NO", "fault-NC") else None  # a drive's fault relay: listed apart
        if sense is not None:
            uses.setdefault(el.tag, CoilUse(el.tag, [], []))
            (uses[el.tag].no if sense == "NO" else uses[el.tag].nc).append(numbers[el.rung])
        elif el.role == "contact" and el.part is not None:
            uses.setdefault(el.tag, CoilUse(el.tag, [], [])).other.setdefault(el.part, []).append(numbers[el.rung])
    for use in uses.values():
        use.no.sort()
        use.nc.sort()
        use.other = {name: sorted(rungs) for name, rungs in sorted(use.other.items())}
    return uses


# -- rung layout ---------------------------------------------------------------------

def _rung_supply(sch: Schematic, rung: Rung, previous: Supply | None) -> Supply | None:
    for path in rung.paths:
        for wire in (path.wires[0], path.wires[-1], *path.wires):
            sup = sch.supply_of_rail(wire)
            if sup is not None:
                return sup
    return previous or next(iter(sch.supplies.values()), None)


class _Graph:
    """The rung as a directed graph drawn left to right."""

    def __init__(self) -> None:
        self.order: list[str] = []
        self.succ: dict[str, list[str]] = {}
        self.pred: dict[str, list[str]] = {}

    def node(self, n: str) -> None:
        if n not in self.succ:
            self.order.append(n)
            self.succ[n] = []
            self.pred[n] = []

    def reaches(self, start: str, goal: str) -> bool:
        seen = {start}
        stack = [start]
        while stack:
            n = stack.pop()
            if n == goal:
                return True
            for s in self.succ[n]:
                if s not in seen:
                    seen.add(s)
                    stack.append(s)
        return False

    def edge(self, a: str, b: str) -> None:
        self.succ[a].append(b)
        self.pred[b].append(a)

    def topological(self) -> list[str]:
        indeg = {n: len(self.pred[n]) for n in self.order}
        ready = [n for n in self.order if indeg[n] == 0]
        out: list[str] = []
        while ready:
            n = ready.pop(0)
            out.append(n)
            for s in self.succ[n]:
                indeg[s] -= 1
                if indeg[s] == 0:
                    ready.append(s)
        return out

    def longest_from_left(self) -> dict[str, int]:
        col: dict[str, int] = {}
        for n in self.topological():
            col[n] = max((col[p] + 1 for p in self.pred[n]), default=0)
        return col


@dataclass
class _Chain:
    """One path of the rung, in file order, with each node's graph name."""

    nodes: list[str]
    elements: list[Element]
    edges: list[tuple[str, str]]   # per element: the graph edge, left to right


def _plan_rung(sch: Schematic, rung: Rung, supply: Supply | None) -> tuple[RungLayout, _Graph, list[_Chain], set[str], dict[str, int]]:
    hot = supply.hot if supply else None
    common = supply.common if supply else None
    g = _Graph()
    wire_of: dict[str, str] = {}
    chains: list[_Chain] = []
    for pi, path in enumerate(rung.paths):
        wires = list(path.wires)
        elements = list(path.elements)
        first, last = wires[0], wires[-1]
        if last == hot or first == common or (
            first != hot and last != common and first in g.succ and last in g.succ
            and g.reaches(last, first) and not g.reaches(first, last)
        ):
            wires.reverse()
            elements.reverse()
        # An element joining a wire to itself ends on a second node, drawn as a
        # terminal carrying the same wire number.
        nodes: list[str] = []
        for j, w in enumerate(wires):
            n = f"{w}\u0000{pi}.{j}" if j and w == wires[j - 1] else w
            g.node(n)
            wire_of[n] = w
            nodes.append(n)
        edges = []
        for j in range(len(elements)):
            a, b = nodes[j], nodes[j + 1]
            if b == hot or a == common or (a != hot and b != common and g.reaches(b, a)):
                a, b = b, a
            g.edge(a, b)
            edges.append((a, b))
        chains.append(_Chain(nodes, elements, edges))
    col = g.longest_from_left()
    # A load's right terminal, and every node after it, packs to the right.
    right_side: set[str] = set()
    stack = [e[1] for ch in chains for el, e in zip(ch.elements, ch.edges) if el.role == "load"]
    while stack:
        n = stack.pop()
        if n not in right_side:
            right_side.add(n)
            stack.extend(g.succ[n])
    lay = RungLayout(rung, supply, hot, common, [], col, wire_of)
    return lay, g, chains, right_side, col


def _finish_columns(lay: RungLayout, g: _Graph, chains: list[_Chain], right_side: set[str], asap: dict[str, int], last: int) -> None:
    """Fix each node's column now that the drawing's width in columns is known,
    and cut each path into runs that go left to right, one row segment each."""
    alap: dict[str, int] = {}
    for n in reversed(g.topological()):
        if n in right_side:
            alap[n] = min((alap[s] - 1 for s in g.succ[n] if s in alap), default=last)
    column = {n: (alap[n] if n in right_side else asap[n]) for n in g.order}
    if lay.hot in column:
        column[lay.hot] = 0
    if lay.common in column:
        column[lay.common] = last
    lay.column = column
    for ch in chains:
        segments: list[tuple[list[str], list[Element]]] = []
        nodes, els = [ch.nodes[0]], []
        direction = 0
        for j, el in enumerate(ch.elements):
            a, b = ch.nodes[j], ch.nodes[j + 1]
            step = 1 if column[b] > column[a] else -1
            if direction and step != direction:
                segments.append((nodes, els))
                nodes, els = [a], []
            direction = step
            nodes.append(b)
            els.append(el)
        segments.append((nodes, els))
        for nodes, els in segments:
            if column[nodes[-1]] < column[nodes[0]]:
                nodes, els = nodes[::-1], els[::-1]
            placed = []
            for j, el in enumerate(els):
                u, v = nodes[j], nodes[j + 1]
                slot = column[v] - 1 if (el.role == "load" or u in right_side) else column[u]
                placed.append(Placed(el, 0, u, v, slot))
            lay.paths.append(RowPath(nodes, placed))


def _assign_rows(lay: RungLayout) -> None:
    """The first path on row 0; each further path on the first row where it fits cleanly.

    "Cleanly": it overlaps nothing on that row, touches a neighbour only at
    a shared wire, and its vertical connectors cross no row in between (nor
    does its line cross another path's connector). Several orders of the
    further paths are tried (file order, narrowest first, leftmost first) and
    the one with the fewest crossings, then the fewest rows, is kept.
    """
    if len(lay.paths) <= 1:
        for rp in lay.paths:
            rp.row = 0
            for p in rp.placed:
                p.row = 0
        lay.rows = 1
        return
    col = lay.column
    rest = list(range(1, len(lay.paths)))
    span = {i: (col[lay.paths[i].nodes[0]], col[lay.paths[i].nodes[-1]]) for i in range(len(lay.paths))}
    orders = [rest,
              sorted(rest, key=lambda i: (span[i][1] - span[i][0], i)),
              sorted(rest, key=lambda i: (span[i][0], span[i][1], i))]
    best: tuple[tuple[int, int], dict[int, int]] | None = None
    for order in orders:
        rows = _rows_in_order(lay, [0] + order)
        score = (_crossings(lay, rows), max(rows.values()) + 1)
        if best is None or score < best[0]:
            best = (score, rows)
    assert best is not None
    rows = best[1]
    for i, rp in enumerate(lay.paths):
        rp.row = rows[i]
        for p in rp.placed:
            p.row = rows[i]
    lay.rows = max(rows.values()) + 1


def _bits_between(lo: int, hi: int) -> int:
    """Rows strictly between ``lo`` and ``hi``, as a bit mask."""
    return ((1 << hi) - 1) & ~((1 << (lo + 1)) - 1) if hi - lo >= 2 else 0


class _Ends:
    """Per column: the rows where an interval ends there, and at which node, as bit masks."""

    def __init__(self) -> None:
        self.any: dict[int, int] = {}
        self.node: dict[tuple[int, str], int] = {}
        self.multi: dict[int, int] = {}

    def add(self, c: int, node: str, bit: int) -> None:
        anyc = self.any.get(c, 0)
        own = self.node.get((c, node), 0)
        if anyc & bit and not own & bit:
            self.multi[c] = self.multi.get(c, 0) | bit
        self.any[c] = anyc | bit
        self.node[(c, node)] = own | bit

    def other(self, c: int, node: str) -> int:
        """Rows with an interval ending at column ``c`` at a node other than ``node``."""
        own = self.node.get((c, node), 0)
        return (self.any.get(c, 0) & ~own) | (self.multi.get(c, 0) & own)


def _rows_in_order(lay: RungLayout, order: list[int]) -> dict[int, int]:
    """Each path's row, the paths placed in ``order``, each on the first row where it fits.

    Where a path fits on row r (r up to one past the last row; when none
    fits, that new row):

    1. it overlaps no interval on row r and touches one only at the same wire;
    2. for each of its end wires (not a rail) already on other rows, no
       interval strictly between r and those rows covers the wire's column
       without ending at that wire (its connector would cross a line);
    3. no wire (not a rail, not one of its ends) whose column it spans has a
       connector across row r (rows above and below).

    What each row holds is kept as bit masks over rows (per column, per
    wire), so that finding the first row is a few mask operations, not a
    scan of every row and every wire: near linear in the paths even when
    a thousand parallel branches each need a row of their own.
    """
    col = lay.column
    rails = {lay.hot, lay.common}
    count = 0                           # rows so far
    interior: dict[int, int] = {}       # doubled column strictly inside an interval of non-zero length -> rows
    points: dict[int, int] = {}         # doubled column of a zero-length interval -> rows
    inside: dict[int, int] = {}         # column strictly inside an interval -> rows
    zero: dict[int, list[tuple[int, str, str]]] = {}   # column -> zero-length intervals (bit, left node, right node)
    starts, finishes, ends = _Ends(), _Ends(), _Ends()  # ends: both ends of intervals of non-zero length
    low: dict[str, int] = {}            # node -> its lowest and highest row so far
    high: dict[str, int] = {}
    span: dict[str, int] = {}           # node (not a rail) -> rows strictly between its lowest and highest
    colspan: dict[int, int] = {}        # column -> union of span of its nodes
    spanners: dict[int, list[str]] = {}  # column -> nodes with a span

    def crossing(w: str) -> int:
        """Rows where a connector down or up to node ``w`` would cross a line (condition 2)."""
        if w in rails or w not in low:
            return 0
        c = col[w]
        b = inside.get(c, 0) | ends.other(c, w)
        for bit, wa, wb in zero.get(c, ()):
            if w not in (wa, wb):
                b |= bit
        if not b:
            return 0
        m, big_m = low[w], high[w]
        blocked = 0
        below = b & ((1 << big_m) - 1)
        if below:  # r <= m: a row of b strictly between r and M
            top = min(m, below.bit_length() - 2)
            if top >= 0:
                blocked |= (1 << (top + 1)) - 1
        between = _bits_between(m, big_m)
        inner = b & between
        if inner:  # m < r < M: a row of b in (m, M) other than r
            blocked |= between if inner & (inner - 1) else between & ~inner
        above = (b >> (m + 1)) << (m + 1)
        if above:  # r >= M: a row of b strictly between m and r
            first = max(big_m, (above & -above).bit_length())
            blocked |= ((1 << (count + 1)) - 1) & ~((1 << first) - 1)
        return blocked

    rows: dict[int, int] = {}
    for i in order:
        rp = lay.paths[i]
        wlo, whi = rp.nodes[0], rp.nodes[-1]
        lo, hi = col[wlo], col[whi]
        if i == 0:
            row = 0
        else:
            blocked = 0
            if lo < hi:
                for p in range(2 * lo + 1, 2 * hi):
                    blocked |= interior.get(p, 0) | points.get(p, 0)
            else:
                blocked |= interior.get(2 * lo, 0)
            blocked |= starts.other(hi, whi) | finishes.other(lo, wlo)
            blocked |= crossing(wlo) | crossing(whi)
            for c in range(lo, hi + 1):
                if c in (lo, hi):
                    for x in spanners.get(c, ()):
                        if x not in (wlo, whi):
                            blocked |= span[x]
                else:
                    blocked |= colspan.get(c, 0)
            free = ~blocked & ((1 << (count + 1)) - 1)
            row = (free & -free).bit_length() - 1 if free else count
        bit = 1 << row
        count = max(count, row + 1)
        if lo < hi:
            for p in range(2 * lo + 1, 2 * hi):
                interior[p] = interior.get(p, 0) | bit
            for c in range(lo + 1, hi):
                inside[c] = inside.get(c, 0) | bit
            ends.add(lo, wlo, bit)
            ends.add(hi, whi, bit)
        else:
            points[2 * lo] = points.get(2 * lo, 0) | bit
            zero.setdefault(lo, []).append((bit, wlo, whi))
        starts.add(lo, wlo, bit)
        finishes.add(hi, whi, bit)
        rows[i] = row
        for n in rp.nodes:
            if n not in low:
                low[n] = high[n] = row
            else:
                low[n], high[n] = min(low[n], row), max(high[n], row)
            if n in rails:
                continue
            mask = _bits_between(low[n], high[n])
            if mask and mask != span.get(n, 0):
                c = col[n]
                if n not in span:
                    spanners.setdefault(c, []).append(n)
                span[n] = mask
                colspan[c] = colspan.get(c, 0) | mask
    return rows


def _crossings(lay: RungLayout, rows: dict[int, int]) -> int:
    """Vertical connectors that cross another path's line without joining it."""
    col = lay.column
    rails = {lay.hot, lay.common}
    wire_rows: dict[str, set[int]] = {}
    on_row: dict[int, list[int]] = {}
    for i, rp in enumerate(lay.paths):
        on_row.setdefault(rows[i], []).append(i)
        for n in rp.nodes:
            wire_rows.setdefault(n, set()).add(rows[i])
    node_sets = [set(rp.nodes) for rp in lay.paths]
    count = 0
    for w, rs in wire_rows.items():
        if w in rails or len(rs) < 2:
            continue
        top, bottom = min(rs), max(rs)
        c = col[w]
        for row in range(top + 1, bottom):
            for i in on_row.get(row, ()):
                rp = lay.paths[i]
                if w not in node_sets[i] and col[rp.nodes[0]] <= c <= col[rp.nodes[-1]]:
                    count += 1
    return count


# -- the drawing -------------------------------------------------------------------

class _Svg:
    """Collects SVG text in order."""

    def __init__(self) -> None:
        self.parts: list[str] = []

    def add(self, text: str) -> None:
        self.parts.append(text)

    def line(self, x1: float, y1: float, x2: float, y2: float, cls: str = "w") -> None:
        self.add(f'<line class="{cls}" x1="{_n(x1)}" y1="{_n(y1)}" x2="{_n(x2)}" y2="{_n(y2)}"/>')

    def text(self, x: float, y: float, text: str, cls: str, anchor: str = "start", extra: str = "") -> None:
        a = "" if anchor == "start" else f' text-anchor="{anchor}"'
        size = TEXT_SIZE[cls.split()[0]]
        self.add(f'<text class="{cls}" x="{_n(x)}" y="{_n(y)}" font-size="{size}"{a}{extra}>{escape(text)}</text>')


def _css(prefix: str, marks: bool = False) -> str:
    p = f"#{prefix}drawing " if prefix else ""
    rules = [
        f"{p}.w{{stroke:{INK};stroke-width:1.6;fill:none;stroke-linecap:round}}",
        f"{p}.rail{{stroke:{INK};stroke-width:3;fill:none}}",
        f"{p}.sym{{stroke:{INK};stroke-width:1.8;fill:none;stroke-linecap:round}}",
        f"{p}.symfill{{fill:#ffffff;stroke:{INK};stroke-width:1.8}}",
        f"{p}.symdot{{fill:{INK};stroke:{INK};stroke-width:1}}",
        f"{p}.op{{stroke:{INK};stroke-width:1.2;stroke-dasharray:2 1.5}}",
        f"{p}.dot{{fill:{INK}}}",
        f"{p}.term{{fill:#ffffff;stroke:{INK};stroke-width:1.4}}",
        f"{p}text{{font-family:{MONO};white-space:pre}}",
        f"{p}.tag{{fill:{INK};font-weight:bold}}",
        f"{p}.letter{{fill:{INK};font-weight:bold}}",
        f"{p}.wire{{fill:{WIRE_INK}}}",
        f"{p}.rungno{{fill:{INK};font-weight:bold}}",
        f"{p}.xref{{fill:{MUTED}}}",
        f"{p}.termno{{fill:{MUTED}}}",
        f"{p}.caption{{fill:{MUTED};font-style:italic}}",
        f"{p}.railname{{fill:{INK};font-weight:bold}}",
        f"{p}.supply{{fill:{MUTED}}}",
        f"{p}.title{{font-family:{SANS};fill:{INK};font-weight:bold}}",
        f"{p}.sub{{fill:{MUTED}}}",
        f"{p}.rule{{}}",
        f"{p}.legend{{fill:{INK}}}",
        f"{p}.band{{fill:#f6f8fa}}",
        f"{p}.xrefline{{stroke:#c9d1d9;stroke-width:1;stroke-dasharray:2 3}}",
    ]
    for sev, colour in SEVERITY_COLOUR.items():
        rules.append(f"{p}.sev-{sev}{{fill:{colour}}}")
        rules.append(f"{p}.mark-{sev}{{stroke:{colour};stroke-width:2;fill:{SEVERITY_TINT[sev]};fill-opacity:0.85}}")
    rules.append(f"{p}.el:target .outline,{p}.el.focus .outline{{stroke-width:4}}")
    if marks:
        for change, colour in CHANGE_COLOUR.items():
            dash = f";stroke-dasharray:{CHANGE_DASH[change]}" if CHANGE_DASH[change] else ""
            rules.append(f"{p}.chg-{change}{{stroke:{colour};stroke-width:2.4;fill:{CHANGE_TINT[change]};fill-opacity:0.9{dash}}}")
            rules.append(f"{p}.changelabel.chg-{change}{{fill:{colour};stroke:none;font-weight:bold}}")
        rules.append(f"{p}.chgbadge{{stroke:#ffffff;stroke-width:1.6;stroke-linecap:round;fill:none}}")
    return "".join(rules)


# How a contact is worked, drawn as a small operator above the contact and
# joined to it by a dashed stem, as the trade's symbol standards draw
# mechanical linkage (IEC 60617 and ANSI Y32.2 alike draw the actuator over
# the contact; these glyphs are ctllint's own drawing of those ideas).
OPERATORS = {
    "pushbutton": "push",                  # a plunger: a bar on a stem
    "pushbutton-maintained": "push-latch",  # a plunger with a detent
    "emergency-stop": "mushroom",           # a mushroom head, latching
    "limit-switch": "cam",                  # a roller on a lever
    "float-switch": "float",                # a float ball
    "pressure-switch": "pressure",          # a diaphragm
    "temperature-switch": "thermal",        # a bulb and capillary
    "flow-switch": "flow",                  # a paddle (flag)
    "foot-switch": "pedal",                 # a pedal
    "selector": "selector",                 # a knob with its position marks
    "overload": "overload",                 # a thermal element (square wave)
    "timer-on": "delay-on",                 # the delay arc opening up: moves late on energizing
    "timer-off": "delay-off",               # the delay arc opening down: moves late on de-energizing
}


def operator_of(dev, part: str | None) -> str:
    """The operator a contact of ``dev`` is drawn with ("" for none: relay and contactor contacts)."""
    kind = dev.kind
    if kind == "pushbutton":
        if dev.get("function") == "emergency-stop":
            return OPERATORS["emergency-stop"]
        return OPERATORS["pushbutton-maintained" if dev.get("action") == "maintained" else "pushbutton"]
    if kind == "timer":
        return "" if part in INSTANT_PARTS else OPERATORS["timer-off" if dev.get("delay") == "off" else "timer-on"]
    return OPERATORS.get(kind, "")


def _operator(svg: _Svg, p: Placed) -> None:
    """The operator of a contact, in the band between the contact's bars and
    its tag label (from 11 to 16 above the row line)."""
    op, cx, y = p.operator, p.cx, p.y
    if op in ("delay-on", "delay-off"):  # the delay arc on the bars' tops, no stem
        bow = -9 if op == "delay-on" else -15
        svg.add(f'<path class="sym" d="M{_n(cx - 7)} {_n(y - 12)} Q{_n(cx)} {_n(y + bow)} {_n(cx + 7)} {_n(y - 12)}"/>')
        return
    top = y - 12
    svg.add(f'<line class="op" x1="{_n(cx)}" y1="{_n(y - 4)}" x2="{_n(cx)}" y2="{_n(top)}"/>')
    if op in ("push", "push-latch"):
        svg.line(cx - 5, top, cx + 5, top, "sym")
        if op == "push-latch":  # a detent: the button stays where it is put
            svg.line(cx - 5, top, cx - 5, top + 2.5, "sym")
            svg.line(cx + 5, top, cx + 5, top + 2.5, "sym")
    elif op == "mushroom":
        svg.add(f'<path class="symdot" d="M{_n(cx - 6)} {_n(top)} A6 4 0 0 1 {_n(cx + 6)} {_n(top)} Z"/>')
    elif op == "cam":
        svg.line(cx, top, cx + 5, top - 2, "sym")
        svg.add(f'<circle class="symfill" cx="{_n(cx + 6.5)}" cy="{_n(top - 2.3)}" r="1.6"/>')
    elif op == "float":
        svg.add(f'<circle class="symfill" cx="{_n(cx)}" cy="{_n(top - 2)}" r="2.2"/>')
    elif op == "pressure":
        svg.add(f'<path class="sym" d="M{_n(cx - 5)} {_n(top)} L{_n(cx + 5)} {_n(top)} A5 3.5 0 0 0 {_n(cx - 5)} {_n(top)}"/>')
    elif op == "thermal":
        svg.add(f'<path class="sym" d="M{_n(cx - 5)} {_n(top)} Q{_n(cx - 2.5)} {_n(top - 5)} {_n(cx)} {_n(top)} Q{_n(cx + 2.5)} {_n(top + 5)} {_n(cx + 5)} {_n(top)}"/>')
    elif op == "flow":
        svg.add(f'<path class="sym" d="M{_n(cx)} {_n(top)} L{_n(cx)} {_n(top - 4)} L{_n(cx + 5)} {_n(top - 3)} L{_n(cx)} {_n(top - 2)}"/>')
    elif op == "pedal":
        svg.line(cx - 5, top + 1, cx + 5, top - 2, "sym")
    elif op == "overload":
        pts = " ".join(f"{_n(cx + dx)},{_n(top + dy)}" for dx, dy in ((-6, 0), (-6, -3), (-2, -3), (-2, 0), (2, 0), (2, -3), (6, -3), (6, 0)))
        svg.add(f'<polyline class="sym" points="{pts}"/>')
    elif op == "selector":  # a knob: one mark per position, filled where the contact is closed
        n = len(p.positions) or 1
        for k, name in enumerate(p.positions or ("",)):
            mx = cx + (k - (n - 1) / 2) * 4.5
            svg.add(f'<circle class="{"symdot" if name in p.closed_in else "symfill"}" cx="{_n(mx)}" cy="{_n(top - 1.5)}" r="1.4"/>')


def _symbol(svg: _Svg, p: Placed, kind: str) -> None:
    """Draw the element's symbol centred at (cx, y), leads to cx +- SYMBOL_HALF."""
    cx, y, h = p.cx, p.y, SYMBOL_HALF
    role = p.element.role
    part = p.element.part
    if role == "contact":
        svg.line(cx - h, y, cx - 5, y, "sym")
        svg.line(cx + 5, y, cx + h, y, "sym")
        svg.line(cx - 5, y - 10, cx - 5, y + 10, "sym")
        svg.line(cx + 5, y - 10, cx + 5, y + 10, "sym")
        if contact_sense(part) == "NC":
            svg.line(cx - 11, y + 10, cx + 11, y - 10, "sym")
        if p.operator:
            _operator(svg, p)
    elif role == "load" and kind in RESISTIVE_KINDS:
        # a resistor: a rectangle on the wire (IEC 60617 style); a heater: the same with a heating zigzag inside
        svg.line(cx - h, y, cx - 12, y, "sym")
        svg.line(cx + 12, y, cx + h, y, "sym")
        svg.add(f'<rect class="symfill" x="{_n(cx - 12)}" y="{_n(y - 6)}" width="24" height="12"/>')
        if kind != "resistor":
            pts = " ".join(f"{_n(cx - 9 + 3 * k)},{_n(y + (3 if k % 2 else -3))}" for k in range(7))
            svg.add(f'<polyline class="sym" points="{pts}"/>')
    elif role == "load":
        svg.line(cx - h, y, cx - 11, y, "sym")
        svg.line(cx + 11, y, cx + h, y, "sym")
        svg.add(f'<circle class="symfill" cx="{_n(cx)}" cy="{_n(y)}" r="11"/>')
        if kind == "pilot-light":
            d = 7.8
            svg.line(cx - d, y - d, cx + d, y + d, "sym")
            svg.line(cx - d, y + d, cx + d, y - d, "sym")
        elif kind == "safety-relay":  # a safety relay's inputs: a box named after the input
            svg.add(f'<rect class="symfill" x="{_n(cx - 12)}" y="{_n(y - 12)}" width="24" height="24"/>')
            svg.text(cx, y + 3, SAFETY_INPUT_TEXT.get(part or "", "?"), "termno", "middle")
        elif kind in ("drive", "soft-starter") and part in DRIVE_INPUT_TEXT:
            svg.add(f'<rect class="symfill" x="{_n(cx - 12)}" y="{_n(y - 12)}" width="24" height="24"/>')
            svg.text(cx, y + 9, DRIVE_INPUT_TEXT[part], "termno", "middle")
            if kind == "drive":
                svg.add(f'<path class="sym" d="M{_n(cx - 7)} {_n(y - 4)} q3.5 -5 7 0 t7 0"/>')
            else:
                svg.line(cx - 7, y - 2, cx + 7, y - 8, "sym")
        elif part in ("set", "reset") and kind == "latching-relay":  # a latching relay's two coils: S and R
            svg.text(cx, y + 4, "S" if part == "set" else "R", "letter", "middle")
        elif part != "coil":
            letter = LOAD_LETTER.get(kind, (kind[:1] or "?").upper())
            svg.text(cx, y + 4, letter, "letter", "middle")
        elif kind == "timer":  # a timer coil: a clock hand inside the circle
            svg.line(cx, y, cx, y - 7, "sym")
            svg.line(cx, y, cx + 5, y, "sym")
    elif role == "conductor" and kind in ("breaker", "motor-breaker"):
        svg.line(cx - h, y, cx - 11, y, "sym")
        svg.line(cx + 11, y, cx + h, y, "sym")
        svg.add(f'<circle class="symfill" cx="{_n(cx - 9)}" cy="{_n(y)}" r="2.2"/>')
        svg.add(f'<circle class="symfill" cx="{_n(cx + 9)}" cy="{_n(y)}" r="2.2"/>')
        svg.add(f'<path class="sym" d="M{_n(cx - 10)} {_n(y - 4)} Q{_n(cx)} {_n(y - 16)} {_n(cx + 10)} {_n(y - 4)}"/>')
        if kind == "motor-breaker":  # its overload release: a small thermal bend under the arc (our own sketch)
            svg.add(f'<path class="sym" d="M{_n(cx - 5)} {_n(y + 6)} h4 v-4 h2 v4 h4"/>')
    elif role == "conductor":  # fuse: a small rectangle with the wire through it
        svg.line(cx - h, y, cx + h, y, "sym")
        svg.add(f'<rect class="sym" x="{_n(cx - 11)}" y="{_n(y - 5)}" width="22" height="10"/>')
    elif role == "output":  # a PLC output: a contact in a box
        svg.line(cx - h, y, cx - 11, y, "sym")
        svg.line(cx + 11, y, cx + h, y, "sym")
        svg.add(f'<rect class="sym" x="{_n(cx - 11)}" y="{_n(y - 11)}" width="22" height="22" rx="2"/>')
        svg.line(cx - 11, y, cx - 4, y, "sym")
        svg.line(cx + 4, y, cx + 11, y, "sym")
        svg.line(cx - 4, y - 6, cx - 4, y + 6, "sym")
        svg.line(cx + 4, y - 6, cx + 4, y + 6, "sym")
    else:  # unknown device or part: a dashed box with a question mark
        svg.line(cx - h, y, cx - 11, y, "sym")
        svg.line(cx + 11, y, cx + h, y, "sym")
        svg.add(f'<rect class="sym" x="{_n(cx - 11)}" y="{_n(y - 9)}" width="22" height="18" stroke-dasharray="3 2"/>')
        svg.text(cx, y + 4, "?", "letter", "middle")


def _change_outline(svg: _Svg, p: Placed, half: float, grow: float) -> None:
    """The outline of a changed element, with a badge at its top right corner:
    a minus for what left (removed, moved away), a plus for what arrived."""
    cx, y = p.cx, p.y
    change = p.mark.change if p.mark else ""
    svg.add(f'<rect class="change chg-{change}" x="{_n(cx - half)}" y="{_n(y - 29 - grow)}" width="{_n(2 * half)}" height="{_n(OUTLINE_HEIGHT + 2 * grow)}" rx="5"/>')
    bx, by = cx + half, y - 29 - grow
    svg.add(f'<circle cx="{_n(bx)}" cy="{_n(by)}" r="5.5" fill="{CHANGE_COLOUR.get(change, INK)}"/>')
    svg.line(bx - 3, by, bx + 3, by, "chgbadge")
    if change in ("added", "moved-to"):
        svg.line(bx, by - 3, bx, by + 3, "chgbadge")


def _outline_half(p: Placed, col_w: float) -> float:
    """Half the width of the outline a marked element gets (0 when it has no findings)."""
    if not p.findings and p.mark is None:
        return SYMBOL_HALF
    label = fit(_element_label(p.element), SIZE_TAG, col_w - 8)
    return max(SYMBOL_HALF + 6, text_width(label, SIZE_TAG) / 2 + 5)


def _element_label(el: Element) -> str:
    if el.part in (None, "NO", "NC", "coil"):
        return el.tag
    return el.text


@dataclass
class _Lane:
    x0: float
    x1: float
    text: str
    diag: Diagnostic | None        # None for a change mark's label
    placed: Placed
    lane: int = 0


def _place_rule_labels(labels: list[_Lane], obstacles: list[float], x_min: float, x_max: float) -> int:
    """Give each rule label a lane (0, 1, ...) so that no two overlap; return the lane count."""
    lanes: list[list[tuple[float, float]]] = []
    for lab in labels:
        width = lab.x1 - lab.x0
        centre = lab.placed.cx
        # Keep clear of vertical connectors going down from the row, when the label fits between them.
        left = max([x for x in obstacles if x < centre] + [x_min - 4]) + 4
        right = min([x for x in obstacles if x > centre] + [x_max + 4]) - 4
        x0 = centre - width / 2
        if width <= right - left:
            x0 = min(max(x0, left), right - width)
        else:
            x0 = min(max(x0, x_min), x_max - width)
        lab.x0, lab.x1 = x0, x0 + width
        for i, taken in enumerate(lanes):
            if all(lab.x1 + 6 <= a or b + 6 <= lab.x0 for a, b in taken):
                taken.append((lab.x0, lab.x1))
                lab.lane = i
                break
        else:
            lanes.append([(lab.x0, lab.x1)])
            lab.lane = len(lanes) - 1
    return len(lanes)


def _wrap(text: str, size: float, width: float) -> list[str]:
    """Break ``text`` at spaces into lines no wider than ``width``."""
    per_line = max(8, int(width / (size * MONO_ADVANCE)))
    lines: list[str] = []
    current = ""
    for word in text.split(" "):
        while len(word) > per_line:
            if current:
                lines.append(current)
                current = ""
            lines.append(word[:per_line])
            word = word[per_line:]
        candidate = f"{current} {word}" if current else word
        if len(candidate) <= per_line:
            current = candidate
        else:
            lines.append(current)
            current = word
    if current or not lines:
        lines.append(current)
    return lines


def _xref_lines(uses: list[CoilUse], width: float) -> list[tuple[str, str]]:
    """The margin text for the coils of one row, as (coil tag, line) pairs.

    One line per coil when it fits (``NO 2, 5  NC 7``), else NO and NC on
    lines of their own, wrapped after a comma. Where a row holds more than
    one coil, each coil's lines start with its tag.
    """
    out: list[tuple[str, str]] = []
    for use in uses:
        prefix = f"{use.tag}: " if len(uses) > 1 else ""
        one = prefix + use.text()
        if text_width(one, SIZE_XREF) <= width:
            out.append((use.tag, one))
            continue
        pad = " " * len(prefix)
        first = True
        for name, numbers in (("NO", use.no), ("NC", use.nc), *use.other.items()):
            if not numbers:
                continue
            text = f"{name} " + ", ".join(map(str, numbers))
            for k, line in enumerate(_wrap(text, SIZE_XREF, width - text_width(prefix + "   ", SIZE_XREF))):
                out.append((use.tag, (prefix if first else pad) + ("   " if k else "") + line))
                first = False
    return out


def layout(sch: Schematic, diagnostics: Iterable[Diagnostic] = (), id_prefix: str = "", legend: bool = True,
           finding_links: dict[Diagnostic, str] | None = None, header: bool = True,
           rungs: Iterable[int] | None = None, marks: dict[int, Mark] | None = None,
           min_columns: int = MIN_COLUMNS, kind_registry=None) -> Drawing:
    """Lay out and draw ``sch``: see ``_layout``; one unit of the command's time budget (``ctllint.reading.budget``)."""
    with work(f"the drawing of {sch.path}"):
        return _layout(sch, diagnostics, id_prefix, legend, finding_links, header, rungs, marks, min_columns, kind_registry)


def _layout(sch: Schematic, diagnostics: Iterable[Diagnostic] = (), id_prefix: str = "", legend: bool = True,
            finding_links: dict[Diagnostic, str] | None = None, header: bool = True,
            rungs: Iterable[int] | None = None, marks: dict[int, Mark] | None = None,
            min_columns: int = MIN_COLUMNS, kind_registry=None) -> Drawing:
    """Lay out and draw ``sch`` with ``diagnostics`` marked on their elements.

    ``id_prefix`` starts every id in the SVG, so that several drawings can
    share one HTML page. ``legend`` adds the list of findings (and the
    safety note) under the drawing, for a drawing that stands alone.
    ``finding_links`` maps findings to ids elsewhere on the page: the rule
    names drawn for them become links there. ``header`` writes the title,
    path and finding counts above the drawing.

    ``rungs`` draws only the rungs at these 0-based indices (in file order),
    each keeping its number, its supply and its cross-references to the
    whole schematic; the default is every rung. ``marks`` maps
    ``Element.index`` to a ``Mark``: an outline in the change's colour and
    style with a +/- badge, and its label under the element (as for a
    review of changes). ``min_columns`` widens the drawing to at least that
    many columns, so that two drawings can be laid out on the same grid
    (``Drawing.columns`` tells how many a drawing used). ``kind_registry``
    (a ``KindRegistry``, default the built-in kinds) numbers the terminals
    of plugins' kinds too.
    """
    links = finding_links or {}
    marks = marks or {}
    diagnostics = sorted(set(diagnostics))
    by_element, by_supply, unplaced = match_findings(sch, diagnostics)
    uses = coil_uses(sch)
    pre = id_prefix

    # Sections and rung plans. A rung's supply may come from the rung before
    # it, so every rung's is worked out even when only some are drawn.
    drawn = None if rungs is None else set(rungs)
    plans = []
    previous: Supply | None = None
    for rung in sch.rungs:
        sup = _rung_supply(sch, rung, previous)
        previous = sup
        if drawn is None or rung.index in drawn:
            plans.append(_plan_rung(sch, rung, sup))
    widest = max([MIN_COLUMNS, min_columns] + [max(plan[-1].values(), default=0) for plan in plans])
    last = widest
    layouts: list[RungLayout] = []
    for lay, g, chains, right_side, asap in plans:
        _finish_columns(lay, g, chains, right_side, asap, last)
        _assign_rows(lay)
        layouts.append(lay)

    # Horizontal measures. The column width leaves room for the widest element label.
    col_w = (TARGET_WIDTH - LEFT_MARGIN - XREF_WIDTH - RIGHT_PAD) / last
    col_w = max(MIN_COLUMN_WIDTH, min(MAX_COLUMN_WIDTH, col_w))
    # The shortest run of a wire is half a column less half a symbol (a branch
    # leaving a connector), less the inset where a wire ends off the rails:
    # widen the columns until the longest wire number fits there.
    longest = max([text_width(w, SIZE_WIRE) for lay in layouts for w in lay.wire_of.values()] + [0])
    longest_inset = max([text_width(lay.wire_of[n], SIZE_WIRE) for lay in layouts for n, c in lay.column.items()
                         if c in (0, last) and n not in (lay.hot, lay.common)] + [-TERMINAL_INSET])
    col_w = max(col_w, 2 * (SYMBOL_HALF + 3 + longest), 2 * (SYMBOL_HALF + 3 + TERMINAL_INSET + longest_inset))
    rail_l = LEFT_MARGIN
    rail_r = rail_l + last * col_w
    width = rail_r + XREF_WIDTH + RIGHT_PAD

    def node_x(lay: RungLayout, node: str) -> float:
        c = lay.column[node]
        x = rail_l + c * col_w
        if c == 0 and node != lay.hot:
            x += TERMINAL_INSET
        if c == last and node != lay.common:
            x -= TERMINAL_INSET
        return x

    kinds = {tag: dev.kind for tag, dev in sch.devices.items()}
    terminal_marks = assign_terminals(sch, kind_registry)
    element_ids: dict[int, str] = {}
    anchors: dict[Diagnostic, str] = {}
    for lay in layouts:
        for rp in lay.paths:
            for p in rp.placed:
                p.kind = kinds.get(p.element.tag, "")
                p.cx = rail_l + (p.slot + 0.5) * col_w
                p.anchor = f"{pre}el-{p.element.index}"
                p.findings = by_element.get(p.element.index, [])
                p.mark = marks.get(p.element.index)
                p.terminals = terminal_marks.get(p.element.index)
                dev = sch.devices.get(p.element.tag)
                if p.kind == "selector" and dev is not None:
                    p.closed_in = selector_parts(dev).get(p.element.part or "", ())
                    p.positions = tuple(str(x) for x in dev.get("positions") or ())
                if p.element.role == "contact" and dev is not None:
                    p.operator = operator_of(dev, p.element.part)
                element_ids[p.element.index] = p.anchor
                for d in p.findings:
                    anchors.setdefault(d, p.anchor)

    # The paths of each row (in path order), and the coils per row for the cross-reference margin.
    by_row: dict[int, dict[int, list[RowPath]]] = {}
    for lay in layouts:
        rows_of_lay: dict[int, list[RowPath]] = {}
        for rp in lay.paths:
            rows_of_lay.setdefault(rp.row, []).append(rp)
        by_row[id(lay)] = rows_of_lay

    def row_coils(lay: RungLayout, row: int) -> list[CoilUse]:
        out = []
        for rp in by_row[id(lay)].get(row, ()):
            for p in rp.placed:
                if p.element.part == "coil" or (p.element.part, p.kind) in (("set", "latching-relay"), ("power", "safety-relay"),
                                                                            ("run", "drive"), ("run", "soft-starter")):
                    out.append(uses.get(p.element.tag, CoilUse(p.element.tag, [], [])))
        return out

    # Vertical measures, top to bottom.
    svg_body = _Svg()
    y = 0.0
    head = _Svg()
    title = sch.title or os.path.basename(sch.path)
    if header:
        head.text(rail_l - 40, 26, fit(title, SIZE_TITLE, width - rail_l), "title")
        counts = {s: sum(1 for d in diagnostics if d.severity == s) for s in Severity}
        sub = f"{sch.path}  \u00b7  {len(sch.rungs)} rung{'s' * (len(sch.rungs) != 1)}  \u00b7  {counts[Severity.ERROR]} error{'s' * (counts[Severity.ERROR] != 1)}, {counts[Severity.WARNING]} warning{'s' * (counts[Severity.WARNING] != 1)}, {counts[Severity.INFO]} info"
        head.text(rail_l - 40, 44, fit(sub, SIZE_SUB, width - rail_l), "sub")
        y = 60.0
    else:
        y = 8.0

    sections: list[Section] = []
    for lay in layouts:
        if not sections or sections[-1].supply is not lay.supply:
            sections.append(Section(lay.supply, []))
        sections[-1].rungs.append(lay)
    if not sections:
        head.text(rail_l, y + 20, "no rungs" + (" (a shared device file)" if sch.device_file else ""), "caption")
        y += 40

    # Supply names are free text: ids use their position instead.
    supply_id = {name: f"{pre}supply-{k}" for k, name in enumerate(sch.supplies, 1)}
    rule_labels: dict[tuple[int, int], list[_Lane]] = {}
    for sec in sections:
        sec.top = y
        sec.findings = by_supply.get(sec.supply.name, []) if sec.supply else []
        y += SECTION_HEAD + len(sec.findings) * LANE_STEP
        for lay in sec.rungs:
            lay.top = y
            y += 4
            if lay.rung.title or lay.rung.note:
                y += CAPTION_HEIGHT
            lay.row_y = []
            lowest: dict[str, int] = {}    # node -> the lowest row it is on
            for rp in lay.paths:
                for n in rp.nodes:
                    lowest[n] = max(lowest.get(n, rp.row), rp.row)
            for row in range(lay.rows):
                line_y = y + ROW_TOP
                lay.row_y.append(line_y)
                on_row = by_row[id(lay)].get(row, [])
                # Rule-name lanes under the row.
                labels = []
                for rp in on_row:
                    for p in rp.placed:
                        p.y = line_y
                        if p.mark is not None:
                            text = fit(p.mark.label, SIZE_RULE, max(col_w * 2 - 12, SYMBOL_HALF * 2))
                            labels.append(_Lane(0, text_width(text, SIZE_RULE), text, None, p))
                        for d in p.findings:
                            labels.append(_Lane(0, text_width(d.rule, SIZE_RULE), d.rule, d, p))
                labels.sort(key=lambda lab: (lab.placed.cx, lab.diag.severity * -1 if lab.diag else -9, lab.text))
                below = sorted({node_x(lay, n) for rp in on_row for n in rp.nodes
                                if n not in (lay.hot, lay.common) and lowest[n] > row})
                lanes = _place_rule_labels(labels, below, rail_l + 6, rail_r - 6)
                rule_labels[(id(lay), row)] = labels
                bottom = line_y + ROW_BOTTOM + (LANE_FIRST - ROW_BOTTOM + 4 + (lanes - 1) * LANE_STEP if lanes else 0)
                xlines = _xref_lines(row_coils(lay, row), XREF_WIDTH - 24)
                if xlines:
                    bottom = max(bottom, line_y + 4 + (len(xlines) - 1) * XREF_STEP + 8)
                y = bottom
            lay.bottom = y + RUNG_GAP
            y = lay.bottom
        sec.bottom = y
        for d in sec.findings:
            anchors.setdefault(d, supply_id[sec.supply.name])
        y += 12

    # -- write ---------------------------------------------------------------------
    wire_rungs: dict[str, list[int]] = {}
    for rung in sch.rungs:
        for path in rung.paths:
            for w in path.wires:
                if rung.number not in wire_rungs.setdefault(w, []):
                    wire_rungs[w].append(rung.number)
    svg = svg_body
    for i, sec in enumerate(sections):
        sup = sec.supply
        head_h = SECTION_HEAD + len(sec.findings) * LANE_STEP
        rail_top = sec.top + head_h - 6
        sid = f' id="{supply_id[sup.name]}"' if sup and not any(s.supply is sup for s in sections[:i]) else ""
        attrs = f' data-supply={quoteattr(sup.name)} data-hot={quoteattr(sup.hot)} data-common={quoteattr(sup.common)}' if sup else ""
        svg.add(f'<g class="section"{sid}{attrs}>')
        if sec.findings:
            worst = max(d.severity for d in sec.findings)
            svg.add(f'<rect class="outline mark-{worst}" x="{_n(rail_l - 30)}" y="{_n(sec.top + 2)}" width="{_n(rail_r - rail_l + 60)}" height="{_n(head_h - 12)}" rx="4"/>')
        if sup:
            svg.text(rail_l, sec.top + 20, sup.hot, "railname", "middle", ' data-rail="hot"')
            svg.text(rail_r, sec.top + 20, sup.common, "railname", "middle", ' data-rail="common"')
            label = f"{sup.name} \u00b7 {sup.voltage.text}" + (f" \u00b7 from {sup.source}" if sup.source else "")
            svg.text((rail_l + rail_r) / 2, sec.top + 20, fit(label, SIZE_SUB, rail_r - rail_l - 80), "supply", "middle")
            for k, d in enumerate(sec.findings):
                if d in links:
                    svg.add(f'<a class="finding" href="#{links[d]}" data-rule={quoteattr(d.rule)} data-severity="{d.severity}" data-line="{d.line}" data-column="{d.column}">')
                svg.text((rail_l + rail_r) / 2, sec.top + 33 + k * LANE_STEP, d.rule, f"rule sev-{d.severity}", "middle", f" data-rule={quoteattr(d.rule)}")
                if d in links:
                    svg.add("</a>")
        svg.line(rail_l, rail_top, rail_l, sec.bottom, "rail")
        svg.line(rail_r, rail_top, rail_r, sec.bottom, "rail")
        svg.add("</g>")
        for lay in sec.rungs:
            _draw_rung(svg, lay, node_x, rail_l, rail_r, col_w, rule_labels, row_coils, pre, links, wire_rungs)

    # Legend: every finding, and the safety note.
    legend_svg = _Svg()
    if legend:
        x0 = rail_l - 40
        room = width - RIGHT_PAD - x0
        y += 8
        legend_svg.line(x0, y, width - RIGHT_PAD, y, "xrefline")
        y += 20
        if diagnostics:
            legend_svg.text(x0, y, "Findings", "legend", extra=' font-weight="bold"')
            y += 16
            for d in diagnostics:
                where = "" if d in anchors else "  (not on the drawing)"
                place = f"{d.line}:{d.column}" if os.path.normpath(d.path) == os.path.normpath(sch.path) else f"{d.path}:{d.line}:{d.column}"
                line = f"{place}  {d.severity}  [{d.rule}]  {d.message}{where}"
                for k, text in enumerate(_wrap(line, SIZE_SUB, room - 24)):
                    extra = f' data-finding-line="{d.line}" data-rule={quoteattr(d.rule)}' if k == 0 else ""
                    legend_svg.text(x0 + (24 if k else 0), y, text, "legend", extra=extra)
                    y += 15
            y += 6
        from ctllint.output.report import SAFETY_NOTE

        for text in _wrap(SAFETY_NOTE, SIZE_SUB, room):
            legend_svg.text(x0, y, text, "sub")
            y += 15
    height = y + 12

    out = [
        f'<svg xmlns="http://www.w3.org/2000/svg" xml:space="preserve" id="{pre}drawing" class="ctllint-drawing" width="{_n(width)}" height="{_n(height)}" viewBox="0 0 {_n(width)} {_n(height)}" data-path={quoteattr(sch.path)} data-columns="{last}">',
        f"<title>{escape(title)}</title>",
        f"<style>{_css(pre, bool(marks))}</style>",
        f'<rect x="0" y="0" width="{_n(width)}" height="{_n(height)}" fill="#ffffff"/>',
        *head.parts,
        *svg.parts,
        *legend_svg.parts,
        "</svg>",
    ]
    return Drawing("\n".join(out) + "\n", width, height, anchors, [d for d in unplaced if d not in anchors], element_ids, last)


def _draw_rung(svg: _Svg, lay: RungLayout, node_x, rail_l: float, rail_r: float, col_w: float,
               rule_labels: dict[tuple[int, int], list[_Lane]], row_coils, pre: str, links: dict[Diagnostic, str],
               wire_rungs: dict[str, list[int]]) -> None:
    rung = lay.rung
    attrs = f' data-rung="{rung.number}" data-line="{rung.loc.line}"'
    svg.add(f'<g class="rung" id="{pre}rung-{rung.number}"{attrs}>')
    if rung.index % 2 == 1:
        svg.add(f'<rect class="band" x="{_n(rail_l + 1.5)}" y="{_n(lay.top)}" width="{_n(rail_r - rail_l - 3)}" height="{_n(lay.bottom - lay.top)}"/>')
    svg.text(rail_l - 12, lay.row_y[0] + 4, str(rung.number), "rungno", "end")
    if rung.title or rung.note:
        caption = " \u2014 ".join(t for t in (rung.title, rung.note) if t)
        svg.text(rail_l + 10, lay.top + 4 + 11, fit(caption, SIZE_CAPTION, rail_r - rail_l - 20), "caption")

    # Which rows each node appears on, and on which sides of it the row's line runs.
    rows_of: dict[str, list[int]] = {}
    sides: dict[tuple[str, int], set[str]] = {}
    for rp in lay.paths:
        for k, n in enumerate(rp.nodes):
            rows_of.setdefault(n, [])
            if rp.row not in rows_of[n]:
                rows_of[n].append(rp.row)
            s = sides.setdefault((n, rp.row), set())
            if k > 0:
                s.add("left")
            if k < len(rp.nodes) - 1:
                s.add("right")

    # Wires: on each row, the runs between symbols. A run is one wire; runs of
    # one wire that meet on a row (two segments touching at a node) are one run.
    # Each run carries its number, placed clear of the neighbours' outlines
    # when the run is long enough, and clear of a connector rising from it.
    runs: dict[tuple[int, str], list[float]] = {}
    for rp in lay.paths:
        k_last = len(rp.nodes) - 1
        for k, node in enumerate(rp.nodes):
            x = node_x(lay, node)
            lo = x if k == 0 else rp.placed[k - 1].cx + SYMBOL_HALF
            hi = x if k == k_last else rp.placed[k].cx - SYMBOL_HALF
            free_lo = x if k == 0 else rp.placed[k - 1].cx + _outline_half(rp.placed[k - 1], col_w)
            free_hi = x if k == k_last else rp.placed[k].cx - _outline_half(rp.placed[k], col_w)
            span = runs.setdefault((rp.row, node), [x, x, x, x])
            span[0], span[1] = min(span[0], lo), max(span[1], hi)
            span[2], span[3] = min(span[2], free_lo), max(span[3], free_hi)
    numbers: list[tuple[float, float, str]] = []
    for (row, node), (lo, hi, free_lo, free_hi) in runs.items():
        y = lay.row_y[row]
        if hi - lo > 0.05:
            svg.line(lo, y, hi, y)
        if node in (lay.hot, lay.common):
            continue
        wire = lay.wire_of[node]
        x = node_x(lay, node)
        if any(r < row for r in rows_of.get(node, [])):
            if hi - x >= x - lo:
                lo, free_lo = x, max(free_lo, x)
            else:
                hi, free_hi = x, min(free_hi, x)
        if free_hi - free_lo >= text_width(wire, SIZE_WIRE) + 4:
            lo, hi = free_lo, free_hi
        numbers.append(((lo + hi) / 2, y, wire))

    # Vertical connectors, junction dots, terminals.
    for node, rows in rows_of.items():
        if node in (lay.hot, lay.common):
            for r in rows:
                x = rail_l if node == lay.hot else rail_r
                svg.add(f'<circle class="dot" cx="{_n(x)}" cy="{_n(lay.row_y[r])}" r="2.6"/>')
            continue
        x = node_x(lay, node)
        if len(rows) > 1:
            top, bottom = min(rows), max(rows)
            svg.line(x, lay.row_y[top], x, lay.row_y[bottom], "w")
            for r in rows:
                degree = len(sides[(node, r)]) + (r > top) + (r < bottom)
                if degree >= 3:
                    svg.add(f'<circle class="dot" cx="{_n(x)}" cy="{_n(lay.row_y[r])}" r="2.6"/>')
            if all(len(sides[(node, r)]) == 1 for r in rows):
                # branches that start (or end) on a wire of another rung: the same
                # terminal mark as a single path's, so every branch start reads alike
                wire = lay.wire_of[node]
                elsewhere = [n for n in wire_rungs.get(wire, []) if n != rung.number]
                note = f"wire {wire}" + (f", also in rung{'s' * (len(elsewhere) > 1)} {', '.join(map(str, elsewhere))}" if elsewhere else ", joins nothing else")
                svg.add(f'<circle class="term" cx="{_n(x)}" cy="{_n(lay.row_y[top])}" r="3.2" data-terminal={quoteattr(wire)}><title>{escape(note)}</title></circle>')
        else:
            r = rows[0]
            if len(sides[(node, r)]) == 1:  # a wire end that joins nothing in this rung
                wire = lay.wire_of[node]
                elsewhere = [n for n in wire_rungs.get(wire, []) if n != rung.number]
                note = f"wire {wire}" + (f", also in rung{'s' * (len(elsewhere) > 1)} {', '.join(map(str, elsewhere))}" if elsewhere else ", joins nothing else")
                svg.add(f'<circle class="term" cx="{_n(x)}" cy="{_n(lay.row_y[r])}" r="3.2" data-terminal={quoteattr(wire)}><title>{escape(note)}</title></circle>')

    # Elements.
    for rp in lay.paths:
        for p in rp.placed:
            el = p.element
            label = fit(_element_label(el), SIZE_TAG, col_w - 8)
            rules = " ".join(d.rule for d in p.findings)
            data = (f' data-element={quoteattr(el.text)} data-tag={quoteattr(el.tag)} data-part={quoteattr(el.part or "")}'
                    f' data-role="{el.role or "unknown"}" data-kind={quoteattr(p.kind)} data-rung="{rung.number}"'
                    f' data-line="{el.loc.line}" data-column="{el.loc.column}" data-wires={quoteattr(el.left + " " + el.right)}')
            if rules:
                worst = max(d.severity for d in p.findings)
                data += f' data-findings={quoteattr(rules)} data-severity="{worst}"'
            if p.mark is not None:
                data += f' data-change="{p.mark.change}" data-change-label={quoteattr(p.mark.label)}'
            if p.closed_in:
                data += f' data-closed-in={quoteattr(" ".join(p.closed_in))}'
            if p.terminals is not None:
                data += f' data-terminals={quoteattr(p.terminals.pair)}' + (' data-terminals-written="true"' if p.terminals.written else "")
            svg.add(f'<g class="el" id="{p.anchor}"{data}>')
            what = f"; {p.mark.label}" if p.mark is not None else ""
            terms = f", terminals {p.terminals.pair}" if p.terminals is not None else ""
            if p.closed_in:
                terms += f", closed in {', '.join(p.closed_in)}"
            svg.add(f"<title>{escape(el.text)} (line {el.loc.line}, wires {escape(el.left)}\u2013{escape(el.right)}{escape(terms)}{escape(what)})</title>")
            if p.mark is not None:
                _change_outline(svg, p, _outline_half(p, col_w) + (3 if p.findings else 0), 3 if p.findings else 0)
            if p.findings:
                worst = max(d.severity for d in p.findings)
                half = _outline_half(p, col_w)
                svg.add(f'<rect class="outline mark-{worst}" x="{_n(p.cx - half)}" y="{_n(p.y - 29)}" width="{_n(2 * half)}" height="{OUTLINE_HEIGHT}" rx="5"/>')
            _symbol(svg, p, p.kind)
            svg.text(p.cx, p.y - LABEL_ABOVE, label, "tag", "middle")
            if p.terminals is not None:
                # Each number beside the lead its wire lands on: the drawing may turn an element round.
                flipped = el.left != el.right and lay.wire_of.get(p.left, p.left) != el.left
                left, right = (p.terminals.right, p.terminals.left) if flipped else (p.terminals.left, p.terminals.right)
                svg.text(p.cx - TERMINAL_GAP, p.y + TERMINAL_BELOW, left, "termno", "end")
                svg.text(p.cx + TERMINAL_GAP, p.y + TERMINAL_BELOW, right, "termno", "start")
            svg.add("</g>")

    # Wire numbers, above the elements' outlines.
    for cx, y, wire in numbers:
        svg.text(cx, y - WIRE_ABOVE, wire, "wire", "middle", f' data-wire={quoteattr(wire)} data-rung="{rung.number}"')

    # Rule names (and change labels) under marked elements.
    for r in range(lay.rows):
        for lab in rule_labels.get((id(lay), r), []):
            d = lab.diag
            y = lay.row_y[r] + LANE_FIRST + lab.lane * LANE_STEP
            if d is None:
                change = lab.placed.mark.change if lab.placed.mark else ""
                svg.text(lab.x0, y, lab.text, f"changelabel chg-{change}", extra=f' data-for="{lab.placed.anchor}"')
                continue
            tag = "a" if d in links else "g"
            href = f' href="#{links[d]}"' if d in links else ""
            svg.add(f'<{tag} class="finding"{href} data-rule={quoteattr(d.rule)} data-severity="{d.severity}" data-line="{d.line}" data-column="{d.column}" data-for="{lab.placed.anchor}">'
                    f"<title>{escape(f'{d.severity}: {d.message} [{d.rule}]')}</title>")
            svg.text(lab.x0, y, d.rule, f"rule sev-{d.severity}")
            svg.add(f"</{tag}>")

    # Coil cross-references, right of the common rail.
    for r in range(lay.rows):
        coils = row_coils(lay, r)
        if not coils:
            continue
        lines = _xref_lines(coils, XREF_WIDTH - 24)
        y = lay.row_y[r]
        svg.line(rail_r + 4, y, rail_r + 14, y, "xrefline")
        for k, (tag, text) in enumerate(lines):
            use = next(u for u in coils if u.tag == tag)
            data = f' data-coil={quoteattr(tag)} data-no="{",".join(map(str, use.no))}" data-nc="{",".join(map(str, use.nc))}"'
            svg.text(rail_r + 18, y + 4 + k * XREF_STEP, text, "xref", extra=data if k == 0 or lines[k - 1][0] != tag else f' data-coil={quoteattr(tag)}')
    svg.add("</g>")


def render_svg(sch: Schematic, diagnostics: Iterable[Diagnostic] = (), id_prefix: str = "", legend: bool = True) -> str:
    """The SVG drawing of ``sch`` as text."""
    return layout(sch, diagnostics, id_prefix, legend).svg
