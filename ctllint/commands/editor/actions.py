"""The language server's code actions: edits that change no circuit logic.

A suppression comment for a finding, a device's ``contacts`` entry written out, and quoting a
value whose comma or colon broke the mapping; each edit is tried by loading the edited text
before it is offered. Kept apart from the reading features (``navigation``).
"""
from __future__ import annotations

import os

from lsprotocol import types as T

from ctllint.commands.editor import editing as E
from ctllint.commands.editor.documents import Analysis, text_lines
from ctllint.checking.host import PluginHost
from ctllint.reading.loader import load_text
from ctllint.reading.model import Diagnostic


class CodeActions:
    """Part of ``CtllintServer``: the code actions offered on a range of a document."""

    def code_actions(self, params: T.CodeActionParams) -> list[T.CodeAction] | None:
        uri = params.text_document.uri
        an = self.analyses.get(uri)
        doc = self.workspace.get_text_document(uri)
        if an is None or an.version != doc.version or an.text != doc.source:
            # Editors ask for code actions on every keystroke and cursor move: a
            # pending change is not checked early for them (the pause holds); they
            # ask again once the new findings are published.
            return None
        lines = text_lines(an.text)
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
