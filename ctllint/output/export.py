"""Panel documents made from a schematic: wire list, bill of materials, terminal plan.

Every document is a CSV table (comma-separated, a header row, ``\\n`` line
ends, sorted so that the same file gives the same bytes and an edit gives a
small diff). ``ctllint export KIND FILE`` writes one of them.

Where things are. Each device is in the panel or in the field (outside
the panel: pushbutton stations, limit and process switches, valves,
motors, a motor's space heater). A device says so with ``location: panel | field``; without it,
``FIELD_KINDS`` decides. Every wire that reaches a field device passes a
terminal strip (``TB1`` unless told otherwise): one strip point per field
conductor (a field device's terminal on a wire, so two terminals of one
device on one wire get two points); points of the same wire are bridged on
the strip. A wire whose terminals are all on one field device stays in the
field (jumpered there), unless it is a supply's rail: a rail comes from the
panel (its transformer, fuse or power supply) even where the file draws
nothing of the panel on it.

Wire list (``wires``). One row per conductor a wirer installs: wire number,
from ``device:terminal``, to ``device:terminal``, and where it runs
(``panel``, ``bridge`` on the strip, ``field``). Wires come in the order a
panel wirer works through them: the supplies' hot rails first, then the
other wires by number (2 before 10), the supplies' common rails last.
Within a wire the panel terminals are joined one after the other in the
order the drawing shows them (rung by rung, left to right, as a daisy
chain), the last one to the wire's first strip point; then the strip
bridges; then each field conductor from its strip point to the field
device. Terminal numbers come from ``ctllint.reading.terminals`` (written or
assigned); an element without any (a horn, a PLC input) is named by its
device alone.

Bill of materials (``bom``). One row per group of devices of the same kind
and the same rating: every field written in the file that says what is
bought, and not those that say how it is wired (the tags a device names,
its ``location``); defaults left unwritten are left out. Sorted by kind,
then by that description.

Terminal plan (``terminals``). One row per strip point: strip, point,
wire, the field device and its terminal, the panel terminal the wire comes
from (or the point it is bridged from, or ``supply NAME`` for a rail with no
panel terminal drawn), and the device's kind. Points are
numbered along the strip from 1, grouped by field device in the order the
drawing first shows each device (each cable's conductors side by side),
and by wire within a device.
"""
from __future__ import annotations

import csv
import io
import re
from dataclasses import dataclass
from typing import Any, NamedTuple

from ctllint.reading.kinds import KindRegistry
from ctllint.reading.model import ContactCount, ContactRating, PowerRating, Quantity, Schematic
from ctllint.reading.terminals import assign

KINDS = ("wires", "bom", "terminals")
DEFAULT_STRIP = "TB1"

# Kinds that sit outside the panel unless a device says ``location: panel``.
FIELD_KINDS = frozenset({
    "pushbutton", "limit-switch", "pressure-switch", "temperature-switch", "float-switch", "flow-switch",
    "foot-switch", "solenoid", "motor", "heater", "space-heater",
})


def is_field(dev) -> bool:
    """Whether ``dev`` stands outside the panel (its ``location``, else its kind's default)."""
    where = dev.get("location")
    if where is not None:
        return where == "field"
    return dev.kind in FIELD_KINDS


def natural(name: str) -> tuple:
    """Sort key that puts wire 2 before wire 10 and keeps text in order."""
    return tuple((0, int(p), "") if p.isdigit() else (1, 0, p) for p in re.split(r"(\d+)", name) if p)


class End(NamedTuple):
    """One conductor end: a device's terminal (``terminal`` None when it has no number)."""

    device: str
    terminal: str | None

    def __str__(self) -> str:
        return self.device if self.terminal is None else f"{self.device}:{self.terminal}"


@dataclass(frozen=True)
class Conductor:
    wire: str
    start: End
    end: End
    where: str  # panel, bridge, field


@dataclass(frozen=True)
class StripPoint:
    strip: str
    point: int
    wire: str
    field: End
    kind: str
    source: str  # the panel terminal or strip point the wire arrives from, "supply NAME" for a rail with no panel terminal


@dataclass
class Documents:
    """The wire list and terminal plan of one schematic (worked out together)."""

    conductors: list[Conductor]
    points: list[StripPoint]


def _wire_order(sch: Schematic, wires: set[str]) -> list[str]:
    hots = [s.hot for s in sch.supplies.values() if s.hot in wires]
    commons = [s.common for s in sch.supplies.values() if s.common in wires]
    rest = sorted(wires - set(hots) - set(commons), key=natural)
    return hots + rest + commons


def _ends_by_wire(sch: Schematic, kinds: KindRegistry | None) -> dict[str, list[tuple[End, int]]]:
    """Each wire's device terminals in drawing order, each once: (end, index of the device's first use)."""
    marks = assign(sch, kinds)
    first_use: dict[str, int] = {}
    ends: dict[str, list[tuple[End, int]]] = {}
    seen: set[tuple[str, str, str]] = set()
    for el in sch.elements:
        first_use.setdefault(el.tag, el.index)
        m = marks.get(el.index)
        for side, wire in (("left", el.left), ("right", el.right)):
            terminal = None if m is None else (m.left if side == "left" else m.right)
            key = (wire, el.tag, terminal if terminal is not None else f"\0{el.index}{side}")
            if key in seen:
                continue
            seen.add(key)
            ends.setdefault(wire, []).append((End(el.tag, terminal), first_use[el.tag]))
    return ends


def documents(sch: Schematic, kinds: KindRegistry | None = None, strip: str = DEFAULT_STRIP) -> Documents:
    """The wire list's conductors and the terminal plan's points of ``sch``."""
    ends = _ends_by_wire(sch, kinds)
    order = _wire_order(sch, set(ends))
    devices = sch.devices
    in_field = {tag for tag, dev in devices.items() if is_field(dev)}

    def field(end: End) -> bool:
        return end.device in in_field

    # A supply's rails come from the panel (its transformer, fuse or power
    # supply) even where the file draws nothing of the panel on them.
    rails = {s.hot: name for name, s in sch.supplies.items()} | {s.common: name for name, s in sch.supplies.items()}

    # Strip points: one per field conductor (a field device's terminal on a
    # wire), grouped by field device in the order of its first use.
    wanted: dict[tuple[str, str, int], int] = {}  # (device, wire, its end's place on the wire) -> the device's first use
    for wire in order:
        wire_ends = ends[wire]
        field_devices = {e.device for e, _ in wire_ends if field(e)}
        if not field_devices or (wire not in rails and len(field_devices) == 1 and all(field(e) for e, _ in wire_ends)):
            continue  # all in the panel, or all on one field device (jumpered there): no strip
        for k, (e, first) in enumerate(wire_ends):
            if field(e):
                wanted[(e.device, wire, k)] = first
    rank = {w: k for k, w in enumerate(order)}
    point_of: dict[tuple[str, str, int], int] = {}
    points_of_wire: dict[str, list[int]] = {}
    for n, key in enumerate(sorted(wanted, key=lambda dwk: (wanted[dwk], dwk[0], rank[dwk[1]], dwk[2])), start=1):
        point_of[key] = n
        points_of_wire.setdefault(key[1], []).append(n)  # ascending: n grows

    conductors: list[Conductor] = []
    points: list[StripPoint] = []
    for wire in order:
        wire_ends = [e for e, _ in ends[wire]]
        on_strip = points_of_wire.get(wire, [])
        panel = [e for e in wire_ends if not field(e)]
        if not on_strip:
            for a, b in zip(wire_ends, wire_ends[1:]):
                conductors.append(Conductor(wire, a, b, "field" if field(a) and field(b) else "panel"))
            continue
        for a, b in zip(panel, panel[1:]):
            conductors.append(Conductor(wire, a, b, "panel"))
        first_point = End(strip, str(on_strip[0]))
        if panel:
            conductors.append(Conductor(wire, panel[-1], first_point, "panel"))
        for a, b in zip(on_strip, on_strip[1:]):
            conductors.append(Conductor(wire, End(strip, str(a)), End(strip, str(b)), "bridge"))
        sources = {on_strip[0]: str(panel[-1]) if panel else (f"supply {rails[wire]}" if wire in rails else "")}
        for a, b in zip(on_strip, on_strip[1:]):
            sources[b] = f"{strip}:{a}"
        for k, e in enumerate(wire_ends):
            if field(e):
                p = point_of[(e.device, wire, k)]
                conductors.append(Conductor(wire, End(strip, str(p)), e, "field"))
                points.append(StripPoint(strip, p, wire, e, devices[e.device].kind, sources[p]))
    points.sort(key=lambda sp: (sp.point, str(sp.field)))
    return Documents(conductors, points)


def _csv(header: list[str], rows: list[list[Any]]) -> str:
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow(header)
    writer.writerows(rows)
    return out.getvalue()


def wire_list(sch: Schematic, kinds: KindRegistry | None = None, strip: str = DEFAULT_STRIP) -> str:
    docs = documents(sch, kinds, strip)
    return _csv(["wire", "from", "to", "where"], [[c.wire, str(c.start), str(c.end), c.where] for c in docs.conductors])


def terminal_plan(sch: Schematic, kinds: KindRegistry | None = None, strip: str = DEFAULT_STRIP) -> str:
    docs = documents(sch, kinds, strip)
    return _csv(["strip", "point", "wire", "field device", "field terminal", "kind", "from"],
                [[p.strip, p.point, p.wire, p.field.device, p.field.terminal or "", p.kind, p.source] for p in docs.points])


def describe(value: Any) -> str:
    """A field's value as it names the part bought: quantities and ratings as written."""
    if isinstance(value, Quantity):
        return value.text
    if isinstance(value, ContactRating):
        return value.text or value.designation or ""
    if isinstance(value, ContactCount):
        bits = [f"{n} {w}" for n, w in ((value.no, "NO"), (value.nc, "NC")) if n]
        if value.changeover:
            bits.append(f"{value.changeover} changeover")
        return " + ".join(bits) or "none"
    if isinstance(value, PowerRating):
        if value.nema_size is not None:
            return f"NEMA size {value.nema_size}"
        return ", ".join(f"{c.category} {c.current:g} A {c.voltage:g} V" for c in value.categories)
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, float):
        return f"{value:g}"
    if isinstance(value, (list, tuple)):
        return "/".join(describe(v) for v in value)
    return str(value)


def bom_rows(sch: Schematic, kinds: KindRegistry | None = None) -> list[list[Any]]:
    """Rows of the bill of materials: kind, description, quantity, tags."""
    from ctllint.reading import kinds as K

    kinds = kinds or KindRegistry.builtin()
    groups: dict[tuple[str, str], list[str]] = {}
    for tag, dev in sch.devices.items():
        kind = kinds.get(dev.kind)
        skip = {"location"} | {n for n, spec in (kind.fields.items() if kind else ()) if spec.type in (K.TAG, K.TAGS)}
        written = dev.field_locs  # defaults the file leaves out say nothing about the part
        desc = "; ".join(f"{name} {describe(value)}" for name, value in sorted(dev.fields.items())
                         if name not in skip and name in written and name != "kind")
        groups.setdefault((dev.kind, desc), []).append(tag)
    rows = []
    for (kind, desc), tags in sorted(groups.items()):
        rows.append([kind, desc, len(tags), " ".join(sorted(tags, key=natural))])
    return rows


def bill_of_materials(sch: Schematic, kinds: KindRegistry | None = None) -> str:
    rows = bom_rows(sch, kinds)
    return _csv(["item", "kind", "description", "quantity", "tags"], [[k, *r] for k, r in enumerate(rows, 1)])


def export(what: str, sch: Schematic, kinds: KindRegistry | None = None, strip: str = DEFAULT_STRIP) -> str:
    if what == "wires":
        return wire_list(sch, kinds, strip)
    if what == "bom":
        return bill_of_materials(sch, kinds)
    if what == "terminals":
        return terminal_plan(sch, kinds, strip)
    raise ValueError(f"unknown document '{what}' (one of: {', '.join(KINDS)})")


def conductor_rows(sch: Schematic, kinds: KindRegistry | None = None, strip: str = DEFAULT_STRIP) -> list[Conductor]:
    """The wire list as objects (for the HTML report's sheet)."""
    return documents(sch, kinds, strip).conductors


__all__ = ["KINDS", "DEFAULT_STRIP", "FIELD_KINDS", "is_field", "documents", "wire_list", "terminal_plan",
           "bill_of_materials", "bom_rows", "export", "conductor_rows"]
