"""The wires of a laid-out rung: the runs of wire on each row between the symbols, where each
wire number stands, and what is drawn at each node (vertical connectors, junction dots,
terminal marks of wire ends).

Its own module because this is the layout's reading of the wires as the trade reads them: a
run is one wire, each carries its number, a dot where three or more conductors meet, a
terminal mark where a wire ends without joining anything in the rung.
"""
from __future__ import annotations

from ctllint.output.draw.measures import SIZE_WIRE, SYMBOL_HALF, WIRE_ABOVE, text_width
from ctllint.output.draw.model import Grid, Junction, RungLayout


def wire_rungs(sch) -> dict[str, list[int]]:
    """Each wire's rung numbers, in file order."""
    out: dict[str, list[int]] = {}
    for rung in sch.rungs:
        for path in rung.paths:
            for w in path.wires:
                if rung.number not in out.setdefault(w, []):
                    out[w].append(rung.number)
    return out


def lay_out_wires(lay: RungLayout, grid: Grid, rungs_of_wire: dict[str, list[int]]) -> None:
    """Fill in ``lay.wires``, ``lay.numbers`` and ``lay.junctions`` (its elements and rows placed)."""
    rows_of, sides = _node_rows(lay)
    _runs(lay, grid, rows_of)
    _junctions(lay, grid, rows_of, sides, rungs_of_wire)


def _node_rows(lay: RungLayout) -> tuple[dict[str, list[int]], dict[tuple[str, int], set[str]]]:
    """Which rows each node appears on, and on which sides of it the row's line runs."""
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
    return rows_of, sides


def _runs(lay: RungLayout, grid: Grid, rows_of: dict[str, list[int]]) -> None:
    """On each row, the runs between symbols. A run is one wire; runs of one wire
    that meet on a row (two segments touching at a node) are one run. Each run
    carries its number, placed clear of the neighbours' outlines when the run is
    long enough, and clear of a connector rising from it."""
    runs: dict[tuple[int, str], list[float]] = {}
    for rp in lay.paths:
        k_last = len(rp.nodes) - 1
        for k, node in enumerate(rp.nodes):
            x = grid.node_x(lay, node)
            lo = x if k == 0 else rp.placed[k - 1].cx + SYMBOL_HALF
            hi = x if k == k_last else rp.placed[k].cx - SYMBOL_HALF
            free_lo = x if k == 0 else rp.placed[k - 1].cx + rp.placed[k - 1].half
            free_hi = x if k == k_last else rp.placed[k].cx - rp.placed[k].half
            span = runs.setdefault((rp.row, node), [x, x, x, x])
            span[0], span[1] = min(span[0], lo), max(span[1], hi)
            span[2], span[3] = min(span[2], free_lo), max(span[3], free_hi)
    for (row, node), (lo, hi, free_lo, free_hi) in runs.items():
        y = lay.row_y[row]
        if hi - lo > 0.05:
            lay.wires.append((lo, hi, y))
        if node in (lay.hot, lay.common):
            continue
        wire = lay.wire_of[node]
        x = grid.node_x(lay, node)
        if any(r < row for r in rows_of.get(node, [])):
            if hi - x >= x - lo:
                lo, free_lo = x, max(free_lo, x)
            else:
                hi, free_hi = x, min(free_hi, x)
        if free_hi - free_lo >= text_width(wire, SIZE_WIRE) + 4:
            lo, hi = free_lo, free_hi
        lay.numbers.append(((lo + hi) / 2, y - WIRE_ABOVE, wire))


def _junctions(lay: RungLayout, grid: Grid, rows_of: dict[str, list[int]], sides: dict[tuple[str, int], set[str]],
               rungs_of_wire: dict[str, list[int]]) -> None:
    """Vertical connectors, junction dots, terminals, node by node."""
    for node, rows in rows_of.items():
        if node in (lay.hot, lay.common):
            x = grid.rail_l if node == lay.hot else grid.rail_r
            lay.junctions.append(Junction(x, dots=[lay.row_y[r] for r in rows]))
            continue
        junction = Junction(grid.node_x(lay, node))
        if len(rows) > 1:
            top, bottom = min(rows), max(rows)
            junction.connector = (lay.row_y[top], lay.row_y[bottom])
            for r in rows:
                degree = len(sides[(node, r)]) + (r > top) + (r < bottom)
                if degree >= 3:
                    junction.dots.append(lay.row_y[r])
            if all(len(sides[(node, r)]) == 1 for r in rows):
                # branches that start (or end) on a wire of another rung: the same
                # terminal mark as a single path's, so every branch start reads alike
                junction.terminal = _terminal(lay, node, lay.row_y[top], rungs_of_wire)
        else:
            r = rows[0]
            if len(sides[(node, r)]) == 1:  # a wire end that joins nothing in this rung
                junction.terminal = _terminal(lay, node, lay.row_y[r], rungs_of_wire)
        if junction.connector or junction.dots or junction.terminal:
            lay.junctions.append(junction)


def _terminal(lay: RungLayout, node: str, y: float, rungs_of_wire: dict[str, list[int]]) -> tuple[float, str, str]:
    """The terminal mark of a wire end: its row line, its wire, and where else the wire goes."""
    wire = lay.wire_of[node]
    number = lay.rung.number
    elsewhere = [n for n in rungs_of_wire.get(wire, []) if n != number]
    note = f"wire {wire}" + (f", also in rung{'s' * (len(elsewhere) > 1)} {', '.join(map(str, elsewhere))}" if elsewhere else ", joins nothing else")
    return (y, wire, note)
