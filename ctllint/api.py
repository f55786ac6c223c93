"""The public API for rule plugins: rules, options, findings, the check context.

A rule is a small value: a kebab-case name, a default severity, a one-line
summary, documentation (why, source, a failing and a passing example), its
options with defaults, and a ``check`` function that yields findings. The
host attaches the rule name and the configured severity to each finding, so
a rule never decides its own severity unless it has two (``severity`` on a
``Finding`` overrides, as ``overload-setting`` does for its warning case).
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any, Callable, Iterable

from ctllint.reading.kinds import KindRegistry
from ctllint.reading.model import Diagnostic, Location, Schematic, Severity

__all__ = [
    "CheckContext", "Diagnostic", "Example", "Finding", "KindRegistry", "Location", "Option", "OutputFormat",
    "Rule", "Schematic", "Severity", "reflow", "rules_from",
]

if TYPE_CHECKING:  # pragma: no cover
    from ctllint.circuit.analysis import Circuit


@dataclass(frozen=True)
class Option:
    """A rule option: its default and a check of the configured value.

    ``type`` is int, float, str, bool or list; ``choices`` closes a str option.
    """

    default: Any
    doc: str
    type: type = int
    choices: tuple[Any, ...] = ()
    minimum: float | None = None

    def validate(self, value: Any) -> str | None:
        """Return a problem with ``value``, or None when it is acceptable."""
        if self.type is float and isinstance(value, int) and not isinstance(value, bool):
            value = float(value)
        if not isinstance(value, self.type) or (self.type is int and isinstance(value, bool)):
            return f"must be {self.type.__name__}, not {type(value).__name__}"
        if self.choices and value not in self.choices:
            return "must be one of " + ", ".join(map(str, self.choices))
        if self.minimum is not None and value < self.minimum:
            return f"must be at least {self.minimum}"
        return None


@dataclass(frozen=True)
class Finding:
    """What a rule's check yields: where, what, and about what.

    ``subject`` names the device or element the finding is about (for
    baselines); it defaults to nothing. ``severity`` overrides the rule's
    configured severity only for rules that document two levels.
    """

    at: Location
    message: str
    subject: str = ""
    severity: Severity | None = None


@dataclass(frozen=True)
class Example:
    """A short schematic fragment for the documentation."""

    title: str
    yaml: str


@dataclass(frozen=True)
class Rule:
    """A registered rule. ``check(ctx)`` yields ``Finding`` values.

    ``doc`` is the documentation ``ctllint explain`` prints: why the rule
    exists; ``source`` the standard and clause it rests on, or "common
    practice"; ``failing`` and ``passing`` one example each.
    """

    name: str
    severity: Severity
    summary: str
    doc: str
    source: str
    check: Callable[["CheckContext"], Iterable[Finding]]
    failing: Example | None = None
    passing: Example | None = None
    options: dict[str, Option] = field(default_factory=dict)
    plugin: str = ""  # filled in by the host with the registering plugin's name
    # A rule that must look across the files of a run (a control transformer
    # in a shared device file feeds supplies of several schematics) gives
    # both: ``collect(ctx)`` returns plain JSON data for one file (kept in
    # the cache with the file's result, so it must hold only dicts, lists,
    # text and numbers), and ``combine(data)`` gets the data of every file
    # of the run that gave some and yields findings, located in any file.
    collect: Callable[["CheckContext"], Any] | None = None
    combine: Callable[[list[Any]], Iterable[Finding]] | None = None


def reflow(text: str) -> str:
    """``text`` with each paragraph's lines joined by one space; paragraphs apart by a blank line.

    A rule module's docstring is its documentation: ``Rule(doc=reflow(__doc__))``
    gives every report (SARIF, the HTML report, editor hovers) the same
    one-line paragraphs however the source is wrapped.
    """
    paragraphs, lines = [], []
    for line in (text or "").splitlines() + [""]:
        if line.strip():
            lines.append(line.strip())
        elif lines:
            paragraphs.append(" ".join(lines))
            lines = []
    return "\n\n".join(paragraphs)


def rules_from(package: str, modules: Iterable[str]) -> list[Rule]:
    """The ``RULE`` of each named module of ``package``: a plugin's one list of its rules.

    A plugin package keeps one module per rule (``plugins/wiring/unknown_device.py``
    holds ``RULE = Rule(...)``); its ``__init__`` names them once::

        RULES = rules_from(__name__, ("unknown_device", "unknown_part"))

    so adding a rule is one module and one name here.
    """
    import importlib

    return [importlib.import_module(f"{package}.{name}").RULE for name in modules]


@dataclass
class CheckContext:
    """What a rule sees: the schematic, its circuit analyses, its options."""

    schematic: Schematic
    circuit: "Circuit"
    options: dict[str, Any]
    rule: Rule | None = None
    kinds: KindRegistry = field(default_factory=KindRegistry.builtin)

    @property
    def devices(self):
        return self.schematic.devices


@dataclass(frozen=True)
class OutputFormat:
    """An output format: ``render(diagnostics, files, rules)`` returns the text.

    ``files`` is the list of checked file paths; ``rules`` maps rule names to
    ``Rule`` values (for formats that carry rule metadata).
    """

    name: str
    render: Callable[[list[Diagnostic], list[str], dict[str, Rule]], str]
    summary: str = ""
