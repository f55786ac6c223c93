"""The SVG primitives of the drawing: text made safe for SVG, coordinates as short stable text,
and ``Svg``, the collector that elements are added to in the order they are written.

Its own module because the SVG writer and the symbol drawing both write through these, and
the HTML report shows the schematic's text through ``visible`` as the drawing does.
"""
from __future__ import annotations

import re
from xml.sax.saxutils import escape as _escape, quoteattr as _quoteattr

from ctllint.output.draw.measures import TEXT_SIZE

# What a schematic's text may hold that must not reach the SVG as it is: characters
# XML does not allow (the drawing would not open), other control characters and
# bidirectional overrides (they would reorder or hide what is drawn). Shown
# escaped, as Python writes them (``\x1b``).
_UNSHOWN = re.compile("[\x00-\x1f\x7f-\x9f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069\ud800-\udfff\ufffe\uffff]")


def visible(text: str) -> str:
    """``text`` with the characters that must not reach the SVG (or HTML) as they are shown escaped."""
    return _UNSHOWN.sub(lambda m: m.group().encode("unicode_escape", "backslashreplace").decode("ascii"), text)


def escape(text: str) -> str:
    """``text`` for an SVG element's content."""
    return _escape(visible(text))


def quoteattr(text: str) -> str:
    """``text`` as a quoted SVG attribute value."""
    return _quoteattr(visible(text))


def coord(value: float) -> str:
    """A coordinate as short, stable text."""
    text = f"{value:.1f}"
    return text[:-2] if text.endswith(".0") else text


_n = coord


class Svg:
    """Collects SVG text in order."""

    def __init__(self) -> None:
        self.parts: list[str] = []

    def add(self, text: str) -> None:
        self.parts.append(text)

    def line(self, x1: float, y1: float, x2: float, y2: float, cls: str = "w") -> None:
        self.add(f'<line class="{cls}" x1="{_n(x1)}" y1="{_n(y1)}" x2="{_n(x2)}" y2="{_n(y2)}"/>')

    def text(self, x: float, y: float, text: str, cls: str, anchor: str = "start", extra: str = "") -> None:
        a = "" if anchor == "start" else f' text-anchor="{anchor}"'
        size = TEXT_SIZE[cls.split()[0]]
        self.add(f'<text class="{cls}" x="{_n(x)}" y="{_n(y)}" font-size="{size}"{a}{extra}>{escape(text)}</text>')
