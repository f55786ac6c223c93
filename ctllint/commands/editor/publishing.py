"""The language server's publishing of findings: a check's diagnostics as protocol diagnostics, per file.

A check of one document may give findings for other files (a device defined in a ``use``d file);
each document's published list merges what every open document's check gave for it, and a
closed document's findings are withdrawn. Kept apart from the checking (``documents``) and the
language features, which use its ranges and texts.
"""
from __future__ import annotations

import os

from lsprotocol import types as T
from pygls import uris

from ctllint.commands.editor import editing as E
from ctllint.commands.editor.documents import Analysis, text_lines
from ctllint.reading.loader import read_text
from ctllint.reading.model import Diagnostic, Severity
from ctllint.output.report import SAFETY_NOTE

_SEVERITY = {Severity.ERROR: T.DiagnosticSeverity.Error, Severity.WARNING: T.DiagnosticSeverity.Warning, Severity.INFO: T.DiagnosticSeverity.Information}


class Publishing:
    """Part of ``CtllintServer``: findings published as diagnostics, and positions and texts for the client."""

    def publish_analysis(self, an: Analysis) -> None:
        groups: dict[str, list[T.Diagnostic]] = {an.uri: []}
        texts: dict[str, list[str]] = {an.path: text_lines(an.text)}
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
            return text_lines(doc.source)
        text, _ = read_text(path, self.setup_for(path).limits)
        return text_lines(text or "")

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

    def forget(self, uri: str) -> None:
        old = self.timers.pop(uri, None)
        if old is not None:
            old.cancel()
        self.analyses.pop(uri, None)
        gone = self.published.pop(uri, {})
        for target in gone:
            merged = [d for by_target in self.published.values() for d in by_target.get(target, [])]
            self.text_document_publish_diagnostics(T.PublishDiagnosticsParams(target, merged))
