"""``ctllint report``: check schematics and write one self-contained HTML page, drawings and findings linked.

With ``--changes-since REV`` the page also shows what changed since a git revision; the
revision's files are read from git as ``ctllint diff --git`` reads them (``commands._git``).
"""
from __future__ import annotations

import argparse
import os
import pathlib
import shutil
import sys

from ctllint.reading.budget import work
from ctllint.commands._shared import add_rule_args
from ctllint.commands.base import (EXIT_FINDINGS, EXIT_OK, UsageError, add_config_args, add_plugins_arg, add_quiet_arg, command, exit_note,
                                  settings_for, setup, split_names, write_output)
from ctllint.checking.discover import discover, display_path
from ctllint.checking.engine import Checker
from ctllint.reading.loader import load_file
from ctllint.reading.model import Severity
from ctllint.output.report import SAFETY_NOTE, summary_line


REPORT_HELP = """\
Check schematics and write one self-contained HTML page: a summary per
file (findings by severity), then per file its findings and its drawing.
Each finding links to its element in the drawing, and each rule name in a
drawing links back to its finding. The page uses no external resources
(inline CSS and SVG, no scripts), so it works offline and can be kept as a
CI artifact. It carries no date, so the same files give the same page.

With --changes-since REV (run inside the git repository), the page also
has a "Changes since REV" section: for each schematic of the report that
changed since git revision REV (a commit, branch or tag; compared with the
working tree), what changed electrically, as 'ctllint diff' says it
(devices, supplies, rungs, elements, wires renumbered, expect scenarios,
findings that appeared or disappeared), and each changed rung drawn before
(REV) and after (working tree), side by side on a wide window, with what
was removed or moved away outlined dashed on the old drawing and what was
added or moved there outlined solid on the new one. Only changed rungs are
drawn, each with its own number; a rung that only moved, or whose wires
were only renumbered, is listed, not drawn. Schematics new since REV
(tracked or not) show as new; deleted ones are listed.

examples:
  ctllint report plant/ -o report.html
  ctllint report plant/ --changes-since HEAD~1 -o review.html
  ctllint report --changes-since "$(git merge-base main HEAD)" -o review.html

exit status, as for 'ctllint check': 0 when no finding is at or above
--fail-on (default error), 1 when one is (the page is written either
way; also when a file's check, drawing or diff ran past
limits.command_seconds, and then no page is written), 2 usage or
configuration error, a bad revision, or --changes-since outside a git
working tree (no page is written).
"""


def _configure_report(p: argparse.ArgumentParser) -> None:
    p.description = REPORT_HELP + "\n" + SAFETY_NOTE
    p.add_argument("paths", nargs="*", metavar="PATH", help="files or folders (default: the current folder)")
    p.add_argument("-o", "--output", metavar="report.html", help="write the page to this file (atomically) instead of standard output")
    p.add_argument("--title", default="ctllint report", help="the page's heading (default: %(default)s)")
    p.add_argument("--fail-on", choices=("error", "warning", "info"), help="lowest severity that makes the exit status 1 (default: error)")
    add_quiet_arg(p)
    p.add_argument("--changes-since", metavar="REV",
                   help="add a 'Changes since REV' section: what changed in each schematic since git revision REV "
                        "(e.g. HEAD~1, main, a tag), with each changed rung drawn before and after; needs git")
    add_rule_args(p)
    add_config_args(p)
    add_plugins_arg(p)


def _run_report(args: argparse.Namespace) -> int:
    from ctllint.output.htmlreport import FileReport, render_html

    cfg, host = setup(args)
    settings = settings_for(cfg, host, split_names(args.select) or None, split_names(args.ignore))
    targets, missing = discover(args.paths or ["."], cfg.exclude, cfg.folder if cfg.path else None)
    if missing:
        raise UsageError("ctllint: " + "; ".join(f"path '{m}' does not exist" for m in missing))
    base = _git_base(args.changes_since, targets) if args.changes_since is not None else None
    checker = Checker(host, settings, cfg.limits)
    files = []
    from ctllint.output.progress import Meters

    with Meters(args.quiet) as meters:  # on a terminal: files checked, then files drawn, of the total
        meter = meters.start(len(targets)) if meters.start else None
        for t in targets:
            with work(f"checking {t.shown}"):
                result = checker.check_file(t.path, display_path=t.shown)
                loaded = load_file(t.path, host.kinds, cfg.limits, checker.device_cache, display_path=t.shown)
            files.append(FileReport(t.shown, loaded.schematic, result.diagnostics))
            if meter:
                meter.advance(1)
        changes = None
        if base is not None:
            changes = _changes_since(args.changes_since, base, targets, files, checker, cfg, args.paths or ["."])
        page = render_html(files, args.title, changes, progress=meters.start(len(files), "drew") if meters.start else None)
    write_output(page, args.output)
    every = [d for f in files for d in f.diagnostics]
    fail_on = Severity.parse(args.fail_on or cfg.fail_on or "error")
    failed = any(d.severity >= fail_on for d in every)
    if args.output:
        device_files = sum(1 for f in files if f.schematic is not None and f.schematic.device_file)
        tail = summary_line(every, [f.path for f in files], device_files)
        print(f"ctllint: wrote {args.output}: {tail}" + (f" ({exit_note(fail_on)})" if failed else ""), file=sys.stderr)
        if os.path.isfile(args.output):
            print(f"ctllint: open it in a web browser: {pathlib.Path(os.path.abspath(args.output)).as_uri()}", file=sys.stderr)
    return EXIT_FINDINGS if failed else EXIT_OK


def _repo_rel(path: str, top: str) -> str | None:
    """``path`` relative to the repository's top folder (with /), or None when outside it."""
    absolute = os.path.abspath(path)
    real = os.path.join(os.path.realpath(os.path.dirname(absolute)), os.path.basename(absolute))
    rel = os.path.relpath(real, top)
    if rel == os.curdir or rel.startswith(os.pardir + os.sep) or rel == os.pardir or os.path.isabs(rel):
        return None
    return rel.replace(os.sep, "/")


def _git_base(rev: str, targets) -> tuple[str, str]:
    """The repository's top folder and the commit ``rev`` names; a UsageError (exit 2) when either cannot be had."""
    from ctllint.commands._git import git_cmd, resolve_commit

    if shutil.which("git") is None:
        raise UsageError("ctllint: --changes-since needs the git program on PATH")
    cwd = os.getcwd()
    top_done = git_cmd(["rev-parse", "--show-toplevel"], cwd=cwd, check=False)
    if top_done.returncode != 0:
        raise UsageError("ctllint: --changes-since: not a git repository (run the report from inside the repository's working tree)")
    top = os.path.realpath(top_done.stdout.decode("utf-8", "surrogateescape").strip())
    if ".." in rev:
        raise UsageError(f"ctllint: --changes-since takes one revision, not a range ('{rev}'): the report compares it with the "
                         "working tree; for a branch's changes use --changes-since \"$(git merge-base main HEAD)\"")
    sha = resolve_commit(rev, cwd)  # a bad revision is a UsageError naming it
    outside = [t.shown for t in targets if _repo_rel(t.path, top) is None]
    if outside:
        raise UsageError(f"ctllint: --changes-since: {', '.join(outside[:3])}{' ...' if len(outside) > 3 else ''} "
                         f"{'is' if len(outside) == 1 else 'are'} outside the git repository at {display_path(top)}")
    return top, sha


def _repo_shown(rel: str, top: str, up: bool = False) -> str:
    """A repository file's path as the report shows paths: relative to the current
    folder (with ``up``, also by way of ``..``), else absolute."""
    absolute = os.path.join(top, *rel.split("/"))
    if up:
        try:
            return os.path.relpath(absolute, os.path.realpath(os.getcwd()))
        except ValueError:  # another drive
            return absolute
    return display_path(absolute, os.path.realpath(os.getcwd()))


def _in_scope(rel: str, top: str, given: list[str], exclude: list[str], base: str | None) -> bool:
    """Whether the report would have checked a schematic at ``rel`` (for a file deleted since the revision)."""
    from ctllint.checking.discover import SKIP_DIRS, excluded, is_schematic_name

    if not is_schematic_name(rel):
        return False
    absolute = os.path.join(top, *rel.split("/"))
    for g in given:
        if not os.path.isdir(g):  # a file named on the command line exists, so it is not the deleted one
            continue
        inner = os.path.relpath(absolute, os.path.realpath(g))
        if inner == os.pardir or inner.startswith(os.pardir + os.sep):
            continue
        if any(f in SKIP_DIRS or f.startswith(".") for f in inner.split(os.sep)[:-1]):
            continue
        if not excluded(_repo_shown(rel, top), exclude, base):
            return True
    return False


def _changes_since(rev: str, base: tuple[str, str], targets, files, checker: Checker, cfg, given: list[str]):
    """What changed in the report's schematics since ``rev``: a ``htmlreport.Changes``.

    The old revision's files (and the files they ``use``) are read from git
    into a temporary folder, as 'ctllint diff --git' does; the new side is
    the working tree, as the report checked it.
    """
    import tempfile

    from ctllint.review.diff import Revision, SchematicDiff, diff_revisions, semantic_diff
    from ctllint.output.htmlreport import Changes, FileChange
    from ctllint.commands._git import RevisionTree, dependent_schematics, git_cmd, name_status

    top, sha = base
    listing = git_cmd(["diff", "--name-status", "-z", "-M", "--no-ext-diff", "--no-relative", sha, "--"], cwd=top)
    pairs = name_status(listing.stdout.decode("utf-8", "surrogateescape"))
    old_of = {new: old for old, new in pairs if new is not None}
    in_report = {_repo_rel(t.path, top) for t in targets}
    # gone from the report: deleted, or renamed to a path the report does not cover
    gone = sorted((old, new) for old, new in pairs if old is not None and old != new and new not in in_report)
    tree = git_cmd(["ls-tree", "-r", "-z", "--name-only", "--full-tree", sha], cwd=top).stdout
    in_old = set(tree.decode("utf-8", "surrogateescape").split("\0"))
    uses_changed = dict(dependent_schematics(pairs, sha, None, top, top, [], cfg.limits)) if pairs else {}
    label, now = rev, "working tree"
    out = Changes(rev, sha)
    with tempfile.TemporaryDirectory(prefix="ctllint-report-") as tmp:
        old_tree = RevisionTree(sha, top, os.path.join(tmp, "old"), cfg.limits)

        def old_side(old_rel: str):
            real = old_tree.write(old_rel)
            shown = _repo_shown(old_rel, top)
            loaded = load_file(real, checker.host.kinds, cfg.limits, checker.device_cache, display_path=shown) if real else None
            return real, shown, (loaded.schematic if loaded else None)

        for t, report in zip(targets, files):
            rel = _repo_rel(t.path, top)
            note = None
            if rel in old_of:
                old_rel = old_of[rel]
            elif rel not in in_old:
                old_rel = None  # untracked, or not there at REV: new since REV
            elif rel in uses_changed:
                old_rel = rel
                note = f"unchanged itself; shown because it uses {_repo_shown(uses_changed[rel], top, up=True)}, which changed"
            else:
                out.unchanged += 1
                continue
            if old_rel is None:
                if report.schematic is not None:
                    diff = semantic_diff(None, report.schematic, [], report.diagnostics, label, now)
                else:
                    diff = SchematicDiff(None, t.shown, "added", label, now)
                out.files.append(FileChange(t.shown, diff, None, report.schematic))
                continue
            real, old_shown, old_sch = old_side(old_rel)
            if old_sch is None or report.schematic is None:
                diff = diff_revisions(Revision(old_shown, real_path=real, label=label), Revision(t.shown, real_path=t.path, label=now), checker)
            else:
                try:
                    old_findings = checker.check_file(real, display_path=old_shown).diagnostics
                    diff = semantic_diff(old_sch, report.schematic, old_findings, report.diagnostics, label, now)
                except Exception as exc:  # noqa: BLE001 - as 'ctllint diff': the structural diff stands without findings
                    diff = semantic_diff(old_sch, report.schematic, None, None, label, now)
                    text = str(exc).strip().splitlines()
                    diff.notes.append(f"findings not compared: the checker failed on {label} ({type(exc).__name__}{': ' + text[0] if text else ''})")
            if note:
                if not diff.changed:
                    out.unchanged += 1
                    continue
                diff.notes.insert(0, note)
            out.files.append(FileChange(t.shown, diff, old_sch, report.schematic))
        for old_rel, new_rel in gone:
            if not _in_scope(old_rel, top, given, cfg.exclude, cfg.folder if cfg.path else None):
                continue
            _, old_shown, old_sch = old_side(old_rel)
            diff = SchematicDiff(old_shown, None, "deleted", label, now)
            if new_rel is not None:
                diff.notes.append(f"renamed to {_repo_shown(new_rel, top, up=True)}, which this report does not cover")
            out.deleted.append(FileChange(old_shown, diff, old_sch, None))
    out.deleted.sort(key=lambda c: c.path)
    return out


command("report", "check schematics and write one self-contained HTML page with drawings and linked findings")((_configure_report, _run_report))
