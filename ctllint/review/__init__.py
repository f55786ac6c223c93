"""Stage 4, review: what changed electrically between two revisions.

``diff`` matches two schematics' devices, supplies, rungs, elements and wire
numbers, and the findings that appeared or disappeared (checked through the
checking stage), for ``ctllint diff``, git's diff driver and the HTML report.

May import: ``ctllint.reading``, ``ctllint.circuit``, ``ctllint.api`` and
``ctllint.checking``.
"""
