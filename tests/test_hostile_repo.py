"""A hostile repository: file names, links, devices, plugins and caches set up by an attacker.

Each test here reproduces an attack on a fresh clone (a pull request is all
an attacker controls) and checks that ctllint fails closed: a broken
schematic is never a pass, nothing outside the repository is quoted, no
command hangs, and no code of the repository runs unless asked for.
"""
from __future__ import annotations

import io
import json
import os
import shlex
import shutil
import subprocess
import sys
import textwrap
from contextlib import redirect_stderr, redirect_stdout

import pytest

from ctllint.cli import main

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))

# stop-normally-closed: PB1 is a stop button wired through its NO contact (line 12)
BROKEN = textwrap.dedent("""\
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
CLEAN = BROKEN.replace("PB1.NO", "PB1.NC")

needs_git = pytest.mark.skipif(shutil.which("git") is None, reason="git is not installed")


def run_cli(*argv: str) -> tuple[int, str, str]:
    out, err = io.StringIO(), io.StringIO()
    with redirect_stdout(out), redirect_stderr(err):
        rc = main(list(argv))
    return rc, out.getvalue(), err.getvalue()


def git(cwd, *args: str) -> str:
    env = dict(os.environ, GIT_AUTHOR_NAME="t", GIT_AUTHOR_EMAIL="t@example.invalid", GIT_COMMITTER_NAME="t",
               GIT_COMMITTER_EMAIL="t@example.invalid")
    return subprocess.run(["git", *args], cwd=cwd, capture_output=True, text=True, check=True, env=env).stdout


@pytest.fixture
def clean_env(monkeypatch):
    monkeypatch.setenv("CTLLINT_NO_CACHE", "1")
    monkeypatch.setenv("NO_COLOR", "1")


# -- 1. file names that read as options ---------------------------------------------------

HOSTILE_NAMES = ["--write-baseline=.ctl.yaml", "--baseline=.ctl.yaml", "-o.ctl.yaml", "--fail-on=info.ctl.yaml"]


@pytest.mark.parametrize("name", HOSTILE_NAMES)
def test_a_file_named_like_an_option_never_turns_the_hook_into_a_pass(tmp_path, monkeypatch, clean_env, name):
    """pre-commit runs ENTRY + file names: the entry of .pre-commit-hooks.yaml, as pre-commit splits it."""
    monkeypatch.chdir(tmp_path)
    (tmp_path / "pump.ctl.yaml").write_text(BROKEN)
    (tmp_path / name).write_text(BROKEN)
    import yaml  # pre-commit's own dependency (test extra)

    hooks = yaml.safe_load(open(os.path.join(ROOT, ".pre-commit-hooks.yaml")))
    entry = shlex.split(hooks[0]["entry"])
    assert entry[0] == "ctllint"
    rc, out, err = run_cli(*entry[1:], name, "pump.ctl.yaml")
    assert rc == 1, (out, err)
    assert "pump.ctl.yaml:12:14: error:" in out and f"{name}:12:14: error:" in out
    assert not (tmp_path / ".ctl.yaml").exists()


@pytest.mark.parametrize("name", HOSTILE_NAMES)
def test_a_command_line_without_the_end_of_options_is_refused(tmp_path, monkeypatch, clean_env, name):
    """A hook or script that forgot '--': a usage error (exit 2), never a pass."""
    monkeypatch.chdir(tmp_path)
    (tmp_path / "pump.ctl.yaml").write_text(BROKEN)
    (tmp_path / name).write_text(BROKEN)
    rc, out, err = run_cli("check", name, "pump.ctl.yaml")
    assert rc == 2, (out, err)
    assert "put -- before file names" in err
    assert not (tmp_path / ".ctl.yaml").exists()
    # an option that names no file is still an option
    rc, _, err = run_cli("check", "--fail-on=warning", "pump.ctl.yaml")
    assert rc == 1, err


def test_the_init_hook_entry_ends_options(tmp_path, monkeypatch, clean_env):
    monkeypatch.chdir(tmp_path)
    assert run_cli("init")[0] == 0
    import yaml

    hook = yaml.safe_load((tmp_path / ".pre-commit-config.yaml").read_text())["repos"][0]["hooks"][0]
    assert shlex.split(hook["entry"])[-1] == "--"


@needs_git
def test_git_diff_driver_with_a_file_named_like_an_option(tmp_path, monkeypatch, clean_env):
    repo = tmp_path / "repo"
    repo.mkdir()
    git(repo, "init", "-q")
    (repo / ".gitattributes").write_text("*.ctl.yaml diff=ctllint\n")
    (repo / "-o.ctl.yaml").write_text(CLEAN)
    git(repo, "add", ".")
    git(repo, "commit", "-qm", "first")
    (repo / "-o.ctl.yaml").write_text(BROKEN)
    driver = f'"{sys.executable}" -m ctllint diff --git-external'
    # the documented driver ends options: the file is diffed, nothing is written
    out = git(repo, "-c", f"diff.ctllint.command={driver} --", "diff")
    assert "ctllint diff -o.ctl.yaml" in out and "stop-normally-closed" in out
    assert not (repo / ".ctl.yaml").exists()
    # a driver set up without '--' fails loudly instead of writing the diff to '.ctl.yaml'
    done = subprocess.run(["git", "-c", f"diff.ctllint.command={driver}", "diff"], cwd=repo, capture_output=True, text=True)
    assert done.returncode != 0 and "put -- before file names" in done.stderr
    assert not (repo / ".ctl.yaml").exists()
