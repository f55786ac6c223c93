"""The trade symbols: how each element is drawn, by its role and device kind, and the operator
drawn over a contact to show how it is worked.

Its own module because it is what a reader looks for when a symbol is to change or a kind is
to get its own, apart from where things go (the layout model) and how the sheet is written
(the SVG writer). Every symbol is centred at the element's place and fits in
``[cx - SYMBOL_HALF, cx + SYMBOL_HALF]``.
"""
from __future__ import annotations

from ctllint.output.draw.measures import SYMBOL_HALF
from ctllint.output.draw.model import Placed
from ctllint.output.draw.svg import Svg, coord as _n
from ctllint.reading.kinds import INSTANT_PARTS, contact_sense

# A safety relay's inputs, written in their box.
SAFETY_INPUT_TEXT = {"power": "PWR", "ch1": "CH1", "ch2": "CH2", "feedback": "FB"}
# A drive's or soft starter's command inputs: a box marked with the input and the kind (a drive's
# box carries a sine-wave tilde as IEC 60617 marks a converter, a soft starter's a ramp, our own sketch).
DRIVE_INPUT_TEXT = {"run": "RUN", "stop": "STP"}

# Resistive loads, drawn as a rectangle (heaters with a zigzag inside).
RESISTIVE_KINDS = ("space-heater", "panel-heater", "resistor")

# Letters for loads that are neither coils nor lamps (a circle with a letter).
LOAD_LETTER = {"solenoid": "S", "horn": "H", "plc-input": "I"}

# How a contact is worked, drawn as a small operator above the contact and
# joined to it by a dashed stem, as the trade's symbol standards draw
# mechanical linkage (IEC 60617 and ANSI Y32.2 alike draw the actuator over
# the contact; these glyphs are ctllint's own drawing of those ideas).
OPERATORS = {
    "pushbutton": "push",                  # a plunger: a bar on a stem
    "pushbutton-maintained": "push-latch",  # a plunger with a detent
    "emergency-stop": "mushroom",           # a mushroom head, latching
    "limit-switch": "cam",                  # a roller on a lever
    "float-switch": "float",                # a float ball
    "pressure-switch": "pressure",          # a diaphragm
    "temperature-switch": "thermal",        # a bulb and capillary
    "flow-switch": "flow",                  # a paddle (flag)
    "foot-switch": "pedal",                 # a pedal
    "selector": "selector",                 # a knob with its position marks
    "overload": "overload",                 # a thermal element (square wave)
    "timer-on": "delay-on",                 # the delay arc opening up: moves late on energizing
    "timer-off": "delay-off",               # the delay arc opening down: moves late on de-energizing
}


def operator_of(dev, part: str | None) -> str:
    """The operator a contact of ``dev`` is drawn with ("" for none: relay and contactor contacts)."""
    kind = dev.kind
    if kind == "pushbutton":
        if dev.get("function") == "emergency-stop":
            return OPERATORS["emergency-stop"]
        return OPERATORS["pushbutton-maintained" if dev.get("action") == "maintained" else "pushbutton"]
    if kind == "timer":
        return "" if part in INSTANT_PARTS else OPERATORS["timer-off" if dev.get("delay") == "off" else "timer-on"]
    return OPERATORS.get(kind, "")


def draw_operator(svg: Svg, p: Placed) -> None:
    """The operator of a contact, in the band between the contact's bars and
    its tag label (from 11 to 16 above the row line)."""
    op, cx, y = p.operator, p.cx, p.y
    if op in ("delay-on", "delay-off"):  # the delay arc on the bars' tops, no stem
        bow = -9 if op == "delay-on" else -15
        svg.add(f'<path class="sym" d="M{_n(cx - 7)} {_n(y - 12)} Q{_n(cx)} {_n(y + bow)} {_n(cx + 7)} {_n(y - 12)}"/>')
        return
    top = y - 12
    svg.add(f'<line class="op" x1="{_n(cx)}" y1="{_n(y - 4)}" x2="{_n(cx)}" y2="{_n(top)}"/>')
    if op in ("push", "push-latch"):
        svg.line(cx - 5, top, cx + 5, top, "sym")
        if op == "push-latch":  # a detent: the button stays where it is put
            svg.line(cx - 5, top, cx - 5, top + 2.5, "sym")
            svg.line(cx + 5, top, cx + 5, top + 2.5, "sym")
    elif op == "mushroom":
        svg.add(f'<path class="symdot" d="M{_n(cx - 6)} {_n(top)} A6 4 0 0 1 {_n(cx + 6)} {_n(top)} Z"/>')
    elif op == "cam":
        svg.line(cx, top, cx + 5, top - 2, "sym")
        svg.add(f'<circle class="symfill" cx="{_n(cx + 6.5)}" cy="{_n(top - 2.3)}" r="1.6"/>')
    elif op == "float":
        svg.add(f'<circle class="symfill" cx="{_n(cx)}" cy="{_n(top - 2)}" r="2.2"/>')
    elif op == "pressure":
        svg.add(f'<path class="sym" d="M{_n(cx - 5)} {_n(top)} L{_n(cx + 5)} {_n(top)} A5 3.5 0 0 0 {_n(cx - 5)} {_n(top)}"/>')
    elif op == "thermal":
        svg.add(f'<path class="sym" d="M{_n(cx - 5)} {_n(top)} Q{_n(cx - 2.5)} {_n(top - 5)} {_n(cx)} {_n(top)} Q{_n(cx + 2.5)} {_n(top + 5)} {_n(cx + 5)} {_n(top)}"/>')
    elif op == "flow":
        svg.add(f'<path class="sym" d="M{_n(cx)} {_n(top)} L{_n(cx)} {_n(top - 4)} L{_n(cx + 5)} {_n(top - 3)} L{_n(cx)} {_n(top - 2)}"/>')
    elif op == "pedal":
        svg.line(cx - 5, top + 1, cx + 5, top - 2, "sym")
    elif op == "overload":
        pts = " ".join(f"{_n(cx + dx)},{_n(top + dy)}" for dx, dy in ((-6, 0), (-6, -3), (-2, -3), (-2, 0), (2, 0), (2, -3), (6, -3), (6, 0)))
        svg.add(f'<polyline class="sym" points="{pts}"/>')
    elif op == "selector":  # a knob: one mark per position, filled where the contact is closed
        n = len(p.positions) or 1
        for k, name in enumerate(p.positions or ("",)):
            mx = cx + (k - (n - 1) / 2) * 4.5
            svg.add(f'<circle class="{"symdot" if name in p.closed_in else "symfill"}" cx="{_n(mx)}" cy="{_n(top - 1.5)}" r="1.4"/>')


def draw_symbol(svg: Svg, p: Placed, kind: str) -> None:
    """Draw the element's symbol centred at (cx, y), leads to cx +- SYMBOL_HALF."""
    role = p.element.role
    if role == "contact":
        _contact(svg, p)
    elif role == "load" and kind in RESISTIVE_KINDS:
        _resistive_load(svg, p, kind)
    elif role == "load":
        _load(svg, p, kind)
    elif role == "conductor" and kind in ("breaker", "motor-breaker"):
        _breaker(svg, p, kind)
    elif role == "conductor":
        _fuse(svg, p)
    elif role == "output":
        _plc_output(svg, p)
    else:
        _unknown(svg, p)


def _contact(svg: Svg, p: Placed) -> None:
    """A contact: two bars across the wire, a slash for NC, its operator above."""
    cx, y, h = p.cx, p.y, SYMBOL_HALF
    svg.line(cx - h, y, cx - 5, y, "sym")
    svg.line(cx + 5, y, cx + h, y, "sym")
    svg.line(cx - 5, y - 10, cx - 5, y + 10, "sym")
    svg.line(cx + 5, y - 10, cx + 5, y + 10, "sym")
    if contact_sense(p.element.part) == "NC":
        svg.line(cx - 11, y + 10, cx + 11, y - 10, "sym")
    if p.operator:
        draw_operator(svg, p)


def _resistive_load(svg: Svg, p: Placed, kind: str) -> None:
    """A resistor: a rectangle on the wire (IEC 60617 style); a heater: the same with a heating zigzag inside."""
    cx, y, h = p.cx, p.y, SYMBOL_HALF
    svg.line(cx - h, y, cx - 12, y, "sym")
    svg.line(cx + 12, y, cx + h, y, "sym")
    svg.add(f'<rect class="symfill" x="{_n(cx - 12)}" y="{_n(y - 6)}" width="24" height="12"/>')
    if kind != "resistor":
        pts = " ".join(f"{_n(cx - 9 + 3 * k)},{_n(y + (3 if k % 2 else -3))}" for k in range(7))
        svg.add(f'<polyline class="sym" points="{pts}"/>')


def _load(svg: Svg, p: Placed, kind: str) -> None:
    """A coil or other load: a circle, marked inside by kind (a lamp's cross, an input's box, a letter, a clock hand)."""
    cx, y, h = p.cx, p.y, SYMBOL_HALF
    part = p.element.part
    svg.line(cx - h, y, cx - 11, y, "sym")
    svg.line(cx + 11, y, cx + h, y, "sym")
    svg.add(f'<circle class="symfill" cx="{_n(cx)}" cy="{_n(y)}" r="11"/>')
    if kind == "pilot-light":
        d = 7.8
        svg.line(cx - d, y - d, cx + d, y + d, "sym")
        svg.line(cx - d, y + d, cx + d, y - d, "sym")
    elif kind == "safety-relay":  # a safety relay's inputs: a box named after the input
        svg.add(f'<rect class="symfill" x="{_n(cx - 12)}" y="{_n(y - 12)}" width="24" height="24"/>')
        svg.text(cx, y + 3, SAFETY_INPUT_TEXT.get(part or "", "?"), "termno", "middle")
    elif kind in ("drive", "soft-starter") and part in DRIVE_INPUT_TEXT:
        svg.add(f'<rect class="symfill" x="{_n(cx - 12)}" y="{_n(y - 12)}" width="24" height="24"/>')
        svg.text(cx, y + 9, DRIVE_INPUT_TEXT[part], "termno", "middle")
        if kind == "drive":
            svg.add(f'<path class="sym" d="M{_n(cx - 7)} {_n(y - 4)} q3.5 -5 7 0 t7 0"/>')
        else:
            svg.line(cx - 7, y - 2, cx + 7, y - 8, "sym")
    elif part in ("set", "reset") and kind == "latching-relay":  # a latching relay's two coils: S and R
        svg.text(cx, y + 4, "S" if part == "set" else "R", "letter", "middle")
    elif part != "coil":
        letter = LOAD_LETTER.get(kind, (kind[:1] or "?").upper())
        svg.text(cx, y + 4, letter, "letter", "middle")
    elif kind == "timer":  # a timer coil: a clock hand inside the circle
        svg.line(cx, y, cx, y - 7, "sym")
        svg.line(cx, y, cx + 5, y, "sym")


def _breaker(svg: Svg, p: Placed, kind: str) -> None:
    """A circuit breaker: two terminals under an arc; a motor breaker adds its overload release."""
    cx, y, h = p.cx, p.y, SYMBOL_HALF
    svg.line(cx - h, y, cx - 11, y, "sym")
    svg.line(cx + 11, y, cx + h, y, "sym")
    svg.add(f'<circle class="symfill" cx="{_n(cx - 9)}" cy="{_n(y)}" r="2.2"/>')
    svg.add(f'<circle class="symfill" cx="{_n(cx + 9)}" cy="{_n(y)}" r="2.2"/>')
    svg.add(f'<path class="sym" d="M{_n(cx - 10)} {_n(y - 4)} Q{_n(cx)} {_n(y - 16)} {_n(cx + 10)} {_n(y - 4)}"/>')
    if kind == "motor-breaker":  # its overload release: a small thermal bend under the arc (our own sketch)
        svg.add(f'<path class="sym" d="M{_n(cx - 5)} {_n(y + 6)} h4 v-4 h2 v4 h4"/>')


def _fuse(svg: Svg, p: Placed) -> None:
    """A fuse: a small rectangle with the wire through it."""
    cx, y, h = p.cx, p.y, SYMBOL_HALF
    svg.line(cx - h, y, cx + h, y, "sym")
    svg.add(f'<rect class="sym" x="{_n(cx - 11)}" y="{_n(y - 5)}" width="22" height="10"/>')


def _plc_output(svg: Svg, p: Placed) -> None:
    """A PLC output: a contact in a box."""
    cx, y, h = p.cx, p.y, SYMBOL_HALF
    svg.line(cx - h, y, cx - 11, y, "sym")
    svg.line(cx + 11, y, cx + h, y, "sym")
    svg.add(f'<rect class="sym" x="{_n(cx - 11)}" y="{_n(y - 11)}" width="22" height="22" rx="2"/>')
    svg.line(cx - 11, y, cx - 4, y, "sym")
    svg.line(cx + 4, y, cx + 11, y, "sym")
    svg.line(cx - 4, y - 6, cx - 4, y + 6, "sym")
    svg.line(cx + 4, y - 6, cx + 4, y + 6, "sym")


def _unknown(svg: Svg, p: Placed) -> None:
    """An unknown device or part: a dashed box with a question mark."""
    cx, y, h = p.cx, p.y, SYMBOL_HALF
    svg.line(cx - h, y, cx - 11, y, "sym")
    svg.line(cx + 11, y, cx + h, y, "sym")
    svg.add(f'<rect class="sym" x="{_n(cx - 11)}" y="{_n(y - 9)}" width="22" height="18" stroke-dasharray="3 2"/>')
    svg.text(cx, y + 4, "?", "letter", "middle")
