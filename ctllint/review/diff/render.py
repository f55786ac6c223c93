"""The text and JSON output of a diff: ``render_text`` for a terminal or a CI log, ``render_json``.

Plain ASCII with +/-/~ markers, grouped per file and rung; every text from
the files passes through ``printable`` first. Its own module because it
shows a ``SchematicDiff`` and finds nothing.
"""
from __future__ import annotations

from dataclasses import fields, is_dataclass
from enum import Enum
from typing import Any

from ctllint.review.diff.result import ADDED, APPEARED, CHANGED, DISAPPEARED, MOVED, REMOVED, RungDiff, SchematicDiff, ValueChange

_GREEN, _RED, _YELLOW, _CYAN, _BOLD, _RESET = "\033[32m", "\033[31m", "\033[33m", "\033[36m", "\033[1m", "\033[0m"
_MARK = {ADDED: "+", APPEARED: "+", REMOVED: "-", DISAPPEARED: "-", CHANGED: "~", MOVED: "~"}


def _wires_text(pair: tuple[str, str] | None) -> str:
    return f"{pair[0]}-{pair[1]}" if pair else ""


def _quote(text: str | None) -> str:
    return f'"{text}"' if text is not None else "(none)"


def render_text(diffs: list[SchematicDiff], colour: bool = False) -> str:
    """The diffs for a terminal or a CI log: plain ASCII, +/-/~ markers, grouped per file and rung."""
    def paint(code: str, text: str) -> str:
        return f"{code}{text}{_RESET}" if colour else text

    def mark(change: str, text: str) -> str:
        m = _MARK[change]
        code = {"+": _GREEN, "-": _RED, "~": _YELLOW}[m]
        return paint(code, f"{m} {text}")

    from ctllint.checking.usage import printable

    lines: list[str] = []
    for d in diffs:
        if lines:
            lines.append("")
        lines += _render_one(_printable(d, printable), paint, mark)
    return "".join(line + "\n" for line in lines)


def _printable(value: Any, printable) -> Any:
    """``value`` with every text in it shown by ``printable``: names, titles, values and messages come
    from the files, and control characters or bidirectional overrides in them must not reach a terminal."""
    if isinstance(value, Enum):
        return value
    if isinstance(value, str):
        return printable(value)
    if isinstance(value, list):
        return [_printable(v, printable) for v in value]
    if isinstance(value, tuple):
        return tuple(_printable(v, printable) for v in value)
    if isinstance(value, dict):
        return {_printable(k, printable): _printable(v, printable) for k, v in value.items()}
    if is_dataclass(value) and not isinstance(value, type):
        return type(value)(**{f.name: _printable(getattr(value, f.name), printable) for f in fields(value)})
    return value


def _render_one(d: SchematicDiff, paint, mark) -> list[str]:
    if d.old_path and d.new_path and d.old_path != d.new_path:
        name = f"{d.old_path} -> {d.new_path}"
    else:
        name = d.path
    labels = f" ({d.old_label or 'old'} -> {d.new_label or 'new'})" if (d.old_label or d.new_label) and (d.old_label, d.new_label) != (d.old_path, d.new_path) else ""
    status = {"added": " [new file]", "deleted": " [deleted]", "unloadable": " [does not load]"}.get(d.status, "")
    out = [paint(_BOLD, f"ctllint diff {name}{labels}{status}")]
    for note in d.notes:
        out.append(paint(_CYAN, f"  note: {note}"))
    if d.status == "unloadable":
        for side, diags in d.load_errors.items():
            for e in diags:
                out.append(f"  {side}: {e.path}:{e.line}:{e.column}: {e.message}")
        out += [("  " + line) for line in d.text_diff]
        return out
    if not d.changed:
        out.append("  no electrical change (layout, comments or equal values only)")
        return out
    for h in d.header:
        out.append("  " + mark(CHANGED, f"{h.field}: {_show(h.old)} -> {_show(h.new)}"))
    if d.wire_renames:
        out.append("  wires renumbered (same connections under new numbers):")
        out += [f"    wire {o} -> {n}" for o, n in d.wire_renames.items()]
    if d.supplies:
        out.append("  supplies:")
        for s in d.supplies:
            out += _item(mark, s.change, f"supply {s.name}", s.fields)
    if d.devices:
        out.append("  devices:")
        for dev in d.devices:
            out += _item(mark, dev.change, f"{dev.tag} ({dev.kind})", dev.fields)
    if d.rungs:
        out.append("  rungs:")
        for r in d.rungs:
            out += _render_rung(r, mark)
    if d.scenarios:
        out.append("  expect:")
        for s in d.scenarios:
            out.append("    " + mark(s.change, f'scenario "{s.name}"'))
            for st in s.steps:
                out.append("        " + mark(st.change, f"step {st.step}: {st.text}"))
    if d.findings:
        out.append("  findings:")
        for f in d.findings:
            own = d.new_path if f.change == APPEARED else d.old_path
            where = f"line {f.line}" if f.path in ("", own) else f"{f.path} line {f.line}"
            where = where if f.change == APPEARED else f"was {where}"
            out.append("    " + mark(f.change, f"{f.severity}: {f.message} [{f.rule}] ({where})"))
    elif d.findings_compared and (d.electrical_changes or d.wire_renames):
        out.append("  findings: none appeared or disappeared")
    return out


def _show(value: str | None) -> str:
    return "(none)" if value is None else value


def _item(mark, change: str, name: str, changes: list[ValueChange]) -> list[str]:
    if change == CHANGED:
        return ["    " + mark(CHANGED, name)] + ["        " + mark(CHANGED, f"{c.field}: {_show(c.old)} -> {_show(c.new)}") for c in changes]
    values = ", ".join(f"{c.field}: {c.new if change == ADDED else c.old}" for c in changes)
    return ["    " + mark(change, name + (f": {values}" if values else ""))]


def _render_rung(r: RungDiff, mark) -> list[str]:
    if r.change == ADDED:
        head = f"rung {r.new_number}"
    elif r.change == REMOVED:
        head = f"rung {r.old_number}"
    else:
        head = f"rung {r.old_number}" + (f" -> {r.new_number}" if r.old_number != r.new_number else "")
    if r.title:
        head += f" {_quote(r.title)}"
    if r.moved:
        head += " (moved among the rungs)"
    out = ["    " + mark(r.change, head)]
    for c in r.fields:
        out.append("        " + mark(CHANGED, f"{c.field}: {_show(c.old)} -> {_show(c.new)}"))
    for p in r.paths:
        out.append("        " + mark(r.change, p))
    for e in r.elements:
        if e.change == MOVED:
            text = f"{e.element} moved: wires {_wires_text(e.old_wires)} -> {_wires_text(e.new_wires)}"
        else:
            text = f"{e.element} on wires {_wires_text(e.new_wires or e.old_wires)}"
        if e.note:
            text += f" ({e.note})"
        out.append("        " + mark(e.change, text))
    return out


def render_json(diffs: list[SchematicDiff]) -> str:
    import json

    doc = {"files": [d.as_dict() for d in diffs], "changed": sum(1 for d in diffs if d.changed)}
    return json.dumps(doc, indent=2, ensure_ascii=False) + "\n"
