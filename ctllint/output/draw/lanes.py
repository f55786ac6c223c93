"""The words under elements: each marked element's rule names, and a changed element's change
label, in lanes under its row that never overlap and keep clear of connectors going down.

Its own module because it is the layout's second search (the first is the rows'): where the
words go decides how tall a row is.
"""
from __future__ import annotations

from ctllint.output.draw.measures import LANE_FIRST, LANE_STEP, SIZE_RULE, SYMBOL_HALF, fit, text_width
from ctllint.output.draw.model import Grid, Label, RowPath, RungLayout


def lay_out_labels(lay: RungLayout, on_row: list[RowPath], row: int, lowest: dict[str, int], grid: Grid) -> int:
    """Give the words under the elements of one row (placed at ``lay.row_y[row]``) their
    places, add them to ``lay.labels``, and return how many lanes they take."""
    line_y = lay.row_y[row]
    labels = []
    for rp in on_row:
        for p in rp.placed:
            if p.mark is not None:
                text = fit(p.mark.label, SIZE_RULE, max(grid.col_w * 2 - 12, SYMBOL_HALF * 2))
                labels.append(Label(0, text_width(text, SIZE_RULE), text, None, p))
            for d in p.findings:
                labels.append(Label(0, text_width(d.rule, SIZE_RULE), d.rule, d, p))
    labels.sort(key=lambda lab: (lab.placed.cx, lab.diag.severity * -1 if lab.diag else -9, lab.text))
    below = sorted({grid.node_x(lay, n) for rp in on_row for n in rp.nodes
                    if n not in (lay.hot, lay.common) and lowest[n] > row})
    lanes = place_labels(labels, below, grid.rail_l + 6, grid.rail_r - 6)
    for lab in labels:
        lab.y = line_y + LANE_FIRST + lab.lane * LANE_STEP
    lay.labels.extend(labels)
    return lanes


def place_labels(labels: list[Label], obstacles: list[float], x_min: float, x_max: float) -> int:
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
