"""``ctllint export KIND FILE``: the panel shop's documents as CSV."""
from __future__ import annotations

import argparse

from ctllint.commands.base import EXIT_OK, command, write_output
from ctllint.commands._shared import one_file, refuse_unloadable

EXPORT_HELP = """\
Write one of a schematic's panel documents as CSV (a header row, one row
per line, "\\n" line ends, in a fixed order: the same file gives the same
bytes, an edit a small diff):

  wires      the wire list: one row per conductor to install, with its wire
             number, from device:terminal, to device:terminal, and where it
             runs (panel, bridge on the terminal strip, field). Hot rails
             first, wires by number, common rails last; within a wire a
             daisy chain in drawing order, then the strip, then the field.
  bom        the bill of materials: one row per kind and rating, with the
             quantity and the tags.
  terminals  the terminal plan: one row per terminal-strip point, with the
             wire, the field device and terminal that land on it, and the
             panel terminal (or bridged point) the wire comes from.

Field devices (outside the panel) are those with 'location: field', and,
where a device does not say, pushbuttons, limit, pressure, temperature,
float, flow and foot switches, solenoids, motors and heaters. Terminal
numbers are those written in the paths (CR1.NO 13-14) or assigned by
EN 50005 numbering (see the README).

Check the documents against the drawing before building: they are made
from the file as written.

exit status: 0 written, 1 the file does not load (its format findings are
printed), 2 usage or configuration error.
"""


def _configure(p: argparse.ArgumentParser) -> None:
    from ctllint.output.export import DEFAULT_STRIP, KINDS

    p.description = EXPORT_HELP
    p.formatter_class = argparse.RawDescriptionHelpFormatter
    p.add_argument("kind", metavar="KIND", choices=KINDS, help="which document: " + ", ".join(KINDS))
    p.add_argument("path", metavar="FILE", help="a schematic file (*.ctl.yaml)")
    p.add_argument("-o", "--output", metavar="OUT", help="write to OUT (atomically) instead of standard output")
    p.add_argument("--strip", default=DEFAULT_STRIP, metavar="NAME", help=f"name of the terminal strip field wires pass (default {DEFAULT_STRIP})")
    from ctllint.commands.base import add_config_args

    add_config_args(p)


def _run(args: argparse.Namespace) -> int:
    from ctllint.output.export import export

    loaded, _shown, _cfg, host = one_file(args, args.path)
    refused = refuse_unloadable(loaded)
    if refused is not None:
        return refused
    write_output(export(args.kind, loaded.schematic, host.kinds, args.strip), args.output)
    import sys

    from ctllint.output.report import SAFETY_NOTE

    print(SAFETY_NOTE, file=sys.stderr)  # on standard error: the CSV stays a plain table
    return EXIT_OK


command("export", "write a panel document as CSV: the wire list, the bill of materials or the terminal plan")((_configure, _run))
