"""The motor-control plugin's rule cases (tests/rules/<rule>.yaml), run as data.

Only this plugin's case files are read, so that a case file another plugin's
author is still editing cannot stop these from being collected.
"""
import dataclasses
import os

import pytest

from ctllint.testing import check_case, load_cases

MOTOR_CONTROL_RULES = (
    "stop-normally-closed",
    "stop-in-series",
    "overload-in-coil-path",
    "seal-in",
    "switch-fan-out",
    "interlock",
    "emergency-stop",
    "auto-restart",
    "oscillation",
    "safety-relay-feedback",
)

CASES = os.path.join(os.path.dirname(__file__), "rules")


def _params():
    out = []
    for rule in MOTOR_CONTROL_RULES:
        for case in load_cases(os.path.join(CASES, f"{rule}.yaml")):
            assert case.rule == rule, f"{case.file} names rule {case.rule}"
            out.append(pytest.param(case, id=case.id))
    return out


@pytest.mark.parametrize("case", _params())
def test_case(case):
    check_case(case)


@pytest.mark.parametrize("rule", MOTOR_CONTROL_RULES)
def test_rule_has_passing_and_failing_cases(rule):
    cases = load_cases(os.path.join(CASES, f"{rule}.yaml"))
    assert sum(c.failing for c in cases) >= 2
    assert sum(not c.failing for c in cases) >= 2


def test_every_rule_of_the_plugin_is_run_here():
    """A rule added to the plugin but not to the list above would have its cases silently skipped."""
    from ctllint.checking.host import PluginHost

    registered = sorted(n for n, r in PluginHost.create().rules.items() if r.plugin == "motor-control")
    assert sorted(MOTOR_CONTROL_RULES) == registered


@pytest.mark.parametrize("case", _params())
def test_case_keeps_its_own_rule_on(case):
    """A case that ignores or switches off the rule it tests passes whatever the rule does."""
    assert case.rule not in case.ignore, f"{case.id} ignores its own rule"
    assert (case.options.get(case.rule) or {}).get("severity") != "off", f"{case.id} switches its own rule off"
    assert all(set(f) <= {"rule", "line", "column", "message", "message_not"} for f in case.findings), case.id


def test_a_wrong_message_fails_the_case():
    """The message checks of the case files can fail: a finding at the right line with other words does."""
    case = next(c for c in load_cases(os.path.join(CASES, "seal-in.yaml")) if c.name == "seal-in taken from another starter's contact")
    assert any("message" in f for f in case.findings)
    check_case(case)
    for key, text in (("message", "drops out as soon as the button is released"), ("message_not", "starts M1 whenever M2 runs")):
        wrong = dataclasses.replace(case, findings=[{**f, key: text} for f in case.findings])
        with pytest.raises(AssertionError, match="whose message"):
            check_case(wrong)
