"""Small pieces every circuit module shares: a path written as text, the collector paused.

Kept apart from the analyses so that the simulator (which the analyses
offer to rules) can use them without importing the analyses back.
"""
from __future__ import annotations

import functools
import gc
from typing import Callable, Iterable, TypeVar

from ctllint.reading.model import Element

F = TypeVar("F", bound=Callable)


def _gc_paused(method: F) -> F:
    """Run ``method`` with Python's cyclic garbage collector paused.

    The analyses allocate many short-lived lists and dicts and build no
    reference cycles (reference counting frees them all). Left running, the
    collector rescans the whole live heap - schematic and host program
    included - ever more often as a circuit grows, which turns linear work
    into superlinear time on large panels. Nested calls leave it to the
    outermost.
    """

    @functools.wraps(method)
    def paused(*args, **kwargs):
        if not gc.isenabled():
            return method(*args, **kwargs)
        gc.disable()
        try:
            return method(*args, **kwargs)
        finally:
            gc.enable()

    return paused  # type: ignore[return-value]


def path_text(start: str, path: Iterable[Element]) -> str:
    """A path as wires and elements: ``L1-PB1.NC-2-M1.coil-X2`` from wire ``start``."""
    parts = [start]
    wire = start
    for el in path:
        wire = el.right if el.left == wire else el.left
        parts += [el.text, wire]
    return "-".join(parts)
