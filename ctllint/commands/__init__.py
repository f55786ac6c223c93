"""Stage 6, commands: the command line (``cli``) and its sub-commands, imported only when used.

May import every stage (reading, circuit, api, checking, review, output).

One module per command (``check``, ``rules``, ``explain``, ``schema``, ``init``,
``draw``, ``report``, ``xref``, ``simulate``, ``diff``, ``export``, ``lsp``);
``cli`` holds the parser, ``main``, the set-up and what every command shares,
``_shared`` what the commands that show one schematic file share, and ``_git``
what ``diff --git`` and ``report --changes-since`` share about reading git.

A module registers itself with ``ctllint.commands.base.command(name, help)`` applied
to a ``(configure, run)`` pair. ``check``, ``rules`` and ``explain`` (small, and
what most runs are) are imported with this package, so they are registered first
and lead the list in ``ctllint --help``. ``LAZY`` maps each other command to its
module and its one-line help, so that ``ctllint check`` starts without importing
the drawing, report and diff code, and ``ctllint --help`` still lists them all.
A test checks that these help lines match the modules' own.
"""
from __future__ import annotations

import importlib

LAZY: dict[str, tuple[str, str]] = {
    "schema": ("schema", "print a JSON Schema (draft-07) of the file format for editors"),
    "init": ("init", "write a starter configuration, pre-commit entry and example schematic (never overwrites)"),
    "draw": ("draw", "draw a schematic as SVG: rails, numbered rungs, wire numbers, symbols, coil cross-references, findings marked"),
    "report": ("report", "check schematics and write one self-contained HTML page with drawings and linked findings"),
    "xref": ("xref", "coil cross-reference: where each coil's NO and NC contacts are used, against the contacts available"),
    "simulate": ("simulate", "run the behaviour model step by step and print every load's state after each step"),
    "diff": ("diff", "show what changed electrically between two revisions of schematics (files or git revisions)"),
    "export": ("export", "write a panel document as CSV: the wire list, the bill of materials or the terminal plan"),
    "lsp": ("lsp", "run the language server (LSP over standard input and output) that shows findings in editors as you type"),
}


def load(name: str | None = None) -> None:
    """Import the module of command ``name``, or of every command when ``name`` is None."""
    modules = {LAZY[name][0]} if name in LAZY else ({m for m, _ in LAZY.values()} if name is None else set())
    for module in sorted(modules):
        importlib.import_module(f"{__name__}.{module}")


# Registered whenever the package is imported, before any command of LAZY (see above), in this
# order: the order of ``ctllint --help``.
import ctllint.commands.check  # noqa: E402,F401,I001
import ctllint.commands.rules  # noqa: E402,F401
import ctllint.commands.explain  # noqa: E402,F401
