"""FORMAT.md "Additions": the optional fields of the sizing and protection
rules load with their values and positions, old files stay valid, and a
misuse is a located format error."""
import textwrap

import pytest

from ctllint.reading.loader import load_text
from ctllint.circuit.analysis import Circuit
from ctllint.testing import load_schematic

ADDITIONS = textwrap.dedent("""\
    ctllint: 1
    supplies:
      ctl: {hot: X1, common: X2, voltage: 120 VAC, source: T1}
      dc: {hot: "+24", common: "0V", voltage: 24 VDC, source: PS1}
    devices:
      PB1: {kind: pushbutton, function: stop, rating: [A600, Q300]}
      PB2: {kind: pushbutton, function: start, rating: [A600, {category: DC-13, current: 1 A, voltage: 24 V}]}
      KT: {kind: timer, coil: 120 VAC, delay: on, preset: 5 s, contacts: {NO: 1, instant-NO: 1}}
      KL: {kind: starter, coil: 120 VAC, overload: OL1, feeds: MTR1, role: line, speed: low}
      KH: {kind: contactor, coil: 120 VAC, feeds: MTR1, speed: high, estop_exempt: "freeze protection, no motion hazard"}
      OL1: {kind: overload, setting: 12 A, trip_multiple: 1.25, starting_allowance: true, in: phase, reset: manual}
      MTR1: {kind: motor, voltage: 460 V, phases: 3, connection: wye-delta, protection: integral, speeds: {low: {power: 10 hp, fla: 14 A}, high: {power: 20 hp, fla: 27 A}}}
      T1: {kind: transformer, primary: 480 V, secondary: 120 V, rating: 40 VA, class2: true, integral: true}
      PS1: {kind: power-supply, input: 120 VAC, output: 24 VDC, rating: 2.5 A, efficiency: 0.88, source: T1}
    rungs:
      - paths:
          - [X1, PB1.NC, 2, PB2.NO, 3, KT.coil, X2]
          - [2, KT.instant-NO, 3]
      - paths:
          - [X1, KT.NO, 4, KL.coil, 5, OL1.NC, X2]
""")


def test_every_addition_loads_with_its_value():
    sch = load_schematic(ADDITIONS)
    d = sch.devices
    assert d["PB1"].get("rating").all_designations() == ("A600", "Q300")
    pb2 = d["PB2"].get("rating")
    assert pb2.all_designations() == ("A600",) and pb2.categories[0].category == "DC-13"
    assert d["KT"].get("contacts").instant_no == 1
    assert d["KL"].get("role") == "line" and d["KL"].get("speed") == "low"
    assert d["KH"].get("estop_exempt").startswith("freeze")
    ol = d["OL1"]
    assert (ol.get("trip_multiple"), ol.get("starting_allowance"), ol.get("in"), ol.get("reset")) == (1.25, True, "phase", "manual")
    speeds = {s.name: (s.power.text, s.fla.value) for s in d["MTR1"].get("speeds")}
    assert speeds == {"low": ("10 hp", 14.0), "high": ("20 hp", 27.0)}
    assert d["T1"].get("class2") is True and d["T1"].get("integral") is True
    assert d["PS1"].get("efficiency") == 0.88 and d["PS1"].get("source") == "T1"
    assert d["OL1"].at("trip_multiple").line == 11


def test_instant_contact_follows_the_coil_and_timed_contact_waits():
    """An instantaneous NO closes with the coil (it seals the start button at
    once); the on-delay NO closes only once the preset has run (FORMAT.md
    behaviour model: timers change their timed contacts when a wait covers
    the preset)."""
    sim = Circuit(load_schematic(ADDITIONS)).simulator()
    assert sim.reset().settled
    sim.press("PB2")
    sim.release("PB2")
    assert sim.state_of("KT") is True      # sealed through KT.instant-NO
    assert sim.state_of("KL") is False     # KT.NO still timing
    sim.wait(5.0)
    assert sim.state_of("KL") is True


@pytest.mark.parametrize("change, line, words", [
    ("speeds: {low:", "MTR1: {kind: motor, power: 10 hp, voltage: 460 V, phases: 3, speeds: {low:", "goes under each speed"),
    ("speed: low}", "speed: slow}", "not a speed of motor MTR1"),
    ("efficiency: 0.88", "efficiency: 88", "at most 1"),
    ('estop_exempt: "freeze protection, no motion hazard"', 'estop_exempt: ""', "must give the reason"),
    ("rating: [A600, Q300]", "rating: [A600, Q900]", "must be a pilot-duty designation"),
    ("in: phase", "in: delta", "not one of: line, phase"),
    ("contacts: {NO: 1, instant-NO: 1}", "contacts: {NO: 1, instant-NO: 1}}\n  PBX: {kind: pushbutton, contacts: {instant-NO: 1}", "instant-NO"),
])
def test_misused_additions_are_located_format_errors(change, line, words):
    text = ADDITIONS.replace("MTR1: {kind: motor, voltage: 460 V, phases: 3, connection: wye-delta, protection: integral, speeds: {low:", line) if change == "speeds: {low:" else ADDITIONS.replace(change, line)
    assert text != ADDITIONS
    result = load_text(text, "case.ctl.yaml")
    errors = [d for d in result.diagnostics if d.rule == "format"]
    assert errors, "no format error"
    assert any(words in d.message for d in errors), [d.message for d in errors]
    assert all(d.line > 1 for d in errors)
