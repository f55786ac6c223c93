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
import sys

from lsprotocol import types as T
from pygls.lsp.server import LanguageServer
from pygls.workspace.position_codec import PositionCodec

from ctllint import __version__
from ctllint.commands.editor.actions import CodeActions
from ctllint.commands.editor.documents import Analysis, Configurations, DocumentChecks, Setup
from ctllint.commands.editor.navigation import Navigation
from ctllint.commands.editor.publishing import Publishing

DEFAULT_DEBOUNCE = 0.3  # seconds after the last change before a document is checked again


class CtllintServer(Configurations, DocumentChecks, Publishing, Navigation, CodeActions, LanguageServer):
    """The server: its state here, its parts in the classes it is made of (one module each, by what they do)."""

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
