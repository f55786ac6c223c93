"""A load is energized only with its supply's hot rail on one terminal and the same supply's common
on the other. Where no combination of contact states does that (a missing return to common, a
mistyped wire number), the coil, solenoid or light is dead: the machine will not do what the
drawing shows. A load that reaches a rail only through another load is reported as
loads-in-series instead.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.model import Severity
from ctllint_plugins.wiring._schematic import rail_reach, rail_wires, rung_text, subject_of, tainted_wires


def check(ctx: CheckContext) -> Iterator[Finding]:
    sch, circuit = ctx.schematic, ctx.circuit
    tainted = tainted_wires(sch)
    rails_of = rail_reach(sch)
    for load in circuit.loads:
        if load.left in tainted or load.right in tainted:
            continue
        if circuit.has_energizing_path(load):
            continue
        if circuit.reaches_rail_only_through_loads(load):
            continue  # loads-in-series says so, more precisely
        reached = [rails_of(wire) for wire in (load.left, load.right)]
        supplies = {sch.supply_of_rail(r).name for rails in reached for r in rails if sch.supply_of_rail(r)}
        if len(supplies) > 1:
            continue  # joined to two supplies: supply-cross says so
        sides = [
            f"one side is on rail {wire}" if wire in rails and rails == [wire] else f"wire {wire} reaches " + (" and ".join(rails) if rails else "no rail")
            for wire, rails in zip((load.left, load.right), reached)
        ]
        if load.left == load.right:
            sides = [f"both its ends are on {'rail' if load.left in rail_wires(sch) else 'wire'} {load.left}"]
        supply = circuit.supply_of(load) or (sch.supplies.get(next(iter(supplies))) if supplies else None)
        want = f"hot {supply.hot} on one side and common {supply.common} on the other" if supply else "a supply's hot rail on one side and its common rail on the other"
        yield Finding(
            load.loc,
            f"{load.text} in {rung_text(sch, load)} can never be energized: it needs {want}, whatever the contacts do, "
            f"but {'; '.join(sides)}; check the wire numbers of this rung",
            subject_of(sch, load),
        )


RULE = Rule(
    name="open-circuit",
    severity=Severity.ERROR,
    summary="a load can never reach hot on one side and common on the other",
    doc=reflow(__doc__),
    source="common practice",
    check=check,
    failing=Example("no return to common", "      - [L1, PB1.NO, 3, CR1.coil, 4]"),
    passing=Example("coil returns to X2", "      - [L1, PB1.NO, 3, CR1.coil, X2]"),
)
