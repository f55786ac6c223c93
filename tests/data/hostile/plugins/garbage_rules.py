"""A plugin that registers garbage: not Rules, Rules with unusable fields (tests/test_hostile.py)."""
from ctllint.api import Rule
from ctllint.checking.hookspecs import hookimpl
from ctllint.reading.model import Severity


def _check(ctx):
    return []


@hookimpl
def ctllint_rules():
    return [
        42,
        "a rule, honestly",
        None,
        Rule("not-callable", Severity.ERROR, "s", "d", "src", "check me"),  # check is not callable
        Rule(["unhashable", "name"], Severity.ERROR, "s", "d", "src", _check),
        Rule("", Severity.ERROR, "s", "d", "src", _check),
        Rule("bad-severity", "catastrophic", "s", "d", "src", _check),
        Rule("bad-options", Severity.ERROR, "s", "d", "src", _check, options={"x": 5}),
    ]


@hookimpl
def ctllint_device_kinds():
    from ctllint.reading.kinds import DeviceKind

    return [object(), DeviceKind(["unhashable"], {}), DeviceKind("bad-fields", {"x": 1})]
