"""The result cache: never stale after an edit, safe when shared, and can be turned off."""
import json
import os
import subprocess
import sys
import textwrap

import pytest

from ctllint.cli import main

SCHEMATIC = textwrap.dedent("""\
    ctllint: 1
    title: Cache test
    use: [lib/devices.ctl.yaml]
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      PB2: {kind: pushbutton, function: start}
      CR1: {kind: relay, coil: 120 VAC}
    rungs:
      - title: Run relay
        paths:
          - [L1, PB1.NC, 2, PB2.NO, 3, CR1.coil, X2]
          - [2, CR1.NO, 3]
    """)
DEVICES = "ctllint: 1\ndevices:\n  PB1: {kind: pushbutton, function: stop}\n"


@pytest.fixture
def project(tmp_path, monkeypatch):
    (tmp_path / ".git").mkdir()
    (tmp_path / "lib").mkdir()
    (tmp_path / "lib" / "devices.ctl.yaml").write_text(DEVICES)
    (tmp_path / "a.ctl.yaml").write_text(SCHEMATIC)
    monkeypatch.chdir(tmp_path)
    monkeypatch.delenv("CTLLINT_NO_CACHE", raising=False)
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "cache"))
    return tmp_path


def rules_found(capsys, *args):
    code = main(["check", "--format", "json", "-j", "1", "a.ctl.yaml", *args])
    doc = json.loads(capsys.readouterr().out)
    return code, sorted((d["rule"], d["line"]) for d in doc["diagnostics"])


def entries(project):
    folder = project / "cache" / "ctllint"
    return sorted(p for p in folder.rglob("*.json")) if folder.exists() else []


def test_second_run_reads_the_cache_and_agrees(project, capsys):
    first = rules_found(capsys)
    assert first == (0, []) and len(entries(project)) == 1
    stamp = entries(project)[0].stat().st_mtime_ns
    assert rules_found(capsys) == first
    assert entries(project)[0].stat().st_mtime_ns == stamp  # read, not rewritten


def test_editing_the_file_is_never_stale(project, capsys):
    rules_found(capsys)
    (project / "a.ctl.yaml").write_text(SCHEMATIC.replace("PB1.NC", "PB1.NO"))
    code, found = rules_found(capsys)
    assert code == 1 and ("stop-normally-closed", 12) in found


def test_editing_a_used_device_file_is_never_stale(project, capsys):
    rules_found(capsys)
    (project / "lib" / "devices.ctl.yaml").write_text(DEVICES.replace("{kind: pushbutton, function: stop}", "{kind: relay, coil: 120 VAC}"))
    code, found = rules_found(capsys)
    assert code == 1 and ("coil-missing", 12) in found


def test_configuration_is_part_of_the_key(project, capsys):
    (project / "a.ctl.yaml").write_text(SCHEMATIC.replace("PB1.NC", "PB1.NO"))
    assert rules_found(capsys)[0] == 1
    (project / ".ctllint.yaml").write_text("ignore: [motor-control]\n")
    code, found = rules_found(capsys)
    assert not any(rule == "stop-normally-closed" for rule, _ in found)


def test_local_plugin_edit_is_part_of_the_key(project, capsys):
    plugin = project / "site_rule.py"
    body = textwrap.dedent('''\
        from ctllint import hookimpl
        from ctllint.api import Finding, Rule
        from ctllint.model import Severity

        def check(ctx):
            if MESSAGE:
                yield Finding(ctx.schematic.loc, MESSAGE)

        MESSAGE = "{message}"

        @hookimpl
        def ctllint_rules():
            return [Rule("site-note", Severity.ERROR, "a note", "A test rule for the cache key; it says what it is told.", "test", check)]
        ''')
    plugin.write_text(body.format(message=""))
    (project / ".ctllint.yaml").write_text("plugins: [site_rule.py]\n")
    assert rules_found(capsys) == (0, [])
    plugin.write_text(body.format(message="now it speaks"))
    os.utime(plugin, ns=(plugin.stat().st_atime_ns, plugin.stat().st_mtime_ns + 10_000_000))
    assert rules_found(capsys)[1] == [("site-note", 1)]


def test_cache_can_be_turned_off(project, capsys):
    rules_found(capsys, "--no-cache")
    assert entries(project) == []
    (project / ".ctllint.yaml").write_text("cache: false\n")
    rules_found(capsys)
    assert entries(project) == []


def test_two_runs_sharing_the_cache_agree(project):
    """Concurrent runs write entries atomically: both finish, agree, and leave only whole entries."""
    for i in range(30):
        (project / f"p{i:02d}.ctl.yaml").write_text(SCHEMATIC.replace("Cache test", f"Panel {i}"))
    env = dict(os.environ, XDG_CACHE_HOME=str(project / "cache"))
    env.pop("CTLLINT_NO_CACHE", None)
    cmd = [sys.executable, "-m", "ctllint", "check", "--format", "json", "-j", "2", "."]
    procs = [subprocess.Popen(cmd, cwd=project, env=env, stdout=subprocess.PIPE, stderr=subprocess.PIPE) for _ in range(3)]
    outs = [p.communicate(timeout=300) for p in procs]
    assert all(p.returncode == 0 for p in procs), [o[1][-500:] for o in outs]
    assert outs[0][0] == outs[1][0] == outs[2][0]
    for entry in entries(project):
        json.loads(entry.read_text())  # every entry is whole
    assert not list((project / "cache").rglob("*.tmp"))
    again = subprocess.run(cmd, cwd=project, env=env, capture_output=True)
    assert again.stdout == outs[0][0]
