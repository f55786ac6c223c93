"""Terminal numbers: written in paths (``CR1.NO 13-14``) and assigned by the trade's numbering.

The expected numbers are worked by hand from EN 50005 / IEC 60947-5-1
(Annex M) numbering as we know it (from memory; common practice on panel
drawings): coils A1-A2; a device's contacts a sequence digit and a function
digit, NC 1-2, NO 3-4, timed NC 5-6, timed NO 7-8; overload relays 95-96
(NC) and 97-98 (NO); a changeover pole n1 (common), n2 (NC), n4 (NO).
"""
import textwrap

import pytest

from ctllint.commands.cli import main
from ctllint.reading.kinds import KindRegistry
from ctllint.reading.loader import load_text
from ctllint.output.schema import build_schema
from ctllint.reading.terminals import assign, parse

HEAD = """\
ctllint: 1
supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
devices:
  PB1: {kind: pushbutton, function: stop}
  PB2: {kind: pushbutton, function: start}
  M1: {kind: starter, coil: 120 VAC, overload: OL1}
  OL1: {kind: overload, setting: 4 A}
  TR1: {kind: timer, coil: 120 VAC, delay: on, preset: 5 s}
  CR2: {kind: relay, coil: 120 VAC, contacts: {poles: 2, throw: double}}
  FU1: {kind: fuse, rating: 2 A}
  PL1: {kind: pilot-light, voltage: 120 VAC}
  PL2: {kind: pilot-light, voltage: 120 VAC}
  PL3: {kind: pilot-light, voltage: 120 VAC}
  HN1: {kind: horn, voltage: 120 VAC}
  SS1: {kind: selector, positions: [off, hand, auto]}
"""


def load(rungs: str, head: str = HEAD):
    result = load_text(head + textwrap.dedent(rungs), "t.ctl.yaml")
    assert result.schematic is not None, result.diagnostics
    return result


def marks_by_text(sch):
    marks = assign(sch, KindRegistry.builtin())
    return [(el.text, marks[el.index].pair if el.index in marks else None) for el in sch.elements]


def test_numbers_assigned_as_en_50005_marks_them():
    sch = load("""\
        rungs:
          - paths:
              - [L1, FU1, 1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]
              - [2, M1.NO, 3]
          - paths:
              - [1, M1.NC, 5, PL1, X2]
              - [1, M1.NO, 6, TR1.coil, X2]
          - paths:
              - [1, TR1.NO, 7, CR2.coil, X2]
              - [1, TR1.NC, 8, HN1, X2]
          - paths:
              - [1, OL1.NO, 9, PL2, X2]
              - [1, SS1.auto, 10, PL3, X2]
        """).schematic
    assert marks_by_text(sch) == [
        ("FU1", "1-2"), ("PB1.NC", "11-12"), ("PB2.NO", "13-14"), ("M1.coil", "A1-A2"), ("OL1.NC", "95-96"),
        ("M1.NO", "13-14"),
        ("M1.NC", "21-22"), ("PL1", "X1-X2"), ("M1.NO", "33-34"), ("TR1.coil", "A1-A2"),
        ("TR1.NO", "17-18"), ("CR2.coil", "A1-A2"), ("TR1.NC", "25-26"), ("HN1", None),
        ("OL1.NO", "97-98"), ("PL2", "X1-X2"), ("SS1.auto", "13-14"), ("PL3", "X1-X2"),
    ]


def test_changeover_pole_shares_its_common_wire():
    sch = load("""\
        rungs:
          - paths:
              - [L1, CR2.coil, X2]
          - paths:
              - [L1, CR2.NO, 5, PL1, X2]
              - [L1, CR2.NC, 6, PL2, X2]
              - [7, CR2.NC, 8, PL3, X2]
        """).schematic
    # NO and NC on wire L1 share pole 1 (11 on L1, 14 NO, 12 NC); the NC on wires 7-8 needs pole 2.
    assert marks_by_text(sch)[1:] == [("CR2.NO", "11-14"), ("PL1", "X1-X2"), ("CR2.NC", "11-12"), ("PL2", "X1-X2"),
                                      ("CR2.NC", "21-22"), ("PL3", "X1-X2")]


def test_written_numbers_are_kept_and_their_sequence_skipped():
    sch = load("""\
        rungs:
          - paths:
              - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]
              - [2, M1.NO 14-13, 3]
          - paths:
              - [L1, M1.NO, 5, PL1 X2-X1, X2]
        """).schematic
    marks = assign(sch)
    seal, run, lamp = sch.elements[4], sch.elements[5], sch.elements[6]
    assert (marks[seal.index].left, marks[seal.index].right, marks[seal.index].written) == ("14", "13", True)
    assert seal.terminals == ("14", "13")
    assert marks[run.index].pair == "23-24"  # sequence 1 is taken by the written 13-14
    assert marks[lamp.index].pair == "X2-X1"


def test_files_without_numbers_load_as_before():
    result = load("""\
        rungs:
          - paths:
              - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]
        """)
    assert all(el.terminals is None for el in result.schematic.elements)
    assert [d for d in result.diagnostics if d.rule == "format"] == []


@pytest.mark.parametrize("element, why", [
    ("CR2.NO 13", "LEFT-RIGHT"),
    ("CR2.NO 13-13", "LEFT-RIGHT"),
    ("CR2.NO 1-2-3", "LEFT-RIGHT"),
    ("CR2.NO 1-2 extra", "LEFT-RIGHT"),
])
def test_malformed_numbers_are_format_errors(element, why):
    text = HEAD + f"rungs:\n  - paths:\n      - [L1, {element}, 3, CR2.coil, X2]\n"
    result = load_text(text, "t.ctl.yaml")
    assert result.schematic is None
    [diag] = [d for d in result.diagnostics if d.rule == "format"]
    assert (diag.line, why in diag.message) == (text.count("\n"), True)


def test_one_written_terminal_on_two_wires_is_a_format_error():
    text = HEAD + textwrap.dedent("""\
        rungs:
          - paths:
              - [L1, CR2.coil, X2]
          - paths:
              - [L1, CR2.NO 13-14, 5, PL1, X2]
              - [L1, CR2.NC 21-14, 6, PL2, X2]
        """)
    result = load_text(text, "t.ctl.yaml")
    assert result.schematic is None
    [diag] = result.diagnostics
    assert diag.line == text.count("\n")
    assert "terminal 14 of CR2 is written on wire 6 here and on wire 5" in diag.message


def test_shared_written_terminal_on_one_wire_is_fine():
    load("""\
        rungs:
          - paths:
              - [L1, CR2.coil, X2]
          - paths:
              - [L1, CR2.NO 11-14, 5, PL1, X2]
              - [L1, CR2.NC 11-12, 6, PL2, X2]
        """)


def test_parse():
    assert parse("13-14") == ("13", "14")
    assert parse("+24-0V") == ("+24", "0V")  # a power terminal pair
    assert parse("A1-A2") == ("A1", "A2")
    assert parse("A1") is None and parse("A1-A1") is None and parse("1-2-3") is None


def test_contact_count_names_the_terminal_pair(tmp_path, capsys):
    path = tmp_path / "c.ctl.yaml"
    path.write_text(HEAD.replace("overload: OL1}", "overload: OL1, contacts: {NO: 1, NC: 1}}") + textwrap.dedent("""\
        rungs:
          - paths:
              - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]
              - [2, M1.NO, 3]
          - paths:
              - [L1, M1.NO, 5, PL1, X2]
        """))
    assert main(["check", str(path), "--select", "contact-count"]) == 1
    out = capsys.readouterr().out
    assert "M1.NO (terminals 23-24) in rung 2 is NO contact number 2" in out


def test_schema_accepts_numbers_and_refuses_half_ones():
    jsonschema = pytest.importorskip("jsonschema")
    validator = jsonschema.Draft7Validator(build_schema())
    base = {"ctllint": 1, "supplies": {"ctl": {"hot": "L1", "common": "X2", "voltage": "120 VAC"}},
            "devices": {"CR1": {"kind": "relay"}}}
    good = dict(base, rungs=[{"paths": [["L1", "CR1.NO 13-14", 3, "CR1.coil A1-A2", "X2"]]}])
    bad = dict(base, rungs=[{"paths": [["L1", "CR1.NO 13", 3, "CR1.coil", "X2"]]}])
    assert list(validator.iter_errors(good)) == []
    assert list(validator.iter_errors(bad))


def test_drawing_shows_numbers_beside_each_lead(tmp_path, capsys):
    path = tmp_path / "d.ctl.yaml"
    path.write_text(HEAD + textwrap.dedent("""\
        rungs:
          - paths:
              - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]
              - [3, M1.NO 14-13, 2]
        """))
    assert main(["draw", str(path), "--no-findings"]) == 0
    svg = capsys.readouterr().out
    import xml.etree.ElementTree as ET

    root = ET.fromstring(svg)
    ns = {"s": "http://www.w3.org/2000/svg"}
    groups = {g.get("data-element"): g for g in root.iter("{http://www.w3.org/2000/svg}g") if g.get("data-element")}
    assert groups["M1.coil"].get("data-terminals") == "A1-A2"
    assert groups["OL1.NC"].get("data-terminals") == "95-96"
    seal = groups["M1.NO"]
    assert seal.get("data-terminals") == "14-13" and seal.get("data-terminals-written") == "true"
    # The seal-in is drawn left to right from wire 2 to wire 3, so 13 (on wire 2) stands left of 14.
    texts = {t.text: float(t.get("x")) for t in seal.findall("s:text", ns) if "termno" in t.get("class")}
    assert texts["13"] < texts["14"]
    coil = {t.text: float(t.get("x")) for t in groups["M1.coil"].findall("s:text", ns) if "termno" in t.get("class")}
    assert coil["A1"] < coil["A2"]


def test_xref_lists_terminals(tmp_path, capsys):
    path = tmp_path / "x.ctl.yaml"
    path.write_text(HEAD + textwrap.dedent("""\
        rungs:
          - paths:
              - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]
              - [2, M1.NO, 3]
          - paths:
              - [L1, M1.NC, 5, PL1, X2]
        """))
    assert main(["xref", str(path)]) == 0
    row = next(ln for ln in capsys.readouterr().out.splitlines() if ln.startswith("M1 "))
    assert "A1-A2  NO 13-14  NC 21-22" in row


def test_diff_reports_changed_written_numbers(tmp_path, capsys):
    rungs = "rungs:\n  - paths:\n      - [L1, PB1.NC{t}, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n"
    a, b = tmp_path / "a.ctl.yaml", tmp_path / "b.ctl.yaml"
    a.write_text(HEAD + rungs.format(t=" 11-12"))
    b.write_text(HEAD + rungs.format(t=" 21-22"))
    main(["diff", str(a), str(b)])
    out = capsys.readouterr().out
    assert "PB1.NC on wires L1-2 (terminals 11-12 -> 21-22)" in out


def test_an_overload_contact_written_95_96_leaves_the_other_nc_unnumbered():
    sch = load("""\
        rungs:
          - paths:
              - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]
              - [2, M1.NO, 3]
          - paths:
              - [L1, OL1.NC 95-96, 5, PL1, X2]
        """).schematic
    marks = assign(sch)
    first, written = [el for el in sch.elements if el.tag == "OL1"]
    assert first.index not in marks  # 95-96 is written on the other one: a second NC must be written
    assert marks[written.index].pair == "95-96"
