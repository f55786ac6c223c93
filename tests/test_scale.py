"""Commands other than check stay near linear on files built to be slow, and stop at their time budget.

Growth is measured without a clock: the number of Python lines executed
(``sys.settrace`` line events) for a file and for one four times larger.
Linear work gives a ratio of about 4, quadratic 16, cubic 64; the count is
the same on any machine. A count far past the linear one stops the trace
at once, so a regression fails quickly instead of running for minutes.
The figures in seconds are in ``tests/benchmarks/bench.py``.
"""
from __future__ import annotations

import os
import subprocess
import sys

import pytest

from ctllint.circuit.analysis import Circuit
from ctllint.review.diff import semantic_diff
from ctllint.output.draw import layout
from ctllint.reading.loader import load_text

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "benchmarks"))
from generate import long_scenario, parallel_branches, repeated_titles  # noqa: E402

# Four times the input may cost at most this many times the lines (linear: 4, plus what grows as n log n).
GROWTH = 6


class _TooMany(Exception):
    pass


def lines_run(fn, cap: float = float("inf")) -> int:
    """Python lines executed by ``fn()``; raises _TooMany past ``cap``."""
    count = 0

    def tracer(frame, event, arg):
        nonlocal count
        if event == "line":
            count += 1
            if count > cap:
                raise _TooMany()
        return tracer

    sys.settrace(tracer)
    try:
        fn()
    finally:
        sys.settrace(None)
    return count


def growth(make, n: int) -> float:
    """lines(4n) / lines(n) for the work ``make(n)`` returns as a callable."""
    small = lines_run(make(n))
    try:
        big = lines_run(make(4 * n), cap=GROWTH * 2 * small)
    except _TooMany:
        pytest.fail(f"four times the input took more than {2 * GROWTH} times the work (linear: 4)")
    return big / small


def load(text: str, name: str = "scale.ctl.yaml"):
    res = load_text(text, name)
    assert res.schematic is not None, res.diagnostics
    return res.schematic


def test_drawing_parallel_branches_grows_linearly():
    # Each of the n branches needs a row of its own: the row search once tried every row
    # and every wire against every other (1,000 branches: 4 minutes).
    def make(n):
        sch = load(parallel_branches(n))
        return lambda: layout(sch)
    assert growth(make, 60) <= GROWTH


def test_parallel_branches_each_get_a_row_under_the_first():
    sch = load(parallel_branches(30))
    svg = layout(sch).svg
    assert svg.count('class="el"') == 31
    rows = {line.split('y1="')[1].split('"')[0] for line in svg.splitlines() if line.startswith('<line class="w"') and 'y1="' in line}
    assert len(rows) >= 29  # the branches stack: one row each (plus connectors)


def test_diff_of_rungs_sharing_a_title_grows_linearly():
    # All rungs titled "Spare": they were scored pair by pair (2,000 rungs: 50 s, 1 GB).
    def make(n):
        old, new = load(repeated_titles(n, "NO"), "old.ctl.yaml"), load(repeated_titles(n, "NC"), "new.ctl.yaml")
        return lambda: semantic_diff(old, new)
    assert growth(make, 40) <= GROWTH


def test_rungs_sharing_a_title_still_pair_by_what_they_hold():
    # Worked by hand: old rung k holds CRk.NO and CRk.coil; the new file is reversed, so
    # each old rung k pairs with the new rung holding CRk (by the coil they share), and
    # each changes its NO contact to NC; in drawing order they would all pair wrongly.
    n = 200
    old = load(repeated_titles(n, "NO"), "old.ctl.yaml")
    text = repeated_titles(n, "NC")
    head, rungs = text.split("rungs:\n")
    blocks = rungs.strip("\n").split("  - title")
    blocks = ["  - title" + b for b in blocks if b]
    new = load(head + "rungs:\n" + "\n".join(reversed([b.rstrip("\n") for b in blocks])) + "\n", "new.ctl.yaml")
    d = semantic_diff(old, new)
    changed = [r for r in d.rungs if r.change == "changed"]
    assert len(changed) == n
    for r in changed:
        assert r.matched_by == "title"
        k = r.old_index + 1
        assert r.new_index == n - k
        assert sorted(e.element for e in r.elements) == [f"CR{k}.NC", f"CR{k}.NO"]


def test_simulate_of_a_long_scenario_grows_linearly():
    # The command replayed every prefix of the steps (2,000 steps: quadratic).
    from ctllint.commands.simulate import simulate_rows

    def make(n):
        sch = load(long_scenario(n))
        steps = list(sch.expect[0].steps)
        return lambda: simulate_rows(Circuit(sch).simulator(), steps)
    assert growth(make, 50) <= GROWTH


def test_simulate_rows_match_the_scenario_run_of_each_prefix():
    # The reference: each row as its own run of the steps so far (what the command used to do).
    from ctllint.commands.simulate import simulate_rows
    from ctllint.reading.model import Scenario

    sch = load(long_scenario(23))
    steps = list(sch.expect[0].steps)
    sim = Circuit(sch).simulator()
    _, rows = simulate_rows(sim, steps)
    assert len(rows) == len(steps) + 1
    for n, row in enumerate(rows):
        ref = Circuit(sch).simulator()
        events = ref.run_scenario(Scenario("prefix", steps[0].loc, steps[:n]))
        assert row["states"] == ref.states()
        fails = [e for e in events if e.kind == "check" and e.step_index == n - 1]
        assert row["ok"] == (not fails)


# -- the time budget of draw, report, diff, simulate ------------------------------------------

def _slow_repo(tmp_path, seconds: float):
    """A folder with a 12,000-branch drawing and a config giving the commands ``seconds``."""
    (tmp_path / ".ctllint.yaml").write_text(f"limits: {{command_seconds: {seconds}}}\n")
    (tmp_path / "big.ctl.yaml").write_text(parallel_branches(12000))
    return tmp_path


def _run(args, cwd):
    env = dict(os.environ, NO_COLOR="1")
    return subprocess.run([sys.executable, "-m", "ctllint", *args], cwd=cwd, capture_output=True, text=True, env=env, timeout=600)


@pytest.mark.parametrize("args", [
    ["draw", "--no-findings", "big.ctl.yaml", "-o", "out.svg"],
    ["report", "big.ctl.yaml", "-o", "out.html"],
    ["diff", "--no-findings", "/dev/null", "big.ctl.yaml"],
])
def test_a_command_past_its_budget_stops_with_a_message(tmp_path, args):
    repo = _slow_repo(tmp_path, 0.05)
    proc = _run(args, repo)
    assert proc.returncode == 1, proc.stderr
    assert "took longer than limits.command_seconds (0.05 s)" in proc.stderr
    assert "big.ctl.yaml" in proc.stderr
    assert "Traceback" not in proc.stderr
    assert not (repo / "out.svg").exists() and not (repo / "out.html").exists()


def test_simulate_past_its_budget_stops_with_a_message(tmp_path):
    (tmp_path / ".ctllint.yaml").write_text("limits: {command_seconds: 0.05}\n")
    (tmp_path / "long.ctl.yaml").write_text(long_scenario(30000))
    proc = _run(["simulate", "long.ctl.yaml", "--scenario", "start and stop"], tmp_path)
    assert proc.returncode == 1, proc.stderr
    assert "simulating long.ctl.yaml took longer than limits.command_seconds" in proc.stderr


def test_within_its_budget_a_command_runs_as_before(tmp_path):
    (tmp_path / ".ctllint.yaml").write_text("limits: {command_seconds: .inf}\n")
    (tmp_path / "small.ctl.yaml").write_text(parallel_branches(5))
    proc = _run(["draw", "small.ctl.yaml", "-o", "out.svg"], tmp_path)
    assert proc.returncode == 0, proc.stderr
    assert (tmp_path / "out.svg").read_text().startswith("<svg")


# -- the row search against the plain one it replaced ----------------------------------------

def _rows_reference(lay, order):
    """The row search written plainly (every row, every wire tried): the model the fast one must equal."""
    col = lay.column
    rails = {lay.hot, lay.common}
    occupied: list[list[tuple[int, int, str, str]]] = []
    wire_rows: dict[str, set[int]] = {}

    def fits(row, lo, hi, wlo, whi):
        if row < len(occupied):
            for a, b, wa, wb in occupied[row]:
                if lo < b and a < hi:
                    return False
                if (hi == a and whi != wa) or (lo == b and wlo != wb):
                    return False
        for w in (wlo, whi):
            if w in rails:
                continue
            c = col[w]
            for other in wire_rows.get(w, ()):
                for between in range(min(other, row) + 1, max(other, row)):
                    if between < len(occupied) and any(a <= c <= b and w not in (wa, wb) for a, b, wa, wb in occupied[between]):
                        return False
        for w, rs in wire_rows.items():
            if w not in rails and min(rs) < row < max(rs) and lo <= col[w] <= hi and w not in (wlo, whi):
                return False
        return True

    rows = {}
    for i in order:
        rp = lay.paths[i]
        wlo, whi = rp.nodes[0], rp.nodes[-1]
        lo, hi = col[wlo], col[whi]
        row = 0 if i == 0 else next((r for r in range(len(occupied) + 1) if fits(r, lo, hi, wlo, whi)), len(occupied))
        while len(occupied) <= row:
            occupied.append([])
        occupied[row].append((lo, hi, wlo, whi))
        rows[i] = row
        for n in rp.nodes:
            wire_rows.setdefault(n, set()).add(row)
    return rows


def _random_schematic(rnd) -> str:
    wires = ["L1", "X2"] + [str(i) for i in range(1, rnd.randint(2, 9))]
    devices: dict[str, str] = {}
    paths = []
    for _ in range(rnd.randint(2, 14)):
        n = rnd.randint(1, 5)
        ws = [rnd.choice(wires) for _ in range(n + 1)]
        if rnd.random() < 0.5:
            ws[0] = "L1"
        if rnd.random() < 0.5:
            ws[-1] = "X2"
        items = []
        for j in range(n):
            kind, parts = rnd.choice([("relay", ["NO", "NC", "coil"]), ("limit-switch", ["NO", "NC"]), ("pilot-light", [None])])
            tag = {"relay": "CR", "limit-switch": "LS", "pilot-light": "PL"}[kind] + str(rnd.randint(1, 4))
            devices[tag] = kind
            part = rnd.choice(parts)
            items += [repr(ws[j]), tag + (f".{part}" if part else "")]
        items.append(repr(ws[-1]))
        paths.append("      - [" + ", ".join(items) + "]")
    devs = "\n".join(f"  {t}: {{kind: {k}" + (", coil: 120 VAC" if k == "relay" else "") + "}" for t, k in sorted(devices.items()))
    return ("ctllint: 1\ntitle: random\nsupplies:\n  ctl: {hot: L1, common: X2, voltage: 120 VAC}\n"
            f"devices:\n{devs}\nrungs:\n  - title: R\n    paths:\n" + "\n".join(paths) + "\n")


def test_row_search_equals_the_plain_search_on_random_rungs():
    import random

    from ctllint.output.draw import MIN_COLUMNS
    from ctllint.output.draw.columns import finish_columns, plan_rung, rung_supply
    from ctllint.output.draw.rows import rows_in_order

    rnd = random.Random(1414)
    compared = 0
    for _ in range(150):
        sch = load(_random_schematic(rnd))
        for rung in sch.rungs:
            sup = rung_supply(sch, rung, None)
            lay, g, chains, right_side, asap = plan_rung(sch, rung, sup)
            finish_columns(lay, g, chains, right_side, asap, max(MIN_COLUMNS, max(asap.values(), default=0)))
            rest = list(range(1, len(lay.paths)))
            for order in (rest, sorted(rest, key=lambda i: -i), rnd.sample(rest, len(rest))):
                assert rows_in_order(lay, [0] + order) == _rows_reference(lay, [0] + order)
                compared += 1
    assert compared >= 450
