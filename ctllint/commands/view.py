"""Commands that show a circuit: ``draw``, ``report``, ``xref`` and ``simulate``."""
from __future__ import annotations

import argparse
import difflib
import os
import pathlib
import shutil
import sys

from ctllint.reading.budget import work
from ctllint.commands.cli import (EXIT_FINDINGS, EXIT_OK, UsageError, add_config_args, add_plugins_arg, add_quiet_arg, command, exit_note, printable,
                   printable_diagnostic, settings_for, setup, split_names, write_output)
from ctllint.checking.discover import discover, display_path
from ctllint.checking.engine import Checker
from ctllint.reading.loader import LoadResult, load_file
from ctllint.reading.model import Diagnostic, Location, Scenario, Schematic, Severity, Step
from ctllint.output.report import SAFETY_NOTE, render_text, summary_line

# -- shared -------------------------------------------------------------------------


def _add_rule_args(p: argparse.ArgumentParser) -> None:
    p.add_argument("--select", action="append", metavar="RULES", help="mark only these rules or plugins (comma-separated; repeatable)")
    p.add_argument("--ignore", action="append", metavar="RULES", help="do not mark these rules or plugins (comma-separated; repeatable)")


def _one_file(args: argparse.Namespace, path: str) -> tuple[LoadResult, str, object, object]:
    """Set up from configuration and load ``path``; a missing file is a usage error."""
    if not os.path.exists(path):
        raise UsageError(f"ctllint: path '{path}' does not exist")
    if os.path.isdir(path):
        raise UsageError(f"ctllint: '{path}' is a folder; name one schematic file")
    cfg, host = setup(args)
    shown = display_path(path)
    loaded = load_file(path, host.kinds, cfg.limits, display_path=shown)
    return loaded, shown, cfg, host


def _refuse_unloadable(loaded: LoadResult) -> int | None:
    """Print a file's format findings when it does not load; the exit status to return."""
    if loaded.schematic is not None:
        return None
    sys.stderr.write(render_text(sorted(printable_diagnostic(d) for d in loaded.diagnostics), [], {}))
    print("ctllint: the file does not load; fix the findings above first", file=sys.stderr)
    return EXIT_FINDINGS


# -- draw ---------------------------------------------------------------------------

DRAW_HELP = """\
Draw a schematic's ladder as a plain SVG file.

The drawing shows one pair of rails per supply (hot at left, common at
right, labelled with their wire names), the rungs numbered as in findings,
each wire's number on its wire, trade symbols (NO contact: two bars; NC
contact: two bars with a slash; coil: a circle; pilot light: a circle with
a cross; other loads: a circle with a letter; fuse: a small rectangle with
the wire through it), parallel paths under the path they bridge, and right
of each coil the rungs where its contacts are used ("NO 2, 5  NC 7").

The file is checked with the configured rules, and every finding is marked
on its element: an outline in the colour of its severity (red error, amber
warning, blue info) and the rule name under it. Findings that point at
nothing drawn are listed under the drawing.

Elements carry ids and data attributes (id="el-12", data-element="M1.coil",
data-line="14", data-rung="3") for tools that read the drawing.

exit status: 0 drawn, 1 the file does not load (its format findings are
printed) or the work ran past limits.command_seconds, 2 usage or
configuration error.
"""


def _configure_draw(p: argparse.ArgumentParser) -> None:
    p.description = DRAW_HELP
    p.add_argument("path", metavar="FILE", help="a schematic file (*.ctl.yaml)")
    p.add_argument("-o", "--output", metavar="OUT.svg", help="write the SVG to OUT.svg (atomically) instead of standard output")
    p.add_argument("--no-findings", action="store_true", help="draw the circuit alone: do not run the rules")
    p.add_argument("--no-legend", action="store_true", help="leave out the list of findings and the safety note under the drawing")
    _add_rule_args(p)
    add_config_args(p)
    add_plugins_arg(p)


def _run_draw(args: argparse.Namespace) -> int:
    loaded, shown, cfg, host = _one_file(args, args.path)
    with work(f"checking and drawing {shown}"):
        return _draw(args, loaded, shown, cfg, host)


def _draw(args: argparse.Namespace, loaded: LoadResult, shown: str, cfg, host) -> int:
    from ctllint.output.draw import layout

    refused = _refuse_unloadable(loaded)
    if refused is not None:
        return refused
    diagnostics: list[Diagnostic] = []
    if not args.no_findings:
        settings = settings_for(cfg, host, split_names(args.select) or None, split_names(args.ignore))
        diagnostics = Checker(host, settings, cfg.limits).check_file(args.path, display_path=shown).diagnostics
    drawing = layout(loaded.schematic, diagnostics, legend=not args.no_legend, kind_registry=host.kinds)
    write_output(drawing.svg, args.output)
    return EXIT_OK


command("draw", "draw a schematic as SVG: rails, numbered rungs, wire numbers, symbols, coil cross-references, findings marked")((_configure_draw, _run_draw))


# -- report -------------------------------------------------------------------------

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
    _add_rule_args(p)
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
    from ctllint.commands.diff import _git_cmd, _resolve

    if shutil.which("git") is None:
        raise UsageError("ctllint: --changes-since needs the git program on PATH")
    cwd = os.getcwd()
    top_done = _git_cmd(["rev-parse", "--show-toplevel"], cwd=cwd, check=False)
    if top_done.returncode != 0:
        raise UsageError("ctllint: --changes-since: not a git repository (run the report from inside the repository's working tree)")
    top = os.path.realpath(top_done.stdout.decode("utf-8", "surrogateescape").strip())
    if ".." in rev:
        raise UsageError(f"ctllint: --changes-since takes one revision, not a range ('{rev}'): the report compares it with the "
                         "working tree; for a branch's changes use --changes-since \"$(git merge-base main HEAD)\"")
    sha = _resolve(rev, cwd)  # a bad revision is a UsageError naming it
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
    from ctllint.commands.diff import _dependents, _git_cmd, _name_status, _RevisionTree

    top, sha = base
    listing = _git_cmd(["diff", "--name-status", "-z", "-M", "--no-ext-diff", "--no-relative", sha, "--"], cwd=top)
    pairs = _name_status(listing.stdout.decode("utf-8", "surrogateescape"))
    old_of = {new: old for old, new in pairs if new is not None}
    in_report = {_repo_rel(t.path, top) for t in targets}
    # gone from the report: deleted, or renamed to a path the report does not cover
    gone = sorted((old, new) for old, new in pairs if old is not None and old != new and new not in in_report)
    tree = _git_cmd(["ls-tree", "-r", "-z", "--name-only", "--full-tree", sha], cwd=top).stdout
    in_old = set(tree.decode("utf-8", "surrogateescape").split("\0"))
    uses_changed = dict(_dependents(pairs, sha, None, top, top, [], cfg.limits)) if pairs else {}
    label, now = rev, "working tree"
    out = Changes(rev, sha)
    with tempfile.TemporaryDirectory(prefix="ctllint-report-") as tmp:
        old_tree = _RevisionTree(sha, top, os.path.join(tmp, "old"), cfg.limits)

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


# -- xref ---------------------------------------------------------------------------

XREF_HELP = """\
For each relay, timer, contactor and starter: the rung of its coil, the
rungs where its NO and NC contacts are used, and the contacts used against
those its 'contacts' field declares ("available: not declared" when the
field is absent). A contact used twice in one rung is listed twice. A
timer's instantaneous contacts (instant-NO, instant-NC) are listed with its
NO and NC contacts and checked against their own counts in 'contacts'.
TERMINALS gives the coil's terminals and each contact's, in the order of
the rungs listed (written in the file, or assigned by EN 50005 numbering:
coil A1-A2, NO x3-x4, NC x1-x2, timed x7-x8 and x5-x6).

exit status: 0 shown, 1 the file does not load, 2 usage error.
"""


def _configure_xref(p: argparse.ArgumentParser) -> None:
    p.description = XREF_HELP
    p.add_argument("path", metavar="FILE", help="a schematic file (*.ctl.yaml)")
    add_config_args(p)
    add_plugins_arg(p)


def _rungs_text(numbers: list[int]) -> str:
    return ", ".join(map(str, numbers)) if numbers else "-"


def xref_rows(sch: Schematic, coil_kinds: set[str], kinds=None) -> list[dict[str, str]]:
    """One row per device of a coil kind that the rungs use or declare."""
    from ctllint.output.draw import coil_uses
    from ctllint.reading.terminals import assign

    uses = coil_uses(sch)
    marks = assign(sch, kinds)
    numbers = {r.index: r.number for r in sch.rungs}
    coil_rung: dict[str, list[int]] = {}
    terminals: dict[str, dict[str, list[tuple[int, int, str]]]] = {}
    # a timer's instantaneous contacts, counted apart from its timed NO/NC as `contacts` declares them
    instant: dict[str, dict[str, int]] = {}
    for el in sch.elements:
        if el.part == "coil" or (el.part in ("set", "power", "run") and el.role == "load"):  # a latching relay's set coil, a safety relay's power, a drive's run input
            coil_rung.setdefault(el.tag, []).append(numbers[el.rung])
        elif el.part in ("instant-NO", "instant-NC"):
            counts = instant.setdefault(el.tag, {})
            counts[el.part] = counts.get(el.part, 0) + 1
        m = marks.get(el.index)
        if m is not None and el.part in ("coil", "set", "reset", "NO", "NC", "instant-NO", "instant-NC"):
            terminals.setdefault(el.tag, {}).setdefault(el.part, []).append((numbers[el.rung], el.index, m.pair))
    rows = []
    tags = [t for t, d in sch.devices.items() if d.kind in coil_kinds]
    tags.sort(key=lambda t: (min(coil_rung.get(t, [10**9])), t))
    for tag in tags:
        dev = sch.devices[tag]
        use = uses.get(tag)
        no = use.no if use else []
        nc = use.nc if use else []
        count = dev.get("contacts")
        if count is None:
            available, status = "not declared", ""
        else:
            bits = []
            if count.no or not count.changeover:
                bits.append(f"{count.no} NO")
            if count.nc or not count.changeover:
                bits.append(f"{count.nc} NC")
            if count.changeover:
                bits.append(f"{count.changeover} changeover")
            for name, n in (("instant-NO", count.instant_no), ("instant-NC", count.instant_nc)):
                if n:
                    bits.append(f"{n} {name}")
            available = ", ".join(bits)
            used = instant.get(tag, {})
            inst_no, inst_nc = used.get("instant-NO", 0), used.get("instant-NC", 0)
            no_max, nc_max = count.available()
            extra = [
                (max(0, len(no) - inst_no - no_max), "NO"),
                (max(0, len(nc) - inst_nc - nc_max), "NC"),
                (max(0, inst_no - count.instant_no), "instant-NO"),
                (max(0, inst_nc - count.instant_nc), "instant-NC"),
            ]
            over = [f"{n} {name} too many" for n, name in extra if n]
            status = "OVER: " + ", ".join(over) if over else "ok"
        rows.append({
            "coil": tag,
            "kind": dev.kind,
            "rung": _rungs_text(coil_rung.get(tag, [])) if tag in coil_rung else "no coil",
            "no": f"{len(no)}: {_rungs_text(no)}" if no else ("  ".join(f"{name}: {_rungs_text(r)}" for name, r in use.other.items())
                                                               if use and use.other else "0"),
            "nc": f"{len(nc)}: {_rungs_text(nc)}" if nc else "0",
            "terminals": "  ".join(
                (f"{part} " if part != "coil" else "") + " ".join(t for _, _, t in sorted(terminals[tag][part]))
                for part in ("coil", "set", "reset", "NO", "NC", "instant-NO", "instant-NC") if part in terminals.get(tag, {})) or "-",
            "available": available,
            "status": status,
        })
    return rows


def render_xref(rows: list[dict[str, str]]) -> str:
    heads = {"coil": "COIL", "kind": "KIND", "rung": "COIL RUNG", "no": "NO USED (RUNGS)", "nc": "NC USED (RUNGS)", "terminals": "TERMINALS", "available": "AVAILABLE", "status": ""}
    if not rows:
        return "no relay, timer, contactor or starter in this file\n"
    rows = [{k: printable(text) for k, text in r.items()} for r in rows]  # tags are the file's text: no terminal control
    keys = list(heads)
    widths = {k: max(len(heads[k]), *(len(r[k]) for r in rows)) for k in keys}
    lines = ["  ".join(heads[k].ljust(widths[k]) for k in keys).rstrip()]
    for r in rows:
        lines.append("  ".join(r[k].ljust(widths[k]) for k in keys).rstrip())
    return "\n".join(lines) + "\n"


def _run_xref(args: argparse.Namespace) -> int:
    loaded, shown, cfg, host = _one_file(args, args.path)
    refused = _refuse_unloadable(loaded)
    if refused is not None:
        return refused
    coil_kinds = {k.name for k in host.kinds.kinds.values() if k.coil}
    sys.stdout.write(render_xref(xref_rows(loaded.schematic, coil_kinds, host.kinds)))
    return EXIT_OK


command("xref", "coil cross-reference: where each coil's NO and NC contacts are used, against the contacts available")((_configure_xref, _run_xref))


# -- simulate -----------------------------------------------------------------------

SIMULATE_HELP = """\
Run the behaviour model on a schematic and print every load's state after
each step: a row per step, a column per load (or the other way round when
that fits the terminal better; see --layout). The first row is the rest
state: power on, nothing actuated, selectors in their first position,
everything settled. Steps that leave the circuit oscillating or shorted are
called out, and the run stops there, as an expect scenario does.

Steps (--step, repeatable, run in the order given):

  press:TAG[,TAG...]        hold pushbuttons or switches actuated
  release:TAG[,TAG...]      return them to rest (a selector to its first position)
  set:TAG=VALUE[,...]       a selector's position (set:SS1=auto), or a switch
                            or PLC output on/off (set:Q0_3=on)
  trip:TAG[,TAG...]         trip an overload, blow a fuse or breaker
  reset:TAG[,TAG...]        reset it
  power:on | power:off      control power
  wait:TIME                 let time pass for timers (wait:5s, wait:200ms)
  check:TAG=on|off[,...]    compare states; a failed check is marked FAIL

or --scenario NAME to run one of the file's expect scenarios.

Cells: ON energized, - not energized; * marks a load this step changed.

exit status: 0 every step settled and every check held, 1 a step did not
settle, a check failed, the file does not load or the run passed
limits.command_seconds, 2 usage error (an unknown tag, a bad step, an
unknown scenario).

example:
  ctllint simulate press.ctl.yaml --step press:PB2 --step release:PB2 \\
      --step trip:OL1 --step reset:OL1 --step power:off --step wait:5s
"""

_ACTIONS = ("press", "release", "set", "trip", "reset", "power", "wait", "check")


def _configure_simulate(p: argparse.ArgumentParser) -> None:
    p.description = SIMULATE_HELP
    p.add_argument("path", metavar="FILE", help="a schematic file (*.ctl.yaml)")
    p.add_argument("--step", action="append", default=[], metavar="ACTION:ARGS", help="a step to run, e.g. press:PB2 (repeatable; see above)")
    p.add_argument("--scenario", metavar="NAME", help="run the expect scenario of this name instead of --step")
    p.add_argument("--layout", choices=("auto", "steps", "loads"), default="auto",
                   help="rows are steps (steps), rows are loads (loads), or whichever fits the terminal (auto, the default)")
    add_config_args(p)
    add_plugins_arg(p)


def _tag_hint(tag: str, candidates: list[str]) -> str:
    close = difflib.get_close_matches(tag, candidates, n=1)
    return f" (did you mean {close[0]}?)" if close else ""


def parse_step(text: str, index: int, sch: Schematic, sim) -> Step:
    """One --step argument as a model Step; a UsageError says what is wrong."""
    where = f"--step {text}"
    action, sep, rest = text.partition(":")
    action = action.strip().lower()
    rest = rest.strip()
    if action not in _ACTIONS:
        hint = _tag_hint(action, list(_ACTIONS))
        raise UsageError(f"ctllint: {where}: unknown action '{action}'{hint}; actions: {', '.join(_ACTIONS)} (see 'ctllint simulate --help')")
    if not sep or not rest:
        raise UsageError(f"ctllint: {where}: {action} needs an argument, e.g. {_EXAMPLE[action]}")
    loc = Location("<command line>", 0, index + 1)
    step = Step(action=action, loc=loc)
    devices = sch.devices
    if action == "power":
        if rest.lower() not in ("on", "off"):
            raise UsageError(f"ctllint: {where}: power is on or off, e.g. power:off")
        step.targets[""] = rest.lower()
        step.target_locs[""] = loc
        return step
    if action == "wait":
        from ctllint.reading.quantities import QuantityError, parse_quantity

        try:
            step.seconds = parse_quantity(rest, "time").value
        except QuantityError as exc:
            raise UsageError(f"ctllint: {where}: {exc} (e.g. wait:5s or wait:200ms)") from None
        return step
    for item in (x.strip() for x in rest.split(",")):
        if not item:
            raise UsageError(f"ctllint: {where}: an empty device name")
        tag, eq, value = (s.strip() for s in item.partition("="))
        if action in ("set", "check") and (not eq or not value):
            raise UsageError(f"ctllint: {where}: {action} needs TAG=VALUE, e.g. {_EXAMPLE[action]}")
        if action not in ("set", "check") and eq:
            raise UsageError(f"ctllint: {where}: {action} takes device tags only, e.g. {_EXAMPLE[action]}")
        if tag not in devices:
            raise UsageError(f"ctllint: {where}: no device '{tag}' in {sch.path}{_tag_hint(tag, list(devices))}")
        dev = devices[tag]
        if action == "press" and tag not in sim.actuated:
            raise UsageError(f"ctllint: {where}: {tag} is a {dev.kind}; press works on pushbuttons and switches"
                             + (" (a selector is turned with set:TAG=POSITION)" if dev.kind == "selector" else ""))
        if action == "release" and tag not in sim.actuated and tag not in sim.position:
            raise UsageError(f"ctllint: {where}: {tag} is a {dev.kind}; release works on pushbuttons, switches and selectors")
        if action in ("trip", "reset") and tag not in sim.tripped:
            raise UsageError(f"ctllint: {where}: {tag} is a {dev.kind}; {action} works on overloads, fuses and breakers")
        if action == "set":
            if tag in sim.position:
                positions = [str(p) for p in (dev.get("positions") or [])]
                if value not in positions:
                    raise UsageError(f"ctllint: {where}: selector {tag} has no position '{value}' (positions: {', '.join(positions)})")
            elif tag in sim.actuated or tag in sim.outputs_on:
                if value.lower() not in ("on", "off"):
                    raise UsageError(f"ctllint: {where}: {tag} is set on or off, not '{value}'")
                value = value.lower()
            else:
                raise UsageError(f"ctllint: {where}: {tag} is a {dev.kind}; set works on selectors, switches and PLC outputs")
        if action == "check":
            if value.lower() not in ("on", "off"):
                raise UsageError(f"ctllint: {where}: check {tag} is on or off, not '{value}'")
            value = value.lower() == "on"
        step.targets[tag] = value if action in ("set", "check") else None
        step.target_locs[tag] = loc
    return step


_EXAMPLE = {
    "press": "press:PB2", "release": "release:PB2", "set": "set:SS1=auto", "trip": "trip:OL1",
    "reset": "reset:OL1", "power": "power:off", "wait": "wait:5s", "check": "check:M1=on",
}


def step_text(step: Step) -> str:
    """A step written back in --step form."""
    if step.action == "power":
        return f"power:{step.targets.get('', 'on')}"
    if step.action == "wait":
        s = step.seconds
        return f"wait:{s * 1000:g}ms" if 0 < s < 1 else f"wait:{s:g}s"
    if step.action == "set":
        return "set:" + ",".join(f"{t}={v}" for t, v in step.targets.items())
    if step.action == "check":
        return "check:" + ",".join(f"{t}={'on' if v else 'off'}" for t, v in step.targets.items())
    return f"{step.action}:" + ",".join(step.targets)


def simulate_rows(sim, steps: list[Step]) -> tuple[list[str], list[dict]]:
    """Run ``steps`` from rest; one row per state: step text, load states, notes.

    The steps run once through ``Simulator.scenario_steps``, the scenario
    runner itself, so the states shown are exactly what an expect scenario
    of those steps sees, in time linear in the steps.
    """
    rows = []
    loads: list[str] = []
    previous: dict[str, bool] = {}
    scen = Scenario("command line", Location("<command line>", 0, 0), list(steps))
    for at, events in sim.scenario_steps(scen):
        n = 0 if at is None else at + 1
        states = sim.states()
        if not loads:
            loads = list(states)
        label = "rest" if n == 0 else step_text(steps[n - 1])
        notes: list[str] = []
        stop = False
        ok = True
        for ev in events:
            if ev.kind == "unsettled" and (ev.step_index is None or ev.step_index == n - 1):
                notes.append("UNSETTLED: " + (ev.why or "the circuit does not settle"))
                stop = True
                ok = False
            elif ev.kind == "check" and ev.step_index == n - 1:
                notes.append(f"FAIL: {ev.tag} is {'on' if ev.actual else 'off'}, expected {'on' if ev.expected else 'off'}")
                ok = False
        if n and steps[n - 1].action == "check" and ok:
            notes.append("check holds")
        changed = {t for t in states if n and states[t] != previous.get(t)}
        rows.append({"step": label, "states": states, "changed": changed, "notes": notes, "ok": ok})
        previous = states
        if stop:
            if n < len(steps):
                rows[-1]["notes"].append(f"stopped: {len(steps) - n} later step(s) not run")
            break
    return loads, rows


def _shown_rows(loads: list[str], rows: list[dict]) -> tuple[list[str], list[dict]]:
    """Tags, step texts and notes with control characters and bidirectional overrides escaped (they come from the file)."""
    shown = [printable(t) for t in loads]
    out = []
    for r in rows:
        out.append({**r, "step": printable(r["step"]), "notes": [printable(n) for n in r["notes"]],
                    "states": {printable(t): s for t, s in r["states"].items()}, "changed": {printable(t) for t in r["changed"]}})
    return shown, out


def _cell(row: dict, tag: str) -> str:
    return ("ON" if row["states"].get(tag) else "-") + ("*" if tag in row["changed"] else "")


def render_steps_table(loads: list[str], rows: list[dict]) -> str:
    """Rows are steps, columns are loads, a notes column last."""
    loads, rows = _shown_rows(loads, rows)
    step_w = max(len("STEP"), *(len(r["step"]) for r in rows))
    widths = [max(len(t), 3) for t in loads]
    head = f"{'#':>2}  {'STEP':<{step_w}}  " + "  ".join(f"{t:<{w}}" for t, w in zip(loads, widths)) + "  NOTES"
    out = [head.rstrip()]
    for i, r in enumerate(rows):
        cells = "  ".join(f"{_cell(r, t):<{w}}" for t, w in zip(loads, widths))
        out.append(f"{i:>2}  {r['step']:<{step_w}}  {cells}  {'; '.join(r['notes'])}".rstrip())
    return "\n".join(out) + "\n"


def render_loads_table(loads: list[str], rows: list[dict]) -> str:
    """Rows are loads, columns are steps (numbered; the steps and notes listed above)."""
    loads, rows = _shown_rows(loads, rows)
    out = ["steps:"]
    for i, r in enumerate(rows):
        out.append(f"  {i:>2}  {r['step']}" + (f"   {'; '.join(r['notes'])}" if r["notes"] else ""))
    tag_w = max(len("LOAD"), *(len(t) for t in loads)) if loads else 4
    out.append("")
    out.append(f"{'LOAD':<{tag_w}}  " + "  ".join(f"{i:<3}" for i in range(len(rows))).rstrip())
    for t in loads:
        out.append((f"{t:<{tag_w}}  " + "  ".join(f"{_cell(r, t):<3}" for r in rows)).rstrip())
    return "\n".join(out) + "\n"


def _run_simulate(args: argparse.Namespace) -> int:
    loaded, shown, cfg, host = _one_file(args, args.path)
    with work(f"simulating {shown}"):
        return _simulate(args, loaded, shown)


def _simulate(args: argparse.Namespace, loaded: LoadResult, shown: str) -> int:
    from ctllint.circuit.analysis import Circuit

    refused = _refuse_unloadable(loaded)
    if refused is not None:
        return refused
    sch = loaded.schematic
    if args.scenario is not None and args.step:
        raise UsageError("ctllint: give either --scenario or --step, not both")
    sim = Circuit(sch).simulator()
    if args.scenario is not None:
        found = [s for s in sch.expect if s.name == args.scenario]
        if not found:
            names = ", ".join(repr(s.name) for s in sch.expect) or "none"
            raise UsageError(f"ctllint: no expect scenario named '{args.scenario}' in {shown} (scenarios: {names})")
        steps = list(found[0].steps)
        unknown = sorted({t for st in steps for t in st.targets if t and t not in sch.devices})
        if unknown:
            raise UsageError(f"ctllint: scenario '{args.scenario}' names unknown device(s) {', '.join(unknown)}; run 'ctllint check {shown}'")
    else:
        steps = [parse_step(text, i, sch, sim) for i, text in enumerate(args.step)]
    loads, rows = simulate_rows(sim, steps)
    if not loads:
        print(f"{printable(shown)}: no loads to show (no coil, solenoid, light, horn or PLC input in the rungs)")
        return EXIT_OK
    by_steps = render_steps_table(loads, rows)
    by_loads = render_loads_table(loads, rows)
    choice = args.layout
    if choice == "auto":
        columns = shutil.get_terminal_size((100, 24)).columns
        # Notes end the steps table's lines and may wrap; the grid itself must fit.
        grid_w = len(by_steps.splitlines()[0]) - len("NOTES") + 12
        loads_w = max(len(line) for line in by_loads.splitlines() if line and not line.startswith(" "))
        choice = "steps" if grid_w <= columns or grid_w <= loads_w else "loads"
    title = printable(f"{shown}" + (f": scenario '{args.scenario}'" if args.scenario is not None else ""))
    sys.stdout.write(title + "\n" + (by_steps if choice == "steps" else by_loads))
    sys.stdout.write("ON energized, - not energized, * changed by this step\n")
    return EXIT_OK if all(r["ok"] for r in rows) else EXIT_FINDINGS


command("simulate", "run the behaviour model step by step and print every load's state after each step")((_configure_simulate, _run_simulate))
