"""What the language server knows about a schematic's text, without the protocol.

Everything here works on plain text, the loaded model and ctllint's own
diagnostics, in 0-based lines and 0-based character columns (Python string
indexes); ``ctllint.commands.editor.server`` turns them into protocol ranges. Kept apart from
pygls so that it can be read and tested on its own, and so that nothing of
it is imported by ``ctllint check``.
"""
from __future__ import annotations

import os
import re
from dataclasses import dataclass, field

from ctllint.reading.kinds import TEXT, KindRegistry
from ctllint.reading.model import ContactCount, Device, Diagnostic, Schematic
from ctllint.checking.suppress import MARKER, UNSUPPRESSIBLE, _COMMENT

# A span: (line, start, end), 0-based, end exclusive.
Span = tuple[int, int, int]

_TAG_CHARS = re.compile(r"[^\s.,:\[\]{}#'\"]")
RULE_WORD = re.compile(r"[A-Za-z0-9_-]+")

CORE_RULE_SUMMARIES = {
    "format": "the file breaks the schematic format (FORMAT.md); cannot be suppressed",
    "plugin-error": "a plugin failed to import, raised, or ran past its time limit; cannot be suppressed",
    "suppression": "an inline suppression is malformed, gives no reason, or suppresses nothing",
}


def _flow_depth(line: str, end: int) -> int:
    """How many flow brackets are open on ``line`` before column ``end`` (quotes skipped)."""
    depth, i, quote = 0, 0, ""
    while i < end and i < len(line):
        c = line[i]
        if quote:
            if c == "\\" and quote == '"':
                i += 1
            elif c == quote:
                quote = ""
        elif c in "\"'" and (i == 0 or line[i - 1] in " \t[{,:"):
            quote = c
        elif c == "#" and (i == 0 or line[i - 1] in " \t"):
            break
        elif c in "[{":
            depth += 1
        elif c in "]}":
            depth = max(0, depth - 1)
        i += 1
    return depth


def token_end(line: str, col: int) -> int:
    """End (exclusive) of the YAML token that starts at ``col`` of ``line``: a scalar, a key, a bracketed flow value.

    Always at least one character past ``col`` when the line has one there.
    """
    n = len(line)
    if col >= n:
        return col
    c = line[col]
    if c in "\"'":
        i = col + 1
        while i < n:
            if c == '"' and line[i] == "\\":
                i += 2
                continue
            if line[i] == c:
                if c == "'" and i + 1 < n and line[i + 1] == "'":
                    i += 2
                    continue
                return i + 1
            i += 1
        return n
    if c in "[{":
        close = "]" if c == "[" else "}"
        depth, i, quote = 0, col, ""
        while i < n:
            ch = line[i]
            if quote:
                if ch == quote:
                    quote = ""
            elif ch in "\"'":
                quote = ch
            elif ch in "[{":
                depth += 1
            elif ch in "]}":
                depth -= 1
                if depth == 0 and ch == close:
                    return i + 1
            i += 1
        return n
    flow = _flow_depth(line, col) > 0
    i = col
    while i < n:
        ch = line[i]
        if ch == "#" and i > col and line[i - 1] in " \t":
            break
        if ch == ":" and (i + 1 == n or line[i + 1] in " \t" or (flow and line[i + 1] in ",]}")):
            break
        if flow and ch in ",]}":
            break
        i += 1
    end = i
    while end > col and line[end - 1] in " \t":
        end -= 1
    return max(end, col + 1)


def span_of(lines: list[str], line: int, column: int) -> Span:
    """The span of the token at a diagnostic's 1-based ``line`` and ``column``, clamped to the text."""
    if not lines:
        return (0, 0, 0)
    ln = min(max(line, 1), len(lines)) - 1
    text = lines[ln]
    col = min(max(column, 1) - 1, len(text))
    if col == len(text) and text.strip():  # past the end: mark the line's last token
        col = len(text) - len(text.lstrip()) if not text.strip() else len(text.rstrip()) - 1
        return (ln, col, len(text.rstrip()))
    return (ln, col, token_end(text, col))


def word_at(line: str, col: int, pattern: re.Pattern = _TAG_CHARS) -> tuple[int, int]:
    """Start and end of the run of ``pattern`` characters around ``col`` (empty when none)."""
    start = col
    while start > 0 and pattern.match(line[start - 1]):
        start -= 1
    end = col
    while end < len(line) and pattern.match(line[end]):
        end += 1
    return start, end


# -- what stands at a position --------------------------------------------------------

@dataclass
class Target:
    """What the cursor is on: a device tag (``tag``) or a wire (``wire``), and where."""

    tag: str | None = None
    wire: str | None = None
    span: Span = (0, 0, 0)


def target_at(sch: Schematic, line: int, col: int, line_text: str) -> Target | None:
    """The device or wire at 0-based ``line``, ``col`` of the schematic's own file."""
    ln = line + 1
    # wires of the paths: exact positions from the loader
    for rung in sch.rungs:
        for path in rung.paths:
            if path.loc.line > ln:
                break
            for wire, at in zip(path.wires, path.wire_locs):
                if at.line == ln and at.path == sch.path:
                    end = token_end(line_text, at.column - 1)
                    if at.column - 1 <= col < max(end, at.column):
                        return Target(wire=wire, span=(line, at.column - 1, end))
            for el in path.elements:
                if el.line == ln and el.column - 1 <= col < el.column - 1 + len(el.text):
                    return Target(tag=el.tag, span=(line, el.column - 1, el.column - 1 + len(el.tag)))
    for sup in sch.supplies.values():
        for key, wire in (("hot", sup.hot), ("common", sup.common)):
            at = sup.at(key)
            if at.line == ln and at.column - 1 <= col < token_end(line_text, at.column - 1):
                return Target(wire=wire, span=(line, at.column - 1, token_end(line_text, at.column - 1)))
    start, end = word_at(line_text, col)
    if start == end:
        return None
    word = line_text[start:end]
    if word in sch.devices:
        return Target(tag=word, span=(line, start, end))
    return None


def use_entry_at(line_text: str, col: int) -> str | None:
    """The ``*.ctl.yaml`` path written under the cursor (an entry of ``use``), or None."""
    for m in re.finditer(r"[^\s,\[\]'\"#]+\.ctl\.ya?ml", line_text):
        if m.start() <= col <= m.end():
            return m.group()
    return None


def _tag_fields(dev: Device, tag: str) -> list[str]:
    """The fields of ``dev`` whose value names ``tag`` (overload, feeds, interlock, fuses...)."""
    out = []
    for name, value in dev.fields.items():
        if value == tag or (isinstance(value, (list, tuple)) and tag in value):
            out.append(name)
    return out


def references(sch: Schematic, target: Target, include_declaration: bool = True) -> list[tuple[str, int, int]]:
    """Every place (path, 1-based line, 1-based column) where the target's device or wire is named."""
    out: list[tuple[str, int, int]] = []
    if target.tag is not None:
        tag = target.tag
        dev = sch.devices.get(tag)
        if dev is not None and include_declaration:
            out.append((dev.loc.path, dev.loc.line, dev.loc.column))
        for el in sch.elements:
            if el.tag == tag:
                out.append((sch.path, el.line, el.column))
        for other in sch.devices.values():
            for name in _tag_fields(other, tag):
                at = other.at(name)
                out.append((at.path, at.line, at.column))
        for sup in sch.supplies.values():
            if sup.source == tag:
                at = sup.at("source")
                out.append((at.path, at.line, at.column))
        for scenario in sch.expect:
            for step in scenario.steps:
                at = step.target_locs.get(tag)
                if at is not None:
                    out.append((at.path, at.line, at.column))
    elif target.wire is not None:
        wire = target.wire
        for sup in sch.supplies.values():
            for key, name in (("hot", sup.hot), ("common", sup.common)):
                if name == wire:
                    at = sup.at(key)
                    out.append((at.path, at.line, at.column))
        for rung in sch.rungs:
            for path in rung.paths:
                for name, at in zip(path.wires, path.wire_locs):
                    if name == wire:
                        out.append((at.path, at.line, at.column))
    return sorted(set(out))


# -- hover --------------------------------------------------------------------------

def _value_text(value: object) -> str:
    if isinstance(value, ContactCount):
        bits = [f"NO: {value.no}", f"NC: {value.nc}"]
        if value.changeover:
            bits.append(f"changeover: {value.changeover}")
        return "{" + ", ".join(bits) + "}"
    text = getattr(value, "text", None)
    if isinstance(text, str) and text:
        return text
    if isinstance(value, (list, tuple)):
        return "[" + ", ".join(_value_text(v) for v in value) + "]"
    if isinstance(value, bool):
        return "true" if value else "false"
    if hasattr(value, "categories") and getattr(value, "categories", None):
        return ", ".join(f"{c.category} {c.current:g} A {c.voltage:g} V" for c in value.categories)
    if hasattr(value, "nema_size") and getattr(value, "nema_size", None):
        return f"NEMA size {value.nema_size}"
    return str(value)


def involved(sch: Schematic, diagnostics: list[Diagnostic], tag: str) -> list[Diagnostic]:
    """The findings about device ``tag``: by subject, or at its entry, its fields or its elements."""
    dev = sch.devices.get(tag)
    spots = set()
    if dev is not None:
        spots.add((dev.loc.path, dev.loc.line, dev.loc.column))
        spots.update((at.path, at.line, at.column) for at in dev.field_locs.values())
    spots.update((sch.path, el.line, el.column) for el in sch.elements if el.tag == tag)
    out = []
    for d in diagnostics:
        subject = d.subject or ""
        head = re.split(r"[.@:\s]", subject, maxsplit=1)[0] if subject else ""
        if head == tag or (d.path, d.line, d.column) in spots:
            out.append(d)
    return out


def device_hover(sch: Schematic, diagnostics: list[Diagnostic], tag: str, coil_kinds: set[str], rule_summaries: dict[str, str], shown) -> str:
    """Markdown for a hover on a device tag: kind, fields, where it is used, the findings about it."""
    from ctllint.commands.xref import xref_rows  # the cross-reference of `ctllint xref`

    dev = sch.devices[tag]
    lines = [f"**{tag}**: {dev.kind}"]
    if dev.loc.path != sch.path:
        lines[0] += f" (defined in {shown(dev.loc.path)}, line {dev.loc.line})"
    lines.append("")
    for name, value in dev.fields.items():
        lines.append(f"- `{name}`: {_value_text(value)}")
    numbers = {r.index: r.number for r in sch.rungs}
    lines.append("")
    if dev.kind in coil_kinds:
        row = next((r for r in xref_rows(sch, {dev.kind}) if r["coil"] == tag), None)
        if row is not None:
            lines.append(f"- coil: rung {row['rung']}" if row["rung"] != "no coil" else "- coil: in no rung")
            lines.append(f"- NO contacts used: {row['no']} (rungs)")
            lines.append(f"- NC contacts used: {row['nc']} (rungs)")
            status = f" ({row['status']})" if row["status"] else ""
            lines.append(f"- available: {row['available']}{status}")
    uses = [el for el in sch.elements if el.tag == tag]
    if uses:
        parts = ", ".join(f"`{el.text}` rung {numbers.get(el.rung, el.rung + 1)} (line {el.line})" for el in uses[:40])
        more = f" and {len(uses) - 40} more" if len(uses) > 40 else ""
        lines.append(f"- used in this file: {parts}{more}")
    elif dev.kind not in coil_kinds:
        lines.append("- used in no rung of this file")
    found = involved(sch, diagnostics, tag)
    if found:
        lines += ["", "Findings:"]
        for d in found:
            summary = rule_summaries.get(d.rule, "")
            lines.append(f"- `{d.rule}` ({d.severity}, line {d.line}): {summary}")
    return "\n".join(lines)


def rule_at(line_text: str, col: int) -> str | None:
    """The rule name under ``col`` when it stands in the rule list of a suppression comment."""
    if MARKER not in line_text:
        return None
    m = _COMMENT.search(line_text)
    if not m or m.start("rules") < 0:
        return None
    start, end = m.start("rules"), m.end("rules")
    if not start <= col <= end:
        return None
    a, b = word_at(line_text, col, RULE_WORD)
    return line_text[a:b] or None


def rule_hover(name: str, rules: dict) -> str | None:
    rule = rules.get(name)
    if rule is not None:
        return (f"**{rule.name}** ({rule.plugin} plugin, default severity {rule.severity}): {rule.summary}\n\n"
                f"`ctllint explain {rule.name}` gives its reasoning, source, examples and options.")
    if name in CORE_RULE_SUMMARIES:
        return f"**{name}** (core): {CORE_RULE_SUMMARIES[name]}"
    return None


# -- code actions -------------------------------------------------------------------

@dataclass
class Edit:
    line: int          # 0-based
    start: int         # 0-based character columns
    end: int
    text: str


@dataclass
class Action:
    title: str
    edits: list[Edit]
    diagnostics: list[Diagnostic] = field(default_factory=list)


def suppression_action(lines: list[str], d: Diagnostic) -> Action | None:
    """Add ``# ctllint-allow: RULE --`` to the finding's line, the reason left for the engineer to write.

    Until a reason follows ``--`` the comment suppresses nothing (and is a
    ``suppression`` warning), so picking the action hides no finding by itself.
    """
    if d.rule in UNSUPPRESSIBLE or not 1 <= d.line <= len(lines):
        return None
    ln = d.line - 1
    text = lines[ln]
    m = _COMMENT.search(text) if MARKER in text else None
    if m:
        rules = [r for r in re.split(r"[,\s]+", m.group("rules") or "") if r]
        if d.rule in rules:
            return None
        end = m.end("rules")
        return Action(f"Allow {d.rule} on this line (add it to the suppression; a reason after -- is required)",
                      [Edit(ln, end, end, f", {d.rule}" if rules else d.rule)], [d])
    body = text.rstrip()
    return Action(f"Allow {d.rule} on this line (suppression comment; write the reason after --)",
                  [Edit(ln, len(body), len(text), f"  # {MARKER} {d.rule} -- ")], [d])


def _entry_lines(lines: list[str], ln: int) -> int:
    """Index after the last line of the block entry whose key stands on line ``ln``."""
    indent = len(lines[ln]) - len(lines[ln].lstrip())
    i = ln + 1
    while i < len(lines):
        s = lines[i]
        if s.strip() and not s.lstrip().startswith("#") and len(s) - len(s.lstrip()) <= indent:
            break
        i += 1
    return i


def contacts_action(sch: Schematic, kinds: KindRegistry, lines: list[str], tag: str, verify) -> Action | None:
    """Declare ``contacts: {NO: n, NC: m}`` as the rungs use them, on a device that declares none.

    Offered only for a device of this file whose kind has a ``contacts``
    field and that is used through NO and NC parts only; the edit is checked
    by loading the edited entry on its own (``verify``) before it is offered.
    """
    dev = sch.devices.get(tag)
    kind = kinds.get(dev.kind) if dev is not None else None
    if dev is None or kind is None or "contacts" not in kind.fields or dev.get("contacts") is not None or dev.loc.path != sch.path:
        return None
    if "positions" in kind.fields:
        return None
    no = nc = 0
    for el in sch.elements:
        if el.tag != tag or el.part in (None, "coil"):
            continue
        if el.part == "NO":
            no += 1
        elif el.part == "NC":
            nc += 1
        else:
            return None  # other contact parts (a timer's instant contacts): not a plain count
    if no + nc == 0:
        return None
    ln = dev.loc.line - 1
    if not 0 <= ln < len(lines):
        return None
    text = lines[ln]
    value = f"{{NO: {no}, NC: {nc}}}"
    key_end = dev.loc.column - 1 + len(tag)
    rest = text[key_end:]
    m = re.match(r"\s*:\s*\{", rest)
    if m:  # flow mapping on the tag's line: before its closing brace
        open_at = key_end + m.end() - 1
        close = token_end(text, open_at)
        if close <= open_at or text[close - 1] != "}":
            return None
        inner = text[open_at + 1:close - 1].strip()
        insert = f", contacts: {value}" if inner else f"contacts: {value}"
        pos = close - 1
        while pos > open_at + 1 and text[pos - 1] in " \t":
            pos -= 1
        edit = Edit(ln, pos, pos, insert)
        entry = lines[ln][:edit.start] + edit.text + lines[ln][edit.end:]
        block = [entry]
    elif re.match(r"\s*:\s*(#.*)?$", rest):  # block mapping: a new line under the tag
        end = _entry_lines(lines, ln)
        body = [s for s in lines[ln + 1:end] if s.strip() and not s.lstrip().startswith("#")]
        if not body:
            return None
        indent = body[0][: len(body[0]) - len(body[0].lstrip())]
        edit = Edit(ln, len(text), len(text), f"\n{indent}contacts: {value}")
        block = [text, f"{indent}contacts: {value}", *lines[ln + 1:end]]
    else:
        return None
    if not verify(block, tag, ContactCount(no, nc)):
        return None
    return Action(f"Declare the contacts {tag} uses: contacts: {value} (check the part's data)", [edit])


def free_text_keys(kinds: KindRegistry) -> set[str]:
    keys = {"title", "note", "name"}
    for kind in kinds.kinds.values():
        for name, spec in kind.fields.items():
            if spec.type == TEXT and not spec.choices:
                keys.add(name)
    return keys


_KEY_AFTER = re.compile(r",\s*([A-Za-z_][A-Za-z0-9_-]*)\s*:(?=\s|$)")


def quote_candidates(line: str, keys: set[str]) -> list[tuple[int, int, str]]:
    """Ways to quote a free-text value in a flow mapping on ``line``: (start, end, replacement).

    For each ``KEY: value`` with KEY a free-text key and the value unquoted,
    the value may run up to any later ``, key:`` or to the mapping's closing
    brace; the caller keeps the first that makes the line load cleanly.
    """
    out = []
    for m in re.finditer(r"[{,]\s*([A-Za-z_][A-Za-z0-9_-]*)\s*:\s+", line):
        if m.group(1) not in keys:
            continue
        start = m.end()
        if start >= len(line) or line[start] in "\"'[{":
            continue
        if _flow_depth(line, start) == 0:
            continue
        ends = [k.start() for k in _KEY_AFTER.finditer(line, start)]
        depth_at = _flow_depth(line, start)
        close = None
        depth = depth_at
        for i in range(start, len(line)):  # the brace closing this mapping, quotes ignored (the value is what broke)
            if line[i] in "[{":
                depth += 1
            elif line[i] in "]}":
                depth -= 1
                if depth < depth_at:
                    close = i
                    break
        if close is not None:
            ends.append(close)
        for end in ends:
            raw = line[start:end].rstrip()
            if not raw or "#" in raw:
                continue
            quoted = '"' + raw.replace("\\", "\\\\").replace('"', '\\"') + '"'
            out.append((start, start + len(raw), quoted))
    return out


def display(path: str, root: str | None) -> str:
    if root:
        try:
            rel = os.path.relpath(path, root)
            if not rel.startswith(".."):
                return rel
        except ValueError:
            pass
    return path

