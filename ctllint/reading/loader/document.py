"""The file as a whole: parse it, check its header (``ctllint: 1``) and top-level keys, read each section in turn.

``load_text`` and ``load_file`` are the loader's entry points. The two large
sections (``devices``, ``rungs``) are read entry by entry while the file is
parsed; the rest are read here in file-format order once the header shows
the file is a schematic of this version, then the cross-references. Its own
module because it is the one place that knows the order of the sections.
"""
from __future__ import annotations

from typing import Any, Callable

from ctllint.reading.kinds import KindRegistry
from ctllint.reading.loader.devices import device_entry, read_devices
from ctllint.reading.loader.expect import read_expect
from ctllint.reading.loader.files import DeviceFileCache, link_out_of_repository, read_text
from ctllint.reading.loader.references import check_device_references
from ctllint.reading.loader.rungs import read_rungs, rung_item
from ctllint.reading.loader.sink import LoadResult, Stop, excerpt, format_error
from ctllint.reading.loader.state import FileState
from ctllint.reading.loader.supplies import read_supplies
from ctllint.reading.loader.use import read_use
from ctllint.reading.loader.values import describe_value, streamed
from ctllint.reading.model import Diagnostic, Location, Schematic, Severity
from ctllint.reading.yamlsafe import STD, Limits, MappingNode, Node, ScalarNode, SequenceNode, YamlProblem, check_tree, compose, scalar_value, within

FORMAT_VERSION = 1
TOP_KEYS = ("ctllint", "title", "supplies", "devices", "rungs", "expect", "use")
REQUIRED_TOP = ("ctllint", "supplies", "devices", "rungs")
DEVICE_FILE_KEYS = ("ctllint", "title", "devices")


def load_file(
    path: str,
    kinds: KindRegistry | None = None,
    limits: Limits | None = None,
    device_cache: DeviceFileCache | None = None,
    display_path: str | None = None,
) -> LoadResult:
    """Load the schematic at ``path``; ``display_path`` is how messages name it."""
    limits = limits or Limits()
    shown = display_path or path
    outside = link_out_of_repository(path)
    if outside is not None:
        return LoadResult(None, [format_error(shown, 1, 1, f"is a symbolic link to a file outside the repository ({outside}), so it is not read")])
    text, problem = read_text(path, limits)
    if problem is not None:
        return LoadResult(None, [Diagnostic(shown, problem.line, problem.column, "format", Severity.ERROR, problem.message)])
    return load_text(text, shown, kinds=kinds, limits=limits, device_cache=device_cache, real_path=path)


def load_text(
    text: str,
    path: str = "t.ctl.yaml",
    kinds: KindRegistry | None = None,
    limits: Limits | None = None,
    device_cache: DeviceFileCache | None = None,
    real_path: str | None = None,
) -> LoadResult:
    """Load schematic text. ``path`` names the file in diagnostics and resolves ``use``."""
    st = FileState(path, real_path or path, kinds or KindRegistry.builtin(), limits or Limits(), device_cache)
    return read_document(st, text)


def read_document(st: FileState, text: str) -> LoadResult:
    """Parse ``text`` (streaming devices and rungs to their readers), then read the rest of it."""
    sink = st.sink
    sink.start(text)
    sch = st.sch = Schematic(path=st.path, loc=Location(st.path, 1, 1), line_count=sink.line_count)
    sch.text = text
    # The two large sections are read entry by entry while the file is
    # parsed (see yamlsafe.compose): the whole file is never a tree in memory.
    sections = {"devices": (MappingNode, lambda k, v: device_entry(st, k, v)),
                "rungs": (SequenceNode, lambda k, v: rung_item(st, k, v))}
    try:
        root = compose(text, st.limits, sections)
        if root is None or (isinstance(root, ScalarNode) and str(root.tag) == STD + "null" and not root.value):
            return _done(st, None, [format_error(st.path, 1, 1, "file is empty: a schematic needs ctllint, supplies, devices and rungs")])
        check_tree(root, st.limits)
    except YamlProblem as exc:
        return _done(st, None, [format_error(st.path, *within(sink.text_lines(), exc.line, exc.column), exc.message)])
    sch.loc = sink.loc(root)
    # Errors of the streamed sections count only once the file is known to
    # be a schematic of this version (read_top puts them back).
    sink.streamed_errors, sink.errors = sink.errors, []
    try:
        read_top(st, root, sch)
    except Stop:
        pass
    except RecursionError:
        sink.error(root, "structure nested too deeply to read")
    if sink.errors:
        return _done(st, None, sink.errors)
    return _done(st, sch, [])


def _done(st: FileState, sch: Schematic | None, diags: list[Diagnostic]) -> LoadResult:
    return LoadResult(sch, sorted(set(diags)), st.used)


def read_top(st: FileState, root: Node, sch: Schematic) -> None:
    """The top level: that it is a schematic, its format version, its keys, then each section."""
    keys = _top_keys(st, root)
    sink = st.sink
    sink.errors.extend(sink.streamed_errors)
    device_file = "supplies" not in keys and "rungs" not in keys and "expect" not in keys and "use" not in keys and "devices" in keys
    sch.device_file = device_file
    if not device_file:
        for req in REQUIRED_TOP:
            if req not in keys:
                sink.error(root, f"missing top-level key '{req}'")
    if "title" in keys:
        _guard(lambda: setattr(sch, "title", st.values.text(keys["title"][1], "title")))
    if "devices" in keys and not streamed(keys["devices"][1]):
        _guard(lambda: read_devices(st, keys.pop("devices")[1], sch))
    if "use" in keys:
        _guard(lambda: read_use(st, keys.pop("use")[1], sch, load_file))
    if "supplies" in keys:
        _guard(lambda: read_supplies(st, keys.pop("supplies")[1], sch))
    if "rungs" in keys and not streamed(keys["rungs"][1]):
        _guard(lambda: read_rungs(st, keys.pop("rungs")[1], sch))
    if "expect" in keys:
        _guard(lambda: read_expect(st, keys.pop("expect")[1], sch))
    if not sink.errors:
        check_device_references(st, sch)


def _top_keys(st: FileState, root: Node) -> dict[str, tuple[ScalarNode, Node]]:
    """The top-level keys, once the file shows it is a ctllint schematic of this format version."""
    sink = st.sink
    # A file that is not a schematic at all (a key, a token, a configuration
    # file named like one) gives one finding that quotes nothing of it.
    if not isinstance(root, MappingNode):
        sink.fail(root, f"not a ctllint schematic: the file is {describe_value(scalar_value(root)) if isinstance(root, ScalarNode) else 'a list'}, "
                        "not a mapping starting with 'ctllint: 1' (its text is not shown)")
    if not any(isinstance(k, ScalarNode) and k.value == "ctllint" for k, _ in root.value):
        sink.fail(root, "missing 'ctllint: 1' (the format version) at the top level: not a ctllint schematic (its keys are not shown)")
    entries = st.values.mapping(root, "a schematic file")
    keys = {k: (kn, vn) for k, kn, vn in entries}
    for key, knode, _ in entries:
        if key not in TOP_KEYS:
            sink.unknown_key(knode, key, "the top level", TOP_KEYS)
    # From here ``keys`` holds the only references to the sections, and
    # each is let go once read (``keys.pop``): the readers of the large
    # ones drop each item's nodes as they go, so the node tree shrinks
    # while the model grows instead of both being alive in full.
    root.value.clear()
    del entries
    if "ctllint" not in keys:
        sink.fail(root, "missing 'ctllint: 1' (the format version) at the top level")
    vnode = keys["ctllint"][1]
    version = st.values.scalar(vnode, "ctllint")
    # Only the whole number 1 as written: 1.0, 01 or 0x1 are other values
    if version != FORMAT_VERSION or type(version) is not int or vnode.value.strip() != str(FORMAT_VERSION):
        sink.fail(vnode, f"format version '{excerpt(vnode.value, 12)}' is not supported: this ctllint reads version {FORMAT_VERSION}")
    return keys


def _guard(fn: Callable[[], Any]) -> None:
    try:
        fn()
    except Stop:
        pass
