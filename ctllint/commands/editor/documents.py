"""The language server's documents: the configuration each one is checked with, and its check.

Each open schematic is checked as ``ctllint check`` would check the file, from the editor's
text: ``Setup`` is what a configuration file gives (found as the CLI finds it, kept while the
file is unchanged), ``Analysis`` the latest check of one document. Kept apart from how findings
are published and from the language features, which only read an ``Analysis``.
"""
from __future__ import annotations

import asyncio
import gc
import os
import time
import traceback
from dataclasses import dataclass, field
from typing import Any

from lsprotocol import types as T
from pygls import uris

from ctllint.checking.config import ConfigError, find_config, load_config
from ctllint.checking.discover import excluded
from ctllint.checking.engine import Checker
from ctllint.checking.host import PluginHost
from ctllint.reading.loader import SCHEMATIC_SUFFIXES, LoadResult, format_error, load_text
from ctllint.reading.model import Diagnostic, Severity


@dataclass
class Setup:
    """What a configuration file gives: the plugin host and a checker (or the error that stopped it)."""

    key: tuple
    cfg: Any = None
    host: PluginHost | None = None
    checker: Checker | None = None
    error: str | None = None
    error_path: str | None = None
    error_line: int = 1

    @property
    def limits(self):
        from ctllint.reading.yamlsafe import Limits

        return self.cfg.limits if self.cfg is not None else Limits()


@dataclass
class Analysis:
    """The latest check of one open document."""

    uri: str
    path: str
    version: int | None
    text: str
    loaded: LoadResult | None = None
    diagnostics: list[Diagnostic] = field(default_factory=list)
    setup: Setup | None = None
    used_files: list[str] = field(default_factory=list)
    quotes: dict[int, list] = field(default_factory=dict)  # line -> quoting actions (each tried by loading the file)

    @property
    def schematic(self):
        return self.loaded.schematic if self.loaded is not None else None


def text_lines(text: str) -> list[str]:
    """A document's text as lines, as every part of the server counts them."""
    return text.splitlines()


class Configurations:
    """Part of ``CtllintServer``: the configuration file a document is checked with, and what it gives."""

    def _roots(self) -> list[str]:
        out = []
        try:
            for folder in self.workspace.folders.values():
                path = uris.to_fs_path(folder.uri)
                if path:
                    out.append(os.path.abspath(path))
        except Exception:  # noqa: BLE001 - no workspace yet
            pass
        root = getattr(self.workspace, "root_path", None)
        if root:
            out.append(os.path.abspath(root))
        return out

    def folder_for(self, path: str) -> str:
        """Where ``ctllint check`` would be run for this file: its workspace folder, else the file's own folder."""
        best = None
        for root in self._roots():
            if os.path.commonpath([root, path]) == root and (best is None or len(root) > len(best)):
                best = root
        return best or os.path.dirname(path)

    def setup_for(self, path: str) -> Setup:
        cfg_path = self.config_path or find_config(self.folder_for(path))
        try:
            stamp = os.stat(cfg_path).st_mtime_ns if cfg_path else 0
        except OSError:
            stamp = -1
        key = (cfg_path, stamp)
        hit = self.setups.get(key)
        if hit is not None:
            return hit
        setup = Setup(key)
        try:
            if self.config_path and not os.path.isfile(self.config_path):
                raise ConfigError(self.config_path, 1, "configuration file does not exist")
            cfg = load_config(cfg_path)
            host = PluginHost.create(local_plugins=cfg.plugins)
            from ctllint.commands.base import UsageError, settings_for

            try:
                settings = settings_for(cfg, host, None, [])
            except UsageError as exc:
                raise ConfigError(cfg_path or "configuration", 1, str(exc).removeprefix("ctllint: ")) from None
            setup.cfg, setup.host, setup.checker = cfg, host, Checker(host, settings, cfg.limits)
        except ConfigError as exc:
            setup.error, setup.error_path, setup.error_line = f"configuration error: {exc.message}", exc.path, exc.line
        self.setups = {k: v for k, v in self.setups.items() if k[0] != cfg_path}
        self.setups[key] = setup
        return setup


class DocumentChecks:
    """Part of ``CtllintServer``: which documents are checked, when, and the check itself."""

    def wanted(self, uri: str) -> str | None:
        """The file path of a document ctllint checks (a schematic by its name), or None."""
        path = uris.to_fs_path(uri) if uri.startswith("file:") else None
        if not path or not path.endswith(SCHEMATIC_SUFFIXES):
            return None
        return os.path.abspath(path)

    def schedule(self, uri: str, delay: float) -> None:
        old = self.timers.pop(uri, None)
        if old is not None:
            old.cancel()
        loop = asyncio.get_running_loop()
        self.timers[uri] = loop.call_later(delay, self.run_check, uri)

    def run_check(self, uri: str) -> None:
        self.timers.pop(uri, None)
        collecting = gc.isenabled()
        gc.disable()  # as in the CLI: a check makes almost no cycles, and the collector would rescan its growing heap
        try:
            self.analyse(uri)
        except Exception as exc:  # noqa: BLE001 - one document's trouble must not stop the server
            self.window_log_message(T.LogMessageParams(T.MessageType.Error, f"ctllint: checking {uri} failed:\n{traceback.format_exc()}"))
            self.publish(uri, {uri: [T.Diagnostic(T.Range(T.Position(0, 0), T.Position(0, 1)), f"ctllint could not check this file: {type(exc).__name__}: {exc}",
                                                  severity=T.DiagnosticSeverity.Error, source="ctllint", code="internal-error")]})
        finally:
            if collecting:
                gc.enable()

    def current(self, uri: str) -> Analysis | None:
        """The analysis of the document's text as it is now (checked at once when a change is pending)."""
        doc = self.workspace.get_text_document(uri)
        have = self.analyses.get(uri)
        if have is not None and have.version == doc.version and have.text == doc.source:
            return have
        if self.wanted(uri) is None:
            return None
        old = self.timers.pop(uri, None)
        if old is not None:
            old.cancel()
        self.run_check(uri)
        return self.analyses.get(uri)

    def analyse(self, uri: str) -> Analysis | None:
        path = self.wanted(uri)
        if path is None:
            return None
        started = time.perf_counter()
        doc = self.workspace.get_text_document(uri)
        text = doc.source
        self.analyses.pop(uri, None)  # let the old model go before the new one is built
        an = Analysis(uri, path, doc.version, text)
        setup = an.setup = self.setup_for(path)
        if setup.error is not None:
            an.diagnostics = [Diagnostic(path, 1, 1, "config", Severity.ERROR, f"{setup.error} ({setup.error_path}:{setup.error_line}); fix it to have this file checked")]
        elif excluded(path, setup.cfg.exclude, setup.cfg.folder if setup.cfg.path else None):
            an.diagnostics = []
        else:
            limits = setup.cfg.limits
            problem = None
            if len(text.encode("utf-8", "surrogatepass")) > limits.max_file_bytes:
                problem = format_error(path, 1, 1, f"file is above the limit of {limits.max_file_bytes / 1e6:.1f} MB (limits.max_file_bytes)")
            elif "\x00" in text:
                i = text.index("\x00")
                problem = format_error(path, text.count("\n", 0, i) + 1, 1, "file holds a NUL character; schematics are text")
            if problem is not None:
                an.loaded = LoadResult(None, [problem])
                an.diagnostics = [problem]
            else:
                an.loaded = load_text(text, path, setup.host.kinds, limits, setup.checker.device_cache, real_path=path)
                result = setup.checker.check_loaded(an.loaded)
                an.diagnostics, an.used_files = result.diagnostics, list(result.used_files)
        self.analyses[uri] = an
        self.publish_analysis(an)
        self.window_log_message(T.LogMessageParams(T.MessageType.Log, f"ctllint: checked {path} (version {an.version}) in {time.perf_counter() - started:.3f} s: {len(an.diagnostics)} finding(s)"))
        return an

    def dependents(self, path: str) -> list[str]:
        real = os.path.realpath(path)
        return [u for u, an in self.analyses.items() if real in an.used_files and u in self.workspace.text_documents]
