"""What several wiring rules ask of the schematic itself, beside ``ctx.circuit``.

How a finding names an element's place (``rung 3``, ``CR1.NO@rung3``), what a
device's built-in kind says (its fields that name other devices), which wires
are rails, which wires an unknown element taints, and which rails a wire
reaches without crossing a load. Its own module because most rules of the
plugin use some of it and none of it belongs to one rule.
"""
from __future__ import annotations

from typing import Callable

import ctllint.reading.kinds as K
from ctllint.circuit.wiresets import WireSets
from ctllint.reading.model import Device, Element, Schematic


# The built-in kinds tell which fields name other devices and which parts a
# kind has, for messages. Roles themselves come from the loader, which knows
# plugin kinds too.
KINDS = K.KindRegistry.builtin()


def rung_text(sch: Schematic, el: Element) -> str:
    return f"rung {sch.rungs[el.rung].number}"


def subject_of(sch: Schematic, el: Element) -> str:
    return f"{el.text}@rung{sch.rungs[el.rung].number}"


def kind_of(dev: Device, kinds: K.KindRegistry | None = None) -> K.DeviceKind | None:
    return (kinds or KINDS).get(dev.kind)


def tag_fields(dev: Device, kinds: K.KindRegistry | None = None) -> list[tuple[str, list[str]]]:
    """(field, tags named) for each of the device's fields that name other devices."""
    kind = kind_of(dev, kinds)
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


def rail_wires(sch: Schematic) -> set[str]:
    return {w for s in sch.supplies.values() for w in (s.hot, s.common)}


def tainted_wires(sch: Schematic) -> set[str]:
    """Wires joined, through non-rail wires, to an element whose tag or part is unknown.

    A load there may look open or shorted only because of the unknown element,
    which ``unknown-device``/``unknown-part`` already report.
    """
    rails = rail_wires(sch)
    sets = WireSets((el.left, el.right) for el in sch.elements if el.left not in rails and el.right not in rails)
    roots = {sets.find(w) for el in sch.elements if not el.role for w in (el.left, el.right) if w not in rails}
    return {w for w in list(sets.parent) if sets.find(w) in roots}


def rail_reach(sch: Schematic) -> Callable[[str], list[str]]:
    """A function giving the rails a wire reaches through non-load elements, passing no rail.

    The parts of the non-load, known elements with the rails left out are
    found once (union-find), with the rails each part touches, so that no
    graph of the whole circuit is built and each question is answered at
    once. (A load is never crossed, so leaving out the load asked about
    changes nothing.)
    """
    rails = rail_wires(sch)
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
