"""The example site plugin's rules, tested with ctllint's public helpers."""
import os

import pytest

from ctllint.testing import case_params, check_case

from ctllint_site_example import rules as site_rules

CASES = os.path.join(os.path.dirname(__file__), "cases")


@pytest.mark.parametrize("case", case_params(CASES))
def test_case(case):
    check_case(case, plugins=[site_rules])


def test_every_rule_has_cases():
    names = {c.values[0].rule for c in case_params(CASES)}
    assert names == {r.name for r in site_rules.RULES}
