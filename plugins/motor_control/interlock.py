"""Two contactors that must never be on together, such as the forward and reverse contactors of a
reversing starter, short the supply between phases if they are. Each coil needs an NC auxiliary
contact of the other in series, so that neither can pull in while the other is on. A contactor that
names another in `interlock` is checked, and so is the other side of the pair, each at its own coil.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import CheckContext, Example, Finding, Rule, reflow
from ctllint.reading.model import Severity
from ctllint_plugins.motor_control._devices import coils_of, contacts_of, device_of, interlock_pairs
from ctllint_plugins.motor_control._paths import path_text, subject_of


def check(ctx: CheckContext) -> Iterator[Finding]:
    circuit = ctx.circuit
    for a, b in interlock_pairs(ctx):
        for this, other in ((a, b), (b, a)):
            nc = contacts_of(ctx, other, "NC")
            for coil in coils_of(ctx, this):
                path = circuit.energizing_path(coil, without=nc)
                if path is None:
                    continue
                this_dev = device_of(ctx, this)
                declared = f"{this} has interlock: {other}" if this_dev.get("interlock") == other else f"{other} has interlock: {this}"
                yield Finding(
                    coil.loc,
                    f"coil {coil.text} has no NC contact of {other} in series ({declared}; path "
                    f"{path_text(path, coil, ctx)}): both can be on together; wire {other}.NC in series with {coil.text}",
                    subject_of(ctx, coil),
                )


RULE = Rule(
    name="interlock",
    severity=Severity.ERROR,
    summary="an interlocked contactor's coil lacks the other contactor's NC contact in series",
    doc=reflow(__doc__),
    source="NFPA 79 9.3.4 (interlocks for reversing); common practice (electrical interlock of reversing starters)",
    check=check,
    failing=Example("reverse coil not interlocked", "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1R.NC, 4, M1F.coil, 5, OL1.NC, X2]\n      - [2, PB3.NO, 6, M1R.coil, 5]\n"),
    passing=Example("each coil through the other's NC", "rungs:\n  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1R.NC, 4, M1F.coil, 5, OL1.NC, X2]\n      - [2, PB3.NO, 6, M1F.NC, 7, M1R.coil, 5]\n"),
)
