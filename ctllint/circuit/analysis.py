"""The circuit graph of a schematic and the questions rules ask of it.

``Circuit(schematic)`` offers one ``networkx.MultiGraph`` (built on first
use): wires are nodes, each element is an edge keyed by ``element.index``
with ``element=<Element>``.
The analyses below are computed lazily and cached, since many rules ask the
same questions of the same loads.

Terms are those of RULES.md. An *energizing path* of load X is a simple path
from its supply's hot rail to X, through X, and on to the same supply's
common rail, passing no other load. It passes hot only at its start, common
only at its end, and never through a rail of another supply. "On paper"
means that every contact may close.

How the answers are found without enumerating paths (their number grows
exponentially):

* The *region* of X is the set of non-rail wires joined to X's terminals by
  non-load elements without passing any rail, plus the two rails. Only
  elements of the region can be on an energizing path of X, so other rungs
  hanging on the same rails never "serve" X, and every analysis is linear in
  the size of X's own rung.
* An energizing path exists iff there are two vertex-disjoint paths in the
  region (X and other loads left out) linking {hot, common} to X's two
  terminals, in either pairing (Menger). Two augmenting paths of a unit
  vertex-capacity flow find them, and give the path reported in messages.
* ``in_series`` (on every energizing path) is exact: with the two disjoint
  paths Q1 and Q2 in hand, an element e of Q1 is on every energizing path iff
  some vertex x of Q2 separates, together with e, the supply side from the
  load side; the bridges of the cycle Q1+Q2 decide this for all e at once
  (prefix maxima, suffix minima and a coverage count: linear).
* ``serves`` (on at least one energizing path) is peeled down, exactly, in
  rounds. Simple hot-common paths through X run along the chain of blocks
  (block-cut tree) between hot and common: every element of a chain block
  other than X's own is on one, and inside X's block the question repeats
  with the block's entry and exit as the new ends. The same peeling is
  applied from X's side (the chain of blocks between X's terminals, the
  supply taken as an edge). Each round also simplifies series and parallel
  connections (a wire joining just two elements makes them one bundle;
  parallel elements are interchangeable; an element in parallel with X or
  with hot-common is on no path). When the two ends share a wire (a load
  hung directly on a rail, say), the block chain of the rest is the exact
  answer. When neither side peels any more, an element that makes a cut of
  three with X and hot-common is dropped (a cycle crosses a cut an even
  number of times). A 2-vertex separation that puts the supply side, X and
  an element in three different branches - an element bridging directly
  across the branch that holds X - is peeled off this way.

The one known approximation: whatever remains after peeling (a core that no
block chain, series-parallel step or odd cut reduces further; SPQR "R"
structure) is taken to serve X as a whole. An element so counted that is on
no energizing path of X always lies on a path from hot to common through no
load at all - a short circuit on paper, which ``short_circuits`` reports -
so circuits without a short circuit get exact answers. (Exactness there too
would need the SPQR tree of the core.) ``in_series`` has no approximation.

Elements whose role is unknown (an undeclared tag or a part the kind lacks,
reported by other rules) are left out of every analysis, as if not drawn.
"""
from __future__ import annotations

import functools
import gc
import itertools
from array import array
from collections import deque
from functools import cached_property
from typing import TYPE_CHECKING, Callable, Iterable, TypeVar

from typing import TYPE_CHECKING as _TYPE_CHECKING

if _TYPE_CHECKING:  # pragma: no cover
    import networkx as nx

from ctllint.circuit.paths import _gc_paused, path_text  # noqa: F401 - path_text is used by rules through this module
from ctllint.circuit.wiresets import WireSets
from ctllint.reading.model import Element, Schematic, Supply

if TYPE_CHECKING:  # pragma: no cover
    from ctllint.circuit.simulate import Simulator

LOAD = "load"

# Ids of the virtual edges used while peeling: the supply (hot to common) and
# the load's terminal pair. Element indices are >= 0.
_SIGMA = -1
_XI = -2

# Peeling rounds before the remaining core is taken as it stands (see the
# module docstring); real rungs need two or three.
_MAX_ROUNDS = 64

Edge = tuple[int, str, str]  # (element index or virtual id, one wire, other wire)

F = TypeVar("F", bound=Callable)


def _index(el: Element) -> int:
    return el.index


# ---------------------------------------------------------------------------
# graph helpers (pure functions on edge lists; all linear)
# ---------------------------------------------------------------------------


class _Parts:
    """Connected parts of the non-rail wires, joined by the given elements.

    Rails are never passed through: an element reaching a rail ends there.
    ``members[root]`` lists the elements touching the part (file order),
    ``rails_of[root]`` the rails those elements reach.
    """

    def __init__(self, elements: list[Element], rails: set[str]):
        sets = WireSets()
        for el in elements:
            for w in (el.left, el.right):
                if w not in rails:
                    sets.find(w)  # a non-rail wire is a part of its own to begin with
            if el.left not in rails and el.right not in rails:
                sets.join(el.left, el.right)
        find = sets.find
        self._find = find
        self._parent = sets.parent
        self.members: dict[str, tuple[Element, ...]] = {}  # type: ignore[assignment]  # lists while built
        self.rails_of: dict[str, tuple[str, ...]] = {}  # type: ignore[assignment]
        for el in elements:
            roots = []
            for w in (el.left, el.right):
                if w not in rails:
                    r = find(w)
                    if r not in roots:
                        roots.append(r)
            for r in roots:
                self.members.setdefault(r, []).append(el)
                seen = self.rails_of.setdefault(r, [])
                for w in (el.left, el.right):
                    if w in rails and w not in seen:
                        seen.append(w)
        # Kept while the rules run: tuples (no spare room), and one tuple for
        # each set of rails, since most parts reach the same one or two.
        self.members = {r: tuple(m) for r, m in self.members.items()}
        shared: dict[tuple[str, ...], tuple[str, ...]] = {}
        self.rails_of = {r: shared.setdefault(t, t) for r, t in ((r, tuple(v)) for r, v in self.rails_of.items())}

    def root(self, wire: str) -> str | None:
        return self._find(wire) if wire in self._parent else None

    def reach(self, wire: str, rails: set[str]) -> set[str]:
        """Rails that ``wire`` reaches (a rail reaches itself)."""
        if wire in rails:
            return {wire}
        r = self.root(wire)
        return set(self.rails_of.get(r, ())) if r is not None else set()


def _adjacency(edges: Iterable[Edge]) -> dict[str, list[tuple[str, int]]]:
    adj: dict[str, list[tuple[str, int]]] = {}
    for eid, a, b in edges:
        if a == b:
            continue  # a self-loop is on no simple path
        adj.setdefault(a, []).append((b, eid))
        adj.setdefault(b, []).append((a, eid))
    return adj


def biconnected_blocks(edges: Iterable[Edge]) -> list[list[int]]:
    """The biconnected blocks of a graph given as (id, wire, wire) edges: the edge ids of each.

    Two edges are in one block exactly when some simple cycle passes both;
    a bridge is a block of its own, parallel edges share a block, self-loops
    are in none. Iterative Tarjan, linear in the edges, over wires numbered
    0, 1, 2, ... and flat arrays of numbers: the rules use it instead of
    building a graph object of the whole circuit (on a large panel that
    graph was the largest thing a rule held).
    """
    number: dict[str, int] = {}
    ids: list[int] = []
    ends = array("l")  # ends[2k], ends[2k+1]: the wires of the k-th edge
    for eid, a, b in edges:
        if a == b:
            continue  # a self-loop is on no cycle with another edge
        ids.append(eid)
        ends.append(number.setdefault(a, len(number)))
        ends.append(number.setdefault(b, len(number)))
    n = len(number)
    del number
    # Adjacency as one array: the edge slots of vertex v are order[first[v]:first[v + 1]].
    first = array("l", bytes(8 * (n + 1)))
    for v in ends:
        first[v + 1] += 1
    for v in range(n):
        first[v + 1] += first[v]
    fill = array("l", first)
    order = array("l", bytes(8 * len(ends)))
    for slot, v in enumerate(ends):
        order[fill[v]] = slot  # slot = 2k or 2k+1: edge k, seen from one of its ends
        fill[v] += 1
    del fill
    unseen = -1
    disc = array("l", [unseen]) * n
    low = array("l", bytes(8 * n))
    via = array("l", [unseen]) * n  # the edge a vertex was reached by
    blocks: list[list[int]] = []
    estack: list[int] = []
    clock = 0
    for root in range(n):
        if disc[root] != unseen:
            continue
        disc[root] = low[root] = clock
        clock += 1
        stack = [root]
        cursor = [first[root]]  # the next adjacency slot to look at, per stack entry
        while stack:
            v = stack[-1]
            i = cursor[-1]
            end = first[v + 1]
            descended = False
            while i < end:
                slot = order[i]
                i += 1
                k = slot >> 1
                if k == via[v]:
                    continue
                w = ends[slot ^ 1]
                if disc[w] == unseen:
                    disc[w] = low[w] = clock
                    clock += 1
                    via[w] = k
                    estack.append(k)
                    cursor[-1] = i
                    stack.append(w)
                    cursor.append(first[w])
                    descended = True
                    break
                if disc[w] < disc[v]:  # back edge to an ancestor (or a parallel edge)
                    if disc[w] < low[v]:
                        low[v] = disc[w]
                    estack.append(k)
            if descended:
                continue
            stack.pop()
            cursor.pop()
            if not stack:
                break
            p = stack[-1]
            if low[v] < low[p]:
                low[p] = low[v]
            if low[v] >= disc[p]:
                block: list[int] = []
                while True:
                    k = estack.pop()
                    block.append(ids[k])
                    if k == via[v]:
                        break
                blocks.append(block)
    return blocks


def _block_chain(edges: list[Edge], s: str, t: str) -> list[tuple[list[int], str, str]] | None:
    """Blocks on the block-cut tree path from ``s`` to ``t``, in order.

    Each item is (edge ids of the block, entry vertex, exit vertex). An edge
    lies on some simple s-t path iff its block is in this chain. None when t
    cannot be reached from s. Iterative Tarjan, parallel edges kept apart by
    their ids.
    """
    if s == t:
        return None
    adj = _adjacency(edges)
    if s not in adj or t not in adj:
        return None
    disc = {s: 0}
    low = {s: 0}
    parent_edge: dict[str, int | None] = {s: None}
    block_of_edge: dict[int, int] = {}
    blocks: list[list[int]] = []
    tops: list[str] = []
    estack: list[int] = []
    stack = [(s, iter(adj[s]))]
    clock = 1
    while stack:
        v, it = stack[-1]
        descended = False
        for w, eid in it:
            if eid == parent_edge[v]:
                continue
            if w not in disc:
                disc[w] = low[w] = clock
                clock += 1
                parent_edge[w] = eid
                estack.append(eid)
                stack.append((w, iter(adj[w])))
                descended = True
                break
            if disc[w] < disc[v]:  # back edge to an ancestor (or a parallel edge)
                if disc[w] < low[v]:
                    low[v] = disc[w]
                estack.append(eid)
        if descended:
            continue
        stack.pop()
        if not stack:
            break
        p = stack[-1][0]
        if low[v] < low[p]:
            low[p] = low[v]
        if low[v] >= disc[p]:
            block: list[int] = []
            while True:
                e = estack.pop()
                block.append(e)
                block_of_edge[e] = len(blocks)
                if e == parent_edge[v]:
                    break
            blocks.append(block)
            tops.append(p)
    if t not in disc:
        return None
    chain = []
    v = t
    while v != s:
        b = block_of_edge[parent_edge[v]]  # type: ignore[index]
        chain.append((blocks[b], tops[b], v))
        v = tops[b]
    chain.reverse()
    return chain


def _two_paths(edges: list[Edge], h: str, c: str, u: str, v: str, skip: frozenset[int] = frozenset()):
    """Two vertex-disjoint paths linking {h, c} to {u, v}, in either pairing.

    Returns ((wires, edge ids) from h, (wires, edge ids) from c), each ending
    at u or v, or None when there are not two. Unit vertex capacities, two
    BFS augmentations: linear.
    """
    if h == c or u == v:
        return None
    ids: dict[str, int] = {}
    names: list[str] = []

    def vid(w: str) -> int:
        i = ids.get(w)
        if i is None:
            i = ids[w] = len(names)
            names.append(w)
        return i

    for w in (h, c, u, v):
        vid(w)
    live = [(eid, a, b) for eid, a, b in edges if a != b and eid not in skip]
    for _, a, b in live:
        vid(a)
        vid(b)
    n = len(names)
    src, snk = 2 * n, 2 * n + 1
    head: list[list[int]] = [[] for _ in range(2 * n + 2)]
    to: list[int] = []
    cap: list[int] = []
    tag: list[int | None] = []

    def add(x: int, y: int, t: int | None) -> None:
        head[x].append(len(to))
        to.append(y)
        cap.append(1)
        tag.append(t)
        head[y].append(len(to))
        to.append(x)
        cap.append(0)
        tag.append(None)

    for i in range(n):
        add(2 * i, 2 * i + 1, None)  # vertex capacity: in -> out
    add(src, 2 * ids[h], None)
    add(src, 2 * ids[c], None)
    add(2 * ids[u] + 1, snk, None)
    add(2 * ids[v] + 1, snk, None)
    for eid, a, b in live:
        ia, ib = ids[a], ids[b]
        add(2 * ia + 1, 2 * ib, eid)
        add(2 * ib + 1, 2 * ia, eid)
    for _ in range(2):
        prev = [-1] * (2 * n + 2)
        prev[src] = -2
        queue = deque([src])
        while queue and prev[snk] == -1:
            x = queue.popleft()
            for e in head[x]:
                y = to[e]
                if cap[e] > 0 and prev[y] == -1:
                    prev[y] = e
                    queue.append(y)
        if prev[snk] == -1:
            return None
        y = snk
        while y != src:
            e = prev[y]
            cap[e] -= 1
            cap[e ^ 1] += 1
            y = to[e ^ 1]
    found = {}
    for e in head[src]:
        if e % 2 or cap[e]:
            continue
        x = to[e]  # in-node of h or c
        start = names[x // 2]
        wires = [start]
        eids: list[int] = []
        while True:
            out = x + 1
            nxt = None
            for f in head[out]:
                if f % 2 == 0 and cap[f] == 0 and f != (e ^ 1):
                    nxt = f
                    break
            if nxt is None or to[nxt] == snk:
                break
            eids.append(tag[nxt])  # type: ignore[arg-type]
            x = to[nxt]
            wires.append(names[x // 2])
        found[start] = (tuple(wires), tuple(eids))  # kept per load while the rules run
    if h not in found or c not in found:
        return None
    return found[h], found[c]


def _series_edges(edges: list[Edge], q1: tuple[list[str], list[int]], q2: tuple[list[str], list[int]]) -> set[int]:
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
    adj = _adjacency(edges)
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


def _serving_edges(edges: list[Edge], s: str, t: str, u: str, v: str) -> set[int] | None:
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
            chain = _block_chain(rest, p, q)
            if chain is None:
                return None
            for block, _, _ in chain:
                served.update(block)
            break
        virtual, virtual_ends, a, b = (_XI, (u, v), s, t) if turn == 0 else (_SIGMA, (s, t), u, v)
        sub = [(e, *ends[e]) for e in inner] + [(virtual, *virtual_ends)]
        chain = _block_chain(sub, a, b)
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


def _compact(ids: set[int]) -> "set[int] | tuple[int, ...] | frozenset[int]":
    """A set of element indices to keep while the rules run, in less room.

    Small ones (most loads have a handful of elements on their paths) become
    sorted tuples: ``in``, ``len`` and iteration answer the same, in a third
    of the memory of a set; larger ones stay hashed.
    """
    if len(ids) <= 16:
        return tuple(sorted(ids))
    return frozenset(ids)


# ---------------------------------------------------------------------------
# per-load facts
# ---------------------------------------------------------------------------


class _Route:
    """What is known of one load on one supply: its region and one path."""

    __slots__ = ("supply", "elements", "paths", "path", "_serve", "_series")

    def __init__(self, supply: Supply, elements: list[Element], paths):
        self.supply = supply
        # The region as its elements (index order), not as edge tuples: routes
        # are kept for every load while the rules run, and a tuple per edge
        # held the largest share of them; ``edges`` builds the tuples for the
        # analysis at hand.
        self.elements = elements
        self.paths = paths  # (q1, q2) from _two_paths, or None
        self.path: list[int] | None = None
        self._serve: set[int] | None = None
        self._series: set[int] | None = None

    @property
    def edges(self) -> list[Edge]:
        return _edges(self.elements)

    def settle(self) -> None:
        """Let the two paths go once the one path and the series set are known: nothing else reads them."""
        if self.path is not None and self._series is not None:
            self.paths = _SETTLED


# Stands for a route's two paths once they are no longer needed: not None, so
# "the load has an energizing path" still reads the same.
_SETTLED = ((), ())


def _edges(elements: list[Element]) -> list[Edge]:
    return [(el.index, el.left, el.right) for el in elements]


class Circuit:
    """A schematic as a graph, with the shared analyses rules ask for."""

    @_gc_paused
    def __init__(self, schematic: Schematic):
        self.schematic = schematic
        self._elements: list[Element] = schematic.elements
        # Element by index. The loader numbers elements 0, 1, 2, ... in file
        # order, so the schematic's own element list answers ``[index]`` at no
        # cost; a dict (an entry and an int per element) only for a hand-built
        # schematic numbered otherwise.
        if all(el.index == i for i, el in enumerate(self._elements)):
            self._by_index: list[Element] | dict[int, Element] = self._elements
        else:
            self._by_index = {el.index: el for el in self._elements}
        self._supplies = [s for s in schematic.supplies.values()]
        self._rail_supply: dict[str, Supply] = {}
        for s in self._supplies:
            for w in (s.hot, s.common):
                self._rail_supply.setdefault(w, s)
        self._routes: dict[int, _Route | None] = {}
        self._loose_routes: dict[int, tuple[_Route, Element] | None] = {}

    @cached_property
    @_gc_paused
    def graph(self) -> nx.MultiGraph:
        """The circuit as a ``networkx.MultiGraph``: wires are nodes, each element an edge.

        Edges are keyed by ``element.index`` with ``element=<Element>``. Built
        on first use: none of the analyses below need it, and on a large
        panel it is one of the largest structures alive (several times the
        file's size), so a run whose rules never ask for it never pays for it.
        """
        graph = _nx().MultiGraph()
        for rung in self.schematic.rungs:
            for path in rung.paths:
                graph.add_nodes_from(path.wires)
        for el in self._elements:
            graph.add_edge(el.left, el.right, key=el.index, element=el)
        return graph

    # -- plain facts ----------------------------------------------------
    @cached_property
    def rails(self) -> set[str]:
        """Every supply's hot and common wire names."""
        return set(self._rail_supply)

    @cached_property
    def loads(self) -> list[Element]:
        """Load elements (coils, solenoids, lights, horns, PLC inputs), file order."""
        return [el for el in self._elements if el.role == LOAD]

    def elements_of(self, tag: str) -> list[Element]:
        """Every element of device ``tag``, file order."""
        return list(self._tag_elements.get(tag, ()))

    @cached_property
    def _tag_elements(self) -> dict[str, list[Element]]:
        out: dict[str, list[Element]] = {}
        for el in self._elements:
            out.setdefault(el.tag, []).append(el)
        return {tag: tuple(els) for tag, els in out.items()}  # type: ignore[misc]

    def wire_degree(self, wire: str) -> int:
        """Element ends at ``wire`` (a self-loop counts twice)."""
        return self.graph.degree(wire) if wire in self.graph else 0

    def simulator(self) -> "Simulator":
        """A new behaviour simulator of this circuit (FORMAT.md "Behaviour model")."""
        from ctllint.circuit.simulate import Simulator

        return Simulator(self)

    # -- parts --------------------------------------------------------------
    @cached_property
    def _known(self) -> list[Element]:
        return [el for el in self._elements if el.role]

    @cached_property
    def _non_load_parts(self) -> _Parts:
        return _Parts([el for el in self._known if el.role != LOAD], self.rails)

    @cached_property
    def _all_parts(self) -> _Parts:
        return _Parts(self._known, self.rails)

    def _candidates(self, load: Element, parts: _Parts) -> list[Supply]:
        """Supplies whose hot reaches one terminal of ``load`` and common the other."""
        ra = parts.reach(load.left, self.rails)
        rb = parts.reach(load.right, self.rails)
        out = []
        for s in self._supplies:
            if s.hot == s.common:
                continue
            if (s.hot in ra and s.common in rb) or (s.common in ra and s.hot in rb):
                out.append(s)
        return out

    def _region(self, load: Element, supply: Supply, parts: _Parts) -> list[Element]:
        """Elements that can be on a path hot-load-common (the load left out), index order."""
        allowed = {supply.hot, supply.common}
        seen: set[int] = set()
        region: list[Element] = []
        for w in (load.left, load.right):
            if w in self.rails:
                continue
            root = parts.root(w)
            for el in parts.members.get(root, ()) if root is not None else ():
                if el is load or el.index in seen:
                    continue
                seen.add(el.index)
                if any(x in self.rails and x not in allowed for x in (el.left, el.right)):
                    continue  # another supply's rail is never passed
                region.append(el)
        region.sort(key=_index)
        return tuple(region)  # type: ignore[return-value]  # kept per load: no spare room

    def _route(self, load: Element) -> _Route | None:
        if load.index in self._routes:
            return self._routes[load.index]
        route = None
        if load.role == LOAD:
            first = None
            for s in self._candidates(load, self._non_load_parts):
                region = self._region(load, s, self._non_load_parts)
                r = _Route(s, region, _two_paths(_edges(region), s.hot, s.common, load.left, load.right))
                if first is None:
                    first = r
                if r.paths is not None:
                    route = r
                    break
            route = route or first
        self._routes[load.index] = route
        return route

    @staticmethod
    def _assemble(load: Element, paths) -> tuple[int, ...]:
        (_, from_hot), (_, from_common) = paths
        return (*from_hot, load.index, *reversed(from_common))

    def _serve_set(self, load: Element) -> set[int]:
        route = self._route(load)
        if route is None or route.paths is None:
            return set()
        if route._serve is None:
            s = route.supply
            found = _serving_edges(route.edges, s.hot, s.common, load.left, load.right)
            route._serve = _compact(found or set())
        return route._serve

    def _series_set(self, load: Element) -> set[int]:
        route = self._route(load)
        if route is None or route.paths is None:
            return set()
        if route._series is None:
            route._series = _compact(_series_edges(route.edges, *route.paths))
            route.settle()
        return route._series

    # -- energizing paths ------------------------------------------------
    @_gc_paused
    def supply_of(self, load: Element) -> Supply | None:
        """The supply whose hot reaches one terminal of ``load`` and common the other.

        Reaching is through non-load elements, on paper. Where several do, the
        first in ``schematic.supplies`` order for which the load has an
        energizing path, else the first.
        """
        route = self._route(load)
        return route.supply if route else None

    def has_energizing_path(self, load: Element, without: Iterable[Element] | frozenset[int] = ()) -> bool:
        """Whether ``load`` has an energizing path once ``without`` (elements, or indices) are removed."""
        return self.energizing_path(load, without) is not None

    @_gc_paused
    def energizing_path(self, load: Element, without: Iterable[Element] | frozenset[int] = ()) -> list[Element] | None:
        """One energizing path of ``load`` avoiding ``without``, hot to common, or None."""
        route = self._route(load)
        if route is None or route.paths is None:
            return None
        # ``without`` holds elements, or element indices (``cut`` builds a
        # reusable set of them once for callers asking many times).
        if isinstance(without, frozenset) and all(isinstance(x, int) for x in itertools.islice(without, 1)):
            skip = without
        else:
            skip = frozenset(x if isinstance(x, int) else x.index for x in without)
        if load.index in skip:
            return None
        if route.path is None:
            route.path = self._assemble(load, route.paths)
            route.settle()
        # Fast answers from what is already known of this load, checked from
        # the smaller side so a large cut costs no more than a small one.
        series = self._series_set(load)
        if len(skip) <= len(series) and any(i in series for i in skip) or len(skip) > len(series) and any(i in skip for i in series):
            return None  # an element on every energizing path is removed
        if not any(i in skip for i in route.path):
            ids = route.path  # the known path survives the cut
        else:
            s = route.supply
            paths = _two_paths(route.edges, s.hot, s.common, load.left, load.right, skip)
            if paths is None:
                return None
            ids = self._assemble(load, paths)
        return [self._by_index[i] for i in ids]

    @staticmethod
    def cut(elements: Iterable[Element]) -> frozenset[int]:
        """A reusable ``without`` for many energizing-path questions with the same elements removed."""
        return frozenset(el.index for el in elements)

    @_gc_paused
    def serves(self, element: Element, load: Element) -> bool:
        """Whether ``element`` is on at least one energizing path of ``load`` (not itself)."""
        return element is not load and element.index in self._serve_set(load)

    @_gc_paused
    def serving(self, load: Element) -> list[Element]:
        """Elements on at least one energizing path of ``load``, itself excluded, file order."""
        return [self._by_index[i] for i in sorted(self._serve_set(load))]

    @_gc_paused
    def served_loads(self, element: Element) -> list[Element]:
        """Loads that ``element`` serves, file order."""
        return list(self._served_by.get(element.index, ()))

    @cached_property
    def _served_by(self) -> dict[int, list[Element]]:
        out: dict[int, list[Element]] = {}
        for load in self.loads:
            for i in sorted(self._serve_set(load)):
                out.setdefault(i, []).append(load)
        return {i: tuple(loads) for i, loads in out.items()}  # type: ignore[misc]

    @_gc_paused
    def in_series(self, element: Element, load: Element) -> bool:
        """Whether ``element`` is on every energizing path of ``load`` (and there is one)."""
        return element is not load and element.index in self._series_set(load)

    # -- wiring faults ---------------------------------------------------
    @_gc_paused
    def short_circuits(self) -> list[tuple[Supply, list[Element]]]:
        """Paths of non-load elements joining a supply's hot to its common, on paper.

        One path per element leaving hot (when it leads to common), each a
        shortest one, ordered from hot; supplies in file order, then by
        that first element.
        """
        return list(self._shorts)

    @cached_property
    def _shorts(self) -> list[tuple[Supply, list[Element]]]:
        parts = self._non_load_parts
        rails = self.rails
        out: list[tuple[Supply, list[Element]]] = []
        for s in self._supplies:
            h, c = s.hot, s.common
            if h == c:
                continue
            found: list[tuple[Supply, list[Element]]] = []
            trees: dict[str, dict[str, Element]] = {}
            for el in self._known:
                if el.role == LOAD or h not in (el.left, el.right) or el.left == el.right:
                    continue
                other = el.right if el.left == h else el.left
                if other == c:
                    found.append((s, [el]))
                    continue
                if other in rails:
                    continue
                root = parts.root(other)
                if root is None or c not in parts.rails_of.get(root, ()):
                    continue
                if root not in trees:
                    trees[root] = self._tree_to(c, root, parts)
                toward = trees[root]
                if other not in toward:
                    continue
                path = [el]
                w = other
                while w != c:
                    step = toward[w]
                    path.append(step)
                    w = step.right if step.left == w else step.left
                found.append((s, path))
            out.extend(found)
        return out

    def _tree_to(self, rail: str, root: str, parts: _Parts) -> dict[str, Element]:
        """BFS tree of part ``root`` toward ``rail``: wire -> next element."""
        rails = self.rails
        members = parts.members.get(root, ())
        adj: dict[str, list[Element]] = {}
        toward: dict[str, Element] = {}
        queue: deque[str] = deque()
        for el in members:
            if el.left == el.right:
                continue
            if rail in (el.left, el.right):
                w = el.right if el.left == rail else el.left
                if w not in rails and w not in toward:
                    toward[w] = el
                    queue.append(w)
            elif el.left not in rails and el.right not in rails:
                adj.setdefault(el.left, []).append(el)
                adj.setdefault(el.right, []).append(el)
        while queue:
            w = queue.popleft()
            for el in adj.get(w, ()):
                x = el.right if el.left == w else el.left
                if x not in toward:
                    toward[x] = el
                    queue.append(x)
        return toward

    @_gc_paused
    def reaches_rail_only_through_loads(self, load: Element) -> list[Element]:
        """For a load with no energizing path, the other loads a hot-load-common path needs.

        The loads on every such path (other loads allowed) where there are
        some, else those on one such path; empty when the load has an
        energizing path, or when no path exists even through other loads
        (an open circuit).
        """
        if load.role != LOAD or self.has_energizing_path(load):
            return []
        found = self._loose_route(load)
        if found is None:
            return []
        route, _ = found
        loads = {i for i in _series_edges(route.edges, *route.paths) if self._by_index[i].role == LOAD}
        if not loads:
            ids = self._assemble(load, route.paths)
            loads = {i for i in ids if i != load.index and self._by_index[i].role == LOAD}
        return [self._by_index[i] for i in sorted(loads)]

    def _loose_route(self, load: Element) -> tuple[_Route, Element] | None:
        if load.index not in self._loose_routes:
            result = None
            parts = self._all_parts
            for s in self._candidates(load, parts):
                region = self._region(load, s, parts)
                paths = _two_paths(_edges(region), s.hot, s.common, load.left, load.right)
                if paths is not None:
                    result = (_Route(s, region, paths), load)
                    break
            self._loose_routes[load.index] = result
        return self._loose_routes[load.index]

    @_gc_paused
    def supply_cross(self) -> list[tuple[Element, Supply, Supply]]:
        """Elements (loads included) joining the rails of two different supplies.

        For each connected part of the circuit (rails not passed through),
        the supply whose rail it touches first (file order) is the first
        supply; for each other supply it touches, the first element touching
        that supply's rail is reported as (element, first, second). An
        element directly between two supplies' rails is reported as
        (element, supply of its left rail, supply of its right rail).
        """
        return list(self._cross)

    @cached_property
    def _cross(self) -> list[tuple[Element, Supply, Supply]]:
        parts = self._all_parts
        rails = self.rails
        found: list[tuple[Element, Supply, Supply]] = []
        for el in self._known:
            if el.left in rails and el.right in rails:
                a, b = self._rail_supply[el.left], self._rail_supply[el.right]
                if a is not b:
                    found.append((el, a, b))
        for root, members in parts.members.items():
            first: Supply | None = None
            reported: set[str] = set()
            for el in members:
                for w in (el.left, el.right):
                    if w not in rails:
                        continue
                    s = self._rail_supply[w]
                    if first is None:
                        first = s
                    elif s is not first and s.name not in reported:
                        reported.add(s.name)
                        found.append((el, first, s))
        found.sort(key=lambda item: item[0].index)
        return found


def _nx():
    """networkx, imported when a graph is first needed: a run answered from the cache never loads it."""
    import networkx

    return networkx
