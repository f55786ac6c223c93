"""Wiring integrity: is the drawing a circuit at all, and a sound one?

These rules check what every other rule takes for granted: that each tag and
part in a path names a declared device and a part its kind has, that the
contacts used exist on the device, that every coil is drawn once and every
contact's coil is drawn somewhere, that each load can be energized from its
supply, that no path joins hot to common without a load, that two supplies
are never joined, that each load's rated voltage matches its supply, that a
grounded circuit switches only the ungrounded side of its loads, and that
no wire ends in mid-air or device sits unused.

The circuit questions (energizing paths, shorts, crossed supplies) are asked
of ``ctllint.circuit.analysis.Circuit``; none of them enumerates paths. Elements
whose tag or part is unknown are reported once, by ``unknown-device`` or
``unknown-part``, and left out of the circuit rules here.
"""
from __future__ import annotations

from collections import deque
from typing import Callable, Iterable, Iterator

from typing import TYPE_CHECKING as _TYPE_CHECKING

if _TYPE_CHECKING:  # pragma: no cover
    import networkx as nx

from ctllint import hookimpl
import ctllint.reading.kinds as K
from ctllint.api import CheckContext, Example, Finding, Rule
from ctllint.circuit.analysis import biconnected_blocks, path_text
from ctllint.reading.model import Device, Element, Schematic, Severity, Supply
from ctllint.reading.quantities import format_si
from ctllint.reading.terminals import assign as assign_terminals
from ctllint.circuit.tables import COIL_MAX_FRACTION, COIL_MIN_FRACTION, coil_voltage_ok
from ctllint.circuit.wiresets import WireSets

# The built-in kinds tell which fields name other devices and which parts a
# kind has, for messages. Roles themselves come from the loader, which knows
# plugin kinds too.
_KINDS = K.KindRegistry.builtin()

# Roles that grounded-side-switching looks for: switching and conductor elements.
_SWITCHING_ROLES = (K.CONTACT, K.OUTPUT, K.CONDUCTOR)


# ---------------------------------------------------------------------------
# small helpers
# ---------------------------------------------------------------------------


def _rung(sch: Schematic, el: Element) -> str:
    return f"rung {sch.rungs[el.rung].number}"


def _subject(sch: Schematic, el: Element) -> str:
    return f"{el.text}@rung{sch.rungs[el.rung].number}"


def _kind(dev: Device, kinds: K.KindRegistry | None = None) -> K.DeviceKind | None:
    return (kinds or _KINDS).get(dev.kind)


def _tag_fields(dev: Device, kinds: K.KindRegistry | None = None) -> list[tuple[str, list[str]]]:
    """(field, tags named) for each of the device's fields that name other devices."""
    kind = _kind(dev, kinds)
    if kind is None:
        return []
    out = []
    for name, spec in kind.fields.items():
        value = dev.get(name)
        if value is None or spec.type not in (K.TAG, K.TAGS):
            continue
        tags = list(value) if spec.type == K.TAGS else [value]
        out.append((name, [t for t in tags if isinstance(t, str)]))
    return out


def _article(word: str) -> str:
    return ("an " if word[:1] in "aeiou" else "a ") + word


def _wires_in_order(sch: Schematic) -> list[str]:
    seen: dict[str, None] = {}
    for rung in sch.rungs:
        for path in rung.paths:
            for wire in path.wires:
                seen.setdefault(wire, None)
    return list(seen)


def _rails(sch: Schematic) -> set[str]:
    return {w for s in sch.supplies.values() for w in (s.hot, s.common)}


def _tainted_wires(sch: Schematic) -> set[str]:
    """Wires joined, through non-rail wires, to an element whose tag or part is unknown.

    A load there may look open or shorted only because of the unknown element,
    which ``unknown-device``/``unknown-part`` already report.
    """
    rails = _rails(sch)
    sets = WireSets((el.left, el.right) for el in sch.elements if el.left not in rails and el.right not in rails)
    roots = {sets.find(w) for el in sch.elements if not el.role for w in (el.left, el.right) if w not in rails}
    return {w for w in list(sets.parent) if sets.find(w) in roots}


def _and(words: list[str]) -> str:
    return words[0] if len(words) == 1 else ", ".join(words[:-1]) + " and " + words[-1]


# ---------------------------------------------------------------------------
# unknown-device
# ---------------------------------------------------------------------------


def check_unknown_device(ctx: CheckContext) -> Iterator[Finding]:
    sch = ctx.schematic
    devices = sch.devices
    for el in sch.elements:
        if el.tag not in devices:
            yield Finding(
                el.loc,
                f"{el.text} in {_rung(sch, el)}: device {el.tag} is not declared under 'devices'"
                + (" or in a used file" if sch.uses else "")
                + f"; declare it or correct the tag",
                _subject(sch, el),
            )
    for dev in devices.values():
        if dev.origin != sch.path:
            continue
        for name, tags in _tag_fields(dev, ctx.kinds):
            for i, tag in enumerate(tags):
                if tag not in devices:
                    yield Finding(
                        dev.field_locs.get(f"{name}.{i}", dev.at(name)),
                        f"{name} of {dev.tag} names {tag}, which is not declared under 'devices'; declare it or correct the tag",
                        f"{dev.tag}.{name}",
                    )
    for sup in sch.supplies.values():
        if sup.source and sup.source not in devices:
            yield Finding(
                sup.at("source"),
                f"source of supply {sup.name} names {sup.source}, which is not declared under 'devices'; declare the transformer or power supply",
                f"supply {sup.name}",
            )
    for scenario in sch.expect:
        for step in scenario.steps:
            for tag in step.targets:
                if tag and tag not in devices:
                    yield Finding(
                        step.target_locs.get(tag, step.loc),
                        f"scenario '{scenario.name}': {step.action} names {tag}, which is not declared under 'devices'",
                        f"expect {scenario.name}: {tag}",
                    )


# ---------------------------------------------------------------------------
# unknown-part
# ---------------------------------------------------------------------------


def _valid_parts(dev: Device, kind: K.DeviceKind) -> list[str]:
    parts = [f"{dev.tag}.{p}" for p in kind.parts]
    if kind.positions:
        parts += [f"{dev.tag}.{p}" for p in K.selector_parts(dev)]  # positions, then cam blocks
    if kind.bare:
        parts.append(dev.tag)
    return parts


def check_unknown_part(ctx: CheckContext) -> Iterator[Finding]:
    sch = ctx.schematic
    for el in sch.elements:
        dev = sch.devices.get(el.tag)
        if dev is None or el.role:
            continue
        kind = _kind(dev)
        what = _article(dev.kind)
        if kind is not None and not kind.used_in_rungs:
            why = (
                f"{dev.tag} is {what}, which is drawn in the power circuit, not in control rungs; "
                "use the coil or contacts of the device that switches it"
            )
        elif kind is None:
            why = f"{dev.kind} {dev.tag} has no part {el.part!r}" if el.part else f"{dev.kind} {dev.tag} cannot be used as a bare tag"
        else:
            valid = ", ".join(_valid_parts(dev, kind)) or "none"
            if el.part is None:
                why = f"{dev.tag} is {what}: name one of its parts ({valid}), not the bare tag"
            elif kind.positions:
                why = f"selector {dev.tag} has no position or cam block '{el.part}' (its parts: {valid})"
            else:
                why = f"{dev.tag} is {what} and has no part '{el.part}' (use {valid})"
        yield Finding(el.loc, f"{el.text} in {_rung(sch, el)}: {why}", _subject(sch, el))


# ---------------------------------------------------------------------------
# contact-count
# ---------------------------------------------------------------------------


def _provides(count) -> str:
    given = [f"{n} {what}" for n, what in ((count.no, "NO"), (count.nc, "NC"), (count.instant_no, "instant-NO"), (count.instant_nc, "instant-NC")) if n]
    if count.changeover:
        given.append(f"{count.changeover} changeover (each one NO and one NC)")
    return " and ".join(given) or "no contacts"


def _excess(count, no_used: int, nc_used: int) -> int:
    """Uses beyond what ``count`` provides.

    FORMAT.md: changeover (double-throw) poles "each offer one NO and one
    NC", so each pole adds one NO use and one NC use (a form-C pole's NO and
    NC are both there to wire, sharing the pole's common).
    """
    return max(0, no_used - count.no - count.changeover) + max(0, nc_used - count.nc - count.changeover)


def check_contact_count(ctx: CheckContext) -> Iterator[Finding]:
    """More NO or NC uses than ``contacts`` gives; for a selector, more position uses.

    A selector is drawn by its positions (``SS1.hand``), and a cam can make
    either an NO or an NC block close in a given position, so each position
    use takes one contact block of any type: a selector is reported when it
    has more position uses than contact blocks in all.
    """
    sch = ctx.schematic
    used: dict[str, list[int]] = {}
    instant_used: dict[tuple[str, str], int] = {}
    marks: dict = {}

    def pair(el: Element) -> str:
        """`` (terminals 23-24)`` of the exceeding use, worked out only once a finding needs it."""
        if not marks:
            marks.update(assign_terminals(sch, ctx.kinds) or {None: None})
        m = marks.get(el.index)
        return f" (terminals {m.pair})" if m is not None else ""

    for el in sch.elements:
        if el.role != K.CONTACT:
            continue
        dev = sch.devices.get(el.tag)
        count = dev.get("contacts") if dev is not None else None
        if count is None or not hasattr(count, "allows"):
            continue
        kind = _kind(dev, ctx.kinds)
        if kind is not None and kind.positions and el.part in K.selector_parts(dev):
            tally = used.setdefault(el.tag, [0, 0, 0])
            tally[2] += 1
            blocks = count.no + count.nc + count.changeover
            if tally[2] > blocks:
                yield Finding(
                    el.loc,
                    f"{el.text}{pair(el)} in {_rung(sch, el)} is position contact number {tally[2]} drawn for selector {el.tag}, "
                    f"which provides {_provides(count)} (line {dev.at('contacts').line}), {blocks} contact "
                    f"block{'s' if blocks != 1 else ''} in all; add a contact block, correct `contacts`, or use a relay",
                    _subject(sch, el),
                )
            continue
        if el.part in K.INSTANT_PARTS:
            # a timer's instantaneous contacts are counted apart from its timed NO/NC
            key = (el.tag, el.part)
            instant_used[key] = instant_used.get(key, 0) + 1
            provided = count.instant_no if el.part == "instant-NO" else count.instant_nc
            if instant_used[key] > provided:
                yield Finding(
                    el.loc,
                    f"{el.text} in {_rung(sch, el)} is {el.part} contact number {instant_used[key]} drawn for {el.tag}, "
                    f"which provides {provided} {el.part} (line {dev.at('contacts').line}); "
                    "add an instantaneous contact block, correct `contacts`, or use a relay",
                    _subject(sch, el),
                )
            continue
        if el.part not in ("NO", "NC"):
            continue
        tally = used.setdefault(el.tag, [0, 0, 0])
        before = _excess(count, tally[0], tally[1])
        tally[0 if el.part == "NO" else 1] += 1
        # Only the use that goes beyond what is left is reported: once the
        # NCs are exhausted, a later NO within the NO count is no fault.
        if _excess(count, tally[0], tally[1]) > before:
            yield Finding(
                el.loc,
                f"{el.text}{pair(el)} in {_rung(sch, el)} is {el.part} contact number {tally[0 if el.part == 'NO' else 1]} drawn for {el.tag}, "
                f"which provides {_provides(count)} (line {dev.at('contacts').line}) and {tally[0]} NO + {tally[1]} NC are drawn so far; "
                "add an auxiliary contact block, correct `contacts`, or use a relay",
                _subject(sch, el),
            )


# ---------------------------------------------------------------------------
# coil-missing, coil-duplicate
# ---------------------------------------------------------------------------


def _has_coil(dev: Device) -> bool:
    kind = _kind(dev)
    return bool(kind and kind.coil)


def check_coil_missing(ctx: CheckContext) -> Iterator[Finding]:
    sch = ctx.schematic
    coils = {el.tag for el in sch.elements if el.part == "coil" and el.role == K.LOAD}
    # A kind with coils of its own names (a latching relay's set and reset) needs every one of them drawn.
    drawn = {(el.tag, el.part) for el in sch.elements if el.role == K.LOAD}
    for tag in {el.tag for el in sch.elements if el.role == K.LOAD and el.part != "coil"}:
        kind = _kind(sch.devices.get(tag)) if tag in sch.devices else None
        named = tuple(p for p in K.coil_parts(kind) if p not in kind.optional_coils) if kind else ()
        if named and named != ("coil",) and all((tag, part) in drawn for part in named):
            coils.add(tag)
    # A coil drawn as a part the kind lacks (the bare tag M1, or M1.Coil) is
    # reported once, by unknown-part; its contacts are not reported again.
    coils |= {
        el.tag
        for el in sch.elements
        if not el.role and el.tag in sch.devices and (el.part is None or "coil" in el.part.lower())
    }
    reported: set[str] = set()
    for el in sch.elements:
        if el.role != K.CONTACT or el.tag in coils or el.tag in reported:
            continue
        dev = sch.devices.get(el.tag)
        if dev is None or not _has_coil(dev):
            continue
        reported.add(el.tag)
        named = tuple(p for p in K.coil_parts(_kind(dev)) if p not in _kind(dev).optional_coils)
        if named and named != ("coil",):
            missing = [f"{el.tag}.{p}" for p in named if (el.tag, p) not in drawn]
            yield Finding(
                el.loc,
                f"{el.text} in {_rung(sch, el)} is a contact of {dev.kind} {el.tag}, but {' and '.join(missing)} "
                f"{'is' if len(missing) == 1 else 'are'} in no rung: the contact "
                + ("never changes state" if len(missing) == len(named) else "can never return")
                + "; draw the missing coil or use another device's contact",
                el.tag,
            )
            continue
        yield Finding(
            el.loc,
            f"{el.text} in {_rung(sch, el)} is a contact of {dev.kind} {el.tag}, but {el.tag}.coil is in no rung: "
            "the contact never changes state; draw the coil or use another device's contact",
            el.tag,
        )


def check_coil_duplicate(ctx: CheckContext) -> Iterator[Finding]:
    sch = ctx.schematic
    first: dict[tuple[str, str], Element] = {}
    for el in sch.elements:
        if el.role != K.LOAD or el.part is None or el.part not in K.coil_parts(_kind(sch.devices.get(el.tag)) if el.tag in sch.devices else None):
            continue
        if (el.tag, el.part) not in first:
            first[(el.tag, el.part)] = el
            continue
        one = first[(el.tag, el.part)]
        yield Finding(
            el.loc,
            f"{el.text} in {_rung(sch, el)} is drawn a second time (first in {_rung(sch, one)}, line {one.loc.line}); "
            f"a device has one coil: join the branches that drive it to one {el.text}, or use a second relay",
            _subject(sch, el),
        )


# ---------------------------------------------------------------------------
# open-circuit, loads-in-series
# ---------------------------------------------------------------------------


def _rail_reach(sch: Schematic) -> Callable[[str], list[str]]:
    """A function giving the rails a wire reaches through non-load elements, passing no rail.

    The parts of the non-load, known elements with the rails left out are
    found once (union-find), with the rails each part touches, so that no
    graph of the whole circuit is built and each question is answered at
    once. (A load is never crossed, so leaving out the load asked about
    changes nothing.)
    """
    rails = _rails(sch)
    parent: dict[str, str] = {}

    def find(w: str) -> str:
        parent.setdefault(w, w)
        while parent[w] != w:
            parent[w] = parent[parent[w]]
            w = parent[w]
        return w

    touching: list[tuple[str, str]] = []  # (rail, non-rail wire) joined by an element
    for el in sch.elements:
        if el.role in (K.LOAD, ""):
            continue
        a, b = el.left, el.right
        if a in rails and b not in rails:
            touching.append((a, b))
        elif b in rails and a not in rails:
            touching.append((b, a))
        elif a not in rails:
            ra, rb = find(a), find(b)
            if ra != rb:
                parent[ra] = rb
    reached: dict[str, set[str]] = {}
    for rail, wire in touching:
        reached.setdefault(find(wire), set()).add(rail)

    def rails_of(wire: str) -> list[str]:
        if wire in rails:
            return [wire]
        return sorted(reached.get(find(wire), ())) if wire in parent else []

    return rails_of


def check_open_circuit(ctx: CheckContext) -> Iterator[Finding]:
    sch, circuit = ctx.schematic, ctx.circuit
    tainted = _tainted_wires(sch)
    rails_of = _rail_reach(sch)
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
            sides = [f"both its ends are on {'rail' if load.left in _rails(sch) else 'wire'} {load.left}"]
        supply = circuit.supply_of(load) or (sch.supplies.get(next(iter(supplies))) if supplies else None)
        want = f"hot {supply.hot} on one side and common {supply.common} on the other" if supply else "a supply's hot rail on one side and its common rail on the other"
        yield Finding(
            load.loc,
            f"{load.text} in {_rung(sch, load)} can never be energized: it needs {want}, whatever the contacts do, "
            f"but {'; '.join(sides)}; check the wire numbers of this rung",
            _subject(sch, load),
        )


def _fed_from_hot(ctx: CheckContext, load: Element, rails_of: Callable[[str], list[str]]) -> bool:
    """Whether a side of ``load`` reaches a hot rail without passing another load."""
    hots = {s.hot for s in ctx.schematic.supplies.values()}
    return any(r in hots for wire in (load.left, load.right) for r in rails_of(wire))


def check_loads_in_series(ctx: CheckContext) -> Iterator[Finding]:
    sch, circuit = ctx.schematic, ctx.circuit
    tainted = _tainted_wires(sch)
    # The second load of a pair is the one farther from hot: the one that
    # does not reach a hot rail without passing a load; file order breaks ties.
    rails_of = _rail_reach(sch)
    order = {load.index: (0 if _fed_from_hot(ctx, load, rails_of) else 1, load.index) for load in circuit.loads}
    partners: dict[int, list[Element]] = {}
    seconds: dict[int, Element] = {}
    for load in circuit.loads:
        if load.left in tainted or load.right in tainted:
            continue
        for other in circuit.reaches_rail_only_through_loads(load):
            if other is load:
                continue
            first, second = sorted((load, other), key=lambda e: order.get(e.index, (1, e.index)))
            seconds[second.index] = second
            if all(p is not first for p in partners.setdefault(second.index, [])):
                partners[second.index].append(first)
    for index in sorted(seconds):
        second = seconds[index]
        firsts = sorted(partners[index], key=lambda e: e.index)
        supply = circuit.supply_of(firsts[0]) or circuit.supply_of(second)
        volts = f" of supply {supply.name} ({supply.voltage.text})" if supply else ""
        names = ", ".join(f"{e.text} ({_rung(sch, e)})" for e in firsts)
        yield Finding(
            second.loc,
            f"{second.text} in {_rung(sch, second)} is in series with {names}: it reaches the rail only through "
            f"{'that load' if len(firsts) == 1 else 'those loads'}, so they share the voltage{volts} and none gets its rating; "
            "connect each load between its own contacts and the common rail",
            _subject(sch, second),
        )


# ---------------------------------------------------------------------------
# short-circuit, supply-cross
# ---------------------------------------------------------------------------


def check_short_circuit(ctx: CheckContext) -> Iterator[Finding]:
    sch = ctx.schematic
    # One finding per short: the circuit gives one path per element leaving
    # hot, so a short reached from hot through several parallel elements (the
    # hand and auto branches of a selector, two start buttons) comes back
    # once per branch, all ending at the same element on common; and several
    # common-side elements in parallel come back from the same first element.
    # A path is reported only when both its ends are new.
    reported: set[int] = set()
    for supply, path in ctx.circuit.short_circuits():
        if not path or any(not el.role for el in path):
            continue
        first, last = path[0], path[-1]
        if first.index in reported or last.index in reported:
            continue
        reported.update((first.index, last.index))
        closing = [el.text for el in path if el.role in (K.CONTACT, K.OUTPUT)]
        when = f"when {_and(closing)} {'close' if len(closing) > 1 else 'closes'}" if closing else "as soon as power is on"
        yield Finding(
            first.loc,
            f"short circuit of supply {supply.name} ({supply.voltage.text}): {path_text(supply.hot, path)} "
            f"joins hot to common with no load, {when}; put the load in this path or correct the wire numbers",
            _subject(sch, first),
        )


def check_supply_cross(ctx: CheckContext) -> Iterator[Finding]:
    sch = ctx.schematic
    for el, first, second in ctx.circuit.supply_cross():
        rail = next((w for w in (el.left, el.right) if w in (second.hot, second.common)), None)
        touches = f"rail {rail} of supply {second.name}" if rail else f"supply {second.name}"
        yield Finding(
            el.loc,
            f"{el.text} in {_rung(sch, el)} connects {touches} ({second.voltage.text}) to the circuit of supply "
            f"{first.name} ({first.voltage.text}); separate supplies must never be joined: use a relay whose coil "
            "is on one supply and contact on the other",
            _subject(sch, el),
        )


# ---------------------------------------------------------------------------
# voltage-mismatch
# ---------------------------------------------------------------------------


def _rated_voltage(dev: Device, el: Element):
    if el.part is not None and el.part in K.coil_parts(_kind(dev)):  # coil, or a latching relay's set and reset
        return dev.get("coil")
    return dev.get("voltage")


def check_voltage_mismatch(ctx: CheckContext) -> Iterator[Finding]:
    sch, circuit = ctx.schematic, ctx.circuit
    for load in circuit.loads:
        dev = sch.devices.get(load.tag)
        if dev is None or not load.role:
            continue
        rated = _rated_voltage(dev, load)
        supply = circuit.supply_of(load)
        if rated is None or supply is None or not rated.value:
            continue
        problems = []
        if not coil_voltage_ok(supply.voltage.value, rated.value):
            low, high = COIL_MIN_FRACTION * rated.value, COIL_MAX_FRACTION * rated.value
            problems.append(
                f"{format_si(supply.voltage.value, 'V')} is outside {format_si(low, 'V')} to {format_si(high, 'V')} "
                f"(85 % to 110 % of its rating)"
            )
        rated_kind = rated.current_kind or supply.current_kind
        if rated_kind and supply.current_kind and rated_kind != supply.current_kind:
            problems.append(f"it is rated for {rated_kind} and the supply is {supply.current_kind}")
        if problems:
            part = "coil" if load.part == "coil" else dev.kind
            yield Finding(
                load.loc,
                f"{load.text} in {_rung(sch, load)} is rated {rated.text} but is on supply {supply.name} ({supply.voltage.text}): "
                f"{'; '.join(problems)}; fit a {part} rated for {supply.voltage.text} or move it to a matching supply",
                _subject(sch, load),
            )
    for el in sch.elements:
        if el.role != K.OUTPUT:
            continue
        dev = sch.devices.get(el.tag)
        if dev is None or dev.get("output") != "transistor":
            continue
        supplies = []
        for load in circuit.served_loads(el):
            sup = circuit.supply_of(load)
            if sup is not None and sup not in supplies:
                supplies.append(sup)
        ac = next((s for s in supplies if s.current_kind == "AC"), None)
        if ac is not None:
            yield Finding(
                el.loc,
                f"{el.text} in {_rung(sch, el)} is a transistor output on AC supply {ac.name} ({ac.voltage.text}): "
                "a transistor switches DC only; use a relay or triac output, or an interposing relay",
                _subject(sch, el),
            )


# ---------------------------------------------------------------------------
# grounded-side-switching
# ---------------------------------------------------------------------------


# An undirected edge as its two wires in sorted order: a plain tuple, a
# quarter of the size of a frozenset, and there is one per element of the
# circuit while grounded-side-switching runs.
_Pair = tuple[str, str]


def _pair(a: str, b: str) -> _Pair:
    return (a, b) if a <= b else (b, a)


def _pairs_on_simple_paths(graph: nx.Graph, source: str, target: str) -> set[_Pair]:
    """Edges (as wire pairs) that lie on at least one simple path from ``source`` to ``target``.

    An edge lies on such a path exactly when its biconnected block lies on the
    block-cut tree's path between the two: inside a 2-connected block, any
    edge lies on a simple path between any two distinct vertices. Linear in
    the graph's size; no path is enumerated.
    """
    if source == target or source not in graph or target not in graph or not _nx().has_path(graph, source, target):
        return set()
    tree, block_edges = _block_cut_tree(graph)
    start, goal = _tree_node(tree, source), _tree_node(tree, target)
    route = _nx().shortest_path(tree, start, goal)
    out: set[_Pair] = set()
    for node in route:
        if node[0] == "B":
            out |= block_edges[node[1]]
    return out


def _block_cut_tree(graph: nx.Graph) -> tuple[nx.Graph, list[set[_Pair]]]:
    tree = _nx().Graph()
    blocks: list[set[_Pair]] = []
    cuts = set(_nx().articulation_points(graph))
    for i, edges in enumerate(_nx().biconnected_component_edges(graph)):
        pairs = {_pair(*e) for e in edges}
        blocks.append(pairs)
        tree.add_node(("B", i))
        for wire in {w for e in edges for w in e}:
            if wire in cuts:
                tree.add_edge(("B", i), ("C", wire))
            else:
                tree.add_edge(("B", i), ("W", wire))
    return tree, blocks


def _tree_node(tree: nx.Graph, wire: str):
    return ("C", wire) if ("C", wire) in tree else ("W", wire)


class _NonLoadGraph:
    """The circuit's non-load, known elements as wire pairs, read once for every supply."""

    def __init__(self, ctx: CheckContext):
        self.wires: dict[str, None] = {}  # an ordered set, in file order
        self.elements: dict[_Pair, list[Element]] = {}  # keyed by the wire pair, in ``_pair`` order
        # Read from the elements, not ``circuit.graph``: the circuit builds its
        # graph only when asked, and on a large panel it is the bulk of memory.
        for el in ctx.schematic.elements:
            a, b = el.left, el.right
            if el.role in (K.LOAD, "") or a == b:
                continue
            self.elements.setdefault(_pair(a, b), []).append(el)
            self.wires.setdefault(a)
            self.wires.setdefault(b)

    def without(self, removed: set[str]) -> nx.Graph:
        """The graph of the edges with the wires ``removed`` taken out (built directly, not copied)."""
        graph = _nx().Graph()
        graph.add_nodes_from(w for w in self.wires if w not in removed)
        graph.add_edges_from((a, b) for a, b in self.elements if a not in removed and b not in removed)
        return graph


class _SupplySides:
    """For one grounded supply: which elements lie between a load and the common rail.

    The graph is the circuit with every load, every unknown element and every
    other rail taken out, since an energizing path passes no other load. The
    block-cut tree of its common-side part is built once; a load whose two
    sides are joined without a load (a bypass, reported elsewhere) is
    worked out on its own.
    """

    def __init__(self, base: "_NonLoadGraph", supply: Supply, rails: set[str]):
        self.supply = supply
        self.base = base
        self.elements = base.elements
        self._hot_removed = {r for r in rails if r != supply.hot}
        self._common_removed = {r for r in rails if r != supply.common}
        # Components by union-find and blocks by ``biconnected_blocks``: no
        # graph object of the circuit is built unless a load is bypassed on paper.
        self._common_component = _component_map_of_pairs(base, self._common_removed)
        self._common_graph: nx.Graph | None = None
        # The hot side needs only which part each wire is in (found without a
        # graph); its graph is built only for a load bypassed on paper, so that
        # one graph, not two, is alive on a large panel.
        self._hot_component = _component_map_of_pairs(base, self._hot_removed)
        self._hot_graph: nx.Graph | None = None
        self._tree = None

    @property
    def common_graph(self) -> nx.Graph:
        if self._common_graph is None:
            self._common_graph = self.base.without(self._common_removed)
        return self._common_graph

    @property
    def hot_graph(self) -> nx.Graph:
        if self._hot_graph is None:
            self._hot_graph = self.base.without(self._hot_removed)
        return self._hot_graph

    def _reaches_hot(self, wire: str, other_side: str) -> bool:
        hot = self.supply.hot
        if wire == hot:
            return True
        comp = self._hot_component.get(wire)
        if comp is None or comp != self._hot_component.get(hot):
            return False
        if self._hot_component.get(other_side) != comp:
            return True
        graph = self.hot_graph.subgraph(n for n in self.hot_graph if n != other_side)
        return _nx().has_path(graph, wire, hot)

    def common_side(self, load: Element) -> list[Element]:
        """Non-load elements on some energizing path of ``load`` between it and the common rail."""
        hot, common = self.supply.hot, self.supply.common
        pairs: set[_Pair] = set()
        for hot_side, common_side in ((load.left, load.right), (load.right, load.left)):
            if hot_side == common or common_side == hot or hot_side == common_side:
                continue
            if common_side == common:
                continue
            if not self._reaches_hot(hot_side, common_side):
                continue
            comp = self._common_component.get(common_side)
            if comp is None or comp != self._common_component.get(common):
                continue
            if self._common_component.get(hot_side) == comp:
                graph = self.common_graph.subgraph(n for n in self.common_graph if n != hot_side)
                pairs |= _pairs_on_simple_paths(_nx().Graph(graph), common_side, common)
            else:
                pairs |= self._on_paths_to_common(common_side)
        found = [el for pair in pairs for el in self.elements.get(pair, ())]
        return sorted(found, key=lambda e: e.index)

    def _on_paths_to_common(self, wire: str) -> set[_Pair]:
        if self._tree is None:
            removed = self._common_removed
            pairs = [p for p in self.elements if p[0] not in removed and p[1] not in removed]
            self._tree = _TreeToRoot(pairs, self.supply.common)
        return self._tree.pairs_to_root(wire)


class _TreeToRoot:
    """The block-cut tree of a graph, kept only as links towards one root wire.

    Answers what ``_block_cut_tree`` and a walk to the root would, with no
    tree graph built: each block knows the wire above it, each wire the block
    above it. On a large panel the tree as a graph of tuple-named nodes was
    the largest structure this rule built.
    """

    __slots__ = ("root", "blocks", "up_of_block", "up_of_wire")

    def __init__(self, edges: list[_Pair], root: str):
        """``edges``: the graph's edges as wire pairs, each once."""
        self.root = root
        self.blocks: list[tuple[_Pair, ...]] = []
        # A wire in more than one block is a cut vertex; the others are leaves of the tree.
        first: dict[str, int] = {}
        more: dict[str, list[int]] = {}
        for i, block in enumerate(biconnected_blocks((j, a, b) for j, (a, b) in enumerate(edges))):
            pairs = tuple(edges[j] for j in block)
            self.blocks.append(pairs)
            for w in {w for pair in pairs for w in pair}:
                if w in first:
                    more.setdefault(w, [first[w]]).append(i)
                else:
                    first[w] = i
        self.up_of_block: list[str | None] = [None] * len(self.blocks)
        self.up_of_wire: dict[str, int] = {}
        if root not in first:
            return
        seen = [False] * len(self.blocks)
        queue = deque([root])
        while queue:
            w = queue.popleft()
            for b in more.get(w) or (first[w],):
                if seen[b]:
                    continue
                seen[b] = True
                self.up_of_block[b] = w
                for pair in self.blocks[b]:
                    for x in pair:
                        if x != root and x not in self.up_of_wire:
                            self.up_of_wire[x] = b
                            if x in more:
                                queue.append(x)

    def pairs_to_root(self, wire: str) -> set[_Pair]:
        """The edges of the blocks on the tree path from ``wire`` to the root."""
        out: set[_Pair] = set()
        b = self.up_of_wire.get(wire)
        while b is not None:
            out.update(self.blocks[b])
            up = self.up_of_block[b]
            if up == self.root:
                break
            b = self.up_of_wire[up]
        return out


def _component_map_of_pairs(base: "_NonLoadGraph", removed: set[str]) -> dict[str, int]:
    """Wire -> number of its connected part in ``base`` with the wires ``removed``, by union-find.

    Only whether two wires share a part is ever asked of the numbers.
    """
    sets = WireSets()
    for w in base.wires:
        if w not in removed:
            sets.find(w)  # every remaining wire is a set of its own to begin with
    for a, b in base.elements:
        if a in sets.parent and b in sets.parent:
            sets.join(a, b)
    numbers: dict[str, int] = {}
    return {w: numbers.setdefault(sets.find(w), len(numbers)) for w in list(sets.parent)}


def _is_overload_contact(sch: Schematic, el: Element) -> bool:
    dev = sch.devices.get(el.tag)
    return el.role == K.CONTACT and dev is not None and dev.kind == "overload"


def check_grounded_side_switching(ctx: CheckContext) -> Iterator[Finding]:
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
    base = _NonLoadGraph(ctx) if by_supply else None
    rails = _rails(sch)
    found: dict[int, tuple[Element, list[tuple[int, Element, Supply]]]] = {}
    for supply, loads in by_supply.values():
        sides = _SupplySides(base, supply, rails)
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
            f"{what} {el.text} in {_rung(sch, el)} is between {names} and the grounded common {supply.common} "
            f"of supply {supply.name}: {why}",
            _subject(sch, el),
        )


# ---------------------------------------------------------------------------
# dangling-wire, unused-device
# ---------------------------------------------------------------------------


def check_dangling_wire(ctx: CheckContext) -> Iterator[Finding]:
    """Wires with one element on them, and elements whose two ends are one wire.

    A wire's connections are the elements on it, each counted once: an
    element with both ends on a wire found nowhere else ([7, CR1.NO, 7]) is
    that wire's only connection. An element with both ends on the same wire
    that has other connections ([3, CR1.NO, 3]) is joined across nothing, so
    it never changes the circuit: almost always one mistyped wire number (3
    for 2), the mistake this rule exists for; it is reported here, at the
    element. A load so drawn is left to ``open-circuit``, which already says
    it can never be energized; unknown elements to ``unknown-device`` and
    ``unknown-part``.
    """
    sch, circuit = ctx.schematic, ctx.circuit
    rails = _rails(sch) | set(circuit.rails)
    on_wire: dict[str, list[Element]] = {}
    for e in sch.elements:
        for wire in (e.left,) if e.left == e.right else (e.left, e.right):
            on_wire.setdefault(wire, []).append(e)
    reported: set[int] = set()
    for wire in _wires_in_order(sch):
        found = on_wire.get(wire, ())
        if wire in rails or len(found) != 1:
            continue
        el = found[0]
        reported.add(el.index)
        if el.left == el.right:
            why = f"both ends of {el.text} are on it, so {el.text} is connected to nothing else"
        else:
            why = f"{el.text} is connected on one side only"
        yield Finding(
            el.loc,
            f"wire {wire} ends at {el.text} in {_rung(sch, el)} and goes nowhere else: {why}; "
            "correct the wire number or complete the path",
            f"wire {wire}",
        )
    for el in sch.elements:
        if el.left != el.right or el.index in reported or not el.role or el.role == K.LOAD:
            continue
        where = f"{'rail' if el.left in rails else 'wire'} {el.left}"
        yield Finding(
            el.loc,
            f"both ends of {el.text} in {_rung(sch, el)} are on {where}: it joins a wire to itself, so whether it is open "
            "or closed changes nothing; one of its wire numbers is probably mistyped",
            f"wire {el.left}",
        )


def _used_tags(sch: Schematic, kinds: K.KindRegistry) -> set[str]:
    used = {el.tag for el in sch.elements}
    drawn = set(used)
    for dev in sch.devices.values():
        for name, tags in _tag_fields(dev, kinds):
            used.update(tags)
            # A transformer whose own fuses are drawn in the rungs is in the
            # drawing (its secondary fuse feeds them) even where no supply
            # names it as `source`.
            if name == "fuses" and any(t in drawn for t in tags):
                used.add(dev.tag)
    used.update(s.source for s in sch.supplies.values() if s.source)
    for scenario in sch.expect:
        for step in scenario.steps:
            used.update(t for t in step.targets if t)
    return used


def check_unused_device(ctx: CheckContext) -> Iterator[Finding]:
    sch = ctx.schematic
    used = _used_tags(sch, ctx.kinds)
    for dev in sch.devices.values():
        if dev.origin != sch.path or dev.tag in used:
            continue
        yield Finding(
            dev.loc,
            f"{dev.kind} {dev.tag} is declared but used nowhere: in no rung, no supply's source, no other device's field "
            "and no expect step; draw it or remove it",
            dev.tag,
        )


# ---------------------------------------------------------------------------
# registration
# ---------------------------------------------------------------------------

RULES = [
    Rule(
        name="unknown-device",
        severity=Severity.ERROR,
        summary="a tag in a path, a device field, a supply's source or an expect step is not declared",
        doc=(
            "Every tag a schematic names must be a declared device, in this file or a used device file. "
            "A mistyped tag (CR12 for CR21) would otherwise draw a contact nobody can find in the panel, "
            "a starter whose overload does not exist, or a scenario that checks nothing. Naming a device "
            "of the wrong kind (a starter whose overload is a pushbutton) is a format error instead."
        ),
        source="common practice (every reference designation on a drawing names a listed device)",
        check=check_unknown_device,
        failing=Example("CR2 is not declared", "devices:\n  CR1: {kind: relay, coil: 120 VAC}\nrungs:\n  - paths:\n      - [L1, CR2.NO, 3, SOL1, X2]"),
        passing=Example("every tag declared", "devices:\n  CR1: {kind: relay, coil: 120 VAC}\nrungs:\n  - paths:\n      - [L1, CR1.NO, 3, SOL1, X2]"),
    ),
    Rule(
        name="unknown-part",
        severity=Severity.ERROR,
        summary="an element names a part its device's kind does not have, or a device never drawn in rungs",
        doc=(
            "A pushbutton has contacts but no coil, a selector has only the positions it lists, a starter is "
            "drawn by its coil and contacts, never bare, and motors, heaters, transformers and power supplies "
            "belong to the power circuit, not to control rungs. Such an element cannot be built as drawn, so "
            "ctllint cannot say what it does; the circuit rules leave it out."
        ),
        source="common practice",
        check=check_unknown_part,
        failing=Example("a pushbutton has no coil", "devices:\n  PB1: {kind: pushbutton, function: start}\nrungs:\n  - paths:\n      - [L1, PB1.coil, X2]"),
        passing=Example("a pushbutton's contact", "devices:\n  PB1: {kind: pushbutton, function: start}\nrungs:\n  - paths:\n      - [L1, PB1.NO, 3, CR1.coil, X2]"),
    ),
    Rule(
        name="contact-count",
        severity=Severity.ERROR,
        summary="more NO (or NC) contacts used than the device's `contacts` provides",
        doc=(
            "A device has a fixed number of contacts. Drawing more NO or NC uses than it provides gives a "
            "panel that cannot be wired as drawn; the missing contact is usually found at commissioning. "
            "Changeover (double-throw) poles give one NO and one NC use each (FORMAT.md). Devices without `contacts` are "
            "not checked. A selector is drawn by its positions, and a cam can close an NO or an NC block in "
            "any position, so each position use takes one block of either type: a selector is reported when "
            "its position uses outnumber its contact blocks."
        ),
        source="common practice",
        check=check_contact_count,
        failing=Example("two NO uses of a 1 NO relay", "  CR1: {kind: relay, coil: 120 VAC, contacts: {NO: 1, NC: 1}}\n  ...\n      - [L1, CR1.NO, 5, SOL1, X2]\n      - [L1, CR1.NO, 6, SOL2, X2]"),
        passing=Example("one NO and one NC use", "  CR1: {kind: relay, coil: 120 VAC, contacts: {NO: 1, NC: 1}}\n  ...\n      - [L1, CR1.NO, 5, SOL1, X2]\n      - [L1, CR1.NC, 6, SOL2, X2]"),
    ),
    Rule(
        name="coil-missing",
        severity=Severity.ERROR,
        summary="contacts of a relay, timer, contactor or starter are used but its coil is in no rung",
        doc=(
            "A relay's contacts move only when its coil is energized. A contact whose coil is drawn nowhere "
            "never changes state, so the logic that depends on it is dead or always on; usually the coil "
            "was left off the drawing or the contact carries the wrong tag."
        ),
        source="common practice",
        check=check_coil_missing,
        failing=Example("CR2's contact, no CR2 coil", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [L1, CR2.NO, 4, SOL1, X2]"),
        passing=Example("the contact's coil is drawn", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [L1, CR1.NO, 4, SOL1, X2]"),
    ),
    Rule(
        name="coil-duplicate",
        severity=Severity.ERROR,
        summary="the same coil is drawn twice",
        doc=(
            "A device has one coil. Drawing it twice means two branches are meant to drive it; as drawn "
            "they are two coils, and the panel builder cannot wire both. Join the branches in parallel "
            "ahead of one coil."
        ),
        source="common practice",
        check=check_coil_duplicate,
        failing=Example("CR1.coil twice", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [L1, LS1.NO, 4, CR1.coil, X2]"),
        passing=Example("branches in parallel ahead of one coil", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [L1, LS1.NO, 3]"),
    ),
    Rule(
        name="open-circuit",
        severity=Severity.ERROR,
        summary="a load can never reach hot on one side and common on the other",
        doc=(
            "A load is energized only with its supply's hot rail on one terminal and the same supply's "
            "common on the other. Where no combination of contact states does that (a missing return "
            "to common, a mistyped wire number), the coil, solenoid or light is dead: the machine will "
            "not do what the drawing shows. A load that reaches a rail only through another load is "
            "reported as loads-in-series instead."
        ),
        source="common practice",
        check=check_open_circuit,
        failing=Example("no return to common", "      - [L1, PB1.NO, 3, CR1.coil, 4]"),
        passing=Example("coil returns to X2", "      - [L1, PB1.NO, 3, CR1.coil, X2]"),
    ),
    Rule(
        name="loads-in-series",
        severity=Severity.ERROR,
        summary="a load reaches a rail only through another load",
        doc=(
            "Loads in series share the supply voltage: neither gets its rated voltage, a coil may not pick "
            "up or may chatter, and one load failing open drops the other. Every load belongs between its "
            "switching elements and the common rail, in parallel with the others."
        ),
        source="common practice",
        check=check_loads_in_series,
        failing=Example("coil then light to common", "      - [L1, PB1.NO, 3, CR1.coil, 4, PL1, X2]"),
        passing=Example("light in parallel, switched by a contact", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [L1, CR1.NO, 4, PL1, X2]"),
    ),
    Rule(
        name="short-circuit",
        severity=Severity.ERROR,
        summary="hot and common of a supply are joined by a path with no load in it",
        doc=(
            "A path of contacts, outputs or fuses from hot to common with no load shorts the supply when "
            "its contacts close, tripping the protection or welding the contacts. The path counts if it "
            "exists on paper, for any combination of contact states, since the drawing is what gets wired. "
            "One short reached from hot through several parallel branches (hand and auto, two start "
            "buttons) is reported once, at the first element of its first path."
        ),
        source="common practice",
        check=check_short_circuit,
        failing=Example("contact straight across the supply", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [3, CR1.NO, X2]"),
        passing=Example("seal-in around the start button", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [L1, CR1.NO, 3]"),
    ),
    Rule(
        name="supply-cross",
        severity=Severity.ERROR,
        summary="elements connect the rails of two different supplies",
        doc=(
            "Separate supplies (a 120 VAC control transformer and a 24 VDC power supply) must never be joined: "
            "a path between them puts one supply's voltage on the other's devices, damages electronics and "
            "defeats each supply's protection. Pass signals between supplies through a relay whose coil is on "
            "one and whose contact is on the other."
        ),
        source="common practice",
        check=check_supply_cross,
        failing=Example("a 24 V contact fed from L1", "      - [L1, PB1.NO, 3, CR1.coil, \"0V\"]"),
        passing=Example("an interposing relay", "      - [\"+24\", Q0_1, 3, CR1.coil, \"0V\"]\n      - [L1, CR1.NO, 4, SOL1, X2]"),
    ),
    Rule(
        name="voltage-mismatch",
        severity=Severity.ERROR,
        summary="a load's rated voltage does not match its supply, or a transistor output is on AC",
        doc=(
            "A coil picks up and holds between 85 % and 110 % of its rated voltage: below that it may not "
            "close or may chatter, above it overheats. AC and DC coils are not interchangeable: a DC coil on "
            "AC hums and overheats, an AC coil on DC burns out. The same holds for solenoids, pilot lights, "
            "horns and PLC inputs with a rated voltage. A transistor output cannot switch AC. Loads without "
            "a rated voltage are not checked."
        ),
        source="IEC 60947-4-1 operating limits of electromagnets, 85 % to 110 % of rated control voltage (from memory)",
        check=check_voltage_mismatch,
        failing=Example("a 24 VDC coil on 120 VAC", "  CR1: {kind: relay, coil: 24 VDC}\n  ...\n      - [L1, PB1.NO, 3, CR1.coil, X2]"),
        passing=Example("a 120 VAC coil on 120 VAC", "  CR1: {kind: relay, coil: 120 VAC}\n  ...\n      - [L1, PB1.NO, 3, CR1.coil, X2]"),
    ),
    Rule(
        name="grounded-side-switching",
        severity=Severity.ERROR,
        summary="on a grounded supply, a contact, PLC output, fuse or breaker sits between a load and the common rail",
        doc=(
            "In a grounded control circuit every load has one side tied straight to the grounded common, "
            "and all switching is on the hot side. A contact on the grounded side leaves the load connected "
            "to hot while off: a ground fault on the wire between the load and that contact energizes the "
            "load (a motor starts by itself) or a stop contact there is bypassed. Overload relay contacts "
            "are allowed on the grounded side, as both standards permit."
        ),
        source="IEC 60204-1:2016 9.4.3.1.1 method a) and NFPA 79 9.4.3 (grounded control circuits; clause numbers from memory)",
        check=check_grounded_side_switching,
        failing=Example("stop button on the grounded side", "      - [L1, PB2.NO, 3, M1.coil, 4, PB1.NC, 5, OL1.NC, X2]"),
        passing=Example("stop on the hot side, overload on the grounded side", "      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]"),
    ),
    Rule(
        name="dangling-wire",
        severity=Severity.WARNING,
        summary="a wire, not a rail, has only one connection",
        doc=(
            "A wire number that appears at one element only goes nowhere: usually a mistyped wire number "
            "(3 for 8) that silently opens a branch, or a half-drawn path. An element with both ends on the "
            "same wire ([3, CR1.NO, 3]) is the same mistake seen from the other side: it joins a wire to "
            "itself, so open or closed it changes nothing; it is reported here too, at the element (a load "
            "so drawn is open-circuit instead)."
        ),
        source="common practice",
        check=check_dangling_wire,
        failing=Example("wire 8 ends at LS1", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [8, LS1.NO, 3]"),
        passing=Example("LS1 in parallel with PB1", "      - [L1, PB1.NO, 3, CR1.coil, X2]\n      - [L1, LS1.NO, 3]"),
    ),
    Rule(
        name="unused-device",
        severity=Severity.INFO,
        summary="a device declared in this file is used nowhere",
        doc=(
            "A device that no rung, supply, other device or expect step names is a leftover of an edit or a "
            "part of the drawing that was never finished. Devices from used shared files are not reported. "
            "A transformer whose fuses are drawn in the rungs counts as used even where no supply names it "
            "as `source`: its secondary fuse is what feeds them."
        ),
        source="common practice",
        check=check_unused_device,
        failing=Example("PB9 declared, never drawn", "devices:\n  PB9: {kind: pushbutton}"),
        passing=Example("every device drawn", "devices:\n  PB1: {kind: pushbutton}\nrungs:\n  - paths:\n      - [L1, PB1.NO, 3, CR1.coil, X2]"),
    ),
]


@hookimpl
def ctllint_rules() -> Iterable[Rule]:
    return RULES


def _nx():
    """networkx, imported when a graph is first needed: a run answered from the cache never loads it."""
    import networkx

    return networkx
