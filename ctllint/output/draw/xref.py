"""Coil cross-references: for each coil, the rungs where its contacts are used, and the margin
text right of the common rail that says so (``NO 2, 5  NC 7``).

Its own module because the cross-reference is a question about the whole schematic, asked by
``ctllint xref`` as well as by the drawing, apart from where the drawing puts it.
"""
from __future__ import annotations

from dataclasses import dataclass, field

from ctllint.output.draw.measures import SIZE_XREF, text_width, wrap
from ctllint.reading.kinds import contact_sense
from ctllint.reading.model import Schematic


@dataclass
class CoilUse:
    """Where a coil device's contacts are used, by rung number."""

    tag: str
    no: list[int]
    nc: list[int]
    other: dict[str, list[int]] = field(default_factory=dict)  # contacts of other names (an alternating relay's A, B)

    def text(self) -> str:
        parts = []
        if self.no:
            parts.append("NO " + ", ".join(map(str, self.no)))
        if self.nc:
            parts.append("NC " + ", ".join(map(str, self.nc)))
        for name, rungs in self.other.items():
            parts.append(f"{name} " + ", ".join(map(str, rungs)))
        return "  ".join(parts) if parts else "no contacts used"


def coil_uses(sch: Schematic) -> dict[str, CoilUse]:
    """For each device whose kind has a coil: rung numbers of its NO and NC contacts.

    A contact used twice in one rung is listed twice: each entry is one
    contact.
    """
    numbers = {r.index: r.number for r in sch.rungs}
    uses: dict[str, CoilUse] = {}
    for el in sch.elements:
        sense = contact_sense(el.part) if el.part not in ("fault-NO", "fault-NC") else None  # a drive's fault relay: listed apart
        if sense is not None:
            uses.setdefault(el.tag, CoilUse(el.tag, [], []))
            (uses[el.tag].no if sense == "NO" else uses[el.tag].nc).append(numbers[el.rung])
        elif el.role == "contact" and el.part is not None:
            uses.setdefault(el.tag, CoilUse(el.tag, [], [])).other.setdefault(el.part, []).append(numbers[el.rung])
    for use in uses.values():
        use.no.sort()
        use.nc.sort()
        use.other = {name: sorted(rungs) for name, rungs in sorted(use.other.items())}
    return uses


# The parts whose element stands for its device's coil in the margin, besides "coil".
_COIL_PARTS = (("set", "latching-relay"), ("power", "safety-relay"), ("run", "drive"), ("run", "soft-starter"))


def coils_on_row(placed, uses: dict[str, CoilUse]) -> list[CoilUse]:
    """The cross-references of the coils among ``placed`` (the elements of one row, in path order)."""
    out = []
    for p in placed:
        if p.element.part == "coil" or (p.element.part, p.kind) in _COIL_PARTS:
            out.append(uses.get(p.element.tag, CoilUse(p.element.tag, [], [])))
    return out


def xref_lines(uses: list[CoilUse], width: float) -> list[tuple[str, str]]:
    """The margin text for the coils of one row, as (coil tag, line) pairs.

    One line per coil when it fits (``NO 2, 5  NC 7``), else NO and NC on
    lines of their own, wrapped after a comma. Where a row holds more than
    one coil, each coil's lines start with its tag.
    """
    out: list[tuple[str, str]] = []
    for use in uses:
        prefix = f"{use.tag}: " if len(uses) > 1 else ""
        one = prefix + use.text()
        if text_width(one, SIZE_XREF) <= width:
            out.append((use.tag, one))
            continue
        pad = " " * len(prefix)
        first = True
        for name, numbers in (("NO", use.no), ("NC", use.nc), *use.other.items()):
            if not numbers:
                continue
            text = f"{name} " + ", ".join(map(str, numbers))
            for k, line in enumerate(wrap(text, SIZE_XREF, width - text_width(prefix + "   ", SIZE_XREF))):
                out.append((use.tag, (prefix if first else pad) + ("   " if k else "") + line))
                first = False
    return out
