"""Stage 1, reading: schematic files in, plain located data out.

Safe YAML (``yamlsafe``, ``yamlhints`` for the plain-words hints), bounded
file access (``safeio``) and the time budget of a command (``budget``); the
loader (``loader``) that turns FORMAT.md into the model (``model``) with
parsed quantities (``quantities``), the device-kind table (``kinds``) and
terminal numbers (``terminals``). Every value keeps its file, line and column.

May import: the standard library and third-party packages only, never another
stage (it is the first).
"""
