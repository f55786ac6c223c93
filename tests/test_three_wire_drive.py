"""A drive or soft starter set to ``control: three-wire``: the format, the simulator, the format error.

The behaviour is common practice (drives offer two- and three-wire control as
a setting): in three-wire control a momentary NO start pulses the run input,
a momentary NC stop holds the stop input, and the drive latches the run
command itself until the stop input opens, it trips, or control power is
lost; it does not restart when power returns (the latch is lost). The step
tables below are written by hand from that description, not from the code.
"""
from __future__ import annotations

import pytest

from ctllint.circuit.analysis import Circuit
from ctllint.reading.loader import load_text
from ctllint.testing import load_schematic

HEAD = """ctllint: 1
supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
"""

CIRCUIT = HEAD + """devices:
  PB1: {kind: pushbutton, function: stop}
  PB2: {kind: pushbutton, function: start}
  PB3: {kind: pushbutton, function: other, action: maintained}
  PB4: {kind: pushbutton, function: stop}
  PB5: {kind: pushbutton, function: other, action: maintained}
  CR1: {kind: relay}
  VFD1: {kind: drive, control: CONTROL}
  VFD2: {kind: soft-starter, control: CONTROL}
  VFD3: {kind: drive, control: CONTROL}
  PL1: {kind: pilot-light}
rungs:
  - paths:
      - [L1, PB1.NC, 1, VFD1.stop, X2]
  - paths:
      - [L1, PB2.NO, 2, VFD1.run, X2]
  - paths:
      - [L1, VFD1.NO, 3, PL1, X2]
  - paths:
      - [L1, PB4.NC, 4, VFD2.stop, X2]
      - [4, VFD3.stop, X2]
  - paths:
      - [L1, PB3.NO, 5, VFD2.run, X2]
  - paths:
      - [L1, PB5.NO, 6, CR1.coil, X2]
  - paths:
      - [L1, CR1.NO, 7, VFD3.run, X2]
"""


def simulator(control: str, reset: bool = True):
    sim = Circuit(load_schematic(CIRCUIT.replace("CONTROL", control), "t.ctl.yaml")).simulator()
    if reset:
        assert sim.reset().settled
    return sim


def act(sim, action: str, tag: str = ""):
    if action == "power":
        return sim.power(tag == "on")
    return {"press": sim.press, "release": sim.release, "trip": sim.trip, "reset": sim.reset_device}[action](tag)


# (action, target, whether VFD1 runs after it): three-wire, momentary start and stop on the inputs.
THREE_WIRE_STEPS = [
    ("press", "PB2", True),      # rising of run while stop is on: starts
    ("release", "PB2", True),    # keeps running: the drive holds its own run command
    ("press", "PB1", False),     # stop input drops: stops
    ("release", "PB1", False),   # no restart: the latch is gone
    ("press", "PB2", True),
    ("release", "PB2", True),
    ("power", "off", False),     # power loss: stops, latch lost
    ("power", "on", False),      # power return: no restart
    ("press", "PB2", True),      # a new start after power return starts it
    ("release", "PB2", True),
    ("trip", "VFD1", False),     # a trip stops it
    ("reset", "VFD1", False),    # resetting the fault does not restart it
    ("press", "PB1", False),     # start pressed while stop is held: no start
    ("press", "PB2", False),
    ("release", "PB1", False),   # stop released with start still held: no rising, no start
    ("release", "PB2", False),
    ("press", "PB2", True),      # a fresh press starts it
]

# The same steps on a two-wire drive: it runs only while the run input is energized.
TWO_WIRE_STEPS = [
    ("press", "PB2", True),
    ("release", "PB2", False),
    ("press", "PB2", True),
    ("power", "off", False),
    ("power", "on", True),       # the start is still held: a two-wire drive runs again at once
    ("press", "PB1", False),
    ("release", "PB1", True),    # two-wire: stop released with start held runs again
    ("release", "PB2", False),
]


@pytest.mark.parametrize("control, steps", [("three-wire", THREE_WIRE_STEPS), ("two-wire", TWO_WIRE_STEPS)])
def test_step_table_momentary_start_and_stop(control, steps):
    sim = simulator(control)
    assert sim.state_of("VFD1") is False and not sim.energized("PL1")
    for i, (action, tag, runs) in enumerate(steps):
        assert act(sim, action, tag).settled
        assert (sim.state_of("VFD1"), sim.energized("PL1")) == (runs, runs), f"step {i}: {action} {tag}"


# (action, target, VFD2 runs, VFD3 runs): a maintained contact on the run input, straight (VFD2) or
# through a relay (VFD3), both held by the stop PB4.
THREE_WIRE_MAINTAINED = [
    ("press", "PB3", True, False),
    ("press", "PB5", True, True),
    ("power", "off", False, False),
    ("power", "on", False, False),   # run inputs on again at power return, directly or by CR1: no restart
    ("release", "PB3", False, False),
    ("press", "PB3", True, False),   # the next rising starts it
    ("release", "PB5", True, False),
    ("press", "PB5", True, True),
    ("press", "PB4", False, False),
    ("release", "PB4", False, False),
]
TWO_WIRE_MAINTAINED = [
    ("press", "PB3", True, False),
    ("press", "PB5", True, True),
    ("power", "off", False, False),
    ("power", "on", True, True),     # two-wire control restarts at power return
    ("release", "PB3", False, True),
    ("release", "PB5", False, False),
]


@pytest.mark.parametrize("control, steps", [("three-wire", THREE_WIRE_MAINTAINED), ("two-wire", TWO_WIRE_MAINTAINED)])
def test_step_table_maintained_run_and_power_return(control, steps):
    sim = simulator(control)
    for i, (action, tag, vfd2, vfd3) in enumerate(steps):
        assert act(sim, action, tag).settled
        assert (sim.state_of("VFD2"), sim.state_of("VFD3")) == (vfd2, vfd3), f"step {i}: {action} {tag}"


def test_a_fresh_simulator_starts_on_the_first_press():
    sim = simulator("three-wire", reset=False)
    assert sim.press("PB2").settled and sim.state_of("VFD1")
    assert sim.release("PB2").settled and sim.state_of("VFD1")


def test_a_run_input_on_at_rest_is_no_start():
    # The run input is held on at rest through the stop's NC (a maintained run); rest is power-up.
    text = HEAD + """devices:
  PB1: {kind: pushbutton, function: stop}
  VFD1: {kind: drive, control: three-wire}
rungs:
  - paths:
      - [L1, PB1.NC, 1, VFD1.stop, X2]
      - [1, VFD1.run, X2]
"""
    sim = Circuit(load_schematic(text, "t.ctl.yaml")).simulator()
    assert sim.reset().settled and not sim.state_of("VFD1")


def _errors(text: str) -> list[tuple[int, int, str]]:
    result = load_text(text, "t.ctl.yaml")
    return [(d.line, d.column, d.message) for d in result.diagnostics]


def test_control_defaults_to_two_wire_and_old_files_stay_valid():
    sch = load_schematic(CIRCUIT.replace(", control: CONTROL", ""), "t.ctl.yaml")
    assert sch.devices["VFD1"].get("control") in (None, "two-wire")
    from ctllint.reading.kinds import three_wire
    assert not three_wire(sch.devices["VFD1"])


def test_a_bad_control_value_is_a_located_format_error():
    errors = _errors(CIRCUIT.replace("VFD2: {kind: soft-starter, control: CONTROL}", "VFD2: {kind: soft-starter, control: 3-wire}")
                     .replace("CONTROL", "two-wire"))
    assert len(errors) == 1
    line, column, message = errors[0]
    assert line == 12 and column == 39 and "control" in message and "two-wire, three-wire" in message


def test_a_three_wire_drive_without_its_stop_input_is_a_located_format_error():
    text = HEAD + """devices:
  PB2: {kind: pushbutton, function: start}
  VFD1: {kind: drive, control: three-wire}
rungs:
  - paths:
      - [L1, PB2.NO, 2, VFD1.run, X2]
"""
    errors = _errors(text)
    assert len(errors) == 1
    line, column, message = errors[0]
    assert (line, column) == (9, 25)  # at VFD1.run
    assert "VFD1.stop is drawn in no rung" in message and "control: two-wire" in message
    # the same drive set to two-wire control is valid (it runs while its run input is energized)
    assert _errors(text.replace("three-wire", "two-wire")) == []


def test_the_json_schema_knows_control():
    import jsonschema
    from ctllint.output.schema import build_schema
    from ruamel.yaml import YAML

    validator = jsonschema.Draft202012Validator(build_schema())
    for control, ok in (("three-wire", True), ("two-wire", True), ("3-wire", False)):
        data = YAML(typ="safe").load(CIRCUIT.replace("CONTROL", control))
        assert validator.is_valid(data) is ok, control


def test_states_show_whether_a_drive_runs_not_whether_an_input_is_energized():
    # What `ctllint simulate` prints: at rest and after power returns the stop input is energized,
    # yet the drive is stopped; the row must say so, as `check: {VFD1: off}` does.
    sim = simulator("three-wire")
    assert sim.energized("VFD1") and sim.states()["VFD1"] is False
    sim.press("PB2")
    sim.release("PB2")
    assert sim.states()["VFD1"] is True
    sim.power(False)
    sim.power(True)
    assert sim.energized("VFD1") and sim.states()["VFD1"] is False


def test_the_missing_stop_input_of_a_drive_from_a_device_file_is_reported_where_its_run_input_is_drawn(tmp_path):
    from ctllint.reading.loader import load_file

    (tmp_path / ".git").mkdir()
    (tmp_path / "lib").mkdir()
    (tmp_path / "lib" / "drives.ctl.yaml").write_text("ctllint: 1\ndevices:\n  VFD1: {kind: drive, control: three-wire}\n")
    # the device file alone is valid: it draws nothing
    assert load_file(str(tmp_path / "lib" / "drives.ctl.yaml")).diagnostics == []
    main = tmp_path / "fan.ctl.yaml"
    main.write_text("ctllint: 1\nuse: [lib/drives.ctl.yaml]\n" + HEAD.replace("ctllint: 1\n", "") + """devices:
  PB2: {kind: pushbutton, function: start}
rungs:
  - paths:
      - [L1, PB2.NO, 2, VFD1.run, X2]
""")
    diags = load_file(str(main)).diagnostics
    assert [(d.path, d.line, d.column) for d in diags] == [(str(main), 9, 25)]
    assert "VFD1.stop is drawn in no rung" in diags[0].message
