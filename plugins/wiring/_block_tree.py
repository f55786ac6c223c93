"""Which edges of a graph lie on some simple path between two wires: the block-cut tree.

An edge lies on a simple path between two vertices exactly when its
biconnected block lies on the block-cut tree's path between them, so the
question is answered in linear time and no path is enumerated (RULES.md,
"Terms"). Its own module because it is graph theory, not wiring: it knows
nothing of loads, rails or supplies; ``_supply_sides`` asks it for
grounded-side-switching.
"""
from __future__ import annotations

from collections import deque
from typing import TYPE_CHECKING

from ctllint.circuit.analysis import biconnected_blocks

if TYPE_CHECKING:  # pragma: no cover
    import networkx as nx


# An undirected edge as its two wires in sorted order: a plain tuple, a
# quarter of the size of a frozenset, and there is one per element of the
# circuit while grounded-side-switching runs.
Pair = tuple[str, str]


def pair_of(a: str, b: str) -> Pair:
    return (a, b) if a <= b else (b, a)


def pairs_on_simple_paths(graph: nx.Graph, source: str, target: str) -> set[Pair]:
    """Edges (as wire pairs) that lie on at least one simple path from ``source`` to ``target``.

    An edge lies on such a path exactly when its biconnected block lies on the
    block-cut tree's path between the two: inside a 2-connected block, any
    edge lies on a simple path between any two distinct vertices. Linear in
    the graph's size; no path is enumerated.
    """
    if source == target or source not in graph or target not in graph or not nx_module().has_path(graph, source, target):
        return set()
    tree, block_edges = _block_cut_tree(graph)
    start, goal = _tree_node(tree, source), _tree_node(tree, target)
    route = nx_module().shortest_path(tree, start, goal)
    out: set[Pair] = set()
    for node in route:
        if node[0] == "B":
            out |= block_edges[node[1]]
    return out


def _block_cut_tree(graph: nx.Graph) -> tuple[nx.Graph, list[set[Pair]]]:
    tree = nx_module().Graph()
    blocks: list[set[Pair]] = []
    cuts = set(nx_module().articulation_points(graph))
    for i, edges in enumerate(nx_module().biconnected_component_edges(graph)):
        pairs = {pair_of(*e) for e in edges}
        blocks.append(pairs)
        tree.add_node(("B", i))
        for wire in {w for e in edges for w in e}:
            if wire in cuts:
                tree.add_edge(("B", i), ("C", wire))
            else:
                tree.add_edge(("B", i), ("W", wire))
    return tree, blocks


def _tree_node(tree: nx.Graph, wire: str):
    return ("C", wire) if ("C", wire) in tree else ("W", wire)


class TreeToRoot:
    """The block-cut tree of a graph, kept only as links towards one root wire.

    Answers what ``_block_cut_tree`` and a walk to the root would, with no
    tree graph built: each block knows the wire above it, each wire the block
    above it. On a large panel the tree as a graph of tuple-named nodes was
    the largest structure this rule built.
    """

    __slots__ = ("root", "blocks", "up_of_block", "up_of_wire")

    def __init__(self, edges: list[Pair], root: str):
        """``edges``: the graph's edges as wire pairs, each once."""
        self.root = root
        self.blocks: list[tuple[Pair, ...]] = []
        # A wire in more than one block is a cut vertex; the others are leaves of the tree.
        first: dict[str, int] = {}
        more: dict[str, list[int]] = {}
        for i, block in enumerate(biconnected_blocks((j, a, b) for j, (a, b) in enumerate(edges))):
            pairs = tuple(edges[j] for j in block)
            self.blocks.append(pairs)
            for w in {w for pair in pairs for w in pair}:
                if w in first:
                    more.setdefault(w, [first[w]]).append(i)
                else:
                    first[w] = i
        self.up_of_block: list[str | None] = [None] * len(self.blocks)
        self.up_of_wire: dict[str, int] = {}
        if root not in first:
            return
        seen = [False] * len(self.blocks)
        queue = deque([root])
        while queue:
            w = queue.popleft()
            for b in more.get(w) or (first[w],):
                if seen[b]:
                    continue
                seen[b] = True
                self.up_of_block[b] = w
                for pair in self.blocks[b]:
                    for x in pair:
                        if x != root and x not in self.up_of_wire:
                            self.up_of_wire[x] = b
                            if x in more:
                                queue.append(x)

    def pairs_to_root(self, wire: str) -> set[Pair]:
        """The edges of the blocks on the tree path from ``wire`` to the root."""
        out: set[Pair] = set()
        b = self.up_of_wire.get(wire)
        while b is not None:
            out.update(self.blocks[b])
            up = self.up_of_block[b]
            if up == self.root:
                break
            b = self.up_of_wire[up]
        return out


def nx_module():
    """networkx, imported when a graph is first needed: a run answered from the cache never loads it."""
    import networkx

    return networkx
