"""What the section readers of one file share: the sink, the value reader and the state read so far.

``devices`` and ``rungs`` are read entry by entry while the file is parsed
(see ``yamlsafe.compose``), so what an entry's reader must know of the
entries before it (tags and rung numbers seen, counts, whether reading
stopped at a limit) lives here rather than in a reader's locals. Its own
module so that every section module can take it without importing another.
"""
from __future__ import annotations

from ctllint.reading.kinds import KindRegistry
from ctllint.reading.loader.files import DeviceFileCache
from ctllint.reading.loader.sink import FormatSink
from ctllint.reading.loader.values import ValueReader
from ctllint.reading.model import Schematic
from ctllint.reading.yamlsafe import Limits


class FileState:
    """One file's reading: where it is, what it may use, and what has been read of it so far."""

    def __init__(self, path: str, real_path: str, kinds: KindRegistry, limits: Limits, cache: DeviceFileCache | None):
        self.path = path
        self.real_path = real_path
        self.kinds = kinds
        self.limits = limits
        self.cache = cache
        self.sink = FormatSink(path)  # the one sink of the file's format diagnostics
        self.values = ValueReader(self.sink)
        self.used: list[str] = []
        self.shapes: dict[tuple[str, ...], tuple[str, ...]] = {}  # field-name tuples shared by devices written alike
        # State of the sections read entry by entry (device_entry, rung_item).
        self.sch: Schematic | None = None
        self.device_keys: dict[str, int] = {}  # device tag -> line, for duplicates
        self.rung_numbers: dict[int, int] = {}  # rung number -> line of its rung
        self.rung_count = 0
        self.element_count = 0
        self.rungs_stopped = False
