"""``ctllint diff``: review a schematic change like a controls engineer.

Three ways to call it::

    ctllint diff OLD.ctl.yaml NEW.ctl.yaml
    ctllint diff --git REV [PATH...]          REV against the working tree
    ctllint diff --git REV1..REV2 [PATH...]   between two revisions (REV1...REV2: from their merge base)

It prints, per file and per rung, the devices, supplies, rungs, elements,
expect scenarios and findings that changed, with wire renumbering shown as
"wire 3 -> 13" (see ``ctllint.review.diff``). ``--format json`` prints the same as
one JSON object. The exit status is 0 whatever changed (a diff is not a
failure), 2 for a usage error (a missing file, a bad revision, not a git
repository).

Git integration (``git diff`` shows the semantic diff of schematics)
--------------------------------------------------------------------

Tell git which files use the driver, in ``.gitattributes`` (commit it)::

    *.ctl.yaml diff=ctllint
    *.ctl.yml  diff=ctllint

and define the driver, once per clone (or ``--global``)::

    git config diff.ctllint.command "ctllint diff --git-external --"

``git diff``, ``git diff --cached`` and ``git diff REV`` then print the
semantic diff for schematics and the usual line diff for other files.
``git log -p``, ``git show`` and ``git format-patch`` use external diff
drivers only when asked: ``git log -p --ext-diff``, ``git show --ext-diff``;
``git diff --no-ext-diff`` gives the line diff back.

Git runs the driver from the top of the working tree with seven arguments,
``path old-file old-hex old-mode new-file new-hex new-mode`` (nine for a
rename: ``new-path`` and the rename message follow). An added or deleted
file has ``/dev/null`` as its missing side. ``--git-external`` reads that
form; it always exits 0 so that git carries on with the next file, and a
revision that does not load is shown as a line diff beside its errors.
The ``use`` files of both sides are read from the working tree in this
mode (git hands the driver only the one file); ``ctllint diff --git``
reads them from the revision itself.
"""
from __future__ import annotations

import argparse
import os
import sys
import tempfile

from ctllint.commands._git import RevisionTree, dependent_schematics, git_cmd, name_status, resolve_commit
from ctllint.commands.base import EXIT_OK, UsageError, add_config_args, add_plugins_arg, command, settings_for, setup, write_output
from ctllint.review.diff import Revision, SchematicDiff, diff_revisions, render_json, render_text
from ctllint.checking.engine import Checker
from ctllint.reading.loader import SCHEMATIC_SUFFIXES
from ctllint.output.report import use_colour
from ctllint.reading.safeio import ReadProblem, read_bytes
from ctllint.reading.yamlsafe import Limits

DEV_NULL = "/dev/null"

EPILOG = """\
examples:
  ctllint diff old/press.ctl.yaml press.ctl.yaml
  ctllint diff --git HEAD                       uncommitted changes to schematics
  ctllint diff --git main..feature plant/       what a branch changes under plant/
  ctllint diff --git HEAD~1..HEAD --format json

git integration (git diff shows this diff for schematics):
  printf '*.ctl.yaml diff=ctllint\\n*.ctl.yml diff=ctllint\\n' >> .gitattributes
  git config diff.ctllint.command "ctllint diff --git-external --"
  git diff; git log -p --ext-diff; git diff --no-ext-diff for the line diff
  (git calls the driver with: path old-file old-hex old-mode new-file new-hex
  new-mode; /dev/null stands for the missing side of an added or deleted file)

exit status: 0 whatever changed, 1 a file's diff ran past limits.command_seconds,
2 usage error (missing file, bad revision).
"""


def _configure(p: argparse.ArgumentParser) -> None:
    p.description = (
        "Show what changed electrically between two revisions of schematics: devices,\n"
        "supplies, rungs, elements moved between wires, wires renumbered, expect\n"
        "scenarios, and the findings that appeared or disappeared."
    )
    p.epilog = EPILOG
    p.usage = (
        "ctllint diff [options] OLD NEW\n"
        "       ctllint diff [options] --git REV[..REV] [PATH ...]\n"
        "       ctllint diff [options] --git-external PATH OLD-FILE OLD-HEX OLD-MODE NEW-FILE NEW-HEX NEW-MODE [NEW-PATH INFO]"
    )
    p.add_argument("files", nargs="*", metavar="FILE", help="OLD NEW (two files); with --git, paths to limit the diff to; with --git-external, git's arguments")
    mode = p.add_mutually_exclusive_group()
    mode.add_argument("--git", metavar="REV[..REV]", help="compare the schematics changed between git revisions: REV alone is REV against the working tree, A..B from A to B, A...B from their merge base to B")
    mode.add_argument("--git-external", action="store_true", help="act as git's external diff driver (diff.ctllint.command); takes git's 7 or 9 arguments")
    p.add_argument("--format", choices=("text", "json"), default="text", help="text (default) or json")
    p.add_argument("-o", "--output", metavar="FILE", help="write the diff to FILE (atomically) instead of standard output")
    p.add_argument("--no-findings", action="store_true", help="do not run the checker on both revisions (faster; no findings section)")
    p.add_argument("--color", "--colour", dest="color", choices=("auto", "always", "never"), default="auto",
                   help="colour the text output: auto (default: on a terminal), always, never; NO_COLOR turns it off")
    add_config_args(p)
    add_plugins_arg(p)


def _colour(args: argparse.Namespace) -> bool:
    if os.environ.get("NO_COLOR") or args.format != "text" or args.output:
        return False
    if args.color == "always":
        return True
    return args.color == "auto" and use_colour(sys.stdout)


def _checker(args: argparse.Namespace) -> Checker:
    """The configured checker; its plugins' device kinds are needed to load, even without findings."""
    cfg, host = setup(args)
    return Checker(host, settings_for(cfg, host, None, []), cfg.limits)


def _run(args: argparse.Namespace) -> int:
    if args.git_external:
        diffs = _external(args)
    elif args.git is not None:
        diffs = _git(args)
    else:
        diffs = _two_files(args)
    if args.format == "json":
        text = render_json(diffs)
    elif not diffs:
        text = "" if args.git_external else "ctllint diff: no schematic changed\n"
    else:
        text = render_text(diffs, colour=_colour(args))
        if args.git_external:
            text += "\n"  # git prints one driver's output after another: keep the files apart
    write_output(text, args.output)
    return EXIT_OK


# -- OLD NEW ------------------------------------------------------------------------

def _file_revision(path: str) -> Revision:
    if path == DEV_NULL:
        return Revision(path, label=path)
    if not os.path.exists(path):
        raise UsageError(f"ctllint: file '{path}' does not exist")
    if os.path.isdir(path):
        raise UsageError(f"ctllint: '{path}' is a folder; ctllint diff compares two files (or use --git REV PATH...)")
    return Revision(path, real_path=path, label=path)


def _two_files(args: argparse.Namespace) -> list[SchematicDiff]:
    if len(args.files) != 2:
        raise UsageError("ctllint: diff needs two files, OLD and NEW (or --git REV[..REV] [PATH...])\nusage: ctllint diff OLD NEW")
    old, new = (_file_revision(p) for p in args.files)
    if not old.exists and not new.exists:
        raise UsageError("ctllint: both sides are /dev/null")
    checker = _checker(args)
    return [diff_revisions(old, new, checker, findings=not args.no_findings)]


# -- git's external diff driver -----------------------------------------------------

def _external(args: argparse.Namespace) -> list[SchematicDiff]:
    argv = args.files
    if len(argv) == 1:  # git passes only the path of an unmerged file
        sys.stdout.write(f"ctllint diff {argv[0]}: unmerged; resolve the conflict, then diff again\n")
        return []
    if len(argv) not in (7, 9):
        raise UsageError(
            f"ctllint: --git-external takes the 7 arguments git passes to an external diff "
            f"(path old-file old-hex old-mode new-file new-hex new-mode), or 9 for a rename; got {len(argv)}"
        )
    path, old_file, old_hex, _old_mode, new_file, new_hex, _new_mode = argv[:7]
    new_path = argv[7] if len(argv) == 9 else path
    checker = _checker(args)
    old = _external_side(path, old_file, old_hex, checker.limits)
    new = _external_side(new_path, new_file, new_hex, checker.limits)
    return [diff_revisions(old, new, checker, findings=not args.no_findings)]


def _external_side(path: str, file: str, hex_id: str, limits: Limits | None = None) -> Revision:
    """One side as git hands it over: /dev/null, the working file itself, or a temporary copy of a blob."""
    label = "working tree" if not hex_id.strip("0.") else hex_id[:9]
    if file == DEV_NULL:
        return Revision(path, label="none")
    if os.path.abspath(file) == os.path.abspath(path):
        return Revision(path, real_path=file, label=label)
    if not os.path.lexists(file):
        raise UsageError(f"ctllint: cannot read {file}: it does not exist")
    try:
        data = read_bytes(file, limits)
    except ReadProblem:
        # not a regular file or too large: loading it reports why, at 1:1 of the file
        return Revision(path, real_path=file, label=label)
    if data.startswith(b"\xef\xbb\xbf"):
        data = data[3:]
    # text stands for the file at `path`, so `use` resolves beside it in the working tree
    return Revision(path, text=data.decode("utf-8", errors="replace"), label=label)


# -- --git REV[..REV] -------------------------------------------------------------------

def _parse_range(spec: str, cwd: str) -> tuple[tuple[str, str], tuple[str, str] | None]:
    """((old sha, old label), (new sha, new label) or None for the working tree)."""
    if "..." in spec:
        a, b = spec.split("...", 1)
        a, b = a or "HEAD", b or "HEAD"
        ra, rb = resolve_commit(a, cwd), resolve_commit(b, cwd)
        base = git_cmd(["merge-base", ra, rb], cwd=cwd, check=False)
        if base.returncode != 0:
            raise UsageError(f"ctllint: {a} and {b} have no merge base")
        return (base.stdout.decode().strip(), f"merge-base({a}, {b})"), (rb, b)
    if ".." in spec:
        a, b = spec.split("..", 1)
        a, b = a or "HEAD", b or "HEAD"
        return (resolve_commit(a, cwd), a), (resolve_commit(b, cwd), b)
    if not spec:
        raise UsageError("ctllint: --git needs a revision, e.g. --git HEAD or --git main..feature")
    return (resolve_commit(spec, cwd), spec), None


def _git(args: argparse.Namespace) -> list[SchematicDiff]:
    cwd = os.getcwd()
    top_done = git_cmd(["rev-parse", "--show-toplevel"], cwd=cwd, check=False)
    if top_done.returncode != 0:
        raise UsageError("ctllint: --git: not inside a git working tree")
    top = top_done.stdout.decode().strip()
    (old_sha, old_label), new = _parse_range(args.git, cwd)
    revs = [old_sha] + ([new[0]] if new else [])
    listing = git_cmd(["diff", "--name-status", "-z", "--no-relative", "-M", "--no-ext-diff", *revs, "--", *args.files], cwd=cwd)
    changes = name_status(listing.stdout.decode("utf-8", "surrogateescape"))
    changes = [(a, b) for a, b in changes if any(p and p.endswith(SCHEMATIC_SUFFIXES) for p in (a, b))]
    if not changes:
        return []
    checker = _checker(args)
    new_label = new[1] if new else "working tree"
    dependents = dict(dependent_schematics(changes, old_sha, new[0] if new else None, top, cwd, args.files, checker.limits))
    diffs = []
    with tempfile.TemporaryDirectory(prefix="ctllint-diff-") as tmp:
        old_tree = RevisionTree(old_sha, top, os.path.join(tmp, "old"), checker.limits)
        new_tree = RevisionTree(new[0], top, os.path.join(tmp, "new"), checker.limits) if new else None
        for old_rel, new_rel in changes + [(name, name) for name in dependents]:
            old_rev = Revision(old_rel or new_rel, label=old_label)
            if old_rel:
                real = old_tree.write(old_rel)
                old_rev = Revision(old_rel, real_path=real, label=old_label)
            new_rev = Revision(new_rel or old_rel, label=new_label)
            if new_rel:
                if new_tree is not None:
                    real = new_tree.write(new_rel)
                else:
                    real = os.path.join(top, *new_rel.split("/"))
                    real = real if os.path.lexists(real) else None  # a link, pipe or device: loading it says why
                new_rev = Revision(new_rel, real_path=real, label=new_label)
            diff = diff_revisions(old_rev, new_rev, checker, findings=not args.no_findings)
            if new_rel in dependents:
                if not diff.changed:
                    continue
                diff.notes.insert(0, f"unchanged itself; shown because it uses {dependents[new_rel]}, which changed")
            diffs.append(diff)
    return diffs


command("diff", "show what changed electrically between two revisions of schematics (files or git revisions)")((_configure, _run))
