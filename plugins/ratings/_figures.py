"""Figures the ratings rules share: what a load draws, and how a figure is compared and worded.

What a load draws at its supply (``load_figures``: VA and amperes at inrush and sealed) is asked
by contact-rating (a contact's duty) and by control-transformer (a source's load). A figure
compared with its limit (``exceeds``, with a slack for float routes) and amperes, tag lists and
element subjects in messages are written alike by most of the rules. Its own module so that
every rule module imports it and it imports none of them.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

from ctllint.reading.model import Device, Element, Quantity
from ctllint.reading.quantities import format_si

# Relative slack when comparing a duty with a limit, so that a duty equal to
# its limit (computed through a different float route) is not a finding.
_SLACK = 1e-9

# The kinds of device with a coil: their W figure is coil_power, their contacts are relay contacts.
COIL_KINDS = ("relay", "timer", "contactor", "starter", "alternating-relay", "latching-relay")


def exceeds(value: float, limit: float) -> bool:
    return value > limit and not math.isclose(value, limit, rel_tol=_SLACK, abs_tol=_SLACK)


def amps_text(value: float) -> str:
    return format_si(value, "A")


def join_names(items: list[str]) -> str:
    return ", ".join(items)


def element_subject(ctx, element: Element) -> str:
    rungs = ctx.schematic.rungs
    number = rungs[element.rung].number if 0 <= element.rung < len(rungs) else element.rung + 1
    return f"{element.text}@rung{number}"


@dataclass(frozen=True)
class LoadFigures:
    """What one load draws: apparent power (VA, W standing for VA where the
    load is resistive or a DC coil) and current at its supply's voltage."""

    tag: str
    inrush_va: float
    sealed_va: float
    inrush_a: float
    sealed_a: float


def load_power(device: Device, volts: float) -> tuple[float, float] | None:
    """(inrush VA, sealed VA) of a load device on a supply of ``volts``.

    VA figures where given; else W (``coil_power`` of a DC coil, ``power`` of
    a solenoid, pilot light or horn), which stands for both; else a PLC
    input's rated ``current`` times the voltage. One of inrush and sealed
    stands for both; None when the device gives no figure.
    """
    inrush, sealed = device.get("inrush"), device.get("sealed")
    if isinstance(inrush, Quantity) or isinstance(sealed, Quantity):
        inrush_va = inrush.value if isinstance(inrush, Quantity) else sealed.value
        sealed_va = sealed.value if isinstance(sealed, Quantity) else inrush.value
        return inrush_va, sealed_va
    watts = device.get("coil_power") if device.kind in COIL_KINDS else device.get("power")
    if isinstance(watts, Quantity):
        return watts.value, watts.value
    current = device.get("current")
    if isinstance(current, Quantity) and volts > 0:
        return current.value * volts, current.value * volts
    return None


def load_figures(device: Device, volts: float) -> LoadFigures | None:
    """Inrush and sealed VA and current of a load on a supply of ``volts``
    (current = VA / V, or W / V), or None when it cannot be told."""
    if not volts or volts <= 0:
        return None
    power = load_power(device, volts)
    if power is None:
        return None
    inrush_va, sealed_va = power
    return LoadFigures(device.tag, inrush_va, sealed_va, inrush_va / volts, sealed_va / volts)
