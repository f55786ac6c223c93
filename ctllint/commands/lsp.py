"""``ctllint lsp``: the language server for editors (see ``ctllint.commands.editor.server``)."""
from __future__ import annotations

import argparse

from ctllint.commands.base import UsageError, command

LSP_HELP = """\
Run ctllint as a language server: the Language Server Protocol over
standard input and output, for any editor that speaks it. The editor
starts this command and sends it the schematics (*.ctl.yaml, *.ctl.yml)
it opens; ctllint answers with findings while you type (the same rules,
configuration, suppressions and local plugins as 'ctllint check'), hover
on device tags and on rule names in suppression comments, go to
definition, find references, and code actions that change no circuit
logic.

The configuration is found as 'ctllint check' finds it when run in the
editor's workspace folder (or in the file's folder outside any
workspace), or named with --config. Local plugins it names are run, as
'ctllint check' runs them: open schematics only from repositories whose
configuration you trust.

Needs the 'lsp' extra: python -m pip install 'ctllint[lsp]'.
"""


def _configure_lsp(p: argparse.ArgumentParser) -> None:
    p.description = LSP_HELP
    p.add_argument("--stdio", action="store_true", help="use standard input and output (the default and only transport; accepted because many editors pass it)")
    p.add_argument("--config", metavar="FILE", help="configuration file for every document (default: found by walking up from the workspace folder)")
    p.add_argument("--debounce", type=float, default=None, metavar="SECONDS", help="pause after the last change before checking again (default 0.3)")


def _run_lsp(args: argparse.Namespace) -> int:
    try:
        from ctllint.commands.editor import server as lsp
    except ImportError as exc:
        raise UsageError(f"ctllint lsp needs pygls ({exc}); install it with: python -m pip install 'ctllint[lsp]'") from None
    debounce = lsp.DEFAULT_DEBOUNCE if args.debounce is None else args.debounce
    if not 0 <= debounce <= 60:
        raise UsageError("ctllint: --debounce must be between 0 and 60 seconds")
    lsp.serve(args.config, debounce)
    return 0


command("lsp", "run the language server (LSP over standard input and output) that shows findings in editors as you type")((_configure_lsp, _run_lsp))
