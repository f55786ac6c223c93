"""Resistive loads in rungs (space heater, panel heater, resistor) and a selector's cam table."""
import textwrap

import pytest

from ctllint.circuit.analysis import Circuit
from ctllint.commands.cli import main
from ctllint.review.diff import semantic_diff
from ctllint.reading.loader import load_text
from ctllint.reading.terminals import assign
from ctllint.testing import load_schematic

HOA = textwrap.dedent("""\
    ctllint: 1
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      SS1: {kind: selector, positions: [off, hand, auto], cams: {HA: [hand, auto], OA: [off, auto]}}
      PL1: {kind: pilot-light, voltage: 120 VAC}
      PL2: {kind: pilot-light, voltage: 120 VAC}
      PL3: {kind: pilot-light, voltage: 120 VAC}
      HTR1: {kind: space-heater, voltage: 120 VAC, power: 100 W}
    rungs:
      - paths:
          - [L1, SS1.HA, 2, PL1, X2]
      - paths:
          - [L1, SS1.OA, 3, PL2, X2]
      - paths:
          - [L1, SS1.hand, 4, PL3, X2]
      - paths:
          - [L1, SS1.HA, 5, HTR1, X2]
    """)


def test_cam_blocks_close_in_every_position_they_list():
    sim = Circuit(load_schematic(HOA)).simulator()
    sim.reset()
    table = {}
    for position in ("off", "hand", "auto"):
        sim.set("SS1", position)
        table[position] = {t for t in ("PL1", "PL2", "PL3", "HTR1") if sim.energized(t)}
    # Worked from the cam table by hand: HA closed in hand and auto, OA in off and auto, hand in hand alone.
    assert table == {"off": {"PL2"}, "hand": {"PL1", "PL3", "HTR1"}, "auto": {"PL1", "PL2", "HTR1"}}


def test_resistive_loads_are_loads_and_not_inductive():
    sch = load_schematic(HOA)
    heater = [el for el in sch.elements if el.tag == "HTR1"][0]
    assert heater.role == "load" and heater.inductive is False


def test_resistive_current_is_watts_over_volts_with_no_inrush():
    from ctllint_plugins.ratings import load_figures

    sch = load_schematic(HOA)
    figures = load_figures(sch.devices["HTR1"], 120.0)
    assert figures.inrush_a == pytest.approx(100 / 120) and figures.sealed_a == pytest.approx(100 / 120)


def test_cam_block_terminals_are_no_blocks_in_sequence():
    sch = load_schematic(HOA)
    marks = assign(sch)
    assert [marks[el.index].pair for el in sch.elements if el.tag == "SS1"] == ["13-14", "23-24", "33-34", "43-44"]


@pytest.mark.parametrize("cams, line, words", [
    ("{HA: [hand, remote]}", 5, "'remote', which is not one of its positions"),
    ("{hand: [hand, auto]}", 5, "has the name of a position"),
    ("{HA: [hand, hand]}", 5, "lists position 'hand' twice"),
    ("{HA: []}", 5, "closed in no position"),
    ("{H.A: [hand]}", 5, "holds a dot or a space"),
])
def test_cam_table_errors_are_format_errors(cams, line, words):
    text = HOA.replace("cams: {HA: [hand, auto], OA: [off, auto]}", f"cams: {cams}")
    result = load_text(text, "c.ctl.yaml")
    assert result.schematic is None
    assert any(d.line == line and words in d.message for d in result.diagnostics), result.diagnostics


def test_set_names_a_position_not_a_cam_block():
    text = HOA + "expect:\n  - name: s\n    steps:\n      - set: {SS1: HA}\n"
    result = load_text(text, "c.ctl.yaml")
    assert result.schematic is None
    assert "not one of its positions" in result.diagnostics[0].message


def test_diff_shows_a_changed_cam_table(tmp_path, capsys):
    old = load_schematic(HOA, str(tmp_path / "a.ctl.yaml"))
    new = load_schematic(HOA.replace("OA: [off, auto]", "OA: [off]"), str(tmp_path / "b.ctl.yaml"))
    d = semantic_diff(old, new)
    [dev] = d.devices
    assert dev.tag == "SS1" and [f.field for f in dev.fields] == ["cams"]


def test_drawing_shows_heater_symbol_and_cam_positions(tmp_path, capsys):
    path = tmp_path / "h.ctl.yaml"
    path.write_text(HOA)
    assert main(["draw", str(path), "--no-findings"]) == 0
    svg = capsys.readouterr().out
    import xml.etree.ElementTree as ET

    root = ET.fromstring(svg)
    groups = [g for g in root.iter("{http://www.w3.org/2000/svg}g") if g.get("data-element")]
    heater = next(g for g in groups if g.get("data-element") == "HTR1")
    shapes = [child.tag.split("}")[1] for child in heater]
    assert "rect" in shapes and "polyline" in shapes and "circle" not in shapes
    ha = next(g for g in groups if g.get("data-element") == "SS1.HA")
    assert ha.get("data-closed-in") == "hand auto"


ALTERNATOR = textwrap.dedent("""\
    ctllint: 1
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      LSL: {kind: float-switch}
      ALT1: {kind: alternating-relay, coil: 120 VAC}
      PL1: {kind: pilot-light, voltage: 120 VAC}
      PL2: {kind: pilot-light, voltage: 120 VAC}
    rungs:
      - restart: automatic
        paths:
          - [L1, LSL.NO, 2, ALT1.coil, X2]
      - paths:
          - [2, ALT1.A, 3, PL1, X2]
          - [2, ALT1.B, 4, PL2, X2]
    """)


def test_alternating_relay_outputs_take_turns():
    sim = Circuit(load_schematic(ALTERNATOR)).simulator()
    sim.reset()
    seen = []
    for _ in range(4):  # four float cycles: A, B, A, B (the turn passes at each drop-out)
        sim.press("LSL")
        seen.append((sim.energized("PL1"), sim.energized("PL2")))
        sim.release("LSL")
        assert not sim.energized("PL1") and not sim.energized("PL2")
    assert seen == [(True, False), (False, True), (True, False), (False, True)]


def test_alternating_relay_parts_and_margin(tmp_path, capsys):
    sch = load_schematic(ALTERNATOR)
    assert [(el.text, el.role) for el in sch.elements] == [
        ("LSL.NO", "contact"), ("ALT1.coil", "load"), ("ALT1.A", "contact"), ("PL1", "load"), ("ALT1.B", "contact"), ("PL2", "load")]
    marks = assign(sch)
    assert [marks.get(el.index) and marks[el.index].pair for el in sch.elements if el.tag == "ALT1"] == ["A1-A2", None, None]
    path = tmp_path / "a.ctl.yaml"
    path.write_text(ALTERNATOR)
    assert main(["xref", str(path)]) == 0
    assert "A: 2  B: 2" in capsys.readouterr().out


LATCH = textwrap.dedent("""\
    ctllint: 1
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      PB1: {kind: pushbutton, function: other}
      PB2: {kind: pushbutton, function: other}
      LR1: {kind: latching-relay, coil: 120 VAC}
      PL1: {kind: pilot-light, voltage: 120 VAC}
      PL2: {kind: pilot-light, voltage: 120 VAC}
    rungs:
      - paths:
          - [L1, PB1.NO, 2, LR1.set, X2]
      - paths:
          - [L1, PB2.NO, 3, LR1.reset, X2]
      - paths:
          - [L1, LR1.NO, 4, PL1, X2]
          - [L1, LR1.NC, 5, PL2, X2]
    """)


def test_latching_relay_holds_without_power_and_reset_wins():
    sim = Circuit(load_schematic(LATCH)).simulator()
    sim.reset()
    lamps = lambda: (sim.energized("PL1"), sim.energized("PL2"))  # noqa: E731
    assert lamps() == (False, True) and sim.state_of("LR1") is False
    sim.press("PB1")
    sim.release("PB1")
    assert lamps() == (True, False) and sim.state_of("LR1") is True  # set, and it stays set
    sim.power(False)
    assert lamps() == (False, False) and sim.state_of("LR1") is True  # no power, still set
    sim.power(True)
    assert lamps() == (True, False)
    sim.press("PB1")
    sim.press("PB2")  # set and reset both on: reset wins
    assert lamps() == (False, True)
    sim.release("PB2")
    assert lamps() == (True, False)  # set alone again
    sim.release("PB1")
    sim.press("PB2")
    sim.release("PB2")
    assert lamps() == (False, True) and sim.state_of("LR1") is False


def test_latching_relay_coils_and_terminals(tmp_path, capsys):
    sch = load_schematic(LATCH)
    assert [(el.text, el.role) for el in sch.elements if el.tag == "LR1"] == [
        ("LR1.set", "load"), ("LR1.reset", "load"), ("LR1.NO", "contact"), ("LR1.NC", "contact")]
    marks = assign(sch)
    assert [marks[el.index].pair for el in sch.elements if el.tag == "LR1"] == ["A1-A2", "B1-B2", "13-14", "21-22"]
    path = tmp_path / "l.ctl.yaml"
    path.write_text(LATCH)
    assert main(["xref", str(path)]) == 0
    row = next(ln for ln in capsys.readouterr().out.splitlines() if ln.startswith("LR1"))
    assert row.split()[:3] == ["LR1", "latching-relay", "1"] and "set A1-A2  reset B1-B2  NO 13-14  NC 21-22" in row
    assert main(["draw", str(path), "--no-findings"]) == 0
    svg = capsys.readouterr().out
    assert 'data-coil="LR1"' in svg  # the contacts' rungs beside the set coil


SAFETY = textwrap.dedent("""\
    ctllint: 1
    supplies:
      dc: {hot: "+24", common: 0V, voltage: 24 VDC}
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      ES1: {kind: pushbutton, function: emergency-stop, action: maintained}
      LS1: {kind: limit-switch}
      PB3: {kind: pushbutton, function: reset}
      SR1: {kind: safety-relay, coil: 24 VDC}
      K1: {kind: contactor, coil: 120 VAC}
    rungs:
      - restart: automatic
        paths:
          - ["+24", SR1.power, 0V]
          - ["+24", ES1.NC, 11, SR1.ch1, 0V]
          - ["+24", LS1.NC, 12, SR1.ch2, 0V]
      - paths:
          - ["+24", K1.NC, 21, PB3.NO, 23, SR1.feedback, 0V]
      - paths:
          - [L1, SR1.NO, 5, K1.coil, X2]
    """)


def test_safety_relay_needs_both_channels_and_a_reset():
    sim = Circuit(load_schematic(SAFETY)).simulator()
    sim.reset()
    assert not sim.energized("K1")  # no reset yet
    sim.press("PB3")
    sim.release("PB3")
    assert sim.energized("K1") and sim.state_of("SR1")
    sim.press("LS1")  # channel 2 opens (guard)
    assert not sim.energized("K1")
    sim.release("LS1")
    assert not sim.energized("K1")  # both channels closed again, but it waits for a reset
    sim.press("ES1")
    sim.press("PB3")
    assert not sim.energized("K1")  # a reset with a channel open does nothing
    sim.release("PB3")
    sim.release("ES1")
    assert not sim.energized("K1")
    sim.power(False)
    sim.power(True)
    sim.press("PB3")
    assert sim.energized("K1")


def test_safety_relay_terminals():
    sch = load_schematic(SAFETY)
    marks = assign(sch)
    assert [(el.part, marks[el.index].pair) for el in sch.elements if el.tag == "SR1"] == [
        ("power", "A1-A2"), ("ch1", "S11-S12"), ("ch2", "S21-S22"), ("feedback", "Y1-Y2"), ("NO", "13-14")]
