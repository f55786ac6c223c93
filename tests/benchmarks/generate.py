"""Generators of large schematics for the benchmarks (and for tests of scale).

``motor_circuits(n)``: n everyday motor circuits, each a three-wire
start/stop with seal-in and overload, a running light, an interposing
relay driven by a PLC output, and a solenoid worked by that relay. The
result obeys every rule, so a check does all its work and reports nothing.

``lattice(n)``: one rung whose contacts form a ladder lattice of n
sections with cross-links between the two strings; the number of simple
paths grows exponentially with n while the file grows linearly.

``parallel_branches(n)``: one coil fed through any of n limit switches in
parallel, each branch on a row of its own in the drawing.

``repeated_titles(n, contact)``: n relay rungs all titled "Spare", each
relay sealed in through its own ``contact`` (NO or NC): two revisions
differ in every rung while the titles tell none apart.

``long_scenario(n)``: a start/stop circuit with an expect scenario of n
steps (start, check, stop, wait in turn).

Run: python tests/benchmarks/generate.py motors 1000 > line.ctl.yaml
     python tests/benchmarks/generate.py lattice 200 -o lattice.ctl.yaml
"""
from __future__ import annotations

import sys


def motor_circuits(n: int, title: str = "Generated line") -> str:
    out = [
        "ctllint: 1",
        f"title: {title}, {n} motor circuits",
        "supplies:",
        "  ctl: {hot: L1, common: X2, voltage: 120 VAC}",
        "  dc: {hot: '+24', common: 0V, voltage: 24 VDC}",
        "devices:",
    ]
    for i in range(1, n + 1):
        out += [
            f"  PB{i}A: {{kind: pushbutton, function: stop, rating: A600}}",
            f"  PB{i}B: {{kind: pushbutton, function: start, rating: A600}}",
            f"  M{i}: {{kind: starter, coil: 120 VAC, inrush: 120 VA, sealed: 12 VA, overload: OL{i}, feeds: MTR{i}, rating: A600, power_rating: {{size: 1}}}}",
            f"  OL{i}: {{kind: overload, setting: 4.6 A}}",
            f"  MTR{i}: {{kind: motor, power: 3 hp, voltage: 460 V, phases: 3, fla: 4.6 A, service_factor: 1.15}}",
            f"  PL{i}: {{kind: pilot-light, voltage: 120 VAC, power: 1 W}}",
            f"  Q{i}: {{kind: plc-output, output: transistor, voltage: 24 VDC, rating: 0.5 A}}",
            f"  CR{i}: {{kind: relay, coil: 24 VDC, coil_power: 1.2 W, suppressed: true, rating: A600}}",
            f"  SOL{i}: {{kind: solenoid, voltage: 120 VAC, inrush: 60 VA, sealed: 20 VA}}",
        ]
    out.append("rungs:")
    for i in range(1, n + 1):
        w = i * 10
        out += [
            f"  - title: Motor {i}",
            "    paths:",
            f"      - [L1, PB{i}A.NC, {w + 1}, PB{i}B.NO, {w + 2}, M{i}.coil, {w + 3}, OL{i}.NC, X2]",
            f"      - [{w + 1}, M{i}.NO, {w + 2}]",
            f"  - title: Motor {i} running",
            "    paths:",
            f"      - [L1, M{i}.NO, {w + 4}, PL{i}, X2]",
            f"  - title: Valve {i} interposing relay",
            "    paths:",
            f"      - ['+24', Q{i}, {w + 5}, CR{i}.coil, 0V]",
            f"  - title: Valve {i}",
            "    paths:",
            f"      - [L1, CR{i}.NO, {w + 6}, SOL{i}, X2]",
        ]
    return "\n".join(out) + "\n"


def lattice(n: int) -> str:
    """Two strings of n contacts from L1 to the coil, cross-linked at every section."""
    out = [
        "ctllint: 1",
        f"title: Lattice of {n} sections",
        "supplies:",
        "  ctl: {hot: L1, common: X2, voltage: 120 VAC}",
        "devices:",
        "  CR0: {kind: relay, coil: 120 VAC}",
        "  PB0: {kind: pushbutton, function: stop}",
        "  LS0: {kind: limit-switch}",
    ]
    for i in range(1, n + 1):
        out.append(f"  LS{i}: {{kind: limit-switch}}")
    out += ["rungs:", "  - title: Lattice", "    paths:"]
    paths = ["      - [L1, PB0.NC, s]"]
    prev_a, prev_b = "s", "s"
    for i in range(1, n + 1):
        a, b = f"a{i}", f"b{i}"
        paths.append(f"      - [{prev_a}, LS{i}.NO, {a}]")
        paths.append(f"      - [{prev_b}, LS{i}.NC, {b}]")
        paths.append(f"      - [{a}, LS{i}.NO, {b}]")
        prev_a, prev_b = a, b
    paths.append(f"      - [{prev_a}, CR0.NO, c, CR0.coil, X2]")
    paths.append(f"      - [{prev_b}, LS0.NO, c]")
    out += paths
    return "\n".join(out) + "\n"


def parallel_branches(n: int) -> str:
    out = [
        "ctllint: 1",
        f"title: Any of {n} switches",
        "supplies:",
        "  ctl: {hot: L1, common: X2, voltage: 120 VAC}",
        "devices:",
        "  CR0: {kind: relay, coil: 120 VAC}",
    ]
    out += [f"  LS{i}: {{kind: limit-switch}}" for i in range(1, n + 1)]
    out += ["rungs:", "  - title: Any switch", "    paths:", "      - [L1, LS1.NO, 1, CR0.coil, X2]"]
    out += [f"      - [L1, LS{i}.NO, 1]" for i in range(2, n + 1)]
    return "\n".join(out) + "\n"


def repeated_titles(n: int, contact: str = "NO") -> str:
    out = [
        "ctllint: 1",
        f"title: {n} spare relays",
        "supplies:",
        "  ctl: {hot: L1, common: X2, voltage: 120 VAC}",
        "devices:",
    ]
    out += [f"  CR{i}: {{kind: relay, coil: 120 VAC}}" for i in range(1, n + 1)]
    out.append("rungs:")
    for i in range(1, n + 1):
        out += ["  - title: Spare", "    paths:", f"      - [L1, CR{i}.{contact}, w{i}, CR{i}.coil, X2]"]
    return "\n".join(out) + "\n"


def long_scenario(n: int) -> str:
    out = [
        "ctllint: 1",
        "title: Start and stop, over and over",
        "supplies:",
        "  ctl: {hot: L1, common: X2, voltage: 120 VAC}",
        "devices:",
        "  PB1: {kind: pushbutton, function: stop}",
        "  PB2: {kind: pushbutton, function: start}",
        "  CR1: {kind: relay, coil: 120 VAC}",
        "rungs:",
        "  - title: Run relay",
        "    paths:",
        "      - [L1, PB1.NC, 2, PB2.NO, 3, CR1.coil, X2]",
        "      - [2, CR1.NO, 3]",
        "expect:",
        "  - name: start and stop",
        "    steps:",
    ]
    cycle = ["press: PB2", "release: PB2", "check: {CR1: on}", "press: PB1", "release: PB1", "check: {CR1: off}", "wait: 1 s"]
    out += [f"      - {cycle[k % len(cycle)]}" for k in range(n)]
    return "\n".join(out) + "\n"


def main(argv: list[str] | None = None) -> int:
    import argparse

    def positive(text: str) -> int:
        try:
            value = int(text)
        except ValueError:
            raise argparse.ArgumentTypeError(f"'{text}' is not a whole number") from None
        if value < 1:
            raise argparse.ArgumentTypeError("must be at least 1")
        return value

    parser = argparse.ArgumentParser(
        description="Write a generated schematic for the benchmarks: 'motors N' (N everyday motor circuits that obey "
                    "every rule) or 'lattice N' (one rung of N cross-linked contact sections).",
        epilog="example: python tests/benchmarks/generate.py motors 1000 > line.ctl.yaml")
    parser.add_argument("kind", choices=("motors", "lattice"), help="what to generate")
    parser.add_argument("count", type=positive, help="motor circuits or lattice sections")
    parser.add_argument("-o", "--output", metavar="FILE", help="write to FILE instead of standard output")
    args = parser.parse_args(argv)
    text = motor_circuits(args.count) if args.kind == "motors" else lattice(args.count)
    if args.output:
        with open(args.output, "w", encoding="utf-8") as handle:
            handle.write(text)
    else:
        sys.stdout.write(text)
    return 0


if __name__ == "__main__":
    sys.exit(main())
