"""One self-contained HTML page: every schematic's drawing and findings.

The page has no external resources (inline CSS, inline SVG, no scripts,
no fonts to fetch), so it can be mailed, archived as a CI artifact or
opened offline. It holds, in order: the safety note, a summary table (one
row per file, counts by severity), then per file its findings and its
drawing. Each finding links to its element in the drawing (``#f1-el-12``)
and each rule name in the drawing links back to its row in the table
(``#f1-d3``). The page carries no date and no absolute path, so the same
files give the same bytes.

Given ``Changes`` (``ctllint report --changes-since REV``), the page also
has a "Changes since REV" section after the summary table: per changed
schematic, the semantic diff (see ``ctllint.review.diff``) as lists, and each
changed rung drawn before (the old revision) and after (the working tree),
side by side where the page is wide enough, with what was removed or moved
away outlined on the old drawing and what was added or moved there on the
new one (``ctllint.output.draw.Mark``). Only the changed rungs are drawn, with
their own numbers; a rung that only moved, or whose wires were only
renumbered, is listed, not drawn.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from html import escape as _escape
from typing import Any

from ctllint import __version__
from ctllint.review.diff import ADDED, APPEARED, CHANGED, MOVED, REMOVED, ElementDiff, RungDiff, SchematicDiff, ValueChange, changed_rungs
from ctllint.output.draw import CHANGE_COLOUR, CHANGE_TINT, SEVERITY_COLOUR, SEVERITY_TINT, Drawing, Mark, layout
from ctllint.output.draw import visible as _visible
from ctllint.reading.model import Diagnostic, Schematic, Severity


def escape(text: str, quote: bool = True) -> str:
    """HTML-escaped, with control characters and bidirectional overrides shown escaped (``\x1b``), as in the drawings."""
    return _escape(_visible(text), quote)
from ctllint.output.report import SAFETY_NOTE


@dataclass
class FileReport:
    """One checked file: its display path, its schematic when it loaded, its findings."""

    path: str
    schematic: Schematic | None
    diagnostics: list[Diagnostic]


@dataclass
class FileChange:
    """One schematic changed since the revision the report compares with.

    ``path`` is the file's path as the report shows it (for a deleted file,
    where it was); ``diff`` the semantic diff from the old revision to the
    working tree; ``old`` and ``new`` the two revisions' schematics, for
    drawing the changed rungs (None for a side that does not exist or does
    not load).
    """

    path: str
    diff: SchematicDiff
    old: Schematic | None = None
    new: Schematic | None = None


@dataclass
class Changes:
    """What changed since a git revision, for the report's changes section.

    ``since`` is the revision as the user gave it, ``commit`` the commit it
    named; ``files`` the report's files that changed or are new (in the
    report's order), ``deleted`` those gone since, ``unchanged`` how many
    of the report's files did not change.
    """

    since: str
    commit: str
    files: list[FileChange] = field(default_factory=list)
    deleted: list[FileChange] = field(default_factory=list)
    unchanged: int = 0


def _counts(diagnostics: list[Diagnostic]) -> dict[Severity, int]:
    return {s: sum(1 for d in diagnostics if d.severity == s) for s in Severity}


def _plural(n: int, word: str) -> str:
    return f"{n} {word}{'' if n == 1 or word == 'info' else 's'}"


def _files_checked(files: list[FileReport]) -> str:
    """``4 schematics, 1 device file``: shared device files counted apart, as the command line's summary does."""
    device_files = sum(1 for f in files if f.schematic is not None and f.schematic.device_file)
    return _plural(len(files) - device_files, "schematic") + (f", {_plural(device_files, 'device file')}" if device_files else "")


def _badges(counts: dict[Severity, int]) -> str:
    if not any(counts.values()):
        return '<span class="badge clean">no findings</span>'
    out = []
    for sev in (Severity.ERROR, Severity.WARNING, Severity.INFO):
        if counts[sev]:
            out.append(f'<span class="badge sev-{sev}">{_plural(counts[sev], str(sev))}</span>')
    return " ".join(out)


CSS = """
:root{color-scheme:light}
*{box-sizing:border-box}
body{margin:0;font:14px/1.45 system-ui,-apple-system,'Segoe UI',Roboto,'DejaVu Sans',Arial,sans-serif;color:#1b1f24;background:#f3f5f7}
header,main,footer{max-width:1680px;margin:0 auto;padding:0 24px}
header{padding-top:20px}
h1{font-size:22px;margin:0 0 4px}
h2{font-size:18px;margin:0}
h2 small{font-weight:normal;color:#5c6670;font-family:'DejaVu Sans Mono',Menlo,Consolas,monospace;font-size:13px;margin-left:8px}
.meta{color:#5c6670;margin:0 0 12px}
.safety{border-left:4px solid #b26a00;background:#fff8e6;padding:10px 14px;margin:12px 0 18px;border-radius:0 4px 4px 0}
table{border-collapse:collapse;width:100%;background:#fff}
th,td{text-align:left;padding:6px 10px;border-bottom:1px solid #e1e5e9;vertical-align:top}
th{background:#eef1f4;font-weight:600;font-size:13px}
td.num{text-align:right;font-variant-numeric:tabular-nums;width:6em}
td.num.zero{color:#a0a8b0}
.summary{margin-bottom:24px;border:1px solid #d6dbe0}
.summary tfoot td{font-weight:600;background:#f7f9fa}
section.file{background:#fff;border:1px solid #d6dbe0;border-radius:6px;margin:0 0 28px;padding:16px 18px}
.filehead{display:flex;align-items:baseline;gap:16px;flex-wrap:wrap;margin-bottom:12px}
.badge{display:inline-block;padding:1px 8px;border-radius:10px;font-size:12px;font-weight:600;border:1px solid}
.badge.clean{color:#2e7d32;border-color:#2e7d32;background:#edf7ee}
.findings{margin:0 0 16px;border:1px solid #e1e5e9}
.findings td.where{font-family:'DejaVu Sans Mono',Menlo,Consolas,monospace;font-size:12px;white-space:nowrap}
.findings td.rule{font-family:'DejaVu Sans Mono',Menlo,Consolas,monospace;font-size:12px;white-space:nowrap}
.findings td.sev{white-space:nowrap;font-weight:600;width:6em}
.findings tr:target{background:#fff6c2}
.findings a{color:#1d5fa6}
.nodraw{color:#5c6670;font-style:italic}
.drawing{overflow-x:auto;border:1px solid #e1e5e9;border-radius:4px;background:#fff}
.drawing svg{display:block}
details.wirelist{margin:12px 0 0}
details.wirelist summary{cursor:pointer;font-weight:600}
table.wires{margin-top:6px;border:1px solid #e1e5e9;width:auto}
table.wires td{font-family:'DejaVu Sans Mono',Menlo,Consolas,monospace;font-size:12px;padding:2px 10px}
table.wires tr.w-field td{color:#1d5fa6}
.drawing .el,.drawing .section,.findings tr{scroll-margin-top:140px}
.drawing a text{text-decoration:underline}
footer{color:#5c6670;padding-bottom:32px;font-size:13px}
"""


def render_html(files: list[FileReport], title: str = "ctllint report", changes: Changes | None = None,
                progress: Any = None) -> str:
    """The report page for ``files`` (in the order given), with a changes section when ``changes`` is given;
    ``progress.advance(1)`` is called as each file is drawn."""
    css = CSS
    for sev, colour in SEVERITY_COLOUR.items():
        css += f".sev-{sev}{{color:{colour}}}\n.badge.sev-{sev}{{border-color:{colour};background:{SEVERITY_TINT[sev]}}}\n"
    if changes is not None:
        css += CHANGES_CSS
    every = [d for f in files for d in f.diagnostics]
    total = _counts(every)
    index_of = {f.path: i for i, f in enumerate(files, 1)}
    change_of: dict[str, FileChange] = {c.path: c for c in changes.files} if changes else {}
    out = [
        "<!DOCTYPE html>",
        '<html lang="en">',
        "<head>",
        '<meta charset="utf-8">',
        '<meta name="viewport" content="width=device-width, initial-scale=1">',
        f'<meta name="generator" content="ctllint {escape(__version__)}">',
        f"<title>{escape(title)}</title>",
        f"<style>{css}</style>",
        "</head>",
        "<body>",
        "<header>",
        f"<h1>{escape(title)}</h1>",
        f'<p class="meta">{_files_checked(files)} checked \u00b7 '
        f'{_plural(total[Severity.ERROR], "error")}, {_plural(total[Severity.WARNING], "warning")}, {_plural(total[Severity.INFO], "info")}'
        + (f" \u00b7 changes since {escape(changes.since)}" if changes else "")
        + f" \u00b7 ctllint {escape(__version__)}</p>",
        f'<p class="safety" id="safety-note" role="note"><strong>Safety.</strong> {escape(SAFETY_NOTE)}</p>',
        "</header>",
        "<main>",
        '<table class="summary" id="summary">',
        "<thead><tr><th>file</th><th>title</th><th>errors</th><th>warnings</th><th>info</th>"
        + (f"<th>since {escape(changes.since)}</th>" if changes else "") + "</tr></thead>",
        "<tbody>",
    ]
    for i, f in enumerate(files, 1):
        c = _counts(f.diagnostics)
        name = f.schematic.title if f.schematic and f.schematic.title else ""
        cells = "".join(
            f'<td class="num{" zero" if not c[s] else ""} sev-{s if c[s] else "none"}" data-severity="{s}">{c[s]}</td>'
            for s in (Severity.ERROR, Severity.WARNING, Severity.INFO)
        )
        if changes is not None:
            change = change_of.get(f.path)
            if change is None:
                cells += '<td class="since unchanged">unchanged</td>'
            else:
                cells += f'<td class="since"><a href="#change-{i}">{escape(_status_word(change.diff))}</a></td>'
        out.append(f'<tr data-path="{escape(f.path)}"><td><a href="#file-{i}">{escape(f.path)}</a></td><td>{escape(name)}</td>{cells}</tr>')
    out.append("</tbody>")
    out.append(
        "<tfoot><tr><td>total</td><td></td>"
        + "".join(f'<td class="num">{total[s]}</td>' for s in (Severity.ERROR, Severity.WARNING, Severity.INFO))
        + (f'<td class="since">{_since_total(changes)}</td>' if changes else "")
        + "</tr></tfoot>"
    )
    out.append("</table>")

    if changes is not None:
        out.extend(_changes_section(changes, files, index_of))
    for i, f in enumerate(files, 1):
        out.extend(_file_section(i, f, changes.since if f.path in change_of else None))
        if progress is not None:
            progress.advance(1)
    out += [
        "</main>",
        f'<footer><p>{escape(SAFETY_NOTE)}</p><p>Made by ctllint {escape(__version__)}. '
        "Each finding links to its element in the drawing; each rule name in a drawing links back to its finding.</p></footer>",
        "</body>",
        "</html>",
    ]
    return "\n".join(out) + "\n"


def _file_section(i: int, f: FileReport, changed_since: str | None = None) -> list[str]:
    prefix = f"f{i}-"
    diagnostics = sorted(set(f.diagnostics))
    row_id = {d: f"{prefix}d{k}" for k, d in enumerate(diagnostics, 1)}
    drawing = None
    if f.schematic is not None:
        drawing = layout(f.schematic, diagnostics, id_prefix=prefix, legend=False, finding_links=row_id, header=False)
    heading = escape(f.schematic.title) if f.schematic and f.schematic.title else escape(f.path)
    out = [
        f'<section class="file" id="file-{i}" data-path="{escape(f.path)}">',
        f'<div class="filehead"><h2>{heading} <small>{escape(f.path)}</small></h2>'
        f'<span class="counts">{_badges(_counts(diagnostics))}</span>'
        + (f'<a class="tochange" href="#change-{i}">changes since {escape(changed_since)}</a>' if changed_since else "")
        + "</div>",
    ]
    if diagnostics:
        out.append(f'<table class="findings" id="{prefix}findings">')
        out.append("<thead><tr><th>severity</th><th>where</th><th>rule</th><th>finding</th><th>drawing</th></tr></thead><tbody>")
        for d in diagnostics:
            where = f"{d.line}:{d.column}" if d.path == f.path else f"{d.path}:{d.line}:{d.column}"
            anchor = drawing.anchors.get(d) if drawing else None
            link = f'<a href="#{anchor}" data-target="{anchor}">show</a>' if anchor else '<span class="nodraw">not on the drawing</span>'
            out.append(
                f'<tr id="{row_id[d]}" class="finding" data-rule="{escape(d.rule)}" data-severity="{d.severity}" data-line="{d.line}" data-column="{d.column}">'
                f'<td class="sev sev-{d.severity}">{d.severity}</td><td class="where">{escape(where)}</td>'
                f'<td class="rule">{escape(d.rule)}</td><td>{escape(d.message)}</td><td>{link}</td></tr>'
            )
        out.append("</tbody></table>")
    if drawing is not None:
        out.append(f'<div class="drawing" id="{prefix}drawing-box">{drawing.svg}</div>')
        out.extend(_wire_sheet(prefix, f.schematic))
    else:
        out.append('<p class="nodraw">Not drawn: the file does not load (see its format findings).</p>')
    out.append("</section>")
    return out


def _wire_sheet(prefix: str, sch: Schematic) -> list[str]:
    """The wire list (as ``ctllint export wires`` writes it) as a folded table under the drawing."""
    from ctllint.output.export import conductor_rows

    rows = conductor_rows(sch)
    if not rows:
        return []
    out = [f'<details class="wirelist" id="{prefix}wires"><summary>Wire list: {_plural(len(rows), "conductor")}'
           " (as <code>ctllint export wires</code> writes it)</summary>",
           '<table class="wires"><thead><tr><th>wire</th><th>from</th><th>to</th><th>where</th></tr></thead><tbody>']
    for c in rows:
        out.append(f'<tr class="w-{c.where}"><td>{escape(c.wire)}</td><td>{escape(str(c.start))}</td>'
                   f"<td>{escape(str(c.end))}</td><td>{c.where}</td></tr>")
    out.append("</tbody></table></details>")
    return out


# -- changes since a revision -------------------------------------------------------

CHANGES_CSS = f"""
section.changes{{background:#fff;border:1px solid #d6dbe0;border-radius:6px;margin:0 0 28px;padding:16px 18px}}
section.change{{border-top:1px solid #d6dbe0;margin-top:18px;padding-top:14px}}
h3{{font-size:16px;margin:0}}
h3 small{{font-weight:normal;color:#5c6670;font-family:'DejaVu Sans Mono',Menlo,Consolas,monospace;font-size:13px;margin-left:8px}}
h4{{font-size:12px;margin:14px 0 4px;text-transform:uppercase;letter-spacing:.05em;color:#5c6670}}
.key{{margin:4px 0 8px}}
.swatch{{display:inline-block;padding:0 6px;border:2px solid;border-radius:4px;font-weight:600;white-space:nowrap}}
.swatch.gone{{border-color:{CHANGE_COLOUR["removed"]};border-style:dashed;background:{CHANGE_TINT["removed"]};color:{CHANGE_COLOUR["removed"]}}}
.swatch.new{{border-color:{CHANGE_COLOUR["added"]};background:{CHANGE_TINT["added"]};color:{CHANGE_COLOUR["added"]}}}
.status{{display:inline-block;padding:1px 8px;border-radius:10px;font-size:12px;font-weight:600;border:1px solid #5c6670;color:#44505c;background:#f3f5f7}}
.status.st-added{{border-color:{CHANGE_COLOUR["added"]};color:{CHANGE_COLOUR["added"]};background:{CHANGE_TINT["added"]}}}
.status.st-deleted{{border-color:{CHANGE_COLOUR["removed"]};color:{CHANGE_COLOUR["removed"]};background:{CHANGE_TINT["removed"]}}}
.status.st-unloadable{{border-color:#c62828;color:#c62828;background:#fdecea}}
td.since.unchanged{{color:#5c6670}}
a.tochange{{font-size:13px;color:#1d5fa6}}
.filehead a.tochange{{margin-left:auto}}
ul.delta{{list-style:none;margin:0;padding:0}}
ul.delta li{{margin:2px 0;padding-left:1.5em;text-indent:-1.5em}}
ul.delta ul{{list-style:none;margin:2px 0 4px;padding:0}}
.glyph{{display:inline-block;width:1.5em;text-indent:0;text-align:center;font-weight:700;font-family:'DejaVu Sans Mono',Menlo,Consolas,monospace}}
.d-added>.glyph,.d-appeared>.glyph{{color:{CHANGE_COLOUR["added"]}}}
.d-removed>.glyph,.d-disappeared>.glyph{{color:{CHANGE_COLOUR["removed"]}}}
.d-changed>.glyph,.d-moved>.glyph{{color:#44505c}}
.word{{font-size:12px;color:#5c6670}}
code,.wires{{font-family:'DejaVu Sans Mono',Menlo,Consolas,monospace;font-size:12px}}
code{{background:#f3f5f7;border-radius:3px;padding:0 3px}}
ul.renames{{display:flex;flex-wrap:wrap;gap:6px;list-style:none;margin:4px 0;padding:0}}
ul.renames li{{border:1px solid #d6dbe0;border-radius:10px;padding:0 8px;font-family:'DejaVu Sans Mono',Menlo,Consolas,monospace;font-size:12px;background:#f7f9fa}}
ul.deleted{{margin:4px 0 0;padding-left:1.5em}}
figure.rungpair{{margin:12px 0 0;border:1px solid #e1e5e9;border-radius:6px;padding:10px 12px;scroll-margin-top:40px}}
figure.rungpair figcaption{{font-weight:600;margin:0 0 8px}}
.pair{{display:grid;grid-template-columns:repeat(auto-fit,minmax(min(700px,100%),1fr));gap:12px;align-items:start}}
.pane{{border:1px solid #d6dbe0;border-radius:4px;overflow:hidden;background:#fff}}
.panehead{{margin:0;padding:4px 10px;font-size:13px;font-weight:600;border-bottom:1px solid #d6dbe0}}
.pane.before .panehead{{background:{CHANGE_TINT["removed"]};color:#7a1f52}}
.pane.after .panehead{{background:{CHANGE_TINT["added"]};color:#005a43}}
.pane svg{{display:block;max-width:100%;height:auto}}
.pane .nodraw{{padding:14px 10px;margin:0}}
pre.textdiff{{background:#f7f9fa;border:1px solid #e1e5e9;border-radius:4px;padding:8px 10px;overflow-x:auto;font-size:12px}}
"""

_STATUS_WORD = {"added": "new file", "deleted": "deleted", "unloadable": "does not load"}
_GLYPH = {ADDED: "+", APPEARED: "+", REMOVED: "\u2212", "disappeared": "\u2212", CHANGED: "~", MOVED: "~"}


def _since_total(changes: Changes) -> str:
    new = sum(1 for c in changes.files if c.diff.status == "added")
    parts = [f"{len(changes.files) - new} changed"] + ([f"{new} new"] if new else []) + ([f"{len(changes.deleted)} deleted"] if changes.deleted else [])
    return ", ".join(parts)


def _status_word(d: SchematicDiff) -> str:
    if d.status in _STATUS_WORD:
        return _STATUS_WORD[d.status]
    if d.old_path and d.new_path and d.old_path != d.new_path:
        return "renamed"
    if not d.changed:
        return "layout only"
    if d.renumbering_only:
        return "renumbered"
    return "changed"


def _wires(pair: tuple[str, str] | None) -> str:
    return f"{pair[0]}\u2013{pair[1]}" if pair else ""


def _value(text: str | None) -> str:
    return "<i>(none)</i>" if text is None else f"<code>{escape(text)}</code>"


def _item(change: str, html: str, inner: list[str] | None = None, extra: str = "") -> list[str]:
    """One line of a change list: a glyph (+, -, ~) and the text, which says the change in words too."""
    glyph = f'<span class="glyph" aria-hidden="true">{_GLYPH.get(change, "~")}</span>'
    out = [f'<li class="d-{change}" data-change="{change}"{extra}>{glyph}{html}']
    if inner:
        out += ["<ul>", *inner, "</ul>"]
    out.append("</li>")
    return out


def _fields_html(change: str, fields: list[ValueChange]) -> str:
    if change == CHANGED:
        return "; ".join(f"{escape(c.field)} {_value(c.old)} \u2192 {_value(c.new)}" for c in fields)
    return ", ".join(f"{escape(c.field)} {_value(c.new if change == ADDED else c.old)}" for c in fields)


def _rung_head(r: RungDiff) -> str:
    if r.change == ADDED:
        head = f"rung {r.new_number}"
    elif r.change == REMOVED:
        head = f"rung {r.old_number}"
    else:
        head = f"rung {r.old_number}" + (f" \u2192 {r.new_number}" if r.old_number != r.new_number else "")
    if r.title:
        head += f" \u201c{r.title}\u201d"
    return head


def _element_words(e: ElementDiff) -> str:
    if e.change == MOVED:
        text = f"<strong>{escape(e.element)}</strong> moved from wires <span class=\"wires\">{escape(_wires(e.old_wires))}</span> to <span class=\"wires\">{escape(_wires(e.new_wires))}</span>"
    else:
        text = f"<strong>{escape(e.element)}</strong> on wires <span class=\"wires\">{escape(_wires(e.new_wires or e.old_wires))}</span> {e.change}"
    if e.note:
        text += f" ({escape(e.note)})"
    return text


def _change_word(r: RungDiff) -> str:
    if r.change == MOVED:
        return "moved among the rungs (no electrical change)"
    return r.change + (", and moved among the rungs" if r.moved else "")


def _changes_section(changes: Changes, files: list[FileReport], index_of: dict[str, int]) -> list[str]:
    since = escape(changes.since)
    n_new = sum(1 for c in changes.files if c.diff.status == "added")
    parts = [f"{len(changes.files) - n_new} changed", f"{n_new} new", f"{len(changes.deleted)} deleted", f"{changes.unchanged} unchanged"]
    out = [
        '<section class="changes" id="changes" aria-labelledby="changes-title">',
        f'<div class="filehead"><h2 id="changes-title">Changes since {since} <small>commit {escape(changes.commit[:12])}</small></h2></div>',
        f'<p class="meta">The working tree compared with {since}, schematic by schematic: {", ".join(parts)}.</p>',
    ]
    if any(changed_rungs(c.diff)[0] or changed_rungs(c.diff)[1] for c in changes.files if c.diff.status == "modified"):
        out.append(
            f'<p class="key">Changed rungs are drawn before ({since}) and after (working tree), each with its own number. '
            f'<span class="swatch gone">dashed, \u2212</span> removed, or moved away (before); '
            f'<span class="swatch new">solid, +</span> added, or moved here (after). '
            "Findings are not marked on these drawings: see each file's own section below.</p>"
        )
    if not changes.files and not changes.deleted:
        out.append(f'<p class="nodraw">No schematic in this report changed since {since}.</p>')
    if changes.deleted:
        out.append(f"<h4>Deleted since {since}</h4>")
        out.append('<ul class="deleted">')
        for k, c in enumerate(changes.deleted, 1):
            sch = c.old
            what = f" \u2014 {_count_text(sch)}" if sch is not None else ""
            title = f" \u201c{escape(sch.title)}\u201d" if sch is not None and sch.title else ""
            notes = "".join(f' <span class="word">({escape(n)})</span>' for n in c.diff.notes)
            out.append(f'<li id="deleted-{k}" class="deleted" data-path="{escape(c.path)}"><code>{escape(c.path)}</code>{title}{what}{notes}</li>')
        out.append("</ul>")
    for c in changes.files:
        i = index_of.get(c.path)
        if i is None:  # pragma: no cover - the caller lists the report's own files
            continue
        report = files[i - 1]
        out.extend(_file_change(i, c, report, changes.since))
    out.append("</section>")
    return out


def _count_text(sch: Schematic) -> str:
    n_rungs, n_dev = len(sch.rungs), len(sch.devices)
    return f"{n_rungs} rung{'s' * (n_rungs != 1)}, {n_dev} device{'s' * (n_dev != 1)}"


def _file_change(i: int, c: FileChange, report: FileReport, since: str) -> list[str]:
    d = c.diff
    status = d.status if d.status in _STATUS_WORD else "modified"
    sch = c.new or c.old
    heading = escape(sch.title) if sch is not None and sch.title else escape(c.path)
    renamed = ""
    if d.old_path and d.new_path and d.old_path != d.new_path:
        renamed = f' <span class="word">renamed from <code>{escape(d.old_path)}</code></span>'
    out = [
        f'<section class="change" id="change-{i}" data-path="{escape(c.path)}" data-status="{escape(_status_word(d))}">',
        f'<div class="filehead"><h3>{heading} <small>{escape(c.path)}</small></h3>'
        f'<span class="status st-{status}">{escape(_status_word(d))}</span>{renamed}'
        f'<a class="tochange" href="#file-{i}">current drawing and findings</a></div>',
    ]
    for note in d.notes:
        out.append(f'<p class="note">Note: {escape(note.rstrip("."))}.</p>')
    if d.status == "unloadable":
        out.append("<h4>Does not load</h4>")
        out.append('<ul class="delta">')
        for side, diags in sorted(d.load_errors.items()):
            word = since if side == "old" else "working tree"
            for e in diags:
                out += _item(REMOVED if side == "old" else ADDED,
                             f'<span class="word">{escape(word)}:</span> {escape(e.path)}:{e.line}:{e.column}: {escape(e.message)}')
        out.append("</ul>")
        if d.text_diff:
            out.append("<h4>Line diff</h4>")
            out.append(f'<pre class="textdiff">{escape(chr(10).join(d.text_diff))}</pre>')
        out.append("</section>")
        return out
    if d.status == "added":
        what = _count_text(c.new) if c.new is not None else "a new file"
        out.append(f"<p>New since {escape(since)}: {what}. Its drawing and findings are in "
                   f'<a href="#file-{i}">its own section</a>.</p>')
        out.append("</section>")
        return out
    if not d.changed:
        out.append('<p class="nodraw">No electrical change (layout, comments or equal values only).</p>')
        out.append("</section>")
        return out

    items: list[str] = []
    for h in d.header:
        items += _item(CHANGED, f"{escape(h.field)} {_value(h.old)} \u2192 {_value(h.new)}")
    for s in d.supplies:
        items += _item(s.change, f"supply <strong>{escape(s.name)}</strong> <span class=\"word\">{s.change}</span> {_fields_html(s.change, s.fields)}")
    for dev in d.devices:
        items += _item(dev.change, f"<strong>{escape(dev.tag)}</strong> ({escape(dev.kind)}) <span class=\"word\">{dev.change}</span> {_fields_html(dev.change, dev.fields)}")
    old_set, new_set = (set(x) for x in changed_rungs(d))
    figures: dict[int, str] = {}
    for k, r in enumerate(d.rungs, 1):
        if (r.old_index is not None and r.old_index in old_set) or (r.new_index is not None and r.new_index in new_set):
            figures[k] = f"c{i}-r{k}"
    for k, r in enumerate(d.rungs, 1):
        inner = [x for f in r.fields for x in _item(CHANGED, f"{escape(f.field)} {_value(f.old)} \u2192 {_value(f.new)}")]
        inner += [x for e in r.elements for x in _item(e.change, _element_words(e))]
        link = f' <a href="#{figures[k]}">drawn below</a>' if k in figures else ""
        items += _item(r.change, f"{escape(_rung_head(r))} <span class=\"word\">{escape(_change_word(r))}</span>{link}", inner,
                     f' data-rung="{r.new_number if r.new_number is not None else r.old_number}"')
    for sc in d.scenarios:
        inner = [x for st in sc.steps for x in _item(st.change, f"step {st.step}: <code>{escape(st.text)}</code> <span class=\"word\">{st.change}</span>")]
        items += _item(sc.change, f"expect scenario \u201c{escape(sc.name)}\u201d <span class=\"word\">{sc.change}</span>", inner)
    if items:
        out += ["<h4>What changed</h4>", '<ul class="delta">', *items, "</ul>"]
    if d.wire_renames:
        out.append("<h4>Wires renumbered</h4>")
        out.append('<p class="word">Same connections under new numbers: not an electrical change.</p>')
        out.append('<ul class="renames">')
        for o, n in d.wire_renames.items():
            out.append(f'<li data-old="{escape(o)}" data-new="{escape(n)}">wire {escape(o)} \u2192 {escape(n)}</li>')
        out.append("</ul>")
    out += _findings_html(i, d, report, since)
    out.append("<h4>Changed rungs</h4>")
    if not figures:
        out.append('<p class="nodraw">No rung changed electrically: nothing to draw.</p>')
    for k, r in enumerate(d.rungs, 1):
        if k in figures:
            out += _rung_pair(figures[k], r, c, since)
    out.append("</section>")
    return out


def _findings_html(i: int, d: SchematicDiff, report: FileReport, since: str) -> list[str]:
    if not d.findings_compared:
        return []
    out = ["<h4>Findings</h4>"]
    if not d.findings:
        return out + ['<p class="word">None appeared or disappeared.</p>']
    rows = {(x.rule, x.message, x.path, x.line, x.column): f"f{i}-d{k}" for k, x in enumerate(sorted(set(report.diagnostics)), 1)}
    out.append('<ul class="delta findings-delta">')
    for f in d.findings:
        own = d.new_path if f.change == APPEARED else d.old_path
        where = f"line {f.line}" if f.path in ("", own) else f"{f.path} line {f.line}"
        if f.change == APPEARED:
            row = rows.get((f.rule, f.message, f.path, f.line, f.column))
            where = escape(where) + (f' \u00b7 <a href="#{row}">show</a>' if row else "")
        else:
            where = f"was {escape(where)} in {escape(since)}"
        out += _item(f.change, f'<span class="word">{f.change}:</span> <span class="sev-{escape(f.severity)}"><strong>{escape(f.severity)}</strong></span> '
                     f'{escape(f.message)} <code>{escape(f.rule)}</code> <span class="word">({where})</span>',
                     extra=f' data-rule="{escape(f.rule)}" data-severity="{escape(f.severity)}"')
    out.append("</ul>")
    return out


def _find(rung, text: str, wires: tuple[str, str] | None, line: int | None):
    """The element of ``rung`` that an ElementDiff names: by text and wires, and line when several match."""
    found = [e for e in rung.elements if e.text == text and (e.left, e.right) == wires]
    exact = [e for e in found if e.loc.line == line]
    return (exact or found or [None])[0]


def _marks(r: RungDiff, sch: Schematic, side: str) -> dict[int, Mark]:
    """The change marks for one revision's drawing of a changed rung."""
    index = r.old_index if side == "old" else r.new_index
    rung = sch.rungs[index]
    marks: dict[int, Mark] = {}
    if r.change in (ADDED, REMOVED):
        change = "removed" if side == "old" else "added"
        return {e.index: Mark(change, change) for e in rung.elements}
    for e in r.elements:
        if side == "old" and e.change in (REMOVED, MOVED):
            el = _find(rung, e.element, e.old_wires, e.old_line)
            mark = Mark("removed", "removed") if e.change == REMOVED else Mark("moved-from", f"moved to wires {_wires(e.new_wires)}")
        elif side == "new" and e.change in (ADDED, MOVED):
            el = _find(rung, e.element, e.new_wires, e.new_line)
            mark = Mark("added", "added") if e.change == ADDED else Mark("moved-to", f"moved from wires {_wires(e.old_wires)}")
        else:
            continue
        if el is not None and el.index not in marks:
            marks[el.index] = mark
    return marks


def _rung_pair(fig_id: str, r: RungDiff, c: FileChange, since: str) -> list[str]:
    """One changed rung: its drawing before and after, on the same grid of columns."""
    sides: dict[str, Drawing | None] = {"old": None, "new": None}
    args: dict[str, tuple[Schematic, int, dict[int, Mark]]] = {}
    for side, sch, index in (("old", c.old, r.old_index), ("new", c.new, r.new_index)):
        if sch is not None and index is not None and index < len(sch.rungs):
            args[side] = (sch, index, _marks(r, sch, side))

    def draw(side: str, columns: int = 0) -> Drawing:
        sch, index, marks = args[side]
        return layout(sch, (), id_prefix=f"{fig_id}-{side}-", legend=False, header=False, rungs=[index], marks=marks,
                      min_columns=columns)
    for side in args:
        sides[side] = draw(side)
    drawn = [dr for dr in sides.values() if dr is not None]
    if len(drawn) == 2 and drawn[0].columns != drawn[1].columns:
        widest = max(dr.columns for dr in drawn)
        for side in args:
            if sides[side].columns != widest:
                sides[side] = draw(side, widest)
    words = {"old": (f"Before \u00b7 {since}", r.old_number), "new": ("After \u00b7 working tree", r.new_number)}
    absent = {"old": f"Not in {since}: the rung is new.", "new": "Not in the working tree: the rung was removed."}
    out = [
        f'<figure class="rungpair" id="{fig_id}" data-old-rung="{r.old_number if r.old_number is not None else ""}"'
        f' data-new-rung="{r.new_number if r.new_number is not None else ""}" data-change="{r.change}">',
        f"<figcaption>{escape(_rung_head(r))} \u2014 {escape(_change_word(r))}</figcaption>",
        '<div class="pair">',
    ]
    for side, cls in (("old", "before"), ("new", "after")):
        label, number = words[side]
        dr = sides[side]
        head = f"{escape(label)}" + (f" \u00b7 rung {number}" if number is not None else "")
        out.append(f'<div class="pane {cls}" data-side="{cls}"><p class="panehead">{head}</p>')
        if dr is not None:
            out.append(f'<div class="panedrawing">{dr.svg}</div>')
        elif number is None:
            out.append(f'<p class="nodraw">{escape(absent[side])}</p>')
        else:
            out.append('<p class="nodraw">Not drawn: this revision does not load.</p>')
        out.append("</div>")
    out += ["</div>", "</figure>"]
    return out
