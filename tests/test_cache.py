"""The result cache: never stale after an edit, safe when shared, and can be turned off."""
import json
import os
import subprocess
import sys
import textwrap

import pytest

from ctllint.commands.cli import main

SCHEMATIC = textwrap.dedent("""\
    ctllint: 1
    title: Cache test
    use: [lib/devices.ctl.yaml]
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      PB2: {kind: pushbutton, function: start}
      CR1: {kind: relay, coil: 120 VAC}
    rungs:
      - title: Run relay
        paths:
          - [L1, PB1.NC, 2, PB2.NO, 3, CR1.coil, X2]
          - [2, CR1.NO, 3]
    """)
DEVICES = "ctllint: 1\ndevices:\n  PB1: {kind: pushbutton, function: stop}\n"


@pytest.fixture
def project(tmp_path, monkeypatch):
    (tmp_path / ".git").mkdir()
    (tmp_path / "lib").mkdir()
    (tmp_path / "lib" / "devices.ctl.yaml").write_text(DEVICES)
    (tmp_path / "a.ctl.yaml").write_text(SCHEMATIC)
    monkeypatch.chdir(tmp_path)
    monkeypatch.delenv("CTLLINT_NO_CACHE", raising=False)
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "cache"))
    return tmp_path


def rules_found(capsys, *args):
    code = main(["check", "--format", "json", "-j", "1", "a.ctl.yaml", *args])
    doc = json.loads(capsys.readouterr().out)
    return code, sorted((d["rule"], d["line"]) for d in doc["diagnostics"])


def entries(project):
    folder = project / "cache" / "ctllint"
    return sorted(p for p in folder.rglob("*.json")) if folder.exists() else []


def test_second_run_reads_the_cache_and_agrees(project, capsys):
    first = rules_found(capsys)
    assert first == (0, []) and len(entries(project)) == 1
    stamp = entries(project)[0].stat().st_mtime_ns
    assert rules_found(capsys) == first
    assert entries(project)[0].stat().st_mtime_ns == stamp  # read, not rewritten


def test_editing_the_file_is_never_stale(project, capsys):
    rules_found(capsys)
    (project / "a.ctl.yaml").write_text(SCHEMATIC.replace("PB1.NC", "PB1.NO"))
    code, found = rules_found(capsys)
    assert code == 1 and ("stop-normally-closed", 12) in found


def test_editing_a_used_device_file_is_never_stale(project, capsys):
    rules_found(capsys)
    (project / "lib" / "devices.ctl.yaml").write_text(DEVICES.replace("{kind: pushbutton, function: stop}", "{kind: relay, coil: 120 VAC}"))
    code, found = rules_found(capsys)
    assert code == 1 and ("coil-missing", 12) in found


def test_configuration_is_part_of_the_key(project, capsys):
    (project / "a.ctl.yaml").write_text(SCHEMATIC.replace("PB1.NC", "PB1.NO"))
    assert rules_found(capsys)[0] == 1
    (project / ".ctllint.yaml").write_text("ignore: [motor-control]\n")
    code, found = rules_found(capsys)
    assert not any(rule == "stop-normally-closed" for rule, _ in found)


def test_local_plugin_edit_is_part_of_the_key(project, capsys):
    plugin = project / "site_rule.py"
    body = textwrap.dedent('''\
        from ctllint import hookimpl
        from ctllint.api import Finding, Rule
        from ctllint.reading.model import Severity

        def check(ctx):
            if MESSAGE:
                yield Finding(ctx.schematic.loc, MESSAGE)

        MESSAGE = "{message}"

        @hookimpl
        def ctllint_rules():
            return [Rule("site-note", Severity.ERROR, "a note", "A test rule for the cache key; it says what it is told.", "test", check)]
        ''')
    plugin.write_text(body.format(message=""))
    (project / ".ctllint.yaml").write_text("plugins: [site_rule.py]\n")
    assert rules_found(capsys) == (0, [])
    plugin.write_text(body.format(message="now it speaks"))
    os.utime(plugin, ns=(plugin.stat().st_atime_ns, plugin.stat().st_mtime_ns + 10_000_000))
    assert rules_found(capsys)[1] == [("site-note", 1)]


def test_cache_can_be_turned_off(project, capsys):
    rules_found(capsys, "--no-cache")
    assert entries(project) == []
    (project / ".ctllint.yaml").write_text("cache: false\n")
    rules_found(capsys)
    assert entries(project) == []


def test_two_runs_sharing_the_cache_agree(project):
    """Concurrent runs write entries atomically: both finish, agree, and leave only whole entries."""
    for i in range(30):
        (project / f"p{i:02d}.ctl.yaml").write_text(SCHEMATIC.replace("Cache test", f"Panel {i}"))
    env = dict(os.environ, XDG_CACHE_HOME=str(project / "cache"))
    env.pop("CTLLINT_NO_CACHE", None)
    cmd = [sys.executable, "-m", "ctllint", "check", "--format", "json", "-j", "2", "."]
    procs = [subprocess.Popen(cmd, cwd=project, env=env, stdout=subprocess.PIPE, stderr=subprocess.PIPE) for _ in range(3)]
    outs = [p.communicate(timeout=300) for p in procs]
    assert all(p.returncode == 0 for p in procs), [o[1][-500:] for o in outs]
    assert outs[0][0] == outs[1][0] == outs[2][0]
    for entry in entries(project):
        json.loads(entry.read_text())  # every entry is whole
    assert not list((project / "cache").rglob("*.tmp"))
    again = subprocess.run(cmd, cwd=project, env=env, capture_output=True)
    assert again.stdout == outs[0][0]


# -- a cache an attacker or a full disk has been at ----------------------------------------------

def test_an_edit_in_any_module_of_a_plugin_package_is_part_of_the_key(project, capsys):
    """The package's top module only imports; the rule's message lives in another module of it."""
    pkg = project / "site_rules"
    pkg.mkdir()
    (pkg / "__init__.py").write_text(textwrap.dedent('''\
        import importlib.util, os
        from ctllint import hookimpl
        from ctllint.api import Finding, Rule
        from ctllint.reading.model import Severity

        _spec = importlib.util.spec_from_file_location(__name__ + ".words", os.path.join(os.path.dirname(__file__), "words.py"))
        words = importlib.util.module_from_spec(_spec)
        _spec.loader.exec_module(words)

        def check(ctx):
            if words.MESSAGE:
                yield Finding(ctx.schematic.loc, words.MESSAGE)

        @hookimpl
        def ctllint_rules():
            return [Rule("site-note", Severity.ERROR, "a note", "A test rule for the cache key; it says what it is told.", "test", check)]
        '''))
    (pkg / "words.py").write_text('MESSAGE = ""\n')
    (project / ".ctllint.yaml").write_text("plugins: [site_rules]\n")
    assert rules_found(capsys) == (0, [])
    before = (pkg / "__init__.py").stat()
    (pkg / "words.py").write_text('MESSAGE = "now it speaks"\n')  # the same size would do; the top module is untouched
    assert (pkg / "__init__.py").stat().st_mtime_ns == before.st_mtime_ns
    assert rules_found(capsys)[1] == [("site-note", 1)]


def test_a_used_file_that_was_missing_and_is_created_later(project, capsys):
    os.remove(project / "lib" / "devices.ctl.yaml")
    code, found = rules_found(capsys)
    assert code == 1 and ("format", 3) in found  # use path does not exist
    (project / "lib" / "devices.ctl.yaml").write_text(DEVICES)
    assert rules_found(capsys) == (0, [])


def _bad_entries(project, capsys):
    """Each way a cache entry can be damaged or forged; the run must check the file afresh every time."""
    (project / "a.ctl.yaml").write_text(SCHEMATIC.replace("PB1.NC", "PB1.NO"))
    truth = rules_found(capsys)
    assert truth[0] == 1 and truth[1]
    [entry] = entries(project)
    good = json.loads(entry.read_text())
    forged = json.loads(entry.read_text())
    forged["entry"]["diagnostics"] = []  # a clean bill of health, signature left as it was
    unsigned = {"seal": "0" * 64, "entry": forged["entry"]}
    wrong_types = json.loads(entry.read_text())
    wrong_types["entry"]["diagnostics"][0]["line"] = "twelve"
    bad_severity = json.loads(entry.read_text())
    bad_severity["entry"]["diagnostics"][0]["severity"] = 99
    return truth, entry, [
        b"", b"\x00\xff garbage", b"[]", b"{}", b"null", b'{"seal": 1, "entry": 2}', b"[" * 100_000,
        json.dumps(good)[: len(json.dumps(good)) // 2].encode(),  # cut short (a full disk)
        json.dumps(forged).encode(), json.dumps(unsigned).encode(), json.dumps(wrong_types).encode(),
        json.dumps(bad_severity).encode(), json.dumps({"seal": good["seal"], "entry": good["entry"]["diagnostics"]}).encode(),
    ]


def test_a_corrupt_or_forged_entry_is_a_miss(project, capsys):
    truth, entry, variants = _bad_entries(project, capsys)
    for i, raw in enumerate(variants):
        entry.write_bytes(raw)
        assert rules_found(capsys) == truth, f"variant {i}: {raw[:80]!r}"


def test_entries_committed_to_a_repository_cache_folder_are_not_trusted(project, capsys, tmp_path_factory):
    """A repository can name its own cache folder and commit entries made elsewhere: without the user's key they are misses."""
    (project / ".ctllint.yaml").write_text("cache: .ctllint-cache\n")
    (project / "a.ctl.yaml").write_text(SCHEMATIC.replace("PB1.NC", "PB1.NO"))
    truth = rules_found(capsys)
    assert truth[0] == 1
    [entry] = sorted((project / ".ctllint-cache").rglob("*.json"))
    doc = json.loads(entry.read_text())
    doc["entry"]["diagnostics"] = []
    import hashlib
    import hmac

    for key in (b"", b"\x00" * 32, os.urandom(32)):  # keys an attacker might guess, and one of their own
        doc["seal"] = hmac.new(key, json.dumps(doc["entry"], sort_keys=True).encode(), hashlib.sha256).hexdigest()
        entry.write_text(json.dumps(doc))
        assert rules_found(capsys) == truth


def test_a_file_above_the_size_limit_is_not_read_to_be_hashed(project):
    """A sparse 64 GB file named like a schematic: refused by its size, never read (a memory limit proves it)."""
    with open(project / "huge.ctl.yaml", "wb") as handle:
        handle.truncate(64 << 30)
    env = dict(os.environ, XDG_CACHE_HOME=str(project / "cache"))
    env.pop("CTLLINT_NO_CACHE", None)
    code = ("import resource, sys; resource.setrlimit(resource.RLIMIT_AS, (2 << 30, 2 << 30)); "
            "from ctllint.commands.cli import main; sys.exit(main(['check', '--format', 'json', '-j', '1', 'huge.ctl.yaml']))")
    done = subprocess.run([sys.executable, "-c", code], cwd=project, env=env, capture_output=True, text=True, timeout=120)
    assert done.returncode == 1, done.stderr[-2000:]
    [d] = json.loads(done.stdout)["diagnostics"]
    assert d["rule"] == "format" and "above the limit" in d["message"]


def test_a_full_disk_leaves_no_temporary_file(project, capsys, monkeypatch):
    import errno

    import ctllint.checking.run as run

    real_dump = json.dump

    def full(obj, handle, *a, **k):
        handle.write('{"seal": "')  # part of it got out before the disk filled
        raise OSError(errno.ENOSPC, "No space left on device")

    monkeypatch.setattr(run.json, "dump", full)
    assert rules_found(capsys) == (0, [])
    monkeypatch.setattr(run.json, "dump", real_dump)
    assert list((project / "cache").rglob("*.tmp")) == []
    assert entries(project) == []


def test_a_key_file_that_is_a_pipe_turns_the_cache_off_instead_of_blocking(project):
    folder = project / "cache" / "ctllint"
    folder.mkdir(parents=True)
    os.mkfifo(folder / "entry-key")
    env = dict(os.environ, XDG_CACHE_HOME=str(project / "cache"))
    env.pop("CTLLINT_NO_CACHE", None)
    done = subprocess.run([sys.executable, "-m", "ctllint", "check", "--format", "json", "-j", "1", "a.ctl.yaml"],
                          cwd=project, env=env, capture_output=True, text=True, timeout=60)
    assert done.returncode == 0 and json.loads(done.stdout)["diagnostics"] == [], done.stderr
    assert entries(project) == []
