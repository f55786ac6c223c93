"""What a newcomer sees on a first run: the summary counts schematics and
shared device files apart, and says what exit status 1 means."""
import os
import textwrap

import pytest

from ctllint.cli import main

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
