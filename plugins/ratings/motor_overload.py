"""A motor without running overload protection burns on a stall, an overload or a lost phase; NEC
430.32 requires it for continuous-duty motors. A contactor or starter that `feeds` a motor must name
its `overload` relay, unless the motor is marked `protection: integral` (a thermal protector in the
motor, 430.32(A)(2)) or is fed through a device that protects it. A motor-protective breaker or a
soft starter covers the contactor with it; a drive does not cover a bypass contactor, which runs the
motor with the drive out of circuit and needs its own overload relay. In a wye-delta starter the
overload sits with the line contactor, so the star and delta contactors need none of their own; a
second contactor in series with a protected one (the redundant pair of a safety circuit) needs none
either. One that runs the motor instead of another (interlocked: the other direction, another speed)
needs its own, so that a trip drops it. Changing `starter` to `contactor` does not take a motor out
of this rule. These are US NEC figures; other codes (CEC, local rules) may differ.
"""
from __future__ import annotations

from typing import Iterator

from ctllint.api import Example, Finding, Rule, reflow
from ctllint.reading.model import Device, Severity
from ctllint_plugins.ratings._controllers import CONTACTOR_KINDS


# Device kinds that protect the motor they feed (a drive or soft starter
# with its own motor overload function, a motor-protective breaker).
PROTECTIVE_FEEDERS = ("drive", "soft-starter", "motor-breaker")
# Of those, the ones whose protection also covers a contactor feeding the
# same motor: a motor breaker sits in series with its contactor, and a soft
# starter's bypass contactor is wired back through the starter's protection
# (common practice). A drive's bypass contactor runs the motor with the
# drive out of circuit, so it needs an overload relay of its own.
_COVERS_CONTACTORS = ("soft-starter", "motor-breaker")


def _alternative(contactor: Device, feeders: list[Device]) -> bool:
    """Whether ``contactor`` runs the motor instead of another feeder (the
    other direction of a reversing pair, another speed) rather than in
    series with it. The format draws no power circuit; alternatives are
    interlocked (``interlock`` names one or the other), series contactors
    (the redundant pair of a safety circuit) are not."""
    if contactor.get("interlock") or contactor.get("speed"):
        return True
    return any(d.get("interlock") == contactor.tag for d in feeders)


def check_motor_overload(ctx) -> Iterator[Finding]:
    """A contactor or starter that feeds a motor has an overload relay, or
    the motor is protected otherwise (NEC 430.32)."""
    feeders: dict[str, list[Device]] = {}
    for device in ctx.devices.values():
        fed = device.get("feeds")
        if isinstance(fed, str):
            feeders.setdefault(fed, []).append(device)
    for contactor in ctx.devices.values():
        if contactor.kind not in CONTACTOR_KINDS or isinstance(contactor.get("overload"), str):
            continue
        motor = ctx.devices.get(contactor.get("feeds") or "")
        if motor is None or motor.kind != "motor" or motor.get("protection") == "integral":
            continue
        others = feeders.get(motor.tag, [])
        if any(d.kind in _COVERS_CONTACTORS for d in others):
            continue
        bypass = any(d.kind in PROTECTIVE_FEEDERS for d in others)
        protected = any(isinstance(d.get("overload"), str) for d in others)
        if protected and contactor.get("role") in ("star", "delta"):
            continue  # a wye-delta starter's overload sits with its line contactor
        if protected and not _alternative(contactor, others):
            continue  # a second contactor in series (a monitored safety pair): the overload drops the first

        if bypass:
            yield Finding(
                at=contactor.loc,
                message=(
                    f"{contactor.kind} {contactor.tag} feeds motor {motor.tag}, which a drive also feeds, and names no overload "
                    f"relay: running through {contactor.tag} (a bypass) the drive is out of circuit and does not protect the "
                    f"motor (NEC 430.32); fit an overload relay for the bypass path (overload: OL..)"
                ),
                subject=contactor.tag,
            )
            continue
        yield Finding(
            at=contactor.loc,
            message=(
                f"{contactor.kind} {contactor.tag} feeds motor {motor.tag} and names no overload relay, and the motor is "
                f"not marked protection: integral: an unprotected motor burns on a stall or a lost phase (NEC 430.32); "
                f"fit an overload relay (overload: OL..) in series with the coil"
            ),
            subject=contactor.tag,
        )


RULE = Rule(
    name="motor-overload",
    severity=Severity.ERROR,
    summary="a contactor feeds a motor that has no overload protection",
    doc=reflow(__doc__),
    source="NEC (NFPA 70) 430.32(A)(1) and (A)(2)",
    check=check_motor_overload,
    failing=Example(
        "a contactor feeds a 30 hp motor with no overload relay",
        """devices:
  M1: {kind: contactor, coil: 120 VAC, feeds: MTR1}
  MTR1: {kind: motor, power: 30 hp, voltage: 460 V, phases: 3}
""",
    ),
    passing=Example(
        "a thermally protected motor",
        """devices:
  M1: {kind: contactor, coil: 120 VAC, feeds: MTR1}
  MTR1: {kind: motor, power: 1 hp, voltage: 460 V, phases: 3, protection: integral}
""",
    ),
)
