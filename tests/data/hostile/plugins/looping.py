"""A plugin whose rule never returns (tests/test_hostile.py)."""
from ctllint.api import Rule
from ctllint.checking.hookspecs import hookimpl
from ctllint.reading.model import Severity


def _forever(ctx):
    n = 0
    while True:
        n += 1


@hookimpl
def ctllint_rules():
    return [Rule("never-returns", Severity.ERROR, "loops", "Loops.", "test", _forever)]
