"""A plugin whose ctllint_rules itself raises (tests/test_hostile.py)."""
from ctllint.checking.hookspecs import hookimpl


@hookimpl
def ctllint_rules():
    raise RuntimeError("cannot even list my rules")
