"""Which edges are on some, and on every, pair of disjoint paths: ``serves`` and ``in_series``.

The two questions of RULES.md "Terms" that a path search cannot answer
without enumerating paths (their number grows exponentially), answered on
plain edge lists from the disjoint paths ``edges.two_paths`` finds. Their
own module because each is an algorithm with its own argument:

* ``series_edges`` (``in_series``: on every energizing path) is exact: with
  the two disjoint paths Q1 and Q2 in hand, an element e of Q1 is on every
  energizing path iff some vertex x of Q2 separates, together with e, the
  supply side from the load side; the bridges of the cycle Q1+Q2 decide
  this for all e at once (prefix maxima, suffix minima and a coverage
  count: linear).
* ``serving_edges`` (``serves``: on at least one energizing path) is peeled
  down, exactly, in rounds. Simple hot-common paths through X run along the
  chain of blocks (block-cut tree) between hot and common: every element of
  a chain block other than X's own is on one, and inside X's block the
  question repeats with the block's entry and exit as the new ends. The same
  peeling is applied from X's side (the chain of blocks between X's
  terminals, the supply taken as an edge). Each round also simplifies series
  and parallel connections (a wire joining just two elements makes them one
  bundle; parallel elements are interchangeable; an element in parallel with
  X or with hot-common is on no path). When the two ends share a wire (a
  load hung directly on a rail, say), the block chain of the rest is the
  exact answer. When neither side peels any more, an element that makes a
  cut of three with X and hot-common is dropped (a cycle crosses a cut an
  even number of times). A 2-vertex separation that puts the supply side, X
  and an element in three different branches - an element bridging directly
  across the branch that holds X - is peeled off this way. Whatever remains
  after that (the core) is taken to serve X as a whole: the one known
  approximation, which ``ctllint.circuit.analysis`` explains.
"""
from __future__ import annotations

from collections import deque

from ctllint.circuit.edges import Edge, adjacency, block_chain
from ctllint.circuit.wiresets import WireSets

# Ids of the virtual edges used while peeling: the supply (hot to common) and
# the load's terminal pair. Element indices are >= 0.
_SIGMA = -1
_XI = -2

# Peeling rounds before the remaining core is taken as it stands (see the
# module docstring); real rungs need two or three.
_MAX_ROUNDS = 64


def series_edges(edges: list[Edge], q1: tuple[list[str], list[int]], q2: tuple[list[str], list[int]]) -> set[int]:
    """Edges on every pair of disjoint paths linking {hot, common} to the load.

    ``q1`` and ``q2`` are one such pair. Think of a source joined to the
    first wires of both paths and a sink joined to their last wires: an edge
    e of one path is on every pair iff, with e removed, a single vertex x of
    the other path separates source from sink. With positions along both
    paths, a bridge of the cycle (a part of the graph off the paths, or a
    chord) joins the source side to the sink side exactly when its
    attachments fall on both; the conditions for all e are read off prefix
    maxima, suffix minima and a coverage count.
    """
    (w1, e1), (w2, e2) = q1, q2
    on_path = set(e1) | set(e2)
    pos = ({w: i + 1 for i, w in enumerate(w1)}, {w: i + 1 for i, w in enumerate(w2)})
    def off(w: str) -> bool:
        return w not in pos[0] and w not in pos[1]

    parts = WireSets()  # the parts of the graph off both paths
    for eid, a, b in edges:
        if eid in on_path or a == b:
            continue
        if off(a) and off(b):
            parts.join(a, b)
    find = parts.find
    inf = float("inf")
    bridges: dict[object, list[float]] = {}  # key -> [lo1, hi1, lo2, hi2]
    for eid, a, b in edges:
        if eid in on_path or a == b:
            continue
        key: object = find(a) if off(a) else find(b) if off(b) else ("chord", eid)
        span = bridges.setdefault(key, [inf, -inf, inf, -inf])
        for w in (a, b):
            for side in (0, 1):
                p = pos[side].get(w)
                if p is not None:
                    span[2 * side] = min(span[2 * side], p)
                    span[2 * side + 1] = max(span[2 * side + 1], p)
    series: set[int] = set()
    lengths = (len(w1) + 1, len(w2) + 1)
    for main in (0, 1):
        other = 1 - main
        lm, lo_len = lengths[main], lengths[other]
        path_edges = (e1, e2)[main]
        if not path_edges:
            continue
        straddle = [0] * (lm + 2)
        best_hi = [-inf] * (lm + 2)  # max other-hi of bridges whose main span ends at t
        best_lo = [inf] * (lm + 2)  # min other-lo of bridges whose main span starts at t
        cover = [0] * (lo_len + 2)
        for span in bridges.values():
            mlo, mhi, olo, ohi = span[2 * main], span[2 * main + 1], span[2 * other], span[2 * other + 1]
            if mlo != inf:
                if mhi > mlo:
                    straddle[int(mlo)] += 1
                    straddle[int(mhi)] -= 1
                if ohi != -inf:
                    best_hi[int(mhi)] = max(best_hi[int(mhi)], ohi)
                    best_lo[int(mlo)] = min(best_lo[int(mlo)], olo)
            elif ohi - olo >= 2:
                cover[int(olo) + 1] += 1
                cover[int(ohi)] -= 1
        # uncovered[j]: vertices 1..j of the other path that no other-only bridge spans
        uncovered = [0] * (lo_len + 1)
        run = 0
        for j in range(1, lo_len):
            run += cover[j]
            uncovered[j] = uncovered[j - 1] + (1 if run == 0 else 0)
        suffix_lo = [inf] * (lm + 3)
        for t in range(lm, -1, -1):
            suffix_lo[t] = min(suffix_lo[t + 1], best_lo[t])
        run = 0
        prefix_hi = -inf
        for k in range(1, lm - 1):
            run += straddle[k]
            prefix_hi = max(prefix_hi, best_hi[k])
            if run > 0:
                continue
            lo_j = max(1, prefix_hi)
            hi_j = min(lo_len - 1, suffix_lo[k + 1])
            if lo_j > hi_j:
                continue
            lo_j, hi_j = int(lo_j), int(hi_j)
            if uncovered[hi_j] - uncovered[lo_j - 1] > 0:
                series.add(path_edges[k - 1])
    return series


def _simplify(inner: list[int], ends: dict[int, tuple[str, str]], keep: set[str], dead: tuple[frozenset, ...], merge, new_id) -> list[int]:
    """Series-parallel simplification that keeps the answer exact.

    A wire other than the four ends with one element is a dead end (its
    element is on no path); with two, both are on a path or neither, so they
    become one bundle edge. Parallel edges are interchangeable on any path:
    one bundle. An edge joining the same two vertices as hot-common or as the
    load (``dead``) closes a 2-cycle with it and is on no path through both.
    Returns the remaining edge ids (bundles get new ids from ``new_id``).
    """
    inc: dict[str, dict[int, None]] = {}
    pair: dict[frozenset, int] = {}
    live: dict[int, tuple[str, str]] = {}

    def add(eid: int, a: str, b: str) -> None:
        if a == b:
            return
        key = frozenset((a, b))
        if key in dead:
            return
        rep = pair.get(key)
        if rep is not None:
            merge(rep, eid)
            return
        pair[key] = eid
        live[eid] = (a, b)
        inc.setdefault(a, {})[eid] = None
        inc.setdefault(b, {})[eid] = None

    def remove(eid: int) -> tuple[str, str]:
        a, b = live.pop(eid)
        del pair[frozenset((a, b))]
        del inc[a][eid]
        del inc[b][eid]
        return a, b

    for eid in inner:
        add(eid, *ends[eid])
    queue = deque(inc)
    while queue:
        w = queue.popleft()
        if w in keep:
            continue
        incident = list(inc.get(w, ()))
        if len(incident) == 1:
            a, b = remove(incident[0])
            queue.append(b if a == w else a)
        elif len(incident) == 2:
            e1, e2 = incident
            a1, b1 = remove(e1)
            a2, b2 = remove(e2)
            a = b1 if a1 == w else a1
            b = b2 if a2 == w else a2
            n = new_id()
            merge(n, e1)
            merge(n, e2)
            ends[n] = (a, b)
            add(n, a, b)
            queue.extend((a, b))
    return list(live)


def _odd_cut_bridges(edges: list[Edge], s: str, t: str, u: str, v: str) -> set[int]:
    """Bridges whose removal puts s apart from t and u apart from v.

    With the virtual edges (s, t) and (u, v) added, such a bridge and the two
    virtual edges form a cut of three edges; a cycle crosses a cut an even
    number of times, so no cycle through both virtual edges uses the bridge.
    One iterative DFS with entry and exit times: linear.
    """
    adj = adjacency(edges)
    if s not in adj:
        return set()
    disc: dict[str, int] = {s: 0}
    low: dict[str, int] = {s: 0}
    done: dict[str, int] = {}
    parent_edge: dict[str, int | None] = {s: None}
    tree: list[tuple[int, str, str]] = []  # (edge, parent, child)
    stack = [(s, iter(adj[s]))]
    clock = 1
    while stack:
        x, it = stack[-1]
        descended = False
        for y, eid in it:
            if eid == parent_edge[x]:
                continue
            if y not in disc:
                disc[y] = low[y] = clock
                clock += 1
                parent_edge[y] = eid
                tree.append((eid, x, y))
                stack.append((y, iter(adj[y])))
                descended = True
                break
            if disc[y] < low[x]:
                low[x] = disc[y]
        if descended:
            continue
        stack.pop()
        done[x] = clock
        clock += 1
        if stack:
            p = stack[-1][0]
            if low[x] < low[p]:
                low[p] = low[x]

    def below(child: str, w: str) -> bool:
        return w in disc and disc[child] <= disc[w] and done[w] <= done[child]

    out = set()
    for eid, parent, child in tree:
        if low[child] > disc[parent] and below(child, s) != below(child, t) and below(child, u) != below(child, v):
            out.add(eid)
    return out


def serving_edges(edges: list[Edge], s: str, t: str, u: str, v: str) -> set[int] | None:
    """Real edges on some cycle through the virtual edges (s, t) and (u, v).

    That is, on some pair of disjoint paths linking {s, t} to {u, v}. Peels
    block chains from both sides, with series-parallel simplification at
    each round, as the module docstring says. None when there is no such
    cycle.
    """
    ends = {eid: (a, b) for eid, a, b in edges if a != b}
    parent: dict[int, int] = {}

    def find(x: int) -> int:
        root = x
        while parent.get(root, root) != root:
            root = parent[root]
        while parent.get(x, x) != root:
            parent[x], x = root, parent[x]
        return root

    def merge(keep: int, other: int) -> None:
        ra, rb = find(keep), find(other)
        if ra != rb:
            parent[rb] = ra

    counter = [_XI]

    def new_id() -> int:
        counter[0] -= 1
        return counter[0]

    inner = list(ends)
    served: set[int] = set()
    turn, stall = 0, 0
    for _ in range(_MAX_ROUNDS):
        if {s, t} == {u, v}:
            break
        before = len(inner)
        inner = _simplify(inner, ends, {s, t, u, v}, (frozenset((s, t)), frozenset((u, v))), merge, new_id)
        simplified = len(inner) != before
        shared = {s, t} & {u, v}
        if shared:
            w = shared.pop()
            p = t if s == w else s
            q = v if u == w else u
            rest = [(e, *ends[e]) for e in inner if w not in ends[e]]
            chain = block_chain(rest, p, q)
            if chain is None:
                return None
            for block, _, _ in chain:
                served.update(block)
            break
        virtual, virtual_ends, a, b = (_XI, (u, v), s, t) if turn == 0 else (_SIGMA, (s, t), u, v)
        sub = [(e, *ends[e]) for e in inner] + [(virtual, *virtual_ends)]
        chain = block_chain(sub, a, b)
        if chain is None:
            return None
        j = next((i for i, (block, _, _) in enumerate(chain) if virtual in block), None)
        if j is None:
            return None
        progressed = simplified or len(chain) > 1 or len(chain[0][0]) != len(sub)
        for i, (block, _, _) in enumerate(chain):
            if i != j:
                served.update(block)
        block, entry, exit_ = chain[j]
        inner = [e for e in block if e != virtual]
        if turn == 0:
            s, t = entry, exit_
        else:
            u, v = entry, exit_
        stall = 0 if progressed else stall + 1
        if stall >= 2:
            odd = _odd_cut_bridges([(e, *ends[e]) for e in inner], s, t, u, v)
            if odd:
                inner = [e for e in inner if e not in odd]
                stall = 0
            else:
                served.update(inner)  # the core (see the module docstring)
                break
        turn ^= 1
    else:
        served.update(inner)
    roots = {find(x) for x in served}
    return {eid for eid, a, b in edges if a != b and find(eid) in roots}

