"""``ctllint explain RULE``: one rule's documentation, as a page for a terminal.

Its own module: how a rule's doc, source, examples and options are laid out (``explain_text``).
"""
from __future__ import annotations

import argparse
import sys
import textwrap
from typing import Any

from ctllint.commands.base import EXIT_OK, UsageError, add_config_args, command, setup


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
