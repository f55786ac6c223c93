"""The example site plugin's rules, tested with ctllint's public helpers."""
import os

import pytest

from ctllint.testing import case_params, check_case

HERE = os.path.dirname(os.path.abspath(__file__))
CASES = os.path.join(HERE, "cases")


def _load_plugin():
    """Import the plugin module from its source file, installed or not, without touching sys.path.

    (Putting the source folder on sys.path would also expose any build metadata
    there, registering the plugin for every other test of the session.)
    """
    import importlib.util

    path = os.path.join(os.path.dirname(HERE), "ctllint_site_example", "rules.py")
    spec = importlib.util.spec_from_file_location("ctllint_site_example_under_test", path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


site_rules = _load_plugin()


@pytest.mark.parametrize("case", case_params(CASES))
def test_case(case):
    check_case(case, plugins=[site_rules])


def test_every_rule_has_cases():
    names = {c.values[0].rule for c in case_params(CASES)}
    assert names == {r.name for r in site_rules.RULES}
