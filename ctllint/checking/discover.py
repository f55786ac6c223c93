"""Find the schematic files to check under the paths given on the command line."""
from __future__ import annotations

import fnmatch
import os
from dataclasses import dataclass

from ctllint.reading.loader import SCHEMATIC_SUFFIXES

SKIP_DIRS = {".git", ".hg", ".svn", "__pycache__", "node_modules", ".venv", "venv", ".tox", ".ctllint-cache"}


@dataclass(frozen=True)
class Target:
    path: str      # as opened
    shown: str     # as printed in findings (relative to the current folder where possible)


def display_path(path: str, cwd: str | None = None) -> str:
    cwd = cwd or os.getcwd()
    absolute = os.path.abspath(path)
    try:
        rel = os.path.relpath(absolute, cwd)
    except ValueError:
        return text_name(absolute)
    return text_name(absolute if rel.startswith("..") else rel)


def text_name(path: str) -> str:
    """A file name as text that any output can hold.

    A name that is not valid UTF-8 reaches Python with its bad bytes as lone
    surrogates, which no UTF-8 output (a report file, JSON, XML) can encode;
    they are shown as ``\\xff`` escapes instead. The file is still opened by
    its real name.
    """
    try:
        path.encode("utf-8")
        return path
    except UnicodeEncodeError:
        return os.fsencode(path).decode("utf-8", "backslashreplace")


def is_schematic_name(name: str) -> bool:
    return name.endswith(SCHEMATIC_SUFFIXES)


def excluded(shown: str, patterns: list[str], base: str | None = None) -> bool:
    candidates = {shown.replace(os.sep, "/")}
    if base:
        try:
            candidates.add(os.path.relpath(os.path.abspath(shown), base).replace(os.sep, "/"))
        except ValueError:
            pass
    for pattern in patterns:
        for c in candidates:
            if fnmatch.fnmatch(c, pattern) or fnmatch.fnmatch(os.path.basename(c), pattern):
                return True
            if pattern.endswith("/**") and (c + "/").startswith(pattern[:-2]):
                return True
    return False


def discover(paths: list[str], exclude: list[str] = (), base: str | None = None) -> tuple[list[Target], list[str]]:
    """Schematic files under ``paths`` (sorted, each once) and the paths that do not exist.

    A file named on the command line is checked whatever its name; folders
    are searched for ``*.ctl.yaml`` and ``*.ctl.yml``. Symbolic links to
    folders are not followed, so a link loop cannot trap the search. A
    folder that cannot be listed becomes a target of its own, so that
    reading it reports why instead of its files going unchecked.
    """
    found: dict[str, Target] = {}
    missing: list[str] = []
    for given in paths:
        if not os.path.lexists(given):
            missing.append(given)
            continue
        if os.path.isdir(given) and not is_schematic_name(given.rstrip("/\\")):
            def unreadable(exc: OSError) -> None:  # a folder that cannot be listed is reported, not skipped in silence
                where = exc.filename or given
                found.setdefault(os.path.abspath(where), Target(where, display_path(where)))

            for folder, dirs, files in os.walk(given, onerror=unreadable, followlinks=False):
                dirs[:] = sorted(d for d in dirs if d not in SKIP_DIRS and not (d.startswith(".") and d not in (".", "..")))
                names = sorted(files) + sorted(d for d in os.listdir(folder) if is_schematic_name(d) and os.path.isdir(os.path.join(folder, d)))
                for name in names:
                    if not is_schematic_name(name):
                        continue
                    full = os.path.join(folder, name)
                    shown = display_path(full)
                    if excluded(shown, list(exclude), base):
                        continue
                    found.setdefault(os.path.abspath(full), Target(full, shown))
        else:
            shown = display_path(given)
            found.setdefault(os.path.abspath(given), Target(given, shown))
    return sorted(found.values(), key=lambda t: t.shown), missing
