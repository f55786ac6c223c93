"""``ctllint schema``: a JSON Schema of the file format (with the plugins' device kinds) for editors."""
from __future__ import annotations

import argparse
import json

from ctllint.commands.base import EXIT_OK, add_config_args, add_plugins_arg, command, setup, write_output


def _configure_schema(p: argparse.ArgumentParser) -> None:
    p.add_argument("-o", "--output", metavar="FILE", help="write the schema to FILE instead of standard output")
    add_config_args(p)
    add_plugins_arg(p)


def _run_schema(args: argparse.Namespace) -> int:
    from ctllint.output.schema import build_schema

    _, host = setup(args)
    write_output(json.dumps(build_schema(host.kinds), indent=2, sort_keys=False) + "\n", args.output)
    return EXIT_OK


command("schema", "print a JSON Schema (draft-07) of the file format for editors")((_configure_schema, _run_schema))
