"""The plugin host: finds plugins, collects their rules, runs them on a schematic.

Plugins come from the ``ctllint`` entry-point group (the built-in rules
register there too) and from local plugin paths named in configuration. A
plugin that fails to import, registers garbage, raises or runs past the
time limit becomes a ``plugin-error`` finding naming it; the other rules
still run.
"""
from __future__ import annotations

import importlib
import importlib.metadata
import importlib.util
import os
import signal
import sys
import threading
import time
from dataclasses import dataclass, field
from typing import Any, Iterable

import pluggy

from ctllint.checking import hookspecs
from ctllint.api import CheckContext, Finding, OutputFormat, Rule
from ctllint.reading.kinds import DeviceKind, KindRegistry
from ctllint.checking.core_rules import CORE_RULE_NAMES as CORE_RULES
from ctllint.reading.model import Diagnostic, Location, Schematic, Severity


@dataclass
class PluginProblem:
    plugin: str
    message: str


class PluginTimeout(BaseException):
    """Raised inside a rule that ran past the per-file time limit.

    A BaseException, so that a rule's own ``except Exception`` cannot swallow it.
    """


@dataclass
class PluginHost:
    """The plugins of one run and what they registered."""

    pm: pluggy.PluginManager
    rules: dict[str, Rule] = field(default_factory=dict)
    kinds: KindRegistry = field(default_factory=KindRegistry.builtin)
    formats: dict[str, OutputFormat] = field(default_factory=dict)
    problems: list[PluginProblem] = field(default_factory=list)
    plugin_names: list[str] = field(default_factory=list)

    # ------------------------------------------------------------------
    @classmethod
    def create(cls, local_plugins: Iterable[str] = (), entry_points: bool = True, extra: Iterable[Any] = (),
               builtin: Iterable[tuple[str, Any]] = ()) -> "PluginHost":
        """Load ``builtin`` (name, module) pairs, entry-point plugins, local plugin paths, then ``extra`` objects.

        The commands pass the built-in output formats as ``builtin``: they are
        a plugin like any other, registered first so that a plugin cannot
        take their names, and the checking stage never imports the output stage.
        """
        pm = pluggy.PluginManager(hookspecs.PROJECT)
        pm.add_hookspecs(hookspecs)
        host = cls(pm)
        for name, module in builtin:
            pm.register(module, name=name)
        if entry_points:
            host._load_entry_points()
        for path in local_plugins:
            host._load_local(path)
        for obj in extra:
            name = getattr(obj, "__name__", None) or type(obj).__name__
            pm.register(obj, name=name)
        try:
            pm.check_pending()
        except pluggy.PluginValidationError as exc:
            host.problems.append(PluginProblem(str(getattr(exc, "plugin", "?")), str(exc).splitlines()[0]))
        host._collect()
        return host

    def _load_entry_points(self) -> None:
        eps = sorted(importlib.metadata.entry_points(group=hookspecs.PROJECT), key=lambda ep: (ep.name, ep.value))
        seen: set[str] = set()
        for ep in eps:
            if ep.name in seen:
                continue
            seen.add(ep.name)
            try:
                module = ep.load()
            except BaseException as exc:  # noqa: BLE001 - a broken plugin must not stop the run
                if isinstance(exc, (KeyboardInterrupt, SystemExit)) and not isinstance(exc, SystemExit):
                    raise
                self.problems.append(PluginProblem(ep.name, f"failed to import {ep.value}: {_one_line(exc)}"))
                continue
            self._register(module, ep.name)

    def _load_local(self, path: str) -> None:
        name = "ctllint_local_" + "".join(c if c.isalnum() else "_" for c in os.path.splitext(os.path.basename(path.rstrip("/")))[0])
        target = os.path.join(path, "__init__.py") if os.path.isdir(path) else path
        try:
            spec = importlib.util.spec_from_file_location(name, target, submodule_search_locations=[path] if os.path.isdir(path) else None)
            if spec is None or spec.loader is None:
                raise ImportError(f"cannot import {path}")
            module = importlib.util.module_from_spec(spec)
            sys.modules[name] = module
            spec.loader.exec_module(module)
        except BaseException as exc:  # noqa: BLE001
            if isinstance(exc, KeyboardInterrupt):
                raise
            sys.modules.pop(name, None)
            self.problems.append(PluginProblem(path, f"failed to import local plugin {path}: {_one_line(exc)}"))
            return
        self._register(module, os.path.basename(path.rstrip("/")))

    def _register(self, module: Any, name: str) -> None:
        try:
            self.pm.register(module, name=name)
            self.plugin_names.append(name)
        except Exception as exc:  # noqa: BLE001
            self.problems.append(PluginProblem(name, f"cannot be registered: {_one_line(exc)}"))

    def call_each(self, hook: str, **kwargs: Any) -> list[tuple[str, Any]]:
        """Call every implementation of ``hook`` on its own; a raising one becomes a problem."""
        results = []
        caller = getattr(self.pm.hook, hook)
        for impl in reversed(caller.get_hookimpls()):
            if impl.hookwrapper or getattr(impl, "wrapper", False):
                continue
            try:
                value = impl.function(**{a: kwargs[a] for a in impl.argnames})
                if value is not None:
                    value = list(value)
            except (Exception, SystemExit) as exc:  # noqa: BLE001 - sys.exit() in a plugin must not end the run
                self.problems.append(PluginProblem(impl.plugin_name, f"{hook} raised {_one_line(exc)}"))
                continue
            if value is not None:
                results.append((impl.plugin_name, value))
        return results

    def _collect(self) -> None:
        for plugin, kinds in self.call_each("ctllint_device_kinds"):
            for kind in kinds:
                if not isinstance(kind, DeviceKind):
                    self.problems.append(PluginProblem(plugin, f"ctllint_device_kinds returned {type(kind).__name__}, not a DeviceKind"))
                elif _kind_problem(kind):
                    self.problems.append(PluginProblem(plugin, f"device kind {kind.name!r}: {_kind_problem(kind)}"))
                elif kind.name in self.kinds:
                    self.problems.append(PluginProblem(plugin, f"device kind '{kind.name}' is already defined"))
                else:
                    self.kinds.add(kind)
        for plugin, rules in self.call_each("ctllint_rules"):
            for rule in rules:
                if not isinstance(rule, Rule) or not callable(getattr(rule, "check", None)):
                    what = f"rule {rule.name!r} whose check is not callable" if isinstance(rule, Rule) else type(rule).__name__
                    self.problems.append(PluginProblem(plugin, f"ctllint_rules returned {what}, not a Rule"))
                    continue
                if _rule_problem(rule):
                    self.problems.append(PluginProblem(plugin, f"rule {rule.name!r}: {_rule_problem(rule)}"))
                    continue
                if rule.name in self.rules or rule.name in CORE_RULES:
                    other = self.rules[rule.name].plugin if rule.name in self.rules else "core"
                    self.problems.append(PluginProblem(plugin, f"rule '{rule.name}' is already registered by {other}"))
                    continue
                object.__setattr__(rule, "plugin", plugin)
                self.rules[rule.name] = rule
        for plugin, formats in self.call_each("ctllint_output_formats"):
            for fmt in formats:
                if isinstance(fmt, OutputFormat) and fmt.name not in self.formats:
                    self.formats[fmt.name] = fmt
                else:
                    self.problems.append(PluginProblem(plugin, f"output format {getattr(fmt, 'name', fmt)!r} is not an OutputFormat or is already registered"))
        self.rules = dict(sorted(self.rules.items()))


def _rule_problem(rule: Rule) -> str | None:
    """Why a registered Rule cannot be used, or None."""
    from ctllint.api import Option

    if not isinstance(rule.name, str) or not rule.name:
        return "its name is not a non-empty text"
    if not isinstance(rule.severity, Severity):
        return f"its severity {rule.severity!r} is not a ctllint.reading.model.Severity"
    if not isinstance(rule.options, dict) or not all(isinstance(k, str) and isinstance(o, Option) for k, o in rule.options.items()):
        return "its options are not a mapping of names to ctllint.api.Option"
    return None


def _kind_problem(kind: DeviceKind) -> str | None:
    """Why a registered DeviceKind cannot be used, or None."""
    from ctllint.reading.kinds import FieldSpec

    if not isinstance(kind.name, str) or not kind.name:
        return "its name is not a non-empty text"
    if not isinstance(kind.fields, dict) or not all(isinstance(k, str) and isinstance(f, FieldSpec) for k, f in kind.fields.items()):
        return "its fields are not a mapping of names to ctllint.reading.kinds.FieldSpec"
    for attr in ("required", "parts"):
        value = getattr(kind, attr)
        if not isinstance(value, (tuple, list)) or not all(isinstance(v, str) for v in value):
            return f"its {attr} is not a list of names"
    return None


def _one_line(exc: BaseException) -> str:
    text = str(exc).strip().splitlines()
    return f"{type(exc).__name__}: {text[0]}" if text else type(exc).__name__


@dataclass
class RuleSettings:
    """What configuration decided for one run: enabled rules, severities, options."""

    enabled: list[str]
    severities: dict[str, Severity]
    options: dict[str, dict[str, Any]]
    time_limit: float = 60.0


def plugin_error(path: str, message: str) -> Diagnostic:
    return Diagnostic(path, 1, 1, "plugin-error", Severity.ERROR, message)


class _Deadline:
    """Raise PluginTimeout in the main thread when a file's rules run too long.

    The signal raises only while plugin code runs (``armed``): landing in the
    host's own bookkeeping it would escape as a traceback. A rule that
    swallows the exception is interrupted again every quarter second until
    it returns. When a rule had to be stopped, the rules after it share one
    more period (``extend``), so that one runaway rule does not silence the
    others; a file's rules thus take at most twice the limit.
    """

    def __init__(self, seconds: float):
        # no limit when infinite or absurd (the timer cannot hold it); at least a millisecond (a smaller one disarms it)
        self.seconds = max(seconds, 0.001) if 0 < seconds < 1e8 else 0
        self.usable = self.seconds > 0 and hasattr(signal, "setitimer") and threading.current_thread() is threading.main_thread()
        self.started = 0.0
        self.armed = False
        self.extended = False

    def __enter__(self) -> "_Deadline":
        self.started = time.monotonic()
        if self.usable:
            self._old = signal.signal(signal.SIGALRM, self._fire)
            signal.setitimer(signal.ITIMER_REAL, self.seconds)
        return self

    def _fire(self, signum: int, frame: Any) -> None:
        if self.armed:
            signal.setitimer(signal.ITIMER_REAL, 0.25)
            raise PluginTimeout()

    def extend(self) -> None:
        """After a rule was stopped: once, give the remaining rules one more period."""
        if self.extended:
            return
        self.extended = True
        self.started = time.monotonic()
        if self.usable:
            signal.setitimer(signal.ITIMER_REAL, self.seconds)

    def __exit__(self, *exc: Any) -> None:
        if self.usable:
            signal.setitimer(signal.ITIMER_REAL, 0)
            signal.signal(signal.SIGALRM, self._old)

    def expired(self) -> bool:
        return self.seconds > 0 and time.monotonic() - self.started >= self.seconds


def run_rules(host: PluginHost, schematic: Schematic, settings: RuleSettings, shared: dict[str, Any] | None = None) -> list[Diagnostic]:
    """Run the enabled rules on a loaded schematic; plugin faults become findings.

    A rule with ``collect`` puts what it collects for the run-wide pass
    into ``shared`` under its name (``combine_rules`` reads it).
    """
    from ctllint.circuit.analysis import Circuit

    path = schematic.path
    out: list[Diagnostic] = []
    circuit = Circuit(schematic)
    lines = max(1, schematic.line_count or len(schematic.text_lines))
    cap = MAX_FINDINGS + 10 * (lines + len(schematic.elements))
    with _Deadline(settings.time_limit) as deadline:
        for name in settings.enabled:
            rule = host.rules.get(name)
            if rule is None:
                continue
            if deadline.expired():
                out.append(plugin_error(path, f"rule {name} ({rule.plugin}) did not run: the file's rules passed the time limit of {settings.time_limit:g} s (limits.plugin_seconds)"))
                continue
            ctx = CheckContext(schematic, circuit, settings.options.get(name, {}), rule, host.kinds)
            try:
                deadline.armed = True
                try:
                    found = _take(rule.check(ctx), cap)
                    if rule.collect is not None and shared is not None:
                        data = rule.collect(ctx)
                        if data:
                            shared[name] = data
                finally:  # disarmed before any handler below runs
                    deadline.armed = False
            except PluginTimeout:
                out.append(plugin_error(path, f"rule {name} ({rule.plugin}) did not finish within {settings.time_limit:g} s (limits.plugin_seconds) and was stopped"))
                deadline.extend()
                continue
            except RecursionError:
                out.append(plugin_error(path, f"rule {name} ({rule.plugin}) raised RecursionError"))
                continue
            except (Exception, SystemExit) as exc:  # noqa: BLE001 - sys.exit() in a rule must not end the run
                out.append(plugin_error(path, f"rule {name} ({rule.plugin}) raised {_one_line(exc)}"))
                continue
            if found is None:
                out.append(plugin_error(path, f"rule {name} ({rule.plugin}) gave more than {cap} findings for one file; none of them are shown"))
                continue
            out.extend(_to_diagnostics(found, rule, settings, path, lines))
        caller = host.pm.hook.ctllint_check
        for impl in caller.get_hookimpls():
            if impl.hookwrapper or getattr(impl, "wrapper", False):
                continue
            if deadline.expired():
                out.append(plugin_error(path, f"plugin {impl.plugin_name} did not run its check: the file's rules passed the time limit of {settings.time_limit:g} s (limits.plugin_seconds)"))
                continue
            ctx = CheckContext(schematic, circuit, {}, None, host.kinds)
            try:
                deadline.armed = True
                try:
                    pairs = _take(impl.function(**{a: {"context": ctx}[a] for a in impl.argnames}), cap)
                finally:
                    deadline.armed = False
            except PluginTimeout:
                out.append(plugin_error(path, f"plugin {impl.plugin_name} did not finish its check within {settings.time_limit:g} s"))
                deadline.extend()
                continue
            except (Exception, SystemExit) as exc:  # noqa: BLE001
                out.append(plugin_error(path, f"plugin {impl.plugin_name} raised {_one_line(exc)}"))
                continue
            if pairs is None:
                out.append(plugin_error(path, f"plugin {impl.plugin_name} gave more than {cap} findings from ctllint_check; none of them are shown"))
                continue
            for pair in pairs:
                try:
                    rule_name, finding = pair
                except (TypeError, ValueError):
                    out.append(plugin_error(path, f"plugin {impl.plugin_name} returned {type(pair).__name__} from ctllint_check, not (rule, Finding)"))
                    break
                rule = host.rules.get(rule_name) if isinstance(rule_name, str) else None
                if rule is None or rule.plugin != impl.plugin_name:
                    out.append(plugin_error(path, f"plugin {impl.plugin_name} reported rule {rule_name!r}, which it did not register"))
                    continue
                if rule_name in settings.enabled:
                    out.extend(_to_diagnostics([finding], rule, settings, path, lines))
    return out


# Findings one rule may give for one file, beyond ten per line and per element
# (a flow-style path holds many elements on one line): a rule that yields
# without end is stopped here rather than filling the memory.
MAX_FINDINGS = 100_000


def _take(value: Any, cap: int) -> list[Any] | None:
    """The first findings of ``value`` as a list, or None when there are more than ``cap``."""
    if value is None:
        return []
    found = []
    for item in value:
        found.append(item)
        if len(found) > cap:
            return None
    return found


def _finding_problem(f: Any, path: str, lines: int | None) -> str | None:
    """Why a rule's finding cannot be reported, or None."""
    if not isinstance(f, Finding) or not isinstance(f.at, Location):
        return f"returned {type(f).__name__}, not a Finding with a Location"
    at = f.at
    if not isinstance(at.path, str) or any(not isinstance(n, int) or isinstance(n, bool) for n in (at.line, at.column)):
        return f"returned a Finding whose Location {at!r} is not (path text, line number, column number)"
    if not isinstance(f.message, str) or not isinstance(f.subject, str):
        return "returned a Finding whose message or subject is not text"
    if f.severity is not None and not isinstance(f.severity, Severity):
        return f"returned a Finding whose severity {f.severity!r} is not a Severity"
    if at.line < 1 or at.column < 1 or (lines is not None and at.path == path and at.line > lines):
        return f"returned a Finding at line {at.line}, column {at.column}, outside {at.path} ({f.message})"
    return None


def _to_diagnostics(found: list[Any], rule: Rule, settings: RuleSettings, path: str, lines: int | None = None) -> list[Diagnostic]:
    out = []
    severity = settings.severities.get(rule.name, rule.severity)
    for f in found:
        problem = _finding_problem(f, path, lines)
        if problem:
            return [plugin_error(path, f"rule {rule.name} ({rule.plugin}) {problem}")]
        sev = severity
        if f.severity is not None and rule.name not in settings.severities:
            sev = f.severity
        out.append(Diagnostic(f.at.path, f.at.line, f.at.column, rule.name, sev, f.message, f.subject))
    return out


def combine_rules(host: PluginHost, settings: RuleSettings, shared: list[dict[str, Any]]) -> list[Diagnostic]:
    """The run-wide pass: each enabled rule with ``combine`` gets what its
    ``collect`` gave for every file of the run; a fault is a plugin-error
    at line 1 of the first file that gave data, and the other rules still run."""
    out: list[Diagnostic] = []
    for name in settings.enabled:
        rule = host.rules.get(name)
        if rule is None or rule.combine is None:
            continue
        data = [s[name] for s in shared if name in s]
        if not data:
            continue
        try:
            found = _take(rule.combine(data), MAX_FINDINGS)
        except (Exception, SystemExit) as exc:  # noqa: BLE001
            first = next((d.get("path") for d in data if isinstance(d, dict) and isinstance(d.get("path"), str)), "?")
            out.append(plugin_error(first, f"rule {name} ({rule.plugin}) raised {_one_line(exc)} in its run-wide pass"))
            continue
        if found is None:
            continue
        for f in found:
            out.extend(_to_diagnostics([f], rule, settings, f.at.path if isinstance(getattr(f, "at", None), Location) else "?"))
    return out
