"""The circuit built from a schematic: elements as edges between wires, indexes, parts.

What every question about a circuit starts from, built once per schematic:
the elements by index and by tag, the supplies and their rails, the loads,
the connected parts of the non-rail wires (``WireParts``), and the
``networkx.MultiGraph`` of the whole circuit, built only when asked for.
Its own module so that the questions (``ctllint.circuit.analysis``) read
apart from how the circuit is put together; nothing here answers a term of
RULES.md.
"""
from __future__ import annotations

from functools import cached_property
from typing import TYPE_CHECKING

from ctllint.circuit.edges import Edge
from ctllint.circuit.paths import _gc_paused
from ctllint.circuit.wiresets import WireSets
from ctllint.reading.model import Element, Schematic, Supply

if TYPE_CHECKING:  # pragma: no cover
    import networkx as nx

LOAD = "load"


class WireParts:
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


def element_edges(elements: list[Element]) -> list[Edge]:
    """The elements as ``(index, left wire, right wire)`` edges, for the algorithms of ``edges``."""
    return [(el.index, el.left, el.right) for el in elements]


class CircuitGraph:
    """A schematic as a graph: wires are nodes, elements edges; its indexes and parts."""

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

    @cached_property
    @_gc_paused
    def graph(self) -> nx.MultiGraph:
        """The circuit as a ``networkx.MultiGraph``: wires are nodes, each element an edge.

        Edges are keyed by ``element.index`` with ``element=<Element>``. Built
        on first use: none of the analyses need it, and on a large
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

    # -- parts --------------------------------------------------------------
    @cached_property
    def _known(self) -> list[Element]:
        return [el for el in self._elements if el.role]

    @cached_property
    def _non_load_parts(self) -> WireParts:
        return WireParts([el for el in self._known if el.role != LOAD], self.rails)

    @cached_property
    def _all_parts(self) -> WireParts:
        return WireParts(self._known, self.rails)


def _nx():
    """networkx, imported when a graph is first needed: a run answered from the cache never loads it."""
    import networkx

    return networkx
