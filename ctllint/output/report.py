"""Built-in output formats: text, json, sarif, junit.

Registered through the ``ctllint_output_formats`` hook like a plugin's
formats. Every format is deterministic: the same findings give the same
bytes, whatever the order plugins loaded in.
"""
from __future__ import annotations

import json
import os
import re
import sys
from typing import Iterable

from ctllint import __version__
from ctllint.api import OutputFormat, Rule
from ctllint.checking.core_rules import CORE_RULES
from ctllint.checking.hookspecs import hookimpl
from ctllint.reading.model import Diagnostic, Severity

# The one caution text: text output (standard error), the JSON, SARIF and
# JUnit reports, --help, the HTML report and drawing legends all carry it.
SAFETY_NOTE = (
    "ctllint checks design rules only: a clean run is not proof that a circuit is safe. "
    "Control circuits can injure or kill: have every change reviewed by a qualified person and "
    "follow the electrical codes that apply where the machine is installed, the machine's risk "
    "assessment and licensed practice. The rating tables are US (NEC, NEMA) and IEC figures, "
    "partly from memory; other codes (CEC, local rules) may differ."
)

_COLOURS = {Severity.ERROR: "\033[31m", Severity.WARNING: "\033[33m", Severity.INFO: "\033[36m"}
_BOLD, _DIM, _RESET = "\033[1m", "\033[2m", "\033[0m"


def use_colour(stream=None) -> bool:
    """Colour only on a terminal, never when NO_COLOR is set (https://no-color.org)."""
    if os.environ.get("NO_COLOR"):
        return False
    stream = stream or sys.stdout
    return bool(getattr(stream, "isatty", lambda: False)())


def render_text(diagnostics: list[Diagnostic], files: list[str], rules: dict[str, Rule], colour: bool = False) -> str:
    lines = []
    for d in diagnostics:
        if colour:
            lines.append(f"{_BOLD}{d.path}:{d.line}:{d.column}:{_RESET} {_COLOURS[d.severity]}{d.severity}{_RESET}: {d.message} {_DIM}[{d.rule}]{_RESET}")
        else:
            lines.append(f"{d.path}:{d.line}:{d.column}: {d.severity}: {d.message} [{d.rule}]")
    return "".join(line + "\n" for line in lines)


def summary_line(diagnostics: list[Diagnostic], files: list[str], device_files: int = 0) -> str:
    """``4 errors, 1 warning, 0 info in 4 schematics, 1 device file``: shared device files counted apart."""
    counts = {s: sum(1 for d in diagnostics if d.severity == s) for s in Severity}
    parts = [f"{counts[Severity.ERROR]} error{'s' * (counts[Severity.ERROR] != 1)}",
             f"{counts[Severity.WARNING]} warning{'s' * (counts[Severity.WARNING] != 1)}",
             f"{counts[Severity.INFO]} info"]
    n = len(files) - device_files
    where = f"{n} schematic{'s' * (n != 1)}"
    if device_files:
        where += f", {device_files} device file{'s' * (device_files != 1)}"
    return f"{', '.join(parts)} in {where}"


def render_json(diagnostics: list[Diagnostic], files: list[str], rules: dict[str, Rule], note: str | None = SAFETY_NOTE) -> str:
    doc = {"diagnostics": [d.as_dict() for d in diagnostics], "files": len(files)}
    if note:  # left out only where the safety note was turned off
        doc["safety_note"] = note
    return json.dumps(doc, indent=2, ensure_ascii=False) + "\n"


_SARIF_LEVEL = {Severity.ERROR: "error", Severity.WARNING: "warning", Severity.INFO: "note"}


def _uri(path: str) -> str:
    """A path as a relative URI reference: percent-encoded (RFC 3986), so that a name holding
    ``#``, ``?``, ``%`` or a space points at that file and not at a part of another."""
    from urllib.parse import quote

    p = path.replace(os.sep, "/")
    p = p[2:] if p.startswith("./") else p
    return quote(p.encode("utf-8", "surrogateescape"), safe="/")


# Characters XML 1.0 does not allow at all (not even as a character reference):
# control characters other than tab, line feed and carriage return, lone
# surrogates, U+FFFE and U+FFFF. Written escaped, as Python writes them.
_NOT_XML = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\ud800-\udfff\ufffe\uffff]")


def xml_safe(text: str) -> str:
    return _NOT_XML.sub(lambda m: m.group().encode("unicode_escape", "backslashreplace").decode("ascii"), text)


def render_sarif(diagnostics: list[Diagnostic], files: list[str], rules: dict[str, Rule], note: str | None = SAFETY_NOTE) -> str:
    descriptors = []
    index: dict[str, int] = {}
    rules = {**CORE_RULES, **dict(sorted(rules.items()))}  # the core rules first, as they always were
    for name in rules:
        rule = rules[name]
        index[name] = len(descriptors)
        descriptors.append({
            "id": name,
            "shortDescription": {"text": rule.summary},
            "fullDescription": {"text": rule.doc.strip()},
            "help": {"text": f"{rule.doc.strip()}\n\nSource: {rule.source}\n\nRun `ctllint explain {name}` for examples and options."},
            "defaultConfiguration": {"level": _SARIF_LEVEL[rule.severity]},
            "properties": {"plugin": rule.plugin, "source": rule.source},
        })
    results = []
    for d in diagnostics:
        result = {
            "ruleId": d.rule,
            "level": _SARIF_LEVEL[d.severity],
            "message": {"text": d.message},
            "locations": [{
                "physicalLocation": {
                    "artifactLocation": {"uri": _uri(d.path)},
                    "region": {"startLine": max(1, d.line), "startColumn": max(1, d.column)},
                }
            }],
        }
        if d.rule in index:
            result["ruleIndex"] = index[d.rule]
        results.append(result)
    log = {
        "$schema": "https://json.schemastore.org/sarif-2.1.0.json",
        "version": "2.1.0",
        "runs": [{
            "tool": {"driver": {"name": "ctllint", "version": __version__, "semanticVersion": __version__.split("+")[0], "rules": descriptors}},
            "artifacts": [{"location": {"uri": _uri(f)}} for f in sorted(files)],
            "results": results,
            "columnKind": "unicodeCodePoints",
        }],
    }
    if note:  # a run's property bag (SARIF 2.1.0 3.8)
        log["runs"][0]["properties"] = {"safetyNote": note}
    return json.dumps(log, indent=2, ensure_ascii=False) + "\n"


def render_junit(diagnostics: list[Diagnostic], files: list[str], rules: dict[str, Rule], note: str | None = SAFETY_NOTE) -> str:
    # Imported here: xml.sax.saxutils pulls in urllib, http and ssl, a cost
    # every start-up would pay for a format few runs ask for.
    from xml.sax.saxutils import escape as _escape, quoteattr as _quoteattr

    def escape(text: str) -> str:
        return _escape(xml_safe(text))

    def quoteattr(text: str) -> str:
        return _quoteattr(xml_safe(text))

    by_file: dict[str, list[Diagnostic]] = {f: [] for f in files}
    for d in diagnostics:
        by_file.setdefault(d.path, []).append(d)
    failing = sum(1 for ds in by_file.values() if any(d.severity >= Severity.WARNING for d in ds))
    out = ['<?xml version="1.0" encoding="UTF-8"?>',
           f'<testsuites name="ctllint" tests="{len(by_file)}" failures="{failing}">',
           f'  <testsuite name="ctllint" tests="{len(by_file)}" failures="{failing}" errors="0" skipped="0">']
    if note:
        out += ["    <properties>", f'      <property name="safety-note" value={quoteattr(note)}/>', "    </properties>"]
    for path in sorted(by_file):
        ds = by_file[path]
        out.append(f"    <testcase classname=\"ctllint\" name={quoteattr(path)}>")
        for d in ds:
            if d.severity == Severity.INFO:
                continue
            text = f"{d.path}:{d.line}:{d.column}: {d.severity}: {d.message} [{d.rule}]"
            out.append(f"      <failure type={quoteattr(d.rule)} message={quoteattr(d.message)}>{escape(text)}</failure>")
        infos = [d for d in ds if d.severity == Severity.INFO]
        if infos:
            out.append("      <system-out>" + escape("\n".join(f"{d.path}:{d.line}:{d.column}: info: {d.message} [{d.rule}]" for d in infos)) + "</system-out>")
        out.append("    </testcase>")
    out.append("  </testsuite>")
    out.append("</testsuites>")
    return "\n".join(out) + "\n"


def render_with_note(fmt: OutputFormat, diagnostics: list[Diagnostic], files: list[str], rules: dict[str, Rule], note: str | None) -> str:
    """Render with ``fmt``; the built-in machine formats carry ``note`` (None: turned off)."""
    if fmt.render in (render_json, render_sarif, render_junit):
        return fmt.render(diagnostics, files, rules, note=note)
    return fmt.render(diagnostics, files, rules)


FORMATS = [
    OutputFormat("text", render_text, "one line per finding: path:line:column: severity: message [rule]"),
    OutputFormat("json", render_json, "one JSON object: diagnostics, the number of files and the safety note"),
    OutputFormat("sarif", render_sarif, "SARIF 2.1.0 log for code-scanning tools"),
    OutputFormat("junit", render_junit, "JUnit XML: a test case per schematic, a failure per finding"),
]


@hookimpl
def ctllint_output_formats() -> Iterable[OutputFormat]:
    return FORMATS
