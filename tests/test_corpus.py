"""Precision and recall over the project's own circuits.

- Every circuit of fixtures/clean/ (everyday practice that obeys every rule)
  gives no finding at all, info included.
- The demo plant gives exactly the findings its ``# expect: RULE`` comments
  mark, on those lines, and nothing else.
"""
import glob
import os
import re

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
