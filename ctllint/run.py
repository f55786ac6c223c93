"""Run a check over many files: discovery, cache, worker processes, merging.

The cache keeps each file's findings under a key made of the file's bytes,
the bytes of every file it ``use``s, ctllint's version, the plugins (their
module files' sizes and times), and the rule settings and limits of the
run. It is never stale after an edit, because any of those changing
changes the key; entries are written atomically, so two runs can share it.
"""
from __future__ import annotations

import hashlib
import json
import os
import stat
import sys
import tempfile
from dataclasses import asdict, dataclass, field

from . import __version__
from .config import Config
from .discover import Target, discover
from .engine import Checker, FileResult
from .host import PluginHost, RuleSettings
from .loader import SCHEMATIC_SUFFIXES, find_repository_root
from .model import Diagnostic, Severity

CACHE_FORMAT = 1


@dataclass
class RunResult:
    diagnostics: list[Diagnostic]
    files: list[str]
    missing: list[str] = field(default_factory=list)
    cached: int = 0


def default_cache_dir() -> str:
    base = os.environ.get("XDG_CACHE_HOME") or os.path.join(os.path.expanduser("~"), ".cache")
    return os.path.join(base, "ctllint")


def _regular_file(path: str) -> bool:
    """Only regular files are opened here: a named pipe would block, /dev/zero never end."""
    try:
        return stat.S_ISREG(os.stat(path).st_mode)
    except (OSError, ValueError):
        return False


def _digest(path: str) -> str | None:
    if not _regular_file(path):
        return None
    try:
        with open(path, "rb") as handle:
            return hashlib.sha256(handle.read()).hexdigest()
    except OSError:
        return None


class ResultCache:
    """Per-file results on disk, keyed by everything that can change them."""

    def __init__(self, folder: str, fingerprint: str):
        self.folder = folder
        self.fingerprint = fingerprint

    @staticmethod
    def fingerprint_of(host: PluginHost, settings: RuleSettings, cfg: Config) -> str:
        parts: list[str] = [f"ctllint {__version__}", f"cache {CACHE_FORMAT}", sys.version]
        for name, plugin in sorted(host.pm.list_name_plugin(), key=lambda p: str(p[0])):
            module_file = getattr(plugin, "__file__", None)
            stamp = ""
            if module_file and os.path.exists(module_file):
                st = os.stat(module_file)
                stamp = f"{st.st_size}:{st.st_mtime_ns}"
            parts.append(f"plugin {name} {module_file} {stamp}")
        parts.append(json.dumps({"enabled": settings.enabled, "sev": {k: int(v) for k, v in sorted(settings.severities.items())},
                                 "options": settings.options, "limit": settings.time_limit}, sort_keys=True, default=str))
        parts.append(json.dumps(asdict(cfg.limits), sort_keys=True))
        parts.append(" ".join(sorted(host.kinds.names())))
        return hashlib.sha256("\n".join(parts).encode()).hexdigest()

    def _entry_path(self, target: Target) -> str:
        key = hashlib.sha256(f"{os.path.abspath(target.path)}\0{target.shown}\0{self.fingerprint}".encode()).hexdigest()
        return os.path.join(self.folder, key[:2], key[2:34] + ".json")

    def get(self, target: Target) -> FileResult | None:
        entry = self._entry_path(target)
        try:
            with open(entry, encoding="utf-8") as handle:
                data = json.load(handle)
        except (OSError, ValueError):
            return None
        if data.get("digest") != _digest(target.path):
            return None
        for used, digest in data.get("used", []):
            if _digest(used) != digest:
                return None
        diags = [Diagnostic(d["path"], d["line"], d["column"], d["rule"], Severity(d["severity"]), d["message"], d.get("subject", "")) for d in data["diagnostics"]]
        return FileResult(target.shown, diags, [u for u, _ in data.get("used", [])], data.get("loaded", True))

    def put(self, target: Target, digest: str | None, result: FileResult) -> None:
        if digest is None or any(d.rule == "plugin-error" for d in result.diagnostics):
            return  # a plugin fault (a time limit, say) may not repeat: do not keep it
        data = {
            "digest": digest,
            "used": [[u, _digest(u)] for u in result.used_files],
            "loaded": result.loaded,
            "diagnostics": [{"path": d.path, "line": d.line, "column": d.column, "rule": d.rule, "severity": int(d.severity), "message": d.message, "subject": d.subject} for d in result.diagnostics],
        }
        entry = self._entry_path(target)
        try:
            os.makedirs(os.path.dirname(entry), exist_ok=True)
            fd, tmp = tempfile.mkstemp(dir=os.path.dirname(entry), suffix=".tmp")
            with os.fdopen(fd, "w", encoding="utf-8") as handle:
                json.dump(data, handle)
            os.replace(tmp, entry)
        except OSError:
            pass  # a cache that cannot be written is only slower


_WORKER: Checker | None = None


def _check_one(target: Target) -> FileResult:
    assert _WORKER is not None
    return _WORKER.check_file(target.path, display_path=target.shown)


def _worker_init(checker: Checker) -> None:
    global _WORKER
    _WORKER = checker


def dependents(device_files: list[str], exclude: list[str], base: str | None) -> list[Target]:
    """Schematics in the repository that ``use`` any of ``device_files``.

    pre-commit passes only the files that changed; when a shared device
    file changes, the schematics built on it must be checked too. Each
    repository is listed and each schematic in it read once, however many
    device files changed (listed in the order of ``device_files``).
    """
    hits: list[list[Target]] = [[] for _ in device_files]
    by_root: dict[str, list[int]] = {}
    for k, device_file in enumerate(device_files):
        by_root.setdefault(find_repository_root(device_file), []).append(k)
    for root, ks in by_root.items():
        names = {os.path.basename(device_files[k]) for k in ks}
        by_real: dict[str, list[int]] = {}
        for k in ks:
            by_real.setdefault(os.path.realpath(device_files[k]), []).append(k)
        candidates, _ = discover([root], exclude, base)
        for t in candidates:
            if not _regular_file(t.path):
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


def run_check(paths: list[str], cfg: Config, host: PluginHost, settings: RuleSettings, jobs: int | None = None, use_cache: bool = True) -> RunResult:
    base = cfg.folder if cfg.path else None
    targets, missing = discover(paths, cfg.exclude, base)
    if missing:
        return RunResult([], [], missing)
    named = {os.path.abspath(p) for p in paths}
    named_files = [t.path for t in targets if os.path.abspath(t.path) in named and os.path.isfile(t.path)]
    device_files = [p for p in named_files if _is_device_file(p)]
    if device_files:
        known = {os.path.abspath(t.path) for t in targets}
        for t in dependents(device_files, cfg.exclude, base):
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
        cache = ResultCache(folder, ResultCache.fingerprint_of(host, settings, cfg))

    results: dict[int, FileResult] = {}
    todo: list[int] = []
    digests: dict[int, str | None] = {}
    for i, t in enumerate(targets):
        hit = cache.get(t) if cache else None
        if hit is not None:
            results[i] = hit
        else:
            todo.append(i)
            if cache:
                digests[i] = _digest(t.path)
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
        with ProcessPoolExecutor(max_workers=min(jobs, len(todo)), mp_context=context, initializer=_worker_init, initargs=(checker,)) as pool:
            chunk = max(1, len(todo) // (jobs * 4))
            for i, result in zip(todo, pool.map(_check_one, [targets[i] for i in todo], chunksize=chunk)):
                results[i] = result
    else:
        for i in todo:
            results[i] = checker.check_file(targets[i].path, display_path=targets[i].shown)
    if cache:
        for i in todo:
            cache.put(targets[i], digests.get(i), results[i])

    diagnostics: set[Diagnostic] = set()
    for r in results.values():
        diagnostics.update(r.diagnostics)
    return RunResult(sorted(diagnostics), [t.shown for t in targets], cached=cached)
