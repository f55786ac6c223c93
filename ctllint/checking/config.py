"""Configuration: ``.ctllint.yaml`` or ``[tool.ctllint]`` in pyproject.toml.

Found by walking up from the current folder (the first folder holding
either wins; ``.ctllint.yaml`` before pyproject.toml), or named with
``--config``. Every problem is a ``ConfigError`` naming the file and line,
which the CLI turns into exit status 2.

Keys::

    select: [rule or plugin names]     # default: every rule
    ignore: [rule or plugin names]
    fail-on: error | warning | info
    rules:
      switch-fan-out: {severity: error, max_inductive: 2}
    plugins: [site_rules.py, tools/ctl_plugins/]   # local plugin paths
    exclude: ["legacy/**", "*.draft.ctl.yaml"]
    limits: {max_file_bytes: 33554432, max_depth: 64, max_nodes: 11184810,
             max_elements: 1000000, plugin_seconds: 60, command_seconds: 300}
    cache: true            # or false, or a folder
    jobs: 2
    safety-note: true      # false leaves the safety note out of check's output
"""
from __future__ import annotations

import math
import os
import re
from dataclasses import dataclass, field, fields
from typing import Any

from ctllint.checking.core_rules import CORE_RULE_NAMES
from ctllint.reading.model import Severity
from ctllint.reading.yamlsafe import Limits, YamlProblem, check_tree, compose, pos, scalar_value

CONFIG_NAMES = (".ctllint.yaml", ".ctllint.yml")
KEYS = ("select", "ignore", "fail-on", "rules", "plugins", "exclude", "limits", "cache", "jobs", "safety-note")


class ConfigError(Exception):
    def __init__(self, path: str, line: int, message: str):
        super().__init__(f"{path}:{line}: {message}")
        self.path = path
        self.line = line
        self.message = message


@dataclass
class Config:
    path: str | None = None
    folder: str = "."
    select: list[str] | None = None
    ignore: list[str] = field(default_factory=list)
    fail_on: str | None = None
    rules: dict[str, dict[str, Any]] = field(default_factory=dict)
    plugins: list[str] = field(default_factory=list)
    exclude: list[str] = field(default_factory=list)
    limits: Limits = field(default_factory=Limits)
    cache: bool | str = True
    jobs: int | None = None
    untrusted_plugins: list[str] = field(default_factory=list)  # named under plugins: but not loaded (no --plugins)
    safety_note: bool = True
    lines: dict[str, int] = field(default_factory=dict)  # "rules.NAME.KEY" -> line, for messages

    def line_of(self, key: str) -> int:
        return self.lines.get(key, 1)


def find_config(start: str) -> str | None:
    folder = os.path.abspath(start)
    while True:
        for name in CONFIG_NAMES:
            candidate = os.path.join(folder, name)
            if os.path.isfile(candidate):
                return candidate
        pyproject = os.path.join(folder, "pyproject.toml")
        if os.path.isfile(pyproject) and _has_tool_table(pyproject):
            return pyproject
        parent = os.path.dirname(folder)
        if parent == folder:
            return None
        folder = parent


def _has_tool_table(path: str) -> bool:
    """Whether pyproject.toml has a ``[tool.ctllint]`` table, looked for in its bytes.

    Any pyproject.toml above the current folder is looked at, so one that is
    not UTF-8 (or not TOML at all) and names no ctllint table is passed
    over; one that does name it is read, and its problem reported (exit 2).
    """
    from ctllint.reading.safeio import ReadProblem, read_bytes

    try:
        return re.search(rb"^\s*\[tool\.ctllint(\.|\])", read_bytes(path), re.M) is not None
    except ReadProblem:  # not a regular file, or above limits.max_file_bytes' default: not ours to read
        return False


def load_config(path: str | None) -> Config:
    if path is None:
        return Config()
    if not os.path.isfile(path):
        raise ConfigError(path, 1, "configuration file does not exist")
    if path.endswith(".toml"):
        data, lines = _read_toml(path)
    else:
        data, lines = _read_yaml(path)
    return _build(path, data, lines)


def _read_toml(path: str) -> tuple[dict[str, Any], dict[str, int]]:
    import tomllib

    raw = _read_bytes(path)
    try:
        doc = tomllib.loads(raw.decode("utf-8"))
    except (tomllib.TOMLDecodeError, UnicodeDecodeError) as exc:
        m = re.search(r"line (\d+)", str(exc))
        raise ConfigError(path, int(m.group(1)) if m else 1, f"TOML: {exc}") from None
    tool = doc.get("tool", {})
    if not isinstance(tool, dict):
        raise ConfigError(path, 1, "'tool' must be a table ([tool.ctllint] holds ctllint's settings)")
    data = tool.get("ctllint", {})
    text = raw.decode("utf-8").splitlines()
    lines: dict[str, int] = {}
    section = ""
    for i, line in enumerate(text, start=1):
        m = re.match(r"^\s*\[([^\]]+)\]", line)
        if m:
            section = m.group(1).strip()
            if section.startswith("tool.ctllint.rules."):
                lines[f"rules.{section.split('.', 3)[3].strip(chr(34))}"] = i
            continue
        m = re.match(r"^\s*\"?([A-Za-z0-9_.-]+)\"?\s*=", line)
        if m and section.startswith("tool.ctllint"):
            key = m.group(1)
            prefix = section[len("tool.ctllint"):].lstrip(".")
            prefix = prefix.replace('"', "")
            full = f"{prefix}.{key}" if prefix else key
            lines.setdefault(full, i)
    return data, lines


def _read_bytes(path: str) -> bytes:
    """A configuration file's bytes: a regular file within the default size limit, else a ConfigError."""
    from ctllint.reading.safeio import ReadProblem, read_bytes

    try:
        return read_bytes(path)
    except ReadProblem as exc:
        raise ConfigError(path, 1, f"cannot read the configuration: {exc}") from None


def _read_yaml(path: str) -> tuple[dict[str, Any], dict[str, int]]:
    try:
        text = _read_bytes(path).decode("utf-8")
        node = compose(text, Limits())
        if node is None:
            return {}, {}
        check_tree(node, Limits())
    except YamlProblem as exc:
        raise ConfigError(path, exc.line, exc.message) from None
    except (OSError, UnicodeDecodeError) as exc:
        raise ConfigError(path, 1, f"cannot read: {exc}") from None
    lines: dict[str, int] = {}
    return _plain(node, "", lines, path), lines


def _plain(node: Any, prefix: str, lines: dict[str, int], path: str) -> Any:
    from ctllint.reading.yamlsafe import MappingNode, SequenceNode

    if isinstance(node, MappingNode):
        out = {}
        for k, v in node.value:
            key = str(scalar_value(k))
            full = f"{prefix}.{key}" if prefix else key
            lines[full] = pos(k)[0]
            out[key] = _plain(v, full, lines, path)
        return out
    if isinstance(node, SequenceNode):
        return [_plain(v, prefix, lines, path) for v in node.value]
    return scalar_value(node)


def _build(path: str, data: Any, lines: dict[str, int]) -> Config:
    cfg = Config(path=path, folder=os.path.dirname(os.path.abspath(path)), lines=lines)
    if not isinstance(data, dict):
        raise ConfigError(path, 1, "configuration must be a mapping of keys")

    def fail(key: str, message: str):
        raise ConfigError(path, lines.get(key, 1), message)

    def names(key: str) -> list[str]:
        value = data[key]
        if isinstance(value, str):
            value = [value]
        if not isinstance(value, list) or not all(isinstance(v, str) for v in value):
            fail(key, f"'{key}' must be a list of rule or plugin names")
        return value

    for key in data:
        if key not in KEYS:
            fail(key, f"unknown configuration key '{key}' (allowed: {', '.join(KEYS)})")
    if "select" in data:
        cfg.select = names("select")
    if "ignore" in data:
        cfg.ignore = names("ignore")
    if "fail-on" in data:
        if data["fail-on"] not in ("error", "warning", "info"):
            fail("fail-on", "'fail-on' must be error, warning or info")
        cfg.fail_on = data["fail-on"]
    if "rules" in data:
        if not isinstance(data["rules"], dict):
            fail("rules", "'rules' must map rule names to their settings")
        for name, settings in data["rules"].items():
            if not isinstance(settings, dict):
                fail(f"rules.{name}", f"settings of rule '{name}' must be a mapping, e.g. {{severity: warning}}")
            cfg.rules[name] = settings
    for key in ("plugins", "exclude"):
        if key in data:
            value = data[key]
            if not isinstance(value, list) or not all(isinstance(v, str) for v in value):
                fail(key, f"'{key}' must be a list of paths")
            setattr(cfg, key, value)
    cfg.plugins = [p if os.path.isabs(p) else os.path.normpath(os.path.join(cfg.folder, p)) for p in cfg.plugins]
    for p in cfg.plugins:
        if not os.path.exists(p):
            fail("plugins", f"local plugin '{p}' does not exist")
    if "limits" in data:
        given = data["limits"]
        if not isinstance(given, dict):
            fail("limits", "'limits' must be a mapping")
        known = {f.name: f for f in fields(Limits)}
        values = {}
        for k, v in given.items():
            if k not in known:
                fail(f"limits.{k}", f"unknown limit '{k}' (allowed: {', '.join(known)})")
            if isinstance(v, bool) or not isinstance(v, (int, float)) or not v > 0:
                fail(f"limits.{k}", f"limit '{k}' must be a positive number")
            if not math.isfinite(v) and k not in ("plugin_seconds", "command_seconds"):
                fail(f"limits.{k}", f"limit '{k}' must be a finite number (only plugin_seconds and command_seconds may be .inf, for no time limit)")
            if isinstance(getattr(Limits(), k), int) and v != int(v):
                fail(f"limits.{k}", f"limit '{k}' counts whole {'bytes' if 'bytes' in k else 'items'}: {v!r} is not a whole number")
            values[k] = type(getattr(Limits(), k))(v)
        cfg.limits = Limits(**values)
    if "cache" in data:
        if not isinstance(data["cache"], (bool, str)):
            fail("cache", "'cache' must be true, false or a folder")
        cfg.cache = data["cache"]
    if "jobs" in data:
        if isinstance(data["jobs"], bool) or not isinstance(data["jobs"], int) or data["jobs"] < 1:
            fail("jobs", "'jobs' must be a whole number of at least 1")
        cfg.jobs = data["jobs"]
    if "safety-note" in data:
        if not isinstance(data["safety-note"], bool):
            fail("safety-note", "'safety-note' must be true or false")
        cfg.safety_note = data["safety-note"]
    return cfg


def resolve_rules(cfg: Config, rules: dict, cli_select: list[str] | None, cli_ignore: list[str],
                  lenient: bool = False) -> tuple[list[str], dict[str, Severity], dict[str, dict[str, Any]]]:
    """Enabled rule names, severity overrides and options, validated against the registered rules.

    ``rules`` maps names to Rule values. A name in select/ignore may be a
    rule or a plugin. Raises ConfigError (or ValueError for command-line
    names) naming what is unknown. ``lenient``: the configuration's local
    plugins were not loaded, so names in the configuration that no loaded
    plugin registered are passed over (they may be those plugins' rules).
    """
    plugins = {r.plugin for r in rules.values()}

    def expand(items: list[str], where: str, from_cli: bool) -> set[str]:
        out = set()
        for item in items:
            if item in rules:
                out.add(item)
            elif item in plugins:
                out.update(n for n, r in rules.items() if r.plugin == item)
            elif item in CORE_RULE_NAMES:
                continue
            elif lenient and not from_cli:
                continue
            else:
                hint = _hint(item, list(rules) + sorted(plugins))
                message = f"unknown rule or plugin '{item}' in {where}" + (f" (did you mean '{hint}'?)" if hint else "; see 'ctllint rules'")
                if from_cli:
                    raise ValueError(message)
                raise ConfigError(cfg.path or "?", cfg.line_of(where), message)
        return out

    enabled = set(rules)
    if cfg.select is not None:
        enabled = expand(cfg.select, "select", False)
    enabled -= expand(cfg.ignore, "ignore", False)
    if cli_select:
        enabled = expand(cli_select, "--select", True)
    enabled -= expand(cli_ignore, "--ignore", True)

    severities: dict[str, Severity] = {}
    options = {name: {k: o.default for k, o in rule.options.items()} for name, rule in rules.items()}
    for name, settings in cfg.rules.items():
        where = f"rules.{name}"
        if name in CORE_RULE_NAMES:
            raise ConfigError(cfg.path or "?", cfg.line_of(where), f"'{name}' is a core rule: it cannot be disabled, re-graded or configured")
        if name not in rules and lenient:
            continue
        if name not in rules:
            hint = _hint(name, list(rules))
            raise ConfigError(cfg.path or "?", cfg.line_of(where), f"unknown rule '{name}' under rules" + (f" (did you mean '{hint}'?)" if hint else ""))
        rule = rules[name]
        for key, value in settings.items():
            if key == "severity":
                if value == "off":
                    enabled.discard(name)
                    continue
                if value not in ("error", "warning", "info"):
                    raise ConfigError(cfg.path or "?", cfg.line_of(f"{where}.severity"), f"severity of '{name}' must be error, warning, info or off")
                severities[name] = Severity.parse(value)
                continue
            if key not in rule.options:
                allowed = ", ".join(["severity", *rule.options]) or "severity"
                raise ConfigError(cfg.path or "?", cfg.line_of(f"{where}.{key}"), f"rule '{name}' has no option '{key}' (it has: {allowed})")
            problem = rule.options[key].validate(value)
            if problem:
                raise ConfigError(cfg.path or "?", cfg.line_of(f"{where}.{key}"), f"option '{key}' of rule '{name}' {problem}")
            options[name][key] = value
    return [n for n in rules if n in enabled], severities, options


def _hint(word: str, options: list[str]) -> str | None:
    import difflib

    found = difflib.get_close_matches(word, options, n=1, cutoff=0.7)
    return found[0] if found else None
