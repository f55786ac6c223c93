"""The result of a semantic diff: what changed, as data classes a report or a JSON document reads.

``SchematicDiff`` and the parts it lists (devices, supplies, rungs and their
elements, scenarios, findings), the change words (``ADDED``, ``MOVED``...) and
``changed_rungs``. Its own module because the outputs (text, JSON, the HTML
report) read these and nothing of how they were found.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from ctllint.reading.model import Diagnostic
from ctllint.review.diff.wires import natural

ADDED, REMOVED, CHANGED, MOVED = "added", "removed", "changed", "moved"
APPEARED, DISAPPEARED = "appeared", "disappeared"


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
            "wire_renames": [{"old": o, "new": n} for o, n in sorted(self.wire_renames.items(), key=lambda p: natural(p[0]))],
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
