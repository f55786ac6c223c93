"""Hostile text in files and settings: what reaches a terminal, an XML or SARIF report, and the configuration.

Each test reproduces one way a file, a file name or a setting could forge
output, break a report, mislocate a finding, or end a command with a
traceback, and checks the outcome against what is written by hand here.
"""
from __future__ import annotations

import json
import os
import subprocess
import sys
import textwrap
import xml.dom.minidom
import xml.etree.ElementTree as ET
from urllib.parse import quote, unquote

import pytest

from ctllint.commands.cli import main
from ctllint.reading.model import Diagnostic, Severity

ESC = "\x1b"
RLO = "\u202e"   # right-to-left override

# Tags, titles and a scenario name holding an escape sequence, a carriage return and a
# right-to-left override (a double-quoted YAML key may hold any of them).
EVIL = textwrap.dedent("""\
    ctllint: 1
    title: "Evil \\e[31mRED\\u202e"
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      "CR\\e[2J1": {kind: relay, coil: 120 VAC}
      PB1: {kind: pushbutton, function: start}
      "PB\\u202e2": {kind: pushbutton, function: stop}
    rungs:
      - title: "T\\rforged"
        paths:
          - [L1, "PB\\u202e2.NC", 2, PB1.NO, 1, "CR\\e[2J1.coil", X2]
    expect:
      - name: "s\\e]0;x\\u0007"
        steps:
          - press: PB1
          - check: {"CR\\e[2J1": on}
    """)


def run(capsys, *args) -> tuple[int, str, str]:
    code = main(list(args))
    out, err = capsys.readouterr()
    return code, out, err


def no_raw_controls(text: str) -> None:
    for ch in (ESC, "\r", RLO, "\x07"):
        assert ch not in text, repr(text)


@pytest.fixture
def evil(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    monkeypatch.setenv("NO_COLOR", "1")
    (tmp_path / "evil.ctl.yaml").write_text(EVIL, encoding="utf-8")
    (tmp_path / "evil2.ctl.yaml").write_text(EVIL.replace("PB1.NO", "PB1.NC"), encoding="utf-8")
    return tmp_path


def test_xref_shows_control_characters_in_tags_escaped(evil, capsys):
    code, out, _ = run(capsys, "xref", "evil.ctl.yaml")
    assert code == 0
    no_raw_controls(out)
    assert "CR\\x1b[2J1" in out


def test_simulate_shows_tags_and_scenario_names_escaped(evil, capsys):
    code, out, _ = run(capsys, "simulate", "evil.ctl.yaml", "--scenario", "s\x1b]0;x\x07", "--layout", "steps")
    no_raw_controls(out)
    assert "scenario 's\\x1b]0;x\\x07'" in out
    assert "check:CR\\x1b[2J1=on" in out
    code, out, _ = run(capsys, "simulate", "evil.ctl.yaml", "--step", "press:PB1", "--layout", "loads")
    no_raw_controls(out)
    assert "CR\\x1b[2J1" in out


def test_diff_shows_titles_tags_and_messages_escaped(evil, capsys):
    code, out, _ = run(capsys, "diff", "evil.ctl.yaml", "evil2.ctl.yaml")
    assert code == 0
    no_raw_controls(out)
    assert 'rung 1 "T\\rforged"' in out
    assert "PB\\u202e2" in out or "CR\\x1b[2J1" in out


def test_diff_still_colours_its_own_markers(evil, capsys, monkeypatch):
    monkeypatch.delenv("NO_COLOR")
    code, out, _ = run(capsys, "diff", "--color", "always", "evil.ctl.yaml", "evil2.ctl.yaml")
    assert "\x1b[32m+ PB1.NC" in out           # the diff's own colour codes stay
    assert "\x1b[2J" not in out and RLO not in out


def test_svg_and_html_report_hold_no_control_characters(evil, capsys):
    from ctllint.output.draw import render_svg
    from ctllint.reading.loader import load_text

    sch = load_text(EVIL, "evil.ctl.yaml").schematic
    svg = render_svg(sch)
    xml.dom.minidom.parseString(svg)            # XML refuses raw control characters
    no_raw_controls(svg)
    assert "CR\\x1b[2J1" in svg and "PB\\u202e2" in svg
    code, _, _ = run(capsys, "report", "evil.ctl.yaml", "-o", "r.html")
    page = (evil / "r.html").read_text(encoding="utf-8")
    no_raw_controls(page)


def test_junit_has_no_xml_invalid_characters(tmp_path):
    from ctllint.output.report import render_junit

    d = Diagnostic("a\ufffe.ctl.yaml", 3, 4, "format", Severity.ERROR, "bad \ufffe\uffff\x01 \ud800 value")
    text = render_junit([d], ["a\ufffe.ctl.yaml"], {})
    root = ET.fromstring(text.encode("utf-8", "surrogatepass"))
    failure = root.find(".//failure")
    assert failure.get("message") == "bad \\ufffe\\uffff\\x01 \\ud800 value"


def test_junit_output_of_a_file_named_with_ufffe_parses(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "a\ufffe.ctl.yaml").write_text("ctllint: 1\nrungs: [\n", encoding="utf-8")
    code, _, _ = run(capsys, "check", "--no-cache", "--format", "junit", "-o", "out.xml", ".")
    assert code == 1
    root = ET.parse(tmp_path / "out.xml").getroot()
    assert root.find(".//testcase").get("name") == "a\\ufffe.ctl.yaml"


@pytest.mark.parametrize("name", ["a b#1.ctl.yaml", "r?x=1.ctl.yaml", "100%.ctl.yaml", "\u00e9t\u00e9.ctl.yaml"])
def test_sarif_artifact_uris_are_percent_encoded(tmp_path, monkeypatch, capsys, name):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "plant").mkdir()
    (tmp_path / "plant" / name).write_text("ctllint: 1\nrungs: [\n", encoding="utf-8")
    code, out, _ = run(capsys, "check", "--no-cache", "--format", "sarif", "plant")
    log = json.loads(out)
    uri = log["runs"][0]["results"][0]["locations"][0]["physicalLocation"]["artifactLocation"]["uri"]
    assert uri == quote(f"plant/{name}") and all(ord(c) < 128 for c in uri)
    assert unquote(uri) == f"plant/{name}"      # RFC 3986: decoding gives the path back
    assert log["runs"][0]["artifacts"][0]["location"]["uri"] == uri


def test_a_control_character_is_located_where_it_is(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    text = ("ctllint: 1\ntitle: \u00e9t\u00e9 \U0001F600\nsupplies:\n  ctl: {hot: L1, common: X2, voltage: 120 VAC}\n"
            "devices:\n  CR1: {kind: relay, coil: 120 \x01VAC}\nrungs: []\n")
    (tmp_path / "c.ctl.yaml").write_text(text, encoding="utf-8")
    code, out, _ = run(capsys, "check", "--no-cache", "c.ctl.yaml")
    # Line 6, "  CR1: {kind: relay, coil: 120 " is 31 characters: the control character is column 32.
    assert out.startswith("c.ctl.yaml:6:32: error: YAML: unacceptable character #x0001"), out


def test_max_nodes_admits_a_file_of_ordinary_rungs_at_max_file_bytes():
    sys.path.insert(0, os.path.join(os.path.dirname(__file__), "benchmarks"))
    from generate import motor_circuits

    from ctllint.reading.yamlsafe import Limits, compose

    text = motor_circuits(100)
    counted = []

    def count(node):
        stack, n = [node], 0
        while stack:
            x = stack.pop()
            n += 1
            v = getattr(x, "value", None)
            if isinstance(v, list):
                for item in v:
                    stack.extend(item if isinstance(item, tuple) else (item,))
        return n
    counted = count(compose(text, Limits()))
    per_byte = counted / len(text.encode())
    limits = Limits()
    # A file of these rungs as large as max_file_bytes allows must stay under max_nodes, with room to spare.
    assert limits.max_nodes >= 1.5 * per_byte * limits.max_file_bytes
    # Raising max_file_bytes alone raises max_nodes with it.
    assert Limits(max_file_bytes=2 * limits.max_file_bytes).max_nodes == 2 * limits.max_file_bytes // 3


def test_max_nodes_follows_max_file_bytes_in_the_configuration(tmp_path):
    from ctllint.checking.config import load_config

    (tmp_path / ".ctllint.yaml").write_text("limits: {max_file_bytes: 90000000}\n")
    assert load_config(str(tmp_path / ".ctllint.yaml")).limits.max_nodes == 30000000
    (tmp_path / ".ctllint.yaml").write_text("limits: {max_file_bytes: 90000000, max_nodes: 1000}\n")
    assert load_config(str(tmp_path / ".ctllint.yaml")).limits.max_nodes == 1000


def test_jobs_in_the_configuration_is_used(tmp_path, monkeypatch, capsys):
    import ctllint.checking.run

    seen = []
    real = ctllint.checking.run.run_check

    def spy(*args, **kwargs):
        seen.append(kwargs.get("jobs"))
        return real(*args, **kwargs)
    monkeypatch.setattr(ctllint.checking.run, "run_check", spy)
    monkeypatch.chdir(tmp_path)
    (tmp_path / ".ctllint.yaml").write_text("jobs: 3\n")
    (tmp_path / "a.ctl.yaml").write_text("ctllint: 1\nrungs: []\n")
    run(capsys, "check", "--no-cache", ".")
    run(capsys, "check", "--no-cache", "-j", "1", ".")
    assert seen == [3, 1]  # the configuration's jobs, unless the command line says otherwise


def test_baseline_naming_a_folder_is_a_usage_error(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "a.ctl.yaml").write_text("ctllint: 1\nrungs: []\n")
    (tmp_path / "base").mkdir()
    code, _, err = run(capsys, "check", "--no-cache", "--baseline", "base", ".")
    assert code == 2
    assert "baseline 'base' is a folder" in err and "Traceback" not in err


def test_toml_whose_tool_is_not_a_table_is_a_configuration_error(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "settings.toml").write_text("tool = 1\n")
    (tmp_path / "a.ctl.yaml").write_text("ctllint: 1\nrungs: []\n")
    code, _, err = run(capsys, "check", "--no-cache", "--config", "settings.toml", ".")
    assert code == 2
    assert "configuration error" in err and "'tool' must be a table" in err


@pytest.mark.parametrize("setting", ["max_depth: 0.5", "max_file_bytes: 1000.5", "max_elements: 0.9", "max_nodes: 2.5"])
def test_a_fractional_count_limit_is_refused_not_truncated(tmp_path, monkeypatch, capsys, setting):
    monkeypatch.chdir(tmp_path)
    (tmp_path / ".ctllint.yaml").write_text(f"limits: {{{setting}}}\n")
    (tmp_path / "a.ctl.yaml").write_text("ctllint: 1\nrungs: []\n")
    code, _, err = run(capsys, "check", "--no-cache", ".")
    assert code == 2
    assert "is not a whole number" in err and ".ctllint.yaml:1" in err


def test_fractional_seconds_are_kept(tmp_path):
    from ctllint.checking.config import load_config

    (tmp_path / ".ctllint.yaml").write_text("limits: {plugin_seconds: 0.5, command_seconds: 0.25, max_depth: 12.0}\n")
    limits = load_config(str(tmp_path / ".ctllint.yaml")).limits
    assert (limits.plugin_seconds, limits.command_seconds, limits.max_depth) == (0.5, 0.25, 12)


SEAL_MISSING = textwrap.dedent("""\
    ctllint: 1
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      PB1: {kind: pushbutton, function: stop}
      PB2: {kind: pushbutton, function: start}
      CR1: {kind: relay, coil: 120 VAC}
    rungs:
      - note: "see # ctllint-allow: seal-in -- a quoted note is not a comment"
        paths:
          - [L1, PB1.NC, 2, PB2.NO, 3, CR1.coil, X2]{comment}
    """)


def test_a_suppression_inside_a_quoted_string_does_not_count(tmp_path, monkeypatch, capsys):
    from ctllint.testing import checker

    c = checker()
    # The rung in flow style on one line: the quoted title shares the line of the finding.
    head = SEAL_MISSING.split("rungs:")[0]
    quoted = head + ('rungs:\n  - {title: "see # ctllint-allow: seal-in -- inside quotes", '
                     "paths: [[L1, PB1.NC, 2, PB2.NO, 3, CR1.coil, X2]]}\n")
    rules = [d.rule for d in c.check_text(quoted, "q.ctl.yaml").diagnostics]
    assert "seal-in" in rules and "suppression" not in rules
    real = SEAL_MISSING.replace("{comment}", "  # ctllint-allow: seal-in -- jog station, released by design")
    rules = [d.rule for d in c.check_text(real, "r.ctl.yaml").diagnostics]
    assert "seal-in" not in rules and "suppression" not in rules


def test_comment_starts_follow_yaml_quoting():
    from ctllint.checking.suppress import comment_starts

    lines = [
        'a: "x # y"  # real',          # 0: the comment after the double-quoted string
        "b: 'it''s # y' # real",        # 1: '' inside single quotes
        "c: it's # real",              # 2: an apostrophe inside a plain scalar opens nothing
        "d: [1, 2]#notacomment",        # 3: '#' must follow a space
        "e: |",                         # 4: a block scalar: its lines are text
        "  # text, not a comment",      # 5
        "f: \"runs on",                 # 6: a double-quoted string running on
        "  # still text\" # real",      # 7
        "# at the start",               # 8
    ]
    assert comment_starts(lines) == [12, 15, 8, -1, -1, -1, -1, 16, 0]


def _repo_with_devices(root, n_devices: int, n_files: int):
    (root / ".git").mkdir()
    (root / "lib").mkdir()
    (root / "plant").mkdir()
    for k in range(n_devices):
        (root / "lib" / f"dev{k}.ctl.yaml").write_text(f"ctllint: 1\ndevices:\n  CR{k}: {{kind: relay, coil: 120 VAC}}\n")
    for i in range(n_files):
        k = i % (n_devices + 1)   # every (n_devices + 1)th file uses none of them
        use = f"use: [../lib/dev{k}.ctl.yaml]\n" if k < n_devices else ""
        (root / "plant" / f"p{i}.ctl.yaml").write_text(f"ctllint: 1\n{use}rungs: []\n")


def test_dependents_reads_the_repository_once_for_many_device_files(tmp_path, monkeypatch):
    import ctllint.checking.run

    _repo_with_devices(tmp_path, 5, 60)
    calls = []
    real = ctllint.checking.run.discover
    monkeypatch.setattr(ctllint.checking.run, "discover", lambda *a, **k: (calls.append(a), real(*a, **k))[1])
    files = [str(tmp_path / "lib" / f"dev{k}.ctl.yaml") for k in range(5)]
    found = ctllint.checking.run.dependents(files, [], None)
    assert len(calls) == 1
    # By hand: file p{i} uses dev{i % 6} when i % 6 < 5; listed device file by device file.
    want = [str(tmp_path / "plant" / f"p{i}.ctl.yaml") for k in range(5) for i in range(60) if i % 6 == k]
    assert sorted(os.path.abspath(t.path) for t in found) == sorted(want)
    uses = [int(os.path.basename(t.path)[1:-len(".ctl.yaml")]) % 6 for t in found]
    assert uses == sorted(uses)  # in the order of the device files given


def _git(cwd, *args):
    subprocess.run(["git", *args], cwd=cwd, check=True, capture_output=True,
                   env=dict(os.environ, GIT_AUTHOR_NAME="t", GIT_AUTHOR_EMAIL="t@example.invalid",
                            GIT_COMMITTER_NAME="t", GIT_COMMITTER_EMAIL="t@example.invalid"))


@pytest.mark.parametrize("entry", ['"a\\0b.ctl.yaml"', "x" * 200_000 + ".ctl.yaml", "../" * 3000 + "d.ctl.yaml"])
def test_use_paths_git_cannot_be_asked_about_do_not_crash(tmp_path, entry):
    if subprocess.run(["git", "--version"], capture_output=True).returncode != 0:
        pytest.skip("git not available")
    _git(tmp_path, "init", "-q")
    body = "ctllint: 1\nuse: [{entry}]\nsupplies:\n  ctl: {{hot: L1, common: X2, voltage: 120 VAC}}\ndevices:\n  CR1: {{kind: relay, coil: 120 VAC}}\nrungs: []\n"
    (tmp_path / "a.ctl.yaml").write_text(body.format(entry=entry))
    _git(tmp_path, "add", "-A")
    _git(tmp_path, "commit", "-qm", "one")
    (tmp_path / "a.ctl.yaml").write_text(body.format(entry=entry).replace("rungs: []", "title: two\nrungs: []"))
    env = dict(os.environ, NO_COLOR="1")
    for args in (["diff", "--git", "HEAD"], ["report", ".", "--changes-since", "HEAD", "-o", "r.html"]):
        proc = subprocess.run([sys.executable, "-m", "ctllint", *args], cwd=tmp_path, capture_output=True, text=True, env=env, timeout=300)
        assert proc.returncode in (0, 1), proc.stderr[-2000:]
        assert "Traceback" not in proc.stderr
