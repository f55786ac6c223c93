"""``ctllint check``: check schematic files and print their findings in a report format.

The command most runs are, kept apart from the parser and the shared set-up in ``cli`` so that
each command reads on its own; it imports the checking run itself only when it runs.
"""
from __future__ import annotations

import argparse
import sys
import textwrap

from ctllint.commands.base import (EXIT_FINDINGS, EXIT_OK, UsageError, add_config_args, add_quiet_arg, command, exit_note, printable,
                                  printable_diagnostic, settings_for, setup, split_names, write_output)
from ctllint.reading.model import Severity
from ctllint.output.report import SAFETY_NOTE, render_text, render_with_note, summary_line, use_colour


def _configure_check(p: argparse.ArgumentParser) -> None:
    p.description = "Check schematic files and print findings.\n\n" + textwrap.fill(SAFETY_NOTE, 78)
    p.epilog = ("exit status: 0 no finding at or above --fail-on, 1 at least one, 2 usage or\n"
                "configuration error, 3 internal error.\n"
                "suppress one finding with a comment on its line:\n"
                "  # ctllint-allow: RULE -- reason\n"
                "the safety note is shown on every run (standard error for text output; a\n"
                "field of the JSON, SARIF and JUnit reports); --no-safety-note or\n"
                "'safety-note: false' in the configuration leaves it out.")
    p.add_argument("paths", nargs="*", metavar="PATH", help="files or folders (default: the current folder); folders are searched for *.ctl.yaml and *.ctl.yml")
    p.add_argument("--format", default="text", metavar="FORMAT", help="text (default), json, sarif, junit, or a plugin's format")
    p.add_argument("-o", "--output", metavar="FILE", help="write the report to FILE (atomically) instead of standard output")
    p.add_argument("--select", action="append", metavar="RULES", help="check only these rules or plugins (comma-separated; repeatable)")
    p.add_argument("--ignore", action="append", metavar="RULES", help="skip these rules or plugins (comma-separated; repeatable)")
    p.add_argument("--fail-on", choices=("error", "warning", "info"), help="lowest severity that makes the exit status 1 (default: error)")
    p.add_argument("-j", "--jobs", type=int, metavar="N", help="check files in N processes (default: jobs: in the configuration, else the number of cores)")
    p.add_argument("--no-cache", action="store_true", help="do not read or write the result cache")
    add_quiet_arg(p)
    p.add_argument("--baseline", metavar="FILE", help="report only findings not recorded in this baseline")
    p.add_argument("--write-baseline", metavar="FILE", help="record today's findings in FILE and exit 0")
    p.add_argument("--no-safety-note", action="store_true", help="leave the safety note out (standard error and the JSON, SARIF and JUnit reports); configuration: safety-note: false")
    add_config_args(p)


def _run_check(args: argparse.Namespace) -> int:
    from ctllint.checking.run import run_check

    cfg, host = setup(args, trust_local=True)
    if args.format not in host.formats:
        raise UsageError(f"ctllint: unknown format '{args.format}' (available: {', '.join(sorted(host.formats))})")
    settings = settings_for(cfg, host, split_names(args.select) or None, split_names(args.ignore))
    if args.jobs is not None and args.jobs < 1:
        raise UsageError("ctllint: --jobs must be at least 1")
    paths = args.paths or ["."]
    from ctllint.output.progress import Meters

    jobs = args.jobs if args.jobs is not None else cfg.jobs  # the command line, then the configuration's jobs:
    with Meters(args.quiet) as meters:
        result = run_check(paths, cfg, host, settings, jobs=jobs, use_cache=not args.no_cache, progress=meters.start)
    note = None if args.no_safety_note or not cfg.safety_note else SAFETY_NOTE
    if result.missing:
        raise UsageError("ctllint: " + "; ".join(f"path '{m}' does not exist" for m in result.missing))
    diagnostics = result.diagnostics
    if args.write_baseline:
        from ctllint.checking.baseline import write_baseline

        write_baseline(args.write_baseline, diagnostics)
        print(f"ctllint: recorded {len(diagnostics)} finding(s) in {args.write_baseline}", file=sys.stderr)
        if note:
            print(note_text(note), file=sys.stderr)
        return EXIT_OK
    if args.baseline:
        from ctllint.checking.baseline import filter_baseline

        diagnostics = filter_baseline(args.baseline, diagnostics)
    fmt = host.formats[args.format]
    shown, files = diagnostics, result.files
    if args.format not in ("json", "sarif"):  # those escape every character themselves
        shown, files = [printable_diagnostic(d) for d in diagnostics], [printable(f) for f in files]
    if args.format == "text":
        text = render_text(shown, files, host.rules, colour=args.output is None and use_colour())
    else:
        text = render_with_note(fmt, shown, files, host.rules, note)
    write_output(text, args.output)
    fail_on = Severity.parse(args.fail_on or cfg.fail_on or "error")
    failed = any(d.severity >= fail_on for d in diagnostics)
    if args.format == "text" or args.output:
        tail = summary_line(diagnostics, result.files, result.device_files)
        print(f"ctllint: {tail}" + (f" ({exit_note(fail_on)})" if failed else ""), file=sys.stderr)
        if not result.files:
            print(f"ctllint: no *.ctl.yaml or *.ctl.yml files under {', '.join(paths)}", file=sys.stderr)
    # The note on every run, clean ones too: on standard error after the
    # summary, unless the report on standard output carries it itself.
    if note and (args.format == "text" or args.output or args.format not in ("json", "sarif", "junit")):
        print(note_text(note), file=sys.stderr)
    return EXIT_FINDINGS if failed else EXIT_OK


def note_text(note: str) -> str:
    """The safety note as a paragraph for a terminal or a CI log."""
    return textwrap.fill(f"Safety note: {note}", 78)


command("check", "check schematic files and print findings")((_configure_check, _run_check))
