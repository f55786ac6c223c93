"""The core rules (`format`, `plugin-error`, `suppression`) in `ctllint rules` and `ctllint explain`.

A user who sees `[format]` in the output must be able to ask what it means:
every rule name that can appear in output is explainable. The names are
found independently of ctllint.checking.core_rules: from the rule literals of every
`Diagnostic(...)` the core code builds (read from its source), from the
registered plugin rules, and from real runs that give each core finding.
"""
import ast
import json
import os
import textwrap

import pytest

from ctllint.api import Finding, Rule
from ctllint.commands.cli import main
from ctllint.checking.host import PluginHost
from ctllint.reading.model import Severity
from ctllint.testing import case_files, check_text, load_cases

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
CORE = ("format", "plugin-error", "suppression", "config")


def run(capsys, *args):
    code = main(list(args))
    out, err = capsys.readouterr()
    return code, out, err


def rule_literals_in_core_source() -> set[str]:
    """The rule argument of every Diagnostic(...) built in ctllint/, where it is written as a literal."""
    found = set()
    for folder, _, files in os.walk(os.path.join(ROOT, "ctllint")):
        for name in files:
            if not name.endswith(".py"):
                continue
            with open(os.path.join(folder, name), encoding="utf-8") as handle:
                tree = ast.parse(handle.read())
            for node in ast.walk(tree):
                if isinstance(node, ast.Call) and getattr(node.func, "id", getattr(node.func, "attr", None)) == "Diagnostic":
                    arg = node.args[3] if len(node.args) > 3 else next((k.value for k in node.keywords if k.arg == "rule"), None)
                    if isinstance(arg, ast.Constant) and isinstance(arg.value, str):
                        found.add(arg.value)
    return found


def test_the_source_scan_finds_the_core_rules():
    # If this fails, the core builds its findings differently now: update the scan, not the list.
    assert rule_literals_in_core_source() == set(CORE)


def names_seen_in_case_files() -> set[str]:
    return {f["rule"] for path in case_files(os.path.join(ROOT, "tests", "rules")) for c in load_cases(path) for f in c.findings}


def every_name_that_can_appear() -> set[str]:
    return rule_literals_in_core_source() | set(PluginHost.create().rules) | names_seen_in_case_files()


def test_every_rule_name_that_can_appear_in_output_is_explainable(capsys, monkeypatch, tmp_path):
    monkeypatch.chdir(tmp_path)
    names = every_name_that_can_appear()
    assert set(CORE) <= names and "seal-in" in names
    for name in sorted(names):
        code, text, err = run(capsys, "explain", name)
        assert code == 0, (name, err)
        assert text.startswith(f"{name}  (")
        for part in ("Source:", "Failing example", "Passing example", "Options:"):
            assert part in text, (name, part)


def test_rules_lists_the_core_rules(capsys, monkeypatch, tmp_path):
    monkeypatch.chdir(tmp_path)
    code, out, _ = run(capsys, "rules")
    rows = {line.split()[0]: line.split()[1:3] for line in out.splitlines()[1:]}
    assert rows["format"] == ["core", "error"]
    assert rows["plugin-error"] == ["core", "error"]
    assert rows["suppression"] == ["core", "warning"]  # info for a stale one, warning for a malformed one
    code, out, _ = run(capsys, "rules", "--format", "json")
    listed = {r["rule"]: r for r in json.loads(out)}
    assert all(listed[n]["plugin"] == "core" and listed[n]["summary"] for n in CORE)


def test_explain_of_a_core_rule_says_it_cannot_be_turned_off(capsys, monkeypatch, tmp_path):
    monkeypatch.chdir(tmp_path)
    code, text, _ = run(capsys, "explain", "format")
    assert code == 0 and "core rule" in text and "cannot be disabled" in text
    assert "ctllint-allow: format" not in text  # no advice to suppress what cannot be suppressed
    code, _, err = run(capsys, "explain", "formatt")
    assert code == 2 and "did you mean 'format'" in err


def _finding_rules(text):
    return {d.rule for d in check_text(text)}


def _core_rule(name):
    from ctllint.checking.core_rules import CORE_RULES

    return CORE_RULES[name]


@pytest.mark.parametrize("name", ["format", "suppression"])
def test_the_schematic_examples_do_what_they_say(name):
    rule = _core_rule(name)
    assert name in _finding_rules(rule.failing.yaml)
    assert check_text(rule.passing.yaml) == []


def _example_as_rule(code: str) -> Rule:
    namespace = {"Finding": Finding}
    exec(textwrap.dedent(code), namespace)  # the documentation's own example, run as written
    return Rule(name="site-overload-limit", severity=Severity.WARNING, summary="example", doc="example " * 20,
                source="example", check=namespace["check"])


def _plugin_of(rule, name):
    import types

    from ctllint import hookimpl

    module = types.ModuleType(name)
    module.ctllint_rules = hookimpl(lambda: [rule])
    return module


def test_the_plugin_error_examples_do_what_they_say():
    rule = _core_rule("plugin-error")
    schematic = textwrap.dedent("""\
        ctllint: 1
        supplies:
          ctl: {hot: L1, common: X2, voltage: 120 VAC}
        devices:
          CR1: {kind: relay, coil: 120 VAC}
          OL1: {kind: overload}
        rungs:
          - paths: [[L1, CR1.coil, 2, OL1.NC, X2]]
        """)
    results, plugins = [], []
    for i, example in enumerate((rule.failing, rule.passing)):
        plugins.append(_plugin_of(_example_as_rule(example.yaml), f"example_{i}"))
        found = check_text(schematic, plugins=[plugins[-1]])
        results.append({(d.rule, d.line) for d in found if d.rule in ("plugin-error", "site-overload-limit")})
    assert results == [{("plugin-error", 1)}, set()]


def test_no_plugin_may_take_a_core_rule_name():
    from ctllint import hookimpl

    for name in CORE:
        rule = Rule(name=name, severity=Severity.WARNING, summary="x", doc="x " * 50, source="x", check=lambda ctx: ())

        class Plugin:
            @staticmethod
            @hookimpl
            def ctllint_rules():
                return [rule]

        host = PluginHost.create(extra=[Plugin], entry_points=False)
        assert any("already registered by core" in p.message for p in host.problems), (name, host.problems)
        assert name not in host.rules


def test_configuring_a_core_rule_says_why_it_cannot_be(capsys, monkeypatch, tmp_path):
    monkeypatch.chdir(tmp_path)
    (tmp_path / ".ctllint.yaml").write_text("rules:\n  suppression: {severity: off}\n")
    code, _, err = run(capsys, "check")
    assert code == 2 and ".ctllint.yaml:2" in err and "core rule" in err


def test_sarif_describes_core_rules_fully(capsys, monkeypatch, tmp_path):
    monkeypatch.chdir(tmp_path)
    monkeypatch.setenv("CTLLINT_NO_CACHE", "1")
    (tmp_path / "bad.ctl.yaml").write_text("ctllint: 1\nsupplies:\n  ctl: {hot: L1, common: X2, voltage: 120}\n")
    code, out, _ = run(capsys, "check", "--format", "sarif")
    run0 = json.loads(out)["runs"][0]
    rules = run0["tool"]["driver"]["rules"]
    by_id = {r["id"]: r for r in rules}
    for name in CORE:
        assert by_id[name]["fullDescription"]["text"] and "ctllint explain " + name in by_id[name]["help"]["text"]
    res = [r for r in run0["results"] if r["ruleId"] == "format"]
    assert res and rules[res[0]["ruleIndex"]]["id"] == "format"
