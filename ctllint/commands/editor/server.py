"""The language server: ``ctllint lsp``, the Language Server Protocol over standard input and output.

Built on pygls (imported only by ``ctllint lsp``). Each open ``*.ctl.yaml``
/ ``*.ctl.yml`` document is checked as ``ctllint check`` would check the file
(the configuration found the same way, the same local plugins, rules,
suppressions and limits), from the editor's text rather than the disk:
at once when opened, and a short pause (``--debounce``) after the last
change. Findings are published as ranges on the element they point at;
a finding about a device defined in a ``use``d file is published on that
file. On top of the findings: hover (device tags, rule names in
suppression comments), go to definition, find references and a few code
actions that change no circuit logic.

Checks run on the server's main thread, between messages, so that the
per-file time limit of the plugin host works as in the CLI (it needs
SIGALRM in the main thread). A plugin that fails is a ``plugin-error``
finding; anything else that goes wrong while checking one document is
reported on that document and in the client's log, and the server goes on.
"""
from __future__ import annotations

import asyncio
import gc
import os
import re
import sys
import time
import traceback
from dataclasses import dataclass, field
from typing import Any

from lsprotocol import types as T
from pygls import uris
from pygls.lsp.server import LanguageServer
from pygls.workspace.position_codec import PositionCodec

from ctllint import __version__
from ctllint.commands.editor import editing as E
from ctllint.checking.config import ConfigError, find_config, load_config
from ctllint.checking.discover import excluded
from ctllint.checking.engine import Checker
from ctllint.checking.host import PluginHost
from ctllint.reading.loader import SCHEMATIC_SUFFIXES, LoadResult, format_error, load_text, read_text
from ctllint.reading.model import Diagnostic, Severity
from ctllint.output.report import SAFETY_NOTE

DEFAULT_DEBOUNCE = 0.3  # seconds after the last change before a document is checked again

_SEVERITY = {Severity.ERROR: T.DiagnosticSeverity.Error, Severity.WARNING: T.DiagnosticSeverity.Warning, Severity.INFO: T.DiagnosticSeverity.Information}


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


def _lines(text: str) -> list[str]:
    return text.splitlines()


class CtllintServer(LanguageServer):
    def __init__(self, config: str | None = None, debounce: float = DEFAULT_DEBOUNCE):
        super().__init__("ctllint", __version__, text_document_sync_kind=T.TextDocumentSyncKind.Incremental)
        self.config_path = os.path.abspath(config) if config else None
        self.debounce = debounce
        self.analyses: dict[str, Analysis] = {}
        self.setups: dict[tuple, Setup] = {}
        self.timers: dict[str, asyncio.TimerHandle] = {}
        # published[source uri][target uri]: diagnostics a check of source gave for target
        self.published: dict[str, dict[str, list[T.Diagnostic]]] = {}
        self.safety_shown = False

    @property
    def codec(self) -> PositionCodec:
        """Positions in the units agreed with the client at initialisation (UTF-16 unless it offered another)."""
        return self.workspace.position_codec

    # -- configuration ---------------------------------------------------------------
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
            from ctllint.commands.cli import UsageError, settings_for

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

    # -- checking ----------------------------------------------------------------------
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

    def publish_analysis(self, an: Analysis) -> None:
        groups: dict[str, list[T.Diagnostic]] = {an.uri: []}
        texts: dict[str, list[str]] = {an.path: _lines(an.text)}
        for d in an.diagnostics:
            target = os.path.abspath(d.path)
            uri = an.uri if target == an.path else uris.from_fs_path(target)
            if target not in texts:
                texts[target] = self.text_of(uri, target)
            groups.setdefault(uri, []).append(self.lsp_diagnostic(d, texts[target], an.path))
        self.publish(an.uri, groups, an.version)
        if an.diagnostics and not self.safety_shown:
            self.safety_shown = True
            self.window_show_message(T.ShowMessageParams(T.MessageType.Info, SAFETY_NOTE))

    def text_of(self, uri: str, path: str) -> list[str]:
        doc = self.workspace.text_documents.get(uri)
        if doc is not None:
            return _lines(doc.source)
        text, _ = read_text(path, self.setup_for(path).limits)
        return _lines(text or "")

    def lsp_range(self, lines: list[str], span: E.Span) -> T.Range:
        ln, a, b = span
        return self.codec.range_to_client_units(lines, T.Range(T.Position(ln, a), T.Position(ln, b)))

    def lsp_diagnostic(self, d: Diagnostic, lines: list[str], checked: str) -> T.Diagnostic:
        message = d.message
        if os.path.abspath(d.path) != checked:
            message += f" (found checking {os.path.basename(checked)})"
        return T.Diagnostic(self.lsp_range(lines, E.span_of(lines, d.line, d.column)), message,
                            severity=_SEVERITY.get(d.severity, T.DiagnosticSeverity.Error), code=d.rule, source="ctllint")

    def publish(self, source: str, groups: dict[str, list[T.Diagnostic]], version: int | None = None) -> None:
        before = self.published.get(source, {})
        self.published[source] = {u: ds for u, ds in groups.items() if ds or u == source}
        for uri in sorted(set(before) | set(groups), key=lambda u: (u == source, u)):  # the checked document last
            merged: list[T.Diagnostic] = []
            for src, by_target in self.published.items():
                merged.extend(by_target.get(uri, []))
            if not merged and uri not in groups and uri not in before:
                continue
            self.text_document_publish_diagnostics(T.PublishDiagnosticsParams(uri, merged, version if uri == source else None))

    def dependents(self, path: str) -> list[str]:
        real = os.path.realpath(path)
        return [u for u, an in self.analyses.items() if real in an.used_files and u in self.workspace.text_documents]

    def forget(self, uri: str) -> None:
        old = self.timers.pop(uri, None)
        if old is not None:
            old.cancel()
        self.analyses.pop(uri, None)
        gone = self.published.pop(uri, {})
        for target in gone:
            merged = [d for by_target in self.published.values() for d in by_target.get(target, [])]
            self.text_document_publish_diagnostics(T.PublishDiagnosticsParams(target, merged))

    # -- features ----------------------------------------------------------------------
    def position(self, uri: str, pos: T.Position) -> tuple[Analysis, list[str], int, int] | None:
        an = self.current(uri)
        if an is None:
            return None
        lines = _lines(an.text)
        p = self.codec.position_from_client_units(lines, pos) if lines else None
        if p is None or p.line >= len(lines):
            return None
        return an, lines, p.line, p.character

    def shown(self, path: str) -> str:
        roots = self._roots()
        return E.display(path, roots[0] if roots else None)

    def location(self, path: str, line: int, column: int, name: str | None = None) -> T.Location:
        """Where ``path``:``line``:``column`` is; on ``name`` itself when it is written inside the value there (a list of tags)."""
        target = os.path.abspath(path)
        uri = uris.from_fs_path(target)
        lines = self.text_of(uri, target)
        span = E.span_of(lines, line, column)
        if name is not None and 0 <= span[0] < len(lines):
            text = lines[span[0]]
            if text[span[1]:span[2]] != name:
                m = re.compile(rf"(?<![^\s,\[\]{{}}'\"]){re.escape(name)}(?![^\s,\[\]{{}}'\"#])").search(text, span[1], span[2])
                if m:
                    span = (span[0], m.start(), m.end())
        return T.Location(uri, self.lsp_range(lines, span))

    def hover(self, params: T.HoverParams) -> T.Hover | None:
        got = self.position(params.text_document.uri, params.position)
        if got is None:
            return None
        an, lines, ln, col = got
        text = lines[ln]
        host = an.setup.host if an.setup else None
        name = E.rule_at(text, col)
        if name is not None and host is not None:
            body = E.rule_hover(name, host.rules)
            if body:
                a, b = E.word_at(text, col, E.RULE_WORD)
                return T.Hover(T.MarkupContent(T.MarkupKind.Markdown, body), self.lsp_range(lines, (ln, a, b)))
        sch = an.schematic
        if sch is None or host is None:
            return None
        target = E.target_at(sch, ln, col, text)
        if target is None or target.tag is None or target.tag not in sch.devices:
            return None
        coil_kinds = {k.name for k in host.kinds.kinds.values() if k.coil}
        summaries = {n: r.summary for n, r in host.rules.items()} | E.CORE_RULE_SUMMARIES
        body = E.device_hover(sch, an.diagnostics, target.tag, coil_kinds, summaries, self.shown)
        if "Findings:" in body:
            body += f"\n\n_{SAFETY_NOTE}_"
        return T.Hover(T.MarkupContent(T.MarkupKind.Markdown, body), self.lsp_range(lines, target.span))

    def definition(self, params: T.DefinitionParams) -> list[T.Location] | None:
        got = self.position(params.text_document.uri, params.position)
        if got is None or got[0].schematic is None:
            return None
        an, lines, ln, col = got
        used = E.use_entry_at(lines[ln], col)
        if used is not None:  # a `use` entry: the used file itself
            real = os.path.realpath(os.path.join(os.path.dirname(an.path), used))
            if real in an.used_files:
                return [T.Location(uris.from_fs_path(os.path.normpath(os.path.join(os.path.dirname(an.path), used))), T.Range(T.Position(0, 0), T.Position(0, 0)))]
        target = E.target_at(an.schematic, ln, col, lines[ln])
        if target is None or target.tag is None:
            return None
        dev = an.schematic.devices.get(target.tag)
        if dev is None:
            return None
        return [self.location(dev.loc.path, dev.loc.line, dev.loc.column)]

    def references(self, params: T.ReferenceParams) -> list[T.Location] | None:
        got = self.position(params.text_document.uri, params.position)
        if got is None or got[0].schematic is None:
            return None
        an, lines, ln, col = got
        target = E.target_at(an.schematic, ln, col, lines[ln])
        if target is None:
            return None
        include = params.context.include_declaration if params.context else True
        found = set(E.references(an.schematic, target, include))
        dev = an.schematic.devices.get(target.tag) if target.tag is not None else None
        if dev is not None:  # a device of a used file: its uses in the other open schematics that use that file too
            home = os.path.abspath(dev.loc.path)
            for other in list(self.analyses.values()):
                sch = other.schematic
                if other is an or sch is None:
                    continue
                theirs = sch.devices.get(target.tag)
                if theirs is not None and os.path.abspath(theirs.loc.path) == home:
                    found.update(E.references(sch, target, include))
        name = target.tag if target.tag is not None else target.wire
        return [self.location(p, l, c, name) for p, l, c in sorted(found)]

    def code_actions(self, params: T.CodeActionParams) -> list[T.CodeAction] | None:
        uri = params.text_document.uri
        an = self.analyses.get(uri)
        doc = self.workspace.get_text_document(uri)
        if an is None or an.version != doc.version or an.text != doc.source:
            # Editors ask for code actions on every keystroke and cursor move: a
            # pending change is not checked early for them (the pause holds); they
            # ask again once the new findings are published.
            return None
        lines = _lines(an.text)
        rng = self.codec.range_from_client_units(lines, params.range) if lines else None
        if rng is None:
            return None
        first, last = rng.start.line + 1, rng.end.line + 1
        actions: list[E.Action] = []
        mine = [d for d in an.diagnostics if os.path.abspath(d.path) == an.path and first <= d.line <= last]
        for d in mine:
            act = E.suppression_action(lines, d)
            if act is not None:
                actions.append(act)
        host = an.setup.host if an.setup else None
        sch = an.schematic
        if sch is not None and host is not None:
            for tag, dev in sch.devices.items():
                if dev.loc.path == sch.path and first <= dev.loc.line <= last:
                    act = E.contacts_action(sch, host.kinds, lines, tag, self._verify_entry(host))
                    if act is not None:
                        actions.append(act)
        if host is not None:
            actions.extend(self._quote_actions(an, lines, host, [d for d in mine if d.rule == "format"]))
        out = []
        newline = "\r\n" if "\r\n" in an.text else "\n"
        for act in actions:
            edits = [T.TextEdit(self.lsp_range(lines, (e.line, e.start, e.end)), e.text.replace("\n", newline)) for e in act.edits]
            diags = [self.lsp_diagnostic(d, lines, an.path) for d in act.diagnostics]
            kind = T.CodeActionKind.QuickFix if act.diagnostics else T.CodeActionKind.RefactorRewrite  # no finding: offered as a refactoring
            out.append(T.CodeAction(act.title, kind=kind, diagnostics=diags or None,
                                    edit=T.WorkspaceEdit(changes={uri: edits})))
        return out

    def _verify_entry(self, host: PluginHost):
        def verify(block: list[str], tag: str, expected) -> bool:
            indent = min(len(s) - len(s.lstrip()) for s in block if s.strip())
            body = "\n".join("  " + s[indent:] for s in block)
            result = load_text(f"ctllint: 1\ndevices:\n{body}\n", "entry.ctl.yaml", host.kinds)
            sch = result.schematic
            if sch is None or result.diagnostics:
                return False
            dev = sch.devices.get(tag)
            return dev is not None and dev.get("contacts") == expected
        return verify

    def _quote_actions(self, an: Analysis, lines: list[str], host: PluginHost, format_diags: list[Diagnostic]) -> list[E.Action]:
        keys = E.free_text_keys(host.kinds)
        out: list[E.Action] = []
        done: set[int] = set()
        before = an.loaded.diagnostics if an.loaded is not None else []
        for d in format_diags:
            ln = d.line - 1
            if ln in done or not 0 <= ln < len(lines):
                continue
            done.add(ln)
            if ln in an.quotes:  # editors ask again on every cursor move: each candidate costs a load of the file
                out.extend(an.quotes[ln])
                continue
            found = len(out)
            for start, end, quoted in E.quote_candidates(lines[ln], keys):
                edited = list(lines)
                edited[ln] = lines[ln][:start] + quoted + lines[ln][end:]
                text = "\n".join(edited) + ("\n" if an.text.endswith("\n") else "")
                result = load_text(text, an.path, host.kinds, an.setup.cfg.limits, None, real_path=an.path)
                left = [x for x in result.diagnostics if os.path.abspath(x.path) == an.path and x.line == d.line]
                if not left and len(result.diagnostics) < len(before):
                    out.append(E.Action(f"Quote the text {quoted} (a comma or colon in it broke the mapping)",
                                        [E.Edit(ln, start, end, quoted)], [x for x in format_diags if x.line == d.line]))
                    break
            an.quotes[ln] = out[found:]
        return out


def build(config: str | None = None, debounce: float = DEFAULT_DEBOUNCE) -> CtllintServer:
    server = CtllintServer(config, debounce)

    @server.feature(T.TEXT_DOCUMENT_DID_OPEN)
    def did_open(ls: CtllintServer, params: T.DidOpenTextDocumentParams) -> None:
        if ls.wanted(params.text_document.uri):
            ls.schedule(params.text_document.uri, 0)

    @server.feature(T.TEXT_DOCUMENT_DID_CHANGE)
    def did_change(ls: CtllintServer, params: T.DidChangeTextDocumentParams) -> None:
        if ls.wanted(params.text_document.uri):
            ls.schedule(params.text_document.uri, ls.debounce)

    @server.feature(T.TEXT_DOCUMENT_DID_SAVE)
    def did_save(ls: CtllintServer, params: T.DidSaveTextDocumentParams) -> None:
        path = ls.wanted(params.text_document.uri)
        if path:  # schematics that use this file read it from the disk: check them again
            for uri in ls.dependents(path):
                if uri != params.text_document.uri:
                    ls.schedule(uri, 0)

    @server.feature(T.TEXT_DOCUMENT_DID_CLOSE)
    def did_close(ls: CtllintServer, params: T.DidCloseTextDocumentParams) -> None:
        ls.forget(params.text_document.uri)

    @server.feature(T.TEXT_DOCUMENT_HOVER)
    def hover(ls: CtllintServer, params: T.HoverParams):
        return ls.hover(params)

    @server.feature(T.TEXT_DOCUMENT_DEFINITION)
    def definition(ls: CtllintServer, params: T.DefinitionParams):
        return ls.definition(params)

    @server.feature(T.TEXT_DOCUMENT_REFERENCES)
    def references(ls: CtllintServer, params: T.ReferenceParams):
        return ls.references(params)

    @server.feature(T.TEXT_DOCUMENT_CODE_ACTION, T.CodeActionOptions(code_action_kinds=[T.CodeActionKind.QuickFix, T.CodeActionKind.RefactorRewrite]))
    def code_action(ls: CtllintServer, params: T.CodeActionParams):
        return ls.code_actions(params)

    return server


def serve(config: str | None = None, debounce: float = DEFAULT_DEBOUNCE) -> int:
    """Run the server on standard input and output until the client says exit."""
    # The protocol owns the process's real standard input and output. A plugin
    # that prints (or reads) would corrupt the stream: file descriptors 0 and 1
    # are pointed at /dev/null and standard error, and sys.stdout with them.
    proto_in = os.fdopen(os.dup(0), "rb")
    proto_out = os.fdopen(os.dup(1), "wb")
    null = os.open(os.devnull, os.O_RDONLY)
    os.dup2(null, 0)
    os.close(null)
    os.dup2(2, 1)
    sys.stdout = sys.stderr
    sys.stdin = open(os.devnull, encoding="utf-8")
    # The console entry pauses the cycle collector for a short-lived process;
    # a server lives long, so it collects between checks (paused during each).
    gc.enable()
    server = build(config, debounce)
    server.start_io(proto_in, proto_out)
    return 0
