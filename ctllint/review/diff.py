"""A semantic diff of two revisions of a schematic: what changed electrically.

A line diff of a ``*.ctl.yaml`` file tells a reviewer which characters moved;
a controls engineer wants to know which devices, contacts and wires did.
``semantic_diff(old, new)`` compares two loaded schematics and returns a
``SchematicDiff`` that lists:

- devices added, removed or changed (which fields, old -> new as written);
- supplies added, removed or changed;
- rungs added, removed, changed or moved. Rungs are matched by title, then
  by content similarity, never by position alone, so inserting a rung does
  not show every later rung as changed;
- within a matched rung, elements added, removed, or moved to other wires,
  and elements whose written terminal numbers changed (`CR1.NO 13-14`);
- wires renumbered: a consistent renaming of non-rail wire names (old ->
  new, one to one) under which the element connections are the same is
  shown as "wire 3 -> 13", not as every element removed and added again;
- ``expect`` scenarios added, removed, or with steps added or removed;
- findings that appeared or disappeared, when the caller passes both
  versions' findings (``diff_revisions`` runs a ``Checker`` for that).
  Findings are matched by rule and message, with the wire renaming (and
  rung renumbering) applied to the old message, never by line.

What counts as a change is electrical, not textual: paths may be split,
joined or written in the other direction, and values may be rewritten in
equal units (``250 mA`` -> ``0.25 A``) without a change being reported. A
field that is absent and one written with its default value are the same.
Values are shown as written in the file (flow style for lists and maps).

``changed_rungs(diff)`` gives the indices of the rungs to show before and
after (for a report that draws them).

Devices brought in by ``use`` are compared too; they are read from where
the loader finds them (see ``ctllint.commands.diff`` for how the ``git``
modes provide the used files of a revision).
"""
from __future__ import annotations

import difflib
import re
from collections import Counter, defaultdict
from dataclasses import dataclass, field, fields, is_dataclass
from enum import Enum
from typing import TYPE_CHECKING, Any, Iterable

from ctllint.reading.budget import work
from ctllint.reading.loader import LoadResult, load_file, load_text
from ctllint.reading.model import Diagnostic, Location, Quantity, Rung, Schematic, Step
from ctllint.reading.yamlsafe import Limits, MappingNode, Node, ScalarNode, SequenceNode, YamlProblem, compose, pos

if TYPE_CHECKING:  # pragma: no cover
    from ctllint.checking.engine import Checker

ADDED, REMOVED, CHANGED, MOVED = "added", "removed", "changed", "moved"
APPEARED, DISAPPEARED = "appeared", "disappeared"

# A rung that is neither matched by title nor this similar to any rung of
# the other revision (Jaccard index of its element names) is added/removed.
RUNG_SIMILARITY = 0.5


# -- the result ----------------------------------------------------------------

@dataclass
class ValueChange:
    """One field whose value changed: ``old`` and ``new`` as written, None when absent."""

    field: str
    old: str | None
    new: str | None

    def as_dict(self) -> dict[str, Any]:
        return {"field": self.field, "old": self.old, "new": self.new}


@dataclass
class DeviceDiff:
    """A device added, removed or changed. ``fields`` lists what changed
    (for an added or removed device: every field it has, as written)."""

    tag: str
    change: str
    kind: str
    fields: list[ValueChange] = field(default_factory=list)
    old_line: int | None = None
    new_line: int | None = None

    def as_dict(self) -> dict[str, Any]:
        return {"tag": self.tag, "change": self.change, "kind": self.kind,
                "fields": [f.as_dict() for f in self.fields], "old_line": self.old_line, "new_line": self.new_line}


@dataclass
class SupplyDiff:
    name: str
    change: str
    fields: list[ValueChange] = field(default_factory=list)
    old_line: int | None = None
    new_line: int | None = None

    def as_dict(self) -> dict[str, Any]:
        return {"name": self.name, "change": self.change, "fields": [f.as_dict() for f in self.fields],
                "old_line": self.old_line, "new_line": self.new_line}


@dataclass
class ElementDiff:
    """An element added to, removed from, or moved between wires within a rung.

    ``old_wires``/``new_wires`` are the (left, right) wires as written in each
    revision. ``note`` says where an element went when it left for another
    rung with the same connections (then it is not an electrical change).
    """

    change: str
    element: str
    old_wires: tuple[str, str] | None = None
    new_wires: tuple[str, str] | None = None
    old_line: int | None = None
    new_line: int | None = None
    note: str = ""

    def as_dict(self) -> dict[str, Any]:
        return {"change": self.change, "element": self.element,
                "old_wires": list(self.old_wires) if self.old_wires else None,
                "new_wires": list(self.new_wires) if self.new_wires else None,
                "old_line": self.old_line, "new_line": self.new_line, "note": self.note}


@dataclass
class RungDiff:
    """A rung added, removed, changed, or only ``moved`` (its order among the others).

    Indices are 0-based positions in ``rungs``; numbers are as drawn.
    ``matched_by`` is "title" or "content" for a rung present in both.
    ``paths`` holds the paths as written of an added or removed rung.
    """

    change: str
    title: str | None
    old_index: int | None = None
    new_index: int | None = None
    old_number: int | None = None
    new_number: int | None = None
    matched_by: str = ""
    moved: bool = False
    fields: list[ValueChange] = field(default_factory=list)
    elements: list[ElementDiff] = field(default_factory=list)
    paths: list[str] = field(default_factory=list)
    old_line: int | None = None
    new_line: int | None = None

    def as_dict(self) -> dict[str, Any]:
        return {"change": self.change, "title": self.title, "old_index": self.old_index, "new_index": self.new_index,
                "old_number": self.old_number, "new_number": self.new_number, "matched_by": self.matched_by,
                "moved": self.moved, "fields": [f.as_dict() for f in self.fields],
                "elements": [e.as_dict() for e in self.elements], "paths": self.paths,
                "old_line": self.old_line, "new_line": self.new_line}


@dataclass
class StepDiff:
    change: str
    step: int  # 1-based position in its own revision's scenario
    text: str

    def as_dict(self) -> dict[str, Any]:
        return {"change": self.change, "step": self.step, "text": self.text}


@dataclass
class ScenarioDiff:
    name: str
    change: str
    steps: list[StepDiff] = field(default_factory=list)
    old_line: int | None = None
    new_line: int | None = None

    def as_dict(self) -> dict[str, Any]:
        return {"name": self.name, "change": self.change, "steps": [s.as_dict() for s in self.steps],
                "old_line": self.old_line, "new_line": self.new_line}


@dataclass
class FindingDiff:
    """A finding that appeared in the new revision or disappeared from the old one."""

    change: str
    rule: str
    severity: str
    message: str
    line: int
    column: int
    path: str = ""  # the file it points at, in its revision: the schematic or a file it uses

    def as_dict(self) -> dict[str, Any]:
        return {"change": self.change, "rule": self.rule, "severity": self.severity,
                "message": self.message, "path": self.path, "line": self.line, "column": self.column}


@dataclass
class SchematicDiff:
    """Everything that changed between two revisions of one schematic.

    ``old_path``/``new_path`` are None for a file added/deleted. ``status``
    is "added", "deleted", "modified" or "unloadable" (a revision that does
    not load: ``load_errors`` and ``text_diff`` then say what is known).
    ``wire_renames`` maps old non-rail wire names to new ones: names that
    changed, on wires that run through a rung present in both revisions
    (the wires of a rung added or removed whole are not renumbered, they
    are new or gone). ``findings_compared`` is False when findings were not
    given or could not be computed (``notes`` says why).
    """

    old_path: str | None
    new_path: str | None
    status: str = "modified"
    old_label: str = ""
    new_label: str = ""
    header: list[ValueChange] = field(default_factory=list)
    wire_renames: dict[str, str] = field(default_factory=dict)
    supplies: list[SupplyDiff] = field(default_factory=list)
    devices: list[DeviceDiff] = field(default_factory=list)
    rungs: list[RungDiff] = field(default_factory=list)
    scenarios: list[ScenarioDiff] = field(default_factory=list)
    findings: list[FindingDiff] = field(default_factory=list)
    findings_compared: bool = False
    notes: list[str] = field(default_factory=list)
    load_errors: dict[str, list[Diagnostic]] = field(default_factory=dict)
    text_diff: list[str] = field(default_factory=list)

    @property
    def path(self) -> str:
        return self.new_path or self.old_path or "?"

    @property
    def electrical_changes(self) -> bool:
        """True when anything but the findings and wire names changed."""
        return bool(self.header or self.supplies or self.devices or self.scenarios
                    or any(r.change != MOVED for r in self.rungs))

    @property
    def changed(self) -> bool:
        return bool(self.electrical_changes or self.wire_renames or self.rungs or self.findings
                    or self.load_errors or self.status in ("added", "deleted"))

    @property
    def renumbering_only(self) -> bool:
        """Wires renamed and nothing else changed."""
        return bool(self.wire_renames) and not self.electrical_changes and not any(r.moved for r in self.rungs) and not self.findings

    def as_dict(self) -> dict[str, Any]:
        return {
            "old_path": self.old_path,
            "new_path": self.new_path,
            "old_label": self.old_label,
            "new_label": self.new_label,
            "status": self.status,
            "changed": self.changed,
            "header": [h.as_dict() for h in self.header],
            "wire_renames": [{"old": o, "new": n} for o, n in sorted(self.wire_renames.items(), key=lambda p: _natural(p[0]))],
            "supplies": [s.as_dict() for s in self.supplies],
            "devices": [d.as_dict() for d in self.devices],
            "rungs": [r.as_dict() for r in self.rungs],
            "expect": [s.as_dict() for s in self.scenarios],
            "findings": {"compared": self.findings_compared, "changes": [f.as_dict() for f in self.findings]},
            "notes": list(self.notes),
            "load_errors": {side: [d.as_dict() for d in diags] for side, diags in self.load_errors.items()},
            "text_diff": list(self.text_diff),
        }


def changed_rungs(diff: SchematicDiff) -> tuple[list[int], list[int]]:
    """The 0-based rung indices to show before (old) and after (new).

    A rung counts when it was added, removed or changed (its elements or
    fields). A rung that only moved among the others, or whose wires were
    only renumbered, does not.
    """
    old: set[int] = set()
    new: set[int] = set()
    for r in diff.rungs:
        if r.change == MOVED:
            continue
        if r.old_index is not None:
            old.add(r.old_index)
        if r.new_index is not None:
            new.add(r.new_index)
    return sorted(old), sorted(new)


# -- values as written -------------------------------------------------------------

class _Source:
    """The YAML nodes of a schematic's own text, found by the positions the model keeps."""

    def __init__(self, sch: Schematic | None):
        self.path = sch.path if sch else None
        self.at: dict[tuple[int, int], Node] = {}
        self.value_of_key: dict[tuple[int, int], Node] = {}
        self.root: Node | None = None
        if sch is None or not sch.text:
            return
        try:
            self.root = compose("\n".join(sch.text_lines) + "\n", Limits())
        except (YamlProblem, RecursionError, ValueError):  # only for display: parsed values stand in
            return
        stack = [self.root] if self.root is not None else []
        seen: set[int] = set()
        while stack:
            node = stack.pop()
            if id(node) in seen:  # aliases
                continue
            seen.add(id(node))
            self.at.setdefault(pos(node), node)
            if isinstance(node, MappingNode):
                for k, v in node.value:
                    self.value_of_key[pos(k)] = v
                    stack.extend((k, v))
            elif isinstance(node, SequenceNode):
                stack.extend(node.value)

    def written(self, loc: Location | None) -> str | None:
        if loc is None or loc.path != self.path:
            return None
        node = self.at.get((loc.line, loc.column))
        return render_node(node) if node is not None else None

    def written_after_key(self, loc: Location) -> str | None:
        if loc.path != self.path:
            return None
        node = self.value_of_key.get((loc.line, loc.column))
        return render_node(node) if node is not None else None

    def top(self, key: str) -> Node | None:
        if isinstance(self.root, MappingNode):
            for k, v in self.root.value:
                if isinstance(k, ScalarNode) and k.value == key:
                    return v
        return None


def render_node(node: Node) -> str:
    """A YAML value as written, in flow style on one line."""
    if isinstance(node, ScalarNode):
        return node.value
    if isinstance(node, SequenceNode):
        return "[" + ", ".join(render_node(n) for n in node.value) + "]"
    if isinstance(node, MappingNode):
        return "{" + ", ".join(f"{render_node(k)}: {render_node(v)}" for k, v in node.value) + "}"
    return str(node.value)


def render_value(value: Any) -> str:
    """A parsed value, for when its text is not at hand (defaults, used files)."""
    if value is None:
        return "(none)"
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, float):
        return f"{value:g}"
    if isinstance(value, Quantity):
        return value.text
    if isinstance(value, (list, tuple)):
        return "[" + ", ".join(render_value(v) for v in value) + "]"
    name = type(value).__name__
    if name == "ContactRating":
        return value.text or str(value.designation or value.current)
    if name == "ContactCount":
        if value.changeover:
            return f"{{poles: {value.changeover}, throw: double}}"
        return "{" + ", ".join(f"{k}: {n}" for k, n in (("NO", value.no), ("NC", value.nc)) if n) + "}"
    if name == "PowerRating":
        if value.nema_size is not None:
            return f"{{size: {value.nema_size}}}"
        return "[" + ", ".join(f"{{category: {c.category}, current: {c.current:g} A, voltage: {c.voltage:g} V}}" for c in value.categories) + "]"
    return str(value)


def _same_value(a: Any, b: Any) -> bool:
    return _value_key(a) == _value_key(b)


def _value_key(value: Any) -> Any:
    """What makes two parsed values electrically the same (units and spelling aside)."""
    if isinstance(value, bool) or value is None or isinstance(value, (str, int)):
        return value
    if isinstance(value, float):
        return float(f"{value:.9g}")
    if isinstance(value, Quantity):
        return ("quantity", float(f"{value.value:.9g}"), value.dimension, value.current_kind)
    if isinstance(value, (list, tuple)):
        return tuple(_value_key(v) for v in value)
    if isinstance(value, dict):
        return tuple(sorted((k, _value_key(v)) for k, v in value.items()))
    if is_dataclass(value):
        return (type(value).__name__,) + tuple(_value_key(getattr(value, f.name)) for f in fields(value) if f.name != "text")
    return repr(value)


# -- wires -------------------------------------------------------------------------

def _natural(name: str) -> tuple:
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
# Rungs sharing a title are compared pair by pair while the pairs are at most
# this many; a larger group (a thousand rungs titled "Spare") is matched
# through shared elements and then in drawing order.
_TITLE_PAIRS = 4096


def _candidates(item: Any, keys: Iterable[Any], index: dict[Any, list[Any]]) -> set[Any]:
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
        for n in _candidates(o, counts, index):
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
        ranked = sorted(candidates, key=lambda c: (-fine(c[0], c[1]), -c[2], -c[3], c[0] != c[1], _natural(c[0]), _natural(c[1])))
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


class _Wires:
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


# -- the diff --------------------------------------------------------------------------

def semantic_diff(
    old: Schematic | None,
    new: Schematic | None,
    old_findings: Iterable[Diagnostic] | None = None,
    new_findings: Iterable[Diagnostic] | None = None,
    old_label: str = "",
    new_label: str = "",
) -> SchematicDiff:
    """Compare two revisions: see ``_semantic_diff``; one unit of the command's time budget (``ctllint.reading.budget``)."""
    with work(f"the diff of {(new or old).path if (new or old) else 'two files'}"):
        return _semantic_diff(old, new, old_findings, new_findings, old_label, new_label)


def _semantic_diff(
    old: Schematic | None,
    new: Schematic | None,
    old_findings: Iterable[Diagnostic] | None = None,
    new_findings: Iterable[Diagnostic] | None = None,
    old_label: str = "",
    new_label: str = "",
) -> SchematicDiff:
    """Compare two revisions of a schematic; None stands for a file that does not exist.

    Pass both revisions' findings (e.g. ``Checker.check_text(...).diagnostics``)
    to have the findings that appeared or disappeared listed; without them
    ``findings_compared`` is False.
    """
    status = "added" if old is None else "deleted" if new is None else "modified"
    out = SchematicDiff(old.path if old else None, new.path if new else None, status, old_label, new_label)
    src_old, src_new = _Source(old), _Source(new)
    wires = _Wires(old, new)
    out.header = _header(old, new, src_old, src_new)
    out.supplies = _supplies(old, new, src_old, src_new)
    out.devices = _devices(old, new, src_old, src_new)
    out.rungs, rung_pairs = _rungs(old, new, wires)
    # a renamed wire is worth showing where it runs through a rung present in both revisions
    shown: dict[str, str] = {}
    for ro, rn, _ in rung_pairs:
        new_wires = {w for e in rn.elements for w in (e.left, e.right)}
        for o in {w for e in ro.elements for w in (e.left, e.right)} & wires.renames.keys():
            if wires.renames[o] in new_wires:
                shown[o] = wires.renames[o]
    out.wire_renames = dict(sorted(shown.items(), key=lambda p: _natural(p[0])))
    out.scenarios = _scenarios(old, new, src_old, src_new)
    if old_findings is not None or new_findings is not None:
        rung_numbers = {o.number: n.number for o, n, _ in rung_pairs}
        out.findings = _findings(list(old_findings or ()), list(new_findings or ()), wires.message_map(), rung_numbers)
        out.findings_compared = True
    return out


def _header(old: Schematic | None, new: Schematic | None, so: _Source, sn: _Source) -> list[ValueChange]:
    out = []
    if old and new and old.title != new.title:
        out.append(ValueChange("title", old.title, new.title))

    def uses(sch: Schematic | None, src: _Source) -> list[str]:
        node = src.top("use")
        if isinstance(node, SequenceNode):
            return [render_node(n) for n in node.value]
        if isinstance(node, ScalarNode):
            return [node.value]
        return [u.replace("\\", "/").rsplit("/", 1)[-1] for u in (sch.uses if sch else ())]
    if old and new:
        a, b = uses(old, so), uses(new, sn)
        if sorted(a) != sorted(b):
            out.append(ValueChange("use", "[" + ", ".join(a) + "]" if a else None, "[" + ", ".join(b) + "]" if b else None))
    return out


def _field_changes(names: Iterable[str], get_old, get_new, written_old, written_new) -> list[ValueChange]:
    out = []
    for name in names:
        a, b = get_old(name), get_new(name)
        if _same_value(a, b):
            continue
        out.append(ValueChange(name, None if a is None else written_old(name, a), None if b is None else written_new(name, b)))
    return out


def _ordered_union(a: Iterable[str], b: Iterable[str]) -> list[str]:
    first = dict.fromkeys(a)
    return list(first) + [x for x in dict.fromkeys(b) if x not in first]


def _supplies(old: Schematic | None, new: Schematic | None, so: _Source, sn: _Source) -> list[SupplyDiff]:
    names = ("hot", "common", "voltage", "grounded", "source")
    a = old.supplies if old else {}
    b = new.supplies if new else {}

    def written(src: _Source, sup):
        def text(name: str, value: Any) -> str:
            found = src.written(sup.field_locs.get(name))
            return found if found is not None else render_value(value) + ("" if name in sup.field_locs else " (default)")
        return text
    out = []
    for name in _ordered_union(b, a):
        s, t = a.get(name), b.get(name)
        if s is None:
            out.append(SupplyDiff(name, ADDED, [ValueChange(f, None, written(sn, t)(f, getattr(t, f))) for f in names if f in t.field_locs], new_line=t.loc.line))
        elif t is None:
            out.append(SupplyDiff(name, REMOVED, [ValueChange(f, written(so, s)(f, getattr(s, f)), None) for f in names if f in s.field_locs], old_line=s.loc.line))
        else:
            changes = _field_changes(names, lambda f: getattr(s, f), lambda f: getattr(t, f), written(so, s), written(sn, t))
            if changes:
                out.append(SupplyDiff(name, CHANGED, changes, s.loc.line, t.loc.line))
    return out


def _device_written(src: _Source, dev):
    def written(name: str, value: Any) -> str:
        text = src.written(dev.field_locs.get(name))
        if text is not None:
            return text
        return render_value(value) + ("" if name in dev.field_locs else " (default)")
    return written


def _devices(old: Schematic | None, new: Schematic | None, so: _Source, sn: _Source) -> list[DeviceDiff]:
    a = old.devices if old else {}
    b = new.devices if new else {}
    out = []
    for tag in _ordered_union(b, a):
        d, e = a.get(tag), b.get(tag)
        if d is None:
            out.append(DeviceDiff(tag, ADDED, e.kind, [ValueChange(f, None, _device_written(sn, e)(f, v)) for f, v in e.fields.items() if f in e.field_locs], new_line=e.loc.line))
        elif e is None:
            out.append(DeviceDiff(tag, REMOVED, d.kind, [ValueChange(f, _device_written(so, d)(f, v), None) for f, v in d.fields.items() if f in d.field_locs], old_line=d.loc.line))
        else:
            changes = []
            if d.kind != e.kind:
                changes.append(ValueChange("kind", d.kind, e.kind))
            changes += _field_changes(_ordered_union(d.fields, e.fields), d.fields.get, e.fields.get, _device_written(so, d), _device_written(sn, e))
            if _origin(d, old) != _origin(e, new):
                changes.append(ValueChange("defined in", _origin(d, old), _origin(e, new)))
            if changes:
                out.append(DeviceDiff(tag, CHANGED, e.kind, changes, d.loc.line, e.loc.line))
    return out


def _origin(dev, sch: Schematic | None) -> str:
    return "this file" if sch is not None and dev.origin == sch.path else dev.origin.replace("\\", "/").rsplit("/", 1)[-1]


# -- rungs -------------------------------------------------------------------------------

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


def _match_rungs(old: list[Rung], new: list[Rung], wires: _Wires) -> list[tuple[Rung, Rung, str]]:
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
        pick([(i, j) for i in olds for j in sorted(_candidates(i, names_o[i], group))], "title", 1e-9)
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
    pick([(i, j) for i in range(len(old)) if i not in used_o for j in _candidates(i, names_o[i], index)], "content", RUNG_SIMILARITY)
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


def _element_changes(a: Rung, b: Rung, wires: _Wires) -> list[ElementDiff]:
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


def _rungs(old: Schematic | None, new: Schematic | None, wires: _Wires) -> tuple[list[RungDiff], list[tuple[Rung, Rung, str]]]:
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


def _note_rung_moves(diffs: list[RungDiff], wires: _Wires) -> None:
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


# -- expect ----------------------------------------------------------------------------

def _step_text(step: Step, src: _Source) -> str:
    written = src.written_after_key(step.loc)
    if written is not None:
        return f"{step.action}: {written}"
    if step.action == "wait":
        return f"wait: {step.seconds:g} s"
    if step.action == "power":
        return f"power: {step.targets.get('')}"
    if step.action in ("set", "check"):
        values = ", ".join(f"{t}: {('on' if v else 'off') if isinstance(v, bool) else v}" for t, v in step.targets.items())
        return f"{step.action}: {{{values}}}"
    tags = list(step.targets)
    return f"{step.action}: {tags[0] if len(tags) == 1 else '[' + ', '.join(tags) + ']'}"


def _step_key(step: Step) -> Any:
    return (step.action, tuple((t, _value_key(v)) for t, v in step.targets.items()), float(f"{step.seconds:.9g}"))


def _scenarios(old: Schematic | None, new: Schematic | None, so: _Source, sn: _Source) -> list[ScenarioDiff]:
    a = {s.name: s for s in (old.expect if old else [])}
    b = {s.name: s for s in (new.expect if new else [])}
    out = []
    for name in _ordered_union(b, a):
        s, t = a.get(name), b.get(name)
        if s is None:
            out.append(ScenarioDiff(name, ADDED, [StepDiff(ADDED, k + 1, _step_text(st, sn)) for k, st in enumerate(t.steps)], new_line=t.loc.line))
        elif t is None:
            out.append(ScenarioDiff(name, REMOVED, [StepDiff(REMOVED, k + 1, _step_text(st, so)) for k, st in enumerate(s.steps)], old_line=s.loc.line))
        else:
            keys_a = [_step_key(x) for x in s.steps]
            keys_b = [_step_key(x) for x in t.steps]
            if keys_a == keys_b:
                continue
            steps = []
            for op, i1, i2, j1, j2 in difflib.SequenceMatcher(None, keys_a, keys_b, autojunk=False).get_opcodes():
                if op == "equal":
                    continue
                steps += [StepDiff(REMOVED, k + 1, _step_text(s.steps[k], so)) for k in range(i1, i2)]
                steps += [StepDiff(ADDED, k + 1, _step_text(t.steps[k], sn)) for k in range(j1, j2)]
            out.append(ScenarioDiff(name, CHANGED, steps, s.loc.line, t.loc.line))
    return out


# -- findings ------------------------------------------------------------------------------

_NAME_CHARS = r"A-Za-z0-9_"


def translate_message(message: str, wire_map: dict[str, str], rung_numbers: dict[int, int]) -> str:
    """Rewrite an old finding's message in the new revision's wire names and rung numbers."""
    if not wire_map and not rung_numbers:
        return message
    names = sorted(wire_map, key=len, reverse=True)
    wire_alt = "|".join(re.escape(n) for n in names)
    pattern = r"(?P<rung>\brung (?P<num>\d+))"
    if wire_alt:
        pattern += rf"|(?<![{_NAME_CHARS}.])(?P<wire>{wire_alt})(?![{_NAME_CHARS}]|\.[{_NAME_CHARS}])"

    def swap(m: re.Match) -> str:
        if m.group("rung"):
            num = int(m.group("num"))
            return f"rung {rung_numbers.get(num, num)}"
        return wire_map[m.group("wire")]
    return re.sub(pattern, swap, message)


def _findings(old: list[Diagnostic], new: list[Diagnostic], wire_map: dict[str, str], rung_numbers: dict[int, int]) -> list[FindingDiff]:
    rest_new = list(new)
    rest_old = list(old)
    for key_old in (lambda d: (d.rule, translate_message(d.message, wire_map, rung_numbers)), lambda d: (d.rule, d.message)):
        pool: dict[tuple[str, str], list[Diagnostic]] = defaultdict(list)
        for d in rest_new:
            pool[(d.rule, d.message)].append(d)
        unmatched = []
        for d in rest_old:
            bucket = pool.get(key_old(d))
            if bucket:
                bucket.pop(0)
            else:
                unmatched.append(d)
        rest_old = unmatched
        rest_new = [d for bucket in pool.values() for d in bucket]
    out = [FindingDiff(DISAPPEARED, d.rule, str(d.severity), d.message, d.line, d.column, d.path) for d in sorted(rest_old)]
    out += [FindingDiff(APPEARED, d.rule, str(d.severity), d.message, d.line, d.column, d.path) for d in sorted(rest_new)]
    return out


# -- revisions: load, check, compare -------------------------------------------------------------

@dataclass
class Revision:
    """One side of a diff: a file to read, or text with the path it stands for.

    ``path`` names the file in messages; with ``text`` it also resolves
    ``use`` (relative to it). ``real_path`` is read when set (``use`` is
    then resolved beside it). ``label`` names the revision ("HEAD",
    "working tree"). A revision with neither text nor real_path does not
    exist (a file added or deleted).
    """

    path: str
    text: str | None = None
    real_path: str | None = None
    label: str = ""

    @property
    def exists(self) -> bool:
        return self.text is not None or self.real_path is not None

    def read_text(self, limits: "Limits | None" = None) -> str:
        """The text for a line diff: a regular file within the size limit, else nothing (its load error says why)."""
        if self.text is not None:
            return self.text
        if self.real_path is None:
            return ""
        from ctllint.reading.loader import link_out_of_repository
        from ctllint.reading.safeio import ReadProblem, read_bytes

        if link_out_of_repository(self.real_path) is not None:
            return ""  # as loading it: a link out of the repository is never read
        try:
            data = read_bytes(self.real_path, limits)
        except ReadProblem:
            return ""
        return data.decode("utf-8", errors="replace")


def _load(rev: Revision, checker: "Checker | None") -> LoadResult:
    kinds = checker.host.kinds if checker else None
    limits = checker.limits if checker else None
    cache = checker.device_cache if checker else None
    if rev.real_path is not None:
        return load_file(rev.real_path, kinds, limits, cache, display_path=rev.path)
    return load_text(rev.text or "", rev.path, kinds, limits, cache)


def _check(rev: Revision, checker: "Checker") -> list[Diagnostic]:
    if rev.real_path is not None:
        return checker.check_file(rev.real_path, display_path=rev.path).diagnostics
    return checker.check_text(rev.text or "", rev.path).diagnostics


def diff_revisions(old: Revision, new: Revision, checker: "Checker | None" = None, findings: bool = True) -> SchematicDiff:
    """Load, check and compare two revisions: see ``_diff_revisions``; one unit of the command's time budget."""
    with work(f"the diff of {new.path if new.exists else old.path}"):
        return _diff_revisions(old, new, checker, findings)


def _diff_revisions(old: Revision, new: Revision, checker: "Checker | None" = None, findings: bool = True) -> SchematicDiff:
    """Load (and, with a checker, check) two revisions and compare them.

    A revision that does not load gives status "unloadable": its format
    errors in ``load_errors`` and a line diff of the texts in ``text_diff``,
    so that no change is hidden. A checker that fails leaves the findings
    uncompared, with the reason in ``notes``.
    """
    results = {side: (_load(rev, checker) if rev.exists else None) for side, rev in (("old", old), ("new", new))}
    errors = {side: r.diagnostics for side, r in results.items() if r is not None and r.schematic is None}
    if errors:
        out = SchematicDiff(old.path if old.exists else None, new.path if new.exists else None, "unloadable", old.label, new.label)
        out.load_errors = errors
        for side in errors:
            out.notes.append(f"the {side} revision does not load, so only a line diff is shown")
        limits = checker.limits if checker else None
        a = old.read_text(limits).splitlines() if old.exists else []
        b = new.read_text(limits).splitlines() if new.exists else []
        out.text_diff = list(difflib.unified_diff(a, b, f"{old.label or 'old'}/{old.path}", f"{new.label or 'new'}/{new.path}", lineterm=""))
        return out
    sch_old = results["old"].schematic if results["old"] else None
    sch_new = results["new"].schematic if results["new"] else None
    diags_old = diags_new = None
    note = None
    if checker is not None and findings:
        try:
            diags_old = _check(old, checker) if old.exists else []
            diags_new = _check(new, checker) if new.exists else []
        except Exception as exc:  # noqa: BLE001 - the structural diff stands without findings
            diags_old = diags_new = None
            text = str(exc).strip().splitlines()
            note = f"findings not compared: the checker failed ({type(exc).__name__}{': ' + text[0] if text else ''})"
    out = semantic_diff(sch_old, sch_new, diags_old, diags_new, old.label, new.label)
    if note:
        out.notes.append(note)
    return out


def diff_files(old_path: str | None, new_path: str | None, checker: "Checker | None" = None) -> SchematicDiff:
    """Compare two schematic files (None for a side that does not exist)."""
    old = Revision(old_path or "", real_path=old_path, label=old_path or "")
    new = Revision(new_path or "", real_path=new_path, label=new_path or "")
    return diff_revisions(old, new, checker)


# -- text output ------------------------------------------------------------------------------

_GREEN, _RED, _YELLOW, _CYAN, _BOLD, _RESET = "\033[32m", "\033[31m", "\033[33m", "\033[36m", "\033[1m", "\033[0m"
_MARK = {ADDED: "+", APPEARED: "+", REMOVED: "-", DISAPPEARED: "-", CHANGED: "~", MOVED: "~"}


def _wires_text(pair: tuple[str, str] | None) -> str:
    return f"{pair[0]}-{pair[1]}" if pair else ""


def _quote(text: str | None) -> str:
    return f'"{text}"' if text is not None else "(none)"


def render_text(diffs: list[SchematicDiff], colour: bool = False) -> str:
    """The diffs for a terminal or a CI log: plain ASCII, +/-/~ markers, grouped per file and rung."""
    def paint(code: str, text: str) -> str:
        return f"{code}{text}{_RESET}" if colour else text

    def mark(change: str, text: str) -> str:
        m = _MARK[change]
        code = {"+": _GREEN, "-": _RED, "~": _YELLOW}[m]
        return paint(code, f"{m} {text}")

    from ctllint.checking.usage import printable

    lines: list[str] = []
    for d in diffs:
        if lines:
            lines.append("")
        lines += _render_one(_printable(d, printable), paint, mark)
    return "".join(line + "\n" for line in lines)


def _printable(value: Any, printable) -> Any:
    """``value`` with every text in it shown by ``printable``: names, titles, values and messages come
    from the files, and control characters or bidirectional overrides in them must not reach a terminal."""
    if isinstance(value, Enum):
        return value
    if isinstance(value, str):
        return printable(value)
    if isinstance(value, list):
        return [_printable(v, printable) for v in value]
    if isinstance(value, tuple):
        return tuple(_printable(v, printable) for v in value)
    if isinstance(value, dict):
        return {_printable(k, printable): _printable(v, printable) for k, v in value.items()}
    if is_dataclass(value) and not isinstance(value, type):
        return type(value)(**{f.name: _printable(getattr(value, f.name), printable) for f in fields(value)})
    return value


def _render_one(d: SchematicDiff, paint, mark) -> list[str]:
    if d.old_path and d.new_path and d.old_path != d.new_path:
        name = f"{d.old_path} -> {d.new_path}"
    else:
        name = d.path
    labels = f" ({d.old_label or 'old'} -> {d.new_label or 'new'})" if (d.old_label or d.new_label) and (d.old_label, d.new_label) != (d.old_path, d.new_path) else ""
    status = {"added": " [new file]", "deleted": " [deleted]", "unloadable": " [does not load]"}.get(d.status, "")
    out = [paint(_BOLD, f"ctllint diff {name}{labels}{status}")]
    for note in d.notes:
        out.append(paint(_CYAN, f"  note: {note}"))
    if d.status == "unloadable":
        for side, diags in d.load_errors.items():
            for e in diags:
                out.append(f"  {side}: {e.path}:{e.line}:{e.column}: {e.message}")
        out += [("  " + line) for line in d.text_diff]
        return out
    if not d.changed:
        out.append("  no electrical change (layout, comments or equal values only)")
        return out
    for h in d.header:
        out.append("  " + mark(CHANGED, f"{h.field}: {_show(h.old)} -> {_show(h.new)}"))
    if d.wire_renames:
        out.append("  wires renumbered (same connections under new numbers):")
        out += [f"    wire {o} -> {n}" for o, n in d.wire_renames.items()]
    if d.supplies:
        out.append("  supplies:")
        for s in d.supplies:
            out += _item(mark, s.change, f"supply {s.name}", s.fields)
    if d.devices:
        out.append("  devices:")
        for dev in d.devices:
            out += _item(mark, dev.change, f"{dev.tag} ({dev.kind})", dev.fields)
    if d.rungs:
        out.append("  rungs:")
        for r in d.rungs:
            out += _render_rung(r, mark)
    if d.scenarios:
        out.append("  expect:")
        for s in d.scenarios:
            out.append("    " + mark(s.change, f'scenario "{s.name}"'))
            for st in s.steps:
                out.append("        " + mark(st.change, f"step {st.step}: {st.text}"))
    if d.findings:
        out.append("  findings:")
        for f in d.findings:
            own = d.new_path if f.change == APPEARED else d.old_path
            where = f"line {f.line}" if f.path in ("", own) else f"{f.path} line {f.line}"
            where = where if f.change == APPEARED else f"was {where}"
            out.append("    " + mark(f.change, f"{f.severity}: {f.message} [{f.rule}] ({where})"))
    elif d.findings_compared and (d.electrical_changes or d.wire_renames):
        out.append("  findings: none appeared or disappeared")
    return out


def _show(value: str | None) -> str:
    return "(none)" if value is None else value


def _item(mark, change: str, name: str, changes: list[ValueChange]) -> list[str]:
    if change == CHANGED:
        return ["    " + mark(CHANGED, name)] + ["        " + mark(CHANGED, f"{c.field}: {_show(c.old)} -> {_show(c.new)}") for c in changes]
    values = ", ".join(f"{c.field}: {c.new if change == ADDED else c.old}" for c in changes)
    return ["    " + mark(change, name + (f": {values}" if values else ""))]


def _render_rung(r: RungDiff, mark) -> list[str]:
    if r.change == ADDED:
        head = f"rung {r.new_number}"
    elif r.change == REMOVED:
        head = f"rung {r.old_number}"
    else:
        head = f"rung {r.old_number}" + (f" -> {r.new_number}" if r.old_number != r.new_number else "")
    if r.title:
        head += f" {_quote(r.title)}"
    if r.moved:
        head += " (moved among the rungs)"
    out = ["    " + mark(r.change, head)]
    for c in r.fields:
        out.append("        " + mark(CHANGED, f"{c.field}: {_show(c.old)} -> {_show(c.new)}"))
    for p in r.paths:
        out.append("        " + mark(r.change, p))
    for e in r.elements:
        if e.change == MOVED:
            text = f"{e.element} moved: wires {_wires_text(e.old_wires)} -> {_wires_text(e.new_wires)}"
        else:
            text = f"{e.element} on wires {_wires_text(e.new_wires or e.old_wires)}"
        if e.note:
            text += f" ({e.note})"
        out.append("        " + mark(e.change, text))
    return out


def render_json(diffs: list[SchematicDiff]) -> str:
    import json

    doc = {"files": [d.as_dict() for d in diffs], "changed": sum(1 for d in diffs if d.changed)}
    return json.dumps(doc, indent=2, ensure_ascii=False) + "\n"
