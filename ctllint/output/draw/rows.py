"""The rows of a rung: the first path on the top row, each further path on the first row below
where it overlaps nothing and its vertical connectors cross no other line.

Its own module because it is the layout's one search, and the one part whose speed matters on
large panels: what each row holds is kept as bit masks, so that a thousand parallel branches
each needing a row of their own stay near linear (``tests/test_scale.py`` checks it against a
plain search, and the benchmark has a row for it).
"""
from __future__ import annotations

from ctllint.output.draw.model import RungLayout


def assign_rows(lay: RungLayout) -> None:
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
        rows = rows_in_order(lay, [0] + order)
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


def rows_in_order(lay: RungLayout, order: list[int]) -> dict[int, int]:
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

