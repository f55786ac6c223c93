"""Load schematic files (FORMAT.md version 1) into located model objects.

Every value the file holds keeps its 1-based line and column. Every breach
of the format becomes a ``format`` diagnostic at the offending value; the
loader reports all of a file's format errors it can find, not only the
first, and returns no schematic when there were any.

The package follows the sections of the file format, around one sink that
collects every located diagnostic of a file (``sink``):

- ``document``   the file as a whole: parsing, the ``ctllint: 1`` header,
                 the top-level keys and the order the sections are read in;
                 ``load_file`` and ``load_text``
- ``supplies``, ``devices`` (with ``ratings``), ``rungs``, ``expect``, ``use``
                 one module per section
- ``references`` cross-references checked once every section is read
- ``values``     reading one value (text, wire, tag, quantity, ...) for all
- ``state``      what the readers of one file share
- ``files``      reading a file from disk, safely; the device-file cache

This module keeps the names other modules import from ``ctllint.reading.loader``.
"""
from __future__ import annotations

from ctllint.reading.loader.values import TAG_RE
from ctllint.reading.loader.document import DEVICE_FILE_KEYS, FORMAT_VERSION, REQUIRED_TOP, TOP_KEYS, load_file, load_text
from ctllint.reading.loader.expect import STEP_ACTIONS
from ctllint.reading.loader.files import SCHEMATIC_SUFFIXES, DeviceFileCache, find_repository_root, link_out_of_repository, read_text
from ctllint.reading.loader.ratings import CATEGORY_RE, NEMA_SIZES, PILOT_DUTY, PILOT_DUTY_VALID
from ctllint.reading.loader.rungs import REF_RE, RUNG_KEYS
from ctllint.reading.loader.sink import LoadResult, count_lines, excerpt, format_error
from ctllint.reading.loader.supplies import SUPPLY_KEYS

__all__ = [
    "CATEGORY_RE", "DEVICE_FILE_KEYS", "FORMAT_VERSION", "NEMA_SIZES", "PILOT_DUTY", "PILOT_DUTY_VALID", "REF_RE",
    "REQUIRED_TOP", "RUNG_KEYS", "SCHEMATIC_SUFFIXES", "STEP_ACTIONS", "SUPPLY_KEYS", "TAG_RE", "TOP_KEYS",
    "DeviceFileCache", "LoadResult", "count_lines", "excerpt", "find_repository_root", "format_error",
    "link_out_of_repository", "load_file", "load_text", "read_text",
]
