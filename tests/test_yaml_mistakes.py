"""The common YAML mistakes are reported in an engineer's words, with the fix, at the exact place.

Case files: tests/data/format-errors/yaml-*.ctl.yaml. Their first line gives
the line of the `format` error (as every format-error case does, checked by
test_schema.py); the second, `# expect-message: LINE:COLUMN: words`, the
exact position and how the message begins. Positions were counted by hand
from the case files (1-based, as editors show them).
"""
import glob
import os
import re

import pytest
from hypothesis import given, settings, strategies as st

from ctllint.reading.loader import load_file, load_text
from ctllint.reading.yamlhints import comma_in_text, explain

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
CASES = sorted(glob.glob(os.path.join(ROOT, "tests", "data", "format-errors", "yaml-*.ctl.yaml")))

# The fix each message asks for, applied by hand: the fixed file must load.
FIXES = {
    "yaml-tab-indent.ctl.yaml": ("\tFS1:", "  FS1:"),
    "yaml-comma-in-text.ctl.yaml": ("setpoint: OFF float, closes above 2 ft}", 'setpoint: "OFF float, closes above 2 ft"}'),
    "yaml-colon-in-text.ctl.yaml": ("setpoint: OFF float: closes above 2 ft}", 'setpoint: "OFF float: closes above 2 ft"}'),
    "yaml-no-space-after-colon.ctl.yaml": ("setting:4 A", "setting: 4 A"),
    "yaml-no-space-after-colon-block.ctl.yaml": ("setting:4 A", "setting: 4 A"),
    "yaml-unclosed-bracket.ctl.yaml": ("OL1.NC, X2\n", "OL1.NC, X2]\n"),
}


def _expected(path):
    with open(path, encoding="utf-8") as handle:
        handle.readline()
        m = re.match(r"# expect-message: (\d+):(\d+): (.*)$", handle.readline().rstrip("\n"))
    assert m, f"{path}: second line must be '# expect-message: LINE:COLUMN: words'"
    return int(m.group(1)), int(m.group(2)), m.group(3)


def test_a_case_file_for_each_common_mistake():
    names = {os.path.basename(p) for p in CASES}
    assert set(FIXES) == names


@pytest.mark.parametrize("path", CASES, ids=os.path.basename)
def test_case_file_gives_the_words_and_the_exact_place(path):
    line, column, words = _expected(path)
    result = load_file(path)
    assert result.schematic is None
    assert [(d.line, d.column, d.rule) for d in result.diagnostics] == [(line, column, "format")]
    message = result.diagnostics[0].message
    assert message.startswith(words), message
    assert "cannot start any token" not in message.split("(YAML:")[0]  # the parser's words only as a footnote


@pytest.mark.parametrize("path", CASES, ids=os.path.basename)
def test_doing_what_the_message_says_fixes_the_file(path):
    with open(path, encoding="utf-8") as handle:
        text = handle.read()
    old, new = FIXES[os.path.basename(path)]
    assert text.count(old) == 1
    fixed = load_text(text.replace(old, new), path)
    assert fixed.schematic is not None, [d.message for d in fixed.diagnostics]


def _one(text):
    result = load_text(text, "t.ctl.yaml")
    assert result.schematic is None
    assert len(result.diagnostics) == 1, result.diagnostics
    d = result.diagnostics[0]
    return d.line, d.column, d.message


HEAD = "ctllint: 1\nsupplies:\n  ctl: {hot: L1, common: X2, voltage: 120 VAC}\ndevices:\n"
RUNG = "rungs:\n  - paths:\n      - [L1, CR1.coil, X2]\n"


@pytest.mark.parametrize("text, where, words", [
    # a tab in the middle of the indentation points at the tab itself
    (HEAD + "  CR1:\n  \tkind: relay\n" + RUNG, (6, 3), "a tab indents this line"),
    (HEAD + "  CR1:\n    kind: relay\n\tcoil: 120 VAC\n" + RUNG, (7, 1), "a tab indents this line"),
    # a colon in a block value: at the colon
    ("ctllint: 1\ntitle: Pump: north well\n" + HEAD[11:] + "  CR1: {kind: relay}\n" + RUNG, (2, 12),
     "a colon followed by a space inside the unquoted text of 'title' ends it: quote the whole text, title: \"Pump: north well\""),
    # no space after a colon, found on the line above where the parser stopped
    ("ctllint:1\n" + HEAD[11:] + "  CR1: {kind: relay}\n" + RUNG, (1, 8), "no space after the colon of 'ctllint'"),
    (HEAD + "  CR1:{kind: relay, coil: 120 VAC}\n" + RUNG, (5, 6), "no space after the colon of 'CR1'"),
    (HEAD + "  CR1: {kind:relay}\n" + RUNG, (5, 13), "no space after the colon of 'kind': YAML needs 'key: value' with a space after the colon, so write 'kind: relay'"),
    # a colon with no space inside free text in {...} is free text, not a missing space
    (HEAD + "  FS1: {kind: float-switch, setpoint: OFF float:closes}\n" + RUNG, (5, 48),
     "a colon inside the unquoted text of 'setpoint' is not allowed between '{' and '}': quote the whole text, setpoint: \"OFF float:closes\""),
    # unclosed brackets: where they opened
    ("ctllint: 1\nsupplies:\n  ctl: {hot: L1, common: X2, voltage: 120 VAC\ndevices:\n  CR1: {kind: relay}\n" + RUNG, (3, 8),
     "this '{' is never closed: YAML read on to line 4 looking for its '}'; end the mapping with '}'"),
    (HEAD + "  CR1: {kind: relay}\nrungs:\n  - paths:\n      - [L1, CR1.coil, X2\n", (8, 9), "this '[' is never closed"),
    # a bracket inside quoted text is not structure
    (HEAD + "  CR1: {kind: relay, setpoint: \"a [b\"\n  CR2: {kind: relay}\n" + RUNG, (5, 8), "this '{' is never closed"),
    (HEAD + "  CR1: {kind: relay, coil: \"120 VAC}\n" + RUNG, (5, 28), "this quote is never closed"),
    (HEAD + "  CR1: {kind: relay, coil: @home}\n" + RUNG, (5, 28), "text cannot start with '@' unless it is quoted"),
])
def test_more_of_the_common_mistakes(text, where, words):
    line, column, message = _one(text)
    assert (line, column) == where, message
    assert message.startswith(words), message


def test_other_yaml_errors_keep_the_parsers_words():
    line, column, message = _one(HEAD + "  CR1: {kind: relay}\n bad: 1\n" + RUNG)
    assert message.startswith("YAML: ") and (line, column) == (6, 2)


def test_a_misspelt_key_after_a_comma_keeps_did_you_mean():
    _, _, message = _one(HEAD + "  CR1: {kind: relay, coil: 120 VAC, supressed}\n" + RUNG)
    assert message == "unknown key 'supressed' in relay CR1 (did you mean 'suppressed'?)"
    assert comma_in_text("  CR1: {kind: relay, setpoint: a, b c: d}", 35) is None  # `b c: d` is written as a key
    assert comma_in_text("  CR1: {kind: relay, setpoint: a, b c}", 35).startswith("'b c' reads as a key")


def test_many_cut_off_keys_split_the_file_once(monkeypatch):
    """A file of 2,000 devices each with a cut-off text is split into lines once, not once per key
    (a hostile file of many such keys would otherwise cost the file's size times their number)."""
    import ctllint.reading.yamlhints as hints

    splits = []
    real = hints._lines
    monkeypatch.setattr(hints, "_lines", lambda text: splits.append(len(text)) or real(text))
    body = "".join(f"  FS{i}: {{kind: float-switch, setpoint: OFF float, closes above {i} ft}}\n" for i in range(2_000))
    result = load_text(HEAD + body + RUNG, "t.ctl.yaml")
    assert len(result.diagnostics) == 2_000 and len(splits) == 1
    # the first 50 say to quote; past that (a hostile file) the plain message, each at its key
    assert sum("quote the whole text" in d.message for d in result.diagnostics) == 50
    assert all(d.column == 49 + len(str(d.line - 5)) for d in result.diagnostics)  # where "closes" starts


def test_every_cut_off_piece_of_text_says_to_quote_the_whole():
    text = HEAD + "  FS1: {kind: float-switch, setpoint: low, falling, level 2 ft}\n  CR1: {kind: relay}\n" + RUNG
    result = load_text(text, "t.ctl.yaml")
    got = [(d.line, d.column, d.message.split(":", 1)[0]) for d in result.diagnostics]
    assert got == [(5, 44, "'falling' reads as a key because the comma before it ends the unquoted text of 'setpoint'"),
                   (5, 53, "'level 2 ft' reads as a key because the comma before it ends the unquoted text of 'setpoint'")]
    assert all('setpoint: "low, falling, level 2 ft"' in d.message for d in result.diagnostics)


@settings(max_examples=300, deadline=None)
@given(st.text(alphabet=" \t\n:,[]{}\"'#-abk1", max_size=80), st.integers(-2, 12), st.integers(-2, 90),
       st.sampled_from(["found character that cannot start any token", "found a tab character that violates indentation",
                        "did not find expected ',' or ']'", "did not find expected ',' or '}'", "found unexpected ':'",
                        "mapping values are not allowed in this context", "could not find expected ':'",
                        "found unexpected end of stream"]),
       st.one_of(st.none(), st.tuples(st.integers(-2, 12), st.integers(-2, 90))))
def test_explain_never_fails(text, line, col, problem, opened):
    cline, ccol = opened if opened else (None, None)
    got = explain(text, problem, line, col, "while scanning a quoted scalar" if opened and line % 2 else None, cline, ccol)
    assert isinstance(got[0], int) and isinstance(got[1], int) and problem in got[2]


def test_a_line_longer_than_anyone_writes_gets_no_hint():
    """A hostile file's one huge line is not read character by character for a hint (bounded time)."""
    line = "  FS1: {kind: float-switch, setpoint: a" + "".join(f", k{i}: v" for i in range(400)) + ", x: y: z}"
    assert len(line) > 2000
    text = HEAD + line + "\n" + RUNG
    got = explain(text, "did not find expected ',' or '}'", 5, len(line) - 4, "while parsing a flow mapping", 5, 8)
    assert got == (5, len(line) - 4, "YAML: did not find expected ',' or '}'")
    short = HEAD + "  FS1: {kind: float-switch, setpoint: a, x: y: z}\n" + RUNG
    assert "quote the whole text" in explain(short, "did not find expected ',' or '}'", 5, 46, "while parsing a flow mapping", 5, 8)[2]
