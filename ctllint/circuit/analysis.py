"""The questions rules ask of a circuit (RULES.md "Terms"), answered once and cached.

``Circuit(schematic)`` is what a rule gets as ``ctx.circuit``. It offers one
``networkx.MultiGraph`` (built on first use): wires are nodes, each element
is an edge keyed by ``element.index`` with ``element=<Element>``.
The analyses below are computed lazily and cached, since many rules ask the
same questions of the same loads.

Terms are those of RULES.md. An *energizing path* of load X is a simple path
from its supply's hot rail to X, through X, and on to the same supply's
common rail, passing no other load. It passes hot only at its start, common
only at its end, and never through a rail of another supply. "On paper"
means that every contact may close.

The answers are found without enumerating paths (their number grows
exponentially), each piece in a module of its own:

* ``ctllint.circuit.graph``: the circuit built from the schematic (indexes,
  rails, the connected parts of the wires, the networkx graph on demand);
* ``ctllint.circuit.routes``: each load's *region* (only its own rung can
  be on its energizing paths, so every analysis is linear in the size of
  that rung) and two vertex-disjoint paths linking {hot, common} to its
  terminals, which exist iff it has an energizing path (Menger);
* ``ctllint.circuit.serving``: ``in_series`` (exact, from the bridges of the
  cycle the two paths make) and ``serves`` (block chains peeled from both
  sides, with series-parallel simplification and odd cuts);
* ``ctllint.circuit.edges``: the graph algorithms on plain edge lists they
  use (``biconnected_blocks`` is offered to rules here as well).

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

import itertools
from collections import deque
from functools import cached_property
from typing import TYPE_CHECKING, Iterable

from ctllint.circuit.edges import biconnected_blocks, two_paths  # noqa: F401 - biconnected_blocks is used by rules through this module
from ctllint.circuit.edges import block_chain as _block_chain  # noqa: F401 - the name tests reach for
from ctllint.circuit.graph import LOAD, CircuitGraph, WireParts
from ctllint.circuit.paths import _gc_paused, path_text  # noqa: F401 - path_text is used by rules through this module
from ctllint.circuit.routes import LoadRoutes
from ctllint.circuit.serving import series_edges
from ctllint.reading.model import Element, Supply

if TYPE_CHECKING:  # pragma: no cover
    from ctllint.circuit.simulate import Simulator


class WiringFaults(CircuitGraph):
    """The wiring faults every circuit is asked about: short circuits and supplies joined."""

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

    def _tree_to(self, rail: str, root: str, parts: WireParts) -> dict[str, Element]:
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


class Circuit(LoadRoutes, WiringFaults):
    """A schematic as a graph, with the shared analyses rules ask for."""

    def simulator(self) -> "Simulator":
        """A new behaviour simulator of this circuit (FORMAT.md "Behaviour model")."""
        from ctllint.circuit.simulate import Simulator

        return Simulator(self)

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
            paths = two_paths(route.edges, s.hot, s.common, load.left, load.right, skip)
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

    # -- loads fed only through other loads -----------------------------
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
        loads = {i for i in series_edges(route.edges, *route.paths) if self._by_index[i].role == LOAD}
        if not loads:
            ids = self._assemble(load, route.paths)
            loads = {i for i in ids if i != load.index and self._by_index[i].role == LOAD}
        return [self._by_index[i] for i in sorted(loads)]

