"""Every built-in rule's cases (tests/rules/<rule>.yaml), run as data: one test per case.

A rule's case file is named for the rule and holds at least two passing and
two failing circuits, each failing one with every finding it gives. Adding a
rule adds its case file here; nothing else to list. A case file that cannot
be read fails as one test of its own, so a file still being edited cannot
stop the other rules' cases from being collected.
"""
import dataclasses
import os

import pytest

from ctllint.checking.host import PluginHost
from ctllint.testing import case_files, check_case, load_cases

CASES_DIR = os.path.join(os.path.dirname(__file__), "rules")


def _params():
    out = []
    for path in case_files(CASES_DIR):
        name = os.path.basename(path).split(".")[0]
        try:
            cases = load_cases(path)
        except Exception as exc:  # noqa: BLE001 - reported as this file's own failing test
            out.append(pytest.param(None, repr(exc), id=f"{name}:unreadable"))
            continue
        out += [pytest.param(case, "", id=case.id) for case in cases]
    return out


PARAMS = _params()


@pytest.mark.parametrize("case, problem", PARAMS)
def test_case(case, problem):
    assert not problem, problem
    assert os.path.basename(case.file) == f"{case.rule}.yaml", f"{case.id} is in the case file of another rule"
    check_case(case)


@pytest.mark.parametrize("case, problem", [p for p in PARAMS if p.values[0] is not None])
def test_case_keeps_its_own_rule_on(case, problem):
    """A case that ignores or switches off the rule it tests passes whatever the rule does."""
    assert case.rule not in case.ignore, f"{case.id} ignores its own rule"
    assert (case.options.get(case.rule) or {}).get("severity") != "off", f"{case.id} switches its own rule off"
    assert all(set(f) <= {"rule", "line", "column", "message", "message_not"} for f in case.findings), case.id


BUILTIN = sorted(n for n, r in PluginHost.create().rules.items() if r.check.__module__.startswith("ctllint_plugins."))


@pytest.mark.parametrize("rule", BUILTIN)
def test_every_builtin_rule_has_passing_and_failing_cases(rule):
    path = os.path.join(CASES_DIR, f"{rule}.yaml")
    assert os.path.exists(path), f"no case file tests/rules/{rule}.yaml"
    cases = load_cases(path)
    assert sum(c.failing for c in cases) >= 2, f"{rule}: needs at least two failing cases"
    assert sum(not c.failing for c in cases) >= 2, f"{rule}: needs at least two passing cases"


def test_a_wrong_message_fails_the_case():
    """The message checks of the case files can fail: a finding at the right line with other words does."""
    case = next(c for c in load_cases(os.path.join(CASES_DIR, "seal-in.yaml")) if c.name == "seal-in taken from another starter's contact")
    assert any("message" in f for f in case.findings)
    check_case(case)
    for key, text in (("message", "drops out as soon as the button is released"), ("message_not", "starts M1 whenever M2 runs")):
        wrong = dataclasses.replace(case, findings=[{**f, key: text} for f in case.findings])
        with pytest.raises(AssertionError, match="whose message"):
            check_case(wrong)
