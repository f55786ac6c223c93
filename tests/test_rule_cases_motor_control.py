"""The motor-control plugin's rule cases (tests/rules/<rule>.yaml), run as data.

Only this plugin's case files are read, so that a case file another plugin's
author is still editing cannot stop these from being collected.
"""
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
