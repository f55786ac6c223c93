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

from typing import Iterable

from ctllint import hookimpl
from ctllint.api import Rule, rules_from

RULES = rules_from(__name__, (
    "unknown_device",
    "unknown_part",
    "contact_count",
    "coil_missing",
    "coil_duplicate",
    "open_circuit",
    "loads_in_series",
    "short_circuit",
    "supply_cross",
    "voltage_mismatch",
    "grounded_side_switching",
    "dangling_wire",
    "unused_device",
))


@hookimpl
def ctllint_rules() -> Iterable[Rule]:
    return RULES
