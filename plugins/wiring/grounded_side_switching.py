"""In a grounded control circuit every load has one side tied straight to the grounded common, and
all switching is on the hot side. A contact on the grounded side leaves the load connected to
hot while off: a ground fault on the wire between the load and that contact energizes the load
(a motor starts by itself) or a stop contact there is bypassed. Overload relay contacts are
allowed on the grounded side, as both standards permit.
"""
from __future__ import annotations

from typing import Iterator

import ctllint.reading.kinds as K
from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.model import Element, Schematic, Severity, Supply
from ctllint_plugins.wiring._schematic import rail_wires, rung_text, subject_of
from ctllint_plugins.wiring._supply_sides import NonLoadGraph, SupplySides


# Roles that grounded-side-switching looks for: switching and conductor elements.
_SWITCHING_ROLES = (K.CONTACT, K.OUTPUT, K.CONDUCTOR)


def _is_overload_contact(sch: Schematic, el: Element) -> bool:
    dev = sch.devices.get(el.tag)
    return el.role == K.CONTACT and dev is not None and dev.kind == "overload"


def check(ctx: CheckContext) -> Iterator[Finding]:
    sch, circuit = ctx.schematic, ctx.circuit
    # Loads are taken supply by supply, so that only one supply's graphs are
    # alive at a time (on a large panel they are the bulk of this rule's
    # memory); each finding then lists its loads in circuit order again.
    by_supply: dict[str, tuple[Supply, list[tuple[int, Element]]]] = {}
    for position, load in enumerate(circuit.loads):
        supply = circuit.supply_of(load)
        if supply is None or not supply.grounded or not load.role:
            continue
        by_supply.setdefault(supply.name, (supply, []))[1].append((position, load))
    base = NonLoadGraph(ctx) if by_supply else None
    rails = rail_wires(sch)
    found: dict[int, tuple[Element, list[tuple[int, Element, Supply]]]] = {}
    for supply, loads in by_supply.values():
        sides = SupplySides(base, supply, rails)
        for position, load in loads:
            for el in sides.common_side(load):
                if el.role not in _SWITCHING_ROLES or _is_overload_contact(sch, el):
                    continue
                found.setdefault(el.index, (el, []))[1].append((position, load, supply))
        del sides
    for index in sorted(found):
        el, hits = found[index]
        hits.sort(key=lambda hit: hit[0])
        supply, loads = hits[0][2], [load for _, load, _ in hits]
        names = ", ".join(load.text for load in loads)
        if el.role == K.CONDUCTOR:
            dev = sch.devices.get(el.tag)
            what = dev.kind if dev is not None else "fuse"
            why = (
                f"when it opens, the grounded conductor is broken and the load stays connected to hot; "
                f"protect the hot side ({supply.hot}) instead"
            )
        else:
            what = "PLC output" if el.role == K.OUTPUT else "contact"
            why = (
                f"a ground fault on the wire between the load and {el.text} bypasses it and energizes the load; "
                f"move {el.text} to the hot side ({supply.hot}) of the load"
            )
        yield Finding(
            el.loc,
            f"{what} {el.text} in {rung_text(sch, el)} is between {names} and the grounded common {supply.common} "
            f"of supply {supply.name}: {why}",
            subject_of(sch, el),
        )


RULE = Rule(
    name="grounded-side-switching",
    severity=Severity.ERROR,
    summary="on a grounded supply, a contact, PLC output, fuse or breaker sits between a load and the common rail",
    doc=reflow(__doc__),
    source="IEC 60204-1:2016 9.4.3.1.1 method a) and NFPA 79 9.4.3 (grounded control circuits; clause numbers from memory)",
    check=check,
    failing=Example("stop button on the grounded side", "      - [L1, PB2.NO, 3, M1.coil, 4, PB1.NC, 5, OL1.NC, X2]"),
    passing=Example("stop on the hot side, overload on the grounded side", "      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]"),
)
