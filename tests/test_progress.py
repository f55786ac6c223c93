"""Progress on long runs: on a terminal only (standard error), never in pipes, CI logs, with NO_COLOR or --quiet."""
import io
import os
import textwrap

import pytest

from ctllint.output import progress
from ctllint.commands.cli import main

CLEAN = textwrap.dedent("""\
    ctllint: 1
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      PB1: {kind: pushbutton, function: stop}
      PB2: {kind: pushbutton, function: start}
      CR1: {kind: relay, coil: 120 VAC}
    rungs:
      - paths:
          - [L1, PB1.NC, 2, PB2.NO, 3, CR1.coil, X2]
          - [2, CR1.NO, 3]
    """)


class Terminal(io.StringIO):
    """Standard error as a terminal."""

    def isatty(self):
        return True


class Clock:
    def __init__(self):
        self.now = 100.0

    def __call__(self):
        return self.now


def test_silent_at_first_then_files_done_of_total_and_elapsed():
    clock, out = Clock(), Terminal()
    meter = progress.Progress(10_000, stream=out, clock=clock)
    meter.advance(3)
    clock.now += 0.4
    meter.advance()
    assert out.getvalue() == ""                      # a short run shows nothing
    clock.now += 0.2
    meter.advance()
    assert out.getvalue() == "\rctllint: checked 5 of 10,000 files, 0 s\x1b[K"
    clock.now += 0.05
    meter.advance()                                   # at most ten updates a second
    assert out.getvalue().count("\r") == 1
    clock.now += 64.9
    meter.advance(2000)
    assert out.getvalue().endswith("\rctllint: checked 2,006 of 10,000 files, 1 min 05 s\x1b[K")
    meter.close()
    assert out.getvalue().endswith("\x1b[K\r\x1b[K")  # the line erased: what follows starts clean
    meter.close()
    assert out.getvalue().endswith("files, 1 min 05 s\x1b[K\r\x1b[K")


@pytest.mark.parametrize("env, quiet, tty, shown", [
    ({}, False, True, True),
    ({}, False, False, False),                       # a pipe or a file
    ({"NO_COLOR": "1"}, False, True, False),
    ({"CI": "true"}, False, True, False),            # CI systems that fake a terminal
    ({"TERM": "dumb"}, False, True, False),
    ({}, True, True, False),                         # --quiet
])
def test_when_progress_is_shown(monkeypatch, env, quiet, tty, shown):
    for name in ("NO_COLOR", "CI", "TERM"):
        monkeypatch.delenv(name, raising=False)
    for name, value in env.items():
        monkeypatch.setenv(name, value)
    assert progress.wanted(quiet, Terminal() if tty else io.StringIO()) is shown


@pytest.fixture
def many(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    for name in ("NO_COLOR", "CI", "CTLLINT_NO_CACHE"):
        monkeypatch.delenv(name, raising=False)
    monkeypatch.setenv("TERM", "xterm")
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "cache"))
    monkeypatch.setattr(progress, "DELAY", 0.0)      # show from the first file, every file
    monkeypatch.setattr(progress, "INTERVAL", 0.0)
    for i in range(3):
        (tmp_path / f"p{i}.ctl.yaml").write_text(CLEAN)
    return Terminal()


def run(args, stderr):
    """``main(args)`` with standard error on ``stderr`` (set here, in the test's own call:
    pytest puts its capture back on sys.stderr between a fixture and the test)."""
    import sys

    saved, sys.stderr = sys.stderr, stderr
    try:
        return main(args)
    finally:
        sys.stderr = saved


def _lines(err):
    """What the terminal shows, line state by line state (each '\\r' starts one again)."""
    return [part.replace("\x1b[K", "") for part in err.getvalue().split("\r") if part.replace("\x1b[K", "")]


@pytest.mark.parametrize("jobs", ["1", "2"])
def test_check_on_a_terminal_counts_files(capsys, many, jobs):
    assert run(["check", ".", "--jobs", jobs], many) == 0
    seen = _lines(many)
    assert "ctllint: checked 3 of 3 files, 0 s" in seen
    if jobs == "1":
        assert seen[:3] == [f"ctllint: checked {i} of 3 files, 0 s" for i in (1, 2, 3)]
    erased = "\r\x1b[Kctllint: 0 errors, 0 warnings, 0 info in 3 schematics\n"
    assert erased in many.getvalue()  # erased before the summary
    assert "\r" not in many.getvalue().split(erased, 1)[1]  # only the safety note follows
    assert capsys.readouterr().out == ""              # never on standard output
    run(["check", "."], many)                         # from the cache: counted too
    assert _lines(many).count("ctllint: checked 3 of 3 files, 0 s") == 2


@pytest.mark.parametrize("args, env", [(["--quiet"], {}), (["-q"], {}), ([], {"NO_COLOR": "1"}), ([], {"CI": "1"})])
def test_check_quiet_when_asked(many, monkeypatch, args, env):
    for name, value in env.items():
        monkeypatch.setenv(name, value)
    assert run(["check", ".", "--no-cache", *args], many) == 0
    assert "\r" not in many.getvalue() and "\x1b" not in many.getvalue()
    assert "0 errors, 0 warnings, 0 info in 3 schematics" in many.getvalue()


def test_check_into_a_pipe_is_silent(many, monkeypatch):
    pipe = io.StringIO()
    assert run(["check", ".", "--no-cache"], pipe) == 0
    assert "\r" not in pipe.getvalue() and "checked" not in pipe.getvalue()
    assert "0 errors, 0 warnings, 0 info in 3 schematics" in pipe.getvalue()


def test_report_shows_checking_then_drawing(many):
    assert run(["report", ".", "-o", "r.html"], many) == 0
    seen = _lines(many)
    assert seen[:6] == [f"ctllint: {verb} {i} of 3 files, 0 s" for verb in ("checked", "drew") for i in (1, 2, 3)]
    assert "\r\x1b[Kctllint: wrote r.html" in many.getvalue()
    assert os.path.getsize("r.html") > 0
    before = many.getvalue()
    assert run(["report", ".", "-o", "r.html", "--quiet"], many) == 0
    assert "\r" not in many.getvalue()[len(before):]
