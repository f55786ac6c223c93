"""End to end: the real pre-commit runs this repository's hook in a fresh git repository."""
import os
import shutil
import subprocess
import sys
import textwrap

import pytest

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))

SCHEMATIC = textwrap.dedent("""\
    ctllint: 1
    title: Wash pump
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      PB1: {kind: pushbutton, function: stop}
      PB2: {kind: pushbutton, function: start}
      CR1: {kind: relay, coil: 120 VAC}
    rungs:
      - title: Pump relay
        paths:
          - [L1, PB1.NO, 2, PB2.NO, 3, CR1.coil, X2]
          - [2, CR1.NO, 3]
    """)


def git(cwd, *args):
    return subprocess.run(["git", *args], cwd=cwd, capture_output=True, text=True, check=True)


@pytest.fixture
def hook_repo(tmp_path):
    """A committed copy of this repository (try-repo needs a commit; the work tree may be dirty)."""
    if shutil.which("git") is None:
        pytest.skip("git is not installed")
    repo = tmp_path / "hookrepo"
    ignore = shutil.ignore_patterns(".git", ".ci", "__pycache__", "*.egg-info", "build", ".pytest_cache", ".hypothesis", "tests", "fixtures")
    shutil.copytree(ROOT, repo, ignore=ignore)
    git(repo, "init", "-q")
    git(repo, "add", ".")
    git(repo, "-c", "user.name=t", "-c", "user.email=t@example.invalid", "commit", "-qm", "hook")
    return repo


def test_pre_commit_blocks_then_passes(tmp_path, hook_repo):
    pre_commit = [sys.executable, "-m", "pre_commit"]
    if subprocess.run([*pre_commit, "--version"], capture_output=True).returncode != 0:
        pytest.skip("pre-commit is not installed")
    work = tmp_path / "plant"
    work.mkdir()
    git(work, "init", "-q")
    (work / "pump.ctl.yaml").write_text(SCHEMATIC)
    git(work, "add", "pump.ctl.yaml")
    env = dict(os.environ, PRE_COMMIT_HOME=str(tmp_path / "pc-home"), CTLLINT_NO_CACHE="1", NO_COLOR="1")
    env.pop("PYTHONPATH", None)
    cmd = [*pre_commit, "try-repo", str(hook_repo), "ctllint", "--files", "pump.ctl.yaml"]
    bad = subprocess.run(cmd, cwd=work, capture_output=True, text=True, env=env, timeout=900)
    assert bad.returncode == 1, bad.stdout + bad.stderr
    assert "pump.ctl.yaml:12:14: error:" in bad.stdout and "[stop-normally-closed]" in bad.stdout
    (work / "pump.ctl.yaml").write_text(SCHEMATIC.replace("PB1.NO", "PB1.NC"))
    git(work, "add", "pump.ctl.yaml")
    good = subprocess.run(cmd, cwd=work, capture_output=True, text=True, env=env, timeout=900)
    assert good.returncode == 0, good.stdout + good.stderr
    assert "Passed" in good.stdout
    # A file named like an option must not turn the hook into a pass, under --all-files too.
    (work / "pump.ctl.yaml").write_text(SCHEMATIC)
    (work / "--write-baseline=.ctl.yaml").write_text(SCHEMATIC)
    git(work, "add", "--", "pump.ctl.yaml", "--write-baseline=.ctl.yaml")
    for files in ([], ["--all-files"]):  # the staged files (as on commit), then every file
        hostile = subprocess.run([*pre_commit, "try-repo", str(hook_repo), "ctllint", *files], cwd=work, capture_output=True, text=True, env=env, timeout=900)
        assert hostile.returncode == 1, files + [hostile.stdout + hostile.stderr]
        assert "pump.ctl.yaml:12:14: error:" in hostile.stdout and "--write-baseline=.ctl.yaml:12:14: error:" in hostile.stdout
        assert not (work / ".ctl.yaml").exists()


def test_changed_device_file_checks_its_users(tmp_path, monkeypatch, capsys):
    """pre-commit passes only changed files: a changed shared device file brings in the schematics using it."""
    from ctllint.commands.cli import main

    (tmp_path / ".git").mkdir()
    (tmp_path / "lib").mkdir()
    (tmp_path / "lib" / "devices.ctl.yaml").write_text("ctllint: 1\ndevices:\n  PB1: {kind: pushbutton, function: stop}\n")
    (tmp_path / "pump.ctl.yaml").write_text(SCHEMATIC.replace("  PB1: {kind: pushbutton, function: stop}\n", "").replace("title: Wash pump\n", "title: Wash pump\nuse: [lib/devices.ctl.yaml]\n"))
    monkeypatch.chdir(tmp_path)
    monkeypatch.setenv("CTLLINT_NO_CACHE", "1")
    code = main(["check", "lib/devices.ctl.yaml", "--format", "json"])
    out = capsys.readouterr().out
    import json

    doc = json.loads(out)
    assert doc["files"] == 2
    assert code == 1 and any(d["path"] == "pump.ctl.yaml" for d in doc["diagnostics"])
