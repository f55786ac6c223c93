"""Run a check over many files: discovery, cache, worker processes, merging.

The cache keeps each file's findings under a key made of the file's bytes,
the state of every path it ``use``s (the bytes of each used file, and the
paths that were missing or refused, so that creating or fixing one later
counts), ctllint's version, the plugins (the bytes of every file of a
plugin package, not only its top module), and the rule settings and limits
of the run. It is never stale after an edit, because any of those changing
changes the key; entries are written atomically, so two runs can share it.

An entry is trusted only when it is whole, has exactly the shape written
here, and carries the HMAC of the user's own key (``entry-key`` in the
user's cache folder, never in a repository): a corrupt, truncated or forged
entry is a miss, never a crash or hidden findings. Files are hashed only
when regular and within ``limits.max_file_bytes`` (the size is taken
first), and a write that fails (a full disk) leaves no temporary file.
"""
from __future__ import annotations

import hashlib
import hmac
import json
import os
import stat
import sys
import tempfile
from dataclasses import asdict, dataclass, field
from typing import Any, Callable

from ctllint import __version__
from ctllint.checking.config import Config
from ctllint.checking.discover import Target, discover
from ctllint.checking.engine import Checker, FileResult
from ctllint.checking.host import PluginHost, RuleSettings, combine_rules
from ctllint.reading.loader import SCHEMATIC_SUFFIXES, find_repository_root
from ctllint.reading.model import Diagnostic, Severity
from ctllint.reading.safeio import ReadProblem, read_bytes
from ctllint.reading.yamlsafe import Limits

CACHE_FORMAT = 3  # 2: entries keep the data of run-wide rules (Rule.collect); 3: and whether the file is a shared device file


@dataclass
class RunResult:
    diagnostics: list[Diagnostic]
    files: list[str]
    missing: list[str] = field(default_factory=list)
    cached: int = 0
    device_files: int = 0  # how many of ``files`` are shared device files, not schematics


def default_cache_dir() -> str:
    base = os.environ.get("XDG_CACHE_HOME") or os.path.join(os.path.expanduser("~"), ".cache")
    return os.path.join(base, "ctllint")


def _regular_file(path: str) -> bool:
    """Only regular files are opened here: a named pipe would block, /dev/zero never end."""
    try:
        return stat.S_ISREG(os.stat(path).st_mode)
    except (OSError, ValueError):
        return False


def _digest(path: str, max_bytes: int | None = None) -> str | None:
    """SHA-256 of a regular file's bytes, read in blocks; None when it is not one or is above ``max_bytes``
    (the size is taken first: an oversized file is never read to be hashed)."""
    try:
        info = os.stat(path)
    except (OSError, ValueError):
        return None
    if not stat.S_ISREG(info.st_mode) or (max_bytes is not None and info.st_size > max_bytes):
        return None
    h = hashlib.sha256()
    try:
        with open(path, "rb") as handle:
            for block in iter(lambda: handle.read(1 << 20), b""):
                h.update(block)
                if max_bytes is not None and handle.tell() > max_bytes:  # grew while read
                    return None
    except OSError:
        return None
    return h.hexdigest()


def _state(path: str, max_bytes: int | None = None) -> str:
    """What a used path is now, for the cache: where it leads (links followed) and its bytes' digest, or "missing".

    A ``use`` path that was missing, a broken link or a folder is recorded too,
    so that creating or fixing it later makes the entry stale."""
    try:
        real = os.path.realpath(path)
    except (OSError, ValueError):
        return "unreadable"
    if not os.path.lexists(path):
        return "missing"
    return f"{real}\0{_digest(real, max_bytes) or 'not a readable regular file'}"


def _plugin_files(module_file: str) -> list[str]:
    """The files that make up a plugin: a package's every file (its other modules, data), or the one module."""
    if os.path.basename(module_file) != "__init__.py":
        return [module_file]
    folder = os.path.dirname(module_file)
    out = []
    for here, dirs, files in os.walk(folder):
        dirs[:] = sorted(d for d in dirs if d != "__pycache__" and not d.startswith("."))
        out.extend(os.path.join(here, f) for f in sorted(files) if not f.endswith((".pyc", ".pyo")))
        if len(out) > 10_000:  # not a plugin package: a folder holding everything; stop counting
            break
    return out


_ENTRY_KEYS = {"digest", "used", "loaded", "shared", "device_file", "diagnostics", "target", "fingerprint"}
_DIAG_KEYS = {"path": str, "line": int, "column": int, "rule": str, "severity": int, "message": str, "subject": str}


def _valid_entry(data: object) -> bool:
    """Whether a cache entry has exactly the shape ``put`` writes; anything else is a miss."""
    if not isinstance(data, dict) or set(data) != _ENTRY_KEYS or not isinstance(data["loaded"], bool):
        return False
    if not isinstance(data["shared"], dict) or not isinstance(data["device_file"], bool):
        return False  # what run-wide rules collected (Rule.collect), and whether it is a device file
    used = data["used"]
    if not isinstance(used, list) or not all(isinstance(u, list) and len(u) == 2 and all(isinstance(x, str) for x in u) for u in used):
        return False
    diags = data["diagnostics"]
    if not isinstance(diags, list):
        return False
    levels = {int(s) for s in Severity}
    for d in diags:
        if not isinstance(d, dict) or set(d) != set(_DIAG_KEYS):
            return False
        if not all(isinstance(d[k], t) and not isinstance(d[k], bool) for k, t in _DIAG_KEYS.items()):
            return False
        if d["line"] < 1 or d["column"] < 1 or d["severity"] not in levels:
            return False
    return True


def _secret(folder: str) -> bytes | None:
    """The key that signs cache entries, kept in the user's own cache folder (never in a repository).

    A repository can name a cache folder of its own (``cache: FOLDER``) and
    commit entries into it; without this key they are misses, so a forged
    entry cannot hide findings. None (no caching) when it cannot be had."""
    path = os.path.join(folder, "entry-key")
    key = _read_key(path)
    if key is not None:
        return key
    try:
        os.makedirs(folder, exist_ok=True)
        tmp = f"{path}.{os.getpid()}.tmp"
        fd = os.open(tmp, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o600)
        try:
            with os.fdopen(fd, "wb") as handle:
                handle.write(os.urandom(32))
            try:
                os.link(tmp, path)  # the first writer wins; the others read its key
            except FileExistsError:
                pass
        finally:
            os.unlink(tmp)
        return _read_key(path)
    except OSError:
        return None


def _read_key(path: str) -> bytes | None:
    """The 32 bytes of a regular key file (a pipe or device in its place is no key), else None."""
    try:
        fd = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
    except (OSError, ValueError):
        return None
    try:
        info = os.fstat(fd)
        if not stat.S_ISREG(info.st_mode) or info.st_size != 32:
            return None
        key = os.read(fd, 33)
        return key if len(key) == 32 else None
    except OSError:
        return None
    finally:
        os.close(fd)


class ResultCache:
    """Per-file results on disk, keyed by everything that can change them."""

    def __init__(self, folder: str, fingerprint: str, max_bytes: int | None = None, key: bytes | None = None):
        self.folder = folder
        self.fingerprint = fingerprint
        self.max_bytes = max_bytes
        self.key = key if key is not None else _secret(default_cache_dir())

    @staticmethod
    def fingerprint_of(host: PluginHost, settings: RuleSettings, cfg: Config) -> str:
        parts: list[str] = [f"ctllint {__version__}", f"cache {CACHE_FORMAT}", sys.version]
        for name, plugin in sorted(host.pm.list_name_plugin(), key=lambda p: str(p[0])):
            module_file = getattr(plugin, "__file__", None)
            parts.append(f"plugin {name} {module_file}")
            if isinstance(module_file, str) and os.path.exists(module_file):
                # every file of a plugin package, by its bytes: an edit in any of its modules is a new key
                for f in _plugin_files(module_file):
                    parts.append(f"  {f} {_digest(f, 64 << 20) or 'unreadable'}")
        parts.append(json.dumps({"enabled": settings.enabled, "sev": {k: int(v) for k, v in sorted(settings.severities.items())},
                                 "options": settings.options, "limit": settings.time_limit}, sort_keys=True, default=str))
        parts.append(json.dumps(asdict(cfg.limits), sort_keys=True))
        parts.append(" ".join(sorted(host.kinds.names())))
        return hashlib.sha256("\n".join(parts).encode()).hexdigest()

    def _entry_path(self, target: Target) -> str:
        key = hashlib.sha256(f"{os.path.abspath(target.path)}\0{target.shown}\0{self.fingerprint}".encode()).hexdigest()
        return os.path.join(self.folder, key[:2], key[2:34] + ".json")

    def _seal(self, body: str) -> str:
        return hmac.new(self.key or b"", body.encode("utf-8"), hashlib.sha256).hexdigest()

    def get(self, target: Target) -> FileResult | None:
        """The cached result, or None: a missing, unreadable, corrupt, unsigned or mismatched entry is a miss."""
        if self.key is None:
            return None
        entry = self._entry_path(target)
        try:
            info = os.stat(entry)
            if not stat.S_ISREG(info.st_mode) or info.st_size > 64 << 20:
                return None
            with open(entry, encoding="utf-8") as handle:
                sealed = json.load(handle)
            if not isinstance(sealed, dict) or set(sealed) != {"seal", "entry"} or not isinstance(sealed["seal"], str):
                return None
            data = sealed["entry"]
            if not hmac.compare_digest(sealed["seal"], self._seal(json.dumps(data, sort_keys=True))):
                return None
        except (OSError, ValueError, RecursionError, TypeError):
            return None
        if not _valid_entry(data) or data["target"] != os.path.abspath(target.path) or data["fingerprint"] != self.fingerprint:
            return None
        if data["digest"] != _digest(target.path, self.max_bytes):
            return None
        for used, state in data["used"]:
            if _state(used, self.max_bytes) != state:
                return None
        diags = [Diagnostic(d["path"], d["line"], d["column"], d["rule"], Severity(d["severity"]), d["message"], d["subject"]) for d in data["diagnostics"]]
        return FileResult(target.shown, diags, [u for u, _ in data["used"]], data["loaded"], data["shared"], data["device_file"])

    def put(self, target: Target, digest: str | None, result: FileResult) -> None:
        if self.key is None or digest is None or any(d.rule == "plugin-error" for d in result.diagnostics):
            return  # a plugin fault (a time limit, say) may not repeat: do not keep it
        data = {
            "target": os.path.abspath(target.path),
            "fingerprint": self.fingerprint,
            "digest": digest,
            "used": [[u, _state(u, self.max_bytes)] for u in result.used_files],
            "loaded": result.loaded,
            "shared": result.shared,
            "device_file": result.device_file,
            "diagnostics": [{"path": d.path, "line": d.line, "column": d.column, "rule": d.rule, "severity": int(d.severity), "message": d.message, "subject": d.subject} for d in result.diagnostics],
        }
        entry = self._entry_path(target)
        tmp = None
        try:
            sealed = {"seal": self._seal(json.dumps(data, sort_keys=True)), "entry": data}
            os.makedirs(os.path.dirname(entry), exist_ok=True)
            fd, tmp = tempfile.mkstemp(dir=os.path.dirname(entry), suffix=".tmp")
            with os.fdopen(fd, "w", encoding="utf-8") as handle:
                json.dump(sealed, handle)
            os.replace(tmp, entry)
            tmp = None
        except (OSError, ValueError):
            pass  # a cache that cannot be written (a full disk, say) is only slower
        finally:
            if tmp is not None:  # never leave a half-written temporary file behind
                try:
                    os.unlink(tmp)
                except OSError:
                    pass


_WORKER: Checker | None = None


def _check_one(target: Target) -> FileResult:
    assert _WORKER is not None
    return _WORKER.check_file(target.path, display_path=target.shown)


def _worker_init(checker: Checker) -> None:
    global _WORKER
    _WORKER = checker
    import signal

    # The main process turns SIGTERM into an exception so that it can clean up;
    # a worker must simply die of it when the main process stops it.
    signal.signal(signal.SIGTERM, signal.SIG_DFL)
    signal.signal(signal.SIGINT, signal.SIG_IGN)  # Ctrl-C reaches the whole group: the main process decides
    if sys.platform.startswith("linux"):  # and die with the main process, even when it is killed outright
        try:
            import ctypes

            ctypes.CDLL(None, use_errno=True).prctl(1, signal.SIGTERM)  # PR_SET_PDEATHSIG
        except (OSError, AttributeError):
            pass


def _stop_workers(pool) -> None:
    """Stop a pool's worker processes now (an interrupt or SIGTERM): nothing is left running."""
    processes = list((getattr(pool, "_processes", None) or {}).values())
    for proc in processes:
        try:
            proc.terminate()
        except (OSError, ValueError):
            pass
    pool.shutdown(wait=False, cancel_futures=True)
    for proc in processes:
        try:
            proc.join(5)
            if proc.is_alive():
                proc.kill()
                proc.join(5)
        except (OSError, ValueError, AssertionError):
            pass


def _size(path: str) -> int:
    try:
        return os.stat(path).st_size
    except (OSError, ValueError):
        return 0


def _search_root(device_file: str, base: str | None) -> str:
    """Where to look for the schematics that use ``device_file``: its
    repository; outside git, the configuration's folder or the working
    folder when the device file lies below it (a device file's own folder
    would hold no schematic that uses it from above)."""
    root = find_repository_root(device_file)
    if os.path.exists(os.path.join(root, ".git")):
        return root
    real = os.path.realpath(device_file)
    for folder in (base, os.getcwd()):
        if folder and real.startswith(os.path.realpath(folder) + os.sep):
            return folder
    return root


def dependents(device_files: list[str], exclude: list[str], base: str | None, max_bytes: int = Limits().max_file_bytes) -> list[Target]:
    """Schematics in the repository that ``use`` any of ``device_files``.

    pre-commit passes only the files that changed; when a shared device
    file changes, the schematics built on it must be checked too. Each
    repository is listed and each schematic in it read once, however many
    device files changed (listed in the order of ``device_files``).
    """
    hits: list[list[Target]] = [[] for _ in device_files]
    by_root: dict[str, list[int]] = {}
    for k, device_file in enumerate(device_files):
        by_root.setdefault(_search_root(device_file, base), []).append(k)
    for root, ks in by_root.items():
        names = {os.path.basename(device_files[k]) for k in ks}
        by_real: dict[str, list[int]] = {}
        for k in ks:
            by_real.setdefault(os.path.realpath(device_files[k]), []).append(k)
        candidates, _ = discover([root], exclude, base)
        for t in candidates:
            if not _regular_file(t.path) or _size(t.path) > max_bytes:  # as check would refuse it: not read
                continue
            try:
                with open(t.path, encoding="utf-8", errors="replace") as handle:
                    text = handle.read()
            except OSError:
                continue
            if "use" not in text or not any(name in text for name in names):
                continue
            folder = os.path.dirname(t.path)
            for line in text.splitlines():
                if not any(name in line for name in names):
                    continue
                for token in line.replace("[", " ").replace("]", " ").replace(",", " ").replace('"', " ").replace("'", " ").split():
                    if not token.endswith(SCHEMATIC_SUFFIXES):
                        continue
                    for k in by_real.get(os.path.realpath(os.path.join(folder, token)), ()):
                        if os.path.basename(device_files[k]) in line:
                            hits[k].append(t)
    return [t for found in hits for t in found]


def _is_device_file(path: str) -> bool:
    if not _regular_file(path):
        return False
    try:
        with open(path, encoding="utf-8", errors="replace") as handle:
            head = handle.read(200_000)
    except OSError:
        return False
    keys = {line.split(":", 1)[0].strip() for line in head.splitlines() if line and not line[0].isspace() and ":" in line and not line.startswith("#")}
    return "devices" in keys and not keys & {"supplies", "rungs", "use", "expect"}


def run_check(paths: list[str], cfg: Config, host: PluginHost, settings: RuleSettings, jobs: int | None = None, use_cache: bool = True,
              progress: Callable[[int], Any] | None = None) -> RunResult:
    """Check every schematic under ``paths``.

    ``progress``, when given, is called once with the number of files found
    and returns a meter whose ``advance(n)`` is called as n more are done
    (``ctllint.output.progress.Progress``); the caller closes it.
    """
    base = cfg.folder if cfg.path else None
    targets, missing = discover(paths, cfg.exclude, base)
    if missing:
        return RunResult([], [], missing)
    named = {os.path.abspath(p) for p in paths}
    named_files = [t.path for t in targets if os.path.abspath(t.path) in named and os.path.isfile(t.path)]
    device_files = [p for p in named_files if _is_device_file(p)]
    if device_files:
        known = {os.path.abspath(t.path) for t in targets}
        for t in dependents(device_files, cfg.exclude, base, cfg.limits.max_file_bytes):
            if os.path.abspath(t.path) not in known:
                known.add(os.path.abspath(t.path))
                targets.append(t)
        targets.sort(key=lambda t: t.shown)

    checker = Checker(host, settings, cfg.limits)
    cache = None
    if use_cache and cfg.cache is not False and not os.environ.get("CTLLINT_NO_CACHE"):
        folder = cfg.cache if isinstance(cfg.cache, str) else default_cache_dir()
        if isinstance(cfg.cache, str) and not os.path.isabs(folder):
            folder = os.path.join(cfg.folder, folder)
        cache = ResultCache(folder, ResultCache.fingerprint_of(host, settings, cfg), cfg.limits.max_file_bytes)

    results: dict[int, FileResult] = {}
    todo: list[int] = []
    digests: dict[int, str | None] = {}
    meter = progress(len(targets)) if progress else None
    for i, t in enumerate(targets):
        hit = cache.get(t) if cache else None
        if hit is not None:
            results[i] = hit
            if meter:
                meter.advance(1)
        else:
            todo.append(i)
            if cache:
                digests[i] = _digest(t.path, cfg.limits.max_file_bytes)
    cached = len(results)

    jobs = jobs or os.cpu_count() or 1
    parallel = jobs > 1 and len(todo) > 1
    if parallel:
        # Imported only for a parallel run: a one-file check need not pay for them at start-up.
        import multiprocessing
        from concurrent.futures import ProcessPoolExecutor

        parallel = "fork" in multiprocessing.get_all_start_methods()
    if parallel:
        context = multiprocessing.get_context("fork")
        pool = ProcessPoolExecutor(max_workers=min(jobs, len(todo)), mp_context=context, initializer=_worker_init, initargs=(checker,))
        try:
            chunk = max(1, len(todo) // (jobs * 4))
            if meter:  # results come back a chunk at a time: smaller chunks keep the count moving
                chunk = min(chunk, 8)
            for i, result in zip(todo, pool.map(_check_one, [targets[i] for i in todo], chunksize=chunk)):
                results[i] = result
                if meter:
                    meter.advance(1)
        except BaseException:  # SIGTERM, Ctrl-C, a broken pool: the workers must not outlive the run
            _stop_workers(pool)
            raise
        pool.shutdown()
    else:
        for i in todo:
            results[i] = checker.check_file(targets[i].path, display_path=targets[i].shown)
            if meter:
                meter.advance(1)
    if cache:
        for i in todo:
            cache.put(targets[i], digests.get(i), results[i])

    # Run-wide rules: a source device of a shared device file (a control
    # transformer) sums the loads of every schematic that names it. When only
    # some of those schematics are checked (a pre-commit run on one changed
    # file), the others are read for what they add to the sum; their own
    # findings are not reported here (they belong to their own commits), and
    # the run-wide finding stands at the device in the shared file.
    shared = [r.shared for r in results.values() if r.shared]
    shared_files = sorted({f for data in shared for d in data.values() for f in _shared_device_files(d)})
    if shared_files:
        known = {os.path.abspath(t.path) for t in targets}
        for t in dependents(shared_files, cfg.exclude, base):
            if os.path.abspath(t.path) in known:
                continue
            known.add(os.path.abspath(t.path))
            hit = cache.get(t) if cache else None
            extra = hit if hit is not None else checker.check_file(t.path, display_path=t.shown)
            if cache and hit is None:
                cache.put(t, _digest(t.path, cfg.limits.max_file_bytes), extra)
            if extra.shared:
                shared.append(extra.shared)
    diagnostics: set[Diagnostic] = set()
    for r in results.values():
        diagnostics.update(r.diagnostics)
    diagnostics.update(_suppressed(combine_rules(host, settings, shared), host, cfg.limits))
    return RunResult(sorted(diagnostics), [t.shown for t in targets], cached=cached,
                     device_files=sum(1 for r in results.values() if r.device_file))


def _shared_device_files(data) -> list[str]:
    """Device files a run-wide rule's data names (``{"device_files": [...]}``)."""
    files = data.get("device_files") if isinstance(data, dict) else None
    return [f for f in files if isinstance(f, str)] if isinstance(files, list) else []


def _suppressed(diags: list[Diagnostic], host: PluginHost, limits: Limits) -> list[Diagnostic]:
    """Suppression comments apply to run-wide findings as to any other."""
    from ctllint.checking.engine import BUILTIN_CORE_RULES
    from ctllint.checking.suppress import MARKER, apply_suppressions

    out: list[Diagnostic] = []
    by_path: dict[str, list[Diagnostic]] = {}
    for d in diags:
        by_path.setdefault(d.path, []).append(d)
    for path, found in by_path.items():
        try:  # read as check reads a file: a regular file within the size limit
            text = read_bytes(path, limits).decode("utf-8", errors="replace")
        except ReadProblem:
            text = ""
        if MARKER in text:
            found = apply_suppressions(path, text.splitlines(), found, set(host.rules) | BUILTIN_CORE_RULES)
        out.extend(found)
    return out
