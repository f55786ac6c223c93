"""The core rules: findings that ctllint itself gives, not a rule plugin.

``format`` (the loader), ``plugin-error`` (the plugin host),
``suppression`` (inline suppressions) and ``config`` (the language server's
word for a configuration it cannot read) appear in output like any rule, so
``ctllint rules`` lists them and ``ctllint explain`` documents them, from
the ``Rule`` values here. They are never run as checks, cannot be disabled,
re-graded or suppressed, and no plugin may register a rule of these names.
"""
from __future__ import annotations

from typing import Iterable

from ctllint.api import Example, Finding, Rule
from ctllint.reading.model import Severity

CORE_PLUGIN = "core"


def _given_by_ctllint(ctx) -> Iterable[Finding]:
    """Core findings come from the loader, the plugin host and the suppression pass, not from a check."""
    return ()


_FORMAT_DOC = """\
A schematic is checked only when ctllint can read it exactly as written: a
misspelt key, a bare number where a quantity with its unit belongs, or a
duplicate key would otherwise be guessed at, and a guess about a control
circuit is a wrong answer waiting to happen. So every breach of the format is
reported where it stands, all of them per file, and a file with format
errors gets no other rule's findings (they would rest on a model that is not
what the file says).

Found: YAML syntax; an unknown, missing or duplicate key (the second one is
reported); a value of the wrong type; a quantity without its unit, with an
unknown unit or of the wrong dimension; an element reference that is not
`TAG` or `TAG.PART` in form; an unknown `ctllint` version; a bad `use` (not
relative, outside the repository, not a shared device file, a cycle); a
`device` of the wrong kind where a field names one; input past a limit
(`limits:`); a path that is not a regular file. A well-formed reference to an
undeclared tag or to a part its kind lacks is `unknown-device` or
`unknown-part` instead."""

_PLUGIN_ERROR_DOC = """\
A rule plugin is code, and code fails. A rule that raised or hung would
otherwise stop the run or, worse, quietly give no findings, which reads as a
clean circuit. ctllint isolates each rule: its failure becomes one
`plugin-error` finding at line 1 of the file being checked, naming the rule,
its plugin and a one-line summary of what went wrong, and the other rules
still run. A `plugin-error` means the file was NOT fully checked.

Reported when a plugin fails to import or registers something that is not a
Rule (or a name already taken), when a rule raises, runs past
`limits.plugin_seconds` or is left without time to run, gives more findings
than the cap (none of them are shown) or a finding with a malformed
location or severity, and when a `ctllint_check` hook reports a rule it did
not register. Fix the plugin, or take it out of `plugins:` / uninstall it."""

_CONFIG_DOC = """\
The command line stops with exit status 2 and the configuration's own error
when `.ctllint.yaml` (or `[tool.ctllint]` in pyproject.toml) cannot be read:
a misspelt key, a rule that does not exist, an option of the wrong type. An
editor cannot stop, so the language server shows the same error as a
`config` finding at line 1 of every file it would have checked, naming the
configuration file and line, and checks nothing until it is fixed: findings
worked out under a configuration that is not what the project says would be
wrong. Fix the configuration; `ctllint check` prints the same message."""

_SUPPRESSION_DOC = """\
An inline suppression (`# ctllint-allow: RULE -- reason` on a finding's
line) hides a finding from every later run, so it must say why, and it must
not outlive the finding it was written for. ctllint therefore reports the
suppressions themselves.

A warning where the comment names no rule, gives no reason after `--` (it
then suppresses nothing), names a rule that does not exist, or names
`format`, `plugin-error` or `suppression`, which cannot be suppressed. An
info finding where it names a rule that gives no finding on that line: it is
stale, so remove it before it hides a future finding unseen.

A suppression without a reason suppresses nothing, so the finding it was
meant for is shown beside this warning."""

CORE_RULES: dict[str, Rule] = {
    "format": Rule(
        name="format",
        severity=Severity.ERROR,
        summary="the file breaks the schematic format: YAML, keys, types, units, references, version, use",
        doc=_FORMAT_DOC,
        source="FORMAT.md, format version 1 (ctllint's own format); YAML 1.2 core schema",
        check=_given_by_ctllint,
        failing=Example("a voltage without its unit", """\
ctllint: 1
supplies:
  ctl: {hot: L1, common: X2, voltage: 120}      # format: a bare number, no unit
devices:
  CR1: {kind: relay, coil: 120 VAC}
rungs:
  - paths: [[L1, CR1.coil, X2]]"""),
        passing=Example("the unit written", """\
ctllint: 1
supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
devices:
  CR1: {kind: relay, coil: 120 VAC}
rungs:
  - paths: [[L1, CR1.coil, X2]]"""),
        plugin=CORE_PLUGIN,
    ),
    "plugin-error": Rule(
        name="plugin-error",
        severity=Severity.ERROR,
        summary="a rule plugin failed (import, exception, time limit, bad findings): the file was not fully checked",
        doc=_PLUGIN_ERROR_DOC,
        source="ctllint's plugin host (DEVELOPERS.md, \"Limits: hostile and broken input\")",
        check=_given_by_ctllint,
        failing=Example("a site rule that raises on an overload without a setting", """\
# site_rules.py, listed under plugins: in .ctllint.yaml
def check(ctx):
    for dev in ctx.devices.values():
        # AttributeError where an overload has no setting: plugin-error at 1:1
        if dev.kind == "overload" and dev.get("setting").value > 100:
            yield Finding(dev.loc, f"{dev.tag}: setting above 100 A")"""),
        passing=Example("the same rule, guarding the missing value", """\
def check(ctx):
    for dev in ctx.devices.values():
        setting = dev.get("setting")
        if dev.kind == "overload" and setting is not None and setting.value > 100:
            yield Finding(dev.loc, f"{dev.tag}: setting above 100 A")"""),
        plugin=CORE_PLUGIN,
    ),
    "suppression": Rule(
        name="suppression",
        severity=Severity.WARNING,
        summary="an inline suppression is malformed, gives no reason, names an unknown rule, or suppresses nothing",
        doc=_SUPPRESSION_DOC,
        source="ctllint's own (README, \"Suppressing one finding\")",
        check=_given_by_ctllint,
        failing=Example("no reason after --", """\
ctllint: 1
supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
devices:
  CR1: {kind: relay, coil: 120 VAC}
  CR2: {kind: relay, coil: 120 VAC}   # ctllint-allow: unused-device
rungs:
  - paths: [[L1, CR1.coil, X2]]"""),
        passing=Example("the reason given", """\
ctllint: 1
supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
devices:
  CR1: {kind: relay, coil: 120 VAC}
  CR2: {kind: relay, coil: 120 VAC}   # ctllint-allow: unused-device -- spare, wired for stage 2
rungs:
  - paths: [[L1, CR1.coil, X2]]"""),
        plugin=CORE_PLUGIN,
    ),
    "config": Rule(
        name="config",
        severity=Severity.ERROR,
        summary="the configuration cannot be read, so the file was not checked (shown by the language server)",
        doc=_CONFIG_DOC,
        source="ctllint's own (README, \"Configuration\")",
        check=_given_by_ctllint,
        failing=Example("a misspelt key in .ctllint.yaml", """\
# .ctllint.yaml
rules:
  switch-fan-out: {severty: error}"""),
        passing=Example("the key spelt as the rule's options say", """\
# .ctllint.yaml
rules:
  switch-fan-out: {severity: error}"""),
        plugin=CORE_PLUGIN,
    ),
}
CORE_RULE_NAMES = tuple(CORE_RULES)


def all_rules(rules: dict[str, Rule]) -> dict[str, Rule]:
    """The core rules and the registered ones, by name: what output can show."""
    return dict(sorted({**rules, **CORE_RULES}.items()))
