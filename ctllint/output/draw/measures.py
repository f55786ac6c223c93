"""The drawing's faces and measures: type sizes, distances on the grid, and the width of text.

Its own module because the layout model and the SVG writer both work in these units: the
layout places by them, the writer writes the type sizes they assume. All text uses a
monospaced face, so a label's width is known exactly (``text_width``) and the layout can keep
labels apart.
"""
from __future__ import annotations

MONO = "'DejaVu Sans Mono', Menlo, Consolas, 'Liberation Mono', monospace"
SANS = "'DejaVu Sans', 'Helvetica Neue', Helvetica, Arial, sans-serif"
# Advance width of one character of DejaVu Sans Mono, in ems (1233/2048).
MONO_ADVANCE = 0.602

SIZE_TITLE = 16
SIZE_SUB = 11
SIZE_TAG = 11       # element labels
SIZE_WIRE = 10      # wire numbers
SIZE_RUNG = 12      # rung numbers
SIZE_XREF = 10
SIZE_RULE = 9       # rule names under marked elements
SIZE_CAPTION = 10
SIZE_TERMINAL = 8   # terminal numbers under an element's leads
TERMINAL_BELOW = 19  # their baseline below the row line
TERMINAL_GAP = 4     # each ends (left) or starts (right) this far from the element's centre
OUTLINE_HEIGHT = 52  # a marked element's outline, from 29 above its row line to 23 below (terminal numbers inside)
SIZE_RAIL = 12

LEFT_MARGIN = 64        # room for rung numbers left of the hot rail
XREF_WIDTH = 196        # margin right of the common rail
RIGHT_PAD = 16
SYMBOL_HALF = 14        # every symbol fits in [cx - 14, cx + 14]
TERMINAL_INSET = 14     # a wire end that is not a rail stays clear of it
LABEL_ABOVE = 17        # element label baseline above the row line
WIRE_ABOVE = 4          # wire number baseline above the row line
ROW_TOP = 32            # from a row's top to its line
ROW_BOTTOM = 18         # from a row's line to its bottom, without rule lanes
LANE_FIRST = 33         # first rule-name baseline below the row line (under the terminal numbers)
LANE_STEP = 11
XREF_STEP = 13
RUNG_GAP = 8
CAPTION_HEIGHT = 16
SECTION_HEAD = 40
MIN_COLUMNS = 5
TARGET_WIDTH = 1480
MIN_COLUMN_WIDTH = 84
MAX_COLUMN_WIDTH = 124

# Font size by text class; written on every text element so that its box can be computed.
TEXT_SIZE = {
    "title": SIZE_TITLE, "sub": SIZE_SUB, "tag": SIZE_TAG, "letter": SIZE_TAG, "wire": SIZE_WIRE,
    "rungno": SIZE_RUNG, "xref": SIZE_XREF, "caption": SIZE_CAPTION, "railname": SIZE_RAIL,
    "supply": SIZE_SUB, "rule": SIZE_RULE, "legend": SIZE_SUB, "changelabel": SIZE_RULE,
    "termno": SIZE_TERMINAL,
}


def text_width(text: str, size: float) -> float:
    """Width in pixels of ``text`` set in the monospaced face at ``size``."""
    return len(text) * size * MONO_ADVANCE


def fit(text: str, size: float, width: float) -> str:
    """``text`` shortened with an ellipsis so that it fits ``width``."""
    if text_width(text, size) <= width:
        return text
    keep = max(1, int(width / (size * MONO_ADVANCE)) - 1)
    return text[:keep] + "\u2026"


def wrap(text: str, size: float, width: float) -> list[str]:
    """Break ``text`` at spaces into lines no wider than ``width``."""
    per_line = max(8, int(width / (size * MONO_ADVANCE)))
    lines: list[str] = []
    current = ""
    for word in text.split(" "):
        while len(word) > per_line:
            if current:
                lines.append(current)
                current = ""
            lines.append(word[:per_line])
            word = word[per_line:]
        candidate = f"{current} {word}" if current else word
        if len(candidate) <= per_line:
            current = candidate
        else:
            lines.append(current)
            current = word
    if current or not lines:
        lines.append(current)
    return lines
