"""The console-script entry point: a short-lived process, so the cyclic garbage collector is paused.

ctllint builds many small objects and almost no reference cycles; left on,
the collector rescans the growing heap while modules import and files load
(about a fifth of a large check's time, measured). Reference counting
still frees everything; the pause ends with the process. Library callers
of ``ctllint.commands.cli.main`` keep the collector as they set it.
"""
import gc
import sys


def main() -> int:
    gc.disable()
    from ctllint.commands.cli import main as run

    return run()


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
