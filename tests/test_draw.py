"""The SVG drawing: structure, labels, cross-references, findings, legibility, determinism.

The drawing is read back with xml.etree and checked against the schematic
it was drawn from: each element drawn once with its data attributes, every
wire number and rail name present, the coil cross-reference margins, the
finding marks. Text boxes are computed here from each text's font size and
length (a monospaced face: 0.6 em a character, a little more for safety),
independently of the drawing code, and no two may overlap.
"""
from __future__ import annotations

import os
import subprocess
import sys
import xml.etree.ElementTree as ET

import pytest

from ctllint.testing import load_schematic
from ctllint.commands.cli import main
from ctllint.output.draw import layout
from ctllint.checking.engine import Checker
from ctllint.reading.loader import load_file, load_text
from ctllint.reading.model import Diagnostic, Severity

HERE = os.path.dirname(os.path.abspath(__file__))
DATA = os.path.join(HERE, "data", "draw")
PRESS = os.path.join(DATA, "press.ctl.yaml")
AWKWARD = os.path.join(DATA, "awkward.ctl.yaml")
SVG = "{http://www.w3.org/2000/svg}"
ADVANCE = 0.61  # em per character of a monospaced face, rounded up


# -- helpers -------------------------------------------------------------------------

def load(path):
    result = load_file(path)
    assert result.schematic is not None, result.diagnostics
    return result.schematic


def findings(path):
    return Checker.default().check_file(path).diagnostics


def parse(svg_text):
    return ET.fromstring(svg_text)


def texts(root, cls=None):
    out = []
    for t in root.iter(SVG + "text"):
        classes = (t.get("class") or "").split()
        if cls is None or cls in classes:
            out.append(t)
    return out


def text_of(t):
    return "".join(t.itertext())


def box(t):
    """(left, top, right, bottom) of a text element from its font size and length."""
    size = float(t.get("font-size"))
    text = text_of(t)
    width = len(text) * size * (ADVANCE if "title" not in t.get("class", "") else 0.72)
    x, y = float(t.get("x")), float(t.get("y"))
    anchor = t.get("text-anchor", "start")
    left = x - width / 2 if anchor == "middle" else x - width if anchor == "end" else x
    return left, y - 0.8 * size, left + width, y + 0.25 * size


def overlapping_texts(root):
    boxes = sorted((box(t), text_of(t)) for t in texts(root))
    bad = []
    for i, (a, ta) in enumerate(boxes):
        for b, tb in boxes[i + 1:]:
            if b[0] >= a[2]:
                break
            if a[1] < b[3] and b[1] < a[3]:
                bad.append((ta, a, tb, b))
    return bad


def elements(root):
    return [g for g in root.iter(SVG + "g") if "el" in (g.get("class") or "").split()]


def element_groups(root):
    out = {}
    for g in elements(root):
        out.setdefault((g.get("data-element"), int(g.get("data-rung"))), []).append(g)
    return out


def big_schematic(rungs: int = 40) -> str:
    """A plant of ``rungs`` rungs mixing the usual shapes: three-wire starters with
    seal-ins, pilot lights, hand-off-auto selectors, timers and solenoids, PLC
    outputs, fuses, long permissive chains, and one relay whose contacts are
    used in most rungs (so its cross-reference wraps)."""
    devices = ["  PB0: {kind: pushbutton, function: emergency-stop, action: maintained}",
               "  MCR: {kind: relay, coil: 120 VAC, sealed: 8 VA}",
               "  CR900: {kind: relay, coil: 120 VAC, sealed: 8 VA, contacts: {NO: 4, NC: 2}}",
               "  TS1: {kind: temperature-switch}"]
    lines = ["  - title: Master control relay", "    paths:", "      - [L1, PB0.NC, 1, MCR.coil, X2]",
             "  - title: Common run relay used in many places", "    paths:", "      - [1, TS1.NC, 2, CR900.coil, X2]"]
    n, k = 2, 0
    while n < rungs:
        k += 1
        w = 100 + 10 * k
        shape = k % 6
        if shape == 1 and n + 2 <= rungs:
            devices += [f"  PB{k}1: {{kind: pushbutton, function: stop}}", f"  PB{k}2: {{kind: pushbutton, function: start}}",
                        f"  M{k}: {{kind: starter, coil: 120 VAC, sealed: 20 VA, overload: OL{k}, feeds: MTR{k}, contacts: {{NO: 2, NC: 1}}}}",
                        f"  OL{k}: {{kind: overload, setting: 4.2 A}}",
                        f"  MTR{k}: {{kind: motor, power: 3 hp, voltage: 460 V, phases: 3, service_factor: 1.15}}",
                        f"  PL{k}: {{kind: pilot-light, voltage: 120 V}}"]
            lines += [f"  - title: Conveyor {k} motor, three-wire start and stop with overload", "    paths:",
                      f"      - [1, MCR.NO, {w}, PB{k}1.NC, {w+1}, PB{k}2.NO, {w+2}, M{k}.coil, {w+3}, OL{k}.NC, X2]",
                      f"      - [{w+1}, M{k}.NO, {w+2}]", f"      - [{w+1}, CR900.NO, {w+2}]",
                      f"  - title: Conveyor {k} running", "    paths:", f"      - [1, M{k}.NO, {w+5}, PL{k}, X2]"]
            n += 2
        elif shape == 2:
            devices += [f"  SS{k}: {{kind: selector, positions: [off, hand, auto]}}", f"  LS{k}: {{kind: float-switch}}",
                        f"  CR{k}: {{kind: relay, coil: 120 VAC, sealed: 6 VA}}"]
            lines += [f"  - title: Pump {k} hand-off-auto", f"    note: float LS{k} in auto", "    paths:",
                      f"      - [1, SS{k}.hand, {w}, CR{k}.coil, X2]", f"      - [1, SS{k}.auto, {w+1}, LS{k}.NO, {w}]",
                      f"      - [1, CR900.NC, {w+2}, CR{k}.NC, {w}]"]
            n += 1
        elif shape == 3:
            devices += [f"  TR{k}: {{kind: timer, delay: on, preset: 10 s, coil: 120 VAC}}",
                        f"  SOL{k}: {{kind: solenoid, voltage: 120 VAC, sealed: 12 VA}}", f"  PL{k}A: {{kind: pilot-light, voltage: 120 V}}"]
            lines += [f"  - title: Delay {k}", "    paths:", f"      - [1, CR900.NO, {w}, TR{k}.coil, X2]",
                      f"  - title: Valve {k} after the delay", "    paths:", f"      - [1, TR{k}.NO, {w+1}, SOL{k}, X2]",
                      f"      - [{w+1}, PL{k}A, X2]"]
            n += 2
        elif shape == 4:
            devices += [f"  FU{k}: {{kind: fuse, rating: 2 A}}", f"  Q{k}_0: {{kind: plc-output, output: relay, voltage: 120 VAC}}",
                        f"  HN{k}: {{kind: horn, voltage: 120 VAC}}", f"  I{k}_0: {{kind: plc-input, voltage: 120 VAC}}"]
            lines += [f"  - title: Alarm horn {k} from the controller", "    paths:",
                      f"      - [1, FU{k}, {w}A, Q{k}_0, {w+1}A, HN{k}, X2]",
                      "  - paths:", f"      - [1, CR900.NO, {w+2}, I{k}_0, X2]"]
            n += 2
        elif shape == 5:
            devices += [f"  PS{k}: {{kind: pressure-switch}}", f"  FS{k}: {{kind: flow-switch}}", f"  LSW{k}: {{kind: limit-switch}}",
                        f"  CR{k}: {{kind: relay, coil: 120 VAC, sealed: 6 VA}}", f"  CR{k}B: {{kind: relay, coil: 120 VAC, sealed: 6 VA}}"]
            lines += [f"  - title: Permissives {k}, a long chain of switches in series before the relay", "    paths:",
                      f"      - [1, PS{k}.NO, {w}, FS{k}.NO, {w+1}, LSW{k}.NC, {w+2}, CR900.NO, {w+3}, CR{k}.coil, X2]",
                      f"      - [{w+1}, CR{k}B.coil, X2]"]
            n += 1
        else:
            devices += [f"  CR{k}: {{kind: relay, coil: 120 VAC, sealed: 6 VA}}"]
            lines += [f"  - title: Spare relay {k}", "    paths:", f"      - [1, CR900.NC, {w}, CR{k}.coil, X2]"]
            n += 1
    return "\n".join(["ctllint: 1", "title: Generated plant with forty rungs", "supplies:",
                      "  ctl: {hot: L1, common: X2, voltage: 120 VAC}", "devices:", *devices, "rungs:", *lines]) + "\n"


@pytest.fixture(scope="module")
def big(tmp_path_factory):
    path = tmp_path_factory.mktemp("big") / "plant.ctl.yaml"
    path.write_text(big_schematic())
    sch = load(str(path))
    assert len(sch.rungs) == 40
    diags = findings(str(path))
    assert diags, "the generated plant is meant to have findings to mark"
    return sch, diags, layout(sch, diags)


# -- structure -------------------------------------------------------------------------

@pytest.mark.parametrize("path", [PRESS, AWKWARD])
def test_each_element_drawn_once_with_its_data(path):
    sch = load(path)
    drawing = layout(sch, findings(path))
    root = parse(drawing.svg)
    groups = elements(root)
    assert len(groups) == len(sch.elements)
    ids = [g.get("id") for g in groups]
    assert len(set(ids)) == len(ids)
    numbers = {r.index: r.number for r in sch.rungs}
    by_id = {g.get("id"): g for g in groups}
    for el in sch.elements:
        g = by_id[drawing.element_ids[el.index]]
        assert g.get("data-element") == el.text
        assert g.get("data-line") == str(el.loc.line)
        assert g.get("data-column") == str(el.loc.column)
        assert g.get("data-rung") == str(numbers[el.rung])
        labels = [text_of(t) for t in g.iter(SVG + "text") if t.get("class") == "tag"]
        assert len(labels) == 1
        shown = labels[0]
        expected = el.tag if el.part in (None, "NO", "NC", "coil") else el.text
        assert shown == expected or (shown.endswith("\u2026") and expected.startswith(shown[:-1]))


def test_every_id_in_the_drawing_is_unique():
    sch = load(PRESS)
    root = parse(layout(sch, findings(PRESS)).svg)
    ids = [e.get("id") for e in root.iter() if e.get("id")]
    assert len(ids) == len(set(ids))


@pytest.mark.parametrize("path", [PRESS, AWKWARD])
def test_every_wire_number_and_rail_is_labelled(path):
    sch = load(path)
    root = parse(layout(sch).svg)
    rails = {w for s in sch.supplies.values() for w in (s.hot, s.common)}
    for rung in sch.rungs:
        every = {w for p in rung.paths for w in p.wires}
        wires = every - rails
        shown = {t.get("data-wire") for t in texts(root, "wire") if t.get("data-rung") == str(rung.number)}
        assert shown <= every, f"rung {rung.number}"  # a foreign supply's rail shows as a wire end
        assert wires <= shown, f"rung {rung.number}: missing wire numbers {wires - shown}"
        for t in texts(root, "wire"):
            assert text_of(t) == t.get("data-wire")
    hot = {text_of(t) for t in texts(root, "railname") if t.get("data-rail") == "hot"}
    common = {text_of(t) for t in texts(root, "railname") if t.get("data-rail") == "common"}
    used = {s.name for s in sch.supplies.values() if any(w in (s.hot, s.common) for r in sch.rungs for p in r.paths for w in p.wires)}
    assert {sch.supplies[n].hot for n in used} <= hot
    assert {sch.supplies[n].common for n in used} <= common


def test_one_rail_pair_per_supply_hot_left_common_right():
    sch = load(PRESS)
    root = parse(layout(sch).svg)
    sections = [g for g in root.iter(SVG + "g") if g.get("class") == "section"]
    assert [s.get("data-supply") for s in sections] == ["ctl", "dc"]
    for sec in sections:
        rails = [ln for ln in sec.iter(SVG + "line") if ln.get("class") == "rail"]
        assert len(rails) == 2
        left, right = sorted(rails, key=lambda ln: float(ln.get("x1")))
        names = {t.get("data-rail"): t for t in sec.iter(SVG + "text") if t.get("data-rail")}
        assert text_of(names["hot"]) == sec.get("data-hot")
        assert float(names["hot"].get("x")) == float(left.get("x1"))
        assert float(names["common"].get("x")) == float(right.get("x1"))


def test_rungs_are_numbered_top_to_bottom():
    text = open(PRESS).read().replace("  - title: Horn\n", "  - title: Horn\n    number: 60\n")
    sch = load_text(text, "renumbered.ctl.yaml").schematic
    root = parse(layout(sch).svg)
    numbers = texts(root, "rungno")
    assert [text_of(t) for t in numbers] == [str(r.number) for r in sch.rungs]
    assert "60" in [text_of(t) for t in numbers]
    ys = [float(t.get("y")) for t in numbers]
    assert ys == sorted(ys)


def test_symbols_follow_the_trade_conventions():
    sch = load(PRESS)
    root = parse(layout(sch).svg)
    groups = {g.get("data-element"): g for g in elements(root)}

    def shapes(g):
        lines = [ln for ln in g.iter(SVG + "line") if ln.get("class") != "op"]  # the operator's stem is not the contact
        vertical = [ln for ln in lines if ln.get("x1") == ln.get("x2")]
        slanted = [ln for ln in lines if ln.get("x1") != ln.get("x2") and ln.get("y1") != ln.get("y2")]
        return vertical, slanted, list(g.iter(SVG + "circle")), list(g.iter(SVG + "rect"))

    v, s, c, _ = shapes(groups["PB2.NO"])   # NO: two parallel vertical bars
    assert len(v) == 2 and not s and not c
    v, s, c, _ = shapes(groups["PB1.NC"])   # NC: the same with a slash
    assert len(v) == 2 and len(s) == 1 and not c
    v, s, c, _ = shapes(groups["MCR.coil"])  # coil: a circle
    assert len(c) == 1 and not [t for t in groups["MCR.coil"].iter(SVG + "text") if t.get("class") == "letter"]
    v, s, c, _ = shapes(groups["PL1"])      # pilot light: a circle with a cross
    assert len(c) == 1 and len(s) == 2
    letters = [text_of(t) for t in groups["SOL1"].iter(SVG + "text") if t.get("class") == "letter"]
    assert letters == ["S"] and len(shapes(groups["SOL1"])[2]) == 1   # other loads: a circle with a letter
    _, _, _, rects = shapes(groups["FU1"])  # fuse: a small rectangle with the wire through it
    assert len(rects) == 1
    lines = list(groups["FU1"].iter(SVG + "line"))
    rect = rects[0]
    assert any(float(ln.get("x1")) < float(rect.get("x")) and float(ln.get("x2")) > float(rect.get("x")) + float(rect.get("width")) for ln in lines)


def test_branches_sit_under_the_path_they_bridge_with_connectors():
    sch = load(PRESS)
    root = parse(layout(sch).svg)
    g = element_groups(root)
    start = g[("PB2.NO", 2)][0]
    seal = g[("M1.NO", 2)][0]
    other = g[("PB3.NO", 2)][0]

    def centre(grp):
        label = next(t for t in grp.iter(SVG + "text") if t.get("class") == "tag")
        return float(label.get("x")), float(label.get("y"))

    (xs, ys), (xm, ym), (xo, yo) = centre(start), centre(seal), centre(other)
    assert xs == xm == xo and ys < ym < yo
    # Vertical connectors join the branches at wires 4 and 5: one line each, spanning the three rows.
    rung = next(r for r in root.iter(SVG + "g") if r.get("class") == "rung" and r.get("data-rung") == "2")
    verticals = [ln for ln in rung.iter(SVG + "line") if ln.get("class") == "w" and ln.get("x1") == ln.get("x2")]
    assert len(verticals) == 2
    left, right = sorted(verticals, key=lambda ln: float(ln.get("x1")))
    assert float(left.get("x1")) < xs < float(right.get("x1"))
    for ln in verticals:  # element labels sit 17 px above their row's line
        assert float(ln.get("y1")) == ys + 17 and float(ln.get("y2")) == yo + 17
    dots = [c for c in rung.iter(SVG + "circle") if c.get("class") == "dot" and c.get("cx") in (left.get("x1"), right.get("x1"))]
    assert len(dots) == 4  # T-junctions on the first and middle rows; the bottom row turns a corner


def test_coil_cross_reference_margin():
    sch = load(PRESS)
    root = parse(layout(sch).svg)
    xref = {t.get("data-coil"): t for t in texts(root, "xref") if t.get("data-no") is not None}
    assert text_of(xref["M1"]) == "NO 2, 3, 7  NC 5"
    assert (xref["M1"].get("data-no"), xref["M1"].get("data-nc")) == ("2,3,7", "5")
    assert text_of(xref["MCR"]) == "NO 2"
    assert text_of(xref["TR1"]) == "NO 5"
    assert text_of(xref["M2"]) == "no contacts used"
    assert set(xref) == {"MCR", "M1", "M2", "TR1"}
    # Each sits right of the common rail, on its coil's row.
    groups = {g.get("data-element"): g for g in elements(root)}
    rail_x = max(float(ln.get("x1")) for ln in root.iter(SVG + "line") if ln.get("class") == "rail")
    for tag, t in xref.items():
        coil_label = next(x for x in groups[f"{tag}.coil"].iter(SVG + "text") if x.get("class") == "tag")
        assert float(t.get("x")) > rail_x
        assert abs(float(t.get("y")) - 4 - (float(coil_label.get("y")) + 17)) < 0.01


def test_long_cross_reference_wraps_inside_the_margin(big):
    sch, _, drawing = big
    root = parse(drawing.svg)
    lines = [t for t in texts(root, "xref") if t.get("data-coil") == "CR900"]
    assert len(lines) > 1
    joined = " ".join(text_of(t).strip() for t in lines)
    uses = sorted((r.number, e.part) for r in sch.rungs for e in r.elements if e.tag == "CR900" and e.part in ("NO", "NC"))
    no = [n for n, p in uses if p == "NO"]
    nc = [n for n, p in uses if p == "NC"]
    assert joined.replace(",  ", ", ").split("NC")[0].split() == ["NO"] + [f"{n}," for n in no[:-1]] + [str(no[-1])]
    assert joined.split("NC")[1].split() == [f"{n}," for n in nc[:-1]] + [str(nc[-1])]
    width = float(root.get("width"))
    assert all(box(t)[2] <= width for t in lines)


# -- findings -------------------------------------------------------------------------------

def test_findings_are_marked_on_their_elements():
    sch = load(PRESS)
    diags = findings(PRESS)
    rules = {d.rule for d in diags}
    # (No switch-fan-out here since that rule was corrected: SS1.hand makes M2's coil and a timer's coil,
    # and a timer coil is not a power-inductive branch.)
    assert {"emergency-stop", "contact-count", "inductive-on-electronic-output", "unused-device"} <= rules
    drawing = layout(sch, diags)
    root = parse(drawing.svg)
    by_id = {g.get("id"): g for g in elements(root)}
    at_element = {(e.loc.line, e.loc.column): e for e in sch.elements}
    for d in diags:
        el = at_element.get((d.line, d.column))
        if el is None:
            continue
        g = by_id[drawing.element_ids[el.index]]
        assert d.rule in g.get("data-findings").split()
        outline = [r for r in g.iter(SVG + "rect") if "outline" in (r.get("class") or "")]
        assert len(outline) == 1
        worst = max(x.severity for x in diags if (x.line, x.column) == (d.line, d.column))
        assert f"mark-{worst}" in outline[0].get("class")
        labels = [f for f in root.iter() if (f.get("class") or "") == "finding" and f.get("data-for") == g.get("id") and f.get("data-rule") == d.rule]
        assert len(labels) == 1
        assert [text_of(t) for t in labels[0].iter(SVG + "text")] == [d.rule]


def test_device_findings_mark_the_device_once():
    # A finding about a device (a contactor's power poles, its rating) is marked
    # once, on its coil, not on every auxiliary contact (issue: real panels).
    sch = load(PRESS)
    m1 = sch.devices["M1"]
    diag = Diagnostic.at(m1.loc, "auto-restart", Severity.WARNING, "M1 can restart by itself")
    drawing = layout(sch, [diag])
    root = parse(drawing.svg)
    marked = sorted(g.get("data-element") for g in elements(root) if g.get("data-findings") == "auto-restart")
    assert len([e for e in sch.elements if e.tag == "M1"]) > 1 and marked == ["M1.coil"]
    # A field of the device counts too: the overload's setting marks OL1.NC.
    ol = sch.devices["OL1"]
    drawing = layout(sch, [Diagnostic.at(ol.at("setting"), "overload-setting", Severity.ERROR, "too high")])
    assert [g.get("data-element") for g in elements(parse(drawing.svg)) if g.get("data-findings")] == ["OL1.NC"]


def test_findings_with_nothing_to_mark_are_listed_under_the_drawing():
    sch = load(PRESS)
    diags = findings(PRESS)
    drawing = layout(sch, diags)
    unused = [d for d in diags if d.rule == "unused-device"]
    assert unused and all(d in drawing.unplaced for d in unused)
    root = parse(drawing.svg)
    legend = [text_of(t) for t in texts(root, "legend") if t.get("data-rule") == "unused-device"]
    assert legend and "(not on the drawing)" in " ".join(text_of(t) for t in texts(root, "legend"))
    assert len([t for t in texts(root, "legend") if t.get("data-finding-line")]) == len(diags)
    # Without the legend, nothing is listed.
    quiet = parse(layout(sch, diags, legend=False).svg)
    assert not texts(quiet, "legend")


def test_a_supply_finding_marks_its_rails():
    sch = load(PRESS)
    d = Diagnostic.at(sch.supplies["dc"].at("voltage"), "voltage-mismatch", Severity.ERROR, "x")
    drawing = layout(sch, [d])
    root = parse(drawing.svg)
    section = next(g for g in root.iter(SVG + "g") if g.get("data-supply") == "dc")
    assert drawing.anchors[d] == section.get("id")
    assert [text_of(t) for t in section.iter(SVG + "text") if t.get("data-rule")] == ["voltage-mismatch"]
    assert not overlapping_texts(root)


# -- legibility and determinism ----------------------------------------------------------

def test_forty_rungs_fit_a_screen_without_overlapping_text(big):
    sch, diags, drawing = big
    root = parse(drawing.svg)
    width = float(root.get("width"))
    assert 600 <= width <= 1600
    assert root.get("viewBox") == f"0 0 {root.get('width')} {root.get('height')}"
    assert len(elements(root)) == len(sch.elements)
    assert len(texts(root, "rungno")) == 40
    marked = [g for g in elements(root) if g.get("data-findings")]
    assert len(marked) >= 10
    bad = overlapping_texts(root)
    assert not bad, bad[:5]
    for t in texts(root):
        left, top, right, bottom = box(t)
        assert left >= 0 and right <= width + 0.5, text_of(t)


@pytest.mark.parametrize("path", [PRESS, AWKWARD])
def test_no_overlapping_text_on_the_fixtures(path):
    sch = load(path)
    root = parse(layout(sch, findings(path)).svg)
    assert not overlapping_texts(root)


def test_many_findings_on_neighbours_stack_in_lanes():
    sch = load(PRESS)
    rules = ["grounded-side-switching", "inductive-on-electronic-output", "stop-in-series", "seal-in", "switch-fan-out"]
    diags = [Diagnostic.at(e.loc, r, Severity.ERROR, "x") for e in sch.elements for r in rules]
    root = parse(layout(sch, diags).svg)
    assert len([f for f in root.iter() if f.get("class") == "finding"]) == len(sch.elements) * len(rules)
    assert not overlapping_texts(root)


def test_a_long_rung_widens_the_drawing_and_long_tags_are_shortened():
    sch = load(AWKWARD)
    root = parse(layout(sch).svg)
    assert float(root.get("width")) <= 1600
    long_tag = next(g for g in elements(root) if g.get("data-tag") == "A_VERY_LONG_DEVICE_TAG")
    label = next(text_of(t) for t in long_tag.iter(SVG + "text") if t.get("class") == "tag")
    assert label.endswith("\u2026")
    assert "A_VERY_LONG_DEVICE_TAG.NO" in text_of(long_tag.find(SVG + "title"))


def test_awkward_wiring_is_drawn_without_losing_anything():
    sch = load(AWKWARD)
    root = parse(layout(sch).svg)
    # A wire that joins nothing else in its rung ends on a terminal, not on a rail.
    terminals = sorted(c.get("data-terminal") for c in root.iter(SVG + "circle") if c.get("class") == "term")
    assert {"20", "22", "X12"} <= set(terminals)
    # Unknown devices get a placeholder symbol.
    xx9 = next(g for g in elements(root) if g.get("data-tag") == "XX9")
    assert xx9.get("data-role") == "unknown"


def test_drawing_is_deterministic(tmp_path):
    sch = load(PRESS)
    diags = findings(PRESS)
    assert layout(sch, diags).svg == layout(sch, list(reversed(diags))).svg
    outputs = []
    for seed in ("1", "2"):
        out = tmp_path / f"d{seed}.svg"
        env = dict(os.environ, PYTHONHASHSEED=seed, CTLLINT_NO_CACHE="1")
        subprocess.run([sys.executable, "-m", "ctllint", "draw", PRESS, "-o", str(out)], check=True, env=env, cwd=HERE)
        outputs.append(out.read_bytes())
    assert outputs[0] == outputs[1]


# -- the command -------------------------------------------------------------------------------

def test_draw_command_writes_svg(tmp_path, capsys):
    out = tmp_path / "press.svg"
    assert main(["draw", PRESS, "-o", str(out)]) == 0
    root = parse(out.read_text())
    assert root.tag == SVG + "svg"
    assert any(g.get("data-findings") for g in elements(root))
    assert main(["draw", PRESS, "--no-findings"]) == 0
    plain = parse(capsys.readouterr().out)
    assert not any(g.get("data-findings") for g in elements(plain))
    assert main(["draw", PRESS, "--select", "contact-count"]) == 0
    only = parse(capsys.readouterr().out)
    assert {g.get("data-findings") for g in elements(only) if g.get("data-findings")} == {"contact-count"}


def test_draw_command_errors(tmp_path, capsys):
    assert main(["draw", str(tmp_path / "missing.ctl.yaml")]) == 2
    assert "does not exist" in capsys.readouterr().err
    bad = tmp_path / "bad.ctl.yaml"
    bad.write_text("ctllint: 1\nsupplies: {}\ndevices: {}\nrungs: []\nextra: 1\n")
    assert main(["draw", str(bad)]) == 1
    err = capsys.readouterr().err
    assert "bad.ctl.yaml:5:1: error:" in err and "[format]" in err
    assert main(["draw", str(tmp_path)]) == 2


def test_long_wire_numbers_in_tight_places_stay_legible():
    """Long wire names on the shortest runs (a branch leaving a connector, next to
    a lettered load) and many columns: the columns widen rather than let text collide."""
    names = ["1001A", "1002B", "1003C", "1004D", "1005E", "1006F", "1007G", "1008H"]
    chain = ", ".join(f"{w}, S{i}.NO" for i, w in enumerate(names[:-1]))
    text = "\n".join([
        "ctllint: 1",
        "supplies:",
        "  ctl: {hot: L1, common: X2, voltage: 120 VAC}",
        "devices:",
        *[f"  S{i}: {{kind: limit-switch}}" for i in range(10)],
        "  SOL1: {kind: solenoid}",
        "  HN1: {kind: horn}",
        "  I1: {kind: plc-input}",
        "rungs:",
        "  - paths:",
        f"      - [L1, S9.NO, {chain}, {names[-1]}, SOL1, X2]",
        f"      - [{names[0]}, S8.NO, {names[1]}]",
        f"      - [{names[2]}, HN1, X2]",
        "  - paths:",
        f"      - [{names[3]}, I1, 77777, S8.NC, X2]",
    ]) + "\n"
    sch = load_text(text, "long.ctl.yaml").schematic
    assert sch is not None
    root = parse(layout(sch).svg)
    assert not overlapping_texts(root)
    shown = {t.get("data-wire") for t in texts(root, "wire")}
    assert set(names) <= shown


OPERATED = """ctllint: 1
supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
devices:
  ES1: {kind: pushbutton, function: emergency-stop, action: maintained}
  PB1: {kind: pushbutton, function: stop}
  SW1: {kind: pushbutton, action: maintained}
  LS1: {kind: limit-switch}
  FS1: {kind: float-switch}
  PS1: {kind: pressure-switch}
  TS1: {kind: temperature-switch}
  FL1: {kind: flow-switch}
  FT1: {kind: foot-switch}
  SS1: {kind: selector, positions: [off, hand, auto]}
  TR1: {kind: timer, coil: 120 VAC, delay: on, preset: 5 s}
  TR2: {kind: timer, coil: 120 VAC, delay: off, preset: 5 s}
  OL1: {kind: overload}
  CR1: {kind: relay, coil: 120 VAC}
rungs:
  - restart: automatic
    paths:
      - [L1, ES1.NC, 1, PB1.NC, 2, SW1.NO, 3, LS1.NO, 4, FS1.NO, 5, PS1.NO, 6, TS1.NO, 7, FL1.NO, 8, FT1.NO, 9, SS1.hand, 10, CR1.coil, 11, OL1.NC, X2]
      - [1, TR1.NO, 12, TR2.NO, 13, CR1.NO, 14, TR1.coil, X2]
      - [14, TR2.coil, X2]
"""


def test_contacts_are_drawn_with_their_operators():
    """Each mechanical contact shows how it is worked, as the trade's symbol
    standards draw the actuator over the contact; relay contacts show none;
    on-delay and off-delay contacts carry the delay arc bowed opposite ways
    (common practice in ladder drawings)."""
    root = parse(layout(load_schematic(OPERATED)).svg)
    groups = {g.get("data-element"): g for g in elements(root)}

    def stems(tag):
        return [ln for ln in groups[tag].iter(SVG + "line") if ln.get("class") == "op"]

    def glyph(tag):
        return [(e.tag.split("}")[1], e.get("class")) for e in groups[tag] if e.tag.split("}")[1] in ("path", "circle", "polyline")]

    for tag in ("ES1.NC", "PB1.NC", "SW1.NO", "LS1.NO", "FS1.NO", "PS1.NO", "TS1.NO", "FL1.NO", "FT1.NO", "SS1.hand", "OL1.NC"):
        assert len(stems(tag)) == 1, tag  # joined to its operator by a dashed stem
    assert not stems("CR1.NO") and not glyph("CR1.NO")  # a relay contact is worked by its coil
    assert ("path", "symdot") in glyph("ES1.NC")            # the mushroom head, filled
    assert not glyph("PB1.NC")                              # a plain plunger: lines only
    assert ("circle", "symfill") in glyph("FS1.NO")          # the float
    assert ("polyline", "sym") in glyph("OL1.NC")            # the thermal element
    dots = [e.get("class") for e in groups["SS1.hand"].iter(SVG + "circle")]
    assert dots == ["symfill", "symdot", "symfill"]          # off, hand (closed), auto
    arcs = {t: groups[t].find(SVG + "path").get("d") for t in ("TR1.NO", "TR2.NO")}
    assert arcs["TR1.NO"] != arcs["TR2.NO"] and not stems("TR1.NO")


def test_branch_starts_are_drawn_alike():
    """A rung that starts on another rung's wire is marked with the same
    terminal circle whether it starts with one path or with a parallel pair."""
    text = """ctllint: 1
supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
devices:
  FS1: {kind: float-switch}
  FS2: {kind: float-switch}
  CR1: {kind: relay, coil: 120 VAC}
  CR2: {kind: relay, coil: 120 VAC}
rungs:
  - restart: automatic
    paths: [[L1, FS1.NO, 1, CR1.coil, X2]]
  - restart: automatic
    paths: [[1, CR1.NO, 2, CR2.coil, X2]]
  - restart: automatic
    paths:
      - [1, FS2.NO, 3, CR2.NO, 4, CR1.coil, X2]
      - [1, CR2.NC, 3]
"""
    root = parse(layout(load_schematic(text)).svg)
    terms = [c.get("data-terminal") for c in root.iter(SVG + "circle") if c.get("class") == "term"]
    assert terms.count("1") == 2  # rung 2 (one path) and rung 3 (a parallel pair) alike
