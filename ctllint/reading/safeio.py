"""Bounded reads of files and git blobs, for every command that reads them.

``check`` reads schematics through ``loader.read_text``; ``diff``, ``report
--changes-since`` and the git diff driver read other files too (the sides
of a diff, blobs of a revision, files scanned for ``use``). Every such read
goes through here, with the same rules as ``check``: only regular files
(a named pipe would block, a link to ``/dev/zero`` never end), and never
more than ``limits.max_file_bytes`` (the size is taken before reading).
"""
from __future__ import annotations

import os
import stat
import subprocess

from ctllint.reading.yamlsafe import Limits


class ReadProblem(Exception):
    """Why a file or blob was not read (a message for a ``format`` finding at 1:1)."""


def too_large(size: int, limits: Limits) -> str:
    return f"file is {size / 1e6:.1f} MB, above the limit of {limits.max_file_bytes / 1e6:.1f} MB (limits.max_file_bytes)"


def read_bytes(path: str, limits: Limits | None = None) -> bytes:
    """The bytes of a regular file of at most ``limits.max_file_bytes``; a ReadProblem says why not."""
    limits = limits or Limits()
    try:
        fd = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
    except (OSError, ValueError) as exc:
        raise ReadProblem(f"cannot read file: {getattr(exc, 'strerror', None) or exc}") from None
    try:
        info = os.fstat(fd)
        if stat.S_ISDIR(info.st_mode):
            raise ReadProblem("is a folder, not a schematic file")
        if not stat.S_ISREG(info.st_mode):
            raise ReadProblem("is not a regular file (a pipe, socket or device), so it is not read")
        if info.st_size > limits.max_file_bytes:
            raise ReadProblem(too_large(info.st_size, limits))
        chunks = []
        left = limits.max_file_bytes + 1
        while left > 0:  # a file growing while it is read stops at the limit
            chunk = os.read(fd, min(left, max(info.st_size + 1, 65536)))
            if not chunk:
                break
            chunks.append(chunk)
            left -= len(chunk)
    except OSError as exc:
        raise ReadProblem(f"cannot read file: {exc.strerror or exc}") from None
    finally:
        os.close(fd)
    data = b"".join(chunks)
    if len(data) > limits.max_file_bytes:
        raise ReadProblem(f"file is above the limit of {limits.max_file_bytes / 1e6:.1f} MB (limits.max_file_bytes)")
    return data


# A path git can be asked about: within what a file system names (PATH_MAX).
_GIT_PATH_MAX = 4096


def git_blob(sha: str, rel: str, cwd: str, limits: Limits | None = None) -> bytes | None:
    """The blob at ``sha:rel`` (None when there is none); a ReadProblem when it passes the size limit.

    The size is asked of git first, so an oversized blob is never held in memory.
    """
    limits = limits or Limits()
    spec = f"{sha}:{rel}"
    if "\0" in spec or "\n" in spec or len(spec.encode("utf-8", "surrogateescape")) > _GIT_PATH_MAX:
        return None  # a path git cannot be asked about: the loader reports the entry as missing
    try:
        size = subprocess.run(["git", "cat-file", "-s", spec], cwd=cwd, capture_output=True)
    except (OSError, ValueError):  # an argument the system refuses
        return None
    if size.returncode != 0:
        return None
    try:
        n = int(size.stdout.strip() or b"0")
    except ValueError:
        return None
    if n > limits.max_file_bytes:
        raise ReadProblem(too_large(n, limits))
    done = subprocess.run(["git", "cat-file", "blob", spec], cwd=cwd, capture_output=True)
    if done.returncode != 0:
        return None
    return done.stdout[: limits.max_file_bytes + 1]
