"""A control transformer in a shared device file carries the loads of every
schematic of the run that names it (RULES.md "control-transformer"), and a
run on one of those schematics brings in the others.

Worked arithmetic (common practice, CHECK-VALUES.md "sum sealed VA of loads
on together"): schematic A holds 60 + 10 VA sealed, schematic B 50 + 10 VA:
each far below the 100 VA rating, together 130 VA above it.
"""
import json
import os

import pytest

from ctllint.commands.cli import main

DEVICES = """ctllint: 1
devices:
  T1: {kind: transformer, primary: 480 V, secondary: 120 VAC, rating: RATING, fuses: [FU1, FU2]}
  FU1: {kind: fuse, rating: 1 A, side: primary}
  FU2: {kind: fuse, rating: 1 A, side: primary}
"""

SCHEMATIC = """ctllint: 1
use: [../lib/panel.ctl.yaml]
supplies:
  ctl: {hot: X1, common: X2, voltage: 120 VAC, source: T1}
devices:
  SS1: {kind: selector, positions: [off, run], rating: A600}
  CR1: {kind: relay, coil: 120 VAC, inrush: 40 VA, sealed: 10 VA, rating: A600}
  SOL1: {kind: solenoid, voltage: 120 VAC, inrush: 300 VA, sealed: SEALED}
rungs:
  - paths: [[X1, SS1.run, 1, CR1.coil, X2]]
  - paths: [[X1, CR1.NO, 2, SOL1, X2]]
"""


def make(tmp_path, rating="100 VA", a="60 VA", b="50 VA"):
    tmp_path.mkdir(parents=True, exist_ok=True)
    (tmp_path / ".git").mkdir()
    (tmp_path / "lib").mkdir()
    (tmp_path / "plant").mkdir()
    (tmp_path / "lib" / "panel.ctl.yaml").write_text(DEVICES.replace("RATING", rating))
    (tmp_path / "plant" / "a.ctl.yaml").write_text(SCHEMATIC.replace("SEALED", a))
    (tmp_path / "plant" / "b.ctl.yaml").write_text(SCHEMATIC.replace("SEALED", b))
    return tmp_path


def run(monkeypatch, capsys, root, *paths):
    monkeypatch.chdir(root)
    monkeypatch.setenv("CTLLINT_NO_CACHE", "1")
    code = main(["check", "--format", "json", *paths])
    return code, json.loads(capsys.readouterr().out)


def transformer_findings(report):
    return [d for d in report["diagnostics"] if d["rule"] == "control-transformer"]


def test_two_schematics_sum_on_the_shared_transformer(tmp_path, monkeypatch, capsys):
    root = make(tmp_path)
    code, report = run(monkeypatch, capsys, root, "plant")
    [finding] = transformer_findings(report)
    assert code == 1
    assert finding["path"].endswith(os.path.join("lib", "panel.ctl.yaml")) and finding["line"] == 3
    assert "130 VA" in finding["message"] and "2 schematics" in finding["message"]


def test_one_changed_schematic_brings_in_the_other_user(tmp_path, monkeypatch, capsys):
    # a pre-commit run passes only the changed file: B is brought in because
    # it names the same transformer of the same device file
    root = make(tmp_path)
    (root / "plant" / "b.ctl.yaml").write_text(SCHEMATIC.replace("SEALED", "50 VA").replace("SS1.run", "SS1.NO"))
    code, report = run(monkeypatch, capsys, root, "plant/a.ctl.yaml")
    assert [f["line"] for f in transformer_findings(report)] == [3]
    # B is read for its load only: its own finding (a part SS1 lacks) is for a run that checks B
    assert {d["rule"] for d in report["diagnostics"]} == {"control-transformer"}
    assert report["files"] == 1


def test_within_the_rating_together_is_quiet(tmp_path, monkeypatch, capsys):
    # 60 + 10 + 50 + 10 = 130 VA <= 150 VA
    root = make(tmp_path, rating="150 VA")
    code, report = run(monkeypatch, capsys, root, "plant")
    assert transformer_findings(report) == [] and code == 0


def test_each_alone_is_below_the_rating(tmp_path):
    # the per-file check knows nothing of the other schematic: a shared
    # transformer is judged only by the run-wide sum
    from ctllint.testing import checker

    root = make(tmp_path)
    found = checker().check_file(str(root / "plant" / "a.ctl.yaml")).diagnostics
    assert [d for d in found if d.rule == "control-transformer"] == []


def test_the_sum_survives_the_cache(tmp_path, monkeypatch, capsys):
    # the second run takes both files from the cache: their collected loads
    # are kept with their results, so the run-wide sum is the same
    root = make(tmp_path / "repo")
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "cache"))
    monkeypatch.delenv("CTLLINT_NO_CACHE", raising=False)
    monkeypatch.chdir(root)
    for _ in range(2):
        assert main(["check", "--format", "json", "plant"]) == 1
        report = json.loads(capsys.readouterr().out)
        assert [f["line"] for f in transformer_findings(report)] == [3]
    assert any((tmp_path / "cache").rglob("*.json"))


def test_outside_git_a_run_on_one_user_still_finds_the_other(tmp_path, monkeypatch, capsys):
    # No .git: the schematics sit beside the library folder, under the working folder.
    (tmp_path / "lib").mkdir()
    (tmp_path / "lib" / "panel.ctl.yaml").write_text(DEVICES.replace("RATING", "100 VA"))
    (tmp_path / "a.ctl.yaml").write_text(SCHEMATIC.replace("../lib/", "lib/").replace("SEALED", "60 VA"))
    (tmp_path / "b.ctl.yaml").write_text(SCHEMATIC.replace("../lib/", "lib/").replace("SEALED", "50 VA"))
    monkeypatch.setenv("GIT_CEILING_DIRECTORIES", str(tmp_path.parent))
    code, report = run(monkeypatch, capsys, tmp_path, "a.ctl.yaml")
    assert [f["line"] for f in transformer_findings(report)] == [3]


def test_a_suppression_at_the_shared_transformer_holds_for_the_run_wide_finding(tmp_path, monkeypatch, capsys):
    root = make(tmp_path)
    lib = root / "lib" / "panel.ctl.yaml"
    lib.write_text(lib.read_text().replace("FU2]}", "FU2]}  # ctllint-allow: control-transformer -- second transformer on order"))
    code, report = run(monkeypatch, capsys, root, "plant")
    assert transformer_findings(report) == []
