"""Baselines for legacy projects: record today's findings, then report only new ones.

Findings match by file, rule and subject (the device or element the
finding is about, e.g. ``M1.coil@rung3``), falling back to the message
when a rule gives no subject, never by line: moving lines does not bring
a recorded finding back. Matching counts, so a second identical finding
is new.
"""
from __future__ import annotations

import json
from collections import Counter

from ctllint.reading.model import Diagnostic

VERSION = 1


def _key(path: str, rule: str, subject: str, message: str) -> tuple[str, str, str]:
    return (path.replace("\\", "/"), rule, subject or message)


def write_baseline(path: str, diagnostics: list[Diagnostic]) -> None:
    from ctllint.checking.usage import write_output

    entries = [{"path": d.path.replace("\\", "/"), "rule": d.rule, "subject": d.subject, "message": d.message} for d in sorted(diagnostics)]
    write_output(json.dumps({"ctllint-baseline": VERSION, "findings": entries}, indent=2, ensure_ascii=False) + "\n", path)


def read_baseline(path: str) -> Counter:
    from ctllint.checking.usage import UsageError

    try:
        with open(path, encoding="utf-8") as handle:
            data = json.load(handle)
        if data.get("ctllint-baseline") != VERSION:
            raise ValueError("not a ctllint baseline of version 1")
        return Counter(_key(e["path"], e["rule"], e.get("subject", ""), e.get("message", "")) for e in data["findings"])
    except FileNotFoundError:
        raise UsageError(f"ctllint: baseline '{path}' does not exist (write one with --write-baseline)") from None
    except IsADirectoryError:
        raise UsageError(f"ctllint: baseline '{path}' is a folder; name the baseline file (written with --write-baseline)") from None
    except OSError as exc:
        raise UsageError(f"ctllint: baseline '{path}' cannot be read: {exc.strerror or exc}") from None
    except (ValueError, KeyError, TypeError, AttributeError) as exc:
        raise UsageError(f"ctllint: baseline '{path}' cannot be read: {exc}") from None


def filter_baseline(path: str, diagnostics: list[Diagnostic]) -> list[Diagnostic]:
    known = read_baseline(path)
    out = []
    for d in diagnostics:
        key = _key(d.path, d.rule, d.subject, d.message)
        if known[key] > 0:
            known[key] -= 1
            continue
        out.append(d)
    return out
