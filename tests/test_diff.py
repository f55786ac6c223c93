"""The semantic diff: ``ctllint.review.diff`` and the ``ctllint diff`` command.

Each folder of tests/data/diff holds ``old.ctl.yaml`` and ``new.ctl.yaml``,
two revisions of one control circuit with one known electrical change.
The expected change items below are written from the change that was
made to the file, not from the program's output.
"""
from __future__ import annotations

import json
import os
import re
import shutil
import subprocess
import sys

import pytest

from ctllint import hookimpl
from ctllint.api import Finding, Rule
from ctllint.commands.cli import main
from ctllint.review.diff import (
    ADDED,
    CHANGED,
    MOVED,
    REMOVED,
    Revision,
    SchematicDiff,
    changed_rungs,
    diff_files,
    diff_revisions,
    match_wires,
    render_text,
    semantic_diff,
    translate_message,
)
from ctllint.reading.loader import load_text
from ctllint.reading.model import Severity
from ctllint.testing import checker

DATA = os.path.join(os.path.dirname(os.path.abspath(__file__)), "data", "diff")
BASE = open(os.path.join(DATA, "contact-moved", "old.ctl.yaml"), encoding="utf-8").read()


def load(text: str, path: str = "press.ctl.yaml"):
    result = load_text(text, path)
    assert result.schematic is not None, result.diagnostics
    return result.schematic


def items(d: SchematicDiff) -> list[tuple]:
    """Every change item of a diff as a plain tuple, sorted."""
    out: list[tuple] = []
    out += [("header", h.field, h.old, h.new) for h in d.header]
    out += [("wire", o, n) for o, n in d.wire_renames.items()]
    for s in d.supplies:
        out.append(("supply", s.name, s.change) + (tuple((f.field, f.old, f.new) for f in s.fields) if s.change == CHANGED else ()))
    for dev in d.devices:
        out.append(("device", dev.tag, dev.change) + (tuple((f.field, f.old, f.new) for f in dev.fields) if dev.change == CHANGED else ()))
    for r in d.rungs:
        out.append(("rung", r.title, r.change) + tuple((f.field, f.old, f.new) for f in r.fields))
        out += [("element", r.title, e.change, e.element, e.old_wires, e.new_wires) for e in r.elements]
    for s in d.scenarios:
        out.append(("expect", s.name, s.change))
        if s.change == CHANGED:
            out += [("step", s.name, st.change, st.step, st.text) for st in s.steps]
    out += [("finding", f.change, f.rule) for f in d.findings]
    return sorted(out, key=repr)


def pair_diff(case: str) -> SchematicDiff:
    folder = os.path.join(DATA, case)
    return diff_files(os.path.join(folder, "old.ctl.yaml"), os.path.join(folder, "new.ctl.yaml"), checker())


# -- the pairs of revisions ------------------------------------------------------------

PAIRS = {
    # PB2's contact rating rewritten from a NEMA pilot-duty letter to an IEC category list
    "rating-changed": [
        ("device", "PB2", CHANGED, ("rating", "A600", "[{category: AC-15, current: 3 A, voltage: 240 V}]")),
    ],
    # the grinder running light's M1.NO now takes its feed from wire 2 (after the stop button), not from L1
    "contact-moved": [
        ("rung", "Grinder running", CHANGED),
        ("element", "Grinder running", MOVED, "M1.NO", ("L1", "5"), ("2", "5")),
    ],
    # every wire renumbered by rung (2 -> 102 ...), connections untouched
    "wires-renumbered": [
        ("wire", "2", "102"), ("wire", "3", "103"), ("wire", "4", "104"), ("wire", "5", "201"),
        ("wire", "6", "301"), ("wire", "7", "302"), ("wire", "8", "303"), ("wire", "9", "401"),
    ],
    # a control-power-on light added as the first rung: the rungs after it are renumbered, not changed
    "rung-added": [
        ("device", "PL3", ADDED),
        ("rung", "Control power on", ADDED),
    ],
    # the seal-in M1.NO around the start button deleted: the grinder no longer latches
    "seal-in-removed": [
        ("rung", "Grinder motor", CHANGED),
        ("element", "Grinder motor", REMOVED, "M1.NO", ("2", "3"), None),
        ("finding", "appeared", "seal-in"),
        ("finding", "appeared", "expectation"),  # step 3 checks M1 on
        ("finding", "appeared", "expectation"),  # ... and PL1 on
    ],
    # the remote running light PL3, in parallel with PL1, taken out with its device entry
    "element-removed": [
        ("device", "PL3", REMOVED),
        ("rung", "Grinder running", CHANGED),
        ("element", "Grinder running", REMOVED, "PL3", ("5", "X2"), None),
    ],
}


@pytest.mark.parametrize("case", sorted(PAIRS))
def test_pair_gives_exactly_the_expected_items(case):
    d = pair_diff(case)
    assert d.findings_compared, d.notes
    assert items(d) == sorted(PAIRS[case], key=repr)


def test_every_pair_folder_is_tested():
    assert sorted(os.listdir(DATA)) == sorted(PAIRS)


def test_renumbering_appears_as_renumbering_only():
    d = pair_diff("wires-renumbered")
    assert d.renumbering_only
    assert not (d.devices or d.rungs or d.supplies or d.scenarios or d.findings)
    assert changed_rungs(d) == ([], [])
    text = render_text([d])
    body = [line.strip() for line in text.splitlines()[1:] if line.strip()]
    assert body[0].startswith("wires renumbered")
    assert body[1:9] == ["wire 2 -> 102", "wire 3 -> 103", "wire 4 -> 104", "wire 5 -> 201",
                         "wire 6 -> 301", "wire 7 -> 302", "wire 8 -> 303", "wire 9 -> 401"]
    assert not any(line.startswith(("+", "-")) for line in body)


def test_seal_in_finding_text():
    d = pair_diff("seal-in-removed")
    seal = [f for f in d.findings if f.rule == "seal-in"]
    assert seal and seal[0].severity == "error" and seal[0].line == 21
    assert "M1" in seal[0].message
    assert changed_rungs(d) == ([0], [0])


def test_rung_added_on_top_changes_no_other_rung():
    d = pair_diff("rung-added")
    assert [r.change for r in d.rungs] == [ADDED]
    assert changed_rungs(d) == ([], [0])


# -- wires ---------------------------------------------------------------------------------

def renumber(text: str, mapping: dict[str, str]) -> str:
    """Rename wires in the rung paths of ``text`` (all at once, so a shift does not cascade)."""
    out = []
    for line in text.splitlines(True):
        if line.lstrip().startswith("- ["):
            line = re.sub(r"(?<=[\[ ])([0-9A-Za-z+]+)(?=[,\]])", lambda m: mapping.get(m.group(1), m.group(1)), line)
        out.append(line)
    return "".join(out)


def test_shifted_numbers_that_reuse_old_names_are_a_renumbering():
    shift = {str(n): str(n + 1) for n in range(2, 10)}  # 2 -> 3, 3 -> 4, ... every new name but 10 was an old one
    d = semantic_diff(load(BASE), load(renumber(BASE, shift)))
    assert d.wire_renames == shift
    assert d.renumbering_only


def test_swapped_wire_numbers_are_a_renumbering():
    d = semantic_diff(load(BASE), load(renumber(BASE, {"2": "3", "3": "2"})))
    assert d.wire_renames == {"2": "3", "3": "2"}
    assert d.renumbering_only


def test_renumbering_with_another_change_shows_both():
    new = renumber(BASE, {"6": "60", "7": "70", "8": "80"}).replace("  - title: Wash pump running\n    paths:\n      - [L1, M2.NO, 9, PL2, X2]\n", "  - title: Wash pump running\n    paths:\n      - [70, M2.NO, 9, PL2, X2]\n")
    d = semantic_diff(load(BASE), load(new))
    assert d.wire_renames == {"6": "60", "7": "70", "8": "80"}
    assert items(d) == sorted([
        ("wire", "6", "60"), ("wire", "7", "70"), ("wire", "8", "80"),
        ("rung", "Wash pump running", CHANGED),
        ("element", "Wash pump running", MOVED, "M2.NO", ("L1", "9"), ("70", "9")),
    ], key=repr)


def test_an_ordinary_edit_is_never_a_renumbering():
    d = pair_diff("contact-moved")
    assert d.wire_renames == {}
    d = pair_diff("seal-in-removed")
    assert d.wire_renames == {}


def test_wires_that_share_too_little_are_not_paired():
    old = [("A.NO", "L1", "5"), ("B", "5", "X2")]
    new = [("C.NO", "L1", "7"), ("D", "7", "X2")]
    assert match_wires(old, new, {"L1", "X2"}) == {}


def test_rails_renamed_with_their_supply_are_not_wire_changes():
    new = BASE.replace("hot: L1", "hot: L10")
    new = renumber(new, {"L1": "L10"})
    d = semantic_diff(load(BASE), load(new))
    assert items(d) == [("supply", "ctl", CHANGED, ("hot", "L1", "L10"))]


def test_paths_split_reversed_or_reordered_are_no_change():
    new = BASE.replace(
        "      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n      - [2, M1.NO, 3]\n",
        "      - [X2, OL1.NC, 4, M1.coil, 3]\n      - [3, M1.NO, 2, PB1.NC, L1]\n      - [2, PB2.NO, 3]\n",
    )
    d = semantic_diff(load(BASE), load(new))
    assert not d.changed


# -- devices, supplies, expect, title --------------------------------------------------------

def test_equal_values_in_other_units_are_no_change_but_a_real_change_is_shown_as_written():
    new = BASE.replace("setting: 82 A", "setting: 82000 mA").replace("inrush: 200 VA", "inrush: 0.25 kVA")
    d = semantic_diff(load(BASE), load(new))
    assert items(d) == [("device", "M2", CHANGED, ("inrush", "200 VA", "0.25 kVA"))]


def test_writing_a_default_value_is_no_change():
    new = BASE.replace("PB2: {kind: pushbutton, function: start,", "PB2: {kind: pushbutton, action: momentary, function: start,")
    assert not semantic_diff(load(BASE), load(new)).changed


def test_device_kind_and_several_fields_changed():
    new = BASE.replace("  M1: {kind: starter,", "  M1: {kind: contactor,").replace("coil: 120 VAC, inrush: 600 VA", "coil: 24 VAC, inrush: 600 VA")
    d = semantic_diff(load(BASE), load(new))
    assert items(d) == [("device", "M1", CHANGED, ("kind", "starter", "contactor"), ("coil", "120 VAC", "24 VAC"))]


def test_supply_title_and_expect_changes():
    new = BASE.replace("voltage: 120 VAC}", "voltage: 120 VAC, grounded: false}")
    new = new.replace("title: Cider press line, grinder motor and wash pump", "title: Cider press line 2")
    new = new.replace("      - press: PB1\n      - check: {M1: off, PL1: off}\n", "      - press: PB1\n      - wait: 2 s\n      - check: {M1: off}\n")
    new += "  - name: wash pump starts\n    steps:\n      - press: PB4\n      - check: {M2: on}\n"
    d = semantic_diff(load(BASE), load(new))
    assert items(d) == sorted([
        ("header", "title", "Cider press line, grinder motor and wash pump", "Cider press line 2"),
        ("supply", "ctl", CHANGED, ("grounded", "true (default)", "false")),
        ("expect", "grinder starts, latches and stops", CHANGED),
        ("step", "grinder starts, latches and stops", REMOVED, 5, "check: {M1: off, PL1: off}"),
        ("step", "grinder starts, latches and stops", ADDED, 5, "wait: 2 s"),
        ("step", "grinder starts, latches and stops", ADDED, 6, "check: {M1: off}"),
        ("expect", "wash pump starts", ADDED),
    ], key=repr)


# -- rungs -----------------------------------------------------------------------------------

def test_rungs_swapped_are_matched_by_title_and_only_moved():
    a = "  - title: Grinder running\n    paths:\n      - [L1, M1.NO, 5, PL1, X2]\n"
    b = "  - title: Wash pump\n    paths:\n      - [L1, PB3.NC, 6, PB4.NO, 7, M2.coil, 8, OL2.NC, X2]\n      - [6, M2.NO, 7]\n"
    new = BASE.replace(a + b, b + a)
    d = semantic_diff(load(BASE), load(new))
    # one of the two swapped rungs moved relative to the other three; the earlier one is named
    assert [(r.title, r.change, r.moved, r.old_index, r.new_index, r.matched_by) for r in d.rungs] == [("Grinder running", MOVED, True, 1, 2, "title")]
    assert not d.electrical_changes
    assert changed_rungs(d) == ([], [])
    assert '~ rung 2 -> 3 "Grinder running" (moved among the rungs)' in render_text([d])


def test_retitled_rung_is_matched_by_content():
    new = BASE.replace("title: Wash pump running", "title: Pump run lamp")
    d = semantic_diff(load(BASE), load(new))
    assert items(d) == [("rung", "Pump run lamp", CHANGED, ("title", "Wash pump running", "Pump run lamp"))]
    assert d.rungs[0].matched_by == "content"


def test_untitled_rungs_are_matched_by_content_not_position():
    old = re.sub(r"  - title: [^\n]*\n    paths:", "  - paths:", BASE)
    lamp = "  - paths:\n      - [L1, M1.NO, 5, PL1, X2]\n"
    new = old.replace(lamp, "").replace("expect:", lamp + "expect:")
    d = semantic_diff(load(old), load(new))
    assert [(r.change, r.old_index, r.new_index, r.matched_by) for r in d.rungs] == [(MOVED, 1, 3, "content")]
    assert not d.electrical_changes


def test_element_moved_to_another_rung_on_the_same_wires_is_noted():
    new = BASE.replace("      - [2, M1.NO, 3]\n", "").replace("      - [L1, M1.NO, 5, PL1, X2]\n", "      - [L1, M1.NO, 5, PL1, X2]\n      - [2, M1.NO, 3]\n")
    d = semantic_diff(load(BASE), load(new))
    notes = sorted(e.note for r in d.rungs for e in r.elements)
    assert notes == ["moved from rung 1, same wires", "moved to rung 2, same wires"]


def test_changed_rungs_lists_old_and_new_indices():
    new = BASE.replace("      - [2, M1.NO, 3]\n", "")  # rung 1 (index 0) changed
    new = new.replace("  - title: Wash pump running\n    paths:\n      - [L1, M2.NO, 9, PL2, X2]\n", "")  # index 3 removed
    d = semantic_diff(load(BASE), load(new))
    assert changed_rungs(d) == ([0, 3], [0])


def test_added_and_deleted_files():
    sch = load(BASE)
    added = semantic_diff(None, sch)
    assert added.status == "added"
    assert {r.change for r in added.rungs} == {ADDED} and len(added.rungs) == 4
    assert changed_rungs(added) == ([], [0, 1, 2, 3])
    deleted = semantic_diff(sch, None)
    assert deleted.status == "deleted" and {d.change for d in deleted.devices} == {REMOVED}


# -- findings ------------------------------------------------------------------------------------

class LonelyWire:
    """A test rule whose messages name wires and rungs, as the real rules do."""

    __name__ = "test-lonely-wire"

    @hookimpl
    def ctllint_rules(self):
        def check(ctx):
            sch = ctx.schematic
            rails = {w for s in sch.supplies.values() for w in (s.hot, s.common)}
            ends: dict[str, list] = {}
            for el in sch.elements:
                for w in (el.left, el.right):
                    ends.setdefault(w, []).append(el)
            for wire, els in ends.items():
                if wire not in rails and len(els) == 1:
                    yield Finding(els[0].loc, f"wire {wire} in rung {sch.rungs[els[0].rung].number} ends at {els[0].text}")
        return [Rule("lonely-wire", Severity.WARNING, "a wire with one end", "test", "test", check)]


def test_findings_are_matched_with_wire_renames_and_rung_numbers_applied():
    test_checker = checker(plugins=[LonelyWire()], entry_points=False)
    old = BASE.replace("      - [L1, M1.NO, 5, PL1, X2]\n", "      - [L1, M1.NO, 5, PL1, X2]\n      - [5, PL3, 10]\n")
    old = old.replace("  PL2: {kind", "  PL3: {kind: pilot-light, voltage: 120 VAC}\n  PL2: {kind")
    # renumber every wire and add a rung on top: the lonely wire 10 of rung 2 is now wire 110 of rung 3
    new = renumber(old, {"2": "102", "3": "103", "4": "104", "5": "105", "10": "110"})
    new = new.replace("rungs:\n", "rungs:\n  - title: Lamp test\n    paths:\n      - [L1, PL2, X2]\n")
    o = test_checker.check_text(old, "p.ctl.yaml").diagnostics
    n = test_checker.check_text(new, "p.ctl.yaml").diagnostics
    assert [d.message for d in o] == ["wire 10 in rung 2 ends at PL3"]
    assert [d.message for d in n] == ["wire 110 in rung 3 ends at PL3"]
    d = semantic_diff(load(old), load(new), o, n)
    assert d.findings == []
    assert d.wire_renames == {"2": "102", "3": "103", "4": "104", "5": "105", "10": "110"}
    # without the finding lists, findings are not compared
    assert not semantic_diff(load(old), load(new)).findings_compared


def test_translate_message_keeps_tags_and_parts():
    msg = "coil M1 via L1-M1.NO-3 and wire 3. rung 3, wire 30, PB3.NC, 3A"
    assert translate_message(msg, {"3": "13"}, {3: 4}) == "coil M1 via L1-M1.NO-13 and wire 13. rung 4, wire 30, PB3.NC, 3A"


# -- revisions that do not load -------------------------------------------------------------------

def test_a_revision_that_does_not_load_gives_its_errors_and_a_line_diff(tmp_path):
    (tmp_path / "old.ctl.yaml").write_text(BASE)
    (tmp_path / "new.ctl.yaml").write_text(BASE.replace("kind: overload", "kind: overlaod"))
    d = diff_files(str(tmp_path / "old.ctl.yaml"), str(tmp_path / "new.ctl.yaml"))
    assert d.status == "unloadable"
    assert "overlaod" in d.load_errors["new"][0].message
    assert any(line.startswith("+") and "overlaod" in line for line in d.text_diff)


def test_a_failing_checker_leaves_findings_uncompared():
    class Broken:
        host = checker().host
        limits = checker().limits
        device_cache = checker().device_cache

        def check_text(self, text, path):
            raise RuntimeError("boom")

    d = diff_revisions(Revision("a.ctl.yaml", text=BASE), Revision("a.ctl.yaml", text=BASE.replace("setting: 82 A", "setting: 90 A")), Broken())
    assert not d.findings_compared and any("boom" in n for n in d.notes)
    assert [dev.tag for dev in d.devices] == ["OL1"]


# -- the command ------------------------------------------------------------------------------

@pytest.fixture
def clean_env(monkeypatch):
    monkeypatch.delenv("NO_COLOR", raising=False)
    monkeypatch.setenv("CTLLINT_NO_CACHE", "1")


def test_cli_two_files_text_is_ascii_and_exit_0(capsys, clean_env):
    folder = os.path.join(DATA, "seal-in-removed")
    assert main(["diff", os.path.join(folder, "old.ctl.yaml"), os.path.join(folder, "new.ctl.yaml")]) == 0
    out = capsys.readouterr().out
    assert out.isascii() and "\033" not in out
    assert "- M1.NO on wires 2-3" in out
    assert re.search(r"\+ error: .*\[seal-in\] \(line 21\)", out)


def test_cli_json(capsys, clean_env):
    folder = os.path.join(DATA, "rating-changed")
    assert main(["diff", "--format", "json", os.path.join(folder, "old.ctl.yaml"), os.path.join(folder, "new.ctl.yaml")]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["changed"] == 1
    (f,) = doc["files"]
    assert f["devices"] == [{"tag": "PB2", "change": "changed", "kind": "pushbutton", "old_line": 7, "new_line": 7,
                             "fields": [{"field": "rating", "old": "A600", "new": "[{category: AC-15, current: 3 A, voltage: 240 V}]"}]}]
    assert f["findings"] == {"compared": True, "changes": []}


def test_cli_colour_only_when_asked_and_never_with_no_color(capsys, monkeypatch, clean_env):
    folder = os.path.join(DATA, "element-removed")
    args = ["diff", "--color", "always", os.path.join(folder, "old.ctl.yaml"), os.path.join(folder, "new.ctl.yaml")]
    assert main(args) == 0
    assert "\033[31m- PL3" in capsys.readouterr().out
    monkeypatch.setenv("NO_COLOR", "1")
    assert main(args) == 0
    assert "\033" not in capsys.readouterr().out


@pytest.mark.parametrize("argv", [
    ["diff", "missing-old.ctl.yaml", "missing-new.ctl.yaml"],
    ["diff", os.path.join(DATA, "rung-added", "old.ctl.yaml")],
    ["diff", DATA, DATA],
    ["diff", "--git-external", "a", "b", "c"],
    ["diff", "--format", "sarif", "a", "b"],
])
def test_cli_usage_errors_exit_2(argv, capsys, clean_env):
    assert main(argv) == 2


def test_cli_dev_null_is_an_absent_side(capsys, clean_env):
    new = os.path.join(DATA, "rung-added", "new.ctl.yaml")
    assert main(["diff", "--no-findings", "/dev/null", new]) == 0
    out = capsys.readouterr().out
    assert "[new file]" in out and '+ rung 1 "Control power on"' in out


# -- git ------------------------------------------------------------------------------------------

needs_git = pytest.mark.skipif(shutil.which("git") is None, reason="git is not installed")


def git(repo, *args: str) -> str:
    env = {**os.environ, "GIT_CONFIG_NOSYSTEM": "1", "GIT_CONFIG_GLOBAL": os.devnull, "NO_COLOR": "1"}
    done = subprocess.run(["git", *args], cwd=repo, env=env, capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    return done.stdout


@pytest.fixture
def repo(tmp_path, monkeypatch, clean_env):
    """A repository with two schematics and a shared device file, committed once."""
    root = tmp_path / "repo"
    (root / "plant").mkdir(parents=True)
    (root / "lib").mkdir()
    git(root, "init", "-q")
    git(root, "config", "user.email", "ci@example.com")
    git(root, "config", "user.name", "ci")
    (root / ".gitattributes").write_text("*.ctl.yaml diff=ctllint\n")
    (root / "plant" / "press.ctl.yaml").write_text(open(os.path.join(DATA, "seal-in-removed", "old.ctl.yaml")).read())
    (root / "plant" / "wash.ctl.yaml").write_text(open(os.path.join(DATA, "wires-renumbered", "old.ctl.yaml")).read())
    (root / "notes.txt").write_text("hello\n")
    git(root, "add", ".")
    git(root, "commit", "-qm", "first")
    monkeypatch.chdir(root)
    return root


DRIVER = f'"{sys.executable}" -m ctllint diff --git-external'


@needs_git
def test_git_external_diff_driver_shows_the_semantic_diff(repo):
    (repo / "plant" / "press.ctl.yaml").write_text(open(os.path.join(DATA, "seal-in-removed", "new.ctl.yaml")).read())
    (repo / "plant" / "wash.ctl.yaml").write_text(open(os.path.join(DATA, "wires-renumbered", "new.ctl.yaml")).read())
    (repo / "notes.txt").write_text("hello again\n")
    out = git(repo, "-c", f"diff.ctllint.command={DRIVER}", "diff")
    assert "ctllint diff plant/press.ctl.yaml" in out
    assert "- M1.NO on wires 2-3" in out
    assert re.search(r"\+ error: .*\[seal-in\]", out)
    assert "ctllint diff plant/wash.ctl.yaml" in out and "wire 2 -> 102" in out
    assert "+hello again" in out  # other files keep git's own line diff
    assert "@@" not in out.split("diff --git a/notes.txt")[0]  # no line diff for schematics


@needs_git
def test_git_external_diff_for_added_deleted_and_staged_files(repo):
    git(repo, "rm", "-q", "plant/wash.ctl.yaml")
    (repo / "plant" / "new.ctl.yaml").write_text(open(os.path.join(DATA, "rung-added", "new.ctl.yaml")).read())
    git(repo, "add", "plant/new.ctl.yaml")
    out = git(repo, "-c", f"diff.ctllint.command={DRIVER} --no-findings", "diff", "--cached", "--no-renames")
    assert "ctllint diff plant/new.ctl.yaml (none -> " in out and "[new file]" in out
    assert "ctllint diff plant/wash.ctl.yaml" in out and "[deleted]" in out
    assert '- rung 3 "Wash pump"' in out


@needs_git
def test_git_external_diff_of_a_renamed_schematic_takes_nine_arguments(repo):
    git(repo, "mv", "plant/wash.ctl.yaml", "plant/washer.ctl.yaml")
    path = repo / "plant" / "washer.ctl.yaml"
    path.write_text(path.read_text().replace("setting: 8 A", "setting: 9 A"))
    git(repo, "add", ".")
    out = git(repo, "-c", f"diff.ctllint.command={DRIVER} --no-findings", "diff", "--cached", "-M")
    assert "ctllint diff plant/wash.ctl.yaml -> plant/washer.ctl.yaml" in out
    assert "~ setting: 8 A -> 9 A" in out


def test_git_external_unmerged_path_is_not_an_error(capsys):
    assert main(["diff", "--git-external", "plant/press.ctl.yaml"]) == 0
    assert "unmerged" in capsys.readouterr().out


def test_cli_output_file(tmp_path, capsys, clean_env):
    folder = os.path.join(DATA, "contact-moved")
    target = tmp_path / "diff.json"
    assert main(["diff", "--format", "json", "-o", str(target), os.path.join(folder, "old.ctl.yaml"), os.path.join(folder, "new.ctl.yaml")]) == 0
    assert capsys.readouterr().out == ""
    doc = json.loads(target.read_text())
    assert doc["files"][0]["rungs"][0]["elements"][0]["change"] == "moved"


@needs_git
def test_git_external_accepts_gits_seven_arguments(repo, capsys):
    new = repo / "plant" / "press.ctl.yaml"
    old_copy = repo.parent / "git-blob-press.ctl.yaml"
    old_copy.write_text(new.read_text())
    new.write_text(new.read_text().replace("setting: 82 A", "setting: 90 A"))
    argv = ["diff", "--git-external", "--no-findings", "plant/press.ctl.yaml", str(old_copy), "1" * 40, "100644", "plant/press.ctl.yaml", "0" * 40, "100644"]
    assert main(argv) == 0
    out = capsys.readouterr().out
    assert "ctllint diff plant/press.ctl.yaml (111111111 -> working tree)" in out
    assert "~ setting: 82 A -> 90 A" in out


@needs_git
def test_git_revision_against_working_tree_and_between_revisions(repo, capsys):
    (repo / "plant" / "press.ctl.yaml").write_text(open(os.path.join(DATA, "seal-in-removed", "new.ctl.yaml")).read())
    assert main(["diff", "--git", "HEAD"]) == 0
    out = capsys.readouterr().out
    assert "ctllint diff plant/press.ctl.yaml (HEAD -> working tree)" in out and "[seal-in]" in out
    assert "wash.ctl.yaml" not in out
    git(repo, "commit", "-qam", "second")
    assert main(["diff", "--git", "HEAD~1..HEAD", "--format", "json", "plant/press.ctl.yaml"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert [f["new_path"] for f in doc["files"]] == ["plant/press.ctl.yaml"]
    assert [(f["change"], f["rule"]) for f in doc["files"][0]["findings"]["changes"] if f["rule"] == "seal-in"] == [("appeared", "seal-in")]
    assert main(["diff", "--git", "HEAD"]) == 0
    assert "no schematic changed" in capsys.readouterr().out


@needs_git
def test_git_reads_used_device_files_from_the_revision(repo, capsys):
    (repo / "lib" / "motors.ctl.yaml").write_text("ctllint: 1\ndevices:\n  OL9: {kind: overload, setting: 10 A}\n")
    press = repo / "plant" / "press.ctl.yaml"
    press.write_text(press.read_text().replace("ctllint: 1\n", "ctllint: 1\nuse: [../lib/motors.ctl.yaml]\n", 1))
    git(repo, "add", ".")
    git(repo, "commit", "-qm", "shared devices")
    (repo / "lib" / "motors.ctl.yaml").write_text("ctllint: 1\ndevices:\n  OL9: {kind: overload, setting: 12 A}\n")
    press.write_text(press.read_text().replace("setting: 82 A", "setting: 90 A"))
    git(repo, "commit", "-qam", "settings")
    assert main(["diff", "--no-findings", "--git", "HEAD~1..HEAD", "plant/"]) == 0
    out = capsys.readouterr().out
    assert "~ setting: 82 A -> 90 A" in out
    assert "~ setting: 10 A -> 12 A" in out  # OL9 as the old revision's device file had it


@needs_git
def test_git_shows_schematics_that_use_a_changed_device_file(repo, capsys):
    press = repo / "plant" / "press.ctl.yaml"
    text = press.read_text()
    line = "  OL1: {kind: overload, setting: 82 A}\n"
    assert line in text
    press.write_text(text.replace(line, "").replace("ctllint: 1\n", "ctllint: 1\nuse: [../lib/overloads.ctl.yaml]\n", 1))
    (repo / "lib" / "overloads.ctl.yaml").write_text("ctllint: 1\ndevices:\n" + line)
    git(repo, "add", ".")
    git(repo, "commit", "-qm", "overloads in a shared file")
    (repo / "lib" / "overloads.ctl.yaml").write_text("ctllint: 1\ndevices:\n" + line.replace("82 A", "50 A"))
    assert main(["diff", "--git", "HEAD", "--format", "json"]) == 0
    files = {f["new_path"]: f for f in json.loads(capsys.readouterr().out)["files"]}
    assert sorted(files) == ["lib/overloads.ctl.yaml", "plant/press.ctl.yaml"]
    press_diff = files["plant/press.ctl.yaml"]
    assert press_diff["notes"][0] == "unchanged itself; shown because it uses lib/overloads.ctl.yaml, which changed"
    assert [(d["tag"], d["fields"]) for d in press_diff["devices"]] == [("OL1", [{"field": "setting", "old": "82 A", "new": "50 A"}])]
    assert [(f["change"], f["rule"]) for f in press_diff["findings"]["changes"]] == [("appeared", "overload-setting")]
    # the wash schematic does not use the file and is not listed
    assert "plant/wash.ctl.yaml" not in files


@needs_git
@pytest.mark.parametrize("rev", ["nope", "HEAD..nope", "--all", ""])
def test_git_bad_revision_exits_2(repo, rev, capsys):
    assert main(["diff", f"--git={rev}"]) == 2
    assert "revision" in capsys.readouterr().err


def test_git_outside_a_repository_exits_2(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    monkeypatch.setenv("GIT_CEILING_DIRECTORIES", str(tmp_path.parent))
    assert main(["diff", "--git", "HEAD"]) == 2
    assert "git" in capsys.readouterr().err


def test_help_documents_the_git_setup(capsys):
    with pytest.raises(SystemExit):
        main(["diff", "--help"])
    out = capsys.readouterr().out
    assert 'git config diff.ctllint.command "ctllint diff --git-external --"' in out
    assert "diff=ctllint" in out
    import ctllint.commands.diff as module

    assert "path old-file old-hex old-mode new-file new-hex new-mode" in module.__doc__
