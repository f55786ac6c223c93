"""Whether a start button's coil is sealed around it, by what, and what else the seal bypasses.

``seal-in``'s question, worked out once per position of a start contact and a
coil: which NO contacts can seal (the coil's own, or those of another coil the
same button starts; a timer's instantaneous NO only), whether one lies on a
common loop of wiring with the start contact, which NO contacts of other coils
sit around the start but are no seal, and which stop and overload contacts the
seal bypasses. Its own module because the rule's module holds its wording and
this search is the longest part of the rule.
"""
from __future__ import annotations

from ctllint.api import CheckContext
from ctllint.reading.model import Element
from ctllint_plugins.motor_control._devices import COIL_KINDS, contacts_of, device_of, is_stop_device


def _in_series_without(circuit, element: Element, load: Element, removed: list[Element]) -> bool:
    """``element`` is in series with ``load`` in the circuit with ``removed`` taken out."""
    return circuit.has_energizing_path(load, without=removed) and not circuit.has_energizing_path(load, without=removed + [element])


def _sealing_contacts(ctx: CheckContext, tag: str) -> list[Element]:
    """The contacts of ``tag`` that can seal: NO contacts, a timer's instantaneous NO only.

    A timer's NO/NC are timed: an on-delay NO is still open when the button
    is released, and an off-delay NO stays closed after stop is pressed and
    restarts the coil. Its ``instant-NO`` follows the coil like a relay's.
    """
    if getattr(device_of(ctx, tag), "kind", None) == "timer":
        return contacts_of(ctx, tag, "instant-NO")
    return contacts_of(ctx, tag, "NO")


def _block_members(ctx: CheckContext, blocks: dict[int, int], keeps: dict) -> dict[int, list[Element]]:
    """Block number -> its elements, built once per schematic (kept in ``keeps`` under None)."""
    if None not in keeps:
        members: dict[int, list[Element]] = {}
        for el in ctx.schematic.elements:
            if blocks.get(el.index) is not None:
                members.setdefault(blocks[el.index], []).append(el)
        keeps[None] = members
    return keeps[None]


def seal_verdict(ctx, circuit, blocks, keeps, start: Element, coil: Element):
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
            if m.role == "contact" and m.part == "NO" and getattr(device_of(ctx, m.tag), "kind", None) in COIL_KINDS
            and m.tag not in started and around_start(m)
        ]
        wrong += [
            m for tag in dict.fromkeys([coil.tag, *started]) if getattr(device_of(ctx, tag), "kind", None) == "timer"
            for m in contacts_of(ctx, tag, "NO") if around_start(m) and m not in wrong
        ]
        return ("wrong", wrong, None) if wrong else ("missing", [], None)
    own_no = candidates
    coil_key = (coil.tag, coil.left, coil.right, start.tag, start.left, start.right)
    if coil_key not in keeps:
        # Stop and overload contacts in series with the coil as the start button sees it (seal open).
        keep = []
        for el in circuit.serving(coil):
            el_dev = device_of(ctx, el.tag)
            if el.role != "contact" or el_dev is None:
                continue
            if (is_stop_device(el_dev) or el_dev.kind == "overload") and _in_series_without(circuit, el, coil, own_no):
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
