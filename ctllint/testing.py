"""Public helpers for testing rules, the built-in ones and a site's own.

Rule tests are data: a YAML file of cases per rule. Each case holds a
schematic and the findings it must give::

    rule: seal-in
    source: common practice (three-wire control)
    cases:
      - name: start button with seal-in passes
        schematic: |
          ctllint: 1
          ...
        findings: []
      - name: start without seal-in
        schematic: |
          ...
        findings:
          - {rule: seal-in, line: 14}

A case's ``findings`` lists every finding the schematic gives, of every
rule, as ``{rule, line}`` (``column`` optional), so a failing case proves
both that the rule fires where it should and that nothing else fires. A
case may list rules to leave out of the comparison under ``ignore``. A
finding may also give ``message`` (text, or a list of texts, each of which
the finding's message must contain) and ``message_not`` (texts it must not
contain), for rules whose wording is part of what they must get right.
Lines count from 1 at the first line of the ``schematic`` text.

Use from pytest::

    from ctllint.testing import case_params, check_case
    @pytest.mark.parametrize("case", case_params("tests/rules"))
    def test_rule_case(case):
        check_case(case)
"""
from __future__ import annotations

import os
from dataclasses import dataclass, field
from typing import Any, Iterable

from ruamel.yaml import YAML

from ctllint.checking.engine import Checker
from ctllint.checking.host import PluginHost
from ctllint.reading.model import Diagnostic

_CHECKERS: dict[tuple, Checker] = {}


@dataclass
class Case:
    """One case of a rule's case file."""

    file: str
    rule: str
    name: str
    schematic: str
    findings: list[dict[str, Any]]
    ignore: list[str] = field(default_factory=list)
    options: dict[str, dict[str, Any]] = field(default_factory=dict)
    source: str = ""

    @property
    def id(self) -> str:
        return f"{self.rule}: {self.name}"

    @property
    def failing(self) -> bool:
        return any(f.get("rule") == self.rule for f in self.findings)


# A small correct circuit for tests that need a schematic and not a particular
# one: a three-wire start/stop of a control relay with its seal-in. Changing
# ``PB1.NC`` to ``PB1.NO`` gives one stop-normally-closed finding at 12:14.
THREE_WIRE_RELAY = """\
ctllint: 1
title: Test conveyor
supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
devices:
  PB1: {kind: pushbutton, function: stop}
  PB2: {kind: pushbutton, function: start}
  CR1: {kind: relay, coil: 120 VAC}
rungs:
  - title: Run relay
    paths:
      - [L1, PB1.NC, 2, PB2.NO, 3, CR1.coil, X2]
      - [2, CR1.NO, 3]
"""


def load_cases(path: str) -> list[Case]:
    """Read one case file."""
    yaml = YAML(typ="safe")
    with open(path, encoding="utf-8") as handle:
        data = yaml.load(handle)
    rule = data["rule"]
    cases = []
    for raw in data.get("cases") or []:
        cases.append(
            Case(
                file=path,
                rule=rule,
                name=raw["name"],
                schematic=raw["schematic"],
                findings=list(raw.get("findings") or []),
                ignore=list(raw.get("ignore") or data.get("ignore") or []),
                options=dict(raw.get("options") or {}),
                source=raw.get("source") or data.get("source") or "",
            )
        )
    return cases


def case_files(folder: str) -> list[str]:
    return sorted(os.path.join(folder, f) for f in os.listdir(folder) if f.endswith((".yaml", ".yml")))


def case_params(folder: str) -> list[Any]:
    """pytest parameters, one per case in every case file of ``folder``, with readable ids."""
    import pytest

    return [pytest.param(c, id=c.id) for f in case_files(folder) for c in load_cases(f)]


def checker(options: dict[str, dict[str, Any]] | None = None, plugins: Iterable[Any] = (), entry_points: bool = True) -> Checker:
    """A checker with every registered rule enabled (cached per options)."""
    key = (repr(sorted((options or {}).items())), tuple(id(p) for p in plugins), entry_points)
    if key not in _CHECKERS:
        host = PluginHost.create(extra=plugins, entry_points=entry_points)
        _CHECKERS[key] = Checker.default(options=options, host=host)
    return _CHECKERS[key]


def check_text(text: str, path: str = "case.ctl.yaml", options: dict[str, dict[str, Any]] | None = None, plugins: Iterable[Any] = ()) -> list[Diagnostic]:
    """Every finding for schematic ``text``, sorted."""
    return checker(options, plugins).check_text(text, path).diagnostics


def check_case(case: Case, plugins: Iterable[Any] = ()) -> None:
    """Assert that ``case`` gives exactly its listed findings (rule and line)."""
    found = check_text(case.schematic, options=case.options, plugins=plugins)
    got = sorted((d.rule, d.line) for d in found if d.rule not in case.ignore)
    want = sorted((f["rule"], int(f["line"])) for f in case.findings)
    if got != want:
        listing = "\n".join(f"  {d.line}:{d.column}: {d.severity}: {d.message} [{d.rule}]" for d in found) or "  (none)"
        raise AssertionError(f"case {case.id!r} in {case.file}:\n  expected {want}\n  got      {got}\nfindings:\n{listing}")
    for f in case.findings:
        if "column" in f:
            match = [d for d in found if d.rule == f["rule"] and d.line == int(f["line"]) and d.column == int(f["column"])]
            assert match, f"case {case.id!r}: no {f['rule']} finding at {f['line']}:{f['column']}"
        if "message" in f or "message_not" in f:
            def texts(key):
                value = f.get(key) or []
                return [value] if isinstance(value, str) else list(value)

            here = [d for d in found if d.rule == f["rule"] and d.line == int(f["line"])]
            ok = [d for d in here if all(t in d.message for t in texts("message")) and not any(t in d.message for t in texts("message_not"))]
            assert ok, (f"case {case.id!r}: no {f['rule']} finding at line {f['line']} whose message contains {texts('message')} "
                        f"and none of {texts('message_not')}; messages: {[d.message for d in here]}")


def load_schematic(text: str, path: str = "case.ctl.yaml"):
    """Load schematic ``text`` for a test, failing with its format errors if it does not load."""
    from ctllint.reading.loader import load_text

    result = load_text(text, path)
    assert result.schematic is not None, "\n".join(f"{d.line}:{d.column}: {d.message}" for d in result.diagnostics)
    return result.schematic
