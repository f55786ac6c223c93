"""The ``ctllint`` command line.

Exit status: 0 when no finding is at or above ``--fail-on`` (default
error), 1 when one is, 2 for a usage or configuration error, 3 for an
internal error.
"""
from __future__ import annotations

import argparse
import dataclasses
import os
import re
import stat
import sys
import textwrap
import traceback
from typing import Any, Callable

from ctllint import __version__
from ctllint.reading.budget import CommandTimeout, command_budget, set_limit
from ctllint.checking.config import Config, ConfigError, find_config, load_config, resolve_rules
from ctllint.checking.host import PluginHost, RuleSettings
from ctllint.reading.model import Diagnostic, Severity
from ctllint.checking.usage import UsageError, printable, printable_diagnostic, write_output  # noqa: F401 - the commands' shared names
from ctllint.output import report as _formats
from ctllint.output.report import SAFETY_NOTE, render_text, render_with_note, summary_line, use_colour

EXIT_OK, EXIT_FINDINGS, EXIT_USAGE, EXIT_INTERNAL = 0, 1, 2, 3

# The built-in output formats, registered like a plugin (see PluginHost.create).
BUILTIN_PLUGINS = (("ctllint.report", _formats),)


def exit_note(fail_on: Severity) -> str:
    """What exit status 1 means, said beside the summary: a run that found mistakes did not fail to run."""
    found = {Severity.ERROR: "errors", Severity.WARNING: "warnings or errors", Severity.INFO: "findings"}[fail_on]
    return f"exit status 1: the check ran and found {found}"


DESCRIPTION = """\
Check motor-control and relay-logic schematics (*.ctl.yaml) against design
rules: stop buttons normally closed and in series, overloads in every
starter coil path, seal-ins, contact ratings, coil voltages, grounded-side
switching, automatic restart, transformer and fuse sizing, and more.

""" + textwrap.fill(SAFETY_NOTE, 78)

EPILOG = """\
examples:
  ctllint check                       check every *.ctl.yaml below this folder
  ctllint check plant/ --format sarif -o ctllint.sarif
  ctllint rules                       list every rule with its plugin and severity
  ctllint explain seal-in             why a rule exists, its source and examples

exit status: 0 clean, 1 findings at or above --fail-on, 2 usage or
configuration error, 3 internal error.
"""


COMMANDS: dict[str, tuple[Callable[[argparse.ArgumentParser], None], Callable[[argparse.Namespace], int], str]] = {}


def command(name: str, help: str):
    def wrap(pair):
        COMMANDS[name] = (pair[0], pair[1], help)
        return pair
    return wrap


class _Parser(argparse.ArgumentParser):
    def error(self, message: str) -> None:  # exit 2 with the usage, as argparse does, but through our path
        raise UsageError(f"{self.prog}: {message}\n{self.format_usage().strip()}")


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(prog="ctllint", description=DESCRIPTION, epilog=EPILOG, formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("--version", action="version", version=f"ctllint {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    from ctllint.commands import LAZY

    names = list(COMMANDS) + [n for n in LAZY if n not in COMMANDS]
    for name in names:
        if name in COMMANDS:
            configure, _, help_text = COMMANDS[name]
        else:  # listed for --help; its module is imported only when the command runs
            configure, help_text = (lambda p: None), LAZY[name][1]
        p = sub.add_parser(name, help=help_text, description=help_text, formatter_class=argparse.RawDescriptionHelpFormatter)
        configure(p)
    return parser


# -- shared setup --------------------------------------------------------------

def add_config_args(p: argparse.ArgumentParser) -> None:
    p.add_argument("--config", metavar="FILE", help="configuration file (default: .ctllint.yaml or [tool.ctllint] in pyproject.toml, found by walking up from the current folder)")


def add_quiet_arg(p: argparse.ArgumentParser) -> None:
    p.add_argument("-q", "--quiet", action="store_true",
                   help="no progress line on a long run (it shows only on a terminal, never in pipes, CI or with NO_COLOR set)")


def add_plugins_arg(p: argparse.ArgumentParser) -> None:
    p.add_argument("--plugins", action="store_true",
                   help="also load the local plugins named under plugins: in the configuration (Python code of the repository; "
                        "only for a repository you trust). Without it they are not run")


def setup(args: argparse.Namespace, trust_local: bool | None = None) -> tuple[Config, PluginHost]:
    """Configuration and plugins for a command.

    Local plugins (``plugins:`` in the configuration) are Python files of the
    repository: running them is running the repository's code. ``check``,
    ``rules`` and ``explain`` load them and say so on standard error; the
    commands that only show a circuit (diff, draw, report, xref, simulate,
    schema) load them only with ``--plugins`` (``trust_local`` False unless
    the flag was given), and say when they were left out.
    """
    path = getattr(args, "config", None)
    if path is not None and not os.path.isfile(path):
        raise UsageError(f"ctllint: configuration file '{path}' does not exist")
    cfg = load_config(path or find_config(os.getcwd()))
    if trust_local is None:
        trust_local = bool(getattr(args, "plugins", False))
    where = _config_shown(cfg.path) if cfg.plugins else ""
    if cfg.plugins and not trust_local:
        print(f"ctllint: local plugins named in {where} not loaded (pass --plugins to run them): "
              f"{', '.join(printable(p) for p in cfg.plugins)}", file=sys.stderr)
        cfg.untrusted_plugins, cfg.plugins = cfg.plugins, []
    set_limit(cfg.limits.command_seconds)
    host = PluginHost.create(local_plugins=cfg.plugins, builtin=BUILTIN_PLUGINS)
    if cfg.plugins:
        print(f"ctllint: loaded local plugins from {where}: {', '.join(printable(p) for p in cfg.plugins)}", file=sys.stderr)
    return cfg, host


def _config_shown(path: str | None) -> str:
    from ctllint.checking.discover import display_path

    return printable(display_path(path)) if path else "the configuration"


def settings_for(cfg: Config, host: PluginHost, select: list[str] | None, ignore: list[str]) -> RuleSettings:
    try:
        enabled, severities, options = resolve_rules(cfg, host.rules, select, ignore, lenient=bool(cfg.untrusted_plugins))
    except ValueError as exc:
        raise UsageError(f"ctllint: {exc}") from None
    return RuleSettings(enabled, severities, options, time_limit=cfg.limits.plugin_seconds)


def split_names(values: list[str] | None) -> list[str]:
    out: list[str] = []
    for v in values or []:
        out.extend(x.strip() for x in v.split(",") if x.strip())
    return out


# -- check ---------------------------------------------------------------------

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


# -- rules / explain --------------------------------------------------------------

def _configure_rules(p: argparse.ArgumentParser) -> None:
    p.add_argument("--format", choices=("text", "json", "markdown"), default="text", help="table layout (default text)")
    add_config_args(p)


def rules_table(host: PluginHost, fmt: str = "text") -> str:
    from ctllint.checking.core_rules import all_rules

    rows = [(r.name, r.plugin, str(r.severity), r.summary) for r in all_rules(host.rules).values()]
    if fmt == "json":
        import json

        return json.dumps([{"rule": a, "plugin": b, "severity": c, "summary": d} for a, b, c, d in rows], indent=2) + "\n"
    if fmt == "markdown":
        lines = ["| rule | plugin | severity | summary |", "|---|---|---|---|"]
        lines += [f"| `{a}` | {b} | {c} | {d} |" for a, b, c, d in rows]
        return "\n".join(lines) + "\n"
    widths = [max([len(h)] + [len(r[i]) for r in rows]) for i, h in enumerate(("RULE", "PLUGIN", "SEVERITY"))]
    out = [f"{'RULE':<{widths[0]}}  {'PLUGIN':<{widths[1]}}  {'SEVERITY':<{widths[2]}}  SUMMARY"]
    out += [f"{a:<{widths[0]}}  {b:<{widths[1]}}  {c:<{widths[2]}}  {d}" for a, b, c, d in rows]
    return "\n".join(out) + "\n"


def _run_rules(args: argparse.Namespace) -> int:
    _, host = setup(args, trust_local=True)
    sys.stdout.write(rules_table(host, args.format))
    for p in host.problems:
        print(f"ctllint: plugin-error: {p.plugin}: {p.message}", file=sys.stderr)
    return EXIT_OK


command("rules", "list every registered rule: name, plugin, default severity, summary")((_configure_rules, _run_rules))


def _configure_explain(p: argparse.ArgumentParser) -> None:
    p.add_argument("rule", metavar="RULE", help="a rule name, as 'ctllint rules' lists them")
    add_config_args(p)


def explain_text(rule: Any) -> str:
    origin = "core rule" if rule.plugin == "core" else f"{rule.plugin} plugin"
    parts = [f"{rule.name}  ({origin}, default severity {rule.severity})", "", rule.summary, ""]
    paragraphs = textwrap.dedent(rule.doc).strip().split("\n\n")
    parts.append("\n\n".join(textwrap.fill(para, 78, break_on_hyphens=False) for para in paragraphs))
    parts += ["", f"Source: {rule.source}"]
    for label, ex in (("Failing example", rule.failing), ("Passing example", rule.passing)):
        if ex is not None:
            parts += ["", f"{label}: {ex.title}", textwrap.indent(textwrap.dedent(ex.yaml).strip("\n"), "    ")]
    parts += ["", "Options:"]
    if rule.plugin == "core":
        parts.append("    none: a core rule cannot be disabled, re-graded, configured or suppressed")
        return "\n".join(parts) + "\n"
    if rule.options:
        for name, opt in rule.options.items():
            parts.append(f"    {name} (default {opt.default!r}): {opt.doc}")
    else:
        parts.append("    none (severity can be set under rules: in the configuration)")
    parts += ["", f"Suppress one finding with a comment on its line: # ctllint-allow: {rule.name} -- reason"]
    return "\n".join(parts) + "\n"


def _run_explain(args: argparse.Namespace) -> int:
    from ctllint.checking.core_rules import all_rules

    _, host = setup(args, trust_local=True)
    known = all_rules(host.rules)
    rule = known.get(args.rule)
    if rule is None:
        import difflib

        hint = difflib.get_close_matches(args.rule, list(known), n=1)
        raise UsageError(f"ctllint: no rule named '{args.rule}'" + (f" (did you mean '{hint[0]}'?)" if hint else "; see 'ctllint rules'"))
    sys.stdout.write(explain_text(rule))
    return EXIT_OK


command("explain", "print a rule's documentation: why, source, a failing and a passing example, options")((_configure_explain, _run_explain))


# -- main -----------------------------------------------------------------------

def refuse_file_named_like_option(words: list[str]) -> None:
    """A word before ``--`` that reads as an option but names an existing file is refused.

    pre-commit and git append file names to a command line; a file named
    ``--write-baseline=.ctl.yaml`` or ``-o.ctl.yaml`` would otherwise be taken
    as an option (and could turn a failing check into a pass). The hook and
    the diff driver put ``--`` before the names; this catches a command line
    that forgot it. A usage error (exit 2), never a silent pass.
    """
    for word in words:
        if word == "--":
            return
        if len(word) > 1 and word.startswith("-") and os.path.lexists(word):
            raise UsageError(f"ctllint: '{printable(word)}' is both an option and the name of a file; put -- before file names "
                             f"(ctllint check -- FILE...)")


class Terminated(KeyboardInterrupt):
    """SIGTERM, raised in the main thread so that workers are stopped and temporary files removed.

    A KeyboardInterrupt, so that code which lets Ctrl-C through lets this through too.
    """


def _on_sigterm(signum: int, frame: Any) -> None:
    raise Terminated()


def main(argv: list[str] | None = None) -> int:
    import signal
    import threading

    previous = None
    if threading.current_thread() is threading.main_thread():
        previous = signal.signal(signal.SIGTERM, _on_sigterm)
    try:
        return _main(argv)
    finally:
        if previous is not None:
            signal.signal(signal.SIGTERM, previous)


def _main(argv: list[str] | None) -> int:
    from ctllint import commands

    words = sys.argv[1:] if argv is None else argv
    commands.load(next((w for w in words if not w.startswith("-")), ""))
    parser = build_parser()
    try:
        refuse_file_named_like_option(words)
        args = parser.parse_args(argv)
        if not args.command:
            parser.print_help()
            return EXIT_USAGE
        with command_budget(args.command):
            return COMMANDS[args.command][1](args)
    except UsageError as exc:
        print(str(exc), file=sys.stderr)
        return EXIT_USAGE
    except ConfigError as exc:
        print(f"ctllint: configuration error: {exc}", file=sys.stderr)
        return EXIT_USAGE
    except Terminated:
        print("ctllint: terminated", file=sys.stderr)
        return 143  # 128 + SIGTERM, as a shell reports it
    except CommandTimeout as exc:
        print(f"ctllint: {exc}", file=sys.stderr)
        return EXIT_FINDINGS
    except KeyboardInterrupt:
        print("ctllint: interrupted", file=sys.stderr)
        return 130
    except BrokenPipeError:
        return EXIT_OK
    except Exception:  # noqa: BLE001
        print("ctllint: internal error; please report it with this trace:", file=sys.stderr)
        traceback.print_exc()
        return EXIT_INTERNAL


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
