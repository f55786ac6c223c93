"""Motor control: the habits of three-wire relay logic, checked on the circuit graph.

These rules look at how stop, start, overload, interlock and emergency-stop
contacts sit around the coils they govern, the way a controls engineer reads
a ladder: stop buttons normally closed and in series, the overload contact in
series with its starter's coil, a seal-in around the start button, reversing
pairs interlocked, an emergency stop that latches and drops every contactor,
no contactor that restarts a motor by itself when power returns, and no coil
that switches itself off.

Every rule asks the shared circuit analyses (``ctx.circuit``) whether a coil
has an energizing path with some elements taken out; none enumerates paths,
so each check stays linear in the size of the circuit per question asked.

Choices where the catalogue leaves room:

- ``stop-normally-closed`` (and the NO problem of ``emergency-stop``) leave
  out an auxiliary NO contact that only signals "pressed": the device stops
  through an NC contact used in the rungs, and the NO serves nothing but
  pilot lights, horns and PLC inputs (an e-stop's status contact to the
  PLC). A stop device used only through NO contacts, or whose NO serves a
  coil or solenoid, is flagged as before.
- ``stop-in-series`` and ``interlock`` look at coils (``X.coil``), not at
  lights or solenoids. The message of ``stop-in-series`` names the part of
  the bypassing path on the stop's side of the coil.
- ``seal-in``: a NO contact of the coil's own device "bypasses" the start
  contact when the two lie on a common loop of non-load wiring (the same
  biconnected component once the loads are taken out) and the contact serves
  the coil. A NO contact of another coil the same start contact energizes
  counts too (the main contactor of a star-delta starter holds the star,
  delta and timer coils started with it). A timer's timed contacts never
  seal, its own coil included (an on-delay NO is still open when the button
  is released, an off-delay NO stays closed after stop and restarts); its
  ``instant-NO`` does. A NO contact around the start that is no seal (a
  timed contact, or a contact of a coil this button does not start) is
  reported with what it really does: a timed contact drops out or restarts,
  another starter's contact starts this coil whenever that one runs. The
  advice for a timer names its ``instant-NO``, never a timed contact. The
  stop and overload contacts that must stay in series are the ones in series
  with the coil while its own NO contacts are open (the circuit as the start
  button sees it); so a seal wired around the stop as well as the start
  fails, while two stop buttons wired in parallel are left to
  ``stop-in-series``.
- ``interlock`` treats the pair as symmetric: when M1F names M1R, both coils
  need the other's NC contact in series, each reported at its own coil.
- ``auto-restart``: a spring-return selector is a momentary device (only its
  rest position can be closed at power return); device kinds that a plugin
  adds, and elements of unknown devices, count as open.
- ``oscillation`` fires when a coil's own NC contact serves the coil (lies on
  at least one energizing path), not only when it is in series: whenever
  that path alone feeds the coil, it chatters. The exception is an own NO
  contact that also serves the coil and lies on a common loop of wiring with
  the NC (as in a changeover): it takes over as the NC opens. Timers are
  left out: a timer's own timed NC contact in its coil circuit is the usual
  recycling (pulse) timer, which switches once per preset rather than
  chattering. The simulator is also run from rest, and a circuit that does
  not settle there is reported at the first coil that keeps switching, when
  no own-NC finding already covers it.
- ``emergency-stop``: contactors and starters with a non-empty
  ``estop_exempt`` reason are left out. "its supply" is the supply of the loads its contacts
  serve, and any supply with a contactor or starter it governs through a
  relay (a 24 VDC safety relay switching 120 VAC starters makes the 120 VAC
  starters its own). A coil is governed when every energizing path passes a
  contact of the emergency stop or a NO contact of a relay, timer, contactor or starter
  whose coil is governed (a master control relay, or a chain of them). The
  momentary, NO and governing problems of one device are given in one
  finding at its tag. A drive's or soft starter's ``run`` input counts as
  its motor's coil (``estop_exempt`` on the drive as on a contactor); the
  drive is dropped when its run input is governed, or its ``stop`` input
  where drawn (it runs only while that is energized). Its run relay's NO
  contacts are not taken as governing what they serve: a drive's relay
  output may be set to signal something other than "running".
- ``stop-in-series`` and ``seal-in`` read a drive's or soft starter's
  ``run`` input (and, for ``stop-in-series``, its ``stop`` input) as a coil:
  the simulator runs a drive only while its run input is energized, so a
  momentary start straight to it needs a seal-in (the drive's own run relay
  NO can give one, as a coil's NO does); a drive set to latch a start pulse
  by itself is not modelled.
- ``switch-fan-out`` counts the power-inductive branches a contact makes:
  coils of contactors and starters (those that feed the same motor or
  heater are one branch, one starter assembly such as a wye-delta), solenoids
  and horns; relay and timer coils are not counted, being the interposing
  devices the rule asks for. Every NO contact (and selector position) makes,
  and so does an NC contact of a maintained or process switch; the NC
  contact of a momentary pushbutton (a stop) only breaks sealed current and
  is not counted. Branches are grouped by the `feeds` field as written: a
  wye-delta's contactors that do not name their motor count apart. "At
  once": the count is the largest set of branches that can be made
  together. Two loads are never made together when a third device's
  contacts choose between them (every path of one passes its NC, of the
  other its NO; or two positions of one selector: that device's state is
  given when the switch closes), and the two coils of an interlock pair
  count as one only where each has an NC contact of the other on every
  energizing path (a one-sided interlock does not count).
- A ``safety-relay`` module is governed by an emergency stop in its power
  or in either input channel (its NO safety outputs then count as governed
  contacts); for ``auto-restart`` its outputs can come on at power return
  when its feedback loop can (no momentary reset button in it), and a
  ``latching-relay``'s contacts are taken as possibly closed (it held its
  state through the outage).
- ``safety-relay-feedback``: the contactors and starters whose coils a safety
  relay's NO outputs serve (directly or further down the path) each need an
  NC contact on every energizing path of its ``feedback`` input.
"""
from __future__ import annotations

from typing import Iterable, Iterator

from ctllint import hookimpl
from ctllint.api import CheckContext, Example, Finding, Option, Rule
from ctllint.circuit.analysis import biconnected_blocks
import ctllint.reading.kinds as K
from ctllint.reading.kinds import BUILTIN_KINDS, LOAD
from ctllint.reading.model import Element, Severity

_KINDS = {k.name: k for k in BUILTIN_KINDS}
COIL_KINDS = ("relay", "timer", "contactor", "starter", "alternating-relay")
CONTACTOR_KINDS = ("contactor", "starter")
STOP_FUNCTIONS = ("stop", "emergency-stop")


# ---------------------------------------------------------------------------
# small helpers


def _device(ctx: CheckContext, tag: str):
    return ctx.schematic.devices.get(tag)


def _subject(ctx: CheckContext, el: Element) -> str:
    rungs = ctx.schematic.rungs
    number = rungs[el.rung].number if 0 <= el.rung < len(rungs) else el.rung + 1
    return f"{el.text}@rung{number}"


def _is_stop_device(dev) -> bool:
    return dev is not None and dev.kind == "pushbutton" and dev.get("function") in STOP_FUNCTIONS


def _is_momentary_pushbutton(dev) -> bool:
    return dev is not None and dev.kind == "pushbutton" and (dev.get("action") or "momentary") == "momentary"


def _is_mechanical(dev) -> bool:
    kind = _KINDS.get(dev.kind) if dev is not None else None
    return bool(kind and kind.mechanical)


def _coils(ctx: CheckContext, tag: str) -> list[Element]:
    return [e for e in ctx.circuit.elements_of(tag) if e.part == "coil" and e.role == LOAD]


def _contacts(ctx: CheckContext, tag: str, part: str | None = None) -> list[Element]:
    return [e for e in ctx.circuit.elements_of(tag) if e.role == "contact" and (part is None or e.part == part)]


def _safety_loads(ctx: CheckContext, *parts: str) -> list[Element]:
    """The named inputs (``power``, ``ch1``, ``ch2``, ``feedback``) of every safety relay, file order."""
    return [load for load in ctx.circuit.loads if load.part in parts and getattr(_device(ctx, load.tag), "kind", None) == "safety-relay"]


def _coil_loads(ctx: CheckContext) -> list[Element]:
    """Coil elements of relays, timers, contactors and starters, in file order."""
    out = []
    for load in ctx.circuit.loads:
        dev = _device(ctx, load.tag)
        if load.part == "coil" and dev is not None and dev.kind in COIL_KINDS:
            out.append(load)
    return out


def _walk(path: list[Element], load: Element, ctx: CheckContext) -> list[str]:
    """Wires and element names of ``path`` in order from the hot rail, alternating."""
    if not path:
        return []
    supply = ctx.circuit.supply_of(load)
    first = path[0]
    wire = supply.hot if supply is not None and supply.hot in (first.left, first.right) else first.left
    items = [wire]
    for el in path:  # the same walk as ctllint.circuit.analysis.path_text, kept as a list to split at the load
        wire = el.right if el.left == wire else el.left
        items += [el.text, wire]
    return items


def _path_text(path: list[Element] | None, load: Element, ctx: CheckContext) -> str:
    return "-".join(_walk(path or [], load, ctx))


def _wire_groups(ctx: CheckContext) -> dict[str, str]:
    """Wires joined through non-load elements: wire -> representative (union-find)."""
    parent: dict[str, str] = {}

    def find(w: str) -> str:
        parent.setdefault(w, w)
        while parent[w] != w:
            parent[w] = parent[parent[w]]
            w = parent[w]
        return w

    for el in ctx.schematic.elements:
        a, b = find(el.left), find(el.right)
        if el.role and el.role != LOAD and a != b:
            parent[a] = b
    return {w: find(w) for w in list(parent)}


def _side_text(path: list[Element], load: Element, near: Element, ctx: CheckContext, groups: dict[str, str]) -> str:
    """The part of ``path`` on the same side of ``load`` as element ``near``.

    Two sides of a coil are joined only through loads, so the wires of each
    side fall in different groups of non-load wiring; the side whose group
    holds ``near`` is the one that matters to the reader.
    """
    items = _walk(path, load, ctx)
    if load.text not in items:
        return "-".join(items)
    at = items.index(load.text)
    hot_side, common_side = items[:at], items[at + 1:]
    group = groups.get(near.left)
    if group is not None and any(groups.get(w) == group for w in hot_side[0::2]):
        return "-".join(hot_side)
    if group is not None and any(groups.get(w) == group for w in common_side[0::2]):
        return "-".join(common_side)
    return "-".join(items)


def _load_words(ctx: CheckContext, load: Element) -> str:
    """``coil M1`` for a coil, ``drive input VFD1.run`` for a drive's or soft starter's command input."""
    if load.part == "coil":
        return f"coil {load.tag}"
    return f"{_device(ctx, load.tag).kind} input {load.text}"


def _names(elements: Iterable[Element]) -> str:
    return ", ".join(e.text for e in elements)


# ---------------------------------------------------------------------------
# stop-normally-closed


SIGNAL_KINDS = ("pilot-light", "horn", "plc-input")


def _signal_only(ctx: CheckContext, el: Element) -> bool:
    """``el`` is an auxiliary NO of a stop device that only signals "pressed".

    The device stops through an NC contact used in the rungs, and this NO
    serves only pilot lights, horns and PLC inputs (an e-stop's auxiliary
    contact telling the PLC, say): it starts or holds nothing, so a broken
    wire on it cannot keep anything running.
    """
    if not any(e.part == "NC" for e in _contacts(ctx, el.tag)):
        return False
    loads = ctx.circuit.served_loads(el)
    return bool(loads) and all(getattr(_device(ctx, x.tag), "kind", None) in SIGNAL_KINDS for x in loads)


def check_stop_normally_closed(ctx: CheckContext) -> Iterator[Finding]:
    for el in ctx.schematic.elements:
        dev = _device(ctx, el.tag)
        if el.role != "contact" or el.part != "NO" or not _is_stop_device(dev):
            continue
        if _signal_only(ctx, el):
            continue
        what = "emergency stop" if dev.get("function") == "emergency-stop" else "stop button"
        yield Finding(
            el.loc,
            f"{what} {el.tag} is used through its NO contact {el.text}: a broken wire or a dirty contact "
            f"would keep it from stopping; wire its NC contact in series with the coils it stops",
            _subject(ctx, el),
        )


# ---------------------------------------------------------------------------
# stop-in-series


def _is_drive_input(ctx: CheckContext, el: Element, *parts: str) -> bool:
    """``el`` is one of the named command inputs of a drive or soft starter."""
    return el.part in parts and el.role == LOAD and getattr(_device(ctx, el.tag), "kind", None) in _DRIVE_KINDS


def check_stop_in_series(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    # A drive's run and stop inputs start and hold its motor as a coil does.
    coil_by_index = {c.index: c for c in _coil_loads(ctx) + _drive_inputs(ctx, "run", "stop")}
    groups: dict[str, str] | None = None
    for tag, dev in ctx.schematic.devices.items():
        if not _is_stop_device(dev):
            continue
        stop_elements = circuit.elements_of(tag)
        if not stop_elements:
            continue
        served: dict[int, Element] = {}  # coil index -> the first of the stop's contacts serving it
        for el in stop_elements:
            for load in circuit.served_loads(el):
                served.setdefault(load.index, el)
        for index in sorted(served):  # only the coils this stop serves, file order: linear overall
            coil = coil_by_index.get(index)
            if coil is None:
                continue
            stop = served[index]
            path = circuit.energizing_path(coil, without=stop_elements)
            if path is None:
                continue
            if groups is None:
                groups = _wire_groups(ctx)
            what = "emergency stop" if dev.get("function") == "emergency-stop" else "stop button"
            yield Finding(
                stop.loc,
                f"{_load_words(ctx, coil)} can be energized without passing {what} {tag} "
                f"(path {_side_text(path, coil, stop, ctx, groups)}): wire every path to the coil through "
                f"{tag}, with the seal-in and other start contacts after it",
                f"{stop.text}@{coil.text}",
            )


# ---------------------------------------------------------------------------
# overload-in-coil-path


def check_overload_in_coil_path(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    for tag, dev in ctx.schematic.devices.items():
        if dev.kind not in CONTACTOR_KINDS:
            continue
        ol = dev.get("overload")
        ol_dev = _device(ctx, ol) if ol else None
        if ol_dev is None or ol_dev.kind != "overload":
            continue
        ol_nc = _contacts(ctx, ol, "NC")
        for coil in _coils(ctx, tag):
            path = circuit.energizing_path(coil, without=ol_nc)
            if path is None:
                continue
            if ol_nc:
                why = f"without an NC contact of its overload relay {ol} (path {_path_text(path, coil, ctx)})"
            else:
                why = f"and no NC contact of its overload relay {ol} is used in any rung"
            yield Finding(
                coil.loc,
                f"{dev.kind} coil {coil.text} can be energized {why}: wire {ol}.NC in series with the coil, "
                f"so that an overload trip drops the {dev.kind}",
                _subject(ctx, coil),
            )


# ---------------------------------------------------------------------------
# seal-in


def _block_of(ctx: CheckContext) -> dict[int, int]:
    """Element index -> biconnected component of the non-load wiring.

    Two elements in one component lie on a common loop of wiring that passes
    no load, which is what "one contact bypasses the other" means on a
    drawing. Parallel elements between the same two wires are one loop.
    """
    edges = [(el.index, el.left, el.right) for el in ctx.schematic.elements if el.role and el.role != LOAD and el.left != el.right]
    out: dict[int, int] = {}
    for number, block in enumerate(biconnected_blocks(edges)):
        for index in block:
            out[index] = number
    return out


def _in_series_without(circuit, element: Element, load: Element, removed: list[Element]) -> bool:
    """``element`` is in series with ``load`` in the circuit with ``removed`` taken out."""
    return circuit.has_energizing_path(load, without=removed) and not circuit.has_energizing_path(load, without=removed + [element])


def check_seal_in(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    blocks: dict[int, int] | None = None
    # Copies of a contact or coil on the same two wires are the same thing
    # electrically: work each position out once (a pasted rung repeated many
    # times would otherwise multiply the work by the copies, to the fourth power).
    verdicts: dict[tuple, tuple[str, list[Element], list[Element] | None]] = {}
    keeps: dict[tuple, list[Element]] = {}
    for start in ctx.schematic.elements:
        dev = _device(ctx, start.tag)
        if start.role != "contact" or start.part != "NO" or not _is_momentary_pushbutton(dev) or dev.get("function") != "start":
            continue
        for coil in circuit.served_loads(start):
            coil_dev = _device(ctx, coil.tag)
            if coil.part != "coil" or coil_dev is None or coil_dev.kind not in COIL_KINDS:
                if not _is_drive_input(ctx, coil, "run"):  # a drive runs only while its run input is energized
                    continue
            if ctx.schematic.rungs[coil.rung].jog:
                continue
            if blocks is None:
                blocks = _block_of(ctx)
            key = (start.tag, start.left, start.right, coil.tag, coil.left, coil.right)
            if key not in verdicts:
                verdicts[key] = _seal_verdict(ctx, circuit, blocks, keeps, start, coil)
            verdict, bypassed, path = verdicts[key]
            if verdict == "missing" and coil.part == "run":
                yield Finding(
                    start.loc,
                    f"start button {start.tag} ({start.text}) energizes the run input {coil.text} of {coil_dev.kind} {coil.tag}, "
                    f"but no NO contact is wired around it: the {coil_dev.kind} stops as soon as the button is released "
                    f"(ctllint reads its inputs as levels; a drive set to latch a start pulse by itself is not modelled); "
                    f"add a seal-in in parallel with {start.text}: its run relay {coil.tag}.NO, or a control relay started by "
                    f"the button, sealed across it, whose NO gives the run command; or set jog: true on the rung if that is intended",
                    f"{start.text}@{coil.text}",
                )
                continue
            if verdict == "missing":
                yield Finding(
                    start.loc,
                    f"start button {start.tag} ({start.text}) energizes coil {coil.text}, but no NO contact of {coil.tag} "
                    f"is wired around it: {coil.tag} drops out as soon as the button is released; add a seal-in "
                    f"{_seal_advice(ctx, coil.tag)} in parallel with {start.text}, or set jog: true on the rung if that is intended",
                    f"{start.text}@{coil.text}",
                )
                continue
            if verdict == "wrong":
                yield Finding(start.loc, _wrong_seal_message(ctx, start, coil, bypassed), f"{start.text}@{coil.text}")
                continue
            if bypassed:
                yield Finding(
                    start.loc,
                    f"the seal-in of coil {coil.text} around start button {start.text} also bypasses {_names(bypassed)} "
                    f"(path {_path_text(path, coil, ctx)}): once sealed, {coil.tag} no longer drops when "
                    f"{' or '.join(c.tag for c in bypassed)} opens; wire the seal-in across {start.text} only",
                    f"{start.text}@{coil.text}",
                )


def _seal_advice(ctx: CheckContext, tag: str) -> str:
    """The contact to suggest as the seal-in of ``tag``'s coil: never a timer's timed contact."""
    if getattr(_device(ctx, tag), "kind", None) == "timer":
        return f"{tag}.instant-NO (an instantaneous contact; its timed contacts do not seal)"
    return f"{tag}.NO"


def _wrong_seal_message(ctx: CheckContext, start: Element, coil: Element, wrong: list[Element]) -> str:
    """What the contact wired around the start button really does, and what to wire instead."""
    m = wrong[0]
    dev = _device(ctx, m.tag)
    fix = f"wire {_seal_advice(ctx, coil.tag)} across {start.text} as the seal-in"
    head = f"the contact around start button {start.text} for coil {coil.text}, {_names(wrong)}, is no seal-in: "
    if dev.kind == "timer":
        if dev.get("delay") == "off":
            q = dev.get("preset")
            preset = f"{q.number:g} {q.unit}" if q is not None else "its preset"
            what = (f"{m.text} is a timed contact of off-delay timer {m.tag}: it stays closed for {preset} after stop "
                    f"drops {coil.tag}, so releasing stop within that time restarts {coil.tag}")
        else:
            what = (f"{m.text} is a timed contact of on-delay timer {m.tag}: it is still open when the button is "
                    f"released, so {coil.tag} drops out then")
        return head + what + "; " + fix
    runs = "runs" if dev.kind in CONTACTOR_KINDS else "is energized"
    return (head + f"{m.text} belongs to {m.tag}, which this button does not start: it starts {coil.tag} whenever "
            f"{m.tag} {runs}, and does not hold {coil.tag} when {m.tag} is off; " + fix
            + ", or set jog: true on the rung if the button only jogs")


# ---------------------------------------------------------------------------
# switch-fan-out


def _interlock_pairs(ctx: CheckContext) -> list[tuple[str, str]]:
    """Declared interlock pairs (each once, in file order), both devices known and of contactor kind."""
    seen = set()
    pairs = []
    for tag, dev in ctx.schematic.devices.items():
        other = dev.get("interlock") if dev.kind in CONTACTOR_KINDS else None
        other_dev = _device(ctx, other) if other else None
        if other_dev is None or other_dev.kind not in CONTACTOR_KINDS or other == tag:
            continue
        key = frozenset((tag, other))
        if key not in seen:
            seen.add(key)
            pairs.append((tag, other))
    return pairs


def _interlocked(ctx: CheckContext, coil: Element, other: str) -> bool:
    """Every energizing path of ``coil`` passes an NC contact of ``other`` (and one exists)."""
    circuit = ctx.circuit
    nc = _contacts(ctx, other, "NC")
    return bool(nc) and circuit.has_energizing_path(coil) and not circuit.has_energizing_path(coil, without=nc)


INTERPOSING_KINDS = ("relay", "timer")  # their coils are what switch-fan-out asks for, not counted


def _makes(dev, el: Element) -> bool:
    """Whether closing contact ``el`` of mechanical switch ``dev`` can energize the loads it serves.

    Every NO contact (and selector position) makes; an NC contact of a
    maintained or process switch makes when the switch returns; the NC
    contact of a momentary pushbutton (a stop) only breaks the sealed
    current of what it stops, which contact-rating checks.
    """
    return not (el.part == "NC" and _is_momentary_pushbutton(dev))


def _power_branches(ctx: CheckContext, loads: list[Element]) -> list[list[Element]]:
    """The power-inductive branches among ``loads``, each a list of its loads, in file order.

    Counted: coils of contactors and starters, solenoids, horns (any
    inductive load but a relay's or timer's coil). Contactors and starters
    that feed the same motor or heater are one branch (one starter assembly,
    such as a wye-delta or a two-speed starter).
    """
    branches: dict[str, list[Element]] = {}
    for load in loads:
        dev = _device(ctx, load.tag)
        if not load.inductive or (dev is not None and load.part == "coil" and dev.kind in INTERPOSING_KINDS):
            continue
        key = load.tag
        if dev is not None and dev.kind in CONTACTOR_KINDS and dev.get("feeds"):
            key = "feeds:" + dev.get("feeds")
        branches.setdefault(key, []).append(load)
    return list(branches.values())


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
    if getattr(_device(ctx, tag), "kind", None) == "selector":
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


def check_switch_fan_out(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    limit = ctx.options.get("max_inductive", 1)
    pairs: set[frozenset] | None = None
    cache: dict = {}
    for el in ctx.schematic.elements:
        dev = _device(ctx, el.tag)
        if el.role != "contact" or not _is_mechanical(dev) or not _makes(dev, el):
            continue
        loads = [x for x in circuit.served_loads(el) if x.inductive]
        if len(loads) <= limit:
            continue
        branches = _power_branches(ctx, loads)
        if len(branches) <= limit:
            continue
        if pairs is None:
            pairs = {frozenset(p) for p in _interlock_pairs(ctx)}
        branches = _made_at_once(ctx, branches, pairs, cache)
        if len(branches) <= limit:
            continue
        supply = circuit.supply_of(branches[0][0])
        on = f" on supply {supply.name}" if supply is not None else ""
        shown = "; ".join(_names(b) for b in branches)
        yield Finding(
            el.loc,
            f"contact {el.text} makes {len(branches)} power-inductive branches at once ({shown}){on}; "
            f"a mechanical switch should make at most {limit}: it makes their summed inrush current, so drive "
            f"one interposing relay instead",
            _subject(ctx, el),
        )


def _sealing_contacts(ctx: CheckContext, tag: str) -> list[Element]:
    """The contacts of ``tag`` that can seal: NO contacts, a timer's instantaneous NO only.

    A timer's NO/NC are timed: an on-delay NO is still open when the button
    is released, and an off-delay NO stays closed after stop is pressed and
    restarts the coil. Its ``instant-NO`` follows the coil like a relay's.
    """
    if getattr(_device(ctx, tag), "kind", None) == "timer":
        return _contacts(ctx, tag, "instant-NO")
    return _contacts(ctx, tag, "NO")


def _block_members(ctx: CheckContext, blocks: dict[int, int], keeps: dict) -> dict[int, list[Element]]:
    """Block number -> its elements, built once per schematic (kept in ``keeps`` under None)."""
    if None not in keeps:
        members: dict[int, list[Element]] = {}
        for el in ctx.schematic.elements:
            if blocks.get(el.index) is not None:
                members.setdefault(blocks[el.index], []).append(el)
        keeps[None] = members
    return keeps[None]


def check_safety_relay_feedback(ctx: CheckContext) -> Iterator[Finding]:
    """Every contactor a safety relay's NO outputs serve has an NC contact in series with its feedback input."""
    circuit = ctx.circuit
    for tag, dev in ctx.schematic.devices.items():
        if dev.kind != "safety-relay":
            continue
        switched: list[Element] = []
        for out in _contacts(ctx, tag, "NO"):
            for load in circuit.served_loads(out):
                load_dev = _device(ctx, load.tag)
                if load.part == "coil" and load_dev is not None and load_dev.kind in CONTACTOR_KINDS and load not in switched:
                    switched.append(load)
        if not switched:
            continue
        feedback = [load for load in circuit.elements_of(tag) if load.part == "feedback" and load.role == LOAD]
        if not feedback:
            yield Finding(dev.loc, f"safety relay {tag} switches {', '.join(c.tag for c in switched)}, but its feedback loop ({tag}.feedback) is drawn "
                                   "nowhere: wire the NC mirror contact of each in series in it, so a welded contactor blocks the restart", tag)
            continue
        loop = feedback[0]
        missing = [coil for coil in switched
                   if not any(circuit.in_series(nc, loop) for nc in _contacts(ctx, coil.tag, "NC"))]
        if missing:
            yield Finding(
                loop.loc,
                f"the feedback loop of safety relay {tag} lacks an NC mirror contact of {', '.join(c.tag for c in missing)} in series: "
                f"{'it is' if len(missing) == 1 else 'they are'} switched by its safety outputs, and a welded contactor "
                "would not block the restart; wire an NC auxiliary contact of each in series in the loop",
                _subject(ctx, loop),
            )


def _seal_verdict(ctx, circuit, blocks, keeps, start: Element, coil: Element):
    """("missing" | "wrong" | "bypass" | "ok", the wrong seals or the contacts the seal bypasses, a path through the bypass)."""
    # The seal is a NO contact of the coil's own device or of another coil the
    # same start button energizes: in a star-delta starter or a starter with
    # its timer, the main contactor's seal-in holds every coil started with it
    # (a timer's instantaneous NO too, never its timed one).
    started = [load.tag for load in circuit.served_loads(start) if load.part == "coil" and load.tag != coil.tag]
    candidates = [m for tag in dict.fromkeys([coil.tag, *started]) for m in _sealing_contacts(ctx, tag)]

    def around_start(m: Element) -> bool:
        return blocks.get(m.index) is not None and blocks.get(m.index) == blocks.get(start.index) and circuit.serves(m, coil)

    seals = [m for m in candidates if around_start(m)]
    if not seals:
        # A NO contact of a coil around the start that is no seal: a timer's
        # timed contact, or a contact of a device this button does not start.
        wrong = [
            m for m in _block_members(ctx, blocks, keeps).get(blocks.get(start.index), [])
            if m.role == "contact" and m.part == "NO" and getattr(_device(ctx, m.tag), "kind", None) in COIL_KINDS
            and m.tag not in started and around_start(m)
        ]
        wrong += [
            m for tag in dict.fromkeys([coil.tag, *started]) if getattr(_device(ctx, tag), "kind", None) == "timer"
            for m in _contacts(ctx, tag, "NO") if around_start(m) and m not in wrong
        ]
        return ("wrong", wrong, None) if wrong else ("missing", [], None)
    own_no = candidates
    coil_key = (coil.tag, coil.left, coil.right, start.tag, start.left, start.right)
    if coil_key not in keeps:
        # Stop and overload contacts in series with the coil as the start button sees it (seal open).
        keep = []
        for el in circuit.serving(coil):
            el_dev = _device(ctx, el.tag)
            if el.role != "contact" or el_dev is None:
                continue
            if (_is_stop_device(el_dev) or el_dev.kind == "overload") and _in_series_without(circuit, el, coil, own_no):
                keep.append(el)
        keeps[coil_key] = keep
    # A stop or overload stays in series when the seal path passes another
    # contact of the same device (a stop button with a second NC block in the
    # seal branch still drops the coil), as stop-in-series judges by device.
    bypassed = []
    for c in keeps[coil_key]:
        if c.tag not in {b.tag for b in bypassed} and circuit.has_energizing_path(coil, without=[start, *circuit.elements_of(c.tag)]):
            bypassed.append(c)
    if not bypassed:
        return "ok", [], None
    return "bypass", bypassed, circuit.energizing_path(coil, without=[start, *circuit.elements_of(bypassed[0].tag)])

# ---------------------------------------------------------------------------
# interlock


def check_interlock(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    for a, b in _interlock_pairs(ctx):
        for this, other in ((a, b), (b, a)):
            nc = _contacts(ctx, other, "NC")
            for coil in _coils(ctx, this):
                path = circuit.energizing_path(coil, without=nc)
                if path is None:
                    continue
                this_dev = _device(ctx, this)
                declared = f"{this} has interlock: {other}" if this_dev.get("interlock") == other else f"{other} has interlock: {this}"
                yield Finding(
                    coil.loc,
                    f"coil {coil.text} has no NC contact of {other} in series ({declared}; path "
                    f"{_path_text(path, coil, ctx)}): both can be on together; wire {other}.NC in series with {coil.text}",
                    _subject(ctx, coil),
                )


# ---------------------------------------------------------------------------
# emergency-stop


def _governed(ctx: CheckContext, tag: str) -> set[int]:
    """Coils governed by emergency stop ``tag``: its contacts, or NO contacts of relays it governs, in series.

    A least fixpoint: a coil is governed when every energizing path passes a
    contact of the stop or a NO contact of a device whose coils are all
    governed (a master control relay, possibly in a chain).
    """
    circuit = ctx.circuit
    cut = list(circuit.elements_of(tag))
    coils = _coil_loads(ctx)
    # A safety relay drops its outputs when its power or either channel drops: it is governed
    # when one of those is (the stop in one channel of a dual-channel circuit is enough here;
    # both channels are the safety relay's own business).
    inputs = _safety_loads(ctx, "power", "ch1", "ch2")
    # A drive stops when its run input drops, or its stop input where drawn. Its run relay is not
    # taken as governing what it serves (it may be set to signal something other than "running").
    drives = _drive_inputs(ctx, "run", "stop")
    governed: set[int] = set()
    done_devices: set[str] = set()
    changed = True
    while changed:
        changed = False
        for coil in coils + inputs + drives:
            if coil.index in governed or not circuit.has_energizing_path(coil):
                continue
            if not circuit.has_energizing_path(coil, without=cut):
                governed.add(coil.index)
                changed = True
        for coil in coils:
            if coil.tag in done_devices:
                continue
            if all(c.index in governed for c in _coils(ctx, coil.tag)):
                done_devices.add(coil.tag)
                cut.extend(_contacts(ctx, coil.tag, "NO"))
                changed = True
        for load in inputs:
            if load.tag not in done_devices and load.index in governed:
                done_devices.add(load.tag)
                cut.extend(_contacts(ctx, load.tag, "NO"))
                changed = True
    return governed


def _drive_inputs(ctx: CheckContext, *parts: str) -> list[Element]:
    """The named command inputs (``run``, ``stop``) of every drive and soft starter, file order."""
    return [load for load in ctx.circuit.loads if load.part in parts and getattr(_device(ctx, load.tag), "kind", None) in _DRIVE_KINDS]


def check_emergency_stop(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    for tag, dev in ctx.schematic.devices.items():
        if dev.kind != "pushbutton" or dev.get("function") != "emergency-stop":
            continue
        problems = []
        if (dev.get("action") or "momentary") != "maintained":
            problems.append("it is momentary, not maintained (latching): releasing it must not restart anything, so use a latching device (action: maintained)")
        elements = circuit.elements_of(tag)
        no = [e for e in elements if e.part == "NO" and not _signal_only(ctx, e)]
        if no:
            problems.append(f"it is used through its NO contact {_names(no)}: an emergency stop must open its circuit, so use NC contacts")
        supplies = []
        for el in elements:
            if el.part == "NO" and _signal_only(ctx, el):
                continue  # an auxiliary "pressed" signal, perhaps to a PLC on another supply
            for load in circuit.served_loads(el):
                supply = circuit.supply_of(load)
                if supply is not None and supply.name not in supplies:
                    supplies.append(supply.name)
        if supplies:
            governed = _governed(ctx, tag)
            # A supply whose contactors it drops through a relay (a 24 VDC safety
            # relay switching 120 VAC starters) is its supply too.
            # A drive's or soft starter's run input starts its motor as a starter's coil does: it is
            # one of the "coils" to drop, and dropped when its run input or its stop input is.
            drive_inputs = _drive_inputs(ctx, "run", "stop")
            stopped_drives = {load.tag for load in drive_inputs if load.index in governed}
            for coil in _coil_loads(ctx) + drive_inputs:
                supply = circuit.supply_of(coil) if coil.index in governed else None
                if supply is not None and supply.name not in supplies and _device(ctx, coil.tag).kind in (*CONTACTOR_KINDS, *_DRIVE_KINDS):
                    supplies.append(supply.name)
            missed: dict[str, list[Element]] = {}  # supply name -> coils it does not drop there
            for coil in _coil_loads(ctx) + [load for load in drive_inputs if load.part == "run"]:
                coil_dev = _device(ctx, coil.tag)
                supply = circuit.supply_of(coil)
                if coil_dev.kind not in (*CONTACTOR_KINDS, *_DRIVE_KINDS) or supply is None or supply.name not in supplies:
                    continue
                if coil.index in governed or coil.tag in stopped_drives or not circuit.has_energizing_path(coil):
                    continue
                reason = coil_dev.get("estop_exempt")
                if isinstance(reason, str) and reason.strip():
                    continue  # left running on purpose, for the reason given (an empty one is a format error)
                missed.setdefault(supply.name, []).append(coil)
            if missed:
                # Each coil with its own supply: never a supply where nothing is missed.
                where = "; ".join(f"{_names(coils)} on supply {name}" for name, coils in missed.items())
                drives_missed = [c for coils in missed.values() for c in coils if c.part == "run"]
                runs = keeps = ""
                if drives_missed:
                    runs = " and drive run input"
                    keeps = "".join(
                        f"; {_device(ctx, c.tag).kind} {c.tag} keeps "
                        + (f"motor {_device(ctx, c.tag).get('feeds')}" if _device(ctx, c.tag).get("feeds") else "its motor") + " running"
                        for c in drives_missed)
                problems.append(
                    f"it does not govern {where} (each can be energized with "
                    f"{tag} pressed{keeps}): put it in series with every "
                    f"contactor and starter coil{runs}, directly or through a master control relay it drops, "
                    f"or give a device that must stay on its reason in estop_exempt"
                )
        if problems:
            yield Finding(dev.loc, f"emergency stop {tag}: " + "; ".join(problems), tag)


# ---------------------------------------------------------------------------
# auto-restart


def _closable_at_power_return(ctx: CheckContext, el: Element) -> bool | None:
    """Whether ``el`` can be closed when power returns; None for a coil's NO contact (decided by the fixpoint)."""
    dev = _device(ctx, el.tag)
    if dev is None or el.role in ("", LOAD, "output"):
        return False  # unknown, a load (never a conductor here), or a PLC output (the program owns restart)
    if el.role == "conductor":
        return True
    if dev.kind == "latching-relay":
        return True  # it holds through the outage whatever state it was in: either contact may be closed
    if dev.kind == "safety-relay":
        return None if el.part == "NO" else True  # its outputs come on when its feedback loop can (the fixpoint)
    if dev.kind in COIL_KINDS:
        return True if el.part == "NC" else None
    if dev.kind in _DRIVE_KINDS:  # its run relay follows its run input (the fixpoint); no fault at power return
        return {"NO": None, "NC": True, "fault-NO": False, "fault-NC": True}.get(el.part or "", False)
    if dev.kind == "motor-breaker":  # closed, not tripped, at power return
        return {"NO": True, "NC": False, "trip-NO": False, "trip-NC": True}.get(el.part or "", False)
    if dev.kind == "overload":
        return el.part == "NC"
    if dev.kind == "pushbutton":
        return (dev.get("action") or "momentary") == "maintained" or el.part == "NC"
    if dev.kind == "selector":
        if (dev.get("action") or "maintained") == "spring-return":
            positions = dev.get("positions") or []
            return bool(positions) and str(positions[0]) in K.selector_parts(dev).get(el.part, ())
        return True
    return _is_mechanical(dev)


_DRIVE_KINDS = ("drive", "soft-starter")


def check_auto_restart(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    blocked: list[Element] = []
    coil_no: dict[str, list[Element]] = {}
    for el in ctx.schematic.elements:
        if el.role == LOAD:
            continue
        closable = _closable_at_power_return(ctx, el)
        if closable is None:
            coil_no.setdefault(el.tag, []).append(el)
        elif not closable:
            blocked.append(el)
    # A drive or soft starter runs its motor while its run input is energized: a motor starter too.
    drives = [load for load in ctx.circuit.loads if load.part == "run" and getattr(_device(ctx, load.tag), "kind", None) in _DRIVE_KINDS]
    coils = _coil_loads(ctx) + drives
    # A safety relay restarts by itself when its feedback loop closes with no reset button pressed.
    starters = coils + _safety_loads(ctx, "feedback")
    on: set[int] = set()
    changed = True
    while changed:
        changed = False
        still_blocked = [e for nos in coil_no.values() for e in nos]
        cut = circuit.cut(blocked + still_blocked)
        for coil in starters:
            if coil.index not in on and circuit.has_energizing_path(coil, without=cut):
                on.add(coil.index)
                changed = True
        for coil in starters:
            if coil.index in on:
                coil_no.pop(coil.tag, None)
    cut = circuit.cut(blocked + [e for nos in coil_no.values() for e in nos])
    for coil in coils:
        dev = _device(ctx, coil.tag)
        if coil.index not in on or (dev.kind not in CONTACTOR_KINDS and dev.kind not in _DRIVE_KINDS):
            continue
        fed = dev.get("feeds")
        fed_dev = _device(ctx, fed) if fed else None
        if fed_dev is None or fed_dev.kind != "motor":
            continue
        if ctx.schematic.rungs[coil.rung].restart == "automatic":
            continue
        path = circuit.energizing_path(coil, without=cut)
        yield Finding(
            coil.loc,
            f"{dev.kind} {coil.text if dev.kind in _DRIVE_KINDS else coil.tag} (motor {fed}) can "
            f"{'run' if dev.kind in _DRIVE_KINDS else 'energize'} when power returns with no button pressed "
            f"(path {_path_text(path, coil, ctx)}): use three-wire control (momentary start with seal-in) "
            f"so the motor stays off until started, or set restart: automatic on the rung if that is intended",
            _subject(ctx, coil),
        )


# ---------------------------------------------------------------------------
# oscillation


def check_oscillation(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    reported: set[str] = set()
    blocks: dict[int, int] | None = None
    for coil in _coil_loads(ctx):
        dev = _device(ctx, coil.tag)
        if dev.kind == "timer":
            continue
        own_nc = [e for e in _contacts(ctx, coil.tag, "NC") if circuit.serves(e, coil)]
        if not own_nc:
            continue
        if blocks is None:
            blocks = _block_of(ctx)
        own_no = [m for m in _contacts(ctx, coil.tag, "NO") if circuit.serves(m, coil)]
        # An own NO contact on a common loop with the NC takes over as the NC opens (a changeover): no chatter.
        chattering = [c for c in own_nc if not any(blocks.get(m.index) is not None and blocks.get(m.index) == blocks.get(c.index) for m in own_no)]
        if not chattering:
            continue
        nc = chattering[0]
        reported.add(coil.tag)
        yield Finding(
            coil.loc,
            f"coil {coil.text} is fed through its own NC contact {nc.text}: as the coil pulls in the contact opens "
            f"and drops it again, so it chatters; take {nc.text} out of the coil's circuit",
            _subject(ctx, coil),
        )
    yield from _oscillation_at_rest(ctx, reported)


def _oscillation_at_rest(ctx: CheckContext, reported: set[str]) -> Iterator[Finding]:
    """Run the simulator from rest; a circuit that hunts there is reported at a coil involved."""
    result = ctx.circuit.simulator().reset()
    if result is None or not getattr(result, "oscillating", False):
        return
    involved = _hunting_coils(ctx, result.oscillating)
    if not involved or any(c.tag in reported for c in involved):
        return
    first = involved[0]
    yield Finding(
        first.loc,
        f"from rest the circuit does not settle: coils {_names(involved)} switch each other on and off in a loop; "
        f"break the loop (a seal-in, or an interlock that holds one state)",
        _subject(ctx, first),
    )


def _hunting_coils(ctx: CheckContext, tags) -> list[Element]:
    """The coil elements of the simulator's oscillating tags, file order (all coils if it names none)."""
    names = set(tags) if isinstance(tags, (list, tuple, set, frozenset)) else set()
    coils = _coil_loads(ctx)
    return [c for c in coils if c.tag in names] if names else coils


# ---------------------------------------------------------------------------

_STARTER = """\
devices:
  PB1: {kind: pushbutton, function: stop}
  PB2: {kind: pushbutton, function: start}
  M1: {kind: starter, coil: 120 VAC, overload: OL1, feeds: MTR1}
"""

RULES = [
    Rule(
        name="stop-normally-closed",
        severity=Severity.ERROR,
        summary="a stop or emergency-stop button used through an NO contact",
        doc=(
            "A stop button must stop the machine by opening the circuit, so that a broken wire, a loose "
            "terminal or a burnt contact stops it too. Wired through its NO contact, the same faults make "
            "the button do nothing when it is pressed. The rule flags every NO contact of a pushbutton whose "
            "function is stop or emergency-stop, except an auxiliary NO that only signals the button is pressed "
            "(it serves only pilot lights, horns or PLC inputs, and the button stops through an NC contact)."
        ),
        source="NFPA 79 9.2.5.3 / IEC 60204-1 9.4.1 (stop functions by de-energization); common practice",
        check=check_stop_normally_closed,
        failing=Example("stop button through its NO contact", _STARTER + "rungs:\n  - paths:\n      - [L1, PB1.NO, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n      - [2, M1.NO, 3]\n"),
        passing=Example("stop button through its NC contact", _STARTER + "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n      - [2, M1.NO, 3]\n"),
    ),
    Rule(
        name="stop-in-series",
        severity=Severity.ERROR,
        summary="a coil served by a stop button has a path that avoids every contact of it",
        doc=(
            "A stop button stops only the paths it is on. Where the seal-in, a second start station or a "
            "parallel branch reaches the coil without passing the stop, pressing stop leaves the motor "
            "running. For every coil a stop button's contact serves, the rule asks whether the coil can be "
            "energized with all of that button's contacts taken out, and names such a path. Several stop "
            "stations belong in series; a stop wired in parallel with another is bypassed by it. A drive's or "
            "soft starter's run and stop inputs are coils here: they start and hold its motor."
        ),
        source="common practice (stop buttons normally closed and in series); NFPA 79 9.2.5.3",
        check=check_stop_in_series,
        failing=Example("seal-in wired around the stop", _STARTER + "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n      - [L1, M1.NO, 3]\n"),
        passing=Example("seal-in around the start only", _STARTER + "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n      - [2, M1.NO, 3]\n"),
    ),
    Rule(
        name="overload-in-coil-path",
        severity=Severity.ERROR,
        summary="a starter's coil can be energized without its overload relay's NC contact",
        doc=(
            "An overload relay protects the motor only by dropping the starter's coil: its NC contact must "
            "be on every energizing path of the coil. The rule checks starters, and contactors that name an "
            "overload, for a path to the coil that avoids every NC contact of that overload relay (or for an "
            "overload whose NC contact is used nowhere)."
        ),
        source="NEC 430.32 / NFPA 79 7.3 (motor overload protection); common practice",
        check=check_overload_in_coil_path,
        failing=Example("overload contact missing", "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, X2]\n      - [2, M1.NO, 3]\n"),
        passing=Example("overload contact in series", "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n      - [2, M1.NO, 3]\n"),
    ),
    Rule(
        name="seal-in",
        severity=Severity.ERROR,
        summary="a momentary start button's coil has no seal-in of its own around the start contact",
        doc=(
            "Three-wire control: a momentary start button energizes the coil and a NO auxiliary contact of "
            "the same device, wired across the start contact, holds it in after the button is released. "
            "Without it the motor runs only while the button is held; with a seal-in that also bypasses a "
            "stop or overload contact, the motor can no longer be stopped by it. The rule looks at each "
            "coil a momentary start button's NO contact serves, unless the rung sets jog: true. Coils "
            "started together by the same button (the star, delta and timer coils of a star-delta "
            "starter, a starter and its run timer) may share one seal-in: a NO contact of any coil that "
            "button energizes counts, as long as it bypasses only the start contact.\n\n"
            "A timer's timed contact never seals, not even its own coil: an on-delay NO is still open when "
            "the button is released, so the coil drops out; an off-delay NO stays closed after stop and "
            "restarts the coil when stop is released. Only a timer's instantaneous contact (instant-NO) "
            "seals. A contact of another coil that this button does not start is no seal either: wired "
            "around the start button it starts this coil whenever that one runs. The message says which "
            "of these the wrong seal does, and the advice never suggests a timer's timed contact.\n\n"
            "A drive's or soft starter's run input is a coil here: ctllint reads its inputs as levels (it runs "
            "while its run input is energized), so a momentary start straight to it needs a seal-in, such as "
            "its run relay's NO across the start or an interposing relay. A drive set to latch a start pulse "
            "by itself is not modelled: draw the interposing relay, or suppress the finding with that reason."
        ),
        source="common practice (three-wire control, low-voltage protection; timed and instantaneous timer contacts); NFPA 79 7.5",
        check=check_seal_in,
        failing=Example("no seal-in", _STARTER + "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n"),
        passing=Example("seal-in across the start button", _STARTER + "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n      - [2, M1.NO, 3]\n"),
    ),
    Rule(
        name="switch-fan-out",
        severity=Severity.WARNING,
        summary="a mechanical switch contact makes more power-inductive branches than max_inductive",
        doc=(
            "A pushbutton, selector or process switch that closes onto several contactor coils or solenoids "
            "at once makes their summed inrush current, beyond what its small contacts are meant to carry, "
            "and wears or welds. Drive one interposing relay instead, so the switch carries one coil current.\n\n"
            "Counted are coils of contactors and starters, solenoids and horns; contactors and starters that "
            "feed the same motor or heater are one branch (one starter assembly, such as the line, star and "
            "delta contactors of a wye-delta starter). Relay and timer coils are not counted: they are the "
            "interposing devices. A contact makes when its closing can energize the loads: every NO contact "
            "and selector position, and the NC contact of a maintained or process switch (it makes when the "
            "switch returns). The NC contact of a momentary pushbutton, a stop, only breaks the sealed current "
            "of what it stops, which contact-rating checks, and is not counted.\n\n"
            "Only branches made at once count: where a third device's NC and NO contacts choose between two "
            "loads (a start-delay timer's NC to the warning horn and its NO to the starter), the switch makes "
            "one of them. The two coils of an interlock pair count as one where each has the other's NC "
            "contact in series, since they are then never on together."
        ),
        source="common practice (a switch making several inductive loads carries their summed inrush; relays interpose)",
        check=check_switch_fan_out,
        failing=Example("float switch drives two solenoids", "rungs:\n  - paths:\n      - [L1, FS1.NO, 2, SOL1, X2]\n      - [2, SOL2, X2]\n"),
        passing=Example("float switch drives one relay", "rungs:\n  - paths:\n      - [L1, FS1.NO, 2, CR1.coil, X2]\n      - [L1, CR1.NO, 3, SOL1, X2]\n      - [3, SOL2, X2]\n"),
        options={"max_inductive": Option(1, "how many power-inductive branches one mechanical switch contact may make", int, minimum=1)},
    ),
    Rule(
        name="interlock",
        severity=Severity.ERROR,
        summary="an interlocked contactor's coil lacks the other contactor's NC contact in series",
        doc=(
            "Two contactors that must never be on together, such as the forward and reverse contactors of "
            "a reversing starter, short the supply between phases if they are. Each coil needs an NC "
            "auxiliary contact of the other in series, so that neither can pull in while the other is on. "
            "A contactor that names another in `interlock` is checked, and so is the other side of the "
            "pair, each at its own coil."
        ),
        source="NFPA 79 9.3.4 (interlocks for reversing); common practice (electrical interlock of reversing starters)",
        check=check_interlock,
        failing=Example("reverse coil not interlocked", "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1R.NC, 4, M1F.coil, 5, OL1.NC, X2]\n      - [2, PB3.NO, 6, M1R.coil, 5]\n"),
        passing=Example("each coil through the other's NC", "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1R.NC, 4, M1F.coil, 5, OL1.NC, X2]\n      - [2, PB3.NO, 6, M1F.NC, 7, M1R.coil, 5]\n"),
    ),
    Rule(
        name="emergency-stop",
        severity=Severity.ERROR,
        summary="an emergency stop that does not latch, is not NC, or does not drop every contactor",
        doc=(
            "An emergency stop must latch when pressed (releasing it must not restart anything), must open "
            "its circuit through NC contacts (so a broken wire also stops), and must drop every contactor and "
            "starter on its control supply, either directly in series with each coil or through a master "
            "control relay whose coil it drops and whose NO contacts are in series with the others. Where it "
            "drops starters on another supply through a relay (a 24 VDC safety relay switching 120 VAC "
            "starters), that supply's contactors and starters must all be governed too. An auxiliary NO that "
            "only signals the button is pressed (to a PLC input or a light) is not an NO use.\n\n"
            "A contactor or starter whose device gives a reason in estop_exempt (a freeze-protection heater, "
            "panel cooling: no motion hazard, and the risk assessment keeps it on) is left out (an empty "
            "reason is a format error). The message names each coil that is not dropped with its own supply, "
            "never a supply on which the emergency stop drops everything it must.\n\n"
            "A drive's or soft starter's run input is its motor's start command and counts as its coil: the "
            "emergency stop must drop it directly, through a relay it drops, or by dropping the drive's stop "
            "input where one is drawn (the drive runs only while that is energized). Dropping the run command "
            "gives a stop by command (common practice for stop category 1); whether the drive's power or its "
            "safe torque off must also be removed is for the machine's risk assessment and stop category, "
            "which ctllint does not see. A drive may give estop_exempt as a contactor does."
        ),
        source="NFPA 79 9.2.5.4 / IEC 60204-1 10.7 (emergency stop devices), ISO 13850; drive run inputs: IEC 60204-1 9.2.2 stop categories, from memory, and common practice",
        check=check_emergency_stop,
        failing=Example("momentary emergency stop", "devices:\n  ES1: {kind: pushbutton, function: emergency-stop}\n"),
        passing=Example("latching emergency stop through an MCR", "devices:\n  ES1: {kind: pushbutton, function: emergency-stop, action: maintained}\nrungs:\n  - paths:\n      - [L1, ES1.NC, 2, MCR.coil, X2]\n      - [L1, MCR.NO, 3, PB1.NC, 4, PB2.NO, 5, M1.coil, 6, OL1.NC, X2]\n"),
    ),
    Rule(
        name="auto-restart",
        severity=Severity.WARNING,
        summary="a motor contactor can energize when power returns with no button pressed",
        doc=(
            "After a power failure a machine must not start by itself: two-wire control (a maintained "
            "switch, a float or pressure switch straight to the coil) restarts the motor when power returns. "
            "The rule finds, as a least fixpoint from every coil off, which coils can come on with no button "
            "pressed: through momentary buttons' NC contacts, maintained and process switches, NC contacts of "
            "any coil, NO contacts of coils that can come on, fuses and overload NC contacts. PLC outputs "
            "count as open. Where restarting is intended (a sump pump on its float), set restart: automatic "
            "on the rung."
        ),
        source="NFPA 79 7.5 / IEC 60204-1 7.5 (protection against unexpected restart)",
        check=check_auto_restart,
        failing=Example("maintained switch straight to the starter", "rungs:\n  - paths:\n      - [L1, SS1.run, 2, M1.coil, 3, OL1.NC, X2]\n"),
        passing=Example("intended two-wire control", "rungs:\n  - restart: automatic\n    paths:\n      - [L1, FS1.NO, 2, M1.coil, 3, OL1.NC, X2]\n"),
    ),
    Rule(
        name="safety-relay-feedback",
        severity=Severity.ERROR,
        summary="a contactor switched by a safety relay's outputs lacks an NC mirror contact in series in its feedback loop",
        doc=(
            "A safety relay can only refuse a restart over a welded contactor if it sees the contactor: the NC "
            "auxiliary (mirror) contact of every contactor or starter its safety outputs switch belongs in series "
            "in its feedback (reset) loop, so a contactor whose main contacts welded keeps the loop open and the "
            "outputs off (external device monitoring). A safety relay whose outputs switch contactors and whose "
            "feedback loop is not drawn is reported too."
        ),
        source="common practice (external device monitoring, as ISO 13849-1 categories 3 and 4 ask for)",
        check=check_safety_relay_feedback,
        failing=Example("K2's mirror contact missing", "rungs:\n  - paths:\n      - ['+24', K1.NC, 21, PB3.NO, 22, SR1.feedback, 0V]\n  - paths:\n      - [L1, SR1.NO, 5, K1.coil, X2]\n      - [5, K2.coil, X2]\n"),
        passing=Example("both mirror contacts in the loop", "rungs:\n  - paths:\n      - ['+24', K1.NC, 21, K2.NC, 22, PB3.NO, 23, SR1.feedback, 0V]\n  - paths:\n      - [L1, SR1.NO, 5, K1.coil, X2]\n      - [5, K2.coil, X2]\n"),
    ),
    Rule(
        name="oscillation",
        severity=Severity.ERROR,
        summary="a coil is fed through its own NC contact and chatters",
        doc=(
            "A coil whose energizing path passes its own NC contact switches itself off as soon as it pulls "
            "in, and on again when it drops: it chatters, burns its contacts and the loads it drives. "
            "Timers are left out, since a timer with its own timed NC contact is a recycling pulse timer. "
            "The circuit is also simulated from rest, and a loop of several relays that switch each other "
            "off is reported at a coil in the loop."
        ),
        source="common practice",
        check=check_oscillation,
        failing=Example("relay through its own NC", "rungs:\n  - paths:\n      - [L1, PB1.NO, 2, CR1.NC, 3, CR1.coil, X2]\n"),
        passing=Example("relay sealed through its own NO", "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, CR1.coil, X2]\n      - [2, CR1.NO, 3]\n"),
    ),
]


@hookimpl
def ctllint_rules():
    return RULES

