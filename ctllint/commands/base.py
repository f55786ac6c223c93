"""What every command module shares: the registry, the exit statuses, the common arguments and ``setup``.

A command module registers its ``(configure, run)`` pair with
``command(name, help)`` and takes its helpers from here. It never imports
``cli``: ``cli`` builds the parser from the registry and imports the
command modules, so the commands and the parser do not import each other.
"""
from __future__ import annotations

import argparse
import os
import sys
from typing import Callable

from ctllint.checking.config import Config, ConfigError, find_config, load_config, resolve_rules  # noqa: F401
from ctllint.checking.host import PluginHost, RuleSettings
from ctllint.checking.usage import UsageError, printable, printable_diagnostic, write_output  # noqa: F401 - the commands' shared names
from ctllint.output import report as _formats
from ctllint.reading.budget import set_limit  # noqa: F401
from ctllint.reading.model import Severity

EXIT_OK, EXIT_FINDINGS, EXIT_USAGE, EXIT_INTERNAL = 0, 1, 2, 3

# The built-in output formats, registered like a plugin (see PluginHost.create).
BUILTIN_PLUGINS = (("ctllint.report", _formats),)


def exit_note(fail_on: Severity) -> str:
    """What exit status 1 means, said beside the summary: a run that found mistakes did not fail to run."""
    found = {Severity.ERROR: "errors", Severity.WARNING: "warnings or errors", Severity.INFO: "findings"}[fail_on]
    return f"exit status 1: the check ran and found {found}"


COMMANDS: dict[str, tuple[Callable[[argparse.ArgumentParser], None], Callable[[argparse.Namespace], int], str]] = {}


def command(name: str, help: str):
    def wrap(pair):
        COMMANDS[name] = (pair[0], pair[1], help)
        return pair
    return wrap


def add_config_args(p: argparse.ArgumentParser) -> None:
    p.add_argument("--config", metavar="FILE", help="configuration file (default: .ctllint.yaml or [tool.ctllint] in pyproject.toml, found by walking up from the current folder)")


def add_quiet_arg(p: argparse.ArgumentParser) -> None:
    p.add_argument("-q", "--quiet", action="store_true",
                   help="no progress line on a long run (it shows only on a terminal, never in pipes, CI or with NO_COLOR set)")


def add_plugins_arg(p: argparse.ArgumentParser) -> None:
    p.add_argument("--plugins", action="store_true",
                   help="also load the local plugins named under plugins: in the configuration (Python code of the repository; "
                        "only for a repository you trust). Without it they are not run")


def setup(args: argparse.Namespace, trust_local: bool | None = None) -> tuple[Config, PluginHost]:
    """Configuration and plugins for a command.

    Local plugins (``plugins:`` in the configuration) are Python files of the
    repository: running them is running the repository's code. ``check``,
    ``rules`` and ``explain`` load them and say so on standard error; the
    commands that only show a circuit (diff, draw, report, xref, simulate,
    schema) load them only with ``--plugins`` (``trust_local`` False unless
    the flag was given), and say when they were left out.
    """
    path = getattr(args, "config", None)
    if path is not None and not os.path.isfile(path):
        raise UsageError(f"ctllint: configuration file '{path}' does not exist")
    cfg = load_config(path or find_config(os.getcwd()))
    if trust_local is None:
        trust_local = bool(getattr(args, "plugins", False))
    where = _config_shown(cfg.path) if cfg.plugins else ""
    if cfg.plugins and not trust_local:
        print(f"ctllint: local plugins named in {where} not loaded (pass --plugins to run them): "
              f"{', '.join(printable(p) for p in cfg.plugins)}", file=sys.stderr)
        cfg.untrusted_plugins, cfg.plugins = cfg.plugins, []
    set_limit(cfg.limits.command_seconds)
    host = PluginHost.create(local_plugins=cfg.plugins, builtin=BUILTIN_PLUGINS)
    if cfg.plugins:
        print(f"ctllint: loaded local plugins from {where}: {', '.join(printable(p) for p in cfg.plugins)}", file=sys.stderr)
    return cfg, host


def _config_shown(path: str | None) -> str:
    from ctllint.checking.discover import display_path

    return printable(display_path(path)) if path else "the configuration"


def settings_for(cfg: Config, host: PluginHost, select: list[str] | None, ignore: list[str]) -> RuleSettings:
    try:
        enabled, severities, options = resolve_rules(cfg, host.rules, select, ignore, lenient=bool(cfg.untrusted_plugins))
    except ValueError as exc:
        raise UsageError(f"ctllint: {exc}") from None
    return RuleSettings(enabled, severities, options, time_limit=cfg.limits.plugin_seconds)


def split_names(values: list[str] | None) -> list[str]:
    out: list[str] = []
    for v in values or []:
        out.extend(x.strip() for x in v.split(",") if x.strip())
    return out
