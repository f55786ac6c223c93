"""Stage 5, output: what people read.

``report`` (the text, JSON, SARIF and JUnit formats, registered as a plugin,
and ``SAFETY_NOTE``, the one caution text), ``draw`` (the ladder as SVG),
``htmlreport`` (one self-contained page with drawings, findings and changes),
``export`` (wire list, bill of materials, terminal plan as CSV), ``schema``
(the JSON Schema for editors) and ``progress`` (the progress line).

May import: every stage before it (reading, circuit, api, checking, review).
"""
