"""``ctllint init``: a starter configuration, pre-commit entry, example schematic and its schema (never overwrites)."""
from __future__ import annotations

import argparse
import json
import os
import sys

from ctllint.commands.base import EXIT_OK, UsageError, command

STARTER_CONFIG = """\
# ctllint configuration: see 'ctllint rules' and 'ctllint explain RULE'.
# select: [wiring, motor-control, ratings, behaviour]   # default: every rule
ignore: []
fail-on: error
rules:
  switch-fan-out: {max_inductive: 1}
# plugins: [tools/site_rules.py]     # a site's own rule plugins
exclude: []
"""

PRE_COMMIT = """\
# Check control schematics on every commit (see https://pre-commit.com).
repos:
  - repo: local
    hooks:
      - id: ctllint
        name: ctllint (control schematic design rules)
        entry: ctllint check --quiet --
        language: system
        files: '\\.ctl\\.ya?ml$'
"""

EXAMPLE = """\
# yaml-language-server: $schema=ctllint-schema.json
ctllint: 1
title: Example conveyor, three-wire start/stop
supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
devices:
  PB1: {kind: pushbutton, function: stop}
  PB2: {kind: pushbutton, function: start}
  M1: {kind: starter, coil: 120 VAC, overload: OL1, feeds: MTR1}
  OL1: {kind: overload, setting: 4.2 A}
  MTR1: {kind: motor, power: 3 hp, voltage: 460 V, phases: 3, service_factor: 1.15}
rungs:
  - title: Conveyor motor
    paths:
      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]
      - [2, M1.NO, 3]          # seal-in around the start button
expect:
  - name: start latches, stop drops out
    steps:
      - press: PB2
      - release: PB2
      - check: {M1: on}
      - press: PB1
      - check: {M1: off}
"""


def _configure_init(p: argparse.ArgumentParser) -> None:
    p.description = ("Write a starter .ctllint.yaml, a .pre-commit-config.yaml with a ctllint hook, "
                     "an example schematic and its JSON Schema into FOLDER. Never overwrites a file.")
    p.add_argument("folder", nargs="?", default=".", metavar="FOLDER", help="where to write (default: the current folder)")


def _run_init(args: argparse.Namespace) -> int:
    from ctllint.output.schema import build_schema

    folder = args.folder
    if not os.path.isdir(folder):
        raise UsageError(f"ctllint: folder '{folder}' does not exist")
    files = {
        ".ctllint.yaml": STARTER_CONFIG,
        ".pre-commit-config.yaml": PRE_COMMIT,
        "example.ctl.yaml": EXAMPLE,
        "ctllint-schema.json": json.dumps(build_schema(), indent=2) + "\n",
    }
    for name, text in files.items():
        target = os.path.join(folder, name)
        if os.path.lexists(target):
            print(f"kept    {target} (exists; not overwritten)")
            continue
        with open(target, "x", encoding="utf-8") as handle:
            handle.write(text)
        print(f"wrote   {target}")
    print("next: ctllint check " + (folder if folder != "." else ""), file=sys.stderr)
    return EXIT_OK


command("init", "write a starter configuration, pre-commit entry and example schematic (never overwrites)")((_configure_init, _run_init))
