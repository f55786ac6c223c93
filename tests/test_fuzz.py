"""Fuzzing: hostile and broken schematic files never give a traceback.

Valid schematics (``tests/data/fuzz/`` and ``fixtures/clean/``) are mutated
with their structure in mind: keys deleted, duplicated, renamed or swapped,
values of the wrong type, random unicode, huge, zero, negative, NaN and
infinite quantities, shared nodes (aliases), self-joined wires; then as
text: truncation, lines lost or doubled, tabs, a byte-order mark, bytes that
are not UTF-8, CR line ends, YAML syntax in odd places. Whatever the file
holds, ``ctllint check`` runs the whole pipeline in-process and:

- exits 0 or 1 (never 3, never a traceback), 1 exactly when an error is found;
- points every finding at a line of the file it names (1 for an empty file).

The mutation engine here is shared with ``tests/fuzz_campaign.py``, which
runs it for minutes rather than seconds.
"""
from __future__ import annotations

import glob
import io
import json
import math
import os
import random
import re
import shutil
import zlib
from contextlib import redirect_stderr, redirect_stdout
from dataclasses import dataclass
from typing import Any, Callable

import pytest
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st
from ruamel.yaml import YAML

from ctllint.commands.cli import main

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(HERE)
FUZZ_DATA = os.path.join(HERE, "data", "fuzz")


# -- the base schematics -----------------------------------------------------------

@dataclass(frozen=True, repr=False)
class Base:
    """A valid schematic to start from, and the files its ``use`` needs beside it."""

    rel: str                 # path relative to the repository root
    text: str
    data: Any                # the plain data YAML gives
    used: tuple[str, ...]    # repository-relative paths of the files it uses

    def __repr__(self) -> str:  # hypothesis prints this for a failing example
        return f"Base({self.rel!r})"

    def _repr_pretty_(self, printer, cycle) -> None:
        printer.text(repr(self))


def _plain_yaml() -> YAML:
    yaml = YAML(typ="safe", pure=True)
    yaml.version = (1, 2)
    return yaml


def load_bases() -> list[Base]:
    files = sorted(glob.glob(os.path.join(FUZZ_DATA, "*.ctl.yaml")))
    files += sorted(glob.glob(os.path.join(ROOT, "fixtures", "clean", "*.ctl.yaml")))
    bases = []
    for path in files:
        with open(path, encoding="utf-8") as handle:
            text = handle.read()
        data = _plain_yaml().load(text)
        if not isinstance(data, dict) or "rungs" not in data:
            continue  # a shared device file: used by others, not a base of its own
        used = data.get("use") or []
        used = [used] if isinstance(used, str) else used
        rels = tuple(os.path.relpath(os.path.normpath(os.path.join(os.path.dirname(path), u)), ROOT) for u in used)
        bases.append(Base(os.path.relpath(path, ROOT), text, data, rels))
    return bases


BASES = load_bases()


# -- the mutation engine -----------------------------------------------------------

KEY_WORDS = (
    "ctllint", "title", "supplies", "devices", "rungs", "expect", "use", "hot", "common", "voltage", "grounded",
    "source", "kind", "action", "function", "contacts", "rating", "positions", "coil", "inrush", "sealed",
    "coil_power", "suppressed", "delay", "preset", "poles", "power_rating", "feeds", "overload", "interlock",
    "vacuum", "setting", "technology", "power", "output", "current", "side", "primary", "secondary",
    "inrush_rating", "fuses", "input", "fla", "phases", "service_factor", "temp_rise", "paths", "number", "jog",
    "restart", "note", "name", "steps", "press", "release", "set", "trip", "reset", "wait", "check", "NO", "NC",
    "throw", "category", "size", "<<", "",
)
KINDS = (
    "pushbutton", "selector", "limit-switch", "pressure-switch", "temperature-switch", "float-switch", "flow-switch",
    "foot-switch", "relay", "timer", "contactor", "starter", "overload", "solenoid", "pilot-light", "horn",
    "plc-output", "plc-input", "fuse", "breaker", "transformer", "power-supply", "motor", "heater",
)
PARTS = ("NO", "NC", "coil", "hand", "auto", "off", "", "NO.NC", "coil.coil")
UNITS = ("V", "VAC", "VDC", "mV", "kV", "A", "mA", "kA", "VA", "kVA", "W", "kW", "hp", "s", "ms", "min", "h", "C", "K", "Hz", "")
NUMBERS = (
    "0", "-0", "-1", "-120", "1e308", "1e309", "9" * 400, "9" * 5000, "1e-400", "nan", "NaN", ".nan", "inf", "-inf", ".inf",
    "-.inf", "Infinity", "0x18", "0o17", "1_000", "1/0", "0/0", "1-1/0", "3/4", "1-1/2", "１２０", "١٢٠", "0.0000001",
    "120.", ".5", "1e5", "1E+5", "+5", "5 5",
)
ODD_TEXT = (
    "", " ", "\t", "~", "null", "true", "false", "on", "off", "yes", "no", "NO", "NC", "y", "n", ".", "..", "a.b.c",
    "-", "- x", "?", ":", ": x", "#", "&a", "*a", "!", "!!str", "%", "@", "`", "|", ">", "'", '"', "{", "}", "[", "]",
    ",", "\\", "\x00", "\x07", "\x1b[31m", "\u0085", "\u2028", "\u2029", "\ufeff", "\u202e", "\u200b", "\ud800",
    "\U0001F4A5", "e\u0301", "ß", "İ", "ǅ", "𝔐1", "M1\u00a0", "L1\r\nX2", "x" * 5000,
)
SPECIAL_SNIPPETS = (
    "!!python/object/apply:os.system ['echo pwned']", "!!python/name:os.system", "!!python/object:__main__.X {}",
    "!foo bar", "!<tag:example.com,2000:x> 1", "!!binary aGVsbG8=", "!!set {a, b}", "!!omap [a: 1]",
    "!!timestamp 2024-01-31", "!!float x", "!!int x", "!!bool maybe", "!!null x", "&anchor", "*undefined",
    "<<: *a", "? [a, b]\n: c", "? {a: 1}\n: 2", "---", "...", "%YAML 1.1\n---", "%TAG ! tag:evil.com,2000:\n---",
    "|", ">-", "|+\n\n\n", "{a: 1", "[1, 2", "'unterminated", '"bad \\q escape"', '"\\ud800"', "a: b: c",
    "- - - - - - - - - -", "\t- tabbed", "@reserved", "`reserved", "2024-01-31", "0x", "1e", "!!float .nan",
)


class Mutator:
    """Structure-aware and textual mutations of a schematic, driven by ``rng``.

    ``rng`` is a ``random.Random``; hypothesis passes one it controls (and
    can shrink), the campaign a seeded one.
    """

    def __init__(self, rng: random.Random, grow: int = 200):
        self.rng = rng
        self.grow = grow  # how many devices, rungs or steps op_grow and c_fan_out may add

    # -- values ----------------------------------------------------------------
    def unicode_text(self, max_len: int = 12) -> str:
        r = self.rng
        out = []
        for _ in range(r.randint(0, max_len)):
            pick = r.random()
            if pick < 0.4:
                out.append(r.choice("abcXYZ019._- :#&*!|>'\"{}[],%@`\t"))
            elif pick < 0.6:
                out.append(r.choice(("\u0085", "\u2028", "\u2029", "\ufeff", "\u202e", "\u200b", "\x00", "\x1f", "\x7f", "\r", "\n", "\ud800", "\udfff")))
            else:
                cp = r.randint(0, 0x10FFFF) if r.random() < 0.5 else r.randint(0x80, 0x3000)
                out.append(chr(cp))
        return "".join(out)

    def odd_number(self) -> Any:
        r = self.rng
        return r.choice((
            0, -1, -(10**30), 10**30, 2**64, 2**1000, 1e308, -1e308, 5e-324, math.nan, math.inf, -math.inf, 0.0, -0.0,
            r.randint(-10**6, 10**6), r.uniform(-1e6, 1e6),
        ))

    def quantity_text(self) -> str:
        r = self.rng
        sep = r.choice(("", " ", "  ", "\t", "\u00a0"))
        return f"{r.choice(NUMBERS)}{sep}{r.choice(UNITS)}"

    def wrong_value(self, depth: int = 0) -> Any:
        r = self.rng
        pick = r.randint(0, 11)
        if pick == 0:
            return None
        if pick == 1:
            return r.choice((True, False))
        if pick == 2:
            return self.odd_number()
        if pick == 3:
            return self.quantity_text()
        if pick == 4:
            return self.unicode_text()
        if pick == 5:
            return r.choice(ODD_TEXT)
        if pick == 6:
            return r.choice(KINDS + KEY_WORDS)
        if pick == 7 and depth < 3:
            return [self.wrong_value(depth + 1) for _ in range(r.randint(0, 4))]
        if pick == 8 and depth < 3:
            return {self.key(): self.wrong_value(depth + 1) for _ in range(r.randint(0, 3))}
        if pick == 9:
            return f"{r.choice(('M1', 'CR1', 'PB1', 'X', '', 'OL1', 'SS1', 'L1'))}.{r.choice(PARTS)}"
        if pick == 10:
            return r.choice(("L1", "X2", "+24", "0V", 1, 2, 3, "3", 0, -1, "a b", ""))
        return r.choice(SPECIAL_SNIPPETS)

    def key(self) -> Any:
        r = self.rng
        pick = r.random()
        if pick < 0.6:
            return r.choice(KEY_WORDS + KINDS)
        if pick < 0.8:
            return self.unicode_text(6)
        return r.choice((1, 0, -5, 3.5, True, None, "M1", "PB1", "CR1", "M1.coil", "a b"))

    # -- walking the tree ------------------------------------------------------
    def slots(self, data: Any) -> list[tuple[Any, Any]]:
        """Every (container, key-or-index) below ``data``, iteratively."""
        out = []
        stack = [data]
        seen = set()
        while stack:
            node = stack.pop()
            if id(node) in seen:
                continue
            seen.add(id(node))
            if isinstance(node, dict):
                for k in list(node):
                    out.append((node, k))
                    stack.append(node[k])
            elif isinstance(node, list):
                for i in range(len(node)):
                    out.append((node, i))
                    stack.append(node[i])
        return out

    def containers(self, data: Any) -> list[Any]:
        found = [data] if isinstance(data, (dict, list)) else []
        found += [c[k] for c, k in self.slots(data) if isinstance(c[k], (dict, list))]
        return found

    # -- structural mutations --------------------------------------------------
    def mutate_tree(self, data: Any) -> Any:
        r = self.rng
        ops: list[Callable[[Any], Any]] = [
            self.op_delete, self.op_duplicate, self.op_swap, self.op_rename_key, self.op_wrong_type,
            self.op_quantity, self.op_unicode, self.op_insert, self.op_path, self.op_share, self.op_grow,
        ]
        for _ in range(r.randint(1, 4)):
            data = r.choice(ops)(data)
        return data

    def op_delete(self, data: Any) -> Any:
        slots = self.slots(data)
        if not slots:
            return None
        c, k = self.rng.choice(slots)
        del c[k]
        return data

    def op_duplicate(self, data: Any) -> Any:
        conts = self.containers(data)
        if not conts:
            return data
        c = self.rng.choice(conts)
        if isinstance(c, list) and c:
            i = self.rng.randrange(len(c))
            c.insert(i, json.loads(json.dumps(c[i], default=str)) if self.rng.random() < 0.5 else c[i])
        elif isinstance(c, dict) and c:
            k = self.rng.choice(list(c))
            c[f"{k}{self.rng.choice(('', '2', '_', ' '))}" if isinstance(k, str) else k] = c[k]
        return data

    def op_swap(self, data: Any) -> Any:
        slots = self.slots(data)
        if len(slots) < 2:
            return data
        (c1, k1), (c2, k2) = self.rng.sample(slots, 2)
        try:
            c1[k1], c2[k2] = c2[k2], c1[k1]
        except (KeyError, IndexError):
            pass
        return data

    def op_rename_key(self, data: Any) -> Any:
        dicts = [c for c in self.containers(data) if isinstance(c, dict) and c]
        if not dicts:
            return data
        c = self.rng.choice(dicts)
        old = self.rng.choice(list(c))
        new = self.key()
        try:
            hash(new)
        except TypeError:
            return data
        value = c.pop(old)
        c[new] = value
        return data

    def op_wrong_type(self, data: Any) -> Any:
        slots = self.slots(data)
        if not slots:
            return self.wrong_value()
        c, k = self.rng.choice(slots)
        c[k] = self.wrong_value()
        return data

    def op_quantity(self, data: Any) -> Any:
        slots = [(c, k) for c, k in self.slots(data) if isinstance(c[k], str) and any(ch.isdigit() for ch in c[k])]
        if not slots:
            return data
        c, k = self.rng.choice(slots)
        c[k] = self.quantity_text() if self.rng.random() < 0.8 else self.odd_number()
        return data

    def op_unicode(self, data: Any) -> Any:
        slots = [(c, k) for c, k in self.slots(data) if isinstance(c[k], str)]
        if not slots:
            return data
        c, k = self.rng.choice(slots)
        text = c[k]
        at = self.rng.randint(0, len(text))
        c[k] = text[:at] + self.unicode_text(4) + text[at:] if self.rng.random() < 0.7 else self.unicode_text()
        return data

    def op_insert(self, data: Any) -> Any:
        conts = self.containers(data)
        if not conts:
            return data
        c = self.rng.choice(conts)
        if isinstance(c, list):
            c.insert(self.rng.randint(0, len(c)), self.wrong_value())
        else:
            key = self.key()
            try:
                c[key] = self.wrong_value()
            except TypeError:
                pass
        return data

    def op_path(self, data: Any) -> Any:
        """Mutate a rung path: self-joined wire, reversed, odd references, long chains."""
        r = self.rng
        paths = [c for c in self.containers(data) if isinstance(c, list) and len(c) >= 3 and all(not isinstance(x, (dict, list)) for x in c)]
        if not paths:
            return data
        p = r.choice(paths)
        pick = r.randint(0, 6)
        if pick == 0 and len(p) >= 3:
            p[-1] = p[0]  # a wire joined to itself through the whole path
        elif pick == 1:
            p.reverse()
        elif pick == 2:
            i = r.randrange(1, len(p), 2) if len(p) > 1 else 0
            p[i] = r.choice(("CR1.NO.NC", "", ".", "M1.", ".NO", "M1 .coil", "m1.coil", "M1.COIL", "X2", 3, None, True, "UNDECLARED.NO", "MTR1", "T1", "PB1.coil", "SS1.nowhere"))
        elif pick == 3:
            extra = [p[-1]]
            for j in range(r.randint(1, 300)):
                extra += [r.choice(("CR1.NO", "M1.NO", "PB1.NC", "OL1.NC", "FU1", "PL1", "M1.coil")), f"w{j}"]
            p[-1:] = extra
        elif pick == 4:
            del p[r.randrange(len(p))]  # even length: wires and elements out of step
        elif pick == 5:
            p[r.randrange(0, len(p), 2)] = r.choice(("L1", "X2", "+24", "0V", "H1", "H2", p[0], p[-1]))
        else:
            i = r.randrange(len(p))
            p.insert(i, p[i])
        return data

    def op_share(self, data: Any) -> Any:
        """Make one node stand in two places (aliases), sometimes inside itself (a recursive alias)."""
        slots = self.slots(data)
        conts = self.containers(data)
        if not slots or not conts:
            return data
        c, k = self.rng.choice(slots)
        c[k] = self.rng.choice(conts)
        return data

    def op_grow(self, data: Any) -> Any:
        """Many devices, rungs or scenario steps: sizes the rules must stay linear in."""
        r = self.rng
        if not isinstance(data, dict):
            return data
        n = r.randint(2, self.grow)
        pick = r.randint(0, 2)
        if pick == 0 and isinstance(data.get("devices"), dict):
            for i in range(n):
                data["devices"][f"CRX{i}"] = {"kind": "relay", "coil": "120 VAC"}
        elif pick == 1 and isinstance(data.get("rungs"), list) and data["rungs"]:
            data["rungs"].extend(data["rungs"][-1:] * n)  # the same rung again and again (shared: aliases)
        elif isinstance(data.get("expect"), list) and data["expect"] and isinstance(data["expect"][0], dict):
            steps = data["expect"][0].get("steps")
            if isinstance(steps, list):
                steps.extend([{"press": "PB2"}, {"release": "PB2"}, {"wait": "1 h"}] * n)
        return data

    # -- text -------------------------------------------------------------------
    def dump(self, data: Any) -> str:
        r = self.rng
        if r.random() < 0.1:
            try:
                return json.dumps(data, ensure_ascii=r.random() < 0.5, allow_nan=True, indent=r.choice((None, 2)), default=str)
            except (ValueError, RecursionError):
                pass
        yaml = YAML(typ="safe", pure=True)
        yaml.default_flow_style = r.choice((False, None, True))
        yaml.allow_unicode = r.random() < 0.7
        yaml.width = r.choice((80, 4096, 20))
        out = io.StringIO()
        try:
            yaml.dump(data, out)
        except Exception:  # noqa: BLE001 - the dumper cannot write some mutations (lone surrogates, odd keys)
            return json.dumps(data, default=str, ensure_ascii=True) if _jsonable(data) else "ctllint: 1\n"
        return out.getvalue()

    def mutate_text(self, text: str) -> bytes:
        r = self.rng
        lines = text.splitlines(keepends=True)
        for _ in range(r.randint(1, 3)):
            pick = r.randint(0, 13)
            if pick == 0 and text:  # truncation
                text = text[: r.randint(0, len(text))]
            elif pick == 1 and lines:  # a line lost
                del lines[r.randrange(len(lines))]
                text = "".join(lines)
            elif pick == 2 and lines:  # a line doubled: duplicate keys, duplicate paths
                i = r.randrange(len(lines))
                lines.insert(i, lines[i])
                text = "".join(lines)
            elif pick == 3 and len(lines) > 1:  # lines swapped
                i, j = r.sample(range(len(lines)), 2)
                lines[i], lines[j] = lines[j], lines[i]
                text = "".join(lines)
            elif pick == 4 and lines:  # tabs for indentation, or anywhere
                i = r.randrange(len(lines))
                stripped = lines[i].lstrip(" ")
                lines[i] = "\t" * r.randint(1, 2) + stripped if r.random() < 0.6 else lines[i].replace(" ", "\t", 1)
                text = "".join(lines)
            elif pick == 5:  # odd characters anywhere
                at = r.randint(0, len(text))
                text = text[:at] + self.unicode_text(6) + text[at:]
            elif pick == 6:  # YAML syntax where it does not belong
                at = r.randint(0, len(text))
                text = text[:at] + r.choice(SPECIAL_SNIPPETS) + r.choice(("", " ", "\n")) + text[at:]
            elif pick == 7:
                text = text.replace("\n", r.choice(("\r\n", "\r", "\n\n", "\u2028", "\x85")))
            elif pick == 8:
                text = r.choice(("", " ", "\n", "\n\n\n", "# only a comment\n", "---\n", "...\n", "--- |\n  text\n", "~", "[]", "{}", "1", "ctllint: 1", "\ufeff", "\t"))
            elif pick == 9:  # a second document
                text = text + "\n---\n" + text[: r.randint(0, len(text))]
            elif pick == 10 and lines:  # re-indented line
                i = r.randrange(len(lines))
                lines[i] = " " * r.randint(0, 9) + lines[i].lstrip(" ")
                text = "".join(lines)
            elif pick == 11:  # a tag on a value
                at = r.randint(0, len(text))
                text = text[:at] + r.choice(("!!python/object/apply:os.system ", "!foo ", "!!str ", "!!map ", "!!seq ", "&x ", "*x ", "!!merge ")) + text[at:]
            elif pick == 12:
                text = text.replace(" ", "", 1) if r.random() < 0.5 else text.replace(": ", ":", 1)
            else:
                text = text.replace(r.choice(("ctllint: 1", "120 VAC", "NO", "coil", "L1", "kind")), r.choice(("ctllint: 2", "ctllint: 1.0", "ctllint: '1'", "120 V AC", "N0", "coil ", "L 1", "kind:")), 1)
            lines = text.splitlines(keepends=True)
        data = text.encode("utf-8", "surrogatepass")
        return self.mutate_bytes(data) if r.random() < 0.25 else data

    def mutate_bytes(self, data: bytes) -> bytes:
        r = self.rng
        pick = r.randint(0, 5)
        if pick == 0:
            return b"\xef\xbb\xbf" + data  # a byte-order mark
        if pick == 1:
            at = r.randint(0, len(data))
            return data[:at] + r.choice((b"\xff", b"\xfe", b"\xc3", b"\x80", b"\xed\xa0\x80", b"\xf4\x90\x80\x80", b"\xc0\xaf", b"\xe2\x82")) + data[at:]
        if pick == 2:
            return data[: r.randint(0, len(data))]  # cut inside a multibyte character, maybe
        if pick == 3:
            return r.choice((b"\xff\xfe" + data.decode("utf-8", "replace").encode("utf-16-le"), b"\xfe\xff" + data.decode("utf-8", "replace").encode("utf-16-be"), data.decode("utf-8", "replace").encode("latin-1", "replace")))
        if pick == 4:
            return bytes(r.randrange(256) for _ in range(r.randint(0, 200)))
        at = r.randint(0, len(data))
        return data[:at] + b"\x00" + data[at:]

    # -- mutations that keep the file loadable, so the rules and the simulator run --
    def mutate_circuit(self, data: Any) -> Any:
        """Rewire, swap and extend the circuit while keeping the format: the rules' turn."""
        r = self.rng
        if not isinstance(data, dict) or not isinstance(data.get("rungs"), list):
            return data
        ops = [self.c_rewire, self.c_swap_elements, self.c_self_loop, self.c_drop, self.c_flip_part, self.c_add_path,
               self.c_extreme_quantity, self.c_fan_out, self.c_steps, self.c_bridge_rails, self.c_long_chain, self.c_field_tag]
        for _ in range(r.randint(1, 5)):
            try:
                r.choice(ops)(data)
            except (KeyError, IndexError, TypeError, ValueError, AttributeError):
                pass  # the op did not fit this schematic
        return data

    def _paths(self, data: dict) -> list[list]:
        return [p for rung in data["rungs"] if isinstance(rung, dict) for p in rung.get("paths") or [] if isinstance(p, list) and len(p) >= 3]

    def _wires(self, data: dict) -> list[Any]:
        wires = [w for p in self._paths(data) for w in p[0::2]]
        for sup in (data.get("supplies") or {}).values():
            wires += [sup.get("hot"), sup.get("common")]
        return [w for w in wires if w is not None] or ["L1", "X2"]

    def _elements(self, data: dict) -> list[str]:
        els = [e for p in self._paths(data) for e in p[1::2] if isinstance(e, str)]
        return els or ["CR1.NO"]

    def c_rewire(self, data: dict) -> None:
        p = self.rng.choice(self._paths(data))
        p[self.rng.randrange(0, len(p), 2)] = self.rng.choice(self._wires(data))

    def c_swap_elements(self, data: dict) -> None:
        paths = self._paths(data)
        p, q = self.rng.choice(paths), self.rng.choice(paths)
        i, j = self.rng.randrange(1, len(p), 2), self.rng.randrange(1, len(q), 2)
        p[i], q[j] = q[j], p[i]

    def c_self_loop(self, data: dict) -> None:
        w = self.rng.choice(self._wires(data))
        self.rng.choice(data["rungs"])["paths"].append([w, self.rng.choice(self._elements(data)), w])

    def c_drop(self, data: dict) -> None:
        pick = self.rng.randint(0, 3)
        if pick == 0 and len(data["rungs"]) > 1:
            del data["rungs"][self.rng.randrange(len(data["rungs"]))]
        elif pick == 1:
            rung = self.rng.choice(data["rungs"])
            if len(rung["paths"]) > 1:
                del rung["paths"][self.rng.randrange(len(rung["paths"]))]
        elif pick == 2 and data.get("devices"):
            del data["devices"][self.rng.choice(sorted(data["devices"]))]
        elif data.get("expect"):
            del data["expect"][self.rng.randrange(len(data["expect"]))]

    def c_flip_part(self, data: dict) -> None:
        p = self.rng.choice(self._paths(data))
        i = self.rng.randrange(1, len(p), 2)
        tag = str(p[i]).split(".")[0]
        p[i] = f"{tag}.{self.rng.choice(('NO', 'NC', 'coil', 'hand', 'auto', 'off', 'run', 'jog'))}" if self.rng.random() < 0.8 else tag

    def c_add_path(self, data: dict) -> None:
        wires = self._wires(data)
        path = [self.rng.choice(wires)]
        for _ in range(self.rng.randint(1, 4)):
            path += [self.rng.choice(self._elements(data)), self.rng.choice(wires + [f"n{self.rng.randint(0, 99)}"])]
        self.rng.choice(data["rungs"])["paths"].append(path)

    def c_extreme_quantity(self, data: dict) -> None:
        slots = [(c, k) for c, k in self.slots(data) if isinstance(c[k], str) and c[k][:1].isdigit() and c[k].split()[-1].isalpha()]
        c, k = self.rng.choice(slots)
        unit = c[k].split()[-1]
        c[k] = f"{self.rng.choice(('0', '0.0', '1e-300', '1e300', '1e308', '99999999', '0.001', '1', '1000000'))} {unit}"

    def c_fan_out(self, data: dict) -> None:
        """One contact in many parallel paths: the device used in many paths."""
        p = self.rng.choice(self._paths(data))
        i = self.rng.randrange(1, len(p), 2)
        rung = self.rng.choice(data["rungs"])
        for n in range(self.rng.randint(2, self.grow)):
            rung["paths"].append([p[i - 1], p[i], p[i + 1]] if n % 2 else [p[i - 1], p[i], f"f{n}", self.rng.choice(self._elements(data)), p[i + 1]])

    def c_steps(self, data: dict) -> None:
        tags = sorted(data.get("devices") or {}) or ["PB1"]
        steps = []
        for _ in range(self.rng.randint(1, 30)):
            action = self.rng.choice(("press", "release", "trip", "reset", "power", "wait", "check", "set"))
            tag = self.rng.choice(tags)
            if action == "power":
                steps.append({"power": self.rng.choice(("on", "off"))})
            elif action == "wait":
                steps.append({"wait": self.rng.choice(("0 s", "1 ms", "5 s", "1 h", "1e300 s", "1e-300 s"))})
            elif action == "check":
                steps.append({"check": {tag: self.rng.choice(("on", "off"))}})
            elif action == "set":
                steps.append({"set": {tag: self.rng.choice(("on", "off", "hand", "auto", "run", "jog", "nowhere"))}})
            else:
                steps.append({action: tag})
        data.setdefault("expect", []).append({"name": f"fuzz {self.rng.randint(0, 10**6)}", "steps": steps})

    def c_bridge_rails(self, data: dict) -> None:
        sups = [s for s in (data.get("supplies") or {}).values() if isinstance(s, dict)]
        a, b = self.rng.choice(sups), self.rng.choice(sups)
        self.rng.choice(data["rungs"])["paths"].append([a["hot"], self.rng.choice(self._elements(data)), b[self.rng.choice(("hot", "common"))]])

    def c_long_chain(self, data: dict) -> None:
        wires = self._wires(data)
        path = [self.rng.choice(wires)]
        for n in range(self.rng.randint(10, 400)):
            path += [self.rng.choice(self._elements(data)), f"c{n}"]
        path[-1] = self.rng.choice(wires)
        self.rng.choice(data["rungs"])["paths"].append(path)

    def c_field_tag(self, data: dict) -> None:
        """Point a device's feeds / overload / interlock / source at another tag, or at itself."""
        devices = data["devices"]
        tag = self.rng.choice(sorted(devices))
        field_name = self.rng.choice(("feeds", "overload", "interlock"))
        if devices[tag].get("kind") in ("contactor", "starter"):
            devices[tag][field_name] = self.rng.choice(sorted(devices) + [tag])

    def mutate(self, base: Base) -> bytes:
        """One hostile variant of ``base``: structural, textual, both, or a rewired circuit."""
        r = self.rng
        pick = r.random()
        if pick < 0.2:
            return self.mutate_text(base.text)
        if pick < 0.55:
            return self.dump(self.mutate_circuit(json.loads(json.dumps(base.data)))).encode("utf-8", "surrogatepass")
        data = self.mutate_tree(json.loads(json.dumps(base.data)))
        text = self.dump(data)
        if pick < 0.85:
            return text.encode("utf-8", "surrogatepass")
        return self.mutate_text(text)


def _jsonable(data: Any) -> bool:
    try:
        json.dumps(data, default=str)
        return True
    except (ValueError, RecursionError, TypeError):
        return False


# -- running ctllint and checking its answer ----------------------------------------

def line_count(data: bytes) -> int:
    """Lines of a file as an editor counts them, generously: 1 for an empty file."""
    text = data.decode("utf-8", "replace")
    return max(1, len(data.splitlines()), len(text.splitlines()))


class Workspace:
    """A scratch repository where a base's mutated file is written, with the files it uses."""

    def __init__(self, folder: str, plugin_seconds: float = 10):
        self.folder = folder
        os.makedirs(os.path.join(folder, ".git"), exist_ok=True)  # the repository root for `use`
        self.config = os.path.join(folder, ".ctllint.yaml")
        with open(self.config, "w", encoding="utf-8") as handle:
            handle.write(f"# fuzzing: default rules, shorter time limits\nlimits: {{plugin_seconds: {plugin_seconds}, command_seconds: {4 * plugin_seconds + 30}}}\n")

    def place(self, base: Base, data: bytes) -> str:
        # Each base in a repository of its own: a run on a schematic that uses a
        # shared transformer brings in the other schematics of the repository that
        # use it (RULES.md, control-transformer), so another base placed beside it
        # earlier would make a one-file check a two-file one.
        root = os.path.join(self.folder, f"base-{zlib.crc32(base.rel.encode('utf-8')):08x}")
        os.makedirs(os.path.join(root, ".git"), exist_ok=True)
        for rel in base.used:
            target = os.path.join(root, rel)
            if not os.path.exists(target):
                os.makedirs(os.path.dirname(target), exist_ok=True)
                shutil.copyfile(os.path.join(ROOT, rel), target)
        path = os.path.join(root, base.rel)
        os.makedirs(os.path.dirname(path), exist_ok=True)
        with open(path, "wb") as handle:
            handle.write(data)
        return path

    def argv(self, path: str, fmt: str = "json") -> list[str]:
        return ["check", "--config", self.config, "--format", fmt, "--no-cache", path]


def run_cli(argv: list[str]) -> tuple[int, str, str]:
    """``ctllint.commands.cli.main`` in this process, with its output caught."""
    out, err = io.StringIO(), io.StringIO()
    with redirect_stdout(out), redirect_stderr(err):
        rc = main(argv)
    return rc, out.getvalue(), err.getvalue()


def problems_with(rc: int, out: str, err: str, path: str, data: bytes) -> list[str]:
    """What is wrong with ctllint's answer for the file ``path`` holding ``data``; [] when all is well."""
    found = []
    if rc not in (0, 1):
        found.append(f"exit status {rc}")
    if "Traceback" in err or "internal error" in err:
        found.append("traceback:\n" + err[-4000:])
    if rc not in (0, 1):
        return found
    try:
        doc = json.loads(out)
    except ValueError:
        return found + [f"output is not JSON: {out[:300]!r}"]
    if doc.get("files") != 1:
        found.append(f"files is {doc.get('files')}, not 1")
    counts = {os.path.realpath(path): line_count(data)}
    errors = False
    for d in doc["diagnostics"]:
        where = os.path.realpath(d["path"])
        if where not in counts:
            try:
                with open(where, "rb") as handle:
                    counts[where] = line_count(handle.read())
            except OSError:
                found.append(f"finding names a file that is not there: {d}")
                continue
        if not (1 <= d["line"] <= counts[where]) or d["column"] < 1:
            found.append(f"finding at line {d['line']} column {d['column']} of a {counts[where]}-line file: {d}")
        if d["severity"] not in ("error", "warning", "info") or not d["rule"] or not isinstance(d["message"], str):
            found.append(f"malformed finding: {d}")
        errors = errors or d["severity"] == "error"
    if rc != (1 if errors else 0):
        found.append(f"exit status {rc} but {'an' if errors else 'no'} error finding")
    if STRICT:
        found += [f"a rule failed: {m}" for m in rule_failures(doc)]
    return found


# -- the commands other than check ----------------------------------------------------

# What a file may hold that must not reach a terminal raw (see ctllint.commands.cli.printable).
_RAW = re.compile("[\x00-\x08\x0b-\x1f\x7f-\x9f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]")


def other_commands(ws: Workspace, base: Base, path: str) -> list[tuple[str, list[str]]]:
    """(name, argv) of every command besides check, run on the file at ``path`` (its base is the old side of diff)."""
    original = os.path.join(ws.folder, "original", os.path.basename(path))
    os.makedirs(os.path.dirname(original), exist_ok=True)
    with open(original, "w", encoding="utf-8") as handle:
        handle.write(base.text)
    out = os.path.join(ws.folder, "out")
    os.makedirs(out, exist_ok=True)
    cfg = ["--config", ws.config]
    runs = [
        ("draw", ["draw", *cfg, path, "-o", os.path.join(out, "d.svg")]),
        ("report", ["report", *cfg, path, "-o", os.path.join(out, "r.html")]),
        ("xref", ["xref", *cfg, path]),
        ("simulate", ["simulate", *cfg, path, "--layout", "steps"]),
        ("diff", ["diff", *cfg, original, path]),
        ("diff-json", ["diff", *cfg, "--format", "json", "--no-findings", path, original]),
    ]
    from ctllint.reading.loader import load_file

    try:
        sch = load_file(path).schematic
    except Exception:  # noqa: BLE001 - the commands themselves are what is tested
        sch = None
    if sch is not None and sch.expect and sch.expect[0].name:
        runs.append(("simulate-scenario", ["simulate", *cfg, path, "--scenario", sch.expect[0].name, "--layout", "loads"]))
    return runs


def other_problems(name: str, argv: list[str], rc: int, out: str, err: str) -> list[str]:
    """What is wrong with a command's answer: a traceback, an exit status it never gives, output that is not
    what it says, control characters from the file reaching the terminal."""
    found = []
    allowed = (0, 1, 2) if name.startswith("simulate-scenario") else (0, 1)  # a scenario naming unknown tags is a usage error
    if rc not in allowed:
        found.append(f"{name}: exit status {rc}")
    if "Traceback" in err or "internal error" in err:
        found.append(f"{name}: traceback:\n" + err[-4000:])
    if found:
        return found
    if name == "draw" and rc == 0:
        target = argv[argv.index("-o") + 1]
        try:
            import xml.dom.minidom

            xml.dom.minidom.parse(target)
        except Exception as exc:  # noqa: BLE001
            found.append(f"draw: the SVG is not well-formed XML: {exc}")
    if name == "report" and not os.path.exists(argv[argv.index("-o") + 1]):
        found.append("report: no page written")
    if name == "diff-json":
        try:
            json.loads(out)
        except ValueError:
            found.append(f"diff --format json: output is not JSON: {out[:300]!r}")
    elif name in ("xref", "simulate", "simulate-scenario", "diff"):
        raw = _RAW.search(out)
        if raw:
            found.append(f"{name}: {raw.group()!r} reaches the terminal raw: {out[max(0, raw.start() - 80):raw.start() + 80]!r}")
    return found


def assert_commands_sound(workspace: Workspace, base: Base, data: bytes, capsys) -> None:
    path = workspace.place(base, data)
    for name, argv in other_commands(workspace, base, path):
        capsys.readouterr()
        rc = main(argv)
        out, err = capsys.readouterr()
        found = other_problems(name, argv, rc, out, err)
        assert not found, f"{base.rel} mutated to {data[:2000]!r}:\n" + "\n".join(found)


# CTLLINT_FUZZ_STRICT=1 also fails on a rule that raised or ran out of time (a
# plugin-error finding): not a traceback, but a bug in that rule.
STRICT = os.environ.get("CTLLINT_FUZZ_STRICT", "") not in ("", "0")


def rule_failures(doc: dict) -> list[str]:
    return [d["message"] for d in doc.get("diagnostics", []) if d["rule"] == "plugin-error" and any(w in d["message"] for w in (" raised ", "did not finish", "did not run", "returned "))]


# -- the properties ------------------------------------------------------------------

FUZZ_SETTINGS = settings(
    max_examples=150,
    deadline=None,
    suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow, HealthCheck.data_too_large],
)


@pytest.fixture(scope="module")
def workspace(tmp_path_factory) -> Workspace:
    return Workspace(str(tmp_path_factory.mktemp("fuzz")), plugin_seconds=3)


SUITE_GROW = 30  # the suite keeps files small; tests/fuzz_campaign.py grows them to 200


def assert_sound(workspace: Workspace, base: Base, data: bytes, capsys) -> None:
    path = workspace.place(base, data)
    capsys.readouterr()
    rc = main(workspace.argv(path))
    out, err = capsys.readouterr()
    found = problems_with(rc, out, err, path, data)
    assert not found, f"{base.rel} mutated to {data[:2000]!r}:\n" + "\n".join(found)


def test_bases_are_valid(workspace, capsys):
    """Every base schematic loads without format errors, so mutations start from sound ground."""
    assert len(BASES) >= 4
    for base in BASES:
        path = workspace.place(base, base.text.encode("utf-8"))
        capsys.readouterr()
        rc = main(workspace.argv(path))
        out, err = capsys.readouterr()
        assert rc in (0, 1), err
        formats = [d for d in json.loads(out)["diagnostics"] if d["rule"] == "format"]
        assert not formats, f"{base.rel}: {formats}"


@FUZZ_SETTINGS
@given(base=st.sampled_from(BASES), rng=st.randoms(use_true_random=False))
def test_structural_mutations(workspace, capsys, base, rng):
    """Keys deleted, duplicated, renamed, swapped; wrong types; odd quantities; aliases."""
    m = Mutator(rng, SUITE_GROW)
    data = m.dump(m.mutate_tree(json.loads(json.dumps(base.data))))
    assert_sound(workspace, base, data.encode("utf-8", "surrogatepass"), capsys)


@FUZZ_SETTINGS
@given(base=st.sampled_from(BASES), rng=st.randoms(use_true_random=False))
def test_text_mutations(workspace, capsys, base, rng):
    """Truncation, lost and doubled lines, tabs, BOM, bytes that are not UTF-8, odd syntax."""
    assert_sound(workspace, base, Mutator(rng).mutate_text(base.text), capsys)


@settings(FUZZ_SETTINGS, max_examples=100)
@given(base=st.sampled_from(BASES), rng=st.randoms(use_true_random=False))
def test_mixed_mutations(workspace, capsys, base, rng):
    assert_sound(workspace, base, Mutator(rng, SUITE_GROW).mutate(base), capsys)


@settings(FUZZ_SETTINGS, max_examples=100)
@given(base=st.sampled_from(BASES), rng=st.randoms(use_true_random=False))
def test_circuit_mutations(workspace, capsys, base, rng):
    """Rewired paths, self-joined wires, fan-out, bridged rails, long chains, random scenarios:
    files that load, so every rule and the simulator run on them."""
    m = Mutator(rng, SUITE_GROW)
    data = m.dump(m.mutate_circuit(json.loads(json.dumps(base.data))))
    assert_sound(workspace, base, data.encode("utf-8", "surrogatepass"), capsys)


@settings(FUZZ_SETTINGS, max_examples=20)
@given(base=st.sampled_from(BASES), rng=st.randoms(use_true_random=False))
def test_other_commands(workspace, capsys, base, rng):
    """draw, report, xref, simulate and diff on mutated files: no traceback, well-formed SVG and
    JSON, nothing from the file reaching the terminal raw. Their time is bounded by
    limits.command_seconds in the workspace's configuration."""
    m = Mutator(rng, SUITE_GROW)
    if rng.random() < 0.5:
        data = m.dump(m.mutate_circuit(json.loads(json.dumps(base.data)))).encode("utf-8", "surrogatepass")
    else:
        data = m.mutate(base)
    assert_commands_sound(workspace, base, data, capsys)


@settings(FUZZ_SETTINGS, max_examples=60)
@given(data=st.binary(max_size=400))
@example(b"")
@example(b"\xef\xbb\xbf")
@example(b"\xef\xbb\xbfctllint: 1\n")
@example(b"\xff\xfe\x00\x00")
@example(b"ctllint: 1\nrungs: [\n")
@example(b"\t")
@example(b"a: [\n")
@example(b"\x00")
def test_any_bytes(workspace, capsys, data):
    assert_sound(workspace, BASES[0], data, capsys)


@settings(FUZZ_SETTINGS, max_examples=60)
@given(text=st.text(max_size=300))
def test_any_text(workspace, capsys, text):
    assert_sound(workspace, BASES[0], text.encode("utf-8", "surrogatepass"), capsys)


@settings(FUZZ_SETTINGS, max_examples=60)
@given(
    base=st.sampled_from(BASES),
    value=st.one_of(
        st.floats(allow_nan=True, allow_infinity=True).map(lambda f: f"{f} V"),
        st.integers(min_value=-(10**40), max_value=10**40).map(lambda n: f"{n} VA"),
        st.sampled_from(NUMBERS).flatmap(lambda n: st.sampled_from(UNITS).map(lambda u: f"{n} {u}")),
        st.floats(allow_nan=True, allow_infinity=True),
        st.integers(min_value=-(10**40), max_value=10**40),
    ),
    rng=st.randoms(use_true_random=False),
)
def test_odd_quantities(workspace, capsys, base, value, rng):
    """Huge, zero, negative, NaN and infinite values wherever a quantity or count stands."""
    data = json.loads(json.dumps(base.data))
    m = Mutator(rng, SUITE_GROW)
    slots = [(c, k) for c, k in m.slots(data) if isinstance(c[k], (str, int, float)) and not isinstance(c[k], bool) and any(ch.isdigit() for ch in str(c[k]))]
    for c, k in rng.sample(slots, min(len(slots), rng.randint(1, 3))):
        c[k] = value
    assert_sound(workspace, base, m.dump(data).encode("utf-8", "surrogatepass"), capsys)


@pytest.mark.parametrize("fmt", ["text", "json", "sarif", "junit"])
def test_every_format_survives_hostile_text(workspace, fmt):
    """Control characters, lone surrogates and markup in messages do not break a format."""
    base = BASES[0]
    rng = random.Random(7)
    m = Mutator(rng)
    for _ in range(5):
        data = m.mutate(base)
        path = workspace.place(base, data)
        rc, out, err = run_cli(workspace.argv(path, fmt))
        assert rc in (0, 1), err
        assert "Traceback" not in err
        if fmt in ("json", "sarif"):
            json.loads(out)
