"""House rules of an invented plant's drawing office.

Two rules a site might add on top of the built-in ones:

- ``site-wire-numbers``: every wire that is not a supply rail carries a
  number, and the numbers stay inside the band reserved for the rung's
  sheet (rung N uses wires N*100 to N*100+99 when ``per_rung_band`` is on),
  so that an electrician can find a wire from its number alone.
- ``site-tag-prefix``: device tags start with the prefix the site uses for
  their kind (PB for pushbuttons, CR for relays, M for starters...).
"""
from __future__ import annotations

import re
from typing import Iterator

from ctllint import hookimpl
from ctllint.api import CheckContext, Example, Finding, Option, Rule, Severity

DEFAULT_PREFIXES = {
    "pushbutton": "PB",
    "selector": "SS",
    "relay": "CR",
    "timer": "TR",
    "contactor": "M",
    "starter": "M",
    "overload": "OL",
    "solenoid": "SOL",
    "pilot-light": "PL",
    "fuse": "FU",
    "transformer": "T",
    "limit-switch": "LS",
}


def check_wire_numbers(ctx: CheckContext) -> Iterator[Finding]:
    """Wires other than rails are whole numbers (in the rung's band when asked)."""
    sch = ctx.schematic
    rails = {w for s in sch.supplies.values() for w in (s.hot, s.common)}
    band = ctx.options["per_rung_band"]
    seen: set[str] = set()
    for rung in sch.rungs:
        for path in rung.paths:
            for wire, loc in zip(path.wires, path.wire_locs):
                if wire in rails or (wire, rung.number) in seen:
                    continue
                seen.add((wire, rung.number))
                if not wire.isdigit():
                    yield Finding(loc, f"wire '{wire}' in rung {rung.number} is not a wire number: the site numbers every wire that is not a rail", subject=f"wire {wire}")
                elif band and not (rung.number * 100 <= int(wire) < rung.number * 100 + 100):
                    yield Finding(loc, f"wire {wire} in rung {rung.number} is outside the rung's band {rung.number * 100}-{rung.number * 100 + 99}", subject=f"wire {wire}")


def check_tag_prefix(ctx: CheckContext) -> Iterator[Finding]:
    """Device tags begin with the site's prefix for their kind."""
    prefixes = dict(DEFAULT_PREFIXES)
    for item in ctx.options["prefixes"]:
        kind, _, prefix = item.partition("=")
        prefixes[kind.strip()] = prefix.strip()
    for dev in ctx.schematic.devices.values():
        if dev.origin != ctx.schematic.path:
            continue
        want = prefixes.get(dev.kind)
        if want and not re.match(rf"^{re.escape(want)}[0-9]", dev.tag):
            yield Finding(dev.loc, f"{dev.kind} {dev.tag} should be tagged {want}<number> by the site's tag scheme (e.g. {want}1)", subject=dev.tag)


RULES = [
    Rule(
        name="site-wire-numbers",
        severity=Severity.WARNING,
        summary="every wire that is not a rail carries a number (optionally within the rung's band)",
        doc="An electrician traces a fault by wire number. Names such as 'seal' or 'a' on a wire "
        "cannot be printed on a ferrule and found on the drawing; numbers can.",
        source="site practice (example plugin)",
        check=check_wire_numbers,
        failing=Example("a named wire", "paths:\n  - [L1, PB1.NC, seal, M1.coil, X2]"),
        passing=Example("numbered wires", "paths:\n  - [L1, PB1.NC, 2, M1.coil, X2]"),
        options={"per_rung_band": Option(False, "wires of rung N must lie in N*100..N*100+99", bool)},
    ),
    Rule(
        name="site-tag-prefix",
        severity=Severity.WARNING,
        summary="device tags begin with the site's prefix for their kind",
        doc="One prefix per kind lets anyone read a tag on the panel and know what it is.",
        source="site practice (example plugin)",
        check=check_tag_prefix,
        failing=Example("a relay tagged K1", "devices:\n  K1: {kind: relay}"),
        passing=Example("a relay tagged CR1", "devices:\n  CR1: {kind: relay}"),
        options={"prefixes": Option([], "extra or changed prefixes as 'kind=PREFIX' strings", list)},
    ),
]


@hookimpl
def ctllint_rules():
    return RULES
