"""A pushbutton, selector or process switch that closes onto several contactor coils or solenoids at
once makes their summed inrush current, beyond what its small contacts are meant to carry, and wears
or welds. Drive one interposing relay instead, so the switch carries one coil current.

Counted are coils of contactors and starters, solenoids and horns; contactors and starters that feed
the same motor or heater are one branch (one starter assembly, such as the line, star and delta
contactors of a wye-delta starter). Relay and timer coils are not counted: they are the interposing
devices. A contact makes when its closing can energize the loads: every NO contact and selector
position, and the NC contact of a maintained or process switch (it makes when the switch returns).
The NC contact of a momentary pushbutton, a stop, only breaks the sealed current of what it stops,
which contact-rating checks, and is not counted.

Only branches made at once count: where a third device's NC and NO contacts choose between two loads
(a start-delay timer's NC to the warning horn and its NO to the starter), the switch makes one of
them. The two coils of an interlock pair count as one where each has the other's NC contact in
series, since they are then never on together.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import CheckContext, Example, Finding, Option, Rule, reflow
from ctllint.reading.model import Element, Severity
from ctllint_plugins.motor_control._devices import (
    CONTACTOR_KINDS, contacts_of, device_of, interlock_pairs, is_mechanical, is_momentary_pushbutton,
)
from ctllint_plugins.motor_control._paths import names_of, subject_of


INTERPOSING_KINDS = ("relay", "timer")  # their coils are what switch-fan-out asks for, not counted


def _makes(dev, el: Element) -> bool:
    """Whether closing contact ``el`` of mechanical switch ``dev`` can energize the loads it serves.

    Every NO contact (and selector position) makes; an NC contact of a
    maintained or process switch makes when the switch returns; the NC
    contact of a momentary pushbutton (a stop) only breaks the sealed
    current of what it stops, which contact-rating checks.
    """
    return not (el.part == "NC" and is_momentary_pushbutton(dev))


def _power_branches(ctx: CheckContext, loads: list[Element]) -> list[list[Element]]:
    """The power-inductive branches among ``loads``, each a list of its loads, in file order.

    Counted: coils of contactors and starters, solenoids, horns (any
    inductive load but a relay's or timer's coil). Contactors and starters
    that feed the same motor or heater are one branch (one starter assembly,
    such as a wye-delta or a two-speed starter).
    """
    branches: dict[str, list[Element]] = {}
    for load in loads:
        dev = device_of(ctx, load.tag)
        if not load.inductive or (dev is not None and load.part == "coil" and dev.kind in INTERPOSING_KINDS):
            continue
        key = load.tag
        if dev is not None and dev.kind in CONTACTOR_KINDS and dev.get("feeds"):
            key = "feeds:" + dev.get("feeds")
        branches.setdefault(key, []).append(load)
    return list(branches.values())


def _interlocked(ctx: CheckContext, coil: Element, other: str) -> bool:
    """Every energizing path of ``coil`` passes an NC contact of ``other`` (and one exists)."""
    circuit = ctx.circuit
    nc = contacts_of(ctx, other, "NC")
    return bool(nc) and circuit.has_energizing_path(coil) and not circuit.has_energizing_path(coil, without=nc)


def _required_contacts(ctx: CheckContext, load: Element, cache: dict) -> set[tuple[str, str]]:
    """(tag, part) of the contacts every energizing path of ``load`` passes (one of them at least)."""
    if load.index not in cache:
        circuit = ctx.circuit
        out: set[tuple[str, str]] = set()
        for tag, part in dict.fromkeys((e.tag, e.part) for e in circuit.serving(load) if e.role == "contact"):
            same = [e for e in circuit.elements_of(tag) if e.role == "contact" and e.part == part]
            if not circuit.has_energizing_path(load, without=same):
                out.add((tag, part))
        cache[load.index] = out
    return cache[load.index]


_CHANGEOVER = ({"NO", "NC"}, {"instant-NO", "instant-NC"})


def _never_closed_together(ctx: CheckContext, tag: str, p: str, q: str) -> bool:
    """Parts ``p`` and ``q`` of device ``tag`` are never closed at once (NO and NC; two selector positions)."""
    if getattr(device_of(ctx, tag), "kind", None) == "selector":
        return p != q
    return {p, q} in _CHANGEOVER


def _exclusive(ctx: CheckContext, x: Element, y: Element, pairs: set[frozenset], cache: dict) -> bool:
    """Loads ``x`` and ``y`` are never made at once.

    Either a third device's contacts choose between them (x needs its NC, y
    its NO: the device's state is given when the switch closes, so only one
    is made), or they are an interlock pair with each coil through the
    other's NC contact (RULES.md: the pair counts as one).
    """
    if frozenset((x.tag, y.tag)) in pairs and _interlocked(ctx, x, y.tag) and _interlocked(ctx, y, x.tag):
        return True
    need_y = _required_contacts(ctx, y, cache)
    for tag, p in _required_contacts(ctx, x, cache):
        if tag in (x.tag, y.tag):
            continue
        if any(t == tag and _never_closed_together(ctx, tag, p, q) for t, q in need_y):
            return True
    return False


def _made_at_once(ctx: CheckContext, branches: list[list[Element]], pairs: set[frozenset], cache: dict) -> list[list[Element]]:
    """The largest set of branches that can be made together (the first such set, in file order).

    Two branches exclude each other when every load of one excludes every
    load of the other. The branches of one contact are few; beyond 12 every
    branch is counted (no search).
    """
    n = len(branches)
    if n > 12:
        return branches
    apart = [[all(_exclusive(ctx, x, y, pairs, cache) for x in branches[i] for y in branches[j]) if i != j else False
              for j in range(n)] for i in range(n)]
    best: list[int] = []
    for mask in range(1, 1 << n):
        chosen = [i for i in range(n) if mask >> i & 1]
        if len(chosen) <= len(best):
            continue
        if not any(apart[i][j] for i in chosen for j in chosen if i < j):
            best = chosen
    return [branches[i] for i in best]


def check(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    limit = ctx.options.get("max_inductive", 1)
    pairs: set[frozenset] | None = None
    cache: dict = {}
    for el in ctx.schematic.elements:
        dev = device_of(ctx, el.tag)
        if el.role != "contact" or not is_mechanical(dev) or not _makes(dev, el):
            continue
        loads = [x for x in circuit.served_loads(el) if x.inductive]
        if len(loads) <= limit:
            continue
        branches = _power_branches(ctx, loads)
        if len(branches) <= limit:
            continue
        if pairs is None:
            pairs = {frozenset(p) for p in interlock_pairs(ctx)}
        branches = _made_at_once(ctx, branches, pairs, cache)
        if len(branches) <= limit:
            continue
        supply = circuit.supply_of(branches[0][0])
        on = f" on supply {supply.name}" if supply is not None else ""
        shown = "; ".join(names_of(b) for b in branches)
        yield Finding(
            el.loc,
            f"contact {el.text} makes {len(branches)} power-inductive branches at once ({shown}){on}; "
            f"a mechanical switch should make at most {limit}: it makes their summed inrush current, so drive "
            f"one interposing relay instead",
            subject_of(ctx, el),
        )


RULE = Rule(
    name="switch-fan-out",
    severity=Severity.WARNING,
    summary="a mechanical switch contact makes more power-inductive branches than max_inductive",
    doc=reflow(__doc__),
    source="common practice (a switch making several inductive loads carries their summed inrush; relays interpose)",
    check=check,
    failing=Example("float switch drives two solenoids", "rungs:\n  - paths:\n      - [L1, FS1.NO, 2, SOL1, X2]\n      - [2, SOL2, X2]\n"),
    passing=Example("float switch drives one relay", "rungs:\n  - paths:\n      - [L1, FS1.NO, 2, CR1.coil, X2]\n      - [L1, CR1.NO, 3, SOL1, X2]\n      - [3, SOL2, X2]\n"),
    options={"max_inductive": Option(1, "how many power-inductive branches one mechanical switch contact may make", int, minimum=1)},
)
