"""A control transformer's fuses protect the transformer and its wiring. A transformer that feeds a
supply needs primary fuses unless it is marked `class2: true` (Class 2 or Class 1 power-limited, NEC
430.72(C)(1)) or `integral: true` with a rating under 50 VA (integral to the controller and inside
its enclosure, 430.72(C)(3)); a small transformer marked neither needs them too. Where the rated
primary current Ip = VA / V is under 2 A, each primary fuse may be up to 500 % of Ip (430.72(C)(4)),
and that limit stands on its own. Otherwise Table 450.3(B): with a secondary fuse the primary may be
up to 250 % of Ip; without one, 125 % where Ip >= 9 A (the next standard rating up allowed) and 167
% where Ip is 2 A to 9 A. A secondary fuse may be up to 125 % of Is where Is >= 9 A (next standard
rating allowed), 167 % where Is < 9 A. Fuses are the transformer's `fuses` list, each with its
`side`.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import Example, Finding, Rule, reflow
from ctllint.reading.model import Quantity, Severity
from ctllint.reading.quantities import format_si
from ctllint.circuit.tables import primary_fuse_required, transformer_primary_limit, transformer_secondary_limit
from ctllint_plugins.ratings._figures import amps_text, exceeds


def transformer_fuse_limits(rating_va: float, primary_v: float | None, secondary_v: float | None, secondary_fused: bool) -> dict[str, tuple[float | None, str]]:
    """Largest primary and secondary fuse of a control transformer, with the
    clause behind each (NEC 430.72(C)(4), Table 450.3(B))."""
    limits: dict[str, tuple[float | None, str]] = {}
    if primary_v:
        limits["primary"] = transformer_primary_limit(rating_va, primary_v, secondary_fused)
    if secondary_v and rating_va > 0 and secondary_v > 0:
        limits["secondary"] = transformer_secondary_limit(rating_va, secondary_v)
    return limits


def check_transformer_protection(ctx) -> Iterator[Finding]:
    sources = {s.source for s in ctx.schematic.supplies.values() if s.source}
    sources |= {d.get("source") for d in ctx.devices.values() if d.kind == "power-supply" and d.get("source")}
    for transformer in ctx.devices.values():
        if transformer.kind != "transformer":
            continue
        if transformer.origin and transformer.origin != ctx.schematic.path and transformer.tag not in sources:
            continue  # a shared transformer is checked where a schematic uses it
        rating = transformer.get("rating")
        if not isinstance(rating, Quantity) or rating.value <= 0:
            continue
        fuses = [ctx.devices[t] for t in transformer.get("fuses") or [] if t in ctx.devices]
        primary = [f for f in fuses if f.get("side") == "primary"]
        secondary = [f for f in fuses if f.get("side") == "secondary"]
        class2, integral = transformer.get("class2") is True, transformer.get("integral") is True
        if transformer.tag in sources and not primary and primary_fuse_required(rating.value, class2, integral):
            small = rating.value < 50
            yield Finding(
                at=transformer.loc,
                message=(
                    f"control transformer {transformer.tag} ({format_si(rating.value, 'VA')}) has no primary fuse and is "
                    + ("marked integral, but only one under 50 VA may go without (NEC 430.72(C)(3))" if integral else
                       "not marked class2: true (NEC 430.72(C)(1))" + (" nor integral: true (under 50 VA, integral to the controller and inside its enclosure, 430.72(C)(3))" if small else ""))
                    + ": list its primary fuses under 'fuses' with side: primary"
                ),
                subject=transformer.tag,
            )
        if class2:
            continue  # protected as its listing says (430.72(C)(1))
        primary_v, secondary_v = transformer.get("primary"), transformer.get("secondary")
        limits = transformer_fuse_limits(
            rating.value,
            primary_v.value if isinstance(primary_v, Quantity) else None,
            secondary_v.value if isinstance(secondary_v, Quantity) else None,
            bool(secondary),
        )
        for side, side_fuses in (("primary", primary), ("secondary", secondary)):
            limit, clause = limits.get(side, (None, ""))
            if limit is None:
                continue
            for fuse in side_fuses:
                fuse_rating = fuse.get("rating")
                if isinstance(fuse_rating, Quantity) and exceeds(fuse_rating.value, limit):
                    yield Finding(
                        at=fuse.loc,
                        message=(
                            f"{side} {fuse.kind} {fuse.tag} of transformer {transformer.tag} "
                            f"({format_si(rating.value, 'VA')}) is rated {amps_text(fuse_rating.value)}, above the "
                            f"{amps_text(limit)} allowed ({clause}): fit a smaller {fuse.kind}"
                        ),
                        subject=fuse.tag,
                    )


RULE = Rule(
    name="transformer-protection",
    severity=Severity.ERROR,
    summary="a control transformer lacks its primary fuse, or a fuse is above NEC 430.72(C) / 450.3(B)",
    doc=reflow(__doc__),
    source="NEC (NFPA 70) 430.72(C)(1), (3) and (4), Table 450.3(B), 240.6(A); US NEC figures, other codes may differ",
    check=check_transformer_protection,
    failing=Example(
        "100 VA at 480 V: Ip 0.208 A, 500 % = 1.04 A; 2 A primary fuses are too large",
        """devices:
  T1: {kind: transformer, primary: 480 V, secondary: 120 V, rating: 100 VA, fuses: [FU1, FU2]}
  FU1: {kind: fuse, rating: 2 A, side: primary}
  FU2: {kind: fuse, rating: 2 A, side: primary}
""",
    ),
    passing=Example(
        "250 VA at 480 V: Ip 0.521 A, 500 % = 2.60 A; 2 A primary fuses pass",
        """devices:
  T1: {kind: transformer, primary: 480 V, secondary: 120 V, rating: 250 VA, fuses: [FU1, FU2]}
  FU1: {kind: fuse, rating: 2 A, side: primary}
  FU2: {kind: fuse, rating: 2 A, side: primary}
""",
    ),
)
