"""Stage 6, commands: the command line (``cli``) and its sub-commands, imported only when used.

May import every stage (reading, circuit, api, checking, review, output).

A module registers itself with ``ctllint.commands.cli.command(name, help)`` applied
to a ``(configure, run)`` pair. ``LAZY`` maps each command to its module and
its one-line help, so that ``ctllint check`` starts without importing the
drawing, report and diff code, and ``ctllint --help`` still lists them all.
A test checks that these help lines match the modules' own.
"""
from __future__ import annotations

import importlib

LAZY: dict[str, tuple[str, str]] = {
    "schema": ("project", "print a JSON Schema (draft-07) of the file format for editors"),
    "init": ("project", "write a starter configuration, pre-commit entry and example schematic (never overwrites)"),
    "draw": ("view", "draw a schematic as SVG: rails, numbered rungs, wire numbers, symbols, coil cross-references, findings marked"),
    "report": ("view", "check schematics and write one self-contained HTML page with drawings and linked findings"),
    "xref": ("view", "coil cross-reference: where each coil's NO and NC contacts are used, against the contacts available"),
    "simulate": ("view", "run the behaviour model step by step and print every load's state after each step"),
    "diff": ("diff", "show what changed electrically between two revisions of schematics (files or git revisions)"),
    "export": ("export", "write a panel document as CSV: the wire list, the bill of materials or the terminal plan"),
    "lsp": ("lsp", "run the language server (LSP over standard input and output) that shows findings in editors as you type"),
}


def load(name: str | None = None) -> None:
    """Import the module of command ``name``, or of every command when ``name`` is None."""
    modules = {LAZY[name][0]} if name in LAZY else ({m for m, _ in LAZY.values()} if name is None else set())
    for module in sorted(modules):
        importlib.import_module(f"{__name__}.{module}")
