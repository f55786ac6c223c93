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

from ctllint.review.diff.compare import semantic_diff
from ctllint.review.diff.findings import translate_message
from ctllint.review.diff.render import render_json, render_text
from ctllint.review.diff.result import (
    ADDED, APPEARED, CHANGED, DISAPPEARED, MOVED, REMOVED, DeviceDiff, ElementDiff, FindingDiff, RungDiff, ScenarioDiff,
    SchematicDiff, StepDiff, SupplyDiff, ValueChange, changed_rungs,
)
from ctllint.review.diff.revisions import Revision, diff_files, diff_revisions
from ctllint.review.diff.rungs import RUNG_SIMILARITY
from ctllint.review.diff.values import render_node, render_value
from ctllint.review.diff.wires import Edge, match_wires

__all__ = [
    "ADDED", "APPEARED", "CHANGED", "DISAPPEARED", "MOVED", "REMOVED", "RUNG_SIMILARITY",
    "DeviceDiff", "Edge", "ElementDiff", "FindingDiff", "Revision", "RungDiff", "ScenarioDiff", "SchematicDiff",
    "StepDiff", "SupplyDiff", "ValueChange", "changed_rungs", "diff_files", "diff_revisions", "match_wires",
    "render_json", "render_node", "render_text", "render_value", "semantic_diff", "translate_message",
]
