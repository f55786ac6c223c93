"""A plugin whose rule raises on every schematic (tests/test_hostile.py)."""
from ctllint.api import Rule
from ctllint.checking.hookspecs import hookimpl
from ctllint.reading.model import Severity


def _check(ctx):
    raise ValueError("this rule always raises")


@hookimpl
def ctllint_rules():
    return [Rule("always-raises", Severity.WARNING, "raises", "Raises.", "test", _check)]
