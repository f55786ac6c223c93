"""The common YAML mistakes, said in an engineer's words with the fix.

The parser's own messages ("found character that cannot start any token",
"mapping values are not allowed in this context") name what the parser
met, not what the writer did. ``explain`` looks at the text around the
parser's marks and, for the mistakes people really make in schematics,
says what happened and how to fix it, at the place the fix belongs:

- a tab used to indent (YAML indents with spaces only);
- a colon followed by a space inside unquoted text (``title: Pump: north``);
- a missing space after a colon (``kind:relay``);
- a ``[`` or ``{`` that is never closed (said where it opened);
- a quote that is never closed; a value starting with ``@`` or a backquote.

Anything else keeps the parser's words. The parser's message is kept at
the end of every translated one, for people who search for it.

``comma_in_text`` does the same for a mistake YAML does not see: a comma
inside unquoted free text in a flow mapping (``{setpoint: OFF float, closes
above 2 ft}``) ends the text, and what follows reads as a key of its own.
"""
from __future__ import annotations

import re

# YAML's line breaks (not Python's splitlines, which knows more of them).
_BREAK = re.compile(r"\r\n|[\n\r\x85\u2028\u2029]")
_KEY = r"[A-Za-z_][\w.-]*"
# A key written with no space after its colon, at the start of an entry: `kind:relay`, `CR1:{`.
_NO_SPACE = re.compile(rf"({_KEY}):(?=[^\s:/])")
# A key and its value on the same line, at the start of an entry: `title: Pump`.
_KEY_VALUE = re.compile(rf"({_KEY}):[ \t]+(?=\S)")
_NAMES = {"[": ("list", "]"), "{": ("mapping", "}")}
_LONG = 2000  # characters: a longer line gets no hint (see _masked)
_FREE_TEXT = {"setpoint", "estop_exempt", "title", "name"}  # fields whose value is words, not a code


def _lines(text: str) -> list[str]:
    return _BREAK.split(text)


def _line(lines: list[str], line: int) -> str:
    return lines[line - 1] if 0 < line <= len(lines) else ""


def _masked(line: str) -> str:
    """``line`` with quoted text and a comment blanked out (same length), so
    brackets, commas and colons inside them are not taken for structure.
    A line longer than anyone writes by hand is all blank: no hint is given
    from it, and a hostile file's one huge line costs no time here."""
    if len(line) > _LONG:
        return " " * len(line)
    out = list(line)
    i, n = 0, len(line)
    while i < n:
        c = line[i]
        before = line[i - 1] if i else " "
        if c in "'\"" and (before.isspace() or before in "[{,:-"):
            j = i + 1
            while j < n:
                if line[j] == c:
                    if c == "'" and j + 1 < n and line[j + 1] == "'":  # '' inside single quotes
                        j += 2
                        continue
                    break
                j += 2 if c == '"' and line[j] == "\\" else 1
            for k in range(i + 1, min(j, n)):
                out[k] = "x"
            i = j + 1
            continue
        if c == "#" and before.isspace():
            for k in range(i, n):
                out[k] = " "
            break
        i += 1
    return "".join(out)


def _entry_start(masked: str, col: int) -> int:
    """0-based index where the entry holding 1-based column ``col`` starts: after
    the indentation and a list dash, or after the last '{', '[' or ',' before it."""
    cut = max(masked.rfind(c, 0, col - 1) for c in "{[,")
    if cut >= 0:
        i = cut + 1
    else:
        i = 0
        while i < len(masked) and masked[i] in " \t":
            i += 1
        if masked.startswith("- ", i) or masked[i:i + 1] == "-" and i + 1 == len(masked):
            i += 1
    while i < len(masked) and masked[i] in " \t":
        i += 1
    return i


def _said(problem: str) -> str:
    return f" (YAML: {problem})"


def _no_space(lines: list[str], line: int, col: int) -> tuple[int, int, str] | None:
    """A key written with no space after its colon, on ``line`` before ``col`` or
    on the lines just above that the parser read as part of the same text."""
    masked = _masked(_line(lines, line))[:max(0, col - 1)]
    for start in {_entry_start(masked, col), _entry_start(masked, 1)}:
        m = _NO_SPACE.match(masked, start)
        if m and not _KEY_VALUE.match(masked, start):
            return line, m.end(1) + 1, m.group(1)
    # The lines above, while they read as one text running on (no `key: value`, no `key:` alone).
    for above in range(line - 1, max(0, line - 4), -1):
        text = _masked(_line(lines, above))
        body = text.strip()
        if not body:
            continue
        start = _entry_start(text, 1)
        m = _NO_SPACE.match(text, start)
        if m and not _KEY_VALUE.match(text, start):
            return above, m.end(1) + 1, m.group(1)
        if _KEY_VALUE.match(text, start) or body.endswith(":"):
            return None
    return None


def _no_space_message(lines: list[str], line: int, col: int, key: str, problem: str) -> str:
    after = _line(lines, line)[col:]
    value = after[0] + " ..." if after[:1] in ("{", "[") else re.split(r"[,\]}]|\s#", after, maxsplit=1)[0].strip()
    return (f"no space after the colon of '{key}': YAML needs 'key: value' with a space after the colon, "
            f"so write '{key}: {value}'{_said(problem)}" if value else
            f"no space after the colon of '{key}': YAML needs a space after the colon of a key{_said(problem)}")


def _colon_in_text(lines: list[str], line: int, col: int, problem: str) -> tuple[int, int, str] | None:
    """The parser stopped at a ': ' inside the unquoted value of a `key: value`."""
    raw = _line(lines, line)
    masked = _masked(raw)
    if masked[col - 1:col] != ":" or masked[col:col + 1] not in ("", " ", "\t"):
        return None
    start = _entry_start(masked, col)
    m = _KEY_VALUE.match(masked, start)
    if not m or m.end() >= col:
        return None
    rest = re.split(r"[,\]}]|\s#", raw[m.end():], maxsplit=1)[0].rstrip()
    key = m.group(1)
    return line, col, (f"a colon followed by a space inside the unquoted text of '{key}' ends it: quote the whole text, "
                       f"{key}: \"{rest}\"{_said(problem)}")


def _unclosed(lines: list[str], cline: int, ccol: int, line: int, col: int, problem: str) -> tuple[int, int, str] | None:
    """The '[' or '{' at (cline, ccol) is not closed on its own line, and the parser met trouble later."""
    masked = _masked(_line(lines, cline))
    opener = masked[ccol - 1:ccol]
    if opener not in _NAMES:  # a blanked long line has no opener either
        return None
    depth = 0
    for c in masked[ccol - 1:]:
        if c in "[{":
            depth += 1
        elif c in "]}":
            depth -= 1
            if depth == 0:
                return None  # closed on its own line: something else went wrong
    what, closer = _NAMES[opener]
    where = "the end of the file" if line > len(lines) or (line == len(lines) and not _line(lines, line)) else f"line {line}"
    return cline, ccol, (f"this '{opener}' is never closed: YAML read on to {where} looking for its '{closer}'; "
                         f"end the {what} with '{closer}'{_said(problem)}")


def explain(text: str, problem: str, line: int, col: int, context: str | None = None,
            cline: int | None = None, ccol: int | None = None) -> tuple[int, int, str]:
    """(line, column, message) for a YAML error the parser reported at (line, col),
    1-based; (cline, ccol) is where the construct it was reading began."""
    problem = (problem or "invalid YAML").strip()
    lines = _lines(text)
    raw = _line(lines, line)
    here = raw[col - 1:col]

    if "tab" in problem or (here == "\t" and "cannot start any token" in problem):
        lead = len(raw) - len(raw.lstrip(" \t"))
        if "\t" in raw[:lead]:
            return line, raw.index("\t") + 1, f"a tab indents this line: YAML indents with spaces only; replace the tab with spaces{_said(problem)}"
        return line, col, f"a tab here: YAML allows only spaces between the parts of a line; replace the tab with spaces{_said(problem)}"
    if "cannot start any token" in problem and here in ("@", "`"):
        return line, col, f"text cannot start with '{here}' unless it is quoted: put the value in double quotes{_said(problem)}"
    if context and "quoted scalar" in context and cline:
        return cline, ccol or 1, (f"this quote is never closed: end the text with a matching quote on the same line{_said(problem)}")

    if problem == "found unexpected ':'":  # a colon right after text, inside [...] or {...}
        masked = _masked(raw)
        start = _entry_start(masked, col)
        if not _KEY_VALUE.match(masked, start):
            m = _NO_SPACE.match(masked, start)
            if m and m.end(1) + 1 == col:
                return line, col, _no_space_message(lines, line, col, m.group(1), problem)
        m = _KEY_VALUE.match(masked, start)
        if m:
            key = m.group(1)
            rest = re.split(r"[,\]}]|\s#", raw[m.end():], maxsplit=1)[0].rstrip()
            return line, col, (f"a colon inside the unquoted text of '{key}' is not allowed between '{{' and '}}': "
                               f"quote the whole text, {key}: \"{rest}\"{_said(problem)}")

    if problem.startswith("did not find expected ',' or"):
        found = _colon_in_text(lines, line, col, problem)
        if found:
            return found
        if cline and ccol:
            found = _unclosed(lines, cline, ccol, line, col, problem)
            if found:
                return found

    if problem in ("mapping values are not allowed in this context", "could not find expected ':'"):
        found = _no_space(lines, line, col)
        if found:
            return found[0], found[1], _no_space_message(lines, found[0], found[1], found[2], problem)
        found = _colon_in_text(lines, line, col, problem)
        if found:
            return found

    return line, col, f"YAML: {problem}"


def lines_of(text: str) -> list[str]:
    """The lines of ``text`` as the parser counts them (for ``comma_in_text``)."""
    return _lines(text)


def comma_in_text(raw: str, col: int) -> str | None:
    """When the key at 1-based column ``col`` of the line ``raw`` is text cut off by
    a comma from the unquoted value before it in a flow mapping, the message that
    says so; else None."""
    masked = _masked(raw)
    before = masked[:col - 1].rstrip()
    if not before.endswith(","):
        return None
    after = masked[col - 1:]
    m = re.match(r"[^,:{}\[\]]*", after)
    if m is None or after[m.end():m.end() + 1] not in (",", "}"):
        return None  # written as a key of its own (`name: value`): a misspelt key, not cut-off text
    opened = before.rfind("{")
    if opened < 0 or "}" in before[opened:]:
        return None
    field = None
    for found in _KEY_VALUE.finditer(masked, opened + 1, col - 1):
        if masked[found.start() - 1:found.start()] in ("{", " ", ","):
            field = found
    orphan = after[:m.end()].strip()
    if field is None or not (" " in orphan or field.group(1) in _FREE_TEXT):
        return None  # one word after a short value: more likely a key written without its value
    tail = re.match(r"[^{}\[\]]*?(?=,\s*" + _KEY + r"\s*:|\s*}|$)", raw[field.end():])
    value = (tail.group(0) if tail else raw[field.end():]).strip()
    key = field.group(1)
    return (f"'{raw[col - 1:col - 1 + m.end()].strip()}' reads as a key because the comma before it ends the unquoted "
            f"text of '{key}': quote the whole text, {key}: \"{value}\"")
