"""A control transformer sized below its loads overheats, and one that cannot deliver the inrush of a
coil pulling in sags so far that the coil does not close (and other relays drop out). The sealed VA
of every load on the supplies the transformer feeds (W for resistive loads and DC coils), all on
together, plus the input of each DC power supply it feeds (`source` on the power supply; output /
`efficiency`, 0.85 where not given), must not exceed its `rating`. Where it gives an `inrush_rating`
(a maker's figure at about 40 % power factor), the inrush of the largest group of loads that close
together (the loads one contact serves, or those that come on together at power return) plus the
sealed VA of all the others must not exceed it. A transformer defined in a shared device file sums
the loads of every schematic of the run that names it (a run on one file brings in the other
schematics using that device file); its findings stand at its tag there. A DC power supply's loads
above its `rating` (A) are a finding of this rule at the power supply.
"""
from __future__ import annotations

import os
from typing import Iterator

from ctllint.api import Example, Finding, Rule, reflow
from ctllint.reading.model import Device, Location, Quantity, Severity
from ctllint.reading.quantities import format_si
from ctllint_plugins.ratings._figures import amps_text, exceeds, join_names
from ctllint_plugins.ratings._transformer_loads import SourceLoad, load_label, source_load, worst_inrush


def _source_findings(source_kind: str, tag: str, at: Location, rating, inrush_rating, load: SourceLoad, output_v: float | None = None) -> Iterator[Finding]:
    """Findings of one source device against its summed load."""
    if not load.loads:
        return
    where = f" across {len(load.files)} schematics ({join_names([os.path.basename(f) for f in load.files])})" if len(load.files) > 1 else ""
    if source_kind == "power-supply":
        amps = sum(f[2] for f in load.loads.values())
        if rating is not None and exceeds(amps, rating):
            loads = join_names([f"{load_label(k)} {amps_text(f[2])}" for k, f in load.loads.items()])
            yield Finding(
                at=at,
                message=f"power supply {tag} rated {amps_text(rating)} carries {amps_text(amps)}{where} ({loads}): use a larger power supply or split its loads",
                subject=tag,
            )
        return
    sealed = sum(f[0] for f in load.loads.values())
    if rating is not None and exceeds(sealed, rating):
        loads = join_names([f"{load_label(k)} {format_si(f[0], 'VA')}" for k, f in load.loads.items()])
        yield Finding(
            at=at,
            message=(
                f"transformer {tag} rated {format_si(rating, 'VA')} carries {format_si(sealed, 'VA')} sealed{where} "
                f"({loads}): use a larger transformer or move loads to another supply"
            ),
            subject=tag,
        )
    if inrush_rating is not None:
        inrush, group = worst_inrush(load)
        if exceeds(inrush, inrush_rating):
            making = sum(load.loads[k][1] for k in group)
            yield Finding(
                at=at,
                message=(
                    f"transformer {tag} inrush rating {format_si(inrush_rating, 'VA')} is below {format_si(inrush, 'VA')}{where}: "
                    f"{join_names([load_label(k) for k in group])} pulling in together at {format_si(making, 'VA')} while the other loads "
                    f"hold {format_si(inrush - making, 'VA')} sealed: use a transformer with a higher inrush rating"
                ),
                subject=tag,
            )


def _sources(ctx) -> Iterator[Device]:
    for device in ctx.devices.values():
        if device.kind in ("transformer", "power-supply"):
            yield device


def _figure(device: Device, name: str) -> float | None:
    value = device.get(name)
    return value.value if isinstance(value, Quantity) else None


def check_control_transformer(ctx) -> Iterator[Finding]:
    """Sources defined in this file; those of a shared device file are
    summed over the run by ``combine_control_transformer``."""
    for source in _sources(ctx):
        if source.origin and source.origin != ctx.schematic.path:
            continue
        rating, inrush_rating = _figure(source, "rating"), _figure(source, "inrush_rating")
        if rating is None and inrush_rating is None:
            continue
        load = source_load(ctx, source, inrush_rating is not None and source.kind == "transformer")
        yield from _source_findings(source.kind, source.tag, source.loc, rating, inrush_rating, load)


def collect_control_transformer(ctx) -> dict | None:
    """Per file, the loads on sources defined in a shared device file."""
    out = {}
    for source in _sources(ctx):
        if not source.origin or source.origin == ctx.schematic.path:
            continue
        rating, inrush_rating = _figure(source, "rating"), _figure(source, "inrush_rating")
        if rating is None and inrush_rating is None:
            continue
        load = source_load(ctx, source, inrush_rating is not None and source.kind == "transformer")
        if not load.loads:
            continue
        at = source.loc
        out[f"{source.origin}\0{source.tag}"] = {
            "kind": source.kind, "tag": source.tag, "path": at.path, "line": at.line, "column": at.column,
            "rating": rating, "inrush_rating": inrush_rating,
            "loads": load.loads, "groups": load.groups, "files": load.files,
        }
    if not out:
        return None
    return {"sources": out, "device_files": sorted({k.rsplit("\0", 1)[0] for k in out}), "path": ctx.schematic.path}


def combine_control_transformer(data: list[dict]) -> Iterator[Finding]:
    summed: dict[str, tuple[dict, SourceLoad]] = {}
    for item in data:
        for key, src in item.get("sources", {}).items():
            load = SourceLoad(dict(src["loads"]), [list(g) for g in src["groups"]], list(src["files"]))
            if key in summed:
                summed[key][1].merge(load)
            else:
                summed[key] = (src, load)
    for key in sorted(summed):
        src, load = summed[key]
        at = Location(src["path"], src["line"], src["column"])
        yield from _source_findings(src["kind"], src["tag"], at, src["rating"], src["inrush_rating"], load)


RULE = Rule(
    name="control-transformer",
    severity=Severity.ERROR,
    summary="a control transformer's loads exceed its VA rating, sealed or at inrush",
    doc=reflow(__doc__),
    source="common practice (control transformer sizing: sum of sealed VA, largest inrush plus sealed)",
    check=check_control_transformer,
    collect=collect_control_transformer,
    combine=combine_control_transformer,
    failing=Example(
        "three loads of 60 + 10 + 50 = 120 VA sealed on a 100 VA transformer",
        """supplies:
  ctl: {hot: X1, common: X2, voltage: 120 VAC, source: T1}
devices:
  T1: {kind: transformer, primary: 480 V, secondary: 120 V, rating: 100 VA}
  M1: {kind: contactor, coil: 120 VAC, inrush: 600 VA, sealed: 60 VA}
  CR1: {kind: relay, coil: 120 VAC, inrush: 40 VA, sealed: 10 VA}
  SOL1: {kind: solenoid, voltage: 120 VAC, inrush: 300 VA, sealed: 50 VA}
""",
    ),
    passing=Example(
        "the same loads on a 150 VA transformer (with an inrush_rating, one contact making 600 + 300 VA while 10 VA is held needs 910 VA)",
        """devices:
  T1: {kind: transformer, primary: 480 V, secondary: 120 V, rating: 150 VA}
""",
    ),
)
