"""``ctllint xref`` and ``ctllint simulate``: tables, step syntax, usage errors."""
from __future__ import annotations

import os
import textwrap

import pytest

from ctllint.commands.cli import main

HERE = os.path.dirname(os.path.abspath(__file__))
PRESS = os.path.join(HERE, "data", "draw", "press.ctl.yaml")

UNSTABLE = textwrap.dedent("""\
    ctllint: 1
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      PB1: {kind: pushbutton, function: start}
      PB9: {kind: pushbutton, function: other}
      CR1: {kind: relay, coil: 120 VAC}
      PL1: {kind: pilot-light}
    rungs:
      - paths:
          - [L1, PB1.NO, 2, CR1.NC, 3, CR1.coil, X2]   # chatters when PB1 is pressed
      - paths:
          - [L1, PB9.NO, X2]                           # shorts the supply when PB9 is pressed
      - paths:
          - [L1, PL1, X2]
    """)


@pytest.fixture
def unstable(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    monkeypatch.setenv("COLUMNS", "200")
    (tmp_path / "unstable.ctl.yaml").write_text(UNSTABLE)
    return "unstable.ctl.yaml"


@pytest.fixture(autouse=True)
def wide_terminal(monkeypatch):
    monkeypatch.setenv("COLUMNS", "200")


def run(capsys, *args):
    code = main(list(args))
    out, err = capsys.readouterr()
    return code, out, err


def table(out):
    """The rows of the steps table: {step text: {column: cell}}, plus the header."""
    lines = [ln for ln in out.splitlines() if ln.strip()]
    head_i = next(i for i, ln in enumerate(lines) if ln.lstrip().startswith("#"))
    head = lines[head_i].split()
    rows = {}
    for ln in lines[head_i + 1:]:
        parts = ln.split()
        if not parts[0].isdigit():
            break
        cells = dict(zip(head[2:-1], parts[2:2 + len(head) - 3]))
        rows[int(parts[0])] = (parts[1], cells, " ".join(parts[2 + len(head) - 3:]))
    return head, rows


# -- xref ---------------------------------------------------------------------------------

def test_xref_lists_each_coil_with_contacts_and_availability(capsys):
    code, out, _ = run(capsys, "xref", PRESS)
    assert code == 0
    lines = out.splitlines()
    assert lines[0].split()[:4] == ["COIL", "KIND", "COIL", "RUNG"]
    rows = {ln.split()[0]: ln for ln in lines[1:]}
    assert list(rows) == ["MCR", "M1", "M2", "TR1"]  # in the order their coils are drawn
    assert rows["MCR"].split()[:4] == ["MCR", "relay", "1", "1:"]
    assert "2 NO, 0 NC" in rows["MCR"] and rows["MCR"].rstrip().endswith("ok")
    # M1: NO in rungs 2, 3 and 7, NC in rung 5; 2 NO + 1 NC declared.
    assert "3: 2, 3, 7" in rows["M1"] and "1: 5" in rows["M1"]
    assert "2 NO, 1 NC" in rows["M1"] and "OVER: 1 NO too many" in rows["M1"]
    assert "not declared" in rows["M2"] and "not declared" in rows["TR1"]
    assert "1: 5" in rows["TR1"]


def test_xref_changeover_poles_and_a_missing_coil(tmp_path, capsys):
    path = tmp_path / "x.ctl.yaml"
    path.write_text(textwrap.dedent("""\
        ctllint: 1
        supplies:
          ctl: {hot: L1, common: X2, voltage: 120 VAC}
        devices:
          CR1: {kind: relay, coil: 120 VAC, contacts: {poles: 2, throw: double}}
          CR2: {kind: relay, coil: 120 VAC}
          PL1: {kind: pilot-light}
          PL2: {kind: pilot-light}
          PL3: {kind: pilot-light}
          PL4: {kind: pilot-light}
        rungs:
          - paths: [[L1, CR1.NO, 2, PL1, X2]]
          - paths: [[L1, CR1.NC, 3, PL2, X2]]
          - paths: [[L1, CR1.NC, 4, PL3, X2]]
          - paths: [[L1, CR2.NO, 5, CR1.coil, X2]]
          - paths: [[L1, CR1.NC, 6, PL4, X2]]
        """))
    code, out, _ = run(capsys, "xref", str(path))
    assert code == 0
    rows = {ln.split()[0]: ln for ln in out.splitlines()[1:]}
    # Two changeover poles offer two NO and two NC (FORMAT.md): three NC uses are one too many.
    assert "2 changeover" in rows["CR1"] and "OVER: 1 NC too many" in rows["CR1"]
    assert "3: 2, 3, 5" in rows["CR1"]
    assert "no coil" in rows["CR2"]


def test_xref_counts_a_timers_instantaneous_contacts_apart(tmp_path, capsys):
    # FORMAT.md "Additions": a timer's instant-NO / instant-NC are counted in `contacts`
    # under their own names, as contact-count counts them; the timed NO stays 1 NO.
    path = tmp_path / "x.ctl.yaml"
    path.write_text(textwrap.dedent("""\
        ctllint: 1
        supplies:
          ctl: {hot: L1, common: X2, voltage: 120 VAC}
        devices:
          KT1: {kind: timer, delay: on, preset: 5 s, coil: 120 VAC, contacts: {NO: 1, instant-NO: 1}}
          KT2: {kind: timer, delay: on, preset: 5 s, coil: 120 VAC, contacts: {NO: 1, instant-NO: 1}}
          PB1: {kind: pushbutton, function: start}
          PL1: {kind: pilot-light}
          PL2: {kind: pilot-light}
          PL3: {kind: pilot-light}
          PL4: {kind: pilot-light}
        rungs:
          - paths: [[L1, PB1.NO, 1, KT1.coil, X2], [L1, KT1.instant-NO, 1]]
          - paths: [[L1, KT1.NO, 2, PL1, X2]]
          - paths: [[1, KT2.coil, X2]]
          - paths: [[L1, KT2.instant-NO, 3, PL2, X2]]
          - paths: [[L1, KT2.instant-NO, 4, PL3, X2]]
          - paths: [[L1, KT2.NO, 5, PL4, X2]]
        """))
    code, out, _ = run(capsys, "xref", str(path))
    assert code == 0
    rows = {ln.split()[0]: ln for ln in out.splitlines()[1:]}
    # KT1: one timed NO (rung 2) and one instant-NO (rung 1), as declared.
    assert "1 NO, 0 NC, 1 instant-NO" in rows["KT1"] and rows["KT1"].rstrip().endswith("ok")
    # KT2: two instant-NO drawn (rungs 4 and 5) against one declared.
    assert "OVER: 1 instant-NO too many" in rows["KT2"] and "NO too many" not in rows["KT2"].replace("instant-NO too many", "")


def test_xref_usage_errors(tmp_path, capsys):
    code, _, err = run(capsys, "xref", str(tmp_path / "none.ctl.yaml"))
    assert code == 2 and "does not exist" in err


# -- simulate -----------------------------------------------------------------------------

def test_simulate_steps_table(capsys):
    code, out, _ = run(capsys, "simulate", PRESS, "--layout", "steps",
                       "--step", "press:PB2", "--step", "release:PB2", "--step", "set:SS1=auto",
                       "--step", "trip:OL1", "--step", "reset:OL1", "--step", "power:off", "--step", "power:on",
                       "--step", "set:SS1=hand", "--step", "wait:5s")
    assert code == 0
    head, rows = table(out)
    assert head[:2] == ["#", "STEP"] and head[-1] == "NOTES"
    assert head[2:-1] == ["MCR", "M1", "PL1", "M2", "TR1", "SOL1", "PL2", "HN1", "I0_1"]
    assert [rows[i][0] for i in range(10)] == ["rest", "press:PB2", "release:PB2", "set:SS1=auto", "trip:OL1",
                                             "reset:OL1", "power:off", "power:on", "set:SS1=hand", "wait:5s"]
    assert rows[0][1]["MCR"] == "ON" and rows[0][1]["M1"] == "-"
    assert rows[1][1]["M1"] == "ON*" and rows[1][1]["PL1"] == "ON*"   # start pressed
    assert rows[2][1]["M1"] == "ON"                                     # sealed in
    assert rows[4][1]["M1"] == "-*"                                     # the overload trips it
    assert rows[6][1]["MCR"] == "-*" and rows[7][1]["MCR"] == "ON*"     # power off and back
    assert rows[7][1]["M1"] == "-"                                      # no restart by itself
    assert rows[8][1]["M2"] == "ON*" and rows[8][1]["SOL1"] == "-"
    assert rows[9][1]["SOL1"] == "ON*"                                  # the on-delay timer ran out
    assert "ON energized" in out


def test_simulate_transposed_layout(capsys):
    code, out, _ = run(capsys, "simulate", PRESS, "--layout", "loads", "--step", "press:PB2", "--step", "release:PB2")
    assert code == 0
    lines = out.splitlines()
    assert "   1  press:PB2" in lines and "   2  release:PB2" in lines
    head = next(ln for ln in lines if ln.startswith("LOAD"))
    assert head.split() == ["LOAD", "0", "1", "2"]
    m1 = next(ln for ln in lines if ln.startswith("M1 "))
    assert m1.split() == ["M1", "-", "ON*", "ON"]


def test_simulate_auto_layout_follows_the_terminal(capsys, monkeypatch):
    steps = ["--step", "press:PB2", "--step", "release:PB2"]   # nine loads, three states
    monkeypatch.setenv("COLUMNS", "200")
    _, wide, _ = run(capsys, "simulate", PRESS, *steps)
    assert any(ln.lstrip().startswith("#  STEP") for ln in wide.splitlines())
    monkeypatch.setenv("COLUMNS", "60")
    _, narrow, _ = run(capsys, "simulate", PRESS, *steps)
    assert any(ln.startswith("LOAD") for ln in narrow.splitlines())
    assert max(len(ln) for ln in narrow.splitlines()) <= 60
    # Many steps and a narrow terminal: rows stay steps, the narrower table.
    many = [a for i in range(14) for a in ("--step", "press:PB2" if i % 2 == 0 else "release:PB2")]
    _, out, _ = run(capsys, "simulate", PRESS, *many)
    assert any(ln.lstrip().startswith("#  STEP") for ln in out.splitlines())


def test_simulate_checks_pass_and_fail(capsys):
    code, out, _ = run(capsys, "simulate", PRESS, "--layout", "steps", "--step", "press:PB2", "--step", "check:M1=on,PL1=on")
    assert code == 0 and "check holds" in out
    code, out, _ = run(capsys, "simulate", PRESS, "--layout", "steps", "--step", "check:M1=on")
    assert code == 1
    _, rows = table(out)
    assert rows[1][2] == "FAIL: M1 is off, expected on"


def test_simulate_runs_a_named_scenario(capsys):
    code, out, _ = run(capsys, "simulate", PRESS, "--layout", "steps", "--scenario", "start latches, stop drops out")
    assert code == 0
    assert out.splitlines()[0].endswith("scenario 'start latches, stop drops out'")
    _, rows = table(out)
    assert [rows[i][0] for i in range(6)] == ["rest", "press:PB2", "release:PB2", "check:M1=on,PL1=on", "press:PB1", "check:M1=off"]
    assert rows[4][1]["M1"] == "-*"


def test_simulate_calls_out_oscillation_and_shorts(unstable, capsys):
    code, out, _ = run(capsys, "simulate", unstable, "--layout", "steps", "--step", "press:PB1", "--step", "release:PB1")
    assert code == 1
    _, rows = table(out)
    assert "UNSETTLED: oscillation: CR1" in rows[1][2]
    assert "stopped: 1 later step(s) not run" in rows[1][2]
    assert 2 not in rows
    code, out, _ = run(capsys, "simulate", unstable, "--layout", "steps", "--step", "press:PB9")
    assert code == 1
    _, rows = table(out)
    assert "UNSETTLED: short circuit of supply ctl: L1-PB9.NO-X2" in rows[1][2]


@pytest.mark.parametrize("step, message", [
    ("press:PB7", "no device 'PB7'"),
    ("press:M1", "M1 is a starter; press works on pushbuttons and switches"),
    ("press:SS1", "set:TAG=POSITION"),
    ("trip:PB1", "trip works on overloads, fuses and breakers"),
    ("set:SS1=manual", "selector SS1 has no position 'manual' (positions: off, hand, auto)"),
    ("set:M1=on", "set works on selectors, switches and PLC outputs"),
    ("set:Q0_3=half", "Q0_3 is set on or off"),
    ("set:SS1", "set needs TAG=VALUE"),
    ("press:PB2=on", "press takes device tags only"),
    ("push:PB2", "unknown action 'push'"),
    ("press", "press needs an argument"),
    ("power:maybe", "power is on or off"),
    ("wait:5", "has no unit"),
    ("wait:5V", "wait:5s"),
    ("check:M1=yes", "check M1 is on or off"),
])
def test_simulate_bad_steps_are_usage_errors(capsys, step, message):
    code, out, err = run(capsys, "simulate", PRESS, "--step", step)
    assert code == 2
    assert message in err, err
    assert f"--step {step}" in err
    assert out == ""


def test_simulate_other_usage_errors(capsys, tmp_path):
    code, _, err = run(capsys, "simulate", PRESS, "--scenario", "nope")
    assert code == 2 and "no expect scenario named 'nope'" in err and "start latches, stop drops out" in err
    code, _, err = run(capsys, "simulate", PRESS, "--scenario", "x", "--step", "press:PB2")
    assert code == 2 and "not both" in err
    code, _, err = run(capsys, "simulate", str(tmp_path / "none.ctl.yaml"))
    assert code == 2


def test_simulate_help_documents_the_step_syntax(capsys):
    with pytest.raises(SystemExit) as exc:
        main(["simulate", "--help"])
    assert exc.value.code == 0
    out = capsys.readouterr().out
    for form in ("press:TAG", "release:TAG", "set:TAG=VALUE", "trip:TAG", "reset:TAG", "power:on | power:off", "wait:TIME", "--scenario"):
        assert form in out
