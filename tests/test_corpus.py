"""Precision and recall over the project's own circuits.

- Every circuit of fixtures/clean/ (everyday practice that obeys every rule)
  gives no finding at all, info included.
- The demo plant gives exactly the findings its ``# expect: RULE`` comments
  mark, on those lines, and nothing else.
"""
import glob
import json
import os
import re
import shutil

import pytest

from ctllint.testing import checker

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
CLEAN = sorted(glob.glob(os.path.join(ROOT, "fixtures", "clean", "*.ctl.yaml")))
DEMO = sorted(glob.glob(os.path.join(ROOT, "fixtures", "demo", "**", "*.ctl.yaml"), recursive=True))


def test_corpus_is_large_enough():
    assert len(CLEAN) >= 30


@pytest.mark.parametrize("path", CLEAN, ids=os.path.basename)
def test_clean_circuit_gives_no_finding(path):
    result = checker().check_file(path)
    listing = "\n".join(f"{d.line}:{d.column}: {d.severity}: {d.message} [{d.rule}]" for d in result.diagnostics)
    assert result.diagnostics == [], listing


def expected_marks(path):
    marks = []
    with open(path, encoding="utf-8") as handle:
        for number, line in enumerate(handle, start=1):
            for m in re.finditer(r"#\s*expect:\s*([a-z-]+)", line):
                marks.append((m.group(1), number))
    return sorted(marks)


@pytest.mark.parametrize("path", DEMO, ids=lambda p: os.path.relpath(p, ROOT))
def test_demo_findings_are_the_marked_ones(path):
    result = checker().check_file(path)
    got = sorted((d.rule, d.line) for d in result.diagnostics if d.path == path)
    assert got == expected_marks(path)


def test_demo_has_real_findings():
    assert sum(len(expected_marks(p)) for p in DEMO) >= 5


# ---------------------------------------------------------------------------
# A control transformer shared by two schematics through a device file.
# The precision test above checks each file alone; the transformer's load is
# summed only over a run (RULES.md, control-transformer), so the pair is also
# checked together here. The device file sits in fixtures/clean/library/,
# outside the CLEAN glob (not a schematic).
# ---------------------------------------------------------------------------

SHARED_PAIR = [
    os.path.join(ROOT, "fixtures", "clean", "shared-transformer-case-erector.ctl.yaml"),
    os.path.join(ROOT, "fixtures", "clean", "shared-transformer-case-sealer.ctl.yaml"),
]
SHARED_DEVICES = os.path.join(ROOT, "fixtures", "clean", "library", "packing-hall-power.ctl.yaml")


def run_json(capsys, *args):
    from ctllint.commands.cli import main

    code = main(["check", "--format", "json", "--no-cache", "-j", "1", "--fail-on", "info", *args])
    return code, json.loads(capsys.readouterr().out)


def test_device_file_is_not_taken_for_a_schematic():
    assert SHARED_DEVICES not in CLEAN
    assert all(p in CLEAN for p in SHARED_PAIR)


def test_shared_transformer_pair_is_clean_together(capsys):
    # Sealed VA on T1 (150 VA): erector M1 24 + CR1 8 + SOL1 22 + SOL2 15 + PL1 1 = 70 VA,
    # sealer M2 20 + CR2 8 + SOL3 22 + PL2 1 + PL3 1 = 52 VA; 70 + 52 = 122 VA <= 150 VA.
    code, doc = run_json(capsys, *SHARED_PAIR)
    assert doc["diagnostics"] == [] and doc["files"] == 2 and code == 0


def _copy_pair(tmp_path, sol3_sealed):
    (tmp_path / ".git").mkdir()  # a repository root, as in a checkout
    (tmp_path / "library").mkdir()
    shutil.copy(SHARED_DEVICES, tmp_path / "library" / os.path.basename(SHARED_DEVICES))
    for path in SHARED_PAIR:
        shutil.copy(path, tmp_path / os.path.basename(path))
    sealer = tmp_path / os.path.basename(SHARED_PAIR[1])
    old = "SOL3: {kind: solenoid, voltage: 120 VAC, inrush: 50 VA, sealed: 22 VA}"
    text = sealer.read_text(encoding="utf-8")
    assert old in text
    sealer.write_text(text.replace(old, f"SOL3: {{kind: solenoid, voltage: 120 VAC, inrush: 120 VA, sealed: {sol3_sealed}}}"), encoding="utf-8")
    devices = tmp_path / "library" / os.path.basename(SHARED_DEVICES)
    t1_line = next(n for n, line in enumerate(devices.read_text(encoding="utf-8").splitlines(), 1) if line.startswith("  T1:"))
    return devices, t1_line


def test_shared_transformer_overloaded_only_by_the_sum(tmp_path, monkeypatch, capsys):
    # A larger tape-head solenoid on the sealer, 55 VA sealed: sealer 20 + 8 + 55 + 1 + 1 = 85 VA,
    # erector 70 VA; each alone is within 150 VA, together 70 + 85 = 155 VA > 150 VA.
    devices, t1_line = _copy_pair(tmp_path, "55 VA")
    monkeypatch.chdir(tmp_path)
    names = [os.path.basename(p) for p in SHARED_PAIR]
    for name in names:  # each file alone (as the precision test checks it) gives nothing
        assert checker().check_file(str(tmp_path / name)).diagnostics == []
    code, doc = run_json(capsys, *names)
    found = [(d["path"], d["line"], d["rule"], d["severity"]) for d in doc["diagnostics"]]
    assert found == [(os.path.join("library", devices.name), t1_line, "control-transformer", "error")]
    assert "155 VA" in doc["diagnostics"][0]["message"] and code == 1
    # a pre-commit run on the changed sealer alone brings in the erector, which names the same T1
    code, doc = run_json(capsys, names[1])
    assert [(d["line"], d["rule"]) for d in doc["diagnostics"]] == [(t1_line, "control-transformer")]


def test_shared_transformer_at_its_rating_passes(tmp_path, monkeypatch, capsys):
    # The edge: SOL3 at 50 VA sealed makes 70 + 80 = 150 VA, exactly the rating: no finding.
    _copy_pair(tmp_path, "50 VA")
    monkeypatch.chdir(tmp_path)
    code, doc = run_json(capsys, *[os.path.basename(p) for p in SHARED_PAIR])
    assert doc["diagnostics"] == [] and code == 0
