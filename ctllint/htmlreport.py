"""One self-contained HTML page: every schematic's drawing and findings.

The page has no external resources (inline CSS, inline SVG, no scripts,
no fonts to fetch), so it can be mailed, archived as a CI artifact or
opened offline. It holds, in order: the safety note, a summary table (one
row per file, counts by severity), then per file its findings and its
drawing. Each finding links to its element in the drawing (``#f1-el-12``)
and each rule name in the drawing links back to its row in the table
(``#f1-d3``). The page carries no date and no absolute path, so the same
files give the same bytes.
"""
from __future__ import annotations

from dataclasses import dataclass
from html import escape

from . import __version__
from .draw import SEVERITY_COLOUR, SEVERITY_TINT, layout
from .model import Diagnostic, Schematic, Severity
from .report import SAFETY_NOTE


@dataclass
class FileReport:
    """One checked file: its display path, its schematic when it loaded, its findings."""

    path: str
    schematic: Schematic | None
    diagnostics: list[Diagnostic]


def _counts(diagnostics: list[Diagnostic]) -> dict[Severity, int]:
    return {s: sum(1 for d in diagnostics if d.severity == s) for s in Severity}


def _plural(n: int, word: str) -> str:
    return f"{n} {word}{'' if n == 1 or word == 'info' else 's'}"


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
.drawing .el,.drawing .section,.findings tr{scroll-margin-top:140px}
.drawing a text{text-decoration:underline}
footer{color:#5c6670;padding-bottom:32px;font-size:13px}
"""


def render_html(files: list[FileReport], title: str = "ctllint report") -> str:
    """The report page for ``files`` (in the order given)."""
    css = CSS
    for sev, colour in SEVERITY_COLOUR.items():
        css += f".sev-{sev}{{color:{colour}}}\n.badge.sev-{sev}{{border-color:{colour};background:{SEVERITY_TINT[sev]}}}\n"
    every = [d for f in files for d in f.diagnostics]
    total = _counts(every)
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
        f'<p class="meta">{_plural(len(files), "file")} checked \u00b7 '
        f'{_plural(total[Severity.ERROR], "error")}, {_plural(total[Severity.WARNING], "warning")}, {_plural(total[Severity.INFO], "info")}'
        f" \u00b7 ctllint {escape(__version__)}</p>",
        f'<p class="safety" id="safety-note" role="note"><strong>Safety.</strong> {escape(SAFETY_NOTE)}</p>',
        "</header>",
        "<main>",
        '<table class="summary" id="summary">',
        "<thead><tr><th>file</th><th>title</th><th>errors</th><th>warnings</th><th>info</th></tr></thead>",
        "<tbody>",
    ]
    for i, f in enumerate(files, 1):
        c = _counts(f.diagnostics)
        name = f.schematic.title if f.schematic and f.schematic.title else ""
        cells = "".join(
            f'<td class="num{" zero" if not c[s] else ""} sev-{s if c[s] else "none"}" data-severity="{s}">{c[s]}</td>'
            for s in (Severity.ERROR, Severity.WARNING, Severity.INFO)
        )
        out.append(f'<tr data-path="{escape(f.path)}"><td><a href="#file-{i}">{escape(f.path)}</a></td><td>{escape(name)}</td>{cells}</tr>')
    out.append("</tbody>")
    out.append(
        "<tfoot><tr><td>total</td><td></td>"
        + "".join(f'<td class="num">{total[s]}</td>' for s in (Severity.ERROR, Severity.WARNING, Severity.INFO))
        + "</tr></tfoot>"
    )
    out.append("</table>")

    for i, f in enumerate(files, 1):
        out.extend(_file_section(i, f))
    out += [
        "</main>",
        f'<footer><p>{escape(SAFETY_NOTE)}</p><p>Made by ctllint {escape(__version__)}. '
        "Each finding links to its element in the drawing; each rule name in a drawing links back to its finding.</p></footer>",
        "</body>",
        "</html>",
    ]
    return "\n".join(out) + "\n"


def _file_section(i: int, f: FileReport) -> list[str]:
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
        f'<span class="counts">{_badges(_counts(diagnostics))}</span></div>',
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
    else:
        out.append('<p class="nodraw">Not drawn: the file does not load (see its format findings).</p>')
    out.append("</section>")
    return out
