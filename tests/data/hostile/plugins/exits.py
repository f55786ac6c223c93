"""A plugin whose rule calls sys.exit (tests/test_hostile.py)."""
import sys

from ctllint.api import Rule
from ctllint.checking.hookspecs import hookimpl
from ctllint.reading.model import Severity


def _exit(ctx):
    sys.exit(0)


@hookimpl
def ctllint_rules():
    return [Rule("calls-exit", Severity.ERROR, "exits", "Exits.", "test", _exit)]
