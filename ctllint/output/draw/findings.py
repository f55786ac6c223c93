"""Findings matched to what they point at in the drawing: an element, a device's elements, or a
supply's rails, by file, line and column.

Its own module because the matching reads the schematic's source positions, not the drawing's
geometry: it decides what is marked, the layout decides where.
"""
from __future__ import annotations

import os
from typing import Iterable

from ctllint.reading.model import Diagnostic, Element, Location, Schematic


def _key(loc: Location) -> tuple[str, int, int]:
    return (os.path.normpath(loc.path), loc.line, loc.column)


def match_findings(sch: Schematic, diagnostics: Iterable[Diagnostic]) -> tuple[dict[int, list[Diagnostic]], dict[str, list[Diagnostic]], list[Diagnostic]]:
    """Match findings to elements (by index) and supplies (by name).

    A finding at an element's position marks that element; at a device's tag
    or one of its fields (or a scenario step's tag), every rung element of
    that device; at a supply, that supply's rails. The rest are returned as
    unplaced.
    """
    by_element: dict[int, list[Diagnostic]] = {}
    by_supply: dict[str, list[Diagnostic]] = {}
    unplaced: list[Diagnostic] = []
    elements_of: dict[str, list[Element]] = {}
    targets: dict[tuple[str, int, int], list[tuple[str, object]]] = {}
    for el in sch.elements:
        elements_of.setdefault(el.tag, []).append(el)
        targets.setdefault(_key(el.loc), []).append(("element", el))
    for dev in sch.devices.values():
        for loc in [dev.loc, *dev.field_locs.values()]:
            targets.setdefault(_key(loc), []).append(("device", dev.tag))
    for sup in sch.supplies.values():
        for loc in [sup.loc, *sup.field_locs.values()]:
            targets.setdefault(_key(loc), []).append(("supply", sup.name))
    for scen in sch.expect:
        for step in scen.steps:
            for tag, loc in step.target_locs.items():
                if tag:
                    targets.setdefault(_key(loc), []).append(("device", tag))
    for d in sorted(set(diagnostics)):
        hits = targets.get((os.path.normpath(d.path), d.line, d.column), [])
        marked: list[Element] = []
        supplies: list[str] = []
        for what, obj in hits:
            if what == "element":
                marked.append(obj)  # type: ignore[arg-type]
            elif what == "device":
                # once on the drawing: the device's coil (where a contactor's power poles or a
                # device's rating are at fault), else its first element, never every contact
                drawn = elements_of.get(obj, [])  # type: ignore[arg-type]
                coils = [e for e in drawn if e.role == "load"]
                marked.extend(coils[:1] or drawn[:1])
            else:
                supplies.append(obj)  # type: ignore[arg-type]
        if not marked and not supplies:
            unplaced.append(d)
            continue
        seen: set[int] = set()
        for el in marked:
            if el.index not in seen:
                seen.add(el.index)
                by_element.setdefault(el.index, []).append(d)
        for name in supplies:
            by_supply.setdefault(name, []).append(d)
    return by_element, by_supply, unplaced
