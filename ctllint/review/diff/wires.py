"""Wire matching: which old wire is which new one when wires were renumbered.

``match_wires`` pairs old non-rail wires with new ones by the elements they
touch; ``Wires`` translates old wire names (rails by their supply) into the
new revision's names. Its own module because it is the one search of the
diff, and rung matching and the findings both use its answer.
"""
from __future__ import annotations

import re
from collections import Counter, defaultdict
from typing import Any, Iterable

from ctllint.reading.model import Schematic


def natural(name: str) -> tuple:
    """Sort wire names as an electrician numbers them: 2 before 10."""
    return tuple((0, int(part), "") if part.isdigit() else (1, 0, part) for part in re.findall(r"\d+|\D+", name))


def _rails(sch: Schematic | None) -> set[str]:
    return {w for s in (sch.supplies.values() if sch else ()) for w in (s.hot, s.common)}


def _rail_map(old: Schematic | None, new: Schematic | None) -> dict[str, str]:
    """Old rail name -> new rail name, for the supplies present in both."""
    out: dict[str, str] = {}
    if old is None or new is None:
        return out
    for name, s in old.supplies.items():
        t = new.supplies.get(name)
        if t is not None:
            out[s.hot] = t.hot
            out[s.common] = t.common
    return out


Edge = tuple[str, str, str]  # element text, one wire, the other wire


def _edges(sch: Schematic | None) -> list[Edge]:
    return [(e.text, e.left, e.right) for e in (sch.elements if sch else ())]


def _incidence(edges: list[Edge], rails: set[str], other_name) -> dict[str, Counter]:
    """For every non-rail wire, the multiset of (element, what is at its other end)."""
    inc: dict[str, Counter] = defaultdict(Counter)
    for text, a, b in edges:
        for wire, other in ((a, b), (b, a)):
            if wire in rails:
                continue
            inc[wire][(text, other if other in rails else other_name(other))] += 1
    return inc


def _matched_connections(old_edges: list[Edge], new_edges: list[Edge], translate) -> int:
    old = Counter((t, frozenset((translate(a), translate(b)))) for t, a, b in old_edges)
    new = Counter((t, frozenset((a, b))) for t, a, b in new_edges)
    return sum((old & new).values())


# Candidates for a pair are found through what the two share; a key shared
# by more than this many items of the other revision (a master relay's
# contact on every rung) is skipped when rarer ones exist, so that matching
# stays near linear in the size of the file.
_COMMON = 32


def sharing_candidates(item: Any, keys: Iterable[Any], index: dict[Any, list[Any]]) -> set[Any]:
    """Items of the other revision sharing a key with ``item``, through its rarer keys."""
    shared = sorted((len(index[k]), k) for k in keys if k in index)
    if not shared:
        return set()
    rare = [k for size, k in shared if size <= _COMMON]
    if rare:
        return {other for k in rare for other in index[k]}
    pool = index[shared[0][1]]  # every key is common: the same name first, then the first few
    return ({item} & set(pool)) | set(pool[:_COMMON])


def match_wires(old_edges: list[Edge], new_edges: list[Edge], rails: set[str]) -> dict[str, str]:
    """Pair old non-rail wires with new ones so that element connections agree.

    ``old_edges`` must already carry new rail names. Wires are paired by
    the elements they touch (a wire keeps its contacts when only its name
    changes), greedily from the best-matching pair, preferring a pair with
    the same name on a tie; then the pairing is refined a few times using
    the names already paired at each wire's far ends, which tells apart
    wires that touch the same kind of elements. A pair must share at least
    half of what the two wires touch, so unrelated wires are never paired.
    The result is one to one. It is kept only when it explains more
    connections than the names as written do (so an ordinary edit never
    shows up as a renumbering).
    """
    old_wires = {w for _, a, b in old_edges for w in (a, b) if w not in rails}
    new_wires = {w for _, a, b in new_edges for w in (a, b) if w not in rails}
    identity = {w: w for w in old_wires & new_wires}
    coarse_o = _incidence(old_edges, rails, lambda _: "~")
    coarse_n = _incidence(new_edges, rails, lambda _: "~")
    index: dict[Any, list[str]] = defaultdict(list)
    for wire, counts in coarse_n.items():
        for key in counts:
            index[key].append(wire)
    candidates: list[tuple[str, str, float, int]] = []
    for o, counts in coarse_o.items():
        for n in sharing_candidates(o, counts, index):
            inter = sum((counts & coarse_n[n]).values())
            union = sum((counts | coarse_n[n]).values())
            if 2 * inter >= union:
                candidates.append((o, n, inter / union, inter))

    def greedy(fine_o: dict[str, Counter] | None, fine_n: dict[str, Counter] | None) -> dict[str, str]:
        def fine(o: str, n: str) -> float:
            if fine_o is None or fine_n is None:
                return 0.0
            a, b = fine_o.get(o, Counter()), fine_n.get(n, Counter())
            union = sum((a | b).values())
            return sum((a & b).values()) / union if union else 0.0
        ranked = sorted(candidates, key=lambda c: (-fine(c[0], c[1]), -c[2], -c[3], c[0] != c[1], natural(c[0]), natural(c[1])))
        pairs: dict[str, str] = {}
        taken: set[str] = set()
        for o, n, _, _ in ranked:
            if o not in pairs and n not in taken:
                pairs[o] = n
                taken.add(n)
        return pairs

    def translator(sigma: dict[str, str]):
        images = set(sigma.values())

        def tr(w: str) -> str:
            if w in rails:
                return w
            if w in sigma:
                return sigma[w]
            return "\0" + w if w in images else w
        return tr

    best, best_score = identity, _matched_connections(old_edges, new_edges, translator(identity))
    sigma = greedy(None, None)
    for _ in range(4):
        score = _matched_connections(old_edges, new_edges, translator(sigma))
        renames = sum(1 for o, n in sigma.items() if o != n)
        best_renames = sum(1 for o, n in best.items() if o != n)
        if score > best_score or (score == best_score and renames < best_renames):
            best, best_score = sigma, score
        fine_o = _incidence(old_edges, rails, lambda w, s=sigma: s.get(w, "\0?"))
        fine_n = _incidence(new_edges, rails, lambda w: w)
        refined = greedy(fine_o, fine_n)
        if refined == sigma:
            break
        sigma = refined
    return best


class Wires:
    """Translates old wire names into the new revision's names."""

    def __init__(self, old: Schematic | None, new: Schematic | None):
        self.rail_map = _rail_map(old, new)
        rails = _rails(new) | {self.rail_map.get(w, w) for w in _rails(old)}
        old_edges = [(t, self.rail_map.get(a, a), self.rail_map.get(b, b)) for t, a, b in _edges(old)]
        self.sigma = match_wires(old_edges, _edges(new), rails) if old and new else {}
        self.rails = rails
        self.images = set(self.sigma.values())
        self.renames = {o: n for o, n in self.sigma.items() if o != n}

    def __call__(self, wire: str) -> str:
        if wire in self.rail_map:
            return self.rail_map[wire]
        if wire in self.rails:
            return wire
        if wire in self.sigma:
            return self.sigma[wire]
        return "\0" + wire if wire in self.images else wire

    def message_map(self) -> dict[str, str]:
        return {**{o: n for o, n in self.rail_map.items() if o != n}, **self.renames}
