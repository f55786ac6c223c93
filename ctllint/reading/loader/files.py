"""The file system side of loading: which files are read, how, and the cache of shared device files.

A schematic is read as bounded UTF-8 text and never through a link that
leads out of its repository; the parsed device files that ``use`` names are
kept per real path and modification time. Its own module because none of it
concerns a section of the format.
"""
from __future__ import annotations

import os
import stat
from typing import Callable

from ctllint.reading.loader.sink import LoadResult, format_error
from ctllint.reading.model import Diagnostic
from ctllint.reading.yamlsafe import Limits

SCHEMATIC_SUFFIXES = (".ctl.yaml", ".ctl.yml")


def find_repository_root(path: str) -> str:
    """The nearest folder above ``path`` holding ``.git``, else the file's own folder."""
    folder = os.path.dirname(os.path.abspath(path))
    probe = folder
    while True:
        if os.path.exists(os.path.join(probe, ".git")):
            return probe
        parent = os.path.dirname(probe)
        if parent == probe:
            return folder
        probe = parent


def link_out_of_repository(path: str) -> str | None:
    """The repository root when ``path`` is (or passes through) a symbolic link leading out of it, else None.

    A pull request can commit a link named like a schematic to any file of
    the machine that checks it (a key, a token); such a file is never read,
    so none of it can reach a report or a log.
    """
    try:
        if not os.path.isfile(path):  # a device, pipe, folder or dangling link: read_text refuses it and says why
            return None
        root = os.path.realpath(find_repository_root(path))
        real = os.path.realpath(path)
        return None if os.path.commonpath([root, real]) == root else root
    except (OSError, ValueError):  # a NUL in the path, another drive: read_text says why
        return None


class DeviceFileCache:
    """Parsed shared device files, keyed by real path and modification time."""

    def __init__(self) -> None:
        self._cache: dict[str, tuple[float, "LoadResult"]] = {}

    def get(self, real: str, loader: Callable[[], "LoadResult"]) -> "LoadResult":
        try:
            mtime = os.stat(real).st_mtime_ns
        except OSError:
            mtime = -1
        hit = self._cache.get(real)
        if hit and hit[0] == mtime:
            return hit[1]
        result = loader()
        self._cache[real] = (mtime, result)
        return result


def read_text(path: str, limits: Limits) -> tuple[str | None, Diagnostic | None]:
    """Read a file as UTF-8 (a byte-order mark allowed), or say why not."""
    try:
        # Non-blocking open, then fstat: a named pipe, a socket or a device
        # (a link to /dev/zero, say) is refused instead of blocking or reading forever.
        fd = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
        try:
            info = os.fstat(fd)
        except OSError:
            os.close(fd)
            raise
        if not stat.S_ISREG(info.st_mode):
            os.close(fd)
            if stat.S_ISDIR(info.st_mode):
                try:
                    os.scandir(path).close()
                except OSError as exc:  # discovery could not list it either: say so
                    return None, format_error(path, 1, 1, f"folder cannot be read ({exc.strerror or exc}): the schematics in it are not checked")
                return None, format_error(path, 1, 1, "is a folder, not a schematic file")
            return None, format_error(path, 1, 1, "is not a regular file (a pipe, socket or device), so it is not read")
        if info.st_size > limits.max_file_bytes:
            os.close(fd)
            return None, format_error(path, 1, 1, f"file is {info.st_size / 1e6:.1f} MB, above the limit of {limits.max_file_bytes / 1e6:.1f} MB (limits.max_file_bytes)")
        with os.fdopen(fd, "rb") as handle:
            # Asked for the size fstat gave (plus one byte, to see growth) rather
            # than the limit: read(n) sets aside n bytes before it reads, which
            # for the limit is tens of megabytes for a file of one.
            data = handle.read(info.st_size + 1)
            if len(data) > info.st_size:  # grown since fstat: read on, up to the limit
                data += handle.read(max(0, limits.max_file_bytes + 1 - len(data)))
        if len(data) > limits.max_file_bytes:
            return None, format_error(path, 1, 1, f"file is above the limit of {limits.max_file_bytes / 1e6:.1f} MB (limits.max_file_bytes)")
    except IsADirectoryError:
        return None, format_error(path, 1, 1, "is a folder, not a schematic file")
    except OSError as exc:
        return None, format_error(path, 1, 1, f"cannot read file: {exc.strerror or exc}")
    except ValueError as exc:  # a path holding a NUL character
        return None, format_error(path, 1, 1, f"cannot read file: {exc}")
    if data.startswith(b"\xef\xbb\xbf"):
        data = data[3:]
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = data[: exc.start].count(b"\n") + 1
        col = exc.start - (data.rfind(b"\n", 0, exc.start) + 1) + 1
        return None, format_error(path, line, col, f"not UTF-8: byte 0x{data[exc.start]:02x} cannot be decoded")
    if "\x00" in text:
        i = text.index("\x00")
        return None, format_error(path, text.count("\n", 0, i) + 1, 1, "file holds a NUL character; schematics are text")
    return text, None
