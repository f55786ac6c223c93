"""Hostile and broken input: never a traceback, never a hang, nothing executed.

- Resource bombs (alias bomb, deep nesting, a 50 MB file, a rung of 100,000
  elements, self-joined wires, a device in 10,000 paths) end in findings or a
  ``format`` error, run in a subprocess under a memory limit. The timeout is
  only there so that a hang fails instead of blocking CI; the tests assert
  the outcome, not a time.
- Nothing executed or escaped: tags that would construct objects, ``use``
  paths that leave the repository, link loops, unreadable files and folders,
  pipes and devices named like schematics; the other files are still checked.
- Misbehaving plugins (raising, garbage, endless loop, failing import,
  ``sys.exit``): the other rules still run and exit status 1 says so.
- Nothing lost: ``--output`` is atomic, input files are never written, output
  is byte-identical across hash seeds, worker counts and plugin load orders.
"""
from __future__ import annotations

import importlib
import importlib.util
import io
import json
import os
import resource
import shutil
import stat
import subprocess
import sys
import textwrap
from contextlib import redirect_stderr, redirect_stdout

import pytest

from ctllint.commands.cli import main

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(HERE)
HOSTILE = os.path.join(HERE, "data", "hostile")
PLUGINS = os.path.join(HOSTILE, "plugins")
MEMORY_LIMIT = 4 * 2**30  # address space of a subprocess: a bomb that escapes the limits dies of MemoryError, visibly

CLEAN = textwrap.dedent("""\
    ctllint: 1
    title: Run relay
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      PB1: {kind: pushbutton, function: stop}
      PB2: {kind: pushbutton, function: start}
      CR1: {kind: relay, coil: 120 VAC}
    rungs:
      - title: Run relay
        paths:
          - [L1, PB1.NC, 2, PB2.NO, 3, CR1.coil, X2]
          - [2, CR1.NO, 3]
    """)
# The same with an undeclared device at line 14: an unknown-device finding
# (wiring plugin) that proves the built-in rules ran.
WITH_UNKNOWN = CLEAN + "      - [L1, ZZ9.NO, 3]\n"
UNKNOWN_LINE = 14


# -- helpers --------------------------------------------------------------------------

def run_cli(*argv: str) -> tuple[int, str, str]:
    out, err = io.StringIO(), io.StringIO()
    with redirect_stdout(out), redirect_stderr(err):
        rc = main(list(argv))
    return rc, out.getvalue(), err.getvalue()


def _limit_memory() -> None:  # pragma: no cover - runs in the child
    resource.setrlimit(resource.RLIMIT_AS, (MEMORY_LIMIT, MEMORY_LIMIT))


def run_subprocess(args: list[str], cwd: str, timeout: float = 120, env: dict | None = None) -> tuple[int, str, str]:
    """``python -m ctllint ARGS`` in ``cwd`` under a memory limit; a hang fails the test after ``timeout``."""
    full_env = {**os.environ, "CTLLINT_NO_CACHE": "1", "NO_COLOR": "1", **(env or {})}
    try:
        proc = subprocess.run([sys.executable, "-m", "ctllint", *args], cwd=cwd, capture_output=True, text=True,
                              timeout=timeout, env=full_env, preexec_fn=_limit_memory)
    except subprocess.TimeoutExpired:
        pytest.fail(f"ctllint {' '.join(args)} did not finish within {timeout} s")
    return proc.returncode, proc.stdout, proc.stderr


def findings(out: str) -> list[dict]:
    return json.loads(out)["diagnostics"]


def assert_no_traceback(rc: int, err: str) -> None:
    assert rc in (0, 1), f"exit status {rc}:\n{err[-3000:]}"
    assert "Traceback" not in err and "internal error" not in err, err[-3000:]


def write(path, text: str | bytes) -> str:
    os.makedirs(os.path.dirname(str(path)), exist_ok=True)
    with open(path, "wb") as handle:
        handle.write(text.encode("utf-8") if isinstance(text, str) else text)
    return str(path)


def config(folder, **limits) -> str:
    body = "limits: {" + ", ".join(f"{k}: {v}" for k, v in limits.items()) + "}\n" if limits else "# defaults\n"
    return write(os.path.join(str(folder), ".ctllint.yaml"), body)


# -- resource bombs ---------------------------------------------------------------------

def billion_laughs() -> str:
    lines = ["ctllint: 1", 'a: &a ["lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol"]']
    prev = "a"
    for name in "bcdefghij":
        lines.append(f"{name}: &{name} [" + ", ".join([f"*{prev}"] * 10) + "]")
        prev = name
    lines.append(f"rungs: [{{paths: *{prev}}}]")
    return "\n".join(lines) + "\n"


def bomb_long_rung(elements: int) -> str:
    """One path of ``elements`` elements: contacts in series, a coil, an overload, an unknown device at the end."""
    items = ["L1"]
    for i in range(elements - 3):
        items += ["PB1.NC" if i % 2 else "CR1.NO", f"w{i}"]
    items += ["CR2.coil", "m", "ZZ9.NO", "n", "OL1.NC", "X2"]
    return textwrap.dedent("""\
        ctllint: 1
        supplies:
          ctl: {hot: L1, common: X2, voltage: 120 VAC}
        devices:
          PB1: {kind: pushbutton, function: stop}
          PB2: {kind: pushbutton, function: start}
          CR1: {kind: relay, coil: 120 VAC}
          CR2: {kind: relay, coil: 120 VAC}
          OL1: {kind: overload, setting: 5 A}
        rungs:
          - paths:
              - [L1, PB2.NO, c, CR1.coil, X2]
          - paths:
        """) + "      - [" + ", ".join(items) + "]\n"


def bomb_many_paths(paths: int) -> str:
    """One contact (M1.NO) in ``paths`` parallel paths to as many lights, and the seal-in ten thousand times."""
    head = textwrap.dedent("""\
        ctllint: 1
        supplies:
          ctl: {hot: L1, common: X2, voltage: 120 VAC}
        devices:
          PB1: {kind: pushbutton, function: stop}
          PB2: {kind: pushbutton, function: start}
          M1: {kind: starter, coil: 120 VAC, overload: OL1, inrush: 200 VA, sealed: 25 VA}
          OL1: {kind: overload, setting: 5 A}
          PL1: {kind: pilot-light, voltage: 120 VAC, power: 1 W}
        rungs:
          - paths:
              - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]
              - [L1, ZZ9.NO, 3]
        """)
    lights = "  - paths:\n" + "".join(f"      - [L1, M1.NO, p{i}, PL1, X2]\n" for i in range(paths))
    seals = "  - paths:\n" + "".join("      - [2, M1.NO, 3]\n" for _ in range(paths))
    return head + lights + seals


def test_alias_bomb_is_a_format_error(tmp_path):
    path = write(tmp_path / "laughs.ctl.yaml", billion_laughs())
    rc, out, err = run_subprocess(["check", "--format", "json", path], str(tmp_path))
    assert_no_traceback(rc, err)
    assert rc == 1
    [d] = findings(out)
    assert d["rule"] == "format" and "max_nodes" in d["message"], d


@pytest.mark.parametrize("shape", ["flow-sequences", "flow-mappings", "block-sequences", "block-mappings", "million-brackets"])
def test_deep_nesting_is_a_format_error(tmp_path, shape):
    n = 10_000
    text = {
        "flow-sequences": "ctllint: 1\nrungs: " + "[" * n + "]" * n + "\n",
        "flow-mappings": "ctllint: 1\nrungs: " + "{a: " * n + "1" + "}" * n + "\n",
        "block-sequences": "ctllint: 1\nrungs:\n" + "- " * n + "x\n",  # compact: ten thousand levels on one line
        "block-mappings": "ctllint: 1\n" + "".join(" " * i + f"k{i}:\n" for i in range(3000)),  # 10,000 would pass 32 MB
        "million-brackets": "[" * 1_000_000,  # the C composer once crashed (SIGSEGV) at 100,000
    }[shape]
    path = write(tmp_path / "deep.ctl.yaml", text)
    rc, out, err = run_subprocess(["check", "--format", "json", path], str(tmp_path))
    assert_no_traceback(rc, err)
    [d] = findings(out)
    assert d["rule"] == "format" and "max_depth" in d["message"], d
    assert 1 <= d["line"] <= text.count("\n") + 1


def test_50_mb_file_is_a_format_error_without_reading_it(tmp_path):
    path = str(tmp_path / "huge.ctl.yaml")
    with open(path, "wb") as handle:  # sparse: 50 MB long, nothing written
        handle.truncate(50 * 2**20)
    other = write(tmp_path / "other.ctl.yaml", WITH_UNKNOWN)
    rc, out, err = run_subprocess(["check", "--format", "json", path, other], str(tmp_path))
    assert_no_traceback(rc, err)
    by_file = {}
    for d in findings(out):
        by_file.setdefault(os.path.basename(d["path"]), []).append(d)
    [d] = by_file["huge.ctl.yaml"]
    assert d["rule"] == "format" and "max_file_bytes" in d["message"] and d["line"] == 1
    assert any(d["rule"] == "unknown-device" for d in by_file["other.ctl.yaml"]), "the other file was not checked"


def test_50_mb_used_file_is_refused(tmp_path):
    os.makedirs(tmp_path / ".git")
    with open(tmp_path / "huge.ctl.yaml", "wb") as handle:
        handle.truncate(50 * 2**20)
    path = write(tmp_path / "main.ctl.yaml", CLEAN.replace("title: Run relay\n", "title: Run relay\nuse: [huge.ctl.yaml]\n", 1))
    rc, out, err = run_subprocess(["check", "--format", "json", path], str(tmp_path))
    assert_no_traceback(rc, err)
    [d] = findings(out)
    assert d["rule"] == "format" and d["line"] == 3 and "max_file_bytes" in d["message"], d


def test_rung_of_100000_elements_ends_in_findings(tmp_path):
    text = bomb_long_rung(100_000)
    path = write(tmp_path / "long.ctl.yaml", text)
    rc, out, err = run_subprocess(["check", "--format", "json", path], str(tmp_path), timeout=300)
    assert_no_traceback(rc, err)
    found = findings(out)
    last = text.count("\n")
    assert any(d["rule"] == "unknown-device" and d["line"] == last for d in found), found[:20]
    assert not [d for d in found if d["rule"] in ("format", "plugin-error")], [d for d in found if d["rule"] in ("format", "plugin-error")][:5]


def test_more_elements_than_the_limit_is_a_format_error(tmp_path):
    config(tmp_path, max_elements=1000)
    path = write(tmp_path / "long.ctl.yaml", bomb_long_rung(5000))
    rc, out, err = run_cli("check", "--config", str(tmp_path / ".ctllint.yaml"), "--no-cache", "--format", "json", path)
    assert_no_traceback(rc, err)
    assert [d["rule"] for d in findings(out)] == ["format"] and "max_elements" in findings(out)[0]["message"]


def test_device_in_10000_paths_ends_in_findings(tmp_path):
    path = write(tmp_path / "fan.ctl.yaml", bomb_many_paths(10_000))
    rc, out, err = run_subprocess(["check", "--format", "json", path], str(tmp_path), timeout=300)
    assert_no_traceback(rc, err)
    found = findings(out)
    assert any(d["rule"] == "unknown-device" and d["line"] == 13 for d in found), found[:20]
    assert not [d for d in found if d["rule"] in ("format", "plugin-error")], [d for d in found if d["rule"] in ("format", "plugin-error")][:5]


def test_wires_joined_to_themselves(tmp_path):
    text = CLEAN + (
        "      - [3, CR1.NO, 3]\n"
        "      - [L1, PB2.NO, L1]\n"
        "      - [X2, PB1.NC, X2]\n"
        "      - [5, CR1.NO, 5, CR1.NO, 5]\n"
        "  - paths:\n"
        "      - [L1, CR1.coil, L1]\n"
    )
    path = write(tmp_path / "self.ctl.yaml", text)
    rc, out, err = run_cli("check", "--no-cache", "--format", "json", path)
    assert_no_traceback(rc, err)
    found = findings(out)
    assert not [d for d in found if d["rule"] in ("format", "plugin-error")], found
    # the coil with both ends on L1 can never be energized
    assert any(d["line"] == 19 and d["rule"] in ("open-circuit", "coil-duplicate") for d in found), found


def test_the_same_starter_rung_forty_times_is_checked_within_the_limit(tmp_path):
    """Pasted copies of a rung: seal-in once grew as their fourth power (58 copies, about two minutes)."""
    head = bomb_many_paths(0).split("rungs:\n")[0]
    rung = "  - paths:\n      - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]\n      - [2, M1.NO, 3]\n"
    config(tmp_path, plugin_seconds=5)
    path = write(tmp_path / "copies.ctl.yaml", head + "rungs:\n" + rung * 40)
    rc, out, err = run_cli("check", "--config", str(tmp_path / ".ctllint.yaml"), "--no-cache", "--format", "json", path)
    assert_no_traceback(rc, err)
    assert not [d for d in findings(out) if d["rule"] == "plugin-error"], [d for d in findings(out) if d["rule"] == "plugin-error"]


@pytest.mark.parametrize("seconds", [".inf", "1e308", "1e-300", "0.000001"])
def test_odd_time_limits_do_not_break_the_timer(tmp_path, seconds):
    write(tmp_path / ".ctllint.yaml", f"limits: {{plugin_seconds: {seconds}}}\n")
    path = write(tmp_path / "a.ctl.yaml", WITH_UNKNOWN)
    rc, out, err = run_cli("check", "--config", str(tmp_path / ".ctllint.yaml"), "--no-cache", "--format", "json", path)
    assert_no_traceback(rc, err)
    assert rc == 1


@pytest.mark.parametrize("limit", ["max_depth: .inf", "max_nodes: .nan", "max_elements: .inf"])
def test_infinite_limits_are_a_configuration_error(tmp_path, limit):
    write(tmp_path / ".ctllint.yaml", f"limits: {{{limit}}}\n")
    path = write(tmp_path / "a.ctl.yaml", CLEAN)
    rc, out, err = run_cli("check", "--config", str(tmp_path / ".ctllint.yaml"), "--no-cache", path)
    assert rc == 2 and "Traceback" not in err, err


# -- nothing executed -------------------------------------------------------------------

TAGGED = [
    ("!!python/object/apply:os.system ['touch {marker}']", "python/object/apply:os.system"),
    ("!!python/object/apply:subprocess.check_output [['touch', '{marker}']]", "python/object/apply"),
    ("!!python/name:os.system", "python/name:os.system"),
    ("!!python/object:builtins.object {{}}", "python/object"),
    ("!!python/module:os", "python/module"),
    ("!foo bar", "!foo"),
    ("!<tag:example.com,2000:app/x> 1", "tag:example.com"),
    ("!!binary aGVsbG8=", "!!binary"),
    ("!!set {{a, b}}", "!!set"),
    ("!!omap [a: 1]", "!!omap"),
]


@pytest.mark.parametrize("where", ["title", "key", "rungs", "root"])
@pytest.mark.parametrize("tagged,named", TAGGED, ids=[t[1] for t in TAGGED])
def test_tags_that_construct_objects_are_refused(tmp_path, tagged, named, where):
    marker = tmp_path / "executed"
    value = tagged.format(marker=marker)
    if where == "title":
        text = CLEAN.replace("title: Run relay\n", f"title: {value}\n", 1)
    elif where == "key":
        text = CLEAN.replace("title: Run relay\n", f"? {value}\n: 1\n", 1)
    elif where == "rungs":
        text = CLEAN.replace("      - [2, CR1.NO, 3]\n", f"      - {value}\n", 1)
    else:
        text = f"--- {value}\n"
    path = write(tmp_path / "tagged.ctl.yaml", text)
    rc, out, err = run_cli("check", "--no-cache", "--format", "json", path)
    assert_no_traceback(rc, err)
    assert rc == 1
    found = findings(out)
    assert [d["rule"] for d in found] == ["format"], found
    assert "not allowed" in found[0]["message"], found
    assert not marker.exists(), "a tag in a schematic ran a command"


def test_tagged_configuration_is_refused_too(tmp_path, monkeypatch):
    marker = tmp_path / "executed"
    write(tmp_path / ".ctllint.yaml", f"jobs: !!python/object/apply:os.system ['touch {marker}']\n")
    write(tmp_path / "a.ctl.yaml", CLEAN)
    monkeypatch.chdir(tmp_path)
    rc, out, err = run_cli("check", "--no-cache", "a.ctl.yaml")
    assert rc == 2 and "not allowed" in err, err
    assert not marker.exists()


# -- nothing escaped: use paths, links, unreadable files, folders -----------------------------

DEVICES = "ctllint: 1\ndevices:\n  PB9: {kind: pushbutton, function: stop}\n"


@pytest.fixture
def repo(tmp_path):
    """tmp/repo (a git root) with a device library, and tmp/outside beside it."""
    root = tmp_path / "repo"
    os.makedirs(root / ".git")
    write(root / "lib" / "devices.ctl.yaml", DEVICES)
    write(tmp_path / "outside" / "x.ctl.yaml", DEVICES)
    os.symlink(tmp_path / "outside" / "x.ctl.yaml", root / "lib" / "escape.ctl.yaml")
    os.symlink(root / "lib" / "loop-b.ctl.yaml", root / "lib" / "loop-a.ctl.yaml")
    os.symlink(root / "lib" / "loop-a.ctl.yaml", root / "lib" / "loop-b.ctl.yaml")
    return root


def test_use_paths_that_leave_the_repository_are_refused(repo, tmp_path):
    uses = {
        "../../outside/x.ctl.yaml": "leaves the repository",
        "../../../../../../../../../../etc/x.ctl.yaml": "leaves the repository",
        str(tmp_path / "outside" / "x.ctl.yaml"): "must be relative",
        "/etc/passwd.ctl.yaml": "must be relative",
        "../lib/escape.ctl.yaml": "leaves the repository",
        "../lib/loop-a.ctl.yaml": "symbolic link",
        "../lib/nothing.ctl.yaml": "does not exist",
        "../lib": "must name a *.ctl.yaml",
        "../lib/devices.ctl.yaml\u0000.ctl.yaml": "control character",
        "main.ctl.yaml": "leads back",
    }
    text = CLEAN.replace("title: Run relay\n", "title: Run relay\nuse:\n" + "".join(f"  - {json.dumps(u)}\n" for u in uses), 1)
    path = write(repo / "plant" / "main.ctl.yaml", text)
    rc, out, err = run_subprocess(["check", "--format", "json", path], str(repo), timeout=60)
    assert_no_traceback(rc, err)
    found = findings(out)
    by_line = {d["line"]: d for d in found}
    for line, (use, words) in enumerate(uses.items(), start=4):
        assert line in by_line and by_line[line]["rule"] == "format", (use, found)
        assert words in by_line[line]["message"], (use, by_line[line])
    assert all(d["rule"] == "format" for d in found)


def test_used_files_that_use_each_other_are_refused(repo):
    write(repo / "lib" / "a.ctl.yaml", DEVICES + "use: [b.ctl.yaml]\n")
    write(repo / "lib" / "b.ctl.yaml", DEVICES.replace("PB9", "PB8") + "use: [a.ctl.yaml]\n")
    text = CLEAN.replace("title: Run relay\n", "title: Run relay\nuse: [../lib/a.ctl.yaml]\n", 1)
    path = write(repo / "plant" / "main.ctl.yaml", text)
    rc, out, err = run_cli("check", "--no-cache", "--format", "json", path, str(repo / "lib"))
    assert_no_traceback(rc, err)
    mine = [d for d in findings(out) if d["path"].endswith("main.ctl.yaml")]
    assert [(d["line"], d["rule"]) for d in mine] == [(3, "format")], mine
    assert len(mine[0]["message"]) < 600, "the message nests the cycle instead of naming it"


def test_links_pipes_devices_and_folders_named_like_schematics(repo):
    tree = repo / "plant"
    good = write(tree / "good.ctl.yaml", WITH_UNKNOWN)
    write(tree / "bad-version.ctl.yaml", CLEAN.replace("ctllint: 1", "ctllint: 2"))
    os.makedirs(tree / "folder.ctl.yaml")
    write(tree / "folder.ctl.yaml" / "inner.ctl.yaml", CLEAN.replace("ctllint: 1", "ctllint: 3"))
    os.symlink(tree, tree / "self")                          # a folder linked into itself
    os.symlink(tree, tree / "self-named.ctl.yaml")           # ... under a schematic's name
    os.symlink(tree / "b.ctl.yaml", tree / "a.ctl.yaml")     # a -> b -> a
    os.symlink(tree / "a.ctl.yaml", tree / "b.ctl.yaml")
    os.symlink(tree / "nowhere", tree / "dangling.ctl.yaml")
    os.symlink("/dev/zero", tree / "zero.ctl.yaml")          # would read forever
    os.mkfifo(tree / "pipe.ctl.yaml")                        # would block forever
    os.symlink(repo.parent / "outside" / "x.ctl.yaml", tree / "outside-link.ctl.yaml")
    rc, out, err = run_subprocess(["check", "--format", "json", str(tree)], str(repo), timeout=60)
    assert_no_traceback(rc, err)
    assert rc == 1
    doc = json.loads(out)
    by_file: dict[str, list[dict]] = {}
    for d in doc["diagnostics"]:
        by_file.setdefault(os.path.relpath(os.path.join(str(repo), d["path"]), str(tree)), []).append(d)
    expect = {
        "a.ctl.yaml": "cannot read file: Too many levels of symbolic links",
        "b.ctl.yaml": "cannot read file: Too many levels of symbolic links",
        "dangling.ctl.yaml": "cannot read file: No such file or directory",
        "zero.ctl.yaml": "not a regular file",
        "pipe.ctl.yaml": "not a regular file",
        "folder.ctl.yaml": "is a folder",
        "self-named.ctl.yaml": "is a folder",
        "bad-version.ctl.yaml": "format version",
        "outside-link.ctl.yaml": "symbolic link to a file outside the repository",
        os.path.join("folder.ctl.yaml", "inner.ctl.yaml"): "format version",
    }
    for name, words in expect.items():
        assert name in by_file, (name, sorted(by_file))
        assert any(words in d["message"] and d["rule"] == "format" for d in by_file[name]), (name, by_file[name])
    assert any(d["rule"] == "unknown-device" and d["line"] == UNKNOWN_LINE for d in by_file[os.path.relpath(good, str(tree))])
    assert not any(name.startswith("self" + os.sep) for name in by_file), "followed a folder link into itself"
    assert doc["files"] == len(expect) + 1  # and good.ctl.yaml
    assert set(by_file) <= set(expect) | {"good.ctl.yaml"}


def test_unreadable_file_chmod(tmp_path):
    if os.geteuid() == 0:
        pytest.skip("running as root: chmod 000 does not stop root from reading (see test_unreadable_file_simulated)")
    bad = write(tmp_path / "locked.ctl.yaml", CLEAN)
    os.chmod(bad, 0)
    good = write(tmp_path / "good.ctl.yaml", WITH_UNKNOWN)
    try:
        rc, out, err = run_cli("check", "--no-cache", "--format", "json", str(tmp_path))
    finally:
        os.chmod(bad, 0o644)
    assert_no_traceback(rc, err)
    found = findings(out)
    assert any(d["path"].endswith("locked.ctl.yaml") and "Permission denied" in d["message"] for d in found), found
    assert any(d["path"].endswith(os.path.basename(good)) and d["rule"] == "unknown-device" for d in found)


def _deny(monkeypatch, name: str, function: str) -> None:
    """Make ``os.FUNCTION`` fail with EACCES for paths ending in ``name``, as for a non-root user after chmod 000."""
    real = getattr(os, function)

    def denied(path, *args, **kwargs):
        if str(path).rstrip(os.sep).endswith(name):
            raise PermissionError(13, "Permission denied", str(path))
        return real(path, *args, **kwargs)

    monkeypatch.setattr(os, function, denied)


def test_unreadable_file_simulated(tmp_path, monkeypatch):
    write(tmp_path / "locked.ctl.yaml", CLEAN)
    good = write(tmp_path / "good.ctl.yaml", WITH_UNKNOWN)
    _deny(monkeypatch, "locked.ctl.yaml", "open")
    rc, out, err = run_cli("check", "--no-cache", "--format", "json", str(tmp_path))
    assert_no_traceback(rc, err)
    found = findings(out)
    locked = [d for d in found if d["path"].endswith("locked.ctl.yaml")]
    assert [(d["rule"], d["line"]) for d in locked] == [("format", 1)] and "Permission denied" in locked[0]["message"], locked
    assert any(d["path"].endswith(os.path.basename(good)) and d["rule"] == "unknown-device" for d in found)


def test_unreadable_folder_simulated(tmp_path, monkeypatch):
    write(tmp_path / "locked" / "inside.ctl.yaml", CLEAN)
    good = write(tmp_path / "good.ctl.yaml", WITH_UNKNOWN)
    _deny(monkeypatch, "locked", "scandir")
    rc, out, err = run_cli("check", "--no-cache", "--format", "json", str(tmp_path))
    assert_no_traceback(rc, err)
    found = findings(out)
    locked = [d for d in found if d["path"].endswith("locked")]
    assert len(locked) == 1 and "cannot be read" in locked[0]["message"] and "Permission denied" in locked[0]["message"], found
    assert any(d["path"].endswith(os.path.basename(good)) and d["rule"] == "unknown-device" for d in found)


def test_control_characters_in_messages_do_not_reach_the_terminal(tmp_path):
    """A double-quoted key can hold escape sequences, line breaks and bidi overrides: shown escaped."""
    text = CLEAN + '"\\e[2J\\e]0;owned\\a\\rfake.ctl.yaml:1:1: error: forged [format]\\n\\u202e\\x9b": 1\n'
    path = write(tmp_path / "esc.ctl.yaml", text)
    for fmt in ("text", "junit"):
        rc, out, err = run_cli("check", "--no-cache", "--format", fmt, path)
        assert_no_traceback(rc, err)
        assert not any(c in out for c in "\x1b\x07\r\u202e\x9b"), repr(out)
        if fmt == "text":
            assert len(out.splitlines()) == 1 and "\\x1b[2J" in out, out
    rc, out, err = run_cli("check", "--no-cache", "--format", "json", path)
    assert "\x1b[2J" in findings(out)[0]["message"]  # JSON escapes it itself and keeps it exact


# -- misbehaving plugins ------------------------------------------------------------------

def plugin_run(tmp_path, *names: str, seconds: float | None = None) -> tuple[int, list[dict], str]:
    lines = ["plugins: [" + ", ".join(json.dumps(os.path.join(PLUGINS, f"{n}.py")) for n in names) + "]"]
    if seconds:
        lines.append(f"limits: {{plugin_seconds: {seconds}}}")
    write(tmp_path / ".ctllint.yaml", "\n".join(lines) + "\n")
    path = write(tmp_path / "a.ctl.yaml", WITH_UNKNOWN)
    rc, out, err = run_cli("check", "--config", str(tmp_path / ".ctllint.yaml"), "--no-cache", "--format", "json", path)
    assert_no_traceback(rc, err)
    return rc, findings(out), err


def plugin_errors(found: list[dict]) -> list[str]:
    return [d["message"] for d in found if d["rule"] == "plugin-error"]


def assert_builtin_rules_ran(found: list[dict]) -> None:
    assert any(d["rule"] == "unknown-device" and d["line"] == UNKNOWN_LINE for d in found), found


def test_plugin_whose_rule_raises(tmp_path):
    rc, found, _ = plugin_run(tmp_path, "raising")
    assert rc == 1
    assert plugin_errors(found) == ["rule always-raises (raising.py) raised ValueError: this rule always raises"]
    assert all(d["line"] == 1 for d in found if d["rule"] == "plugin-error")
    assert_builtin_rules_ran(found)


def test_plugin_whose_registration_raises(tmp_path):
    rc, found, _ = plugin_run(tmp_path, "raising_registration")
    assert rc == 1
    assert any("ctllint_rules raised RuntimeError: cannot even list my rules" in m for m in plugin_errors(found))
    assert_builtin_rules_ran(found)


def test_plugin_that_fails_to_import(tmp_path):
    rc, found, _ = plugin_run(tmp_path, "broken_import")
    assert rc == 1
    [message] = plugin_errors(found)
    assert "failed to import" in message and "ModuleNotFoundError" in message
    assert_builtin_rules_ran(found)


def test_plugin_that_registers_garbage(tmp_path):
    rc, found, _ = plugin_run(tmp_path, "garbage_rules")
    assert rc == 1
    errors = "\n".join(plugin_errors(found))
    for words in ("returned int, not a Rule", "returned str, not a Rule", "returned NoneType, not a Rule",
                  "whose check is not callable", "['unhashable', 'name']", "rule '': its name", "severity 'catastrophic'",
                  "its options", "returned object, not a DeviceKind", "device kind ['unhashable']", "device kind 'bad-fields'"):
        assert words in errors, (words, errors)
    assert_builtin_rules_ran(found)


def test_plugin_whose_rules_return_garbage(tmp_path):
    rc, found, _ = plugin_run(tmp_path, "garbage_findings")
    assert rc == 1
    errors = "\n".join(plugin_errors(found))
    for rule, words in (("g-number", "raised TypeError"), ("g-strings", "returned str"), ("g-no-location", "not a Finding with a Location"),
                        ("g-bad-location", "is not (path text"), ("g-outside", "outside"), ("g-bad-fields", "severity 'catastrophic'"),
                        ("g-endless", "more than"), ("ctllint_check", "did not register"), ("ctllint_check", "returned int")):
        assert words in errors, (rule, words, errors)
    assert not [d for d in found if d["rule"].startswith("g-")], "a garbage finding was reported as a finding"
    assert_builtin_rules_ran(found)


def test_plugin_whose_rule_never_returns(tmp_path):
    rc, found, _ = plugin_run(tmp_path, "looping", seconds=1)
    assert rc == 1
    assert plugin_errors(found) == ["rule never-returns (looping.py) did not finish within 1 s (limits.plugin_seconds) and was stopped"]
    assert_builtin_rules_ran(found)  # unknown-device runs after never-returns: one runaway rule does not silence the rest


def test_plugin_whose_rule_calls_sys_exit(tmp_path):
    rc, found, _ = plugin_run(tmp_path, "exits")
    assert rc == 1
    assert plugin_errors(found) == ["rule calls-exit (exits.py) raised SystemExit: 0"]
    assert_builtin_rules_ran(found)


def test_every_misbehaving_plugin_at_once(tmp_path):
    rc, found, _ = plugin_run(tmp_path, "raising", "raising_registration", "garbage_rules", "garbage_findings", "looping", "broken_import", "exits", seconds=3)  # room for the built-in rules on a loaded machine
    assert rc == 1
    assert len(plugin_errors(found)) >= 20
    assert_builtin_rules_ran(found)


# -- nothing lost -------------------------------------------------------------------------

def test_failing_render_leaves_the_output_untouched(tmp_path, monkeypatch):
    import ctllint.output.report as report

    path = write(tmp_path / "a.ctl.yaml", WITH_UNKNOWN)
    out_file = write(tmp_path / "report.json", "previous report\n")
    formats = [f for f in report.FORMATS]

    def boom(diagnostics, files, rules):
        raise RuntimeError("render failed")

    monkeypatch.setattr(report, "FORMATS", [type(f)(f.name, boom, f.summary) if f.name == "json" else f for f in formats])
    rc, out, err = run_cli("check", "--no-cache", "--format", "json", "-o", out_file, path)
    assert rc == 3 and "render failed" in err
    with open(out_file) as handle:
        assert handle.read() == "previous report\n"
    assert not [n for n in os.listdir(tmp_path) if n.endswith(".tmp")]


def test_failing_write_leaves_the_output_untouched(tmp_path, monkeypatch):
    path = write(tmp_path / "a.ctl.yaml", WITH_UNKNOWN)
    out_file = write(tmp_path / "report.json", "previous report\n")
    os.chmod(out_file, 0o644)
    real_fdopen = os.fdopen

    class HalfWriter(io.StringIO):
        """Writes half, then the disk is full."""

        def __init__(self, handle):
            super().__init__()
            self.handle = handle

        def write(self, text):
            self.handle.write(text[: len(text) // 2])
            self.handle.flush()
            raise OSError(28, "No space left on device")

        def close(self):
            self.handle.close()

    def fdopen(fd, mode="r", *args, **kwargs):
        handle = real_fdopen(fd, mode, *args, **kwargs)
        return HalfWriter(handle) if mode == "w" else handle  # only the report: reading the schematics goes on

    import ctllint.commands.cli as cli

    monkeypatch.setattr(cli.os, "fdopen", fdopen)
    rc, out, err = run_cli("check", "--no-cache", "--format", "json", "-o", out_file, path)
    monkeypatch.undo()
    assert rc == 2 and "No space left on device" in err, err
    with open(out_file) as handle:
        assert handle.read() == "previous report\n"
    assert not [n for n in os.listdir(tmp_path) if n.endswith(".tmp")]
    # a successful write replaces it whole, keeping its permissions
    rc, out, err = run_cli("check", "--no-cache", "--format", "json", "-o", out_file, path)
    assert rc == 1
    with open(out_file) as handle:
        assert json.load(handle)["files"] == 1
    assert stat.S_IMODE(os.stat(out_file).st_mode) == 0o644


def test_output_to_a_folder_is_a_usage_error(tmp_path):
    path = write(tmp_path / "a.ctl.yaml", CLEAN)
    os.makedirs(tmp_path / "out")
    rc, out, err = run_cli("check", "--no-cache", "-o", str(tmp_path / "out"), path)
    assert rc == 2 and "is a folder" in err


def _snapshot(folder: str) -> dict[str, tuple]:
    snap = {}
    for base, dirs, files in os.walk(folder):
        for name in dirs + files:
            full = os.path.join(base, name)
            st = os.lstat(full)
            content = b""
            if stat.S_ISREG(st.st_mode):
                with open(full, "rb") as handle:
                    content = handle.read()
            snap[os.path.relpath(full, folder)] = (st.st_mode, st.st_mtime_ns, st.st_size, content)
    return snap


def test_input_files_are_never_written(tmp_path):
    """Bytes, mtimes and the listing of the checked tree are the same after runs with every format, the cache on."""
    tree = tmp_path / "tree"
    shutil.copytree(os.path.join(ROOT, "fixtures"), tree / "fixtures", symlinks=True)
    shutil.copytree(os.path.join(HERE, "data", "fuzz"), tree / "fuzz")
    write(tree / "faulty.ctl.yaml", WITH_UNKNOWN)
    write(tree / "broken.ctl.yaml", b"\xef\xbb\xbfctllint: 1\n\tbad: [\n")
    write(tree / "suppressed.ctl.yaml", WITH_UNKNOWN.replace("[L1, ZZ9.NO, 3]", "[L1, ZZ9.NO, 3]   # ctllint-allow: unknown-device"))
    before = _snapshot(str(tree))
    env = {"XDG_CACHE_HOME": str(tmp_path / "cache"), "CTLLINT_NO_CACHE": ""}
    for fmt in ("text", "json", "sarif", "junit"):
        rc, out, err = run_subprocess(["check", "--format", fmt, "."], str(tree), env=env)
        assert_no_traceback(rc, err)
    rc, out, err = run_subprocess(["check", "--format", "json", "-o", str(tmp_path / "report.json"), "."], str(tree), env=env)
    assert_no_traceback(rc, err)
    assert _snapshot(str(tree)) == before


def _fuzz_engine():
    spec = importlib.util.spec_from_file_location("ctllint_fuzz_engine", os.path.join(HERE, "test_fuzz.py"))
    module = importlib.util.module_from_spec(spec)
    sys.modules[spec.name] = module  # its dataclasses look their module up there
    spec.loader.exec_module(module)
    return module


@pytest.fixture(scope="module")
def corpus(tmp_path_factory) -> str:
    """The fixtures, the fuzz bases and 50 seeded mutants of them: many findings of every kind, format errors too."""
    import random

    folder = tmp_path_factory.mktemp("corpus")
    shutil.copytree(os.path.join(ROOT, "fixtures"), folder / "fixtures")
    shutil.copytree(os.path.join(HERE, "data", "fuzz"), folder / "mutants")
    engine = _fuzz_engine()
    for seed in range(50):
        rng = random.Random(seed)
        base = rng.choice(engine.BASES)
        m = engine.Mutator(rng)
        data = m.dump(m.mutate_circuit(json.loads(json.dumps(base.data)))).encode("utf-8", "surrogatepass") if seed % 4 else m.mutate(base)
        write(folder / "mutants" / f"{seed:03d}-{os.path.basename(base.rel)}", data)
    return str(folder)


@pytest.mark.parametrize("fmt", ["json", "text", "sarif"])
def test_output_is_the_same_whatever_the_hash_seed_and_workers(corpus, fmt):
    outputs = set()
    for seed, jobs in (("0", "1"), ("1", "2"), ("random", "2")):
        rc, out, err = run_subprocess(["check", "--format", fmt, "--jobs", jobs, "."], corpus, env={"PYTHONHASHSEED": seed})
        assert_no_traceback(rc, err)
        outputs.add(out)
    assert len(outputs) == 1, "output differs between hash seeds or worker counts"
    if fmt == "json":
        rules = {d["rule"] for d in json.loads(out)["diagnostics"]}
        assert len(rules) >= 10, f"the corpus gives findings of few rules ({rules}): the comparison proves little"


def test_output_is_the_same_whatever_the_plugin_order(corpus):
    from ctllint.output import report
    from ctllint.checking.engine import Checker
    from ctllint.checking.host import PluginHost
    from ctllint.reading.loader import SCHEMATIC_SUFFIXES

    names = ["ctllint_plugins.wiring", "ctllint_plugins.motor_control", "ctllint_plugins.ratings", "ctllint_plugins.behaviour"]
    modules = [importlib.import_module(n) for n in names]
    files = sorted(os.path.join(base, f) for base, _, fs in os.walk(corpus) for f in fs if f.endswith(SCHEMATIC_SUFFIXES))
    rendered = []
    for order in (modules, modules[::-1], modules[1:] + modules[:1]):
        host = PluginHost.create(entry_points=False, extra=order)
        assert not host.problems, host.problems
        checker = Checker.default(host=host)
        diagnostics = sorted({d for f in files for d in checker.check_file(f, display_path=os.path.relpath(f, corpus)).diagnostics})
        shown = [os.path.relpath(f, corpus) for f in files]
        rendered.append((report.render_json(diagnostics, shown, host.rules), report.render_text(diagnostics, shown, host.rules),
                         report.render_sarif(diagnostics, shown, host.rules), list(host.rules)))
    assert rendered[0][3] == rendered[1][3] == rendered[2][3]
    assert rendered[0] == rendered[1] == rendered[2]
    assert json.loads(rendered[0][0])["diagnostics"], "the corpus gave no findings: the comparison proves little"
