"""The wiring plugin's rule cases (tests/rules/<rule>.yaml), one test per case."""
import os

import pytest

from ctllint.testing import case_files, check_case, load_cases

WIRING_RULES = {
    "unknown-device",
    "unknown-part",
    "contact-count",
    "coil-missing",
    "coil-duplicate",
    "open-circuit",
    "loads-in-series",
    "short-circuit",
    "supply-cross",
    "voltage-mismatch",
    "grounded-side-switching",
    "dangling-wire",
    "unused-device",
}

# Only this plugin's case files are read, so that another plugin's file
# being edited cannot stop these from being collected.
CASES = [
    pytest.param(case, id=case.id)
    for path in case_files("tests/rules")
    if os.path.basename(path).split(".")[0] in WIRING_RULES
    for case in load_cases(path)
    if case.rule in WIRING_RULES
]


@pytest.mark.parametrize("case", CASES)
def test_case(case):
    check_case(case)

