"""How the motor-control rules name what they find, and the loops of wiring they ask about.

A finding's subject (``M1.coil@rung3``), an energizing path written from the
hot rail (``L1-PB1.NC-2-M1.coil-X2``) or split at its load, a list of element
names; and which elements lie on a common loop of non-load wiring (one
biconnected block), which is what "one contact bypasses another" means on a
drawing (seal-in and oscillation ask it). Its own module because several rules
word their findings the same way.
"""
from __future__ import annotations

from typing import Iterable

from ctllint.api import CheckContext
from ctllint.circuit.analysis import biconnected_blocks
from ctllint.reading.kinds import LOAD
from ctllint.reading.model import Element


def subject_of(ctx: CheckContext, el: Element) -> str:
    rungs = ctx.schematic.rungs
    number = rungs[el.rung].number if 0 <= el.rung < len(rungs) else el.rung + 1
    return f"{el.text}@rung{number}"


def path_walk(path: list[Element], load: Element, ctx: CheckContext) -> list[str]:
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


def path_text(path: list[Element] | None, load: Element, ctx: CheckContext) -> str:
    return "-".join(path_walk(path or [], load, ctx))


def names_of(elements: Iterable[Element]) -> str:
    return ", ".join(e.text for e in elements)


def block_of(ctx: CheckContext) -> dict[int, int]:
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
