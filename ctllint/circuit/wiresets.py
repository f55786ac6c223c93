"""Disjoint sets of wires: which wires are joined through a chosen kind of element.

The simulator (wires joined by closed contacts), the circuit analyses and
rules (wires joined without a load or a relay contact) all ask this; one
union-find answers it in near-linear time. Part of the public API, so a
site's rule can use it too.
"""
from __future__ import annotations

from typing import Iterable


class WireSets:
    """Union-find over wire names; a wire never joined is its own set."""

    __slots__ = ("parent",)

    def __init__(self, joined: Iterable[tuple[str, str]] = ()):
        self.parent: dict[str, str] = {}
        for a, b in joined:
            self.join(a, b)

    def find(self, wire: str) -> str:
        parent = self.parent
        parent.setdefault(wire, wire)
        root = wire
        while parent[root] != root:
            root = parent[root]
        while parent[wire] != root:  # path compression
            parent[wire], wire = root, parent[wire]
        return root

    def join(self, a: str, b: str) -> None:
        ra, rb = self.find(a), self.find(b)
        if ra != rb:
            self.parent[rb] = ra

    def same(self, a: str, b: str) -> bool:
        return self.find(a) == self.find(b)
