"""control-transformer's loads: what a source device carries in one file, or over a run.

The loads on the supplies a control transformer or DC power supply feeds (with the inputs of the
power supplies a transformer feeds), the groups of loads that close together, and the worst
inrush of a transformer (``SourceLoad``, ``source_load``, ``worst_inrush``). Apart from
control_transformer.py because it is the rule's model of a source's load, which the per-file
check and the run-wide ``collect``/``combine`` all build on.
"""
from __future__ import annotations

from dataclasses import dataclass

from ctllint.reading.model import Device, Supply
from ctllint_plugins.ratings._figures import load_figures

# Output / input power of a DC power supply where it gives no efficiency
# (common practice, CHECK-VALUES.md).
DEFAULT_EFFICIENCY = 0.85


@dataclass
class SourceLoad:
    """What one source device (a control transformer or a DC power supply)
    carries in one file, or summed over the files of a run: each load by a
    key that is the same for a device of a shared file wherever it is drawn
    ((sealed VA, inrush VA, sealed A)), and the groups of loads that close
    together (one contact's served loads, the loads on at power return)."""

    loads: dict[str, list[float]]
    groups: list[list[str]]
    files: list[str]

    def merge(self, other: "SourceLoad") -> None:
        for key, figures in other.loads.items():
            self.loads.setdefault(key, figures)
        self.groups.extend(other.groups)
        self.files.extend(f for f in other.files if f not in self.files)


def worst_inrush(load: SourceLoad) -> tuple[float, list[str]]:
    """The largest inrush the source must deliver: over every group of loads
    that close together (every single load being one too), the group's
    inrush plus the sealed VA of every other load (common practice)."""
    sealed = sum(f[0] for f in load.loads.values())
    best, best_group = 0.0, []
    for group in [*load.groups, *([k] for k in load.loads)]:
        members = [k for k in dict.fromkeys(group) if k in load.loads]
        if not members:
            continue
        total = sealed + sum(load.loads[k][1] - load.loads[k][0] for k in members)
        if total > best:
            best, best_group = total, members
    return best, best_group


def _load_key(ctx, device: Device) -> str:
    """A load's key: the device's own file and tag, so that a device of a
    shared device file is one load wherever it is drawn."""
    return f"{device.origin or ctx.schematic.path}\0{device.tag}"


def load_label(key: str) -> str:
    return key.rsplit("\0", 1)[-1]


def _supplies_fed_by(ctx, tag: str) -> list[Supply]:
    return [s for s in ctx.schematic.supplies.values() if s.source == tag]


def source_load(ctx, source: Device, with_groups: bool) -> SourceLoad:
    """The loads of this file on the supplies ``source`` feeds; for a
    transformer also the input of each DC power supply it feeds
    (output / efficiency, 0.85 where not given)."""
    supplies = {s.name for s in _supplies_fed_by(ctx, source.tag)}
    loads: dict[str, list[float]] = {}
    keys_by_index: dict[int, str] = {}
    if supplies:
        for load in ctx.circuit.loads:
            supply = ctx.circuit.supply_of(load)
            device = ctx.devices.get(load.tag)
            if supply is None or supply.name not in supplies or device is None:
                continue
            found = load_figures(device, supply.voltage.value)
            if found is None:
                continue
            key = _load_key(ctx, device)
            keys_by_index[load.index] = key
            loads.setdefault(key, [found.sealed_va, found.inrush_va, found.sealed_a])
    if source.kind == "transformer":
        for ps in ctx.devices.values():
            if ps.kind != "power-supply" or ps.get("source") != source.tag:
                continue
            output = source_load(ctx, ps, False)
            watts = sum(f[0] for f in output.loads.values())
            if watts > 0:
                efficiency = ps.get("efficiency")
                va = watts / (efficiency if isinstance(efficiency, float) else DEFAULT_EFFICIENCY)
                loads[f"{ctx.schematic.path}\0{ps.tag} input"] = [va, va, 0.0]
    groups: list[list[str]] = []
    if with_groups and keys_by_index:
        seen: set[tuple[str, ...]] = set()
        for element in ctx.schematic.elements:
            if element.role not in ("contact", "output"):
                continue
            group = tuple(sorted({keys_by_index[l.index] for l in ctx.circuit.served_loads(element) if l.index in keys_by_index}))
            if len(group) > 1 and group not in seen:
                seen.add(group)
                groups.append(list(group))
        simulator = ctx.circuit.simulator()
        if simulator.reset().settled:  # the loads that come on together at power return
            on = tuple(sorted({keys_by_index[l.index] for l in ctx.circuit.loads if l.index in keys_by_index and simulator.state_of(l.tag)}))
            if len(on) > 1 and on not in seen:
                groups.append(list(on))
    return SourceLoad(loads, groups, [ctx.schematic.path])
