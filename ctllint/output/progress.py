"""A sign of life on long runs: files done of total and the time elapsed.

Shown on standard error only when it is a terminal, and never when
``NO_COLOR`` or ``CI`` is set, ``TERM`` is ``dumb`` or ``--quiet`` was given:
CI logs, pipes and files never see it. Nothing is shown during the first
half second, so a short run prints nothing; then the one line is rewritten
in place at most ten times a second and erased at the end, before the
findings are printed. Hand-written (a carriage return and an erase-line
code): no library, nothing to import at start-up.
"""
from __future__ import annotations

import os
import sys
import time
from typing import Callable, TextIO

DELAY = 0.5      # seconds of silence before the first line
INTERVAL = 0.1   # seconds between two updates


def wanted(quiet: bool = False, stream: TextIO | None = None) -> bool:
    """Whether to show progress on ``stream`` (standard error)."""
    if quiet or os.environ.get("NO_COLOR") or os.environ.get("CI") or os.environ.get("TERM") == "dumb":
        return False
    stream = stream if stream is not None else sys.stderr
    try:
        return bool(stream.isatty())
    except (AttributeError, ValueError, OSError):
        return False


def elapsed_text(seconds: float) -> str:
    seconds = int(seconds)
    if seconds < 60:
        return f"{seconds} s"
    return f"{seconds // 60} min {seconds % 60:02d} s"


class Progress:
    """Call ``advance`` as files are done and ``close`` at the end."""

    def __init__(self, total: int, verb: str = "checked", stream: TextIO | None = None,
                 clock: Callable[[], float] = time.monotonic):
        self.total = total
        self.verb = verb
        self.stream = stream if stream is not None else sys.stderr
        self.clock = clock
        self.start = clock()
        self.last = -INTERVAL
        self.done = 0
        self.shown = False

    def advance(self, count: int = 1) -> None:
        self.done += count
        now = self.clock()
        if now - self.start < DELAY or now - self.last < INTERVAL:
            return
        self.last = now
        self.show(now)

    def show(self, now: float | None = None) -> None:
        now = self.clock() if now is None else now
        text = f"ctllint: {self.verb} {self.done:,} of {self.total:,} files, {elapsed_text(now - self.start)}"
        try:
            self.stream.write("\r" + text + "\x1b[K")
            self.stream.flush()
        except (OSError, ValueError):
            return
        self.shown = True

    def close(self) -> None:
        """Erase the line, so what follows starts on a clean one."""
        if self.shown:
            try:
                self.stream.write("\r\x1b[K")
                self.stream.flush()
            except (OSError, ValueError):
                pass
            self.shown = False


class Meters:
    """``with Meters(quiet) as m: run(..., progress=m.start)``: ``m.start`` is None
    when progress is not wanted, else makes a meter (``m.start(total, "drew")``
    for a second stage replaces the first), which is closed on leaving."""

    def __init__(self, quiet: bool = False):
        self.meter: Progress | None = None
        self.start = self._start if wanted(quiet) else None

    def _start(self, total: int, verb: str = "checked") -> Progress:
        if self.meter is not None:
            self.meter.close()
        self.meter = Progress(total, verb)
        return self.meter

    def __enter__(self) -> "Meters":
        return self

    def __exit__(self, *exc: object) -> None:
        if self.meter is not None:
            self.meter.close()
