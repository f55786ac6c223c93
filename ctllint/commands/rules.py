"""``ctllint rules``: the table of every registered rule (name, plugin, default severity, summary).

Its own module: the table is also what the README's rule list is made from (``rules_table``).
"""
from __future__ import annotations

import argparse
import sys

from ctllint.commands.base import EXIT_OK, add_config_args, command, setup
from ctllint.checking.host import PluginHost


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
