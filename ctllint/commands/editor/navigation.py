"""The language server's reading features: hover, go to definition and find references.

They answer from the latest check of a document (``documents.Analysis``), with the
protocol-free work in ``editing``; kept apart from the code actions, which change the text.
"""
from __future__ import annotations

import os
import re

from lsprotocol import types as T
from pygls import uris

from ctllint.commands.editor import editing as E
from ctllint.commands.editor.documents import Analysis, text_lines
from ctllint.output.report import SAFETY_NOTE


class Navigation:
    """Part of ``CtllintServer``: hover, definition and references."""

    def position(self, uri: str, pos: T.Position) -> tuple[Analysis, list[str], int, int] | None:
        an = self.current(uri)
        if an is None:
            return None
        lines = text_lines(an.text)
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
