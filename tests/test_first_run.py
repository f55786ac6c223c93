"""What a newcomer sees on a first run: the README's two set-up commands
(the first run as written on a fresh copy; .ci/run runs the second), a
summary that counts schematics and shared device files apart and says what
exit status 1 means, and scripts that answer --help."""
import os
import sys
import textwrap

import pytest

from ctllint.commands.cli import main

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
DEMO = os.path.join(ROOT, "fixtures", "demo")

SHARED = textwrap.dedent("""\
    ctllint: 1
    devices:
      CR9: {kind: relay, coil: 120 VAC}
    """)
USER = textwrap.dedent("""\
    ctllint: 1
    use: [lib/shared.ctl.yaml]
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      PB1: {kind: pushbutton, function: stop}
      PB2: {kind: pushbutton, function: start}
    rungs:
      - paths:
          - [L1, PB1.NC, 2, PB2.NO, 3, CR9.coil, X2]
          - [2, CR9.NO, 3]
    """)


@pytest.fixture
def plant(tmp_path, monkeypatch):
    """Two schematics built on one shared device file, and nothing else."""
    monkeypatch.chdir(tmp_path)
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "cache"))
    monkeypatch.delenv("CTLLINT_NO_CACHE", raising=False)
    (tmp_path / "lib").mkdir()
    (tmp_path / "lib" / "shared.ctl.yaml").write_text(SHARED)
    (tmp_path / "a.ctl.yaml").write_text(USER)
    (tmp_path / "b.ctl.yaml").write_text(USER.replace("PB1.NC", "PB1.NO"))  # a stop button through its NO contact
    return tmp_path


def test_summary_counts_schematics_and_device_files_apart(plant, capsys):
    for run in ("cold cache", "warm cache"):  # the cache keeps which files are device files
        assert main(["check", "."]) == 1, run
        err = capsys.readouterr().err
        assert "in 2 schematics, 1 device file (" in err, (run, err)


def test_summary_singular_and_without_device_files(plant, capsys):
    assert main(["check", "a.ctl.yaml"]) == 0
    err = capsys.readouterr().err
    assert "0 errors, 0 warnings, 0 info in 1 schematic\n" in err


def test_demo_summary_matches_its_readme_and_explains_exit_status(monkeypatch, capsys):
    """fixtures/demo/README.md describes four schematics and one shared device file, five mistakes."""
    monkeypatch.setenv("CTLLINT_NO_CACHE", "1")
    assert main(["check", DEMO]) == 1
    out, err = capsys.readouterr()
    assert len(out.splitlines()) == 5
    assert "4 errors, 1 warning, 0 info in 4 schematics, 1 device file (exit status 1: the check ran and found errors)" in err


def test_exit_note_only_when_the_status_is_1(plant, capsys):
    assert main(["check", "b.ctl.yaml", "--ignore", "stop-normally-closed"]) == 0
    assert "exit status" not in capsys.readouterr().err
    assert main(["check", "b.ctl.yaml", "--fail-on", "warning"]) == 1
    assert "(exit status 1: the check ran and found warnings or errors)" in capsys.readouterr().err


def test_report_summary_counts_apart_and_names_the_page(plant, capsys):
    assert main(["report", ".", "-o", "plant.html"]) == 1
    err = capsys.readouterr().err
    assert "wrote plant.html: 1 error, 0 warnings, 0 info in 2 schematics, 1 device file (exit status 1:" in err
    assert (plant / "plant.html").as_uri() in err
    assert '<p class="meta">2 schematics, 1 device file checked' in (plant / "plant.html").read_text()


def _scripts_the_docs_name():
    """Every `python some/script.py` the README or DEVELOPERS.md tells a reader to run."""
    import re

    found = set()
    for doc in ("README.md", "DEVELOPERS.md"):
        with open(os.path.join(ROOT, doc), encoding="utf-8") as handle:
            found.update(re.findall(r"python3? ((?:[\w.-]+/)*[\w.-]+\.py)\b", handle.read()))
    return sorted(found)


def test_docs_name_the_generator_and_the_benchmark():
    scripts = _scripts_the_docs_name()
    assert {"tests/benchmarks/generate.py", "tests/benchmarks/bench.py", "tests/fuzz_campaign.py"} <= set(scripts), scripts


@pytest.mark.parametrize("script", _scripts_the_docs_name())
def test_every_script_the_docs_name_answers_help(script):
    import subprocess
    import sys

    proc = subprocess.run([sys.executable, os.path.join(ROOT, script), "--help"], capture_output=True, text=True, timeout=120)
    assert proc.returncode == 0, proc.stderr
    assert proc.stdout.startswith("usage:") and "Traceback" not in proc.stdout + proc.stderr


def test_generate_without_arguments_says_how_to_use_it():
    import subprocess
    import sys

    script = os.path.join(ROOT, "tests", "benchmarks", "generate.py")
    for argv in ([], ["motors"], ["motors", "many"], ["pumps", "3"], ["lattice", "0"]):
        proc = subprocess.run([sys.executable, script, *argv], capture_output=True, text=True, timeout=60)
        assert proc.returncode == 2, argv
        assert "Traceback" not in proc.stderr and proc.stderr.startswith("usage: generate.py"), (argv, proc.stderr)
    proc = subprocess.run([sys.executable, script, "motors", "3"], capture_output=True, text=True, timeout=60)
    assert proc.returncode == 0 and proc.stdout.count("  - title: Motor ") == 3 * 2  # "Motor i" and "Motor i running"


# -- the README's two set-up commands ----------------------------------------------

def _readme_commands():
    """The shell blocks of the README's "Two commands" section, in order."""
    import re

    with open(os.path.join(ROOT, "README.md"), encoding="utf-8") as handle:
        text = handle.read()
    section = text.split("\n## Two commands\n", 1)[1].split("\n## ", 1)[0]
    return re.findall(r"```sh\n(.*?)```", section, re.S), section


def test_readme_has_exactly_two_one_line_commands_and_ci_runs_the_second():
    import subprocess

    blocks, _ = _readme_commands()
    assert len(blocks) == 2, blocks
    assert all(b.count("\n") == 1 and b.strip() for b in blocks), "each set-up command is one line"
    demo, tests = (b.strip() for b in blocks)
    for cmd in (demo, tests):
        assert subprocess.run(["sh", "-n", "-c", cmd]).returncode == 0, cmd
        # a fresh machine's Python may refuse installs: each command makes (or reuses) its own environment first
        assert cmd.startswith("test -x .venv/bin/python || python3 -m venv .venv && . .venv/bin/activate && python -m pip install "), cmd
    assert tests.endswith("python -m pytest")
    with open(os.path.join(ROOT, ".ci", "run"), encoding="utf-8") as handle:
        lines = [line.strip() for line in handle if line.strip() and not line.lstrip().startswith("#")]
    assert lines[-1] == tests, "the last command of .ci/run must be the README's test command, verbatim"
    assert not any("venv" in line for line in lines[:-1]), ".ci/run makes no environment of its own"
    assert any("chromium" in line for line in lines), ".ci/run still installs chromium for the browser test"


def test_readme_first_command_on_a_fresh_copy(tmp_path):
    """Run the README's first command verbatim in a copy of the project with no environment:
    it installs, prints the demo's five findings, writes the report and ends in exit status 1,
    and its last lines are the ones the README shows."""
    import re
    import shutil
    import subprocess

    blocks, section = _readme_commands()
    demo = blocks[0].strip()
    copy = tmp_path / "ctllint"
    shutil.copytree(ROOT, copy, ignore=shutil.ignore_patterns(".git", ".venv", ".ci", "build", "*.egg-info", "__pycache__",
                                                                ".pytest_cache", ".hypothesis", "demo-report.html"))
    env = {k: v for k, v in os.environ.items() if k not in ("VIRTUAL_ENV", "PYTHONPATH", "NO_COLOR")}
    venv_bin = os.path.dirname(os.path.abspath(sys.executable))
    env["PATH"] = os.pathsep.join(p for p in env.get("PATH", "").split(os.pathsep) if os.path.abspath(p) != venv_bin)
    env["XDG_CACHE_HOME"] = str(tmp_path / "cache")
    proc = subprocess.run(["sh", "-c", demo], cwd=copy, env=env, capture_output=True, text=True, timeout=900)
    assert proc.returncode == 1, proc.stdout + proc.stderr
    assert (copy / ".venv" / "bin" / "ctllint").exists()
    findings = [line for line in proc.stdout.splitlines() if line.startswith("fixtures/demo/")]
    assert len(findings) == 5 and all(line.startswith("fixtures/demo/dryer-fan.ctl.yaml:") for line in findings), proc.stdout
    page = (copy / "demo-report.html").read_text(encoding="utf-8")
    assert page.count("<svg") >= 4 and "stop-normally-closed" in page
    shown = re.search(r"It ends like this.*?```\n(.*?)```", section, re.S).group(1).splitlines()
    err = proc.stderr.splitlines()
    for line in shown:
        if line == "...":
            continue
        if "file:///" in line:
            assert f"ctllint: open it in a web browser: {(copy / 'demo-report.html').as_uri()}" in err
        else:
            assert line in err, (line, proc.stderr)
