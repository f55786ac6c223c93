"""A plugin whose rules return garbage from check (tests/test_hostile.py)."""
import itertools

from ctllint.api import Finding, Rule
from ctllint.checking.hookspecs import hookimpl
from ctllint.reading.model import Location, Severity


def _number(ctx):
    return 42  # not iterable


def _strings(ctx):
    return ["a finding, honestly", None]


def _no_location(ctx):
    yield Finding(None, "no location")


def _bad_location(ctx):
    yield Finding(Location(None, "one", [1]), "location of the wrong types")


def _outside(ctx):
    yield Finding(Location(ctx.schematic.path, 10**9, 1), "far past the end of the file")
    yield Finding(Location(ctx.schematic.path, -3, 0), "before the start of the file")


def _bad_fields(ctx):
    yield Finding(ctx.schematic.loc, "severity of the wrong type", severity="catastrophic")
    yield Finding(ctx.schematic.loc, ["message", "as", "list"])
    yield Finding(ctx.schematic.loc, "unhashable subject", subject=["x"])


def _endless(ctx):
    # findings without end: must not fill the memory before the time limit
    for n in itertools.count():
        yield Finding(ctx.schematic.loc, f"finding {n}")


def _pairs(context):
    return [([1], [2]), ("never-registered", None), 7]


RULES = [
    Rule("g-number", Severity.ERROR, "s", "d", "src", _number),
    Rule("g-strings", Severity.ERROR, "s", "d", "src", _strings),
    Rule("g-no-location", Severity.ERROR, "s", "d", "src", _no_location),
    Rule("g-bad-location", Severity.ERROR, "s", "d", "src", _bad_location),
    Rule("g-outside", Severity.ERROR, "s", "d", "src", _outside),
    Rule("g-bad-fields", Severity.ERROR, "s", "d", "src", _bad_fields),
    Rule("g-endless", Severity.ERROR, "s", "d", "src", _endless),
]


@hookimpl
def ctllint_rules():
    return RULES


@hookimpl
def ctllint_check(context):
    return _pairs(context)
