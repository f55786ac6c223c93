"""``ctllint export``: wire list, bill of materials and terminal plan.

The small schematic's wire list and terminal plan below were written by
hand, the way a panel wirer would list them from the drawing: terminal
numbers by EN 50005 (coil A1-A2, NO x3-x4, NC x1-x2, overload 95-96),
pushbuttons, the limit switch and the valve in the field, every field
conductor on its own strip point, points of one wire bridged.
"""
import csv
import glob
import io
import os
import subprocess
import sys
import textwrap

import pytest

from ctllint.output.report import SAFETY_NOTE
from ctllint.commands.cli import main
from ctllint.output.export import bom_rows, documents, export
from ctllint.reading.kinds import KindRegistry
from ctllint.reading.loader import load_file, load_text
from ctllint.reading.terminals import assign

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
sys.path.insert(0, os.path.join(ROOT, "tests", "benchmarks"))
import generate  # noqa: E402

SMALL = textwrap.dedent("""\
    ctllint: 1
    title: Press feed
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      FU1: {kind: fuse, rating: 2 A}
      PB1: {kind: pushbutton, function: stop}
      PB2: {kind: pushbutton, function: start}
      M1: {kind: starter, coil: 120 VAC, overload: OL1}
      OL1: {kind: overload, setting: 4 A}
      PL1: {kind: pilot-light, voltage: 120 VAC}
      LS1: {kind: limit-switch}
      SOL1: {kind: solenoid, voltage: 120 VAC}
    rungs:
      - paths:
          - [L1, FU1, 1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]
          - [2, M1.NO, 3]
      - paths:
          - [1, M1.NO, 5, PL1, X2]
      - paths:
          - [1, LS1.NO, 6, SOL1, X2]
    """)

# Written by hand from the drawing of SMALL (see the module's docstring).
SMALL_WIRES = """\
wire,from,to,where
1,FU1:2,M1:23,panel
1,M1:23,TB1:1,panel
1,TB1:1,TB1:5,bridge
1,TB1:1,PB1:11,field
1,TB1:5,LS1:13,field
2,M1:13,TB1:2,panel
2,TB1:2,TB1:3,bridge
2,TB1:2,PB1:12,field
2,TB1:3,PB2:13,field
3,M1:A1,M1:14,panel
3,M1:14,TB1:4,panel
3,TB1:4,PB2:14,field
4,M1:A2,OL1:95,panel
5,M1:24,PL1:X1,panel
6,TB1:6,TB1:7,bridge
6,TB1:6,LS1:14,field
6,TB1:7,SOL1:A1,field
X2,OL1:96,PL1:X2,panel
X2,PL1:X2,TB1:8,panel
X2,TB1:8,SOL1:A2,field
"""

SMALL_TERMINALS = """\
strip,point,wire,field device,field terminal,kind,from
TB1,1,1,PB1,11,pushbutton,M1:23
TB1,2,2,PB1,12,pushbutton,M1:13
TB1,3,2,PB2,13,pushbutton,TB1:2
TB1,4,3,PB2,14,pushbutton,M1:14
TB1,5,1,LS1,13,limit-switch,TB1:1
TB1,6,6,LS1,14,limit-switch,
TB1,7,6,SOL1,A1,solenoid,TB1:6
TB1,8,X2,SOL1,A2,solenoid,PL1:X2
"""


def small():
    result = load_text(SMALL, "small.ctl.yaml")
    assert result.schematic is not None
    return result.schematic


def test_wire_list_matches_the_one_written_by_hand():
    assert export("wires", small()) == SMALL_WIRES


def test_terminal_plan_matches_the_one_written_by_hand():
    assert export("terminals", small()) == SMALL_TERMINALS


def test_a_device_on_the_panel_door_needs_no_strip_point():
    sch = load_text(SMALL.replace("PB1: {kind: pushbutton, function: stop}", "PB1: {kind: pushbutton, function: stop, location: panel}"),
                    "small.ctl.yaml").schematic
    plan = export("terminals", sch)
    assert "PB1" not in plan
    assert "1,FU1:2,PB1:11,panel\n1,PB1:11,M1:23,panel\n1,M1:23,TB1:3,panel\n1,TB1:3,LS1:13,field\n" in export("wires", sch)


def test_bill_of_materials_groups_by_kind_and_rating():
    text = SMALL.replace("  PL1: {kind: pilot-light, voltage: 120 VAC}\n",
                         "  PL1: {kind: pilot-light, voltage: 120 VAC}\n  PL2: {kind: pilot-light, voltage: 120 VAC}\n"
                         "  PL3: {kind: pilot-light, voltage: 24 VDC}\n")
    rows = bom_rows(load_text(text, "b.ctl.yaml").schematic)
    lights = [r for r in rows if r[0] == "pilot-light"]
    assert lights == [["pilot-light", "voltage 120 VAC", 2, "PL1 PL2"], ["pilot-light", "voltage 24 VDC", 1, "PL3"]]
    assert ["starter", "coil 120 VAC", 1, "M1"] in rows  # the overload it names is wiring, not the part
    assert [r[0] for r in rows] == sorted(r[0] for r in rows)


def _check_wire_list_is_a_tree_per_wire(sch, conductors, points):
    """Every device terminal of every wire is joined, with no loop: per wire, rows = ends + points - 1."""
    marks = assign(sch)
    ends: dict[str, set[str]] = {}
    for el in sch.elements:
        m = marks.get(el.index)
        for side, wire in (("L", el.left), ("R", el.right)):
            term = None if m is None else (m.left if side == "L" else m.right)
            ends.setdefault(wire, set()).add(f"{el.tag}:{term}" if term else f"{el.tag}#{el.index}{side}")
    strip_nodes: dict[str, set[str]] = {}
    for p in points:
        strip_nodes.setdefault(p.wire, set()).add(f"{p.strip}:{p.point}")
    rows: dict[str, list] = {}
    for c in conductors:
        rows.setdefault(c.wire, []).append(c)
    for wire, names in ends.items():
        nodes = {n.split("#")[0] if "#" in n else n for n in names} | strip_nodes.get(wire, set())
        got = rows.get(wire, [])
        parent = {n: n for n in nodes}

        def find(n):
            while parent[n] != n:
                n = parent[n]
            return n

        for c in got:
            a, b = str(c.start), str(c.end)
            assert a in parent and b in parent, (wire, a, b)
            ra, rb = find(a), find(b)
            assert ra != rb, f"wire {wire}: a loop at {a}-{b}"
            parent[ra] = rb
        if len(nodes) == len(names | strip_nodes.get(wire, set())):  # every end has its own name
            assert len(got) == len(nodes) - 1, wire
            assert len({find(n) for n in nodes}) == 1, wire


@pytest.mark.parametrize("path", sorted(glob.glob(os.path.join(ROOT, "fixtures", "demo", "*.ctl.yaml"))), ids=os.path.basename)
def test_demo_documents_join_every_terminal_and_are_stable(path):
    sch = load_file(path).schematic
    docs = documents(sch, KindRegistry.builtin())
    _check_wire_list_is_a_tree_per_wire(sch, docs.conductors, docs.points)
    for what in ("wires", "bom", "terminals"):
        text = export(what, sch)
        assert text == export(what, load_file(path).schematic)
        rows = list(csv.reader(io.StringIO(text)))
        assert len({len(r) for r in rows}) == 1


def test_large_generated_panel():
    n = 300
    sch = load_text(generate.motor_circuits(n), "gen.ctl.yaml").schematic
    docs = documents(sch)
    _check_wire_list_is_a_tree_per_wire(sch, docs.conductors, docs.points)
    # Per circuit the generator draws a stop and a start button (wires L1, w+1, w+2) and a valve
    # (wires w+6, X2) in the field: 2 + 2 + 2 strip points.
    assert len(docs.points) == 6 * n
    assert [p.point for p in docs.points] == list(range(1, 6 * n + 1))
    bom = {(r[0], r[1]): r[2] for r in bom_rows(sch)}
    assert bom[("pushbutton", "function stop; rating A600")] == n
    assert bom[("pushbutton", "function start; rating A600")] == n
    assert sum(bom.values()) == len(sch.devices)
    # Wires in the wirer's order: hot rails first (in the order of the supplies), then by number, commons last.
    order = list(dict.fromkeys(c.wire for c in docs.conductors))
    assert order[:2] == ["L1", "+24"] and order[-2:] == ["X2", "0V"]
    numbered = [w for w in order if w.isdigit()]
    assert numbered == sorted(numbered, key=int)


def test_output_is_the_same_whatever_the_hash_seed(tmp_path):
    path = tmp_path / "gen.ctl.yaml"
    path.write_text(generate.motor_circuits(20))
    outs = set()
    for seed in ("1", "2"):
        env = dict(os.environ, PYTHONHASHSEED=seed)
        run = subprocess.run([sys.executable, "-m", "ctllint", "export", "wires", str(path)], capture_output=True, text=True, env=env, check=True)
        outs.add(run.stdout)
        assert SAFETY_NOTE in run.stderr
    assert len(outs) == 1


def test_command_writes_file_and_refuses_unknown_kind(tmp_path, capsys):
    src = tmp_path / "s.ctl.yaml"
    src.write_text(SMALL)
    out = tmp_path / "wires.csv"
    assert main(["export", "wires", str(src), "-o", str(out)]) == 0
    assert out.read_text() == SMALL_WIRES
    assert main(["export", "pictures", str(src)]) == 2
    assert "invalid choice: 'pictures'" in capsys.readouterr().err


def test_html_report_has_the_wire_sheet(tmp_path):
    from ctllint.output.htmlreport import FileReport, render_html

    page = render_html([FileReport("small.ctl.yaml", small(), [])])
    assert 'id="f1-wires"' in page
    assert "<td>3</td><td>M1:14</td><td>TB1:4</td><td>panel</td>" in page
    assert page.count('<tr class="w-') == SMALL_WIRES.count("\n") - 1


# Written by hand from the drawing, as above: a field device with two
# terminals on one wire gets a strip point for each conductor (bridged), and a
# supply's rail reaches a field device through the strip even where the file
# draws nothing of the panel on that rail (the rail comes from the panel's
# transformer or fuse; the plan says which supply).
PENDANT = textwrap.dedent("""\
    ctllint: 1
    title: Pendant station with a contact on each side of one wire
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      CR9: {kind: relay, coil: 120 VAC}
      PB1: {kind: pushbutton, function: start}
      CR1: {kind: relay, coil: 120 VAC}
      CR2: {kind: relay, coil: 120 VAC}
    rungs:
      - paths:
          - [L1, CR9.NO, 4, PB1.NC, 5, CR1.coil, X2]
          - [4, PB1.NO, 6, CR2.coil, X2]
      - paths:
          - [L1, CR1.NO, 7, CR9.coil, X2]
""")
PENDANT_TERMINALS = """\
strip,point,wire,field device,field terminal,kind,from
TB1,1,4,PB1,11,pushbutton,CR9:14
TB1,2,4,PB1,23,pushbutton,TB1:1
TB1,3,5,PB1,12,pushbutton,CR1:A1
TB1,4,6,PB1,24,pushbutton,CR2:A1
"""
SELECTOR_ON_THE_RAIL = textwrap.dedent("""\
    ctllint: 1
    title: Sump pump selector in the field, straight off the rail
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      SS1: {kind: selector, positions: [off, hand, auto], location: field}
      CR1: {kind: relay, coil: 120 VAC}
      CR2: {kind: relay, coil: 120 VAC}
    rungs:
      - title: Hand
        paths:
          - [L1, SS1.hand, 3, CR1.coil, X2]
      - title: Auto
        paths:
          - [L1, SS1.auto, 4, CR2.coil, X2]
""")
SELECTOR_WIRES = """\
wire,from,to,where
L1,TB1:1,TB1:2,bridge
L1,TB1:1,SS1:13,field
L1,TB1:2,SS1:23,field
3,CR1:A1,TB1:3,panel
3,TB1:3,SS1:14,field
4,CR2:A1,TB1:4,panel
4,TB1:4,SS1:24,field
X2,CR1:A2,CR2:A2,panel
"""
SELECTOR_TERMINALS = """\
strip,point,wire,field device,field terminal,kind,from
TB1,1,L1,SS1,13,selector,supply ctl
TB1,2,L1,SS1,23,selector,TB1:1
TB1,3,3,SS1,14,selector,CR1:A1
TB1,4,4,SS1,24,selector,CR2:A1
"""


def _doc(text: str, what: str) -> str:
    res = load_text(text, "memory.ctl.yaml")
    assert not res.diagnostics, res.diagnostics
    return export(what, res.schematic).replace("\r\n", "\n")


def test_two_terminals_of_a_field_device_on_one_wire_get_a_point_each():
    plan = _doc(PENDANT, "terminals")
    assert plan == PENDANT_TERMINALS
    points = [row.split(",")[1] for row in plan.splitlines()[1:]]
    assert len(points) == len(set(points)), "a strip point listed twice"


def test_a_field_device_on_a_supply_rail_lands_on_the_strip():
    assert _doc(SELECTOR_ON_THE_RAIL, "wires") == SELECTOR_WIRES
    assert _doc(SELECTOR_ON_THE_RAIL, "terminals") == SELECTOR_TERMINALS
