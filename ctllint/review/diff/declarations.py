"""The diff of what a schematic declares: its header (title, ``use``), supplies and devices, field by field.

A field that changed is shown old -> new as written; an added or removed
supply or device lists the fields it has. Its own module because these parts
are compared the same way (by name, then field by field), unlike rungs.
"""
from __future__ import annotations

from typing import Any, Iterable

from ctllint.reading.model import Schematic
from ctllint.reading.yamlsafe import ScalarNode, SequenceNode
from ctllint.review.diff.result import ADDED, CHANGED, REMOVED, DeviceDiff, SupplyDiff, ValueChange
from ctllint.review.diff.values import Source, render_node, render_value, same_value


def diff_header(old: Schematic | None, new: Schematic | None, so: Source, sn: Source) -> list[ValueChange]:
    out = []
    if old and new and old.title != new.title:
        out.append(ValueChange("title", old.title, new.title))

    def uses(sch: Schematic | None, src: Source) -> list[str]:
        node = src.top("use")
        if isinstance(node, SequenceNode):
            return [render_node(n) for n in node.value]
        if isinstance(node, ScalarNode):
            return [node.value]
        return [u.replace("\\", "/").rsplit("/", 1)[-1] for u in (sch.uses if sch else ())]
    if old and new:
        a, b = uses(old, so), uses(new, sn)
        if sorted(a) != sorted(b):
            out.append(ValueChange("use", "[" + ", ".join(a) + "]" if a else None, "[" + ", ".join(b) + "]" if b else None))
    return out


def _field_changes(names: Iterable[str], get_old, get_new, written_old, written_new) -> list[ValueChange]:
    out = []
    for name in names:
        a, b = get_old(name), get_new(name)
        if same_value(a, b):
            continue
        out.append(ValueChange(name, None if a is None else written_old(name, a), None if b is None else written_new(name, b)))
    return out


def ordered_union(a: Iterable[str], b: Iterable[str]) -> list[str]:
    first = dict.fromkeys(a)
    return list(first) + [x for x in dict.fromkeys(b) if x not in first]


def diff_supplies(old: Schematic | None, new: Schematic | None, so: Source, sn: Source) -> list[SupplyDiff]:
    names = ("hot", "common", "voltage", "grounded", "source")
    a = old.supplies if old else {}
    b = new.supplies if new else {}

    def written(src: Source, sup):
        def text(name: str, value: Any) -> str:
            found = src.written(sup.field_locs.get(name))
            return found if found is not None else render_value(value) + ("" if name in sup.field_locs else " (default)")
        return text
    out = []
    for name in ordered_union(b, a):
        s, t = a.get(name), b.get(name)
        if s is None:
            out.append(SupplyDiff(name, ADDED, [ValueChange(f, None, written(sn, t)(f, getattr(t, f))) for f in names if f in t.field_locs], new_line=t.loc.line))
        elif t is None:
            out.append(SupplyDiff(name, REMOVED, [ValueChange(f, written(so, s)(f, getattr(s, f)), None) for f in names if f in s.field_locs], old_line=s.loc.line))
        else:
            changes = _field_changes(names, lambda f: getattr(s, f), lambda f: getattr(t, f), written(so, s), written(sn, t))
            if changes:
                out.append(SupplyDiff(name, CHANGED, changes, s.loc.line, t.loc.line))
    return out


def _device_written(src: Source, dev):
    def written(name: str, value: Any) -> str:
        text = src.written(dev.field_locs.get(name))
        if text is not None:
            return text
        return render_value(value) + ("" if name in dev.field_locs else " (default)")
    return written


def diff_devices(old: Schematic | None, new: Schematic | None, so: Source, sn: Source) -> list[DeviceDiff]:
    a = old.devices if old else {}
    b = new.devices if new else {}
    out = []
    for tag in ordered_union(b, a):
        d, e = a.get(tag), b.get(tag)
        if d is None:
            out.append(DeviceDiff(tag, ADDED, e.kind, [ValueChange(f, None, _device_written(sn, e)(f, v)) for f, v in e.fields.items() if f in e.field_locs], new_line=e.loc.line))
        elif e is None:
            out.append(DeviceDiff(tag, REMOVED, d.kind, [ValueChange(f, _device_written(so, d)(f, v), None) for f, v in d.fields.items() if f in d.field_locs], old_line=d.loc.line))
        else:
            changes = []
            if d.kind != e.kind:
                changes.append(ValueChange("kind", d.kind, e.kind))
            changes += _field_changes(ordered_union(d.fields, e.fields), d.fields.get, e.fields.get, _device_written(so, d), _device_written(sn, e))
            if _origin(d, old) != _origin(e, new):
                changes.append(ValueChange("defined in", _origin(d, old), _origin(e, new)))
            if changes:
                out.append(DeviceDiff(tag, CHANGED, e.kind, changes, d.loc.line, e.loc.line))
    return out


def _origin(dev, sch: Schematic | None) -> str:
    return "this file" if sch is not None and dev.origin == sch.path else dev.origin.replace("\\", "/").rsplit("/", 1)[-1]
