"""Grounded-side-switching's model of a grounded supply: the elements between a load and common.

The circuit's non-load elements as wire pairs (read once for every supply),
and for each grounded supply the parts of that graph on its hot and common
sides, worked out by union-find and the block-cut tree (``_block_tree``) so
that no graph of the whole circuit is built unless a load is bypassed on
paper. Its own module because it is the bulk of that rule and a model of
the circuit, not a check: the rule module asks it one question per load.
"""
from __future__ import annotations

from typing import TYPE_CHECKING

import ctllint.reading.kinds as K
from ctllint.api import CheckContext
from ctllint.circuit.wiresets import WireSets
from ctllint.reading.model import Element, Supply
from ctllint_plugins.wiring._block_tree import Pair, TreeToRoot, nx_module, pair_of, pairs_on_simple_paths

if TYPE_CHECKING:  # pragma: no cover
    import networkx as nx


class NonLoadGraph:
    """The circuit's non-load, known elements as wire pairs, read once for every supply."""

    def __init__(self, ctx: CheckContext):
        self.wires: dict[str, None] = {}  # an ordered set, in file order
        self.elements: dict[Pair, list[Element]] = {}  # keyed by the wire pair, in ``pair_of`` order
        # Read from the elements, not ``circuit.graph``: the circuit builds its
        # graph only when asked, and on a large panel it is the bulk of memory.
        for el in ctx.schematic.elements:
            a, b = el.left, el.right
            if el.role in (K.LOAD, "") or a == b:
                continue
            self.elements.setdefault(pair_of(a, b), []).append(el)
            self.wires.setdefault(a)
            self.wires.setdefault(b)

    def without(self, removed: set[str]) -> nx.Graph:
        """The graph of the edges with the wires ``removed`` taken out (built directly, not copied)."""
        graph = nx_module().Graph()
        graph.add_nodes_from(w for w in self.wires if w not in removed)
        graph.add_edges_from((a, b) for a, b in self.elements if a not in removed and b not in removed)
        return graph


class SupplySides:
    """For one grounded supply: which elements lie between a load and the common rail.

    The graph is the circuit with every load, every unknown element and every
    other rail taken out, since an energizing path passes no other load. The
    block-cut tree of its common-side part is built once; a load whose two
    sides are joined without a load (a bypass, reported elsewhere) is
    worked out on its own.
    """

    def __init__(self, base: "NonLoadGraph", supply: Supply, rails: set[str]):
        self.supply = supply
        self.base = base
        self.elements = base.elements
        self._hot_removed = {r for r in rails if r != supply.hot}
        self._common_removed = {r for r in rails if r != supply.common}
        # Components by union-find and blocks by ``biconnected_blocks``: no
        # graph object of the circuit is built unless a load is bypassed on paper.
        self._common_component = _component_map_of_pairs(base, self._common_removed)
        self._common_graph: nx.Graph | None = None
        # The hot side needs only which part each wire is in (found without a
        # graph); its graph is built only for a load bypassed on paper, so that
        # one graph, not two, is alive on a large panel.
        self._hot_component = _component_map_of_pairs(base, self._hot_removed)
        self._hot_graph: nx.Graph | None = None
        self._tree = None

    @property
    def common_graph(self) -> nx.Graph:
        if self._common_graph is None:
            self._common_graph = self.base.without(self._common_removed)
        return self._common_graph

    @property
    def hot_graph(self) -> nx.Graph:
        if self._hot_graph is None:
            self._hot_graph = self.base.without(self._hot_removed)
        return self._hot_graph

    def _reaches_hot(self, wire: str, other_side: str) -> bool:
        hot = self.supply.hot
        if wire == hot:
            return True
        comp = self._hot_component.get(wire)
        if comp is None or comp != self._hot_component.get(hot):
            return False
        if self._hot_component.get(other_side) != comp:
            return True
        graph = self.hot_graph.subgraph(n for n in self.hot_graph if n != other_side)
        return nx_module().has_path(graph, wire, hot)

    def common_side(self, load: Element) -> list[Element]:
        """Non-load elements on some energizing path of ``load`` between it and the common rail."""
        hot, common = self.supply.hot, self.supply.common
        pairs: set[Pair] = set()
        for hot_side, common_side in ((load.left, load.right), (load.right, load.left)):
            if hot_side == common or common_side == hot or hot_side == common_side:
                continue
            if common_side == common:
                continue
            if not self._reaches_hot(hot_side, common_side):
                continue
            comp = self._common_component.get(common_side)
            if comp is None or comp != self._common_component.get(common):
                continue
            if self._common_component.get(hot_side) == comp:
                graph = self.common_graph.subgraph(n for n in self.common_graph if n != hot_side)
                pairs |= pairs_on_simple_paths(nx_module().Graph(graph), common_side, common)
            else:
                pairs |= self._on_paths_to_common(common_side)
        found = [el for pair in pairs for el in self.elements.get(pair, ())]
        return sorted(found, key=lambda e: e.index)

    def _on_paths_to_common(self, wire: str) -> set[Pair]:
        if self._tree is None:
            removed = self._common_removed
            pairs = [p for p in self.elements if p[0] not in removed and p[1] not in removed]
            self._tree = TreeToRoot(pairs, self.supply.common)
        return self._tree.pairs_to_root(wire)


def _component_map_of_pairs(base: "NonLoadGraph", removed: set[str]) -> dict[str, int]:
    """Wire -> number of its connected part in ``base`` with the wires ``removed``, by union-find.

    Only whether two wires share a part is ever asked of the numbers.
    """
    sets = WireSets()
    for w in base.wires:
        if w not in removed:
            sets.find(w)  # every remaining wire is a set of its own to begin with
    for a, b in base.elements:
        if a in sets.parent and b in sets.parent:
            sets.join(a, b)
    numbers: dict[str, int] = {}
    return {w: numbers.setdefault(sets.find(w), len(numbers)) for w in list(sets.parent)}
