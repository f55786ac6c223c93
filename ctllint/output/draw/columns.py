"""The columns of a rung: each wire (node) gets a column, each path is cut into runs that go
left to right, and each element a slot between two columns.

Its own module because it is the first step of the layout and the one place that decides
which way round a path is drawn: each wire is a node and each element an edge; a node's
column is the longest run of elements from the hot rail (contacts pack to the left), except
that a load and whatever follows it pack to the right, next to the common rail, as loads sit
on a ladder diagram.
"""
from __future__ import annotations

from dataclasses import dataclass

from ctllint.output.draw.model import Placed, RowPath, RungLayout
from ctllint.reading.model import Element, Rung, Schematic, Supply


def rung_supply(sch: Schematic, rung: Rung, previous: Supply | None) -> Supply | None:
    """The supply ``rung`` is drawn on: the first rail its paths touch, else the rung before's."""
    for path in rung.paths:
        for wire in (path.wires[0], path.wires[-1], *path.wires):
            sup = sch.supply_of_rail(wire)
            if sup is not None:
                return sup
    return previous or next(iter(sch.supplies.values()), None)


class Graph:
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
class Chain:
    """One path of the rung, in file order, with each node's graph name."""

    nodes: list[str]
    elements: list[Element]
    edges: list[tuple[str, str]]   # per element: the graph edge, left to right


def plan_rung(sch: Schematic, rung: Rung, supply: Supply | None) -> tuple[RungLayout, Graph, list[Chain], set[str], dict[str, int]]:
    """The rung's graph, its paths as chains, the nodes that pack to the right, and each node's
    column counted from the hot rail; the layout is finished by ``finish_columns``."""
    hot = supply.hot if supply else None
    common = supply.common if supply else None
    g = Graph()
    wire_of: dict[str, str] = {}
    chains: list[Chain] = []
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
        chains.append(Chain(nodes, elements, edges))
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


def finish_columns(lay: RungLayout, g: Graph, chains: list[Chain], right_side: set[str], asap: dict[str, int], last: int) -> None:
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
