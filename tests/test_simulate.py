"""Tests of ctllint.circuit.simulate: the behaviour model of FORMAT.md."""
from __future__ import annotations

import pytest

from ctllint.circuit.analysis import Circuit
from ctllint.testing import load_schematic
from ctllint.reading.model import Schematic
from ctllint.circuit.simulate import ScenarioEvent, Simulator, StepResult

HEAD = """ctllint: 1
supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
"""


def load(text: str) -> Schematic:
    return load_schematic(text, "t.ctl.yaml")


def sim(text: str) -> Simulator:
    s = Circuit(load(text)).simulator()
    assert s.reset().settled
    return s


def on(s: Simulator) -> list[str]:
    return [t for t, v in s.states().items() if v]


THREE_WIRE = HEAD + """devices:
  PB1: {kind: pushbutton, function: stop}
  PB2: {kind: pushbutton, function: start}
  M1: {kind: starter, coil: 120 VAC, overload: OL1}
  OL1: {kind: overload}
  PL1: {kind: pilot-light}
  PL2: {kind: pilot-light}
rungs:
  - paths:
      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]
      - [2, M1.NO, 3]
  - paths:
      - [L1, M1.NO, 5, PL1, X2]
  - paths:
      - [L1, OL1.NO, 6, PL2, X2]
"""


def test_three_wire_start_stop_with_seal_in():
    s = sim(THREE_WIRE)
    assert s.states() == {"M1": False, "PL1": False, "PL2": False}
    r = s.press("PB2")
    assert isinstance(r, StepResult) and r.settled and r.oscillating == [] and r.shorts == []
    assert on(s) == ["M1", "PL1"]
    s.release("PB2")
    assert s.energized("M1") and s.energized("PL1")  # sealed in
    s.press("PB1")
    assert on(s) == []
    s.release("PB1")
    assert on(s) == []  # stays off: three-wire control
    s.press("PB2"), s.release("PB2")
    s.trip("OL1")
    assert on(s) == ["PL2"]
    s.reset_device("OL1")
    assert on(s) == []  # the overload reset does not restart the motor
    assert not s.energized("PB1") and not s.energized("nothing")


def test_power_loss_three_wire_stays_off_two_wire_restarts():
    s = sim(THREE_WIRE)
    s.press("PB2"), s.release("PB2")
    assert s.energized("M1")
    s.power(False)
    assert on(s) == []
    s.power(True)
    assert on(s) == []  # the seal-in opened: no restart without the start button
    two = sim(HEAD + """devices:
  SS1: {kind: selector, positions: [off, run]}
  FS1: {kind: float-switch}
  P1: {kind: contactor}
rungs:
  - paths: [[L1, SS1.run, 2, FS1.NO, 3, P1.coil, X2]]
""")
    two.set("SS1", "run"), two.set("FS1", "on")
    assert two.energized("P1")
    two.power(False)
    assert not two.energized("P1")
    two.power(True)
    assert two.energized("P1")  # two-wire control restarts by itself
    two.set("FS1", "off")
    assert not two.energized("P1")


def test_stop_bypassed_by_a_miswired_seal_fails_its_scenario():
    sch = load(HEAD + """devices:
  PB1: {kind: pushbutton, function: stop}
  PB2: {kind: pushbutton, function: start}
  M1: {kind: contactor}
rungs:
  - paths:
      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, X2]
      - [L1, M1.NO, 3]
expect:
  - name: stop drops out
    steps:
      - press: PB2
      - release: PB2
      - check: {M1: on}
      - press: PB1
      - check: {M1: off}
      - release: PB1
      - check: {M1: on}
""")
    events = Circuit(sch).simulator().run_scenario(sch.expect[0])
    assert len(events) == 1
    ev = events[0]
    assert isinstance(ev, ScenarioEvent)
    assert (ev.kind, ev.step_index, ev.tag, ev.expected, ev.actual) == ("check", 4, "M1", False, True)
    assert ev.step is sch.expect[0].steps[4]
    assert ev.location == sch.expect[0].steps[4].target_locs["M1"]
    assert (ev.location.line, ev.location.column) == (19, 17)


def test_overload_missing_from_the_coil_circuit():
    s = sim(HEAD + """devices:
  PB2: {kind: pushbutton, function: start}
  M1: {kind: starter, overload: OL1}
  OL1: {kind: overload}
rungs:
  - paths:
      - [L1, PB2.NO, 3, M1.coil, X2]
      - [L1, M1.NO, 3]
""")
    s.press("PB2"), s.release("PB2")
    s.trip("OL1")
    assert s.energized("M1")  # nothing in the circuit opens on the trip


def test_two_coils_in_series_never_pull_in():
    s = sim(HEAD + """devices:
  PB1: {kind: pushbutton}
  CR1: {kind: relay}
  CR2: {kind: relay}
rungs:
  - paths: [[L1, PB1.NO, 2, CR1.coil, 3, CR2.coil, X2]]
""")
    s.press("PB1")
    assert on(s) == []


def test_short_through_a_contact_is_unsettled_and_stops_the_scenario():
    sch = load(HEAD + """devices:
  PB1: {kind: pushbutton}
  PB9: {kind: pushbutton}
  CR1: {kind: relay}
  PL1: {kind: pilot-light}
rungs:
  - paths: [[L1, PB1.NO, 2, CR1.coil, X2]]
  - paths: [[L1, PB9.NO, 7, CR1.NO, X2]]
  - paths: [[L1, CR1.NO, 8, PL1, X2]]
expect:
  - name: shorted
    steps:
      - press: PB9
      - press: PB1
      - check: {PL1: off}
      - release: PB1
""")
    s = Circuit(sch).simulator()
    s.reset()
    assert s.press("PB9").settled
    r = s.press("PB1")
    assert not r.settled and r.oscillating == []
    assert r.shorts == [("ctl", ["PB9.NO", "CR1.NO"])]
    assert "L1-PB9.NO-7-CR1.NO-X2" in r.why
    events = Circuit(sch).simulator().run_scenario(sch.expect[0])
    assert [(e.kind, e.step_index) for e in events] == [("unsettled", 1)]
    assert "short circuit of supply ctl" in events[0].why
    assert events[0].shorts == [("ctl", ["PB9.NO", "CR1.NO"])]
    assert events[0].location == sch.expect[0].steps[1].loc


REVERSING = HEAD + """devices:
  PB1: {kind: pushbutton, function: stop}
  PBF: {kind: pushbutton, function: start}
  PBR: {kind: pushbutton, function: start}
  MF: {kind: contactor, interlock: MR}
  MR: {kind: contactor, interlock: MF}
rungs:
  - paths:
      - [L1, PB1.NC, 2, PBF.NO, 3, MR.NC, 4, MF.coil, X2]
      - [2, MF.NO, 3]
  - paths:
      - [2, PBR.NO, 5, MF.NC, 6, MR.coil, X2]
      - [2, MR.NO, 5]
"""


def test_reversing_pair_interlock():
    s = sim(REVERSING)
    s.press("PBF"), s.release("PBF")
    assert on(s) == ["MF"]
    s.press("PBR"), s.release("PBR")
    assert on(s) == ["MF"]  # the forward contactor's NC keeps reverse out
    s.press("PB1"), s.release("PB1")
    s.press("PBR"), s.release("PBR")
    assert on(s) == ["MR"]


def test_pressing_both_directions_at_once_is_a_race():
    sch = load(REVERSING + """expect:
  - name: both at once
    steps:
      - press: [PBF, PBR]
""")
    events = Circuit(sch).simulator().run_scenario(sch.expect[0])
    assert [e.kind for e in events] == ["unsettled"]
    assert events[0].oscillating == ["MF", "MR"]


TIMERS = HEAD + """devices:
  SW1: {kind: pushbutton, action: maintained}
  SW2: {kind: pushbutton, action: maintained}
  TR1: {kind: timer, delay: "on", preset: 5 s}
  TR2: {kind: timer, delay: "off", preset: 3 s}
  PL1: {kind: pilot-light}
  PL2: {kind: pilot-light}
  PL3: {kind: pilot-light}
rungs:
  - paths: [[L1, SW1.NO, 2, TR1.coil, X2]]
  - paths: [[L1, TR1.NO, 3, PL1, X2]]
  - paths: [[L1, SW2.NO, 4, TR2.coil, X2]]
  - paths: [[L1, TR2.NO, 5, PL2, X2]]
  - paths: [[L1, TR1.NC, 6, PL3, X2]]
"""


def test_on_delay_timer():
    s = sim(TIMERS)
    s.press("SW1")
    assert s.energized("TR1") and not s.energized("PL1") and s.energized("PL3")
    s.wait(4.9)
    assert not s.energized("PL1")
    s.wait(0.1)
    assert s.energized("PL1") and not s.energized("PL3")
    s.wait(100)
    assert s.energized("PL1")
    s.release("SW1")
    assert not s.energized("PL1") and s.energized("PL3")  # returns at once
    # the time only counts while the coil is on without a break
    s.press("SW1"), s.wait(3), s.release("SW1"), s.press("SW1"), s.wait(3)
    assert not s.energized("PL1")
    s.wait(2)
    assert s.energized("PL1")


def test_off_delay_timer_and_power_loss():
    s = sim(TIMERS)
    s.press("SW2")
    assert s.energized("PL2")  # moves at once
    s.release("SW2")
    assert not s.energized("TR2") and s.energized("PL2")
    s.wait(2.5)
    assert s.energized("PL2")
    s.wait(0.5)
    assert not s.energized("PL2")
    s.press("SW2"), s.release("SW2")
    assert s.energized("PL2")
    s.power(False)
    s.power(True)
    assert not s.energized("PL2")  # off-delay timers return at once without power


def test_flasher_of_two_timers_skips_whole_periods():
    text = HEAD + """devices:
  SW1: {kind: pushbutton, action: maintained}
  TR1: {kind: timer, delay: "on", preset: 1 s}
  TR2: {kind: timer, delay: "on", preset: 1 s}
  PL1: {kind: pilot-light}
rungs:
  - paths: [[L1, SW1.NO, 2, TR2.NC, 3, TR1.coil, X2]]
  - paths: [[L1, TR1.NO, 4, TR2.coil, X2]]
  - paths: [[L1, TR1.NO, 5, PL1, X2]]
"""
    stepwise, jump = sim(text), sim(text)
    stepwise.press("SW1"), jump.press("SW1")
    for _ in range(21):
        stepwise.wait(0.25)
    r = jump.wait(5.25)
    assert r.settled
    assert stepwise.states() == jump.states()
    assert jump.energized("PL1")  # 5.25 s: second half of a 2 s period
    for _ in range(40):
        stepwise.wait(0.25)
    r = jump.wait(10.0)  # 15.25 s, on both
    assert r.settled and stepwise.states() == jump.states() and jump.energized("PL1")
    # 10,000,016.25 s: the first half of a period (light off), reached without
    # five million timer events
    r = jump.wait(10_000_001)
    assert r.settled and not jump.energized("PL1") and jump.energized("TR1")


def test_relay_through_its_own_nc_oscillates():
    sch = load(HEAD + """devices:
  PB2: {kind: pushbutton, function: start}
  CR1: {kind: relay}
rungs:
  - paths: [[L1, PB2.NO, 1, CR1.NC, 2, CR1.coil, X2]]
expect:
  - name: pulse
    steps:
      - press: PB2
      - check: {CR1: on}
""")
    s = Circuit(sch).simulator()
    assert s.reset().settled
    r = s.press("PB2")
    assert not r.settled and r.oscillating == ["CR1"] and r.shorts == []
    assert "oscillation: CR1" in r.why
    assert not s.wait(1).settled  # time does not settle it
    s.release("PB2")
    assert s.wait(1).settled and not s.energized("CR1")
    events = Circuit(sch).simulator().run_scenario(sch.expect[0])
    assert [(e.kind, e.step_index) for e in events] == [("unsettled", 0)]  # stops before the check


def test_relay_ring_chatters():
    s = sim(HEAD + """devices:
  SW1: {kind: pushbutton, action: maintained}
  CR1: {kind: relay}
  CR2: {kind: relay}
  CR3: {kind: relay}
  PL1: {kind: pilot-light}
rungs:
  - paths: [[L1, SW1.NO, 1, CR3.NC, 2, CR1.coil, X2]]
  - paths: [[L1, CR1.NO, 3, CR2.coil, X2]]
  - paths: [[L1, CR2.NO, 4, CR3.coil, X2]]
  - paths: [[L1, CR3.NO, 5, PL1, X2]]
""")
    r = s.press("SW1")
    assert not r.settled
    assert r.oscillating == ["CR1", "CR2", "CR3"]


def test_unsettled_rest_state_is_reported_without_a_step():
    sch = load(HEAD + """devices:
  CR1: {kind: relay}
rungs:
  - paths: [[L1, CR1.NC, 2, CR1.coil, X2]]
expect:
  - name: anything
    steps:
      - check: {CR1: off}
""")
    events = Circuit(sch).simulator().run_scenario(sch.expect[0])
    assert [(e.kind, e.step, e.step_index) for e in events] == [("unsettled", None, None)]
    assert events[0].location == sch.expect[0].loc


def test_selector_plc_output_and_fuse():
    sch = load("""ctllint: 1
supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
devices:
  FU1: {kind: fuse, rating: 2 A}
  SS1: {kind: selector, positions: ["off", hand, auto], action: spring-return}
  Q0_3: {kind: plc-output, output: relay}
  M1: {kind: contactor}
  PL1: {kind: pilot-light}
rungs:
  - paths:
      - [L1, FU1, 1, SS1.hand, 2, M1.coil, X2]
      - [1, SS1.auto, 3, Q0_3, 2]
  - paths:
      - [1, SS1.off, 4, PL1, X2]
expect:
  - name: hand, off, auto
    steps:
      - check: {PL1: on, M1: off}
      - set: {SS1: hand}
      - check: {M1: on, PL1: off}
      - release: SS1
      - check: {M1: off, PL1: on}
      - set: {SS1: auto}
      - check: {M1: off}
      - set: {Q0_3: on}
      - check: {M1: on}
      - trip: FU1
      - check: {M1: off, PL1: off}
      - reset: FU1
      - check: {M1: on}
      - power: "off"
      - check: {M1: off}
      - power: "on"
      - check: {M1: on, Q0_3: on}
      - wait: 2 s
      - check: {M1: on}
""")
    events = Circuit(sch).simulator().run_scenario(sch.expect[0])
    assert events == []
    s = Circuit(sch).simulator()
    s.reset()
    s.set("SS1", "nowhere")  # not a position: ignored
    assert s.state_of("SS1") is False and s.energized("PL1")
    s.set("SS1", "hand")
    assert s.state_of("SS1") is True


def test_states_follow_file_order_and_simulators_are_independent():
    c = Circuit(load(THREE_WIRE))
    a, b = c.simulator(), c.simulator()
    assert a is not b
    a.reset(), b.reset()
    a.press("PB2")
    assert list(a.states()) == ["M1", "PL1", "PL2"]
    assert a.energized("M1") and not b.energized("M1")


@pytest.mark.parametrize("sections", [300])
def test_large_circuit_settles_quickly(sections):
    # a chain of relays, each pulling in the next: settles in one step per relay
    lines = [HEAD + "devices:", "  SW1: {kind: pushbutton}"]
    lines += [f"  CR{i}: {{kind: relay}}" for i in range(sections)]
    lines.append("rungs:")
    lines.append("  - paths: [[L1, SW1.NO, w0, CR0.coil, X2]]")
    for i in range(1, sections):
        lines.append(f"  - paths: [[L1, CR{i - 1}.NO, w{i}, CR{i}.coil, X2]]")
    s = sim("\n".join(lines) + "\n")
    r = s.press("SW1")
    assert r.settled and all(s.states().values())
    s.release("SW1")
    assert not any(s.states().values())
