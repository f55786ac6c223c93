"""The ``use`` section: shared device files, loaded and merged into this file's devices.

A used file is found relative to the using one, must stay inside the
repository, must hold only ``ctllint`` and ``devices``, and may not use back
a file that uses it. Its own module because it is the one section that reads
other files.
"""
from __future__ import annotations

import os
from typing import Callable

from ctllint.reading.loader.files import SCHEMATIC_SUFFIXES, find_repository_root
from ctllint.reading.loader.sink import LoadResult, Stop
from ctllint.reading.loader.state import FileState
from ctllint.reading.model import Schematic
from ctllint.reading.yamlsafe import Node, ScalarNode

# Real paths of the files whose ``use`` is being followed right now: a used
# file that uses one of them back is a cycle, refused instead of recursed into.
_USE_CHAIN: set[str] = set()


def read_use(st: FileState, node: Node, sch: Schematic, load_file: Callable[..., LoadResult]) -> None:
    """Load each used file with ``load_file`` (passed in: it is the loader this module is part of)."""
    items = [node] if isinstance(node, ScalarNode) else st.values.sequence(node, "use")
    here = os.path.dirname(os.path.abspath(st.real_path))
    root = os.path.realpath(find_repository_root(st.real_path))
    for item in items:
        try:
            rel = st.values.text(item, "use entry")
        except Stop:
            continue
        if any(ord(c) < 32 for c in rel):
            st.sink.error(item, f"use path {rel!r} holds a control character")
            continue
        if os.path.isabs(rel):
            st.sink.error(item, f"use path '{rel}' must be relative to this file")
            continue
        if not rel.endswith(SCHEMATIC_SUFFIXES):
            st.sink.error(item, f"use path '{rel}' must name a *.ctl.yaml device file")
            continue
        target = os.path.normpath(os.path.join(here, rel))
        real = os.path.realpath(target)
        if os.path.commonpath([root, real]) != root:
            st.sink.error(item, f"use path '{rel}' leaves the repository ({root})")
            st.used.append(target)  # recorded for the cache: a later fix must be seen
            continue
        if not os.path.isfile(real):
            st.used.append(target)  # missing today: creating it later changes the result
            if os.path.lexists(target) and not os.path.exists(target):
                st.sink.error(item, f"use path '{rel}' is a broken or looping symbolic link")
            else:
                st.sink.error(item, f"use path '{rel}' does not exist" if not os.path.exists(target) else f"use path '{rel}' is not a readable file")
            continue
        me = os.path.realpath(st.real_path)
        if real == me or real in _USE_CHAIN:
            st.sink.error(item, f"use path '{rel}' leads back to a file that uses it; a used file holds only ctllint and devices, never use")
            continue
        shown = _display_path(st.path, rel)
        loader = lambda: load_file(real, st.kinds, st.limits, None, display_path=shown)  # noqa: E731
        outermost = me not in _USE_CHAIN
        _USE_CHAIN.add(me)
        try:
            result = st.cache.get(real, loader) if st.cache else loader()
        finally:
            if outermost:
                _USE_CHAIN.discard(me)
        st.used.append(real)
        if result.schematic is None:
            first = result.diagnostics[0] if result.diagnostics else None
            detail = f": {first.line}:{first.column}: {first.message}" if first else ""
            st.sink.error(item, f"used file '{rel}' does not load{detail}")
            continue
        used = result.schematic
        if not used.device_file:
            st.sink.error(item, f"used file '{rel}' must hold only 'ctllint' and 'devices' (it has supplies or rungs)")
            continue
        sch.uses.append(real)
        for tag, dev in used.devices.items():
            if tag in sch.devices:
                mine = sch.devices[tag]
                if mine.origin == st.path:
                    st.sink.error(mine.loc, f"device {tag} is also defined in {shown} line {dev.loc.line}")
                else:
                    st.sink.error(item, f"device {tag} is defined both in {mine.origin} line {mine.loc.line} and in {shown} line {dev.loc.line}")
                continue
            sch.devices[tag] = dev


def _display_path(base: str, rel: str) -> str:
    folder = os.path.dirname(base)
    return os.path.normpath(os.path.join(folder, rel)) if folder else os.path.normpath(rel)
