"""Findings that appeared or disappeared between two revisions.

Findings are matched by rule and message, with the wire renaming and rung
renumbering applied to the old message (``translate_message``), never by
line. Its own module because it compares the checker's output, not the file.
"""
from __future__ import annotations

import re
from collections import defaultdict

from ctllint.reading.model import Diagnostic
from ctllint.review.diff.result import APPEARED, DISAPPEARED, FindingDiff

_NAME_CHARS = r"A-Za-z0-9_"


def translate_message(message: str, wire_map: dict[str, str], rung_numbers: dict[int, int]) -> str:
    """Rewrite an old finding's message in the new revision's wire names and rung numbers."""
    if not wire_map and not rung_numbers:
        return message
    names = sorted(wire_map, key=len, reverse=True)
    wire_alt = "|".join(re.escape(n) for n in names)
    pattern = r"(?P<rung>\brung (?P<num>\d+))"
    if wire_alt:
        pattern += rf"|(?<![{_NAME_CHARS}.])(?P<wire>{wire_alt})(?![{_NAME_CHARS}]|\.[{_NAME_CHARS}])"

    def swap(m: re.Match) -> str:
        if m.group("rung"):
            num = int(m.group("num"))
            return f"rung {rung_numbers.get(num, num)}"
        return wire_map[m.group("wire")]
    return re.sub(pattern, swap, message)


def diff_findings(old: list[Diagnostic], new: list[Diagnostic], wire_map: dict[str, str], rung_numbers: dict[int, int]) -> list[FindingDiff]:
    rest_new = list(new)
    rest_old = list(old)
    for key_old in (lambda d: (d.rule, translate_message(d.message, wire_map, rung_numbers)), lambda d: (d.rule, d.message)):
        pool: dict[tuple[str, str], list[Diagnostic]] = defaultdict(list)
        for d in rest_new:
            pool[(d.rule, d.message)].append(d)
        unmatched = []
        for d in rest_old:
            bucket = pool.get(key_old(d))
            if bucket:
                bucket.pop(0)
            else:
                unmatched.append(d)
        rest_old = unmatched
        rest_new = [d for bucket in pool.values() for d in bucket]
    out = [FindingDiff(DISAPPEARED, d.rule, str(d.severity), d.message, d.line, d.column, d.path) for d in sorted(rest_old)]
    out += [FindingDiff(APPEARED, d.rule, str(d.severity), d.message, d.line, d.column, d.path) for d in sorted(rest_new)]
    return out
