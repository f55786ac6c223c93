"""The drawing's colours and its style sheet (``css``).

Its own module because the look is shared: the SVG writer writes the classes named here, and
the HTML report uses the same severity and change colours for its own marks.
"""
from __future__ import annotations

from ctllint.output.draw.measures import MONO, SANS
from ctllint.reading.model import Severity

INK = "#1b1f24"
WIRE_INK = "#1d5fa6"
MUTED = "#5c6670"
SEVERITY_COLOUR = {Severity.ERROR: "#c62828", Severity.WARNING: "#b26a00", Severity.INFO: "#1565c0"}
SEVERITY_TINT = {Severity.ERROR: "#fdecea", Severity.WARNING: "#fff4e0", Severity.INFO: "#e8f1fb"}

# Change marks (see ``Mark``): one colour for what left the drawing of the old
# revision, another for what arrived in the new one, both clear of the
# severity colours and told apart by line style and words as well as hue
# (dashed "gone from here", solid "new here"; reddish purple and bluish
# green stay distinct with the common colour-vision deficiencies).
CHANGE_COLOUR = {"removed": "#a8336f", "moved-from": "#a8336f", "added": "#00785a", "moved-to": "#00785a"}
CHANGE_TINT = {"removed": "#f9e8f1", "moved-from": "#f9e8f1", "added": "#e3f4ee", "moved-to": "#e3f4ee"}
CHANGE_DASH = {"removed": "6 3", "moved-from": "6 3", "added": "", "moved-to": ""}


def css(prefix: str, marks: bool = False) -> str:
    """The drawing's style sheet; ``prefix`` scopes it to the drawing with that id prefix,
    ``marks`` adds the change marks' classes."""
    p = f"#{prefix}drawing " if prefix else ""
    rules = [
        f"{p}.w{{stroke:{INK};stroke-width:1.6;fill:none;stroke-linecap:round}}",
        f"{p}.rail{{stroke:{INK};stroke-width:3;fill:none}}",
        f"{p}.sym{{stroke:{INK};stroke-width:1.8;fill:none;stroke-linecap:round}}",
        f"{p}.symfill{{fill:#ffffff;stroke:{INK};stroke-width:1.8}}",
        f"{p}.symdot{{fill:{INK};stroke:{INK};stroke-width:1}}",
        f"{p}.op{{stroke:{INK};stroke-width:1.2;stroke-dasharray:2 1.5}}",
        f"{p}.dot{{fill:{INK}}}",
        f"{p}.term{{fill:#ffffff;stroke:{INK};stroke-width:1.4}}",
        f"{p}text{{font-family:{MONO};white-space:pre}}",
        f"{p}.tag{{fill:{INK};font-weight:bold}}",
        f"{p}.letter{{fill:{INK};font-weight:bold}}",
        f"{p}.wire{{fill:{WIRE_INK}}}",
        f"{p}.rungno{{fill:{INK};font-weight:bold}}",
        f"{p}.xref{{fill:{MUTED}}}",
        f"{p}.termno{{fill:{MUTED}}}",
        f"{p}.caption{{fill:{MUTED};font-style:italic}}",
        f"{p}.railname{{fill:{INK};font-weight:bold}}",
        f"{p}.supply{{fill:{MUTED}}}",
        f"{p}.title{{font-family:{SANS};fill:{INK};font-weight:bold}}",
        f"{p}.sub{{fill:{MUTED}}}",
        f"{p}.rule{{}}",
        f"{p}.legend{{fill:{INK}}}",
        f"{p}.band{{fill:#f6f8fa}}",
        f"{p}.xrefline{{stroke:#c9d1d9;stroke-width:1;stroke-dasharray:2 3}}",
    ]
    for sev, colour in SEVERITY_COLOUR.items():
        rules.append(f"{p}.sev-{sev}{{fill:{colour}}}")
        rules.append(f"{p}.mark-{sev}{{stroke:{colour};stroke-width:2;fill:{SEVERITY_TINT[sev]};fill-opacity:0.85}}")
    rules.append(f"{p}.el:target .outline,{p}.el.focus .outline{{stroke-width:4}}")
    if marks:
        for change, colour in CHANGE_COLOUR.items():
            dash = f";stroke-dasharray:{CHANGE_DASH[change]}" if CHANGE_DASH[change] else ""
            rules.append(f"{p}.chg-{change}{{stroke:{colour};stroke-width:2.4;fill:{CHANGE_TINT[change]};fill-opacity:0.9{dash}}}")
            rules.append(f"{p}.changelabel.chg-{change}{{fill:{colour};stroke:none;font-weight:bold}}")
        rules.append(f"{p}.chgbadge{{stroke:#ffffff;stroke-width:1.6;stroke-linecap:round;fill:none}}")
    return "".join(rules)
