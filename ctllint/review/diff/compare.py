"""The comparison of two loaded schematics: ``semantic_diff`` puts the parts of a ``SchematicDiff`` together.

It matches the wires once, then asks each part (header, supplies, devices,
rungs, scenarios, findings) for its changes and keeps the wire renames worth
showing. Its own module because it is the one place that knows every part.
"""
from __future__ import annotations

from typing import Iterable

from ctllint.reading.budget import work
from ctllint.reading.model import Diagnostic, Schematic
from ctllint.review.diff.declarations import diff_devices, diff_header, diff_supplies
from ctllint.review.diff.expect import diff_scenarios
from ctllint.review.diff.findings import diff_findings
from ctllint.review.diff.result import SchematicDiff
from ctllint.review.diff.rungs import diff_rungs
from ctllint.review.diff.values import Source
from ctllint.review.diff.wires import Wires, natural


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
    src_old, src_new = Source(old), Source(new)
    wires = Wires(old, new)
    out.header = diff_header(old, new, src_old, src_new)
    out.supplies = diff_supplies(old, new, src_old, src_new)
    out.devices = diff_devices(old, new, src_old, src_new)
    out.rungs, rung_pairs = diff_rungs(old, new, wires)
    # a renamed wire is worth showing where it runs through a rung present in both revisions
    shown: dict[str, str] = {}
    for ro, rn, _ in rung_pairs:
        new_wires = {w for e in rn.elements for w in (e.left, e.right)}
        for o in {w for e in ro.elements for w in (e.left, e.right)} & wires.renames.keys():
            if wires.renames[o] in new_wires:
                shown[o] = wires.renames[o]
    out.wire_renames = dict(sorted(shown.items(), key=lambda p: natural(p[0])))
    out.scenarios = diff_scenarios(old, new, src_old, src_new)
    if old_findings is not None or new_findings is not None:
        rung_numbers = {o.number: n.number for o, n, _ in rung_pairs}
        out.findings = diff_findings(list(old_findings or ()), list(new_findings or ()), wires.message_map(), rung_numbers)
        out.findings_compared = True
    return out
