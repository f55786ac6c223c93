"""The commands stage's layout: one module per command, and ``ctllint check`` starting without the others.

The command names are those ``ctllint --help`` lists (README, "Commands"); each is written in
``ctllint/commands/<name>.py``, so that a reader finds a command by its name.
"""
from __future__ import annotations

import os
import subprocess
import sys

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))

# As ``ctllint --help`` lists them, in its order.
COMMAND_NAMES = ["check", "rules", "explain", "schema", "init", "draw", "report", "xref", "simulate", "diff", "export", "lsp"]


def test_each_command_is_the_module_of_its_name():
    from ctllint import commands
    from ctllint.commands.cli import COMMANDS

    commands.load()
    assert sorted(COMMANDS) == sorted(COMMAND_NAMES)
    for name in COMMAND_NAMES:
        configure, run, _ = COMMANDS[name]
        assert configure.__module__ == run.__module__ == f"ctllint.commands.{name}", name
        assert os.path.isfile(os.path.join(ROOT, "ctllint", "commands", f"{name}.py")), name


def test_help_lists_the_commands_in_their_order():
    out = subprocess.run([sys.executable, "-m", "ctllint", "--help"], capture_output=True, text=True, cwd=ROOT, timeout=120).stdout
    listed = [line.split()[0] for line in out.split("COMMAND\n", 1)[-1].splitlines() if line.startswith("    ") and not line.startswith("     ")]
    assert listed == COMMAND_NAMES


def test_check_imports_no_other_command():
    code = ("import sys\nfrom ctllint.commands.cli import main\ntry:\n    main(['check', '--help'])\nexcept SystemExit:\n    pass\n"
            "print(' '.join(sorted(m for m in sys.modules if m.startswith('ctllint.'))))")
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, cwd=ROOT, timeout=120)
    loaded = set(done.stdout.split("\n")[-2].split())
    others = {f"ctllint.commands.{n}" for n in COMMAND_NAMES if n not in ("check", "rules", "explain")}
    heavy = {"ctllint.output.draw", "ctllint.output.htmlreport", "ctllint.review.diff", "ctllint.commands._git", "ctllint.commands._shared"}
    assert "ctllint.commands.check" in loaded
    assert not loaded & (others | heavy), sorted(loaded & (others | heavy))
