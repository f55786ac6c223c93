"""Inline suppressions: a comment on a finding's line that allows named rules.

The comment reads ``# ctllint-allow: RULE[, RULE...] -- reason``. The reason
is required: without one the comment suppresses nothing and is itself a
``suppression`` warning. A suppression that suppresses nothing is a
``suppression`` info finding, so stale ones get cleaned up. ``format`` and
``plugin-error`` cannot be suppressed.
"""
from __future__ import annotations

import re
from dataclasses import dataclass

from ctllint.reading.model import Diagnostic, Severity

MARKER = "ctllint-allow:"
_COMMENT = re.compile(r"(?:^|\s)#\s*ctllint-allow:\s*(?P<rules>[^#]*?)\s*(?:--\s*(?P<reason>.*?))?\s*$")
UNSUPPRESSIBLE = ("format", "plugin-error", "suppression")


@dataclass
class Suppression:
    line: int
    column: int
    rules: list[str]
    reason: str
    used: set[str]


_BLOCK_SCALAR = re.compile(r"(?:^|[\s:])[|>][-+0-9]*\s*$")


def comment_starts(lines: list[str]) -> list[int]:
    """For each line, where its YAML comment starts (-1: none).

    A ``#`` starts a comment only outside quoted scalars (which may run
    over several lines) and block scalars (``|``, ``>``: their lines are
    text), at the start of a line or after a space or tab.
    """
    out: list[int] = []
    quote = ""          # the open quote of a flow scalar running on, if any
    block = -1          # the indentation a block scalar's lines must exceed, while in one
    for line in lines:
        indent = len(line) - len(line.lstrip(" "))
        if block >= 0:
            if not line.strip() or indent > block:
                out.append(-1)
                continue
            block = -1
        start = -1
        i, n = 0, len(line)
        last = ""       # the last character outside quotes that is not a space
        while i < n:
            c = line[i]
            if quote == '"':
                if c == "\\":
                    i += 1
                elif c == '"':
                    quote = ""
            elif quote == "'":
                if c == "'":
                    if i + 1 < n and line[i + 1] == "'":
                        i += 1
                    else:
                        quote = ""
            elif c == "#" and (i == 0 or line[i - 1] in " \t"):
                start = i
                break
            elif c in "\"'" and last in ("", ":", ",", "[", "{", "-", "?"):
                quote = c
            elif c not in " \t":
                last = c
            i += 1
        out.append(start)
        if not quote and _BLOCK_SCALAR.search(line[:start] if start >= 0 else line):
            body = line.lstrip(" ")
            while body.startswith("- "):
                body = body[2:].lstrip(" ")
            block = len(line) - len(body) if ":" in line[: start if start >= 0 else n] else indent
    return out


def find_suppressions(lines: list[str]) -> dict[int, Suppression]:
    found: dict[int, Suppression] = {}
    if not any(MARKER in text for text in lines):
        return found
    starts = comment_starts(lines)
    for i, text in enumerate(lines, start=1):
        if MARKER not in text or starts[i - 1] < 0:
            continue
        m = _COMMENT.search(text, max(0, starts[i - 1] - 1))
        if not m:
            continue
        rules = [r.strip() for r in re.split(r"[,\s]+", m.group("rules") or "") if r.strip()]
        found[i] = Suppression(i, text.index("#", m.start()) + 1, rules, (m.group("reason") or "").strip(), set())
    return found


def apply_suppressions(path: str, lines: list[str], diagnostics: list[Diagnostic], known_rules: set[str]) -> list[Diagnostic]:
    """Drop the findings a suppression on their line allows; report bad and unused ones."""
    sups = find_suppressions(lines)
    if not sups:
        return diagnostics
    out = []
    for d in diagnostics:
        s = sups.get(d.line) if d.path == path else None
        if s and s.reason and d.rule in s.rules and d.rule not in UNSUPPRESSIBLE:
            s.used.add(d.rule)
            continue
        out.append(d)
    for s in sups.values():
        if not s.rules:
            out.append(Diagnostic(path, s.line, s.column, "suppression", Severity.WARNING, "suppression names no rule: write '# ctllint-allow: RULE -- reason'"))
            continue
        if not s.reason:
            out.append(Diagnostic(path, s.line, s.column, "suppression", Severity.WARNING, f"suppression of {', '.join(s.rules)} gives no reason after '--', so it suppresses nothing"))
            continue
        for r in s.rules:
            if r in UNSUPPRESSIBLE:
                out.append(Diagnostic(path, s.line, s.column, "suppression", Severity.WARNING, f"'{r}' cannot be suppressed"))
            elif r not in known_rules:
                out.append(Diagnostic(path, s.line, s.column, "suppression", Severity.WARNING, f"suppression names unknown rule '{r}'"))
            elif r not in s.used:
                out.append(Diagnostic(path, s.line, s.column, "suppression", Severity.INFO, f"suppression of {r} suppresses nothing on this line; remove it"))
    return out
