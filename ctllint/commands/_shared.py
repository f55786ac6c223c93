"""What the commands that show a circuit share: one schematic file set up and loaded, and the rule selection.

``draw``, ``xref``, ``simulate`` and ``export`` each take one schematic file and refuse one
that does not load (its format findings printed); ``draw`` and ``report`` take ``--select`` and
``--ignore`` for the rules they mark. Several commands use these, so they stand apart from
each command's module and from ``cli`` (the parser and the set-up every command shares).
"""
from __future__ import annotations

import argparse
import os
import sys

from ctllint.commands.base import EXIT_FINDINGS, UsageError, printable_diagnostic, setup
from ctllint.checking.discover import display_path
from ctllint.reading.loader import LoadResult, load_file
from ctllint.output.report import render_text


def add_rule_args(p: argparse.ArgumentParser) -> None:
    p.add_argument("--select", action="append", metavar="RULES", help="mark only these rules or plugins (comma-separated; repeatable)")
    p.add_argument("--ignore", action="append", metavar="RULES", help="do not mark these rules or plugins (comma-separated; repeatable)")


def one_file(args: argparse.Namespace, path: str) -> tuple[LoadResult, str, object, object]:
    """Set up from configuration and load ``path``; a missing file is a usage error."""
    if not os.path.exists(path):
        raise UsageError(f"ctllint: path '{path}' does not exist")
    if os.path.isdir(path):
        raise UsageError(f"ctllint: '{path}' is a folder; name one schematic file")
    cfg, host = setup(args)
    shown = display_path(path)
    loaded = load_file(path, host.kinds, cfg.limits, display_path=shown)
    return loaded, shown, cfg, host


def refuse_unloadable(loaded: LoadResult) -> int | None:
    """Print a file's format findings when it does not load; the exit status to return."""
    if loaded.schematic is not None:
        return None
    sys.stderr.write(render_text(sorted(printable_diagnostic(d) for d in loaded.diagnostics), [], {}))
    print("ctllint: the file does not load; fix the findings above first", file=sys.stderr)
    return EXIT_FINDINGS
