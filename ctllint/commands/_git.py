"""Schematics read out of git: revisions resolved, changed paths listed, a revision's files written out.

``ctllint diff --git`` and ``ctllint report --changes-since`` both compare schematics of a git
revision with another revision or the working tree; what they share about asking git (through
the bounded reads of ``reading.safeio``) is here, apart from either command.
"""
from __future__ import annotations

import os
import shutil
import subprocess

from ctllint.commands.base import UsageError
from ctllint.reading.loader import SCHEMATIC_SUFFIXES
from ctllint.reading.safeio import ReadProblem, git_blob, read_bytes
from ctllint.reading.yamlsafe import Limits, MappingNode, ScalarNode, SequenceNode, YamlProblem, compose


def git_cmd(args: list[str], cwd: str | None = None, check: bool = True) -> subprocess.CompletedProcess:
    if shutil.which("git") is None:
        raise UsageError("ctllint: --git needs the git program on PATH")
    done = subprocess.run(["git", *args], cwd=cwd, capture_output=True)
    if check and done.returncode != 0:
        message = done.stderr.decode("utf-8", "replace").strip().splitlines()
        raise UsageError(f"ctllint: git {' '.join(args[:2])} failed: {message[-1] if message else 'exit ' + str(done.returncode)}")
    return done


def resolve_commit(rev: str, cwd: str) -> str:
    if rev.startswith("-"):
        raise UsageError(f"ctllint: bad revision '{rev}'")
    done = git_cmd(["rev-parse", "--verify", "--quiet", "--end-of-options", f"{rev}^{{commit}}"], cwd=cwd, check=False)
    if done.returncode != 0:
        raise UsageError(f"ctllint: bad revision '{rev}': not a commit in this repository")
    return done.stdout.decode().strip()


class RevisionTree:
    """Files of one revision written into a temporary folder, so that ``use`` resolves within that revision."""

    def __init__(self, sha: str, top: str, folder: str, limits: Limits | None = None):
        self.sha = sha
        self.top = top
        self.root = folder
        self.limits = limits or Limits()
        os.makedirs(os.path.join(folder, ".git"), exist_ok=True)  # the repository root for `use` checks

    def blob(self, rel: str) -> bytes | None:
        """The blob's bytes, None when there is none; a ReadProblem when it passes the size limit."""
        return git_blob(self.sha, rel, self.top, self.limits)

    def _put(self, rel: str) -> tuple[str, bytes] | None:
        target = os.path.join(self.root, *rel.split("/"))
        try:
            data = self.blob(rel)
        except ReadProblem:
            # An oversized blob becomes a sparse file of its size: loading it gives the
            # same located "above the limit" finding as check, and nothing is held in memory.
            size = int(git_cmd(["cat-file", "-s", f"{self.sha}:{rel}"], cwd=self.top).stdout.strip())
            os.makedirs(os.path.dirname(target), exist_ok=True)
            with open(target, "wb") as handle:
                handle.truncate(size)
            return target, b""
        if data is None:
            return None
        os.makedirs(os.path.dirname(target), exist_ok=True)
        with open(target, "wb") as handle:
            handle.write(data)
        return target, data

    def write(self, rel: str) -> str | None:
        put = self._put(rel)
        if put is None:
            return None
        target, data = put
        for used in _use_entries(data):
            used_rel = os.path.normpath(os.path.join(os.path.dirname(rel), used)).replace(os.sep, "/")
            if used_rel.startswith("../") or os.path.isabs(used_rel):
                continue
            if not _git_path(used_rel):
                continue  # the loader reports the entry; git is not asked for it
            if not os.path.exists(os.path.join(self.root, *used_rel.split("/"))):
                try:
                    self._put(used_rel)
                except OSError:  # a name the file system refuses: the loader reports the entry as missing
                    continue
        return target


def _peek(data: bytes) -> tuple[set[str], list[str]]:
    """The top-level keys of a schematic and the ``use`` paths it names, read leniently (the loader reports any problem)."""
    try:
        root = compose(data.decode("utf-8", "replace").lstrip("\ufeff"), Limits())
    except (YamlProblem, RecursionError, ValueError):
        return set(), []
    if not isinstance(root, MappingNode):
        return set(), []
    keys: set[str] = set()
    uses: list[str] = []
    for k, v in root.value:
        if isinstance(k, ScalarNode):
            keys.add(k.value)
            if k.value == "use":
                items = v.value if isinstance(v, SequenceNode) else [v]
                uses = [n.value for n in items if isinstance(n, ScalarNode) and isinstance(n.value, str)]
    return keys, uses


def _use_entries(data: bytes) -> list[str]:
    return _peek(data)[1]


def _is_device_file(data: bytes) -> bool:
    keys = _peek(data)[0]
    return "devices" in keys and not keys & {"supplies", "rungs", "expect", "use"}


# A path git can be asked about: no NUL (an argument cannot hold one), within
# what a file system names (PATH_MAX), so that a ``use`` entry written to be
# hostile is reported by the loader rather than crashing the command.
_GIT_PATH_MAX = 4096


def _git_path(rel: str) -> bool:
    return bool(rel) and "\0" not in rel and len(rel.encode("utf-8", "surrogateescape")) <= _GIT_PATH_MAX


def _read(rel: str, sha: str | None, top: str, limits: Limits | None = None) -> bytes | None:
    """A file of the working tree (sha None) or of a revision; None when it is not there, not a
    regular file or above the size limit (loading it, where it is loaded, says why)."""
    try:
        if sha is None:
            return read_bytes(os.path.join(top, *rel.split("/")), limits)
        return git_blob(sha, rel, top, limits)
    except ReadProblem:
        return None


def dependent_schematics(changes: list[tuple[str | None, str | None]], old_sha: str, new_sha: str | None, top: str, cwd: str,
                pathspecs: list[str], limits: Limits | None = None) -> list[tuple[str, str]]:
    """Unchanged schematics that ``use`` a changed shared device file: (schematic, device file) pairs.

    Their devices changed with the device file, and so may their findings.
    """
    device_files: set[str] = set()
    for old_rel, new_rel in changes:
        for rel, sha in ((old_rel, old_sha), (new_rel, new_sha)):
            if rel and rel not in device_files:
                data = _read(rel, sha, top, limits)
                if data is not None and _is_device_file(data):
                    device_files.add(rel)
    if not device_files:
        return []
    listed = {p for pair in changes for p in pair if p}
    if new_sha is None:
        names = git_cmd(["ls-files", "-z", "--full-name", "--", *pathspecs], cwd=cwd).stdout
    else:
        names = git_cmd(["ls-tree", "-r", "-z", "--name-only", "--full-name", new_sha, "--", *pathspecs], cwd=cwd).stdout
    basenames = {rel.rsplit("/", 1)[-1].encode() for rel in device_files}
    out: list[tuple[str, str]] = []
    for name in names.decode("utf-8", "surrogateescape").split("\0"):
        if not name.endswith(SCHEMATIC_SUFFIXES) or name in listed:
            continue
        data = _read(name, new_sha, top, limits)
        if data is None or not any(b in data for b in basenames):
            continue
        for used in _use_entries(data):
            resolved = os.path.normpath(os.path.join(os.path.dirname(name), used)).replace(os.sep, "/")
            if resolved in device_files:
                out.append((name, resolved))
                break
    return out


def name_status(text: str) -> list[tuple[str | None, str | None]]:
    """(old path, new path) pairs from ``git diff --name-status -z``; None for the missing side."""
    fields = text.split("\0")
    out: list[tuple[str | None, str | None]] = []
    i = 0
    while i < len(fields) and fields[i]:
        status = fields[i]
        if status[0] in "RC":
            out.append((fields[i + 1], fields[i + 2]))  # a copy is compared with its source
            i += 3
            continue
        path = fields[i + 1]
        if status[0] == "A":
            out.append((None, path))
        elif status[0] == "D":
            out.append((path, None))
        else:  # M, T, U, X
            out.append((path, path))
        i += 2
    return out
