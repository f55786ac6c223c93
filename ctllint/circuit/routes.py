"""What is known of each load: its supply, its region, two disjoint paths, cached sets.

The working memory of the energizing-path questions. For a load X, the
*region* is the set of non-rail wires joined to X's terminals by non-load
elements without passing any rail, plus the two rails of its supply. Only
elements of the region can be on an energizing path of X, so other rungs
hanging on the same rails never "serve" X, and every analysis is linear in
the size of X's own rung. An energizing path exists iff there are two
vertex-disjoint paths in the region (X and other loads left out) linking
{hot, common} to X's two terminals, in either pairing (Menger):
``edges.two_paths`` finds them, and they give the path reported in
messages. ``LoadRoutes`` finds and keeps one ``_Route`` per load, and on it
the serve and series sets once asked for. Its own module because it is
bookkeeping (what to keep per load, and in how little room) rather than a
question a rule asks: those are in ``ctllint.circuit.analysis``.
"""
from __future__ import annotations

from ctllint.circuit.edges import Edge, two_paths
from ctllint.circuit.graph import LOAD, CircuitGraph, WireParts, element_edges
from ctllint.circuit.serving import series_edges, serving_edges
from ctllint.reading.model import Element, Schematic, Supply


def _index(el: Element) -> int:
    return el.index


def _compact(ids: set[int]) -> "set[int] | tuple[int, ...] | frozenset[int]":
    """A set of element indices to keep while the rules run, in less room.

    Small ones (most loads have a handful of elements on their paths) become
    sorted tuples: ``in``, ``len`` and iteration answer the same, in a third
    of the memory of a set; larger ones stay hashed.
    """
    if len(ids) <= 16:
        return tuple(sorted(ids))
    return frozenset(ids)


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
        self.paths = paths  # (q1, q2) from two_paths, or None
        self.path: list[int] | None = None
        self._serve: set[int] | None = None
        self._series: set[int] | None = None

    @property
    def edges(self) -> list[Edge]:
        return element_edges(self.elements)

    def settle(self) -> None:
        """Let the two paths go once the one path and the series set are known: nothing else reads them."""
        if self.path is not None and self._series is not None:
            self.paths = _SETTLED


# Stands for a route's two paths once they are no longer needed: not None, so
# "the load has an energizing path" still reads the same.
_SETTLED = ((), ())


class LoadRoutes(CircuitGraph):
    """Finds, and keeps, each load's route: the per-load facts the questions are answered from."""

    def __init__(self, schematic: Schematic):
        super().__init__(schematic)
        self._routes: dict[int, _Route | None] = {}
        self._loose_routes: dict[int, tuple[_Route, Element] | None] = {}

    def _candidates(self, load: Element, parts: WireParts) -> list[Supply]:
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

    def _region(self, load: Element, supply: Supply, parts: WireParts) -> list[Element]:
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
                r = _Route(s, region, two_paths(element_edges(region), s.hot, s.common, load.left, load.right))
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
            found = serving_edges(route.edges, s.hot, s.common, load.left, load.right)
            route._serve = _compact(found or set())
        return route._serve

    def _series_set(self, load: Element) -> set[int]:
        route = self._route(load)
        if route is None or route.paths is None:
            return set()
        if route._series is None:
            route._series = _compact(series_edges(route.edges, *route.paths))
            route.settle()
        return route._series

    def _loose_route(self, load: Element) -> tuple[_Route, Element] | None:
        if load.index not in self._loose_routes:
            result = None
            parts = self._all_parts
            for s in self._candidates(load, parts):
                region = self._region(load, s, parts)
                paths = two_paths(element_edges(region), s.hot, s.common, load.left, load.right)
                if paths is not None:
                    result = (_Route(s, region, paths), load)
                    break
            self._loose_routes[load.index] = result
        return self._loose_routes[load.index]
