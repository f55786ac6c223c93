"""Terminal markings of the elements in rungs.

An element may carry its terminal numbers in the file, written after the
reference with a space: ``CR1.NO 13-14``, ``M1.coil A1-A2``, ``FU1 1-2``.
The first number is the terminal on the element's left wire, the second on
its right wire. Where none are written, they are assigned as the trade
marks them (EN 50005 and IEC 60947-5-1, Annex M; IEC 60947-1 for coils;
the numbers below are from memory of those standards and of common
practice):

- a coil (``TAG.coil``) and a solenoid: ``A1`` on its left wire, ``A2`` on
  its right; a latching relay's set coil ``A1-A2``, its reset coil ``B1-B2``;
- contacts of a device, numbered in the order the file uses them: a two-part
  number, the sequence number of the contact on the device (1, 2, 3, ...)
  and a function number: NC ``1``-``2``, NO ``3``-``4`` (``13-14``,
  ``21-22``, ``33-34``, ...); a timer's timed contacts NC ``5``-``6`` and NO
  ``7``-``8`` (``15-16``, ``27-28``); a selector's position contacts are NO
  blocks closed in their position;
- an overload relay: its NC ``95-96``, its NO ``97-98`` (a second contact of
  the same type gets no number: write it);
- a changeover (double-throw) pole ``n``: common ``n1``, NC ``n2``, NO ``n4``;
  an NO and an NC use share a pole when they share a wire;
- fuses and breakers: ``1`` (line, left) and ``2`` (load, right);
- a safety relay: power ``A1-A2``, channels ``S11-S12`` and ``S21-S22``,
  feedback loop ``Y1-Y2``, its contacts as above;
- pilot lights: ``X1``-``X2``. Horns, PLC inputs and outputs get none
  (their terminals are the product's or the I/O address: write them).

Sequence numbers already taken by written terminals of the same device are
skipped, so written and assigned numbers never collide.
"""
from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Iterable

from ctllint.reading.kinds import CONTACT, CONDUCTOR, LOAD, KindRegistry, selector_parts
from ctllint.reading.model import ContactCount, Element, Schematic

# A terminal name: letters, digits, '+', '_', '/' (no dash: the dash separates the two).
TERMINAL = r"[A-Za-z0-9_+/]+"
TERMINALS_RE = re.compile(rf"^(?P<left>{TERMINAL})-(?P<right>{TERMINAL})$")
_SEQUENCE_RE = re.compile(r"^(\d+)(\d)$")


@dataclass(frozen=True, slots=True)
class Marks:
    """The terminal numbers of one element: ``left`` on its left wire, ``right`` on its right wire.

    ``written``: given in the file (else assigned by the trade's numbering).
    """

    left: str
    right: str
    written: bool = False

    @property
    def pair(self) -> str:
        return f"{self.left}-{self.right}"

    def __str__(self) -> str:
        return self.pair


def parse(text: str) -> tuple[str, str] | None:
    """``"13-14"`` as ``("13", "14")``; None when it is not two terminal names joined by a dash."""
    m = TERMINALS_RE.match(text)
    if not m or m.group("left") == m.group("right"):
        return None
    return m.group("left"), m.group("right")


def _function_of(el: Element, kind_name: str, positions: bool) -> str | None:
    """``"NO"``, ``"NC"``, ``"timed-NO"``, ``"timed-NC"`` for a contact use, None otherwise."""
    part = el.part or ""
    if positions:
        return "NO"  # a cam closes the block in its position
    if part in ("NO", "NC"):
        return f"timed-{part}" if kind_name == "timer" else part
    if part.endswith("-NO") or part.endswith("-NC"):  # e.g. instant-NO, instant-NC
        return part[-2:]
    return None


# A safety relay module's inputs as such modules commonly mark them (common practice, from memory).
_SAFETY_INPUTS = {"power": ("A1", "A2"), "ch1": ("S11", "S12"), "ch2": ("S21", "S22"), "feedback": ("Y1", "Y2")}

# A drive's or soft starter's command inputs: no standard marks them alike (our own marks, named for the input).
_DRIVE_INPUTS = {"run": ("RUN+", "RUN-"), "stop": ("STP+", "STP-")}

_FUNCTION_DIGITS = {"NC": ("1", "2"), "NO": ("3", "4"), "timed-NC": ("5", "6"), "timed-NO": ("7", "8")}


def assign(sch: Schematic, kinds: KindRegistry | None = None) -> dict[int, Marks]:
    """Terminal marks of every element that has some, by ``Element.index``.

    Written marks are kept as written; the rest are assigned (see the
    module's docstring). Deterministic: depends only on the file's order.
    """
    kinds = kinds or KindRegistry.builtin()
    marks: dict[int, Marks] = {}
    taken: dict[str, set[int]] = {}      # device tag -> sequence numbers used by written marks
    overload_used: dict[str, set[str]] = {}  # overload tag -> NO/NC whose 95-96 / 97-98 are taken
    for el in sch.elements:
        written = getattr(el, "terminals", None)
        if written:
            marks[el.index] = Marks(written[0], written[1], True)
            for t in written:
                m = _SEQUENCE_RE.match(t)
                if m:
                    taken.setdefault(el.tag, set()).add(int(m.group(1)))
            if {"95", "96"} & set(written):
                overload_used.setdefault(el.tag, set()).add("NC")
            if {"97", "98"} & set(written):
                overload_used.setdefault(el.tag, set()).add("NO")
    next_seq: dict[str, int] = {}
    poles: dict[str, list[dict[str, Element | None]]] = {}   # changeover poles in use per device
    for el in sch.elements:
        if el.index in marks:
            continue
        dev = sch.devices.get(el.tag)
        kind = kinds.get(dev.kind) if dev is not None else None
        if kind is None:
            continue
        if el.role == LOAD:
            if el.part == "coil" or el.part == "set" and "set" in kind.coil_parts or (el.part is None and kind.name == "solenoid"):
                marks[el.index] = Marks("A1", "A2")
            elif el.part == "reset" and "reset" in kind.coil_parts:
                marks[el.index] = Marks("B1", "B2")  # a second coil (a latching relay's reset), from memory
            elif kind.name in ("drive", "soft-starter") and el.part in _DRIVE_INPUTS:
                marks[el.index] = Marks(*_DRIVE_INPUTS[el.part])
            elif kind.name == "safety-relay" and el.part in _SAFETY_INPUTS:
                marks[el.index] = Marks(*_SAFETY_INPUTS[el.part])
            elif el.part is None and kind.name == "pilot-light":
                marks[el.index] = Marks("X1", "X2")
            continue
        if el.role == CONDUCTOR:
            marks[el.index] = Marks("1", "2")
            continue
        if el.role != CONTACT:
            continue
        positions = bool(kind.positions and el.part in selector_parts(dev))
        function = _function_of(el, kind.name, positions)
        if function is None:
            continue
        if kind.name == "overload":
            if function in overload_used.setdefault(el.tag, set()):
                continue
            overload_used[el.tag].add(function)
            marks[el.index] = Marks("95", "96") if function == "NC" else Marks("97", "98")
            continue
        count = dev.get("contacts")
        if (isinstance(count, ContactCount) and count.changeover and not count.no and not count.nc
                and function in ("NO", "NC")):
            marks[el.index] = _changeover(el, function, poles.setdefault(el.tag, []), taken.setdefault(el.tag, set()))
            continue
        seq = next_seq.get(el.tag, 1)
        used = taken.get(el.tag, ())
        while seq in used:
            seq += 1
        next_seq[el.tag] = seq + 1
        a, b = _FUNCTION_DIGITS[function]
        marks[el.index] = Marks(f"{seq}{a}", f"{seq}{b}")
    return marks


def _changeover(el: Element, function: str, poles: list[dict[str, Element | None]], taken: set[int]) -> Marks:
    """The marks of an NO or NC use of a double-throw pole: common n1, NC n2, NO n4.

    The use joins a pole whose other half is in use and shares a wire with
    it (that wire is the common); otherwise it opens a new pole.
    """
    other = "NC" if function == "NO" else "NO"
    number = 0
    common_left = True
    for n, pole in enumerate(poles, start=1):
        mate = pole.get(other)
        if pole.get(function) is None and mate is not None:
            common = pole["common"]
            if common in (el.left, el.right):
                number = n
                common_left = el.left == common
                pole[function] = el
                break
    if not number:
        n = len(poles) + 1
        while n in taken:
            poles.append({"NO": None, "NC": None, "common": None})  # a pole number written elsewhere
            n += 1
        poles.append({"NO": None, "NC": None, "common": el.left})
        poles[-1][function] = el
        number = n
        common_left = True
    end = f"{number}{'4' if function == 'NO' else '2'}"
    common_t = f"{number}1"
    return Marks(common_t, end) if common_left else Marks(end, common_t)


def conflicts(sch: Schematic, marks: dict[int, Marks]) -> Iterable[tuple[Element, str]]:
    """Written terminals of one device that land two different wires: (element, message) pairs.

    One terminal is one connection point: two wires on it are one
    conductor, which the file names twice.
    """
    seen: dict[tuple[str, str], tuple[str, Element]] = {}
    for el in sch.elements:
        m = marks.get(el.index)
        if m is None or not m.written:
            continue
        for term, wire in ((m.left, el.left), (m.right, el.right)):
            key = (el.tag, term)
            if key not in seen:
                seen[key] = (wire, el)
                continue
            first_wire, first = seen[key]
            if first_wire != wire:
                yield el, (f"terminal {term} of {el.tag} is written on wire {wire} here and on wire {first_wire} at "
                           f"{first.text} (line {first.line}): one terminal is one connection point; "
                           "correct the terminal numbers or give both the same wire")


def element_text(el: Element, marks: Marks | None = None) -> str:
    """The element as written with its terminals: ``CR1.NO 13-14``."""
    return el.text if marks is None else f"{el.text} {marks.pair}"
