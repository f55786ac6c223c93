"""Reading the large sections entry by entry while the file is parsed (yamlsafe.compose ``sections``).

The loader must give the same model and the same errors as reading a whole
tree would; these tests pin the cases where streaming could differ: sections
in any order, errors after streamed entries, sections that cannot be streamed
(aliases, wrong types), duplicates by text, and the element limit.
"""
import textwrap

import pytest

from ctllint.reading.loader import load_text
from ctllint.reading.model import Element, Location, Path
from ctllint.reading.yamlsafe import Limits, MappingNode, SequenceNode, YamlProblem, compose

from test_loader import GOOD


def _reader(store):
    return lambda key, node: store.append((key.value if key is not None else None, node))


def test_compose_hands_each_entry_over_and_keeps_none():
    seen_devices, seen_rungs = [], []
    root = compose(GOOD, Limits(), {"devices": (MappingNode, _reader(seen_devices)), "rungs": (SequenceNode, _reader(seen_rungs))})
    sections = {k.value: v for k, v in root.value}
    assert sections["devices"].streamed and sections["devices"].value == []
    assert sections["rungs"].streamed and sections["rungs"].value == []
    assert [k for k, _ in seen_devices] == ["PB1", "PB2", "M1", "OL1", "MTR1", "SS1"]
    assert [n.line for _, n in seen_rungs] == [16, 20]
    assert not sections["supplies"].streamed and sections["supplies"].value  # not asked for: built as usual


def test_compose_streams_only_a_section_of_the_class_asked_for_without_anchor():
    text = "devices: [a, b]\nrungs: &r [x]\nother: *r\n"
    got = []
    root = compose(text, Limits(), {"devices": (MappingNode, _reader(got)), "rungs": (SequenceNode, _reader(got))})
    sections = {k.value: v for k, v in root.value}
    assert got == []  # a list where a mapping is asked for; an anchored list an alias may name again
    assert [n.value for n in sections["devices"].value] == ["a", "b"]
    assert [n.value for n in sections["rungs"].value] == ["x"]


def test_a_yaml_error_after_streamed_entries_still_raises():
    got = []
    with pytest.raises(YamlProblem) as info:
        compose("devices:\n  A: {kind: fuse}\n  B: [\n", Limits(), {"devices": (MappingNode, _reader(got))})
    assert got and info.value.line >= 3


def test_loader_keeps_only_the_yaml_error_when_the_end_of_the_file_is_broken():
    text = GOOD.replace("      PB1: {kind: pushbutton, function: stop}", "      PB1: {kind: pushbutton, function: stopp}") + "  - oops: [\n"
    result = load_text(text, "t.ctl.yaml")
    assert result.schematic is None
    assert len(result.diagnostics) == 1 and result.diagnostics[0].message.startswith("YAML")


def test_errors_of_streamed_sections_wait_for_the_version_check():
    text = GOOD.replace("ctllint: 1\n", "ctllint: 7\n").replace("function: stop}", "function: stopp}")
    messages = [d.message for d in load_text(text, "t.ctl.yaml").diagnostics]
    assert len(messages) == 1 and "format version" in messages[0]
    text = GOOD.replace("function: stop}", "function: stopp}")
    messages = [d.message for d in load_text(text, "t.ctl.yaml").diagnostics]
    assert len(messages) == 1 and "stopp" in messages[0]


def test_sections_in_any_order_give_the_same_model():
    head, rest = GOOD.split("devices:\n")
    devices, rest = rest.split("rungs:\n")
    rungs, expect = rest.split("expect:\n")
    reordered = head + "rungs:\n" + rungs + "expect:\n" + expect + "devices:\n" + devices
    a = load_text(GOOD, "t.ctl.yaml").schematic
    b = load_text(reordered, "t.ctl.yaml").schematic
    assert b is not None
    assert [(e.text, e.left, e.right, e.role, e.inductive) for e in a.elements] == [(e.text, e.left, e.right, e.role, e.inductive) for e in b.elements]
    assert list(a.devices) == list(b.devices)
    assert {t: d.fields for t, d in a.devices.items()} == {t: d.fields for t, d in b.devices.items()}


def test_an_aliased_devices_section_is_read_whole():
    text = textwrap.dedent("""\
        ctllint: 1
        supplies: {ctl: {hot: L1, common: X2, voltage: 120 VAC}}
        devices: &all
          L: {kind: pilot-light, voltage: 120 VAC}
        rungs:
          - paths: [[L1, L, X2]]
        """)
    sch = load_text(text, "t.ctl.yaml").schematic
    assert list(sch.devices) == ["L"] and sch.elements[0].role == "load"


def test_device_tags_equal_as_text_are_duplicates_when_streamed():
    text = textwrap.dedent("""\
        ctllint: 1
        supplies: {ctl: {hot: L1, common: X2, voltage: 120 VAC}}
        devices:
          10: {kind: pilot-light, voltage: 120 VAC}
          "10": {kind: pilot-light, voltage: 120 VAC}
        rungs:
          - paths: [[L1, "10", X2]]
        """)
    diags = load_text(text, "t.ctl.yaml").diagnostics
    assert [(d.line, d.message) for d in diags] == [(5, "duplicate key '10' in devices (first at line 4)")]


def test_the_element_limit_is_said_once():
    rungs = "".join(f"  - paths: [[L1, L, X2], [L1, L, X2]]\n" for _ in range(6))
    text = "ctllint: 1\nsupplies: {ctl: {hot: L1, common: X2, voltage: 120 VAC}}\ndevices:\n  L: {kind: pilot-light, voltage: 120 VAC}\nrungs:\n" + rungs
    diags = load_text(text, "t.ctl.yaml", limits=Limits(max_elements=5)).diagnostics
    assert [d.message for d in diags] == ["more than 5 elements; limit max_elements"]
    assert diags[0].line == 8  # the path that would pass the limit


def test_packed_positions_read_back_as_locations():
    sch = load_text(GOOD, "t.ctl.yaml").schematic
    m1 = sch.devices["M1"]
    assert m1.loc == Location("t.ctl.yaml", 11, 3)
    assert m1.at("coil") == Location("t.ctl.yaml", 11, 29)
    assert m1.at("no such field") == m1.loc
    assert m1.field_locs["kind"] == Location("t.ctl.yaml", 11, 14)
    path = sch.rungs[0].paths[0]
    assert [(w, at.column) for w, at in zip(path.wires, path.wire_locs)] == [("L1", 10), ("2", 22), ("3", 33), ("4", 45), ("X2", 56)]
    el = path.elements[1]
    assert (el.text, el.loc) == ("PB2.NO", Location("t.ctl.yaml", 18, 25))


def test_hand_built_model_objects_keep_what_they_were_given():
    at = Location("x", 3, 4)
    el = Element(0, "M1", "coil", "M1.coil", at, 0, "1", "2", "load", True)
    assert (el.text, el.loc, el.role, el.inductive) == ("M1.coil", at, "load", True)
    with pytest.raises(ValueError):
        Element(0, "M1", "coil", "M1.NO", at, 0, "1", "2")
    p = Path(["1", "2"], [Location("x", 3, 1), Location("x", 3, 9)], [el], at)
    assert p.wire_locs == [Location("x", 3, 1), Location("x", 3, 9)]


def test_a_large_files_text_reads_back_exactly_and_its_suppressions_still_work():
    from ctllint.testing import checker

    body = GOOD.replace("  PB1: {kind: pushbutton, function: stop}\n", "  PB1: {kind: pushbutton, function: stop}  # ctllint-allow: unused-device -- spare\n")
    filler = "".join(f"  SP{i}: {{kind: pilot-light, voltage: 120 VAC}}  # ctllint-allow: unused-device -- spare light\n" for i in range(1000))
    text = body.replace("  SS1:", filler + "  SS1:", 1)
    assert len(text) > 64 * 1024
    sch = load_text(text, "t.ctl.yaml").schematic
    assert isinstance(sch._text, bytes) and len(sch._text) < len(text) // 4  # held packed
    assert sch.text == text and sch.text_lines == text.splitlines() and sch.line_count == len(text.splitlines())
    found = [(d.line, d.rule) for d in checker().check_text(text).diagnostics]
    assert (9, "suppression") in found  # PB1 is used: its suppression suppresses nothing, and says so
    assert not any(rule == "unused-device" for _, rule in found)  # the spare lights' suppressions hold
