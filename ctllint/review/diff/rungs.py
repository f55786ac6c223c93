"""Rungs: matching the rungs of two revisions, and the element changes within a matched rung.

Rungs are matched by title, then by connections, then by similarity, never
by position alone; a matched rung lists its fields changed and its elements
added, removed, moved between wires or with new terminal numbers, and a rung
that only changed place is ``moved``. Its own module because it is the
largest part of the diff and the one a reviewer reads first.
"""
from __future__ import annotations

from collections import Counter, defaultdict

from ctllint.reading.model import Rung, Schematic
from ctllint.review.diff.result import ADDED, CHANGED, MOVED, REMOVED, ElementDiff, RungDiff, ValueChange
from ctllint.review.diff.values import render_value
from ctllint.review.diff.wires import Wires, sharing_candidates

# A rung that is neither matched by title nor this similar to any rung of
# the other revision (Jaccard index of its element names) is added/removed.
RUNG_SIMILARITY = 0.5

# Rungs sharing a title are compared pair by pair while the pairs are at most
# this many; a larger group (a thousand rungs titled "Spare") is matched
# through shared elements and then in drawing order.
_TITLE_PAIRS = 4096


def _path_text(path) -> str:
    items: list[str] = []
    for i, wire in enumerate(path.wires):
        items.append(wire)
        if i < len(path.elements):
            items.append(path.elements[i].text)
    return "[" + ", ".join(items) + "]"


def _connections(rung: Rung, translate=lambda w: w) -> Counter:
    return Counter((e.text, frozenset((translate(e.left), translate(e.right)))) for e in rung.elements)


def _jaccard(a: Counter, b: Counter) -> float:
    union = sum((a | b).values())
    return sum((a & b).values()) / union if union else 1.0


def _match_rungs(old: list[Rung], new: list[Rung], wires: Wires) -> list[tuple[Rung, Rung, str]]:
    conn_o = [_connections(r, wires) for r in old]
    conn_n = [_connections(r) for r in new]
    names_o = [Counter(e.text for e in r.elements) for r in old]
    names_n = [Counter(e.text for e in r.elements) for r in new]
    pairs: list[tuple[Rung, Rung, str]] = []
    used_o: set[int] = set()
    used_n: set[int] = set()

    def pick(candidates: list[tuple[int, int]], how: str, threshold: float | None) -> None:
        scored = []
        for i, j in candidates:
            by_conn, by_name = _jaccard(conn_o[i], conn_n[j]), _jaccard(names_o[i], names_n[j])
            if threshold is not None and max(by_conn, by_name) < threshold:
                continue
            scored.append((-by_conn, -by_name, abs(i - j), i, j))
        for *_, i, j in sorted(scored):
            if i not in used_o and j not in used_n:
                used_o.add(i)
                used_n.add(j)
                pairs.append((old[i], new[j], how))

    titles: dict[str, tuple[list[int], list[int]]] = defaultdict(lambda: ([], []))
    for i, r in enumerate(old):
        if r.title:
            titles[r.title.strip()][0].append(i)
    for j, r in enumerate(new):
        if r.title:
            titles[r.title.strip()][1].append(j)
    for olds, news in titles.values():
        if len(olds) * len(news) <= _TITLE_PAIRS:
            pick([(i, j) for i in olds for j in news], "title", None)
            continue
        # Many rungs under one title ("Spare", "Motor"): score only the pairs
        # that share an element (found through their rarer names), then pair
        # the rest in drawing order, so that the cost stays near linear.
        group: dict[str, list[int]] = defaultdict(list)
        for j in news:
            for text in names_n[j]:
                group[text].append(j)
        pick([(i, j) for i in olds for j in sorted(sharing_candidates(i, names_o[i], group))], "title", 1e-9)
        for i, j in zip([i for i in olds if i not in used_o], [j for j in news if j not in used_n]):
            used_o.add(i)
            used_n.add(j)
            pairs.append((old[i], new[j], "title"))
    # the same connections: paired in drawing order, without scoring
    same: dict[frozenset, list[int]] = defaultdict(list)
    for j in range(len(new)):
        if j not in used_n:
            same[frozenset(conn_n[j].items())].append(j)
    for i in range(len(old)):
        bucket = same.get(frozenset(conn_o[i].items())) if i not in used_o else None
        if bucket:
            j = bucket.pop(0)
            used_o.add(i)
            used_n.add(j)
            pairs.append((old[i], new[j], "content"))
    index: dict[str, list[int]] = defaultdict(list)
    for j in range(len(new)):
        if j not in used_n:
            for text in names_n[j]:
                index[text].append(j)
    pick([(i, j) for i in range(len(old)) if i not in used_o for j in sharing_candidates(i, names_o[i], index)], "content", RUNG_SIMILARITY)
    return sorted(pairs, key=lambda p: p[1].index)


def _moved(pairs: list[tuple[Rung, Rung, str]]) -> set[int]:
    """New indices of matched rungs that changed place relative to the others (outside a longest run kept in order)."""
    seq = [(o.index, n.index) for o, n, _ in sorted(pairs, key=lambda p: p[0].index)]
    if not seq:
        return set()
    # longest increasing subsequence of the new indices, O(n log n)
    import bisect

    tails: list[int] = []
    tail_at: list[int] = []
    prev = [-1] * len(seq)
    for k, (_, j) in enumerate(seq):
        p = bisect.bisect_left(tails, j)
        if p == len(tails):
            tails.append(j)
            tail_at.append(k)
        else:
            tails[p] = j
            tail_at[p] = k
        prev[k] = tail_at[p - 1] if p else -1
    keep: set[int] = set()
    k = tail_at[-1] if tail_at else -1
    while k >= 0:
        keep.add(seq[k][1])
        k = prev[k]
    return {j for _, j in seq if j not in keep}


def _rung_fields(a: Rung, b: Rung) -> list[ValueChange]:
    out = []
    for name in ("title", "jog", "restart", "note"):
        x, y = getattr(a, name), getattr(b, name)
        if x != y:
            out.append(ValueChange(name, render_value(x) if x is not None else None, render_value(y) if y is not None else None))
    explicit = a.number != a.index + 1 or b.number != b.index + 1
    if explicit and a.number != b.number:
        out.append(ValueChange("number", str(a.number), str(b.number)))
    return out


def _element_changes(a: Rung, b: Rung, wires: Wires) -> list[ElementDiff]:
    old_left: dict[tuple[str, frozenset], list] = defaultdict(list)
    for e in a.elements:
        old_left[(e.text, frozenset((wires(e.left), wires(e.right))))].append(e)
    new_rest = []
    out: list[ElementDiff] = []
    for e in b.elements:
        bucket = old_left.get((e.text, frozenset((e.left, e.right))))
        if bucket:
            o = bucket.pop(0)
            before, after = _written_terminals(o, wires), _written_terminals(e, lambda w: w)
            if before != after:
                out.append(ElementDiff(CHANGED, e.text, (o.left, o.right), (e.left, e.right), o.loc.line, e.loc.line,
                                       f"terminals {_terminals_text(o)} -> {_terminals_text(e)}"))
        else:
            new_rest.append(e)
    old_rest = sorted((e for bucket in old_left.values() for e in bucket), key=lambda e: e.index)
    by_text_old: dict[str, list] = defaultdict(list)
    for e in old_rest:
        by_text_old[e.text].append(e)
    added = []
    for e in new_rest:
        candidates = by_text_old.get(e.text)
        if candidates:
            ends = {e.left, e.right}
            best = max(candidates, key=lambda o: (len(ends & {wires(o.left), wires(o.right)}), -o.index))
            candidates.remove(best)
            out.append(ElementDiff(MOVED, e.text, (best.left, best.right), (e.left, e.right), best.loc.line, e.loc.line))
        else:
            added.append(e)
    removed = sorted((e for c in by_text_old.values() for e in c), key=lambda e: e.index)
    out += [ElementDiff(REMOVED, e.text, (e.left, e.right), None, e.loc.line, None) for e in removed]
    out += [ElementDiff(ADDED, e.text, None, (e.left, e.right), None, e.loc.line) for e in added]
    return sorted(out, key=lambda d: (d.new_line or d.old_line or 0, d.old_line or 0))


def _written_terminals(e, translate) -> dict[str, str] | None:
    """Which written terminal each wire of ``e`` lands on (wires translated), None when none are written."""
    if not e.terminals:
        return None
    return {translate(e.left): e.terminals[0], translate(e.right): e.terminals[1]}


def _terminals_text(e) -> str:
    return "-".join(e.terminals) if e.terminals else "not written"


def diff_rungs(old: Schematic | None, new: Schematic | None, wires: Wires) -> tuple[list[RungDiff], list[tuple[Rung, Rung, str]]]:
    """The rung changes in drawing order, and the pairs of matched rungs."""
    old_rungs = old.rungs if old else []
    new_rungs = new.rungs if new else []
    pairs = _match_rungs(old_rungs, new_rungs, wires)
    moved = _moved(pairs)
    matched_old = {o.index for o, _, _ in pairs}
    matched_new = {n.index: (o, how) for o, n, how in pairs}
    out: list[tuple[float, RungDiff]] = []
    for n in new_rungs:
        if n.index in matched_new:
            o, how = matched_new[n.index]
            changes = _rung_fields(o, n)
            elements = _element_changes(o, n, wires)
            is_moved = n.index in moved
            if changes or elements or is_moved:
                kind = CHANGED if changes or elements else MOVED
                out.append((n.index, RungDiff(kind, n.title or o.title, o.index, n.index, o.number, n.number, how, is_moved,
                                              changes, elements, old_line=o.loc.line, new_line=n.loc.line)))
        else:
            out.append((n.index, RungDiff(ADDED, n.title, None, n.index, None, n.number, paths=[_path_text(p) for p in n.paths], new_line=n.loc.line)))
    # a removed rung is listed where it stood: after the new rung that follows its old predecessor
    old_to_new = {o.index: n.index for o, n, _ in pairs}
    for o in old_rungs:
        if o.index in matched_old:
            continue
        before = [old_to_new[i] for i in range(o.index) if i in old_to_new]
        place = (max(before) if before else -1) + 0.5 + o.index * 1e-6
        out.append((place, RungDiff(REMOVED, o.title, o.index, None, o.number, None, paths=[_path_text(p) for p in o.paths], old_line=o.loc.line)))
    diffs = [d for _, d in sorted(out, key=lambda x: x[0])]
    _note_rung_moves(diffs, wires)
    return diffs, pairs


def _note_rung_moves(diffs: list[RungDiff], wires: Wires) -> None:
    """An element that left one rung for another with the same connections is a drawing change only; say so."""
    def number(d: RungDiff) -> str:
        return f"rung {d.new_number if d.new_number is not None else d.old_number}"
    gone: dict[tuple[str, frozenset], list[tuple[RungDiff, ElementDiff]]] = defaultdict(list)
    for d in diffs:
        for e in d.elements:
            if e.change == REMOVED:
                gone[(e.element, frozenset(map(wires, e.old_wires)))].append((d, e))
    for d in diffs:
        for e in d.elements:
            if e.change == ADDED:
                match = gone.get((e.element, frozenset(e.new_wires)))
                if match:
                    src, old_e = match.pop(0)
                    old_e.note = f"moved to {number(d)}, same wires"
                    e.note = f"moved from {number(src)}, same wires"
