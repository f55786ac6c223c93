"""The case files of the ratings plugin's rules (tests/rules/<rule>.yaml)."""
import pytest

from ctllint.testing import case_params, check_case

RULES = {
    "motor-overload",
    "contact-rating",
    "overload-setting",
    "control-transformer",
    "transformer-protection",
    "vacuum-contactor",
    "inductive-on-electronic-output",
}


@pytest.mark.parametrize("case", [c for c in case_params("tests/rules") if c.values[0].rule in RULES])
def test_case(case):
    check_case(case)
