"""A longer fuzzing campaign than the test suite runs (not collected by pytest).

Feeds mutated schematics (the engine of tests/test_fuzz.py) through the whole
``ctllint check`` pipeline, in-process, for a time or a number of inputs, in
one or more worker processes, and saves every input that breaks a property:

- exit status 0 or 1 (never 3, never a traceback), 1 exactly when an error is found;
- every finding on a line of the file it names;
- no input runs longer than ``--hang-seconds`` of CPU (the rules' own limit
  is ``limits.plugin_seconds``; this catches hangs outside the rules);
- the worker does not die (a crash of the interpreter is saved too);
- with ``--strict``, no rule raises (``plugin-error`` "raised"/"did not finish");
- with ``--commands all``, each input also goes through draw, report, xref,
  simulate (from rest, and its first scenario) and diff (against its base, as
  text and JSON): no traceback, exit status 0 or 1, a well-formed SVG, JSON
  that parses, and nothing from the file reaching the terminal raw. The
  ``--hang-seconds`` and ``--memory-mb`` bounds then cover all the commands
  of one input together (the commands' own ``limits.command_seconds`` is set
  in the workspace's configuration).

Usage::

    python tests/fuzz_campaign.py --seconds 300 --jobs 2 --out /tmp/ctllint-fuzz
    python tests/fuzz_campaign.py --seconds 300 --jobs 2 --commands all --out /tmp/ctllint-fuzz-all
    python tests/fuzz_campaign.py --inputs 5000 --seed 1 --out failures/
    python tests/fuzz_campaign.py --replay failures/fail-000123.ctl.yaml

Each saved input ``fail-SEED.ctl.yaml`` has ``fail-SEED.txt`` beside it with
the base schematic, the seed and what went wrong; ``--seed SEED --inputs 1``
makes the same input again.
"""
from __future__ import annotations

import argparse
import json
import os
import random
import resource
import signal
import subprocess
import sys
import time

HERE = os.path.dirname(os.path.abspath(__file__))


class Hang(BaseException):
    """One input used more CPU than --hang-seconds (a BaseException: nothing in ctllint may swallow it)."""


def _engine():
    sys.path.insert(0, HERE)
    import test_fuzz  # noqa: E402  (the shared mutation engine and checks)

    return test_fuzz


def _plugin_crashes(tf, out: str) -> list[str]:
    try:
        return tf.rule_failures(json.loads(out))
    except ValueError:
        return []


def worker(args: argparse.Namespace) -> int:
    """Run inputs with seeds start, start+stride, ...; print one JSON line per finding and a total."""
    tf = _engine()
    import tempfile

    resource.setrlimit(resource.RLIMIT_AS, (args.memory_mb * 2**20, args.memory_mb * 2**20))
    scratch = tempfile.mkdtemp(prefix="ctllint-fuzz-")
    ws = tf.Workspace(scratch, args.plugin_seconds)
    current = os.path.join(args.out, f".current-{args.worker}")

    def on_hang(signum, frame):
        raise Hang()

    signal.signal(signal.SIGVTALRM, on_hang)  # CPU time: the rules' own limit uses SIGALRM
    deadline = time.monotonic() + args.seconds if args.seconds else None
    seed, count, loaded = args.seed + args.worker, 0, 0
    while (args.inputs is None or count < args.inputs) and (deadline is None or time.monotonic() < deadline):
        rng = random.Random(seed)
        base = rng.choice(tf.BASES)
        data = tf.Mutator(rng).mutate(base)
        with open(current, "wb") as handle:  # the parent saves it if this process dies
            handle.write(json.dumps({"seed": seed, "base": base.rel}).encode() + b"\n" + data)
        path = ws.place(base, data)
        started = time.monotonic()
        signal.setitimer(signal.ITIMER_VIRTUAL, args.hang_seconds)
        try:
            rc, out, err = tf.run_cli(ws.argv(path))
            problems = tf.problems_with(rc, out, err, path, data)
            loaded += rc in (0, 1) and '"rule": "format"' not in out
            if args.strict:
                problems += [f"rule failed: {m}" for m in _plugin_crashes(tf, out)]
            if args.commands == "all":
                for name, argv in tf.other_commands(ws, base, path):
                    rc, out, err = tf.run_cli(argv)
                    problems += tf.other_problems(name, argv, rc, out, err)
        except Hang:
            problems = [f"hang: more than {args.hang_seconds} s of CPU"]
        except MemoryError:
            problems = [f"memory: more than {args.memory_mb} MB"]
        finally:
            signal.setitimer(signal.ITIMER_VIRTUAL, 0)
        took = time.monotonic() - started
        count += 1
        if problems:
            where = save(args.out, seed, base.rel, data, problems)
            print(json.dumps({"seed": seed, "base": base.rel, "problem": problems[0].splitlines()[0], "saved": where}), flush=True)
        elif took > args.slow_seconds:
            print(json.dumps({"seed": seed, "base": base.rel, "slow": round(took, 2)}), flush=True)
        seed += args.stride
    print(json.dumps({"done": count, "loaded": loaded}), flush=True)
    os.unlink(current) if os.path.exists(current) else None
    return 0


def save(out: str, seed: int, base: str, data: bytes, problems: list[str]) -> str:
    name = os.path.join(out, f"fail-{seed:06d}")
    with open(name + ".ctl.yaml", "wb") as handle:
        handle.write(data)
    with open(name + ".txt", "w", encoding="utf-8") as handle:
        handle.write(f"base: {base}\nseed: {seed}\nreplay: python tests/fuzz_campaign.py --seed {seed} --inputs 1 --out {out}\n\n")
        handle.write("\n\n".join(problems) + "\n")
    return name + ".ctl.yaml"


def campaign(args: argparse.Namespace) -> int:
    os.makedirs(args.out, exist_ok=True)
    per_worker = None if args.inputs is None else -(-args.inputs // args.jobs)
    started = time.monotonic()
    total, failures, slow = 0, 0, []
    procs = []
    for w in range(args.jobs):
        cmd = [sys.executable, __file__, "--worker", str(w), "--stride", str(args.jobs), "--seed", str(args.seed), "--out", args.out,
               "--hang-seconds", str(args.hang_seconds), "--plugin-seconds", str(args.plugin_seconds), "--memory-mb", str(args.memory_mb), "--slow-seconds", str(args.slow_seconds)]
        if args.seconds:
            cmd += ["--seconds", str(args.seconds)]
        if per_worker is not None:
            cmd += ["--inputs", str(per_worker)]
        if args.strict:
            cmd.append("--strict")
        cmd += ["--commands", args.commands]
        procs.append((w, subprocess.Popen(cmd, stdout=subprocess.PIPE, text=True, env={**os.environ, "PYTHONHASHSEED": "0"})))
    import queue
    import threading

    lines: "queue.Queue[tuple[int, str | None]]" = queue.Queue()

    def pump(w: int, proc: subprocess.Popen) -> None:  # one reader per worker, so that no pipe fills and blocks it
        for line in proc.stdout:
            lines.put((w, line))
        lines.put((w, None))

    for w, proc in procs:
        threading.Thread(target=pump, args=(w, proc), daemon=True).start()
    done: dict[int, int | None] = {w: None for w, _ in procs}
    loaded = 0
    running = len(procs)
    while running:
        w, line = lines.get()
        if line is None:
            running -= 1
            continue
        try:
            msg = json.loads(line)
        except ValueError:
            print(line, end="")
            continue
        if "done" in msg:
            done[w] = msg["done"]
            loaded += msg["loaded"]
        elif "slow" in msg:
            slow.append((msg["slow"], msg["seed"], msg["base"]))
        else:
            failures += 1
            print(f"FAIL seed {msg['seed']} ({msg['base']}): {msg['problem']} -> {msg['saved']}", flush=True)
    for w, proc in procs:
        rc = proc.wait()
        if done[w] is None:  # the worker died: save the input it was running
            current = os.path.join(args.out, f".current-{w}")
            with open(current, "rb") as handle:
                head, _, data = handle.read().partition(b"\n")
            info = json.loads(head)
            failures += 1
            where = save(args.out, info["seed"], info["base"], data, [f"the worker process died (exit status {rc}, signal {-rc if rc < 0 else 0})"])
            print(f"CRASH seed {info['seed']} ({info['base']}): worker exit {rc} -> {where}", flush=True)
            os.unlink(current)
        total += done[w] or 0
    elapsed = time.monotonic() - started
    print(f"inputs run: {total} in {elapsed:.0f} s ({total / max(elapsed, 1e-9):.1f}/s, {args.jobs} worker(s)); "
          f"{loaded} loaded and went through every rule, {total - loaded} were format errors; failures: {failures}; saved under {args.out}")
    for took, seed, base in sorted(slow, reverse=True)[:10]:
        print(f"slow: {took:.1f} s seed {seed} ({base})")
    return 1 if failures else 0


def replay(path: str) -> int:
    tf = _engine()
    import tempfile

    with open(path, "rb") as handle:
        data = handle.read()
    ws = tf.Workspace(tempfile.mkdtemp(prefix="ctllint-replay-"))
    base = tf.BASES[0]
    note = os.path.splitext(os.path.splitext(path)[0])[0] + ".txt"
    if os.path.exists(note):  # place it where its base lives, beside the files it uses
        with open(note, encoding="utf-8") as handle:
            rel = handle.readline().partition(":")[2].strip()
        base = next((b for b in tf.BASES if b.rel == rel), base)
    target = ws.place(base, data)
    rc, out, err = tf.run_cli(ws.argv(target, "text"))
    sys.stdout.write(out)
    sys.stderr.write(err)
    print(f"exit status {rc}")
    return 0


def main() -> int:
    p = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    p.add_argument("--seconds", type=float, help="run for this long (default 60 unless --inputs is given)")
    p.add_argument("--inputs", type=int, help="run this many inputs")
    p.add_argument("--out", default="fuzz-failures", help="folder for failing inputs (default ./fuzz-failures)")
    p.add_argument("--seed", type=int, default=0, help="first seed (default 0)")
    p.add_argument("--jobs", type=int, default=1, help="worker processes (default 1)")
    p.add_argument("--strict", action="store_true", help="also count a rule that raises (plugin-error) as a failure")
    p.add_argument("--commands", choices=("check", "all"), default="check",
                   help="check only (default), or every input also through draw, report, xref, simulate and diff")
    p.add_argument("--plugin-seconds", type=float, default=10.0, help="limits.plugin_seconds for the checks (default 10)")
    p.add_argument("--hang-seconds", type=float, default=60.0, help="CPU seconds one input may use (default 60)")
    p.add_argument("--slow-seconds", type=float, default=5.0, help="report inputs slower than this (default 5)")
    p.add_argument("--memory-mb", type=int, default=4096, help="address-space limit of a worker (default 4096)")
    p.add_argument("--replay", metavar="FILE", help="check one saved input and print the findings")
    p.add_argument("--worker", type=int, help=argparse.SUPPRESS)
    p.add_argument("--stride", type=int, default=1, help=argparse.SUPPRESS)
    args = p.parse_args()
    if args.replay:
        return replay(args.replay)
    if args.seconds is None and args.inputs is None:
        args.seconds = 60.0
    if args.worker is not None:
        return worker(args)
    return campaign(args)


if __name__ == "__main__":
    sys.exit(main())
