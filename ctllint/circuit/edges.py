"""Connectivity on plain edge lists: biconnected blocks, block chains, two disjoint paths.

Pure functions on ``(id, wire, wire)`` tuples, with no circuit, element or
supply in sight: the circuit's analyses (``routes``, ``serving``) and the
rules (``biconnected_blocks``) call them on the few edges they care about.
Kept apart from the circuit so that each algorithm can be read, and tested,
on its own; all are linear in the edges.
"""
from __future__ import annotations

from array import array
from collections import deque
from typing import Iterable

Edge = tuple[int, str, str]  # (element index or virtual id, one wire, other wire)


def adjacency(edges: Iterable[Edge]) -> dict[str, list[tuple[str, int]]]:
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


def block_chain(edges: list[Edge], s: str, t: str) -> list[tuple[list[int], str, str]] | None:
    """Blocks on the block-cut tree path from ``s`` to ``t``, in order.

    Each item is (edge ids of the block, entry vertex, exit vertex). An edge
    lies on some simple s-t path iff its block is in this chain. None when t
    cannot be reached from s. Iterative Tarjan, parallel edges kept apart by
    their ids.
    """
    if s == t:
        return None
    adj = adjacency(edges)
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


def two_paths(edges: list[Edge], h: str, c: str, u: str, v: str, skip: frozenset[int] = frozenset()):
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

