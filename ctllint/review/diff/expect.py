"""The diff of ``expect`` scenarios: scenarios added or removed, and steps added or removed within one.

Steps are compared as values (``250 mA`` equals ``0.25 A``) and shown as
written. Its own module because scenarios are a section of the file of their
own, compared as sequences.
"""
from __future__ import annotations

import difflib
from typing import Any

from ctllint.reading.model import Schematic, Step
from ctllint.review.diff.declarations import ordered_union
from ctllint.review.diff.result import ADDED, CHANGED, REMOVED, ScenarioDiff, StepDiff
from ctllint.review.diff.values import Source, value_key


def _step_text(step: Step, src: Source) -> str:
    written = src.written_after_key(step.loc)
    if written is not None:
        return f"{step.action}: {written}"
    if step.action == "wait":
        return f"wait: {step.seconds:g} s"
    if step.action == "power":
        return f"power: {step.targets.get('')}"
    if step.action in ("set", "check"):
        values = ", ".join(f"{t}: {('on' if v else 'off') if isinstance(v, bool) else v}" for t, v in step.targets.items())
        return f"{step.action}: {{{values}}}"
    tags = list(step.targets)
    return f"{step.action}: {tags[0] if len(tags) == 1 else '[' + ', '.join(tags) + ']'}"


def _step_key(step: Step) -> Any:
    return (step.action, tuple((t, value_key(v)) for t, v in step.targets.items()), float(f"{step.seconds:.9g}"))


def diff_scenarios(old: Schematic | None, new: Schematic | None, so: Source, sn: Source) -> list[ScenarioDiff]:
    a = {s.name: s for s in (old.expect if old else [])}
    b = {s.name: s for s in (new.expect if new else [])}
    out = []
    for name in ordered_union(b, a):
        s, t = a.get(name), b.get(name)
        if s is None:
            out.append(ScenarioDiff(name, ADDED, [StepDiff(ADDED, k + 1, _step_text(st, sn)) for k, st in enumerate(t.steps)], new_line=t.loc.line))
        elif t is None:
            out.append(ScenarioDiff(name, REMOVED, [StepDiff(REMOVED, k + 1, _step_text(st, so)) for k, st in enumerate(s.steps)], old_line=s.loc.line))
        else:
            keys_a = [_step_key(x) for x in s.steps]
            keys_b = [_step_key(x) for x in t.steps]
            if keys_a == keys_b:
                continue
            steps = []
            for op, i1, i2, j1, j2 in difflib.SequenceMatcher(None, keys_a, keys_b, autojunk=False).get_opcodes():
                if op == "equal":
                    continue
                steps += [StepDiff(REMOVED, k + 1, _step_text(s.steps[k], so)) for k in range(i1, i2)]
                steps += [StepDiff(ADDED, k + 1, _step_text(t.steps[k], sn)) for k in range(j1, j2)]
            out.append(ScenarioDiff(name, CHANGED, steps, s.loc.line, t.loc.line))
    return out
