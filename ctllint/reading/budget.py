"""A time budget for the commands that show a circuit (draw, report, diff, simulate).

``check`` bounds a file's rules with ``limits.plugin_seconds``; the other
commands do work of their own (layout, matching, simulation) that is near
linear in the file, but a file built to be slow must not hold a CI job or a
pre-commit hook forever. ``limits.command_seconds`` bounds each unit of that
work: a drawing, the diff of one file, a simulation (a command over many
files gives each file its own period). When a unit runs past it, the command
stops with a message that names the unit and the limit, and exits 1.

How: the command installs a ``Budget`` (``command_budget``); ``work(what)``
marks a unit (``layout``, ``semantic_diff``, ``diff_revisions`` and the
simulate command call it; nested units belong to the outermost). A timer
thread interrupts the main thread when a unit's period is over, through
Python's SIGINT handling, which the budget replaces for the life of the
command: a real Ctrl-C is still ``KeyboardInterrupt``. The interruption
repeats every quarter second until the unit ends, so code that swallows it
once cannot keep running. Outside a command (ctllint used as a library, or
off the main thread) ``work`` does nothing.
"""
from __future__ import annotations

import _thread
import signal
import threading
from contextlib import contextmanager
from typing import Any, Iterator


class CommandTimeout(BaseException):
    """A unit of a command ran past ``limits.command_seconds``.

    A BaseException, so that ``except Exception`` in a rule or in the
    commands' own fallbacks does not swallow it.
    """

    def __init__(self, command: str, what: str, seconds: float):
        self.command, self.what, self.seconds = command, what, seconds
        super().__init__(
            f"{command} stopped: {what} took longer than limits.command_seconds ({seconds:g} s). "
            f"A legitimate file this large needs a higher limit in the configuration "
            f"(limits: {{command_seconds: {max(2 * seconds, 1):g}}}); .inf means no limit"
        )


class Budget:
    def __init__(self, seconds: float, command: str):
        self.seconds = seconds
        self.command = command
        self.lock = threading.Lock()
        self.unit: object | None = None     # token of the running unit
        self.what = ""
        self.fired: object | None = None    # token of the unit whose period ran out
        self.timer: threading.Timer | None = None

    def _fire(self, token: object) -> None:
        with self.lock:
            if self.unit is not token:
                return
            self.fired = token
            _thread.interrupt_main()
            self.timer = threading.Timer(0.25, self._fire, (token,))
            self.timer.daemon = True
            self.timer.start()

    def _handler(self, signum: int, frame: Any) -> None:
        with self.lock:
            fired = self.fired is not None and self.fired is self.unit
            what = self.what
        if fired:
            raise CommandTimeout(self.command, what, self.seconds)
        raise KeyboardInterrupt

    @contextmanager
    def work(self, what: str) -> Iterator[None]:
        if self.unit is not None:  # nested: the outer unit's period goes on
            yield
            return
        token = object()
        with self.lock:
            self.unit, self.what, self.fired = token, what, None
            self.timer = threading.Timer(self.seconds, self._fire, (token,))
            self.timer.daemon = True
            self.timer.start()
        try:
            yield
        finally:
            with self.lock:
                self.unit = None
                if self.timer is not None:
                    self.timer.cancel()
                    self.timer = None


_active: Budget | None = None


@contextmanager
def command_budget(command: str) -> Iterator[None]:
    """Run the command ``command`` under a budget; ``set_limit`` gives its period once the configuration is read."""
    global _active
    if _active is not None or threading.current_thread() is not threading.main_thread():
        yield
        return
    budget = Budget(0.0, command)
    old = signal.signal(signal.SIGINT, budget._handler)
    _active = budget
    try:
        yield
    finally:
        _active = None
        signal.signal(signal.SIGINT, old)


def set_limit(seconds: float) -> None:
    """The period of each unit of the running command (``limits.command_seconds``); infinite or absurd: none."""
    if _active is not None:
        _active.seconds = seconds if 0 < seconds < threading.TIMEOUT_MAX else 0.0


@contextmanager
def work(what: str) -> Iterator[None]:
    """Mark a unit of work of the running command (see the module's docstring)."""
    budget = _active
    if budget is None or not budget.seconds or threading.current_thread() is not threading.main_thread():
        yield
        return
    with budget.work(what):
        yield
