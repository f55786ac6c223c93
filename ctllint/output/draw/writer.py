"""The SVG writer: turns a laid-out ``Sheet`` into SVG text.

Its own module because writing decides nothing about places: every position, fitted text and
lane comes from the layout model, and this module only writes them, in a fixed order with
rounded coordinates, so the same schematic and findings always give the same bytes. The
symbols themselves are drawn by ``symbols``.
"""
from __future__ import annotations

from ctllint.output.draw.measures import LABEL_ABOVE, LANE_STEP, OUTLINE_HEIGHT, TERMINAL_BELOW, TERMINAL_GAP, XREF_STEP
from ctllint.output.draw.model import Drawing, Legend, Placed, RungLayout, Section, Sheet
from ctllint.output.draw.style import CHANGE_COLOUR, INK, css
from ctllint.output.draw.svg import Svg, coord as _n, escape, quoteattr
from ctllint.output.draw.symbols import draw_symbol


def write(sheet: Sheet) -> Drawing:
    """The drawing of ``sheet`` as SVG text."""
    grid = sheet.grid
    head = Svg()
    if sheet.heading is not None:
        head.text(grid.rail_l - 40, 26, sheet.heading[0], "title")
        head.text(grid.rail_l - 40, 44, sheet.heading[1], "sub")
    if sheet.empty is not None:
        head.text(grid.rail_l, sheet.empty[0], sheet.empty[1], "caption")
    body = Svg()
    for sec in sheet.sections:
        _write_section(body, sec, sheet)
        for lay in sec.rungs:
            _write_rung(body, lay, sheet)
    legend = Svg()
    if sheet.legend is not None:
        _write_legend(legend, sheet.legend)
    width, height, pre = grid.width, sheet.height, sheet.prefix
    out = [
        f'<svg xmlns="http://www.w3.org/2000/svg" xml:space="preserve" id="{pre}drawing" class="ctllint-drawing" width="{_n(width)}" height="{_n(height)}" viewBox="0 0 {_n(width)} {_n(height)}" data-path={quoteattr(sheet.path)} data-columns="{grid.last}">',
        f"<title>{escape(sheet.title)}</title>",
        f"<style>{css(pre, sheet.marked)}</style>",
        f'<rect x="0" y="0" width="{_n(width)}" height="{_n(height)}" fill="#ffffff"/>',
        *head.parts,
        *body.parts,
        *legend.parts,
        "</svg>",
    ]
    return Drawing("\n".join(out) + "\n", width, height, sheet.anchors, sheet.unplaced, sheet.element_ids, grid.last)


def _write_section(svg: Svg, sec: Section, sheet: Sheet) -> None:
    """A section's head (rail names, supply, the supply's findings) and its rails."""
    rail_l, rail_r = sheet.grid.rail_l, sheet.grid.rail_r
    links = sheet.links
    sup = sec.supply
    sid = f' id="{sec.anchor}"' if sec.anchor else ""
    attrs = f' data-supply={quoteattr(sup.name)} data-hot={quoteattr(sup.hot)} data-common={quoteattr(sup.common)}' if sup else ""
    svg.add(f'<g class="section"{sid}{attrs}>')
    if sec.findings:
        worst = max(d.severity for d in sec.findings)
        svg.add(f'<rect class="outline mark-{worst}" x="{_n(rail_l - 30)}" y="{_n(sec.top + 2)}" width="{_n(rail_r - rail_l + 60)}" height="{_n(sec.head - 12)}" rx="4"/>')
    if sup:
        svg.text(rail_l, sec.top + 20, sup.hot, "railname", "middle", ' data-rail="hot"')
        svg.text(rail_r, sec.top + 20, sup.common, "railname", "middle", ' data-rail="common"')
        svg.text((rail_l + rail_r) / 2, sec.top + 20, sec.label, "supply", "middle")
        for k, d in enumerate(sec.findings):
            if d in links:
                svg.add(f'<a class="finding" href="#{links[d]}" data-rule={quoteattr(d.rule)} data-severity="{d.severity}" data-line="{d.line}" data-column="{d.column}">')
            svg.text((rail_l + rail_r) / 2, sec.top + 33 + k * LANE_STEP, d.rule, f"rule sev-{d.severity}", "middle", f" data-rule={quoteattr(d.rule)}")
            if d in links:
                svg.add("</a>")
    rail_top = sec.top + sec.head - 6
    svg.line(rail_l, rail_top, rail_l, sec.bottom, "rail")
    svg.line(rail_r, rail_top, rail_r, sec.bottom, "rail")
    svg.add("</g>")


def _write_rung(svg: Svg, lay: RungLayout, sheet: Sheet) -> None:
    """One rung: its number and caption, wires, junctions, elements, wire numbers, the words
    under its elements and its cross-references, in that order."""
    rail_l, rail_r = sheet.grid.rail_l, sheet.grid.rail_r
    rung = lay.rung
    attrs = f' data-rung="{rung.number}" data-line="{rung.loc.line}"'
    svg.add(f'<g class="rung" id="{sheet.prefix}rung-{rung.number}"{attrs}>')
    if rung.index % 2 == 1:
        svg.add(f'<rect class="band" x="{_n(rail_l + 1.5)}" y="{_n(lay.top)}" width="{_n(rail_r - rail_l - 3)}" height="{_n(lay.bottom - lay.top)}"/>')
    svg.text(rail_l - 12, lay.row_y[0] + 4, str(rung.number), "rungno", "end")
    if lay.caption:
        svg.text(rail_l + 10, lay.top + 4 + 11, lay.caption, "caption")
    for lo, hi, y in lay.wires:
        svg.line(lo, y, hi, y)
    for j in lay.junctions:
        if j.connector is not None:
            svg.line(j.x, j.connector[0], j.x, j.connector[1], "w")
        for y in j.dots:
            svg.add(f'<circle class="dot" cx="{_n(j.x)}" cy="{_n(y)}" r="2.6"/>')
        if j.terminal is not None:
            y, wire, note = j.terminal
            svg.add(f'<circle class="term" cx="{_n(j.x)}" cy="{_n(y)}" r="3.2" data-terminal={quoteattr(wire)}><title>{escape(note)}</title></circle>')
    for rp in lay.paths:
        for p in rp.placed:
            _write_element(svg, p, rung.number)
    for cx, y, wire in lay.numbers:
        svg.text(cx, y, wire, "wire", "middle", f' data-wire={quoteattr(wire)} data-rung="{rung.number}"')
    _write_labels(svg, lay, sheet.links)
    _write_xrefs(svg, lay, rail_r)
    svg.add("</g>")


def _element_data(p: Placed, rung_number: int) -> str:
    """An element's data attributes: what it is, where it is written, its findings, change and terminals."""
    el = p.element
    rules = " ".join(d.rule for d in p.findings)
    data = (f' data-element={quoteattr(el.text)} data-tag={quoteattr(el.tag)} data-part={quoteattr(el.part or "")}'
            f' data-role="{el.role or "unknown"}" data-kind={quoteattr(p.kind)} data-rung="{rung_number}"'
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
    return data


def _write_element(svg: Svg, p: Placed, rung_number: int) -> None:
    """An element: its group with a tooltip, its change and finding outlines, symbol, label and terminal numbers."""
    el = p.element
    svg.add(f'<g class="el" id="{p.anchor}"{_element_data(p, rung_number)}>')
    what = f"; {p.mark.label}" if p.mark is not None else ""
    terms = f", terminals {p.terminals.pair}" if p.terminals is not None else ""
    if p.closed_in:
        terms += f", closed in {', '.join(p.closed_in)}"
    svg.add(f"<title>{escape(el.text)} (line {el.loc.line}, wires {escape(el.left)}\u2013{escape(el.right)}{escape(terms)}{escape(what)})</title>")
    if p.mark is not None:
        _change_outline(svg, p, p.half + (3 if p.findings else 0), 3 if p.findings else 0)
    if p.findings:
        worst = max(d.severity for d in p.findings)
        svg.add(f'<rect class="outline mark-{worst}" x="{_n(p.cx - p.half)}" y="{_n(p.y - 29)}" width="{_n(2 * p.half)}" height="{OUTLINE_HEIGHT}" rx="5"/>')
    draw_symbol(svg, p, p.kind)
    svg.text(p.cx, p.y - LABEL_ABOVE, p.label, "tag", "middle")
    if p.terminal_text is not None:
        left, right = p.terminal_text
        svg.text(p.cx - TERMINAL_GAP, p.y + TERMINAL_BELOW, left, "termno", "end")
        svg.text(p.cx + TERMINAL_GAP, p.y + TERMINAL_BELOW, right, "termno", "start")
    svg.add("</g>")


def _change_outline(svg: Svg, p: Placed, half: float, grow: float) -> None:
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


def _write_labels(svg: Svg, lay: RungLayout, links) -> None:
    """Rule names (and change labels) under marked elements."""
    for lab in lay.labels:
        d = lab.diag
        if d is None:
            change = lab.placed.mark.change if lab.placed.mark else ""
            svg.text(lab.x0, lab.y, lab.text, f"changelabel chg-{change}", extra=f' data-for="{lab.placed.anchor}"')
            continue
        tag = "a" if d in links else "g"
        href = f' href="#{links[d]}"' if d in links else ""
        svg.add(f'<{tag} class="finding"{href} data-rule={quoteattr(d.rule)} data-severity="{d.severity}" data-line="{d.line}" data-column="{d.column}" data-for="{lab.placed.anchor}">'
                f"<title>{escape(f'{d.severity}: {d.message} [{d.rule}]')}</title>")
        svg.text(lab.x0, lab.y, d.rule, f"rule sev-{d.severity}")
        svg.add(f"</{tag}>")


def _write_xrefs(svg: Svg, lay: RungLayout, rail_r: float) -> None:
    """Coil cross-references, right of the common rail."""
    for xref in lay.xrefs:
        lines, y = xref.lines, xref.y
        svg.line(rail_r + 4, y, rail_r + 14, y, "xrefline")
        for k, (tag, text) in enumerate(lines):
            use = next(u for u in xref.coils if u.tag == tag)
            data = f' data-coil={quoteattr(tag)} data-no="{",".join(map(str, use.no))}" data-nc="{",".join(map(str, use.nc))}"'
            svg.text(rail_r + 18, y + 4 + k * XREF_STEP, text, "xref", extra=data if k == 0 or lines[k - 1][0] != tag else f' data-coil={quoteattr(tag)}')


def _write_legend(svg: Svg, legend: Legend) -> None:
    """Under the drawing: a rule, every finding, and the safety note."""
    svg.line(legend.x0, legend.rule_y, legend.x1, legend.rule_y, "xrefline")
    if legend.heading_y is not None:
        svg.text(legend.x0, legend.heading_y, "Findings", "legend", extra=' font-weight="bold"')
    for line in legend.lines:
        d = line.finding
        extra = f' data-finding-line="{d.line}" data-rule={quoteattr(d.rule)}' if d is not None else ""
        svg.text(line.x, line.y, line.text, line.cls, extra=extra)
