"""``ctllint export`` and ``ctllint diff`` on drives, soft starters, motor-protective breakers and safety relays.

The wire list, terminal plan and bill-of-materials rows below were written by
hand from the drawing of MIXER, by the rules README "Panel documents" and
"Terminal numbers" give: a safety relay's inputs A1-A2, S11-S12, S21-S22,
Y1-Y2 (ctllint.reading.terminals, from memory of such modules); a drive's or soft
starter's command inputs RUN+/RUN- and STP+/STP- (our own marks); a
breaker used bare 1-2; every device's contacts numbered in file order, NC
x1-x2, NO x3-x4 (a drive's fault relay contact and a motor breaker's
trip-alarm contact numbered as any contact); pilot lights X1-X2;
pushbuttons in the field, everything else in the panel.
"""
import textwrap

from ctllint.commands.cli import main
from ctllint.review.diff import ADDED, CHANGED, MOVED, REMOVED, render_text, semantic_diff
from ctllint.output.export import bom_rows, export
from ctllint.reading.loader import load_text

MIXER = textwrap.dedent("""\
    ctllint: 1
    title: Mixer panel
    supplies:
      dc: {hot: "+24", common: 0V, voltage: 24 VDC}
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      ES1: {kind: pushbutton, function: emergency-stop, action: maintained, contacts: {NC: 2}}
      PB3: {kind: pushbutton, function: reset}
      SR1: {kind: safety-relay, coil: 24 VDC}
      F1: {kind: fuse, rating: 1 A}
      K1: {kind: contactor, coil: 120 VAC}
      Q1: {kind: motor-breaker, rating: 16 A, setting: 11 A, feeds: MTR1}
      VFD1: {kind: drive, coil: 120 VAC, current: 8 mA, feeds: MTR2}
      SST1: {kind: soft-starter, coil: 120 VAC, current: 10 mA, feeds: MTR1}
      PL1: {kind: pilot-light, voltage: 120 VAC}
      MTR1: {kind: motor, power: 7.5 hp, voltage: 460 V, phases: 3, fla: 11 A}
      MTR2: {kind: motor, power: 5 hp, voltage: 460 V, phases: 3, fla: 7.6 A}
    rungs:
      - title: Safety relay
        paths:
          - ["+24", SR1.power, 0V]
          - ["+24", ES1.NC, 11, SR1.ch1, 0V]
          - ["+24", F1, 10, ES1.NC, 12, SR1.ch2, 0V]
          - ["+24", K1.NC, 21, PB3.NO, 22, SR1.feedback, 0V]
      - title: Safe power
        paths:
          - [L1, Q1, 1, SR1.NO, 2, K1.coil, X2]
          - [2, VFD1.stop, X2]
          - [2, SST1.run, X2]
      - title: Drive run
        paths:
          - [1, K1.NO, 3, VFD1.run, X2]
      - title: Trouble light
        paths:
          - [1, Q1.trip-NO, 4, PL1, X2]
          - [1, VFD1.fault-NO, 4]
    """)

# By hand: hot rails first (L1 has one terminal, Q1:1, so no conductor), then wires by number,
# common rails last; panel terminals daisy-chained in drawing order, the last to the wire's strip
# point; each field conductor to its own strip point.
MIXER_WIRES = """\
wire,from,to,where
+24,SR1:A1,F1:1,panel
+24,F1:1,K1:11,panel
+24,K1:11,TB1:1,panel
+24,TB1:1,ES1:11,field
1,Q1:2,SR1:13,panel
1,SR1:13,K1:23,panel
1,K1:23,Q1:13,panel
1,Q1:13,VFD1:13,panel
2,SR1:14,K1:A1,panel
2,K1:A1,VFD1:STP+,panel
2,VFD1:STP+,SST1:RUN+,panel
3,K1:24,VFD1:RUN+,panel
4,Q1:14,PL1:X1,panel
4,PL1:X1,VFD1:14,panel
10,F1:2,TB1:2,panel
10,TB1:2,ES1:21,field
11,SR1:S11,TB1:3,panel
11,TB1:3,ES1:12,field
12,SR1:S21,TB1:4,panel
12,TB1:4,ES1:22,field
21,K1:12,TB1:5,panel
21,TB1:5,PB3:13,field
22,SR1:Y1,TB1:6,panel
22,TB1:6,PB3:14,field
0V,SR1:A2,SR1:S12,panel
0V,SR1:S12,SR1:S22,panel
0V,SR1:S22,SR1:Y2,panel
X2,K1:A2,VFD1:STP-,panel
X2,VFD1:STP-,SST1:RUN-,panel
X2,SST1:RUN-,VFD1:RUN-,panel
X2,VFD1:RUN-,PL1:X2,panel
"""

MIXER_TERMINALS = """\
strip,point,wire,field device,field terminal,kind,from
TB1,1,+24,ES1,11,pushbutton,K1:11
TB1,2,10,ES1,21,pushbutton,F1:2
TB1,3,11,ES1,12,pushbutton,SR1:S11
TB1,4,12,ES1,22,pushbutton,SR1:S21
TB1,5,21,PB3,13,pushbutton,K1:12
TB1,6,22,PB3,14,pushbutton,SR1:Y1
"""


def mixer(text: str = MIXER):
    result = load_text(text, "mixer.ctl.yaml")
    assert result.schematic is not None, result.diagnostics
    return result.schematic


def test_wire_list_of_the_new_kinds_matches_the_one_written_by_hand():
    assert export("wires", mixer()) == MIXER_WIRES


def test_terminal_plan_of_the_new_kinds_matches_the_one_written_by_hand():
    assert export("terminals", mixer()) == MIXER_TERMINALS


def test_bill_of_materials_names_the_new_kinds_with_what_is_bought():
    rows = bom_rows(mixer())
    # the fields that say what is bought, not the motor each names in `feeds`
    assert ["drive", "coil 120 VAC; current 8 mA", 1, "VFD1"] in rows
    assert ["soft-starter", "coil 120 VAC; current 10 mA", 1, "SST1"] in rows
    assert ["motor-breaker", "rating 16 A; setting 11 A", 1, "Q1"] in rows
    assert ["safety-relay", "coil 24 VDC", 1, "SR1"] in rows
    assert not any("MTR" in r[1] for r in rows)


def test_export_command_writes_the_new_kinds(tmp_path, capsys):
    path = tmp_path / "mixer.ctl.yaml"
    path.write_text(MIXER, encoding="utf-8")
    out = tmp_path / "wires.csv"
    assert main(["export", "wires", str(path), "-o", str(out)]) == 0
    assert out.read_text(encoding="utf-8") == MIXER_WIRES


# -- diff ----------------------------------------------------------------------------------


def _items(d):
    out = [("device", dev.tag, dev.change) + tuple((f.field, f.old, f.new) for f in dev.fields) for dev in d.devices]
    for r in d.rungs:
        out += [("element", r.title, e.change, e.element, e.old_wires, e.new_wires) for e in r.elements]
    return sorted(out, key=repr)


def test_diff_names_a_drive_field_and_a_motor_breaker_setting_changed():
    new = MIXER.replace("VFD1: {kind: drive, coil: 120 VAC, current: 8 mA, feeds: MTR2}",
                        'VFD1: {kind: drive, coil: 120 VAC, current: 8 mA, feeds: MTR2, estop_exempt: "glycol freeze protection"}')
    new = new.replace("setting: 11 A, feeds: MTR1}", "setting: 10 A, feeds: MTR1}")
    d = semantic_diff(mixer(), mixer(new))
    assert _items(d) == sorted([
        ("device", "Q1", CHANGED, ("setting", "11 A", "10 A")),
        ("device", "VFD1", CHANGED, ("estop_exempt", None, "glycol freeze protection")),
    ], key=repr)


def test_diff_names_moved_safety_relay_channel_and_drive_inputs():
    # the e-stop taken out of the safety relay's second channel, the soft starter given a stop input
    new = MIXER.replace('["+24", F1, 10, ES1.NC, 12, SR1.ch2, 0V]', '["+24", F1, 10, SR1.ch2, 0V]')
    new = new.replace("      - [2, SST1.run, X2]\n", "      - [2, SST1.run, X2]\n      - [2, SST1.stop, X2]\n")
    d = semantic_diff(mixer(), mixer(new))
    assert _items(d) == sorted([
        ("element", "Safety relay", REMOVED, "ES1.NC", ("10", "12"), None),
        ("element", "Safety relay", MOVED, "SR1.ch2", ("12", "0V"), ("10", "0V")),
        ("element", "Safe power", ADDED, "SST1.stop", None, ("2", "X2")),
    ], key=repr)
    text = render_text([d])
    assert "SR1.ch2" in text and "SST1.stop" in text


def test_diff_names_a_trip_alarm_contact_changed_to_an_auxiliary_and_written_drive_terminals():
    old = MIXER.replace("[1, K1.NO, 3, VFD1.run, X2]", "[1, K1.NO, 3, VFD1.run 5-6, X2]")
    new = MIXER.replace("[1, K1.NO, 3, VFD1.run, X2]", "[1, K1.NO, 3, VFD1.run 5-7, X2]")
    new = new.replace("[1, Q1.trip-NO, 4, PL1, X2]", "[1, Q1.NO, 4, PL1, X2]")
    d = semantic_diff(mixer(old), mixer(new))
    elements = {(e.change, e.element) for r in d.rungs for e in r.elements}
    assert (REMOVED, "Q1.trip-NO") in elements and (ADDED, "Q1.NO") in elements
    text = render_text([d])
    assert "terminals 5-6 -> 5-7" in text and "VFD1.run" in text
