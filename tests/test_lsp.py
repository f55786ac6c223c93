"""``ctllint lsp`` end to end: a real LSP client (pytest-lsp) talking to the server process over stdio.

The reference for every finding is ``ctllint check --format json`` run on
the same file (a separate process, the CLI's own path through discovery,
configuration and the cache-less run); positions, devices and wires are
found in the file's text by the test itself.
"""
from __future__ import annotations

import asyncio
import json
import os
import re
import subprocess
import sys
import textwrap

import pytest
import pytest_lsp
from lsprotocol import types as T
from pygls import uris
from pygls.protocol import default_converter
from pytest_lsp import ClientServerConfig, LanguageClient
from pytest_lsp.client import DEFAULT_CLIENT_FEATURES, register_lsp_features



ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
DEMO = os.path.join(ROOT, "fixtures", "demo")
WAIT = 120.0  # seconds: generous, the machine is shared; this is not a timing test


def make_client() -> LanguageClient:
    """pytest-lsp's client, also keeping every publishDiagnostics in order (to see the debounce)."""
    client = LanguageClient(converter_factory=default_converter)
    features = dict(DEFAULT_CLIENT_FEATURES)

    def publish(client: LanguageClient, params: T.PublishDiagnosticsParams):
        client.diagnostics[params.uri] = params.diagnostics
        client.published.append(params)

    features[T.TEXT_DOCUMENT_PUBLISH_DIAGNOSTICS] = publish
    register_lsp_features(client, features)
    client.published = []
    return client


SERVER = [sys.executable, "-m", "ctllint", "lsp", "--debounce", "0.2"]


@pytest.fixture
def project(tmp_path):
    """A small repository of schematics, with its configuration."""
    (tmp_path / ".git").mkdir()  # the repository root for `use`
    (tmp_path / ".ctllint.yaml").write_text("cache: false\n", encoding="utf-8")
    return tmp_path


@pytest_lsp.fixture(config=ClientServerConfig(server_command=SERVER, client_factory=make_client))
async def client(lsp_client: LanguageClient, project):
    await lsp_client.initialize_session(T.InitializeParams(capabilities=T.ClientCapabilities(), root_uri=uris.from_fs_path(str(project)),
                                                           workspace_folders=[T.WorkspaceFolder(uris.from_fs_path(str(project)), "project")]))
    lsp_client.project = project
    yield
    await lsp_client.shutdown_session()


# -- helpers ---------------------------------------------------------------------------

def cli_findings(path: str, cwd: str) -> list[dict]:
    report = os.path.join(cwd, "cli-report.json.tmp")  # -o: a plugin's prints on standard output stay out of the report
    out = subprocess.run([sys.executable, "-m", "ctllint", "check", "--format", "json", "--no-cache", "-j", "1", "-o", report, path],
                         capture_output=True, text=True, cwd=cwd, env=dict(os.environ, CTLLINT_NO_CACHE="1"))
    assert out.returncode in (0, 1), out.stderr
    with open(report, encoding="utf-8") as handle:
        data = json.load(handle)["diagnostics"]
    os.unlink(report)
    return data


def open_doc(client: LanguageClient, path: str, text: str | None = None, version: int = 1) -> str:
    uri = uris.from_fs_path(path)
    if text is None:
        with open(path, encoding="utf-8") as handle:
            text = handle.read()
    client.text_document_did_open(T.DidOpenTextDocumentParams(T.TextDocumentItem(uri, "yaml", version, text)))
    return uri


def change_doc(client: LanguageClient, uri: str, text: str, version: int) -> None:
    client.text_document_did_change(T.DidChangeTextDocumentParams(T.VersionedTextDocumentIdentifier(version, uri),
                                                                  [T.TextDocumentContentChangeWholeDocument(text)]))


async def published(client: LanguageClient, uri: str, version: int | None = None, after: int = 0) -> T.PublishDiagnosticsParams:
    """The first publishDiagnostics for ``uri`` (of ``version`` when given) received after the ``after``-th one."""
    loop = asyncio.get_running_loop()
    end = loop.time() + WAIT
    while loop.time() < end:
        for p in client.published[after:]:
            if p.uri == uri and (version is None or p.version == version):
                return p
        await asyncio.sleep(0.02)
    raise AssertionError(f"no diagnostics for {uri} (version {version}) within {WAIT} s; got {[(p.uri, p.version) for p in client.published]}")


def text_at(text: str, rng: T.Range) -> str:
    """The text a range covers (ASCII files: UTF-16 units are characters)."""
    lines = text.splitlines()
    assert rng.start.line == rng.end.line
    return lines[rng.start.line][rng.start.character:rng.end.character]


def line_of(text: str, pattern: str) -> tuple[int, int]:
    """0-based line and column of the first match of ``pattern``."""
    for i, line in enumerate(text.splitlines()):
        m = re.search(pattern, line)
        if m:
            return i, m.start()
    raise AssertionError(f"{pattern!r} not in the text")


def apply_edits(text: str, edits: list[T.TextEdit]) -> str:
    lines = text.split("\n")
    for e in sorted(edits, key=lambda e: (e.range.start.line, e.range.start.character), reverse=True):
        s, t = e.range.start, e.range.end
        assert s.line == t.line
        lines[s.line] = lines[s.line][:s.character] + e.new_text + lines[s.line][t.character:]
    return "\n".join(lines)


def same(lsp: list[T.Diagnostic], cli: list[dict]) -> None:
    """The server's findings for a file are the CLI's: rule, line, column, severity, message."""
    sev = {"error": T.DiagnosticSeverity.Error, "warning": T.DiagnosticSeverity.Warning, "info": T.DiagnosticSeverity.Information}
    got = sorted((d.code, d.range.start.line + 1, d.range.start.character + 1, d.severity, d.message) for d in lsp)
    want = sorted((c["rule"], c["line"], c["column"], sev[c["severity"]], c["message"]) for c in cli)
    assert got == want


TOUR = textwrap.dedent("""\
    ctllint: 1                          # format version
    title: Cider press, grinder motor
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      PB1: {kind: pushbutton, function: stop}
      PB2: {kind: pushbutton, function: start}
      M1:  {kind: starter, coil: 120 VAC, overload: OL1, feeds: MTR1, inrush: 200 VA, sealed: 25 VA}
      OL1: {kind: overload, setting: 38 A}
      MTR1: {kind: motor, power: 30 hp, voltage: 460 V, phases: 3, fla: 38 A, service_factor: 1.15}
    rungs:
      - title: Grinder motor
        paths:
          - [L1, PB1.NC, 2, PB2.NO, 3, M1.coil, 4, OL1.NC, X2]
          - [2, M1.NO, 3]               # seal-in around the start button
    """)  # the README's tour example, which gives no findings


# -- diagnostics -----------------------------------------------------------------------

@pytest.mark.asyncio
async def test_demo_findings_are_the_clis_as_ranges_on_their_elements(client: LanguageClient):
    for name in sorted(os.listdir(DEMO)):
        if not name.endswith(".ctl.yaml"):
            continue
        path = os.path.join(DEMO, name)
        uri = open_doc(client, path)
        got = await published(client, uri, 1)
        same(got.diagnostics, cli_findings(path, ROOT))
    fan = os.path.join(DEMO, "dryer-fan.ctl.yaml")
    with open(fan, encoding="utf-8") as handle:
        text = handle.read()
    diags = {d.code: d for d in client.diagnostics[uris.from_fs_path(fan)]}
    # The demo marks each mistake; each range covers exactly the element or value at fault.
    assert text_at(text, diags["stop-normally-closed"].range) == "PB1.NO"
    assert text_at(text, diags["overload-setting"].range) == "25 A"
    assert text_at(text, diags["seal-in"].range) == "PB6.NO"
    assert text_at(text, diags["overload-in-coil-path"].range) == "M2.coil"
    assert text_at(text, diags["switch-fan-out"].range) == "SS1.open"
    # The usual caution goes with findings, once per session.
    assert any("qualified person" in m.message for m in client.messages)


@pytest.mark.asyncio
async def test_change_is_checked_once_after_the_pause(client: LanguageClient):
    path = str(client.project / "press.ctl.yaml")
    (client.project / "press.ctl.yaml").write_text(TOUR, encoding="utf-8")
    uri = open_doc(client, path, TOUR)
    first = await published(client, uri, 1)
    assert list(first.diagnostics) == [] and cli_findings(path, str(client.project)) == []
    mark = len(client.published)
    broken = TOUR.replace("PB1.NC", "PB1.NO")
    for version in (2, 3, 4):  # typing: three changes inside the pause
        change_doc(client, uri, broken if version == 4 else TOUR.replace("PB1.NC", "PB1.N" + "C" * version), version)
    got = await published(client, uri, 4, after=mark)
    (client.project / "press.ctl.yaml").write_text(broken, encoding="utf-8")
    same(got.diagnostics, cli_findings(path, str(client.project)))
    assert "stop-normally-closed" in {d.code for d in got.diagnostics}
    assert [p.version for p in client.published[mark:] if p.uri == uri] == [4]  # versions 2 and 3 never checked


@pytest.mark.asyncio
async def test_used_file_findings_are_published_on_the_used_file(client: LanguageClient):
    project = client.project
    (project / "library").mkdir()
    shared = project / "library" / "motors.ctl.yaml"
    shared.write_text(textwrap.dedent("""\
        ctllint: 1
        devices:
          OL1: {kind: overload, setting: 30 A}
          MTR1: {kind: motor, power: 15 hp, voltage: 460 V, phases: 3, fla: 19.5 A, service_factor: 1.15}
        """), encoding="utf-8")
    text = TOUR.replace("ctllint: 1                          # format version\n", "ctllint: 1\nuse: [library/motors.ctl.yaml]\n")
    text = "\n".join(line for line in text.splitlines() if not line.lstrip().startswith(("OL1:", "MTR1:"))) + "\n"
    path = project / "fan.ctl.yaml"
    path.write_text(text, encoding="utf-8")
    cli = cli_findings(str(path), str(project))
    in_shared = [c for c in cli if c["path"].endswith("motors.ctl.yaml")]
    assert in_shared, cli  # the CLI puts a finding on the used file: the case is real
    uri = open_doc(client, str(path), text)
    shared_uri = uris.from_fs_path(str(shared))
    await published(client, uri, 1)
    got = (await published(client, shared_uri)).diagnostics
    assert sorted((d.code, d.range.start.line + 1, d.range.start.character + 1) for d in got) == \
        sorted((c["rule"], c["line"], c["column"]) for c in in_shared)
    assert text_at(shared.read_text(encoding="utf-8"), got[0].range) == "30 A"
    same(client.diagnostics[uri], [c for c in cli if c not in in_shared])
    # Closing the schematic takes its findings off the used file.
    client.text_document_did_close(T.DidCloseTextDocumentParams(T.TextDocumentIdentifier(uri)))
    mark = len(client.published)
    await published(client, shared_uri, after=mark - 2)
    loop = asyncio.get_running_loop()
    end = loop.time() + WAIT
    while client.diagnostics.get(shared_uri) and loop.time() < end:
        await asyncio.sleep(0.02)
    assert list(client.diagnostics.get(shared_uri)) == []


@pytest.mark.asyncio
async def test_format_errors_shown_at_their_values(client: LanguageClient):
    text = TOUR.replace("setting: 38 A", "setting: 44 amps").replace("voltage: 120 VAC}", "voltage: 120}")
    path = client.project / "bad.ctl.yaml"
    path.write_text(text, encoding="utf-8")
    uri = open_doc(client, str(path), text)
    got = await published(client, uri, 1)
    cli = cli_findings(str(path), str(client.project))
    assert {c["rule"] for c in cli} == {"format"} and len(cli) == 2
    same(got.diagnostics, cli)
    assert sorted(text_at(text, d.range) for d in got.diagnostics) == ["120", "44 amps"]


@pytest.mark.asyncio
async def test_configuration_and_suppressions_as_in_check(client: LanguageClient):
    project = client.project
    (project / ".ctllint.yaml").write_text("cache: false\nignore: [switch-fan-out]\n", encoding="utf-8")
    (project / "library").mkdir()
    with open(os.path.join(DEMO, "library", "shared-devices.ctl.yaml"), encoding="utf-8") as handle:
        (project / "library" / "shared-devices.ctl.yaml").write_text(handle.read(), encoding="utf-8")
    with open(os.path.join(DEMO, "dryer-fan.ctl.yaml"), encoding="utf-8") as handle:
        text = handle.read()
    text = text.replace("# expect: seal-in", "# ctllint-allow: seal-in -- metering roll is jogged by hand (test)")
    path = project / "dryer-fan.ctl.yaml"
    path.write_text(text, encoding="utf-8")
    uri = open_doc(client, str(path), text)
    got = await published(client, uri, 1)
    cli = cli_findings(str(path), str(project))
    same(got.diagnostics, cli)
    rules = {d.code for d in got.diagnostics}
    assert "switch-fan-out" not in rules and "seal-in" not in rules and "stop-normally-closed" in rules


@pytest.mark.asyncio
async def test_crashing_local_plugin_is_reported_and_the_server_goes_on(client: LanguageClient):
    project = client.project
    (project / "noisy_rules.py").write_text(textwrap.dedent("""\
        import os, sys
        from ctllint import hookimpl
        from ctllint.api import Example, Rule
        from ctllint.reading.model import Severity

        print("noise on standard output at import")   # must not reach the protocol stream
        os.write(1, b"Content-Length: 5\\r\\n\\r\\nnoise")

        def crash(ctx):
            print("noise while checking")
            os.write(1, b"more noise")
            return 1 / 0

        def leave(ctx):
            sys.exit(3)

        def rule(name, check):
            return Rule(name=name, severity=Severity.ERROR, summary="crashes on purpose", doc="test", source="test", check=check,
                        failing=Example("x", "x"), passing=Example("y", "y"))

        @hookimpl
        def ctllint_rules():
            return [rule("site-crash", crash), rule("site-exit", leave)]
        """), encoding="utf-8")
    (project / "broken_import.py").write_text("raise RuntimeError('this plugin does not import')\n", encoding="utf-8")
    (project / ".ctllint.yaml").write_text("cache: false\nplugins: [noisy_rules.py, broken_import.py]\n", encoding="utf-8")
    text = TOUR.replace("PB1.NC", "PB1.NO")
    path = project / "press.ctl.yaml"
    path.write_text(text, encoding="utf-8")
    uri = open_doc(client, str(path), text)
    got = await published(client, uri, 1)
    cli = cli_findings(str(path), str(project))
    assert sum(c["rule"] == "plugin-error" for c in cli) == 3  # the import, the raise, the exit
    same(got.diagnostics, cli)
    assert "stop-normally-closed" in {d.code for d in got.diagnostics}  # the other rules still ran
    # still serving: a hover, then a change checked again
    line, col = line_of(text, r"M1\.coil")
    hover = await client.text_document_hover_async(T.HoverParams(T.TextDocumentIdentifier(uri), T.Position(line, col)))
    assert hover is not None and "starter" in hover.contents.value
    mark = len(client.published)
    change_doc(client, uri, TOUR, 2)
    again = await published(client, uri, 2, after=mark)
    assert {d.code for d in again.diagnostics} == {"plugin-error"}


@pytest.mark.asyncio
async def test_configuration_error_is_shown_not_fatal(client: LanguageClient):
    (client.project / ".ctllint.yaml").write_text("cache: false\nselect: [no-such-rule]\n", encoding="utf-8")
    path = client.project / "press.ctl.yaml"
    path.write_text(TOUR, encoding="utf-8")
    uri = open_doc(client, str(path), TOUR)
    got = await published(client, uri, 1)
    assert [d.code for d in got.diagnostics] == ["config"]
    assert "no-such-rule" in got.diagnostics[0].message
    out = subprocess.run([sys.executable, "-m", "ctllint", "check", str(path)], capture_output=True, text=True, cwd=str(client.project))
    assert out.returncode == 2 and "no-such-rule" in out.stderr  # the CLI refuses the same configuration
    (client.project / ".ctllint.yaml").write_text("cache: false\n", encoding="utf-8")
    mark = len(client.published)
    change_doc(client, uri, TOUR + "\n", 2)
    again = await published(client, uri, 2, after=mark)
    assert list(again.diagnostics) == []


# -- hover, definition, references ---------------------------------------------------------

@pytest.mark.asyncio
async def test_hover_on_device_and_on_suppressed_rule(client: LanguageClient):
    fan = os.path.join(DEMO, "dryer-fan.ctl.yaml")
    with open(fan, encoding="utf-8") as handle:
        text = handle.read()
    text = text.replace("# expect: seal-in", "# ctllint-allow: seal-in -- test")
    uri = open_doc(client, fan, text)
    await published(client, uri, 1)
    # M1 in a path: kind, fields, the cross-reference as `ctllint xref` prints it
    line, col = line_of(text, r"M1\.coil")
    hover = await client.text_document_hover_async(T.HoverParams(T.TextDocumentIdentifier(uri), T.Position(line, col + 1)))
    body = hover.contents.value
    xref = subprocess.run([sys.executable, "-m", "ctllint", "xref", fan], capture_output=True, text=True, cwd=ROOT).stdout
    row = next(r for r in xref.splitlines() if r.startswith("M1 "))
    cells = re.split(r"\s{2,}", row.strip())  # COIL KIND COIL-RUNG NO NC AVAILABLE [STATUS]
    assert body.startswith("**M1**: starter")
    assert f"coil: rung {cells[2]}" in body and f"NO contacts used: {cells[3]}" in body and f"NC contacts used: {cells[4]}" in body
    assert "- `overload`: OL1" in body and "- `feeds`: MTR1" in body
    assert text_at(text, hover.range) == "M1"
    # PB1: its finding is listed, with the caution
    line, col = line_of(text, r"PB1\.NO")
    hover = await client.text_document_hover_async(T.HoverParams(T.TextDocumentIdentifier(uri), T.Position(line, col)))
    assert "`stop-normally-closed`" in hover.contents.value and "qualified person" in hover.contents.value
    # a rule name in a suppression comment: the summary `ctllint rules` gives
    rules = json.loads(subprocess.run([sys.executable, "-m", "ctllint", "rules", "--format", "json"], capture_output=True, text=True, cwd=ROOT).stdout)
    summary = next(r["summary"] for r in rules if r["rule"] == "seal-in")
    line, col = line_of(text, r"allow: seal-in")
    hover = await client.text_document_hover_async(T.HoverParams(T.TextDocumentIdentifier(uri), T.Position(line, col + len("allow: ") + 2)))
    assert summary in hover.contents.value
    assert text_at(text, hover.range) == "seal-in"
    # nothing to say on a wire number
    line, col = line_of(text, r"\[3, M1\.NO")
    assert await client.text_document_hover_async(T.HoverParams(T.TextDocumentIdentifier(uri), T.Position(line, col + 1))) is None


@pytest.mark.asyncio
async def test_definition_across_use_and_references(client: LanguageClient):
    fan = os.path.join(DEMO, "dryer-fan.ctl.yaml")
    shared = os.path.join(DEMO, "library", "shared-devices.ctl.yaml")
    with open(fan, encoding="utf-8") as handle:
        text = handle.read()
    with open(shared, encoding="utf-8") as handle:
        shared_text = handle.read()
    uri = open_doc(client, fan)
    await published(client, uri, 1)
    doc = T.TextDocumentIdentifier(uri)
    # FU3 in a path: defined in the used file
    line, col = line_of(text, r"\bFU3\b")
    got = await client.text_document_definition_async(T.DefinitionParams(doc, T.Position(line, col + 1)))
    want_line, want_col = line_of(shared_text, r"^\s*FU3:")
    assert len(got) == 1 and got[0].uri == uris.from_fs_path(shared)
    assert got[0].range.start.line == want_line and text_at(shared_text, got[0].range) == "FU3"
    # CR1.NC: the part points at the device's entry in this file
    line, col = line_of(text, r"CR1\.NC")
    got = await client.text_document_definition_async(T.DefinitionParams(doc, T.Position(line, col + 5)))
    want_line, _ = line_of(text, r"^\s*CR1:")
    assert got[0].uri == uri and got[0].range.start.line == want_line and text_at(text, got[0].range) == "CR1"
    # references of CR1: its entry, and each CR1.PART in the paths
    refs = await client.text_document_references_async(T.ReferenceParams(T.ReferenceContext(True), doc, T.Position(line, col)))
    want = {(i, m.start()) for i, l in enumerate(text.splitlines()) for m in re.finditer(r"\bCR1\b", l.split("#")[0])}
    assert {(r.range.start.line, r.range.start.character) for r in refs} == want and len(want) == 3
    refs = await client.text_document_references_async(T.ReferenceParams(T.ReferenceContext(False), doc, T.Position(line, col)))
    assert len(refs) == 2
    # references of wire 4: every place a path names it
    line, col = line_of(text, r"PB2\.NO, 4")
    col += len("PB2.NO, ")
    refs = await client.text_document_references_async(T.ReferenceParams(T.ReferenceContext(True), doc, T.Position(line, col)))
    want = set()
    for i, l in enumerate(text.splitlines()):
        m = re.search(r"- \[(.*)\]", l)
        if m:
            start = m.start(1)
            for item in re.finditer(r"[^,\s]+", m.group(1)):
                if item.group() == "4":
                    want.add((i, start + item.start()))
    assert {(r.range.start.line, r.range.start.character) for r in refs} == want and len(want) == 2
    # and for a rail: the supply's field and every path end
    line, col = line_of(text, r"\bX2\]")
    refs = await client.text_document_references_async(T.ReferenceParams(T.ReferenceContext(True), doc, T.Position(line, col)))
    assert len(refs) == text.count("X2") - sum(l.split("#", 1)[1].count("X2") for l in text.splitlines() if "#" in l)


# -- code actions ---------------------------------------------------------------------------

async def actions_at(client: LanguageClient, uri: str, line: int) -> list[T.CodeAction]:
    rng = T.Range(T.Position(line, 0), T.Position(line, 0))
    diags = [d for d in client.diagnostics.get(uri, []) if d.range.start.line == line]
    return await client.text_document_code_action_async(T.CodeActionParams(T.TextDocumentIdentifier(uri), rng, T.CodeActionContext(diags))) or []


@pytest.mark.asyncio
async def test_suppression_action_needs_the_engineers_reason(client: LanguageClient):
    fan = os.path.join(DEMO, "dryer-fan.ctl.yaml")
    with open(fan, encoding="utf-8") as handle:
        text = handle.read()
    uri = open_doc(client, fan, text)
    await published(client, uri, 1)
    line, _ = line_of(text, r"PB6\.NO")
    actions = await actions_at(client, uri, line)
    allow = [a for a in actions if "seal-in" in a.title]
    assert len(allow) == 1
    # no action rewires anything: every edit on this line only adds a comment at its end
    for a in actions:
        for e in a.edit.changes[uri]:
            assert e.range.start.character >= len(text.splitlines()[e.range.start.line].rstrip()) and e.new_text.lstrip().startswith("#")
    edited = apply_edits(text, allow[0].edit.changes[uri])
    assert edited.splitlines()[line].endswith("# expect: seal-in  # ctllint-allow: seal-in -- ")
    mark = len(client.published)
    change_doc(client, uri, edited, 2)
    got = await published(client, uri, 2, after=mark)
    codes = [d.code for d in got.diagnostics if d.range.start.line == line]
    assert "seal-in" in codes and "suppression" in codes  # no reason yet: nothing suppressed
    reasoned = edited.replace("seal-in -- ", "seal-in -- roll is run by hand only (test)")
    change_doc(client, uri, reasoned, 3)
    got = await published(client, uri, 3, after=mark)
    assert [d.code for d in got.diagnostics if d.range.start.line == line] == []


RELAYS = textwrap.dedent("""\
    ctllint: 1
    supplies:
      ctl: {hot: L1, common: X2, voltage: 120 VAC}
    devices:
      PB1: {kind: pushbutton, function: stop}
      PB2: {kind: pushbutton, function: start}
      CR1: {kind: relay, coil: 120 VAC}
      CR2:
        kind: relay
        coil: 120 VAC
      LT1: {kind: pilot-light, voltage: 120 VAC}
      LT2: {kind: pilot-light, voltage: 120 VAC}
      LT3: {kind: pilot-light, voltage: 120 VAC}
    rungs:
      - {title: Run relay, paths: [[L1, PB1.NC, 2, PB2.NO, 3, CR1.coil, X2], [2, CR1.NO, 3]]}
      - title: Lights
        paths:
          - [L1, CR1.NO, 4, LT1, X2]
          - [L1, CR1.NC, 5, LT2, X2]
          - [L1, CR1.NO, 6, CR2.coil, X2]
          - [L1, CR2.NC, 7, LT3, X2]
    """)


@pytest.mark.asyncio
async def test_contacts_action_declares_what_the_rungs_use(client: LanguageClient):
    path = client.project / "relays.ctl.yaml"
    path.write_text(RELAYS, encoding="utf-8")
    uri = open_doc(client, str(path), RELAYS)
    await published(client, uri, 1)
    for tag, no, nc in (("CR1", 3, 1), ("CR2", 0, 1)):  # counted by hand from RELAYS
        line, _ = line_of(RELAYS, rf"^\s*{tag}:")
        actions = [a for a in await actions_at(client, uri, line) if "contacts" in a.title]
        assert len(actions) == 1, actions
        edited = apply_edits(RELAYS, actions[0].edit.changes[uri])
        path.write_text(edited, encoding="utf-8")
        xref = subprocess.run([sys.executable, "-m", "ctllint", "xref", str(path)], capture_output=True, text=True, cwd=str(client.project))
        assert xref.returncode == 0, xref.stderr
        row = next(r for r in xref.stdout.splitlines() if r.startswith(tag + " "))
        assert f"{no} NO, {nc} NC" in row and row.rstrip().endswith("ok")
        assert [c for c in cli_findings(str(path), str(client.project)) if c["rule"] == "format"] == []
        path.write_text(RELAYS, encoding="utf-8")
    # the stop button: its one NC contact
    line, _ = line_of(RELAYS, r"^\s*PB1:")
    actions = [a for a in await actions_at(client, uri, line) if "contacts" in a.title]
    assert len(actions) == 1 and "contacts: {NO: 0, NC: 1}" in apply_edits(RELAYS, actions[0].edit.changes[uri]).splitlines()[line]
    # a pilot light has no contacts, and a device that declares them is left alone
    line, _ = line_of(RELAYS, r"^\s*LT1:")
    assert [a for a in await actions_at(client, uri, line) if "contacts" in a.title] == []
    declared = RELAYS.replace("CR1: {kind: relay, coil: 120 VAC}", "CR1: {kind: relay, coil: 120 VAC, contacts: {NO: 4, NC: 1}}")
    mark = len(client.published)
    change_doc(client, uri, declared, 2)
    await published(client, uri, 2, after=mark)
    line, _ = line_of(declared, r"^\s*CR1:")
    assert [a for a in await actions_at(client, uri, line) if "contacts" in a.title] == []


@pytest.mark.asyncio
async def test_quote_action_repairs_a_flow_mapping(client: LanguageClient):
    text = RELAYS.replace("{title: Run relay,", "{title: Run relay, hand/auto: panel door,")
    path = client.project / "relays.ctl.yaml"
    path.write_text(text, encoding="utf-8")
    uri = open_doc(client, str(path), text)
    got = await published(client, uri, 1)
    assert "format" in {d.code for d in got.diagnostics}
    line, _ = line_of(text, r"title: Run relay")
    actions = [a for a in await actions_at(client, uri, line) if a.title.startswith("Quote")]
    assert len(actions) == 1
    edited = apply_edits(text, actions[0].edit.changes[uri])
    assert '{title: "Run relay, hand/auto: panel door", paths:' in edited
    path.write_text(edited, encoding="utf-8")
    assert [c for c in cli_findings(str(path), str(client.project)) if c["rule"] == "format"] == []
    # a colon in a switch's free-text setpoint
    bad = RELAYS.replace("LT3: {kind: pilot-light, voltage: 120 VAC}", "LT3: {kind: pilot-light, voltage: 120 VAC}\n  LS1: {kind: limit-switch, setpoint: opens at: 20 mm}")
    mark = len(client.published)
    change_doc(client, uri, bad, 2)
    got = await published(client, uri, 2, after=mark)
    line, _ = line_of(bad, r"LS1:")
    assert "format" in {d.code for d in got.diagnostics if d.range.start.line == line}
    actions = [a for a in await actions_at(client, uri, line) if a.title.startswith("Quote")]
    assert len(actions) == 1
    assert 'setpoint: "opens at: 20 mm"}' in apply_edits(bad, actions[0].edit.changes[uri])


# -- the command ---------------------------------------------------------------------------------

def test_check_does_not_import_the_language_server():
    code = ("import sys\nfrom ctllint.commands.cli import main\nmain(['check', '--no-cache', '-j', '1', sys.argv[1]])\n"
            "print(sorted(m for m in sys.modules if m.split('.')[0] in ('pygls', 'lsprotocol', 'cattrs') or m in ('ctllint.commands.editor.server', 'ctllint.commands.editor.editing')))")
    out = subprocess.run([sys.executable, "-c", code, os.path.join(DEMO, "dryer-burner.ctl.yaml")], capture_output=True, text=True, cwd=ROOT)
    assert out.stdout.strip().splitlines()[-1] == "[]"


def test_lsp_without_pygls_says_how_to_install():
    code = "import sys\nsys.modules['pygls'] = None\nfrom ctllint.commands.cli import main\nsys.exit(main(['lsp']))"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, cwd=ROOT, stdin=subprocess.DEVNULL)
    assert out.returncode == 2 and "ctllint[lsp]" in out.stderr


@pytest.mark.asyncio
async def test_definition_of_a_use_entry_opens_the_used_file(client: LanguageClient):
    fan = os.path.join(DEMO, "dryer-fan.ctl.yaml")
    with open(fan, encoding="utf-8") as handle:
        text = handle.read()
    uri = open_doc(client, fan, text)
    await published(client, uri, 1)
    line, col = line_of(text, r"library/shared-devices")
    got = await client.text_document_definition_async(T.DefinitionParams(T.TextDocumentIdentifier(uri), T.Position(line, col + 3)))
    assert [g.uri for g in got] == [uris.from_fs_path(os.path.join(DEMO, "library", "shared-devices.ctl.yaml"))]


@pytest.mark.asyncio
async def test_excluded_files_get_no_findings_as_in_check(client: LanguageClient):
    project = client.project
    (project / ".ctllint.yaml").write_text('cache: false\nexclude: ["legacy/**"]\n', encoding="utf-8")
    (project / "legacy").mkdir()
    broken = TOUR.replace("PB1.NC", "PB1.NO")
    (project / "legacy" / "old.ctl.yaml").write_text(broken, encoding="utf-8")
    (project / "new.ctl.yaml").write_text(broken, encoding="utf-8")
    out = subprocess.run([sys.executable, "-m", "ctllint", "check", "--no-cache"], capture_output=True, text=True, cwd=str(project))
    assert "new.ctl.yaml" in out.stdout and "old.ctl.yaml" not in out.stdout  # the CLI, run in the workspace folder
    old = open_doc(client, str(project / "legacy" / "old.ctl.yaml"), broken)
    new = open_doc(client, str(project / "new.ctl.yaml"), broken)
    assert list((await published(client, old, 1)).diagnostics) == []
    assert "stop-normally-closed" in {d.code for d in (await published(client, new, 1)).diagnostics}


@pytest.mark.asyncio
async def test_ranges_count_utf16_units(client: LanguageClient):
    # Two characters outside the Basic Multilingual Plane before the bad value: each is two UTF-16 units (LSP's default).
    text = TOUR.replace("OL1: {kind: overload, setting: 38 A}", 'OL1: {kind: overload, technology: "\U0001F600\U0001F600", setting: 38 A}')
    path = client.project / "wide.ctl.yaml"
    path.write_text(text, encoding="utf-8")
    uri = open_doc(client, str(path), text)
    got = await published(client, uri, 1)
    cli = cli_findings(str(path), str(client.project))
    assert [c["rule"] for c in cli] == ["format"]
    line = text.splitlines()[cli[0]["line"] - 1]
    start = cli[0]["column"] - 1  # the CLI counts characters
    value = '"\U0001F600\U0001F600"'
    assert line[start:start + len(value)] == value
    (d,) = got.diagnostics
    assert d.range.start.line == cli[0]["line"] - 1
    assert d.range.start.character == len(line[:start].encode("utf-16-le")) // 2
    assert d.range.end.character == len(line[:start + len(value)].encode("utf-16-le")) // 2


@pytest.mark.asyncio
async def test_runaway_plugin_is_stopped_by_the_time_limit(client: LanguageClient):
    # Checks run on the server's main thread, where the host's SIGALRM limit works as in the CLI.
    project = client.project
    (project / "slow_rules.py").write_text(textwrap.dedent("""\
        from ctllint import hookimpl
        from ctllint.api import Example, Rule
        from ctllint.reading.model import Severity

        def forever(ctx):
            while True:
                pass

        @hookimpl
        def ctllint_rules():
            return [Rule(name="site-forever", severity=Severity.ERROR, summary="never ends", doc="test", source="test",
                         check=forever, failing=Example("x", "x"), passing=Example("y", "y"))]
        """), encoding="utf-8")
    (project / ".ctllint.yaml").write_text("cache: false\nplugins: [slow_rules.py]\nlimits: {plugin_seconds: 1}\n", encoding="utf-8")
    text = TOUR.replace("PB1.NC", "PB1.NO")
    path = project / "press.ctl.yaml"
    path.write_text(text, encoding="utf-8")
    uri = open_doc(client, str(path), text)
    got = await published(client, uri, 1)
    codes = [d.code for d in got.diagnostics]
    assert "plugin-error" in codes and "stop-normally-closed" in codes
    assert any("site-forever" in d.message for d in got.diagnostics if d.code == "plugin-error")
    line, col = line_of(text, r"M1\.coil")
    hover = await client.text_document_hover_async(T.HoverParams(T.TextDocumentIdentifier(uri), T.Position(line, col)))
    assert hover is not None


# -- token ranges (the protocol-free part), worked by hand --------------------------------------

@pytest.mark.parametrize("line, token", [
    ("      - [L1, PB1.NC, 2, PB2.NO, 3]", "PB1.NC"),
    ("      - [L1, PB1.NC, 2, PB2.NO, 3]", "3"),
    ("  OL1: {kind: overload, setting: 44 amps}   # note", "44 amps"),
    ("  OL1:", "OL1"),
    ("title: Dryer fan, east side   # a comment", "Dryer fan, east side"),   # block context: the comma belongs to the text
    ('  note: "say \\"stop\\", then wait"  # x', '"say \\"stop\\", then wait"'),
    ("  note: 'it''s here', other", "'it''s here'"),
    ("  fuses: [FU1, FU2]", "[FU1, FU2]"),
    ("    setting: 30 A", "30 A"),
])
def test_token_ranges(line, token):
    from ctllint.commands.editor.editing import token_end

    col = line.rindex(token)
    assert line[col:token_end(line, col)] == token


@pytest.mark.asyncio
async def test_references_of_a_shared_device_reach_the_open_schematics_that_use_it(client: LanguageClient):
    shared = os.path.join(DEMO, "library", "shared-devices.ctl.yaml")
    users = [os.path.join(DEMO, n) for n in ("dryer-fan.ctl.yaml", "grain-leg.ctl.yaml")]
    texts = {}
    for path in [shared, *users]:
        with open(path, encoding="utf-8") as handle:
            texts[path] = handle.read()
        await published(client, open_doc(client, path, texts[path]), 1)
    line, col = line_of(texts[shared], r"^\s*FU3:")
    col = texts[shared].splitlines()[line].index("FU3")
    refs = await client.text_document_references_async(T.ReferenceParams(T.ReferenceContext(True), T.TextDocumentIdentifier(uris.from_fs_path(shared)), T.Position(line, col)))
    want = {(uris.from_fs_path(p), i, m.start()) for p, t in texts.items() for i, l in enumerate(t.splitlines())
            for m in re.finditer(r"\bFU3\b", l.split("#")[0])}
    assert {(r.uri, r.range.start.line, r.range.start.character) for r in refs} == want
    assert len({u for u, _, _ in want}) == 3  # the used file and both schematics


@pytest_lsp.fixture(config=ClientServerConfig(server_command=SERVER, client_factory=make_client))
async def client32(lsp_client: LanguageClient, project):
    """A client that counts positions in code points (UTF-32) only."""
    caps = T.ClientCapabilities(general=T.GeneralClientCapabilities(position_encodings=[T.PositionEncodingKind.Utf32]))
    result = await lsp_client.initialize_session(T.InitializeParams(capabilities=caps, root_uri=uris.from_fs_path(str(project))))
    lsp_client.project = project
    lsp_client.encoding = result.capabilities.position_encoding
    yield
    await lsp_client.shutdown_session()


@pytest.mark.asyncio
async def test_ranges_in_the_encoding_agreed(client32: LanguageClient):
    client = client32
    assert client.encoding == T.PositionEncodingKind.Utf32
    text = TOUR.replace("OL1: {kind: overload, setting: 38 A}", 'OL1: {kind: overload, technology: "\U0001F600\U0001F600", setting: 38 A}')
    path = client.project / "wide.ctl.yaml"
    path.write_text(text, encoding="utf-8")
    uri = open_doc(client, str(path), text)
    (d,) = (await published(client, uri, 1)).diagnostics
    line = text.splitlines()[d.range.start.line]
    assert line[d.range.start.character:d.range.end.character] == '"\U0001F600\U0001F600"'  # code points: Python's own indexes


@pytest.mark.asyncio
async def test_saving_a_used_file_checks_its_users_again(client: LanguageClient):
    project = client.project
    (project / "library").mkdir()
    shared = project / "library" / "motors.ctl.yaml"
    too_high = "ctllint: 1\ndevices:\n  OL1: {kind: overload, setting: 30 A}\n  MTR1: {kind: motor, power: 15 hp, voltage: 460 V, phases: 3, fla: 19.5 A, service_factor: 1.15}\n"
    shared.write_text(too_high, encoding="utf-8")
    text = TOUR.replace("ctllint: 1                          # format version\n", "ctllint: 1\nuse: [library/motors.ctl.yaml]\n")
    text = "\n".join(line for line in text.splitlines() if not line.lstrip().startswith(("OL1:", "MTR1:"))) + "\n"
    path = project / "fan.ctl.yaml"
    path.write_text(text, encoding="utf-8")
    shared_uri = uris.from_fs_path(str(shared))
    assert any(c["path"].endswith("motors.ctl.yaml") for c in cli_findings(str(path), str(project)))
    uri = open_doc(client, str(path), text)
    await published(client, uri, 1)
    assert client.diagnostics[shared_uri]
    open_doc(client, str(shared), too_high)
    await published(client, shared_uri, 1)
    # the engineer corrects the setting in the used file and saves it
    fixed = too_high.replace("setting: 30 A", "setting: 19.5 A")
    shared.write_text(fixed, encoding="utf-8")
    assert not any(c["path"].endswith("motors.ctl.yaml") for c in cli_findings(str(path), str(project)))
    mark = len(client.published)
    change_doc(client, shared_uri, fixed, 2)
    client.text_document_did_save(T.DidSaveTextDocumentParams(T.TextDocumentIdentifier(shared_uri)))
    await published(client, uri, 1, after=mark)  # the schematic, checked again unchanged
    loop = asyncio.get_running_loop()
    end = loop.time() + WAIT
    while client.diagnostics.get(shared_uri) and loop.time() < end:
        await asyncio.sleep(0.02)
    assert list(client.diagnostics[shared_uri]) == []
