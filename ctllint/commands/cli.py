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
from ctllint.output.report import SAFETY_NOTE

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
