"""Revisions: load, check and compare two revisions of a file (``Revision``, ``diff_revisions``, ``diff_files``).

A revision is a file to read or a text with the path it stands for; one that
does not load gives a line diff instead. Its own module because it is where
the diff meets the loader and the checker; ``compare`` works on loaded
schematics only.
"""
from __future__ import annotations

import difflib
from dataclasses import dataclass
from typing import TYPE_CHECKING

from ctllint.reading.budget import work
from ctllint.reading.loader import LoadResult, load_file, load_text
from ctllint.reading.model import Diagnostic
from ctllint.reading.yamlsafe import Limits
from ctllint.review.diff.compare import semantic_diff
from ctllint.review.diff.result import SchematicDiff

if TYPE_CHECKING:  # pragma: no cover
    from ctllint.checking.engine import Checker


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
