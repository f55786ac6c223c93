"""The layout of a whole sheet: rungs in sections between their rails, the grid of columns,
each element's place and labels, rows top to bottom, the header and the legend.

Its own module because it is the layout's order of work, from the schematic to the
``Sheet`` the SVG writer reads; each step's own question (columns, rows, wires, lanes,
cross-references) is answered in its own module.

Rungs keep the file's order, top to bottom. Consecutive rungs on the same supply share one
pair of rails (hot at left, common at right), headed by the rail wire names and the supply's
name and voltage. Each coil's row carries, right of the common rail, the rungs where the
coil's contacts are used. A finding's element gets an outline in the colour of its worst
finding, and each rule name is written under it.
"""
from __future__ import annotations

import os
from typing import Iterable

from ctllint.output.draw.columns import finish_columns, plan_rung, rung_supply
from ctllint.output.draw.findings import match_findings
from ctllint.output.draw.lanes import lay_out_labels
from ctllint.output.draw.measures import (
    CAPTION_HEIGHT, LANE_FIRST, LANE_STEP, LEFT_MARGIN, MAX_COLUMN_WIDTH, MIN_COLUMN_WIDTH, MIN_COLUMNS,
    RIGHT_PAD, ROW_BOTTOM, ROW_TOP, RUNG_GAP, SECTION_HEAD, SIZE_CAPTION, SIZE_SUB, SIZE_TAG, SIZE_TITLE,
    SIZE_WIRE, SYMBOL_HALF, TARGET_WIDTH, TERMINAL_INSET, XREF_STEP, XREF_WIDTH, fit, text_width, wrap,
)
from ctllint.output.draw.model import Grid, Legend, LegendLine, Mark, Placed, RowPath, RungLayout, Section, Sheet, XrefRow
from ctllint.output.draw.rows import assign_rows
from ctllint.output.draw.symbols import operator_of
from ctllint.output.draw.wires import lay_out_wires, wire_rungs
from ctllint.output.draw.xref import CoilUse, coil_uses, coils_on_row, xref_lines
from ctllint.reading.kinds import selector_parts
from ctllint.reading.model import Diagnostic, Element, Schematic, Severity, Supply
from ctllint.reading.terminals import assign as assign_terminals


def lay_out(sch: Schematic, diagnostics: Iterable[Diagnostic] = (), id_prefix: str = "", legend: bool = True,
            finding_links: dict[Diagnostic, str] | None = None, header: bool = True,
            rungs: Iterable[int] | None = None, marks: dict[int, Mark] | None = None,
            min_columns: int = MIN_COLUMNS, kind_registry=None) -> Sheet:
    """The layout of ``sch`` with ``diagnostics`` marked on their elements (the arguments are
    ``ctllint.output.draw.layout``'s)."""
    marks = marks or {}
    diagnostics = sorted(set(diagnostics))
    by_element, by_supply, unplaced = match_findings(sch, diagnostics)
    layouts, last = _rung_layouts(sch, rungs, min_columns)
    grid = _grid(layouts, last)
    anchors: dict[Diagnostic, str] = {}
    element_ids: dict[int, str] = {}
    _place_elements(sch, layouts, grid, id_prefix, by_element, marks, kind_registry, anchors, element_ids)

    title = sch.title or os.path.basename(sch.path)
    heading = None
    y = 8.0
    if header:
        heading = (fit(title, SIZE_TITLE, grid.width - grid.rail_l), fit(_sub_title(sch, diagnostics), SIZE_SUB, grid.width - grid.rail_l))
        y = 60.0
    sections = _sections(layouts)
    empty = None
    if not sections:
        empty = (y + 20, "no rungs" + (" (a shared device file)" if sch.device_file else ""))
        y += 40
    y = _measure_sections(sch, sections, grid, by_supply, coil_uses(sch), id_prefix, anchors, y)
    rungs_of_wire = wire_rungs(sch)
    for lay in layouts:
        lay_out_wires(lay, grid, rungs_of_wire)
    legend_box = None
    if legend:
        legend_box, y = _legend(sch, diagnostics, anchors, grid, y)
    return Sheet(sch.path, title, heading, empty, grid, sections, legend_box, y + 12, id_prefix, finding_links or {},
                 bool(marks), anchors, [d for d in unplaced if d not in anchors], element_ids)


def _rung_layouts(sch: Schematic, rungs: Iterable[int] | None, min_columns: int) -> tuple[list[RungLayout], int]:
    """The rungs to draw, each with its columns and rows, and the common rail's column.

    A rung's supply may come from the rung before it, so every rung's is
    worked out even when only some are drawn.
    """
    drawn = None if rungs is None else set(rungs)
    plans = []
    previous: Supply | None = None
    for rung in sch.rungs:
        sup = rung_supply(sch, rung, previous)
        previous = sup
        if drawn is None or rung.index in drawn:
            plans.append(plan_rung(sch, rung, sup))
    last = max([MIN_COLUMNS, min_columns] + [max(plan[-1].values(), default=0) for plan in plans])
    layouts: list[RungLayout] = []
    for lay, g, chains, right_side, asap in plans:
        finish_columns(lay, g, chains, right_side, asap, last)
        assign_rows(lay)
        layouts.append(lay)
    return layouts, last


def _grid(layouts: list[RungLayout], last: int) -> Grid:
    """Horizontal measures. The column width leaves room for the widest element label.

    The shortest run of a wire is half a column less half a symbol (a branch
    leaving a connector), less the inset where a wire ends off the rails:
    the columns are widened until the longest wire number fits there.
    """
    col_w = (TARGET_WIDTH - LEFT_MARGIN - XREF_WIDTH - RIGHT_PAD) / last
    col_w = max(MIN_COLUMN_WIDTH, min(MAX_COLUMN_WIDTH, col_w))
    longest = max([text_width(w, SIZE_WIRE) for lay in layouts for w in lay.wire_of.values()] + [0])
    longest_inset = max([text_width(lay.wire_of[n], SIZE_WIRE) for lay in layouts for n, c in lay.column.items()
                         if c in (0, last) and n not in (lay.hot, lay.common)] + [-TERMINAL_INSET])
    col_w = max(col_w, 2 * (SYMBOL_HALF + 3 + longest), 2 * (SYMBOL_HALF + 3 + TERMINAL_INSET + longest_inset))
    rail_l = LEFT_MARGIN
    rail_r = rail_l + last * col_w
    return Grid(rail_l, rail_r, col_w, last, rail_r + XREF_WIDTH + RIGHT_PAD)


def _place_elements(sch: Schematic, layouts: list[RungLayout], grid: Grid, pre: str, by_element: dict[int, list[Diagnostic]],
                    marks: dict[int, Mark], kind_registry, anchors: dict[Diagnostic, str], element_ids: dict[int, str]) -> None:
    """Each element's centre, id, findings, change mark, terminal numbers, operator and label."""
    kinds = {tag: dev.kind for tag, dev in sch.devices.items()}
    terminal_marks = assign_terminals(sch, kind_registry)
    for lay in layouts:
        for rp in lay.paths:
            for p in rp.placed:
                p.kind = kinds.get(p.element.tag, "")
                p.cx = grid.rail_l + (p.slot + 0.5) * grid.col_w
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
                _label(p, lay, grid.col_w)
                element_ids[p.element.index] = p.anchor
                for d in p.findings:
                    anchors.setdefault(d, p.anchor)


def _element_label(el: Element) -> str:
    if el.part in (None, "NO", "NC", "coil"):
        return el.tag
    return el.text


def _label(p: Placed, lay: RungLayout, col_w: float) -> None:
    """The element's label fitted to its column, the half width of its outline (when it is
    marked), and its terminal numbers each beside the lead its wire lands on (the drawing may
    turn an element round)."""
    el = p.element
    p.label = fit(_element_label(el), SIZE_TAG, col_w - 8)
    if not p.findings and p.mark is None:
        p.half = SYMBOL_HALF
    else:
        p.half = max(SYMBOL_HALF + 6, text_width(p.label, SIZE_TAG) / 2 + 5)
    if p.terminals is not None:
        flipped = el.left != el.right and lay.wire_of.get(p.left, p.left) != el.left
        p.terminal_text = (p.terminals.right, p.terminals.left) if flipped else (p.terminals.left, p.terminals.right)


def _sub_title(sch: Schematic, diagnostics: list[Diagnostic]) -> str:
    counts = {s: sum(1 for d in diagnostics if d.severity == s) for s in Severity}
    return f"{sch.path}  \u00b7  {len(sch.rungs)} rung{'s' * (len(sch.rungs) != 1)}  \u00b7  {counts[Severity.ERROR]} error{'s' * (counts[Severity.ERROR] != 1)}, {counts[Severity.WARNING]} warning{'s' * (counts[Severity.WARNING] != 1)}, {counts[Severity.INFO]} info"


def _sections(layouts: list[RungLayout]) -> list[Section]:
    """Consecutive rungs on one supply, one section each."""
    sections: list[Section] = []
    for lay in layouts:
        if not sections or sections[-1].supply is not lay.supply:
            sections.append(Section(lay.supply, []))
        sections[-1].rungs.append(lay)
    return sections


def _measure_sections(sch: Schematic, sections: list[Section], grid: Grid, by_supply: dict[str, list[Diagnostic]],
                      uses: dict[str, CoilUse], pre: str, anchors: dict[Diagnostic, str], y: float) -> float:
    """Vertical measures, top to bottom, from ``y``; return where the last section ends."""
    # Supply names are free text: ids use their position instead.
    supply_id = {name: f"{pre}supply-{k}" for k, name in enumerate(sch.supplies, 1)}
    for i, sec in enumerate(sections):
        sup = sec.supply
        sec.top = y
        sec.findings = by_supply.get(sup.name, []) if sup else []
        sec.head = SECTION_HEAD + len(sec.findings) * LANE_STEP
        if sup:
            sec.anchor = supply_id[sup.name] if not any(s.supply is sup for s in sections[:i]) else ""
            label = f"{sup.name} \u00b7 {sup.voltage.text}" + (f" \u00b7 from {sup.source}" if sup.source else "")
            sec.label = fit(label, SIZE_SUB, grid.rail_r - grid.rail_l - 80)
        y += sec.head
        for lay in sec.rungs:
            y = _measure_rung(lay, grid, uses, y)
        sec.bottom = y
        for d in sec.findings:
            anchors.setdefault(d, supply_id[sup.name])
        y += 12
    return y


def _measure_rung(lay: RungLayout, grid: Grid, uses: dict[str, CoilUse], y: float) -> float:
    """Each row's line, the words under its elements and its cross-references; return where the rung ends."""
    lay.top = y
    y += 4
    rung = lay.rung
    if rung.title or rung.note:
        y += CAPTION_HEIGHT
        caption = " \u2014 ".join(t for t in (rung.title, rung.note) if t)
        lay.caption = fit(caption, SIZE_CAPTION, grid.rail_r - grid.rail_l - 20)
    on_rows: dict[int, list[RowPath]] = {}
    lowest: dict[str, int] = {}    # node -> the lowest row it is on
    for rp in lay.paths:
        on_rows.setdefault(rp.row, []).append(rp)
        for n in rp.nodes:
            lowest[n] = max(lowest.get(n, rp.row), rp.row)
    lay.row_y = []
    for row in range(lay.rows):
        line_y = y + ROW_TOP
        lay.row_y.append(line_y)
        on_row = on_rows.get(row, [])
        for rp in on_row:
            for p in rp.placed:
                p.y = line_y
        lanes = lay_out_labels(lay, on_row, row, lowest, grid)
        bottom = line_y + ROW_BOTTOM + (LANE_FIRST - ROW_BOTTOM + 4 + (lanes - 1) * LANE_STEP if lanes else 0)
        coils = coils_on_row((p for rp in on_row for p in rp.placed), uses)
        xlines = xref_lines(coils, XREF_WIDTH - 24)
        if coils:
            lay.xrefs.append(XrefRow(line_y, coils, xlines))
        if xlines:
            bottom = max(bottom, line_y + 4 + (len(xlines) - 1) * XREF_STEP + 8)
        y = bottom
    lay.bottom = y + RUNG_GAP
    return lay.bottom


def _legend(sch: Schematic, diagnostics: list[Diagnostic], anchors: dict[Diagnostic, str], grid: Grid, y: float) -> tuple[Legend, float]:
    """Under the drawing, from ``y``: every finding, and the safety note; return it and where it ends."""
    from ctllint.output.report import SAFETY_NOTE

    x0 = grid.rail_l - 40
    room = grid.width - RIGHT_PAD - x0
    y += 8
    rule_y = y
    y += 20
    heading_y = None
    lines: list[LegendLine] = []
    if diagnostics:
        heading_y = y
        y += 16
        for d in diagnostics:
            where = "" if d in anchors else "  (not on the drawing)"
            place = f"{d.line}:{d.column}" if os.path.normpath(d.path) == os.path.normpath(sch.path) else f"{d.path}:{d.line}:{d.column}"
            line = f"{place}  {d.severity}  [{d.rule}]  {d.message}{where}"
            for k, text in enumerate(wrap(line, SIZE_SUB, room - 24)):
                lines.append(LegendLine(x0 + (24 if k else 0), y, text, "legend", d if k == 0 else None))
                y += 15
        y += 6
    for text in wrap(SAFETY_NOTE, SIZE_SUB, room):
        lines.append(LegendLine(x0, y, text, "sub"))
        y += 15
    return Legend(x0, grid.width - RIGHT_PAD, rule_y, heading_y, lines), y
