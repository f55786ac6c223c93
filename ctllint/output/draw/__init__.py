"""Draw a schematic's ladder as plain SVG.

The drawing is built in two steps. The layout places everything on a grid
of columns and rows and measures text, into a layout model of plain data
(``model``: where each rung, row, element, wire number, cross-reference
and mark goes); the SVG writer (``writer``) writes the result. No drawing
library is used: the SVG is a few hundred lines of plain elements, written
in a fixed order with rounded coordinates, so the same schematic and
findings always give the same bytes.

Layout, rung by rung (``sheet`` runs the steps in order):

- Rungs keep the file's order, top to bottom. Consecutive rungs on the same
  supply share one pair of rails (hot at left, common at right), headed by
  the rail wire names and the supply's name and voltage.
- Inside a rung each wire is a node and each element an edge. Nodes get a
  column: the longest run of elements from the hot rail (contacts pack to
  the left), except that a load and whatever follows it pack to the right,
  next to the common rail, as loads sit on a ladder diagram (``columns``).
- The rung's first path is its top row. Each further path goes to the first
  row below where it overlaps nothing and its vertical connectors cross no
  other line (``rows``); it joins the wires it bridges with vertical
  connectors, with a dot where three or more conductors meet (``wires``).
- Each coil's row carries, right of the common rail, the rungs where the
  coil's contacts are used: ``NO 2, 5  NC 7`` (``xref``).
- Each element's terminal numbers (written in the file, or assigned as
  ``ctllint.reading.terminals`` says) stand in small type under its two leads,
  each beside the wire that lands on it.
- A finding is matched to what it points at by file, line and column
  (``findings``): an element, or every rung element of a device whose tag
  or field it names. The element gets an outline in the colour of its worst
  finding, and each rule name is written under it, in lanes that never
  overlap (``lanes``).

For a review of changes, ``layout`` can draw only some rungs (``rungs``:
each keeps its number, supply and cross-references) and mark elements as
removed, added or moved (``marks``, see ``Mark``): a dashed or solid
outline in the change's colour, a minus or plus badge, and words under
the element, in the same lanes as rule names.

The trade symbols are drawn by ``symbols``; type sizes and distances are in
``measures``, colours and the style sheet in ``style``, the SVG primitives
in ``svg``. All text uses a monospaced face, so a label's width is known
exactly (``text_width``) and the layout can keep labels apart.
"""
from __future__ import annotations

from typing import Iterable

from ctllint.output.draw.findings import match_findings
from ctllint.output.draw.measures import (
    CAPTION_HEIGHT, LABEL_ABOVE, LANE_FIRST, LANE_STEP, LEFT_MARGIN, MAX_COLUMN_WIDTH, MIN_COLUMN_WIDTH, MIN_COLUMNS,
    MONO, MONO_ADVANCE, OUTLINE_HEIGHT, RIGHT_PAD, ROW_BOTTOM, ROW_TOP, RUNG_GAP, SANS, SECTION_HEAD, SIZE_CAPTION,
    SIZE_RAIL, SIZE_RULE, SIZE_RUNG, SIZE_SUB, SIZE_TAG, SIZE_TERMINAL, SIZE_TITLE, SIZE_WIRE, SIZE_XREF, SYMBOL_HALF,
    TARGET_WIDTH, TERMINAL_BELOW, TERMINAL_GAP, TERMINAL_INSET, TEXT_SIZE, WIRE_ABOVE, XREF_STEP, XREF_WIDTH, fit,
    text_width,
)
from ctllint.output.draw.model import Drawing, Mark, Placed, RowPath, RungLayout, Section
from ctllint.output.draw.sheet import lay_out
from ctllint.output.draw.style import (
    CHANGE_COLOUR, CHANGE_DASH, CHANGE_TINT, INK, MUTED, SEVERITY_COLOUR, SEVERITY_TINT, WIRE_INK,
)
from ctllint.output.draw.svg import escape, quoteattr, visible
from ctllint.output.draw.symbols import (
    DRIVE_INPUT_TEXT, LOAD_LETTER, OPERATORS, RESISTIVE_KINDS, SAFETY_INPUT_TEXT, operator_of,
)
from ctllint.output.draw.writer import write
from ctllint.output.draw.xref import CoilUse, coil_uses
from ctllint.reading.budget import work
from ctllint.reading.model import Diagnostic, Schematic


def layout(sch: Schematic, diagnostics: Iterable[Diagnostic] = (), id_prefix: str = "", legend: bool = True,
           finding_links: dict[Diagnostic, str] | None = None, header: bool = True,
           rungs: Iterable[int] | None = None, marks: dict[int, Mark] | None = None,
           min_columns: int = MIN_COLUMNS, kind_registry=None) -> Drawing:
    """Lay out and draw ``sch`` with ``diagnostics`` marked on their elements; one unit of the
    command's time budget (``ctllint.reading.budget``).

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
    with work(f"the drawing of {sch.path}"):
        return write(lay_out(sch, diagnostics, id_prefix, legend, finding_links, header, rungs, marks, min_columns, kind_registry))


def render_svg(sch: Schematic, diagnostics: Iterable[Diagnostic] = (), id_prefix: str = "", legend: bool = True) -> str:
    """The SVG drawing of ``sch`` as text."""
    return layout(sch, diagnostics, id_prefix, legend).svg
