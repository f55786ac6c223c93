"""The ``ctllint`` command line.

Exit status: 0 when no finding is at or above ``--fail-on`` (default
error), 1 when one is, 2 for a usage or configuration error, 3 for an
internal error.
"""
from __future__ import annotations

import argparse
import os
import sys
import textwrap
import traceback
from typing import Any

from ctllint import __version__
from ctllint.checking.config import ConfigError
from ctllint.commands.base import (  # noqa: F401 - names the command modules and tests used from cli
    BUILTIN_PLUGINS, COMMANDS, EXIT_FINDINGS, EXIT_INTERNAL, EXIT_OK, EXIT_USAGE, UsageError, add_config_args,
    add_plugins_arg, add_quiet_arg, command, exit_note, printable, printable_diagnostic, settings_for, setup,
    split_names, write_output,
)
from ctllint.output.report import SAFETY_NOTE
from ctllint.reading.budget import CommandTimeout, command_budget

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
