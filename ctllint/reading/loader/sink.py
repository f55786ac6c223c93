"""The one located-error sink of a file's reading, and the wording its messages share.

Every section reader records its ``format`` diagnostics here, at the value
they concern, in the order it finds them; ``Stop`` abandons the value being
read once its error is recorded. Kept apart from the readers so that each
section module reaches the same sink and words its messages alike.
"""
from __future__ import annotations

import re
from dataclasses import dataclass, field

from ctllint.reading.model import Diagnostic, Location, Schematic, Severity
from ctllint.reading.yamlsafe import Node, within


class Stop(Exception):
    """Abandon the value being read; its error is already recorded."""


@dataclass
class LoadResult:
    schematic: Schematic | None
    diagnostics: list[Diagnostic]
    used_files: list[str] = field(default_factory=list)


def format_error(path: str, line: int, column: int, message: str) -> Diagnostic:
    return Diagnostic(path, line, column, "format", Severity.ERROR, message)


class FormatSink:
    """The located ``format`` diagnostics of one file, and where its values stand."""

    def __init__(self, path: str):
        self.path = path
        self.errors: list[Diagnostic] = []
        self.streamed_errors: list[Diagnostic] = []  # set aside until the file is known to be a schematic
        self.source = ""  # the file's text
        self.line_count = 0
        self.hints: list | None = None  # the file's lines and the hints left (see unknown_key)

    def start(self, text: str) -> None:
        self.source = text
        self.line_count = count_lines(text)

    def text_lines(self) -> list[str]:
        """The file's lines, for the rare position past the end (not kept: a large file has many)."""
        return self.source.splitlines()

    def loc(self, node: Node) -> Location:
        return Location(self.path, *self.position(node))

    def position(self, node: Node) -> tuple[int, int]:
        """Where ``node`` stands as (line, column); the model keeps many of these packed."""
        line, col = node.line, node.column
        if line > self.line_count:  # an empty value at the very end of the file
            line, col = within(self.text_lines(), line, col)
        return line, col

    def error(self, node: Node | Location, message: str) -> None:
        loc = node if isinstance(node, Location) else self.loc(node)
        self.errors.append(Diagnostic(loc.path, loc.line, loc.column, "format", Severity.ERROR, message))

    def fail(self, node: Node, message: str):
        self.error(node, message)
        raise Stop

    def unknown_key(self, knode: Node, key: str, where: str, allowed: tuple[str, ...]) -> None:
        hint = closest(key, allowed)
        if hint is None:  # text cut off by a comma in a {...} mapping (FORMAT.md, "Additions"): say to quote it
            from ctllint.reading.yamlhints import comma_in_text, lines_of

            state = self.hints
            if state is None:  # the file split once, however many such keys; at most 50 hints a file,
                state = self.hints = [lines_of(self.source), 50]  # each reads its whole line
            lines = state[0]
            state[1] -= 1
            cut = state[1] >= 0 and comma_in_text(lines[knode.line - 1] if 0 < knode.line <= len(lines) else "", knode.column)
            if cut:
                self.error(knode, f"{cut} (in {where})")
                return
        self.error(knode, f"unknown key '{key}' in {where}" + (f" (did you mean '{hint}'?)" if hint else f"; allowed: {', '.join(allowed)}"))


# Characters other than "\n" that str.splitlines takes for a line break.
_OTHER_BREAKS = re.compile("[\r\x0b\x0c\x1c\x1d\x1e\x85\u2028\u2029]")


def count_lines(text: str) -> int:
    """``len(text.splitlines())`` without building the list (for the usual file, broken by "\n" only)."""
    if _OTHER_BREAKS.search(text):
        return len(text.splitlines())
    return text.count("\n") + (1 if text and not text.endswith("\n") else 0)


def excerpt(text: str, limit: int = 20) -> str:
    """A short, escaped excerpt of a value for a message: at most ``limit`` characters, control characters escaped."""
    text = str(text)
    short = text[:limit]
    short = "".join(c if c.isprintable() else c.encode("unicode_escape").decode("ascii") for c in short)
    return short + ("..." if len(text) > limit else "")


def closest(word: str, options: tuple[str, ...]) -> str | None:
    import difflib

    found = difflib.get_close_matches(word, list(options), n=1, cutoff=0.75)
    return found[0] if found else None


def article(word: str) -> str:
    return ("an " if word[:1] in "aeiou" else "a ") + word
