"""Check files: load, run rules, apply suppressions, collect diagnostics.

The CLI, the test helpers and the benchmarks all go through ``Checker``,
so they see the same pipeline.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Iterable

from ctllint.checking.core_rules import CORE_RULE_NAMES
from ctllint.checking.host import PluginHost, RuleSettings, plugin_error, run_rules
from ctllint.reading.loader import DeviceFileCache, LoadResult, load_file, load_text
from ctllint.reading.model import Diagnostic, Severity
from ctllint.checking.suppress import MARKER, apply_suppressions
from ctllint.reading.yamlsafe import Limits

BUILTIN_CORE_RULES = set(CORE_RULE_NAMES)


@dataclass
class FileResult:
    path: str
    diagnostics: list[Diagnostic]
    used_files: list[str] = field(default_factory=list)
    loaded: bool = True
    shared: dict[str, Any] = field(default_factory=dict)  # per rule, for its run-wide pass (Rule.combine)
    device_file: bool = False  # a shared device file (only ``devices``), counted apart from schematics


@dataclass
class Checker:
    """Everything that stays the same across the files of one run."""

    host: PluginHost
    settings: RuleSettings
    limits: Limits = field(default_factory=Limits)
    device_cache: DeviceFileCache = field(default_factory=DeviceFileCache)

    @classmethod
    def default(cls, select: Iterable[str] | None = None, options: dict[str, dict[str, Any]] | None = None, host: PluginHost | None = None) -> "Checker":
        host = host or PluginHost.create()
        enabled = list(select) if select is not None else list(host.rules)
        opts = {name: {k: o.default for k, o in rule.options.items()} for name, rule in host.rules.items()}
        for name, given in (options or {}).items():
            opts.setdefault(name, {}).update(given)
        return cls(host, RuleSettings(enabled, {}, opts))

    def check_file(self, path: str, display_path: str | None = None) -> FileResult:
        result = load_file(path, self.host.kinds, self.limits, self.device_cache, display_path=display_path)
        return self._finish(result)

    def check_text(self, text: str, path: str = "t.ctl.yaml") -> FileResult:
        result = load_text(text, path, self.host.kinds, self.limits, self.device_cache)
        return self._finish(result)

    def check_loaded(self, result: LoadResult) -> FileResult:
        """Rules and suppressions on a file already loaded (the language server keeps the model it loaded)."""
        return self._finish(result)

    def _finish(self, result: LoadResult) -> FileResult:
        sch = result.schematic
        if sch is None:
            path = result.diagnostics[0].path if result.diagnostics else "?"
            return FileResult(path, list(result.diagnostics), result.used_files, loaded=False)
        diags = [plugin_error(sch.path, f"plugin {p.plugin}: {p.message}") for p in self.host.problems]
        shared: dict[str, Any] = {}
        if not sch.device_file:
            diags.extend(run_rules(self.host, sch, self.settings, shared))
        known = set(self.host.rules) | BUILTIN_CORE_RULES
        if MARKER in sch.text:  # the file's lines are split only when it holds a suppression
            diags = apply_suppressions(sch.path, sch.text_lines, diags, known)
        diags = [d for d in diags if d.rule in BUILTIN_CORE_RULES or d.rule in self.settings.enabled]
        return FileResult(sch.path, sorted(set(diags)), result.used_files, shared=shared, device_file=sch.device_file)


def worst(diagnostics: Iterable[Diagnostic]) -> Severity | None:
    levels = [d.severity for d in diagnostics]
    return max(levels) if levels else None
