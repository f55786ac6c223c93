"""``ctllint xref FILE``: the coil cross-reference, where each coil's contacts are used against those declared.

``xref_rows`` is also what the language server's hover shows for a coil (``commands.editor.editing``).
"""
from __future__ import annotations

import argparse
import sys

from ctllint.commands._shared import one_file, refuse_unloadable
from ctllint.commands.base import EXIT_OK, add_config_args, add_plugins_arg, command, printable
from ctllint.reading.model import Schematic


XREF_HELP = """\
For each relay, timer, contactor and starter: the rung of its coil, the
rungs where its NO and NC contacts are used, and the contacts used against
those its 'contacts' field declares ("available: not declared" when the
field is absent). A contact used twice in one rung is listed twice. A
timer's instantaneous contacts (instant-NO, instant-NC) are listed with its
NO and NC contacts and checked against their own counts in 'contacts'.
TERMINALS gives the coil's terminals and each contact's, in the order of
the rungs listed (written in the file, or assigned by EN 50005 numbering:
coil A1-A2, NO x3-x4, NC x1-x2, timed x7-x8 and x5-x6).

exit status: 0 shown, 1 the file does not load, 2 usage error.
"""


def _configure_xref(p: argparse.ArgumentParser) -> None:
    p.description = XREF_HELP
    p.add_argument("path", metavar="FILE", help="a schematic file (*.ctl.yaml)")
    add_config_args(p)
    add_plugins_arg(p)


def _rungs_text(numbers: list[int]) -> str:
    return ", ".join(map(str, numbers)) if numbers else "-"


def xref_rows(sch: Schematic, coil_kinds: set[str], kinds=None) -> list[dict[str, str]]:
    """One row per device of a coil kind that the rungs use or declare."""
    from ctllint.output.draw import coil_uses
    from ctllint.reading.terminals import assign

    uses = coil_uses(sch)
    marks = assign(sch, kinds)
    numbers = {r.index: r.number for r in sch.rungs}
    coil_rung: dict[str, list[int]] = {}
    terminals: dict[str, dict[str, list[tuple[int, int, str]]]] = {}
    # a timer's instantaneous contacts, counted apart from its timed NO/NC as `contacts` declares them
    instant: dict[str, dict[str, int]] = {}
    for el in sch.elements:
        if el.part == "coil" or (el.part in ("set", "power", "run") and el.role == "load"):  # a latching relay's set coil, a safety relay's power, a drive's run input
            coil_rung.setdefault(el.tag, []).append(numbers[el.rung])
        elif el.part in ("instant-NO", "instant-NC"):
            counts = instant.setdefault(el.tag, {})
            counts[el.part] = counts.get(el.part, 0) + 1
        m = marks.get(el.index)
        if m is not None and el.part in ("coil", "set", "reset", "NO", "NC", "instant-NO", "instant-NC"):
            terminals.setdefault(el.tag, {}).setdefault(el.part, []).append((numbers[el.rung], el.index, m.pair))
    rows = []
    tags = [t for t, d in sch.devices.items() if d.kind in coil_kinds]
    tags.sort(key=lambda t: (min(coil_rung.get(t, [10**9])), t))
    for tag in tags:
        dev = sch.devices[tag]
        use = uses.get(tag)
        no = use.no if use else []
        nc = use.nc if use else []
        count = dev.get("contacts")
        if count is None:
            available, status = "not declared", ""
        else:
            bits = []
            if count.no or not count.changeover:
                bits.append(f"{count.no} NO")
            if count.nc or not count.changeover:
                bits.append(f"{count.nc} NC")
            if count.changeover:
                bits.append(f"{count.changeover} changeover")
            for name, n in (("instant-NO", count.instant_no), ("instant-NC", count.instant_nc)):
                if n:
                    bits.append(f"{n} {name}")
            available = ", ".join(bits)
            used = instant.get(tag, {})
            inst_no, inst_nc = used.get("instant-NO", 0), used.get("instant-NC", 0)
            no_max, nc_max = count.available()
            extra = [
                (max(0, len(no) - inst_no - no_max), "NO"),
                (max(0, len(nc) - inst_nc - nc_max), "NC"),
                (max(0, inst_no - count.instant_no), "instant-NO"),
                (max(0, inst_nc - count.instant_nc), "instant-NC"),
            ]
            over = [f"{n} {name} too many" for n, name in extra if n]
            status = "OVER: " + ", ".join(over) if over else "ok"
        rows.append({
            "coil": tag,
            "kind": dev.kind,
            "rung": _rungs_text(coil_rung.get(tag, [])) if tag in coil_rung else "no coil",
            "no": f"{len(no)}: {_rungs_text(no)}" if no else ("  ".join(f"{name}: {_rungs_text(r)}" for name, r in use.other.items())
                                                               if use and use.other else "0"),
            "nc": f"{len(nc)}: {_rungs_text(nc)}" if nc else "0",
            "terminals": "  ".join(
                (f"{part} " if part != "coil" else "") + " ".join(t for _, _, t in sorted(terminals[tag][part]))
                for part in ("coil", "set", "reset", "NO", "NC", "instant-NO", "instant-NC") if part in terminals.get(tag, {})) or "-",
            "available": available,
            "status": status,
        })
    return rows


def render_xref(rows: list[dict[str, str]]) -> str:
    heads = {"coil": "COIL", "kind": "KIND", "rung": "COIL RUNG", "no": "NO USED (RUNGS)", "nc": "NC USED (RUNGS)", "terminals": "TERMINALS", "available": "AVAILABLE", "status": ""}
    if not rows:
        return "no relay, timer, contactor or starter in this file\n"
    rows = [{k: printable(text) for k, text in r.items()} for r in rows]  # tags are the file's text: no terminal control
    keys = list(heads)
    widths = {k: max(len(heads[k]), *(len(r[k]) for r in rows)) for k in keys}
    lines = ["  ".join(heads[k].ljust(widths[k]) for k in keys).rstrip()]
    for r in rows:
        lines.append("  ".join(r[k].ljust(widths[k]) for k in keys).rstrip())
    return "\n".join(lines) + "\n"


def _run_xref(args: argparse.Namespace) -> int:
    loaded, shown, cfg, host = one_file(args, args.path)
    refused = refuse_unloadable(loaded)
    if refused is not None:
        return refused
    coil_kinds = {k.name for k in host.kinds.kinds.values() if k.coil}
    sys.stdout.write(render_xref(xref_rows(loaded.schematic, coil_kinds, host.kinds)))
    return EXIT_OK


command("xref", "coil cross-reference: where each coil's NO and NC contacts are used, against the contacts available")((_configure_xref, _run_xref))
