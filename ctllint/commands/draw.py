"""``ctllint draw FILE``: a schematic's ladder as an SVG drawing, findings marked on their elements."""
from __future__ import annotations

import argparse

from ctllint.reading.budget import work
from ctllint.commands._shared import add_rule_args, one_file, refuse_unloadable
from ctllint.commands.base import EXIT_OK, add_config_args, add_plugins_arg, command, settings_for, split_names, write_output
from ctllint.checking.engine import Checker
from ctllint.reading.loader import LoadResult
from ctllint.reading.model import Diagnostic


DRAW_HELP = """\
Draw a schematic's ladder as a plain SVG file.

The drawing shows one pair of rails per supply (hot at left, common at
right, labelled with their wire names), the rungs numbered as in findings,
each wire's number on its wire, trade symbols (NO contact: two bars; NC
contact: two bars with a slash; coil: a circle; pilot light: a circle with
a cross; other loads: a circle with a letter; fuse: a small rectangle with
the wire through it), parallel paths under the path they bridge, and right
of each coil the rungs where its contacts are used ("NO 2, 5  NC 7").

The file is checked with the configured rules, and every finding is marked
on its element: an outline in the colour of its severity (red error, amber
warning, blue info) and the rule name under it. Findings that point at
nothing drawn are listed under the drawing.

Elements carry ids and data attributes (id="el-12", data-element="M1.coil",
data-line="14", data-rung="3") for tools that read the drawing.

exit status: 0 drawn, 1 the file does not load (its format findings are
printed) or the work ran past limits.command_seconds, 2 usage or
configuration error.
"""


def _configure_draw(p: argparse.ArgumentParser) -> None:
    p.description = DRAW_HELP
    p.add_argument("path", metavar="FILE", help="a schematic file (*.ctl.yaml)")
    p.add_argument("-o", "--output", metavar="OUT.svg", help="write the SVG to OUT.svg (atomically) instead of standard output")
    p.add_argument("--no-findings", action="store_true", help="draw the circuit alone: do not run the rules")
    p.add_argument("--no-legend", action="store_true", help="leave out the list of findings and the safety note under the drawing")
    add_rule_args(p)
    add_config_args(p)
    add_plugins_arg(p)


def _run_draw(args: argparse.Namespace) -> int:
    loaded, shown, cfg, host = one_file(args, args.path)
    with work(f"checking and drawing {shown}"):
        return _draw(args, loaded, shown, cfg, host)


def _draw(args: argparse.Namespace, loaded: LoadResult, shown: str, cfg, host) -> int:
    from ctllint.output.draw import layout

    refused = refuse_unloadable(loaded)
    if refused is not None:
        return refused
    diagnostics: list[Diagnostic] = []
    if not args.no_findings:
        settings = settings_for(cfg, host, split_names(args.select) or None, split_names(args.ignore))
        diagnostics = Checker(host, settings, cfg.limits).check_file(args.path, display_path=shown).diagnostics
    drawing = layout(loaded.schematic, diagnostics, legend=not args.no_legend, kind_registry=host.kinds)
    write_output(drawing.svg, args.output)
    return EXIT_OK


command("draw", "draw a schematic as SVG: rails, numbered rungs, wire numbers, symbols, coil cross-references, findings marked")((_configure_draw, _run_draw))
