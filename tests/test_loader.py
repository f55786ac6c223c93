"""The loader: FORMAT.md files load with positions; everything else is a located format error."""
import textwrap

import pytest

from ctllint.reading.loader import load_text
from ctllint.reading.model import Severity

GOOD = textwrap.dedent("""\
    ctllint: 1
    title: Cider press line, grinder motor
    supplies:
      ctl:
        hot: L1
        common: X2
        voltage: 120 VAC
    devices:
      PB1: {kind: pushbutton, function: stop}
      PB2: {kind: pushbutton, function: start}
      M1: {kind: starter, coil: 120 VAC, overload: OL1, feeds: MTR1, inrush: 200 VA, sealed: 25 VA}
      OL1: {kind: overload, setting: 44 A}
      MTR1: {kind: motor, power: 30 hp, voltage: 460 V, phases: 3}
      SS1: {kind: selector, positions: [off, hand, auto]}
    rungs:
      - title: Grinder motor
        paths:
          - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]
          - [2, M1.NO, 3]
      - number: 10
        paths:
          - [L1, SS1.hand, 5, M1.NO, 3]
    expect:
      - name: start latches
        steps:
          - press: PB2
          - release: PB2
          - check: {M1: on}
          - set: {SS1: auto}
          - wait: 5 s
          - power: off
""")


def load(text):
    return load_text(textwrap.dedent(text), "t.ctl.yaml")


def errors(text):
    result = load(text)
    assert result.schematic is None, "expected format errors"
    assert all(d.rule == "format" and d.severity == Severity.ERROR for d in result.diagnostics)
    return [(d.line, d.column, d.message) for d in result.diagnostics]


def test_good_file_loads_with_positions():
    result = load_text(GOOD, "t.ctl.yaml")
    assert result.diagnostics == []
    sch = result.schematic
    assert sch.title.startswith("Cider press")
    pb1 = sch.elements[0]
    assert (pb1.text, pb1.loc.line, pb1.loc.column, pb1.left, pb1.right) == ("PB1.NC", 18, 14, "L1", "2")
    assert pb1.role == "contact"
    coil = sch.elements[2]
    assert coil.role == "load" and coil.inductive
    assert sch.rungs[1].number == 10
    assert sch.elements[-2].text == "SS1.hand" and sch.elements[-2].role == "contact"
    assert sch.devices["M1"].get("inrush").value == 200
    assert sch.devices["OL1"].at("setting").line == 12
    assert sch.supplies["ctl"].voltage.current_kind == "AC"
    steps = sch.expect[0].steps
    assert [s.action for s in steps] == ["press", "release", "check", "set", "wait", "power"]
    assert steps[2].targets == {"M1": True}
    assert steps[4].seconds == 5
    assert steps[5].targets == {"": "off"}


def test_integer_wire_names_are_their_decimal_text():
    sch = load_text(GOOD.replace("[2, M1.NO, 3]", '["2", M1.NO, 3]'), "t.ctl.yaml").schematic
    assert sch.elements[4].left == "2" and sch.elements[4].right == "3"


def test_yaml_1_2_booleans_on_off_yes_no_are_strings():
    # YAML 1.2 core schema: only true/false are booleans (yaml.org spec 1.2, 10.3.2)
    sch = load_text(GOOD.replace("positions: [off, hand, auto]", "positions: [off, on, yes]").replace("SS1.hand", "SS1.on").replace("{SS1: auto}", "{SS1: yes}"), "t.ctl.yaml").schematic
    assert sch.devices["SS1"].get("positions") == ["off", "on", "yes"]


@pytest.mark.parametrize("text,where,words", [
    ("ctllint: 2\nsupplies: {}\ndevices: {}\nrungs: []\n", (1, 10), "version"),
    ("ctllint: 1\nsupplies: {}\ndevices: {}\nrungs: []\nextra: 1\n", (5, 1), "unknown key 'extra'"),
    ("ctllint: 1\nsupplies: {}\ndevices: {}\n", (1, 1), "missing top-level key 'rungs'"),
    ("ctllint: 1\nsupplies: {}\ndevices: {}\nrungs: []\nrungs: []\n", (5, 1), "duplicate key"),
    ("ctllint: 1\nsupplies:\n  c: {hot: L1, common: X2, voltage: 120}\ndevices: {}\nrungs: []\n", (3, 37), "no unit"),
    ("ctllint: 1\nsupplies:\n  c: {hot: L1, common: X2, voltage: 2 VA}\ndevices: {}\nrungs: []\n", (3, 37), "apparent power"),
    ("ctllint: 1\nsupplies: {}\ndevices:\n  PB1: {kind: pushbuton}\nrungs: []\n", (4, 15), "did you mean 'pushbutton'"),
    ("ctllint: 1\nsupplies: {}\ndevices:\n  PB1: {kind: pushbutton, colour: red}\nrungs: []\n", (4, 27), "unknown key 'colour'"),
    ("ctllint: 1\nsupplies: {}\ndevices:\n  M1: {kind: starter}\nrungs: []\n", (4, 3), "needs 'overload'"),
    ("ctllint: 1\nsupplies: {}\ndevices: {}\nrungs:\n  - paths:\n      - [L1, PB1..NC, X2]\n", (6, 14), "not an element reference"),
    ("ctllint: 1\nsupplies: {}\ndevices: {}\nrungs:\n  - paths:\n      - [L1, PB1.NC]\n", (6, 9), "alternates wires and elements"),
    ("ctllint: 1\nsupplies: {}\ndevices: {}\nrungs:\n  - paths:\n      - [L1, 7, X2]\n", (6, 14), "element belongs"),
    ("ctllint: 1\nsupplies: {}\ndevices:\n  a: !!python/object/apply:os.system [echo]\nrungs: []\n", (4, 6), "not allowed"),
    ("ctllint: 1\nsupplies: {}\ndevices: {}\nrungs: [\n", (4, 9), "YAML"),
    ("", (1, 1), "empty"),
    ("ctllint: 1\nsupplies:\n  a: {hot: L1, common: X2, voltage: 120 VAC}\n  b: {hot: L1, common: X3, voltage: 24 VDC}\ndevices: {}\nrungs: []\n", (4, 12), "already a rail"),
    ("ctllint: 1\nsupplies: {}\ndevices:\n  C1: {kind: relay, rating: A700}\nrungs: []\n", (4, 29), "pilot-duty"),
    ("ctllint: 1\nsupplies: {}\ndevices:\n  M1: {kind: contactor, power_rating: {size: 12}}\nrungs: []\n", (4, 46), "NEMA size"),
    ("ctllint: 1\nsupplies: {}\ndevices:\n  M1: {kind: contactor, feeds: PB1}\n  PB1: {kind: pushbutton}\nrungs: []\n", (4, 32), "must be a motor or a heater"),
    ("ctllint: 1\nsupplies: {}\ndevices: {}\nrungs: []\nexpect:\n  - name: x\n    steps:\n      - push: PB1\n", (8, 9), "unknown key 'push'"),
    ("ctllint: 1\nsupplies: {}\ndevices: {}\nrungs: []\nexpect:\n  - name: x\n    steps:\n      - check: {M1: yes}\n", (8, 21), "expected on or off"),
    ("ctllint: 1\nsupplies: {}\ndevices:\n  M1: {kind: relay}\nrungs: []\nexpect:\n  - name: x\n    steps:\n      - press: M1\n", (9, 16), "press works a pushbutton"),
    ("ctllint: 1\nsupplies: {}\ndevices:\n  SS1: {kind: selector, positions: [off, run]}\nrungs: []\nexpect:\n  - name: x\n    steps:\n      - set: {SS1: fast}\n", (9, 15), "not one of its positions"),
    ("ctllint: 1\nsupplies: {}\ndevices:\n  PB1: {kind: pushbutton}\nrungs: []\nexpect:\n  - name: x\n    steps:\n      - trip: PB1\n", (9, 15), "trip works an overload"),
    # FORMAT.md review: the version is the whole number 1, not another spelling of it
    ("ctllint: 1.0\nsupplies: {}\ndevices: {}\nrungs: []\n", (1, 10), "version"),
    ("ctllint: 0x1\nsupplies: {}\ndevices: {}\nrungs: []\n", (1, 10), "version"),
    ("ctllint: 01\nsupplies: {}\ndevices: {}\nrungs: []\n", (1, 10), "version"),
    # a bare 00 is read as 0, a different size: refused, not silently taken as size 0
    ("ctllint: 1\nsupplies: {}\ndevices:\n  M1: {kind: contactor, power_rating: {size: 00}}\nrungs: []\n", (4, 46), 'write size 00 as "00"'),
    # 10 and "10" are the same tag, supply name or check target: the second is a duplicate
    ("ctllint: 1\nsupplies: {}\ndevices:\n  10: {kind: pilot-light}\n  \"10\": {kind: horn}\nrungs: []\n", (5, 3), "duplicate key"),
    ("ctllint: 1\nsupplies:\n  1: {hot: L1, common: X2, voltage: 120 VAC}\n  \"1\": {hot: L3, common: X4, voltage: 120 VAC}\ndevices: {}\nrungs: []\n", (4, 3), "duplicate key"),
    ("ctllint: 1\nsupplies: {}\ndevices:\n  1: {kind: pilot-light}\nrungs: []\nexpect:\n  - name: x\n    steps:\n      - check: {1: on, \"1\": off}\n", (9, 24), "duplicate key"),
    # position names are part names (SS1.hand): no dot
    ("ctllint: 1\nsupplies: {}\ndevices:\n  SS1: {kind: selector, positions: [off, hand.1]}\nrungs: []\n", (4, 42), "holds a dot"),
    # YAML 1.2 has no merge keys: say so at the '<<'
    ("ctllint: 1\nsupplies: {}\ndevices:\n  PL2:\n    <<: {kind: pilot-light}\nrungs: []\n", (5, 5), "merge keys"),
])
def test_format_errors_are_located(text, where, words):
    found = errors(text)
    assert any((line, col) == where and words in msg for line, col, msg in found), found


def test_all_format_errors_of_a_file_are_reported():
    found = errors("""\
        ctllint: 1
        supplies:
          ctl: {hot: L1, common: X2, voltage: 120}
        devices:
          PB1: {kind: pushbuton}
          PB2: {kind: pushbutton, function: begin}
        rungs:
          - paths:
              - [L1, PB1.NC, 2, 3.5, X2]
        extra: 1
        """)
    assert [line for line, _, _ in found] == [3, 5, 6, 9, 10]


def test_alias_bomb_stops_at_the_node_limit():
    from ctllint.reading.yamlsafe import Limits

    lines = ["a0: &a0 [x, x, x, x, x, x, x, x, x, x]"]
    for i in range(1, 9):
        prev = f"*a{i - 1}"
        lines.append(f"a{i}: &a{i} [{', '.join([prev] * 10)}]")
    text = "\n".join(lines) + "\n"
    result = load_text(text, "bomb.ctl.yaml", limits=Limits(max_nodes=100_000))
    assert result.schematic is None
    assert "more than 100000" in result.diagnostics[0].message


def test_device_file_loads_on_its_own():
    result = load_text("ctllint: 1\ndevices:\n  PB1: {kind: pushbutton, function: stop}\n", "lib.ctl.yaml")
    assert result.diagnostics == [] and result.schematic.device_file


def test_use_adds_devices_and_refuses_to_leave_the_repository(tmp_path):
    (tmp_path / ".git").mkdir()
    lib = tmp_path / "lib"
    lib.mkdir()
    (lib / "dev.ctl.yaml").write_text("ctllint: 1\ndevices:\n  PB1: {kind: pushbutton, function: stop}\n")
    main = tmp_path / "a.ctl.yaml"
    body = "supplies:\n  c: {hot: L1, common: X2, voltage: 120 VAC}\ndevices:\n  PL1: {kind: pilot-light}\nrungs:\n  - paths:\n      - [L1, PB1.NC, 2, PL1, X2]\n"
    main.write_text("ctllint: 1\nuse: [lib/dev.ctl.yaml]\n" + body)
    from ctllint.reading.loader import load_file

    result = load_file(str(main))
    assert result.diagnostics == []
    assert result.schematic.devices["PB1"].origin.endswith("dev.ctl.yaml")
    main.write_text("ctllint: 1\nuse: [../outside.ctl.yaml]\n" + body)
    (tmp_path.parent / "outside.ctl.yaml").write_text("ctllint: 1\ndevices: {}\n")
    diags = load_file(str(main)).diagnostics
    assert diags and diags[0].line == 2 and "leaves the repository" in diags[0].message
    main.write_text("ctllint: 1\nuse: [lib/dev.ctl.yaml]\n" + body.replace("PL1: {kind: pilot-light}", "PL1: {kind: pilot-light}\n  PB1: {kind: pushbutton}"))
    diags = load_file(str(main)).diagnostics
    assert diags and diags[0].line == 7 and "also defined in" in diags[0].message


def test_size_00_quoted_and_plain_sizes_load():
    for size in ('"00"', "0", "2", '"3"'):
        text = f"ctllint: 1\nsupplies: {{}}\ndevices:\n  M1: {{kind: contactor, power_rating: {{size: {size}}}}}\nrungs: []\n"
        result = load_text(text, "t.ctl.yaml")
        assert result.diagnostics == [], (size, result.diagnostics)
        assert result.schematic.devices["M1"].get("power_rating").nema_size == size.strip('"')
