"""Settling a simulated circuit: which loads are energized, contacts moved until nothing changes.

Evaluate every load (union-find over the closed elements), move every
device after its coils (``state``), repeat; a contact state seen before is
an oscillation, reported with the coils that change within the cycle; hot
and common of a supply joined through closed non-load elements afterwards
is a short circuit, reported with its path. ``StepResult`` is what one
action's settling found. Its own module: the order of evaluation, apart from
what each device does (``coils``).
"""
from __future__ import annotations

from collections import deque
from dataclasses import dataclass, field
from typing import Any

from ctllint.circuit.paths import path_text
from ctllint.circuit.simulate.coils import CoilResponses
from ctllint.circuit.wiresets import WireSets
from ctllint.reading.model import Element

_MAX_ITERATIONS = 10_000


@dataclass
class StepResult:
    """What one action did: whether the circuit settled, and why not.

    ``oscillating`` names the coils that keep changing (file order);
    ``shorts`` lists (supply name, element texts from hot to common) for
    each supply shorted in the final state. ``settled`` is false when either
    is non-empty.
    """

    settled: bool = True
    oscillating: list[str] = field(default_factory=list)
    shorts: list[tuple[str, list[str]]] = field(default_factory=list)
    why: str = ""


class Settling(CoilResponses):
    """Energizes loads and settles the circuit after each change of state."""

    def _union(self) -> tuple[dict[str, str], Any]:
        """Wires joined through closed non-load elements in the present state."""
        sets = WireSets((el.left, el.right) for el in self._switchable if self._closed(el))
        return sets.parent, sets.find

    def _evaluate(self) -> None:
        """Which loads are energized in the present contact state."""
        state = {t: False for t in self._load_tags}
        coils: set[tuple[str, str | None]] = set()
        if self.power_on:
            _, find = self._union()
            pairs = {(find(s.hot), find(s.common)) for s in self._supplies}
            for el in self._loads:
                a, b = find(el.left), find(el.right)
                if (a, b) in pairs or (b, a) in pairs:
                    state[el.tag] = True
                    if el.tag in self.latched or el.tag in self.started or el.tag in self._drive_stop or el.tag in self._drive_set:
                        coils.add((el.tag, el.part))
        self._energized = state
        self._latch_coils = coils

    def _settle(self) -> StepResult:
        seen = {self._key(): 0}
        states = [self._key()]
        energized = [dict(self._energized)]
        result = StepResult()
        for _ in range(_MAX_ITERATIONS):
            self._evaluate()
            energized[-1] = dict(self._energized)
            if not self._update():
                break
            key = self._key()
            if key in seen:
                cycle = energized[seen[key]:]
                result.oscillating = [t for t in self._coil_tags if len({e.get(t) for e in cycle}) > 1]
                if not result.oscillating:  # pragma: no cover - a cycle moves some coil
                    result.oscillating = list(self._coil_tags)
                result.settled = False
                self._evaluate()
                break
            seen[key] = len(states)
            states.append(key)
            energized.append(dict(self._energized))
        else:
            result.settled = False
            result.oscillating = list(self._coil_tags)
        self._drives_see()
        result.shorts = self._shorts()
        if result.shorts:
            result.settled = False
        result.why = self._why(result)
        return result

    def _why(self, result: StepResult) -> str:
        parts = []
        if result.oscillating:
            parts.append(f"oscillation: {', '.join(result.oscillating)} {'keeps' if len(result.oscillating) == 1 else 'keep'} switching on and off")
        for name, texts in result.shorts:
            parts.append(f"short circuit of supply {name}: {self._short_texts.get(name, '-'.join(texts))}")
        return "; ".join(parts)

    def _shorts(self) -> list[tuple[str, list[str]]]:
        self._short_texts: dict[str, str] = {}
        if not self.power_on:
            return []
        _, find = self._union()
        out = []
        adj: dict[str, list[Element]] | None = None
        for s in self._supplies:
            if find(s.hot) != find(s.common):
                continue
            if adj is None:
                adj = {}
                for el in self._switchable:
                    if self._closed(el):
                        adj.setdefault(el.left, []).append(el)
                        adj.setdefault(el.right, []).append(el)
            back: dict[str, Element | None] = {s.hot: None}
            queue = deque([s.hot])
            while queue and s.common not in back:
                w = queue.popleft()
                for el in adj.get(w, ()):
                    x = el.right if el.left == w else el.left
                    if x not in back:
                        back[x] = el
                        queue.append(x)
            path: list[Element] = []
            w = s.common
            while back.get(w) is not None:
                el = back[w]
                path.append(el)  # type: ignore[arg-type]
                w = el.right if el.left == w else el.left  # type: ignore[union-attr]
            path.reverse()
            self._short_texts[s.name] = path_text(s.hot, path)
            out.append((s.name, [el.text for el in path]))
        return out
