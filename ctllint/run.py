"""Run a check over many files: discovery, the per-file pipeline, merging."""
from __future__ import annotations

from dataclasses import dataclass, field

from .config import Config
from .discover import discover
from .engine import Checker
from .host import PluginHost, RuleSettings
from .model import Diagnostic


@dataclass
class RunResult:
    diagnostics: list[Diagnostic]
    files: list[str]
    missing: list[str] = field(default_factory=list)


def run_check(paths: list[str], cfg: Config, host: PluginHost, settings: RuleSettings, jobs: int | None = None, use_cache: bool = True) -> RunResult:
    targets, missing = discover(paths, cfg.exclude, cfg.folder if cfg.path else None)
    if missing:
        return RunResult([], [], missing)
    checker = Checker(host, settings, cfg.limits)
    diagnostics: set[Diagnostic] = set()
    for t in targets:
        result = checker.check_file(t.path, display_path=t.shown)
        diagnostics.update(result.diagnostics)
    return RunResult(sorted(diagnostics), [t.shown for t in targets])
