"""Hook specifications: the whole surface a ctllint plugin can implement.

Each hook's docstring is its reference documentation. Implementations are
marked with ``ctllint.hookimpl`` and may take any subset of a hook's
arguments. Plugins are found through the ``ctllint`` entry-point group (the
built-in rules register that same way) and through local plugin paths named
in configuration.
"""
from __future__ import annotations

from typing import Iterable

import pluggy

from ctllint.api import CheckContext, Finding, OutputFormat, Rule
from ctllint.reading.kinds import DeviceKind

PROJECT = "ctllint"
hookspec = pluggy.HookspecMarker(PROJECT)
hookimpl = pluggy.HookimplMarker(PROJECT)


@hookspec
def ctllint_rules() -> Iterable[Rule]:
    """Register rules.

    Return an iterable of :class:`ctllint.api.Rule`. Rule names must be
    unique across all plugins; a clash is reported as ``plugin-error``.
    The host fills in ``Rule.plugin`` with the plugin's name.
    """


@hookspec
def ctllint_device_kinds() -> Iterable[DeviceKind]:
    """Register device kinds beyond the built-in ones.

    Return an iterable of :class:`ctllint.reading.kinds.DeviceKind`. The loader then
    accepts devices of that kind with the fields the kind declares, and the
    JSON Schema includes them. A kind may not replace a built-in kind.
    """


@hookspec
def ctllint_output_formats() -> Iterable[OutputFormat]:
    """Register output formats for ``ctllint check --format NAME``.

    Return an iterable of :class:`ctllint.api.OutputFormat`. The built-in
    formats (text, json, sarif, junit) are registered through this hook too.
    """


@hookspec
def ctllint_check(context: CheckContext) -> Iterable[Finding] | None:
    """Check a whole schematic outside any single rule's ``check``.

    Called once per schematic that loaded without format errors, with
    ``context.rule`` set to None. Return ``(rule_name, Finding)`` pairs
    naming rules this plugin registered; pairs naming other rules are
    reported as ``plugin-error``. Most plugins need only ``ctllint_rules``.

    :param context: the schematic, its circuit analyses, and an empty options map.
    """
