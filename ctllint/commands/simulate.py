"""``ctllint simulate FILE``: the behaviour model run step by step, every load's state after each step.

Holds the parsing of ``--step`` arguments into model steps and the two table layouts.
"""
from __future__ import annotations

import argparse
import difflib
import shutil
import sys

from ctllint.reading.budget import work
from ctllint.commands._shared import one_file, refuse_unloadable
from ctllint.commands.base import EXIT_FINDINGS, EXIT_OK, UsageError, add_config_args, add_plugins_arg, command, printable
from ctllint.reading.loader import LoadResult
from ctllint.reading.model import Location, Scenario, Schematic, Step


SIMULATE_HELP = """\
Run the behaviour model on a schematic and print every load's state after
each step: a row per step, a column per load (or the other way round when
that fits the terminal better; see --layout). The first row is the rest
state: power on, nothing actuated, selectors in their first position,
everything settled. Steps that leave the circuit oscillating or shorted are
called out, and the run stops there, as an expect scenario does.

Steps (--step, repeatable, run in the order given):

  press:TAG[,TAG...]        hold pushbuttons or switches actuated
  release:TAG[,TAG...]      return them to rest (a selector to its first position)
  set:TAG=VALUE[,...]       a selector's position (set:SS1=auto), or a switch
                            or PLC output on/off (set:Q0_3=on)
  trip:TAG[,TAG...]         trip an overload, blow a fuse or breaker
  reset:TAG[,TAG...]        reset it
  power:on | power:off      control power
  wait:TIME                 let time pass for timers (wait:5s, wait:200ms)
  check:TAG=on|off[,...]    compare states; a failed check is marked FAIL

or --scenario NAME to run one of the file's expect scenarios.

Cells: ON energized, - not energized; * marks a load this step changed.

exit status: 0 every step settled and every check held, 1 a step did not
settle, a check failed, the file does not load or the run passed
limits.command_seconds, 2 usage error (an unknown tag, a bad step, an
unknown scenario).

example:
  ctllint simulate press.ctl.yaml --step press:PB2 --step release:PB2 \\
      --step trip:OL1 --step reset:OL1 --step power:off --step wait:5s
"""

_ACTIONS = ("press", "release", "set", "trip", "reset", "power", "wait", "check")


def _configure_simulate(p: argparse.ArgumentParser) -> None:
    p.description = SIMULATE_HELP
    p.add_argument("path", metavar="FILE", help="a schematic file (*.ctl.yaml)")
    p.add_argument("--step", action="append", default=[], metavar="ACTION:ARGS", help="a step to run, e.g. press:PB2 (repeatable; see above)")
    p.add_argument("--scenario", metavar="NAME", help="run the expect scenario of this name instead of --step")
    p.add_argument("--layout", choices=("auto", "steps", "loads"), default="auto",
                   help="rows are steps (steps), rows are loads (loads), or whichever fits the terminal (auto, the default)")
    add_config_args(p)
    add_plugins_arg(p)


def _tag_hint(tag: str, candidates: list[str]) -> str:
    close = difflib.get_close_matches(tag, candidates, n=1)
    return f" (did you mean {close[0]}?)" if close else ""


def parse_step(text: str, index: int, sch: Schematic, sim) -> Step:
    """One --step argument as a model Step; a UsageError says what is wrong."""
    where = f"--step {text}"
    action, sep, rest = text.partition(":")
    action = action.strip().lower()
    rest = rest.strip()
    if action not in _ACTIONS:
        hint = _tag_hint(action, list(_ACTIONS))
        raise UsageError(f"ctllint: {where}: unknown action '{action}'{hint}; actions: {', '.join(_ACTIONS)} (see 'ctllint simulate --help')")
    if not sep or not rest:
        raise UsageError(f"ctllint: {where}: {action} needs an argument, e.g. {_EXAMPLE[action]}")
    loc = Location("<command line>", 0, index + 1)
    step = Step(action=action, loc=loc)
    devices = sch.devices
    if action == "power":
        if rest.lower() not in ("on", "off"):
            raise UsageError(f"ctllint: {where}: power is on or off, e.g. power:off")
        step.targets[""] = rest.lower()
        step.target_locs[""] = loc
        return step
    if action == "wait":
        from ctllint.reading.quantities import QuantityError, parse_quantity

        try:
            step.seconds = parse_quantity(rest, "time").value
        except QuantityError as exc:
            raise UsageError(f"ctllint: {where}: {exc} (e.g. wait:5s or wait:200ms)") from None
        return step
    for item in (x.strip() for x in rest.split(",")):
        if not item:
            raise UsageError(f"ctllint: {where}: an empty device name")
        tag, eq, value = (s.strip() for s in item.partition("="))
        if action in ("set", "check") and (not eq or not value):
            raise UsageError(f"ctllint: {where}: {action} needs TAG=VALUE, e.g. {_EXAMPLE[action]}")
        if action not in ("set", "check") and eq:
            raise UsageError(f"ctllint: {where}: {action} takes device tags only, e.g. {_EXAMPLE[action]}")
        if tag not in devices:
            raise UsageError(f"ctllint: {where}: no device '{tag}' in {sch.path}{_tag_hint(tag, list(devices))}")
        dev = devices[tag]
        if action == "press" and tag not in sim.actuated:
            raise UsageError(f"ctllint: {where}: {tag} is a {dev.kind}; press works on pushbuttons and switches"
                             + (" (a selector is turned with set:TAG=POSITION)" if dev.kind == "selector" else ""))
        if action == "release" and tag not in sim.actuated and tag not in sim.position:
            raise UsageError(f"ctllint: {where}: {tag} is a {dev.kind}; release works on pushbuttons, switches and selectors")
        if action in ("trip", "reset") and tag not in sim.tripped:
            raise UsageError(f"ctllint: {where}: {tag} is a {dev.kind}; {action} works on overloads, fuses and breakers")
        if action == "set":
            if tag in sim.position:
                positions = [str(p) for p in (dev.get("positions") or [])]
                if value not in positions:
                    raise UsageError(f"ctllint: {where}: selector {tag} has no position '{value}' (positions: {', '.join(positions)})")
            elif tag in sim.actuated or tag in sim.outputs_on:
                if value.lower() not in ("on", "off"):
                    raise UsageError(f"ctllint: {where}: {tag} is set on or off, not '{value}'")
                value = value.lower()
            else:
                raise UsageError(f"ctllint: {where}: {tag} is a {dev.kind}; set works on selectors, switches and PLC outputs")
        if action == "check":
            if value.lower() not in ("on", "off"):
                raise UsageError(f"ctllint: {where}: check {tag} is on or off, not '{value}'")
            value = value.lower() == "on"
        step.targets[tag] = value if action in ("set", "check") else None
        step.target_locs[tag] = loc
    return step


_EXAMPLE = {
    "press": "press:PB2", "release": "release:PB2", "set": "set:SS1=auto", "trip": "trip:OL1",
    "reset": "reset:OL1", "power": "power:off", "wait": "wait:5s", "check": "check:M1=on",
}


def step_text(step: Step) -> str:
    """A step written back in --step form."""
    if step.action == "power":
        return f"power:{step.targets.get('', 'on')}"
    if step.action == "wait":
        s = step.seconds
        return f"wait:{s * 1000:g}ms" if 0 < s < 1 else f"wait:{s:g}s"
    if step.action == "set":
        return "set:" + ",".join(f"{t}={v}" for t, v in step.targets.items())
    if step.action == "check":
        return "check:" + ",".join(f"{t}={'on' if v else 'off'}" for t, v in step.targets.items())
    return f"{step.action}:" + ",".join(step.targets)


def simulate_rows(sim, steps: list[Step]) -> tuple[list[str], list[dict]]:
    """Run ``steps`` from rest; one row per state: step text, load states, notes.

    The steps run once through ``Simulator.scenario_steps``, the scenario
    runner itself, so the states shown are exactly what an expect scenario
    of those steps sees, in time linear in the steps.
    """
    rows = []
    loads: list[str] = []
    previous: dict[str, bool] = {}
    scen = Scenario("command line", Location("<command line>", 0, 0), list(steps))
    for at, events in sim.scenario_steps(scen):
        n = 0 if at is None else at + 1
        states = sim.states()
        if not loads:
            loads = list(states)
        label = "rest" if n == 0 else step_text(steps[n - 1])
        notes: list[str] = []
        stop = False
        ok = True
        for ev in events:
            if ev.kind == "unsettled" and (ev.step_index is None or ev.step_index == n - 1):
                notes.append("UNSETTLED: " + (ev.why or "the circuit does not settle"))
                stop = True
                ok = False
            elif ev.kind == "check" and ev.step_index == n - 1:
                notes.append(f"FAIL: {ev.tag} is {'on' if ev.actual else 'off'}, expected {'on' if ev.expected else 'off'}")
                ok = False
        if n and steps[n - 1].action == "check" and ok:
            notes.append("check holds")
        changed = {t for t in states if n and states[t] != previous.get(t)}
        rows.append({"step": label, "states": states, "changed": changed, "notes": notes, "ok": ok})
        previous = states
        if stop:
            if n < len(steps):
                rows[-1]["notes"].append(f"stopped: {len(steps) - n} later step(s) not run")
            break
    return loads, rows


def _shown_rows(loads: list[str], rows: list[dict]) -> tuple[list[str], list[dict]]:
    """Tags, step texts and notes with control characters and bidirectional overrides escaped (they come from the file)."""
    shown = [printable(t) for t in loads]
    out = []
    for r in rows:
        out.append({**r, "step": printable(r["step"]), "notes": [printable(n) for n in r["notes"]],
                    "states": {printable(t): s for t, s in r["states"].items()}, "changed": {printable(t) for t in r["changed"]}})
    return shown, out


def _cell(row: dict, tag: str) -> str:
    return ("ON" if row["states"].get(tag) else "-") + ("*" if tag in row["changed"] else "")


def render_steps_table(loads: list[str], rows: list[dict]) -> str:
    """Rows are steps, columns are loads, a notes column last."""
    loads, rows = _shown_rows(loads, rows)
    step_w = max(len("STEP"), *(len(r["step"]) for r in rows))
    widths = [max(len(t), 3) for t in loads]
    head = f"{'#':>2}  {'STEP':<{step_w}}  " + "  ".join(f"{t:<{w}}" for t, w in zip(loads, widths)) + "  NOTES"
    out = [head.rstrip()]
    for i, r in enumerate(rows):
        cells = "  ".join(f"{_cell(r, t):<{w}}" for t, w in zip(loads, widths))
        out.append(f"{i:>2}  {r['step']:<{step_w}}  {cells}  {'; '.join(r['notes'])}".rstrip())
    return "\n".join(out) + "\n"


def render_loads_table(loads: list[str], rows: list[dict]) -> str:
    """Rows are loads, columns are steps (numbered; the steps and notes listed above)."""
    loads, rows = _shown_rows(loads, rows)
    out = ["steps:"]
    for i, r in enumerate(rows):
        out.append(f"  {i:>2}  {r['step']}" + (f"   {'; '.join(r['notes'])}" if r["notes"] else ""))
    tag_w = max(len("LOAD"), *(len(t) for t in loads)) if loads else 4
    out.append("")
    out.append(f"{'LOAD':<{tag_w}}  " + "  ".join(f"{i:<3}" for i in range(len(rows))).rstrip())
    for t in loads:
        out.append((f"{t:<{tag_w}}  " + "  ".join(f"{_cell(r, t):<3}" for r in rows)).rstrip())
    return "\n".join(out) + "\n"


def _run_simulate(args: argparse.Namespace) -> int:
    loaded, shown, cfg, host = one_file(args, args.path)
    with work(f"simulating {shown}"):
        return _simulate(args, loaded, shown)


def _simulate(args: argparse.Namespace, loaded: LoadResult, shown: str) -> int:
    from ctllint.circuit.analysis import Circuit

    refused = refuse_unloadable(loaded)
    if refused is not None:
        return refused
    sch = loaded.schematic
    if args.scenario is not None and args.step:
        raise UsageError("ctllint: give either --scenario or --step, not both")
    sim = Circuit(sch).simulator()
    if args.scenario is not None:
        found = [s for s in sch.expect if s.name == args.scenario]
        if not found:
            names = ", ".join(repr(s.name) for s in sch.expect) or "none"
            raise UsageError(f"ctllint: no expect scenario named '{args.scenario}' in {shown} (scenarios: {names})")
        steps = list(found[0].steps)
        unknown = sorted({t for st in steps for t in st.targets if t and t not in sch.devices})
        if unknown:
            raise UsageError(f"ctllint: scenario '{args.scenario}' names unknown device(s) {', '.join(unknown)}; run 'ctllint check {shown}'")
    else:
        steps = [parse_step(text, i, sch, sim) for i, text in enumerate(args.step)]
    loads, rows = simulate_rows(sim, steps)
    if not loads:
        print(f"{printable(shown)}: no loads to show (no coil, solenoid, light, horn or PLC input in the rungs)")
        return EXIT_OK
    by_steps = render_steps_table(loads, rows)
    by_loads = render_loads_table(loads, rows)
    choice = args.layout
    if choice == "auto":
        columns = shutil.get_terminal_size((100, 24)).columns
        # Notes end the steps table's lines and may wrap; the grid itself must fit.
        grid_w = len(by_steps.splitlines()[0]) - len("NOTES") + 12
        loads_w = max(len(line) for line in by_loads.splitlines() if line and not line.startswith(" "))
        choice = "steps" if grid_w <= columns or grid_w <= loads_w else "loads"
    title = printable(f"{shown}" + (f": scenario '{args.scenario}'" if args.scenario is not None else ""))
    sys.stdout.write(title + "\n" + (by_steps if choice == "steps" else by_loads))
    sys.stdout.write("ON energized, - not energized, * changed by this step\n")
    return EXIT_OK if all(r["ok"] for r in rows) else EXIT_FINDINGS


command("simulate", "run the behaviour model step by step and print every load's state after each step")((_configure_simulate, _run_simulate))
