"""Benchmarks of the issue "Fast enough for every commit on large panels".

Run: python tests/benchmarks/bench.py [--quick]

Prints a table: each goal is a ratio of two timings taken in the same run
(best of several repeats), so it holds on a noisy machine. This is not a
test: it never fails a build, it reports.
"""
from __future__ import annotations

import argparse
import os
import resource
import shutil
import subprocess
import sys
import tempfile
import time

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, HERE)
from generate import lattice, long_scenario, motor_circuits, parallel_branches, repeated_titles  # noqa: E402

PY = sys.executable


def best(cmd: list[str], repeats: int, env: dict | None = None, cwd: str | None = None) -> float:
    times = []
    for _ in range(repeats):
        t = time.perf_counter()
        proc = subprocess.run(cmd, capture_output=True, env=env, cwd=cwd)
        times.append(time.perf_counter() - t)
        if proc.returncode not in (0, 1):
            raise SystemExit(f"{' '.join(cmd)} exited {proc.returncode}:\n{proc.stderr.decode()[-2000:]}")
    return min(times)


def best_tty(cmd: list[str], repeats: int, env: dict) -> tuple[float, bytes]:
    """As ``best``, with standard error on a pseudo-terminal (where ctllint shows progress);
    also what the terminal received on the last run."""
    import pty

    times, seen = [], b""
    for _ in range(repeats):
        master, slave = pty.openpty()
        t = time.perf_counter()
        proc = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=slave, env=env)
        os.close(slave)
        chunks = []
        while True:
            try:
                data = os.read(master, 65536)
            except OSError:  # EIO: the process closed the terminal
                break
            if not data:
                break
            chunks.append(data)
        proc.wait()
        times.append(time.perf_counter() - t)
        os.close(master)
        seen = b"".join(chunks)
        if proc.returncode not in (0, 1):
            raise SystemExit(f"{' '.join(cmd)} exited {proc.returncode}:\n{seen.decode(errors='replace')[-2000:]}")
    return min(times), seen


def in_process(path: str, repeats: int) -> float:
    """Best time to check ``path`` (load, analyses, every rule) in a process already started."""
    code = (
        "import gc, sys, time\n"
        "gc.disable()\n"
        "from ctllint.testing import checker\n"
        "c = checker()\n"
        "c.check_file(sys.argv[1])\n"  # warm: imports, tables
        "best = min((lambda t: (c.check_file(sys.argv[1]), time.perf_counter() - t)[1])(time.perf_counter()) for _ in range(int(sys.argv[2])))\n"
        "print(best)\n"
    )
    out = subprocess.run([PY, "-c", code, path, str(repeats)], capture_output=True, text=True)
    if out.returncode != 0:
        raise SystemExit(out.stderr[-2000:])
    return float(out.stdout.strip().splitlines()[-1])


# Work of the commands other than check, timed in a process already started (best of the repeats):
# a drawing, a diff of two revisions, a simulation of a file's first scenario.
WORK = {
    "draw": ("from ctllint.output.draw import layout\n"
             "sch = load_file(sys.argv[1]).schematic\n"
             "run = lambda: layout(sch)\n"),
    "diff": ("from ctllint.review.diff import semantic_diff\n"
             "old, new = load_file(sys.argv[1]).schematic, load_file(sys.argv[2]).schematic\n"
             "run = lambda: semantic_diff(old, new)\n"),
    "simulate": ("from ctllint.circuit.analysis import Circuit\n"
                 "from ctllint.commands.simulate import simulate_rows\n"
                 "sch = load_file(sys.argv[1]).schematic\n"
                 "run = lambda: simulate_rows(Circuit(sch).simulator(), list(sch.expect[0].steps))\n"),
}


def work_in_process(kind: str, paths: list[str], repeats: int) -> float:
    code = (
        "import gc, sys, time\n"
        "gc.disable()\n"
        "from ctllint.reading.loader import load_file\n"
        + WORK[kind]
        + "run()\n"
        "best = min((lambda t: (run(), time.perf_counter() - t)[1])(time.perf_counter()) for _ in range(int(sys.argv[-1])))\n"
        "print(best)\n"
    )
    out = subprocess.run([PY, "-c", code, *paths, str(repeats)], capture_output=True, text=True)
    if out.returncode != 0:
        raise SystemExit(out.stderr[-2000:])
    return float(out.stdout.strip().splitlines()[-1])


def lsp_times(big: str, warm: str, repeats: int, env: dict) -> tuple[float, float, float]:
    """``ctllint lsp`` driven over stdio: best time from didOpen, and from a didChange, to the file's publishDiagnostics.

    The server is started and has checked a one-circuit file first (imports
    and plugins loaded), as in an editor that has been open a while.
    """
    import json

    debounce = 0.3
    proc = subprocess.Popen(ctllint("lsp", "--debounce", str(debounce)), stdin=subprocess.PIPE, stdout=subprocess.PIPE,
                            stderr=subprocess.DEVNULL, env=env, cwd=os.path.dirname(big))

    def send(obj: dict) -> None:
        body = json.dumps(obj).encode()
        proc.stdin.write(b"Content-Length: %d\r\n\r\n" % len(body) + body)
        proc.stdin.flush()

    def receive() -> dict:
        length = 0
        while True:
            line = proc.stdout.readline()
            if not line:
                raise SystemExit("ctllint lsp ended early")
            if line in (b"\r\n", b"\n"):
                break
            if line.lower().startswith(b"content-length:"):
                length = int(line.split(b":")[1])
        return json.loads(proc.stdout.read(length))

    def diagnostics_for(uri: str, version: int) -> None:
        while True:
            msg = receive()
            if msg.get("method") == "textDocument/publishDiagnostics" and msg["params"]["uri"] == uri and msg["params"].get("version") == version:
                return

    def uri_of(path: str) -> str:
        return "file://" + os.path.abspath(path)

    send({"jsonrpc": "2.0", "id": 1, "method": "initialize", "params": {"capabilities": {}, "rootUri": uri_of(os.path.dirname(big))}})
    while receive().get("id") != 1:
        pass
    send({"jsonrpc": "2.0", "method": "initialized", "params": {}})
    with open(warm, encoding="utf-8") as handle:
        send({"jsonrpc": "2.0", "method": "textDocument/didOpen", "params": {"textDocument": {"uri": uri_of(warm), "languageId": "yaml", "version": 1, "text": handle.read()}}})
    diagnostics_for(uri_of(warm), 1)
    with open(big, encoding="utf-8") as handle:
        text = handle.read()
    opens, changes = [], []
    for _ in range(repeats):
        t = time.perf_counter()
        send({"jsonrpc": "2.0", "method": "textDocument/didOpen", "params": {"textDocument": {"uri": uri_of(big), "languageId": "yaml", "version": 1, "text": text}}})
        diagnostics_for(uri_of(big), 1)
        opens.append(time.perf_counter() - t)
        t = time.perf_counter()
        send({"jsonrpc": "2.0", "method": "textDocument/didChange", "params": {"textDocument": {"uri": uri_of(big), "version": 2},
                                                                               "contentChanges": [{"text": text.replace("Generated line", "Generated line, edited")}]}})
        diagnostics_for(uri_of(big), 2)
        changes.append(time.perf_counter() - t)
        send({"jsonrpc": "2.0", "method": "textDocument/didClose", "params": {"textDocument": {"uri": uri_of(big)}}})
    send({"jsonrpc": "2.0", "id": 2, "method": "shutdown"})
    while receive().get("id") != 2:
        pass
    send({"jsonrpc": "2.0", "method": "exit"})
    proc.wait(timeout=60)
    return min(opens), min(changes), debounce


def ctllint(*args: str) -> list[str]:
    return [PY, "-m", "ctllint", *args]


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("--quick", action="store_true", help="fewer repeats and smaller parallel set")
    parser.add_argument("--repeats", type=int, default=None)
    parser.add_argument("--lsp", action="store_true", help="only the rows of start-up and of the language server (ctllint lsp)")
    args = parser.parse_args()
    repeats = args.repeats or (2 if args.quick else 3)
    tmp = tempfile.mkdtemp(prefix="ctllint-bench-")
    env = dict(os.environ, NO_COLOR="1", XDG_CACHE_HOME=os.path.join(tmp, "cache"))
    # As installed for real (pip compiles bytecode), not recompiling every module on every run.
    env.pop("PYTHONDONTWRITEBYTECODE", None)
    nocache = dict(env, CTLLINT_NO_CACHE="1")
    rows: list[tuple[str, str, str, str]] = []

    def write(name: str, text: str) -> str:
        path = os.path.join(tmp, name)
        with open(path, "w", encoding="utf-8") as handle:
            handle.write(text)
        return path

    big = write("m1000.ctl.yaml", motor_circuits(1000))
    small = write("m100.ctl.yaml", motor_circuits(100))
    one = write("one.ctl.yaml", motor_circuits(1))
    lat_small = write("lat200.ctl.yaml", lattice(200))
    lat_big = write("lat2000.ctl.yaml", lattice(2000))
    size = os.path.getsize(big)

    # Warm-up: write bytecode caches and load the file system cache for every command measured.
    subprocess.run(ctllint("check", "--no-cache", "-j", "1", one), capture_output=True, env=nocache)
    subprocess.run([PY, "-c", "import networkx, pluggy, ruamel.yaml"], capture_output=True, env=nocache)

    # Start-up: a one-rung file against importing the three libraries.
    t_import = best([PY, "-c", "import networkx, pluggy, ruamel.yaml"], repeats * 2)
    t_one = best(ctllint("check", "--no-cache", "-j", "1", one), repeats * 2, env=nocache)
    rows.append(("start-up: check 1 circuit / import libraries", f"{t_one:.3f} s / {t_import:.3f} s", f"{t_one / t_import:.2f}", "<= 1.30"))

    def lsp_rows(t_big: float) -> None:
        """The language server on the 1,000-circuit file: diagnostics after open and after a change, against the CLI's check."""
        t_open, t_change, debounce = lsp_times(big, one, repeats, nocache)
        rows.append(("lsp: diagnostics after open / CLI check, 1,000 circuits", f"{t_open:.3f} s / {t_big:.3f} s", f"{t_open / t_big:.2f}", "<= 1.00"))
        rows.append((f"lsp: after a change / CLI check + debounce ({debounce:g} s)", f"{t_change:.3f} s / {t_big + debounce:.3f} s",
                     f"{t_change / (t_big + debounce):.2f}", "<= 1.00"))

    if args.lsp:
        lsp_rows(best(ctllint("check", "--no-cache", "-j", "1", big), repeats, env=nocache))
        print_rows(rows)
        shutil.rmtree(tmp, ignore_errors=True)
        return

    # Parse-bound: cold check of the 1,000-circuit file against composing it with ruamel.yaml's C parser.
    compose = [PY, "-c", "import sys; from ruamel.yaml import YAML; YAML(typ='safe', pure=False).compose(open(sys.argv[1], encoding='utf-8').read())", big]
    t_compose = best(compose, repeats)
    t_big = best(ctllint("check", "--no-cache", "-j", "1", big), repeats, env=nocache)
    rows.append((f"parse-bound: check / compose, 1,000 circuits ({size / 1e6:.2f} MB)", f"{t_big:.3f} s / {t_compose:.3f} s", f"{t_big / t_compose:.2f}", "<= 1.30"))

    # Linear: 10x circuits, start-up subtracted: each file is checked in one process that
    # has started already (best of several), so only the work on the file is timed.
    t_small, t_big_work = in_process(small, repeats + 2), in_process(big, repeats)
    rows.append(("linear: 1,000 / 100 circuits (start-up subtracted)", f"{t_big_work:.3f} s / {t_small:.3f} s", f"{t_big_work / t_small:.2f}", "<= 11"))
    t_ls, t_lb = in_process(lat_small, repeats + 2), in_process(lat_big, repeats)
    rows.append(("linear: lattice 2,000 / 200 sections (start-up subtracted)", f"{t_lb:.3f} s / {t_ls:.3f} s", f"{t_lb / t_ls:.2f}", "<= 12"))

    # Panel documents: exporting the wire list and the terminal plan against a cold check of the same file.
    t_wires = best(ctllint("export", "wires", "-o", os.devnull, big), repeats, env=nocache)
    t_terms = best(ctllint("export", "terminals", "-o", os.devnull, big), repeats, env=nocache)
    rows.append(("export: wire list / check, 1,000 circuits", f"{t_wires:.3f} s / {t_big:.3f} s", f"{t_wires / t_big:.2f}", "<= 1.00"))
    rows.append(("export: terminal plan / check, 1,000 circuits", f"{t_terms:.3f} s / {t_big:.3f} s", f"{t_terms / t_big:.2f}", "<= 1.00"))
    # The other commands on files built to be slow: ten times the input, about ten times the work.
    par_s, par_b = write("par100.ctl.yaml", parallel_branches(100)), write("par1000.ctl.yaml", parallel_branches(1000))
    t_s, t_b = work_in_process("draw", [par_s], repeats + 2), work_in_process("draw", [par_b], repeats)
    rows.append(("draw: 1,000 / 100 parallel branches (start-up subtracted)", f"{t_b:.3f} s / {t_s:.3f} s", f"{t_b / t_s:.2f}", "<= 12"))
    rep = {(n, c): write(f"rep{n}{c}.ctl.yaml", repeated_titles(n, c)) for n in (200, 2000) for c in ("NO", "NC")}
    t_s = work_in_process("diff", [rep[(200, "NO")], rep[(200, "NC")]], repeats + 2)
    t_b = work_in_process("diff", [rep[(2000, "NO")], rep[(2000, "NC")]], repeats)
    rows.append(("diff: 2,000 / 200 rungs all titled alike (start-up subtracted)", f"{t_b:.3f} s / {t_s:.3f} s", f"{t_b / t_s:.2f}", "<= 12"))
    sim_s, sim_b = write("sim200.ctl.yaml", long_scenario(200)), write("sim2000.ctl.yaml", long_scenario(2000))
    t_s, t_b = work_in_process("simulate", [sim_s], repeats + 2), work_in_process("simulate", [sim_b], repeats)
    rows.append(("simulate: 2,000 / 200 steps (start-up subtracted)", f"{t_b:.3f} s / {t_s:.3f} s", f"{t_b / t_s:.2f}", "<= 12"))

    # Cache: a second run over the unchanged file.
    shutil.rmtree(os.path.join(tmp, "cache"), ignore_errors=True)
    t_cold = best(ctllint("check", "-j", "1", big), 1, env=env)
    t_warm = best(ctllint("check", "-j", "1", big), repeats, env=env)
    rows.append(("cache: warm / cold run, 1,000 circuits", f"{t_warm:.3f} s / {t_cold:.3f} s", f"{t_warm / t_cold:.2f}", "<= 0.15"))

    # Parallel: 200 files of 50 circuits, 2 jobs against 1.
    folder = os.path.join(tmp, "many")
    os.makedirs(folder)
    count = 60 if args.quick else 200
    text = motor_circuits(50)
    for i in range(count):
        with open(os.path.join(folder, f"panel{i:03d}.ctl.yaml"), "w", encoding="utf-8") as handle:
            handle.write(text.replace("Generated line", f"Panel {i}"))
    t_j1 = best(ctllint("check", "--no-cache", "-j", "1", folder), max(1, repeats - 1), env=nocache)
    t_j2 = best(ctllint("check", "--no-cache", "-j", "2", folder), max(1, repeats - 1), env=nocache)
    rows.append((f"parallel: {count} files x 50 circuits, 2 jobs / 1 job", f"{t_j2:.3f} s / {t_j1:.3f} s", f"{t_j2 / t_j1:.2f}", "<= 0.65"))

    # Progress on a terminal (NO_COLOR unset): what showing it costs at start-up and on a long run.
    tty_env = {k: v for k, v in nocache.items() if k not in ("NO_COLOR", "CI")}
    tty_env.setdefault("TERM", "xterm")
    def paired(cmd: list[str], times: int) -> tuple[float, float, bytes]:
        """Best on a terminal and best into a pipe, the runs taken in turn so both see the same load."""
        tty, pipe, seen = [], [], b""
        for _ in range(times):
            t, seen = best_tty(cmd, 1, tty_env)
            tty.append(t)
            pipe.append(best(cmd, 1, env=tty_env))
        return min(tty), min(pipe), seen

    # What progress adds to a run's start-up, timed inside a fresh interpreter (a whole-process
    # difference of a few milliseconds is lost in the noise of process start): importing
    # ctllint.output.progress once ctllint is loaded, deciding to show it, and a meter taking
    # 10,000 files on a terminal (stderr is a pseudo-terminal here).
    cost_code = ("import sys, time, os, pty\n"
                 "import ctllint, ctllint.output.report\n"
                 "m, s = pty.openpty(); sys.stderr = os.fdopen(s, 'w')\n"
                 "t = time.perf_counter()\n"
                 "from ctllint.output.progress import Meters\n"
                 "with Meters(False) as meters:\n"
                 "    meter = meters.start(10000)\n"
                 "    for _ in range(10000): meter.advance(1)\n"
                 "print(time.perf_counter() - t)\n")
    costs = []
    for _ in range(repeats * 2):
        out = subprocess.run([PY, "-c", cost_code], capture_output=True, text=True, env=tty_env)
        costs.append(float(out.stdout.strip().splitlines()[-1]))
    t_progress = min(costs)
    rows.append(("start-up: progress (import, 10,000 files counted) / check 1 circuit", f"{t_progress * 1000:.1f} ms / {t_one:.3f} s", f"{t_progress / t_one:.3f}", "<= 0.02"))
    t_many_tty, t_many_pipe, seen = paired(ctllint("check", "--no-cache", "-j", "2", folder), max(1, repeats - 1))
    updates = seen.count(b" files, ")
    rows.append((f"progress: {count} files, 2 jobs, terminal ({updates} updates) / pipe", f"{t_many_tty:.3f} s / {t_many_pipe:.3f} s", f"{t_many_tty / t_many_pipe:.2f}", "<= 1.05"))

    # Memory: the peak resident set of `ctllint check` (as the console script runs it, through
    # ctllint._entry) on the 1,000-circuit file, less the same for the one-circuit file: what
    # the larger file costs beyond interpreter, libraries, plugins and a trivial check.
    probe = ("import resource, sys; sys.argv = ['ctllint'] + sys.argv[1:]; "
             "from ctllint._entry import main; main(); "
             "print(resource.getrusage(resource.RUSAGE_SELF).ru_maxrss)")

    def peak(path: str) -> int:
        """Peak RSS in bytes (ru_maxrss is in KiB on Linux) of one check, best of the repeats."""
        values = []
        for _ in range(repeats):
            out = subprocess.run([PY, "-c", probe, "check", "--no-cache", "-j", "1", "--format", "json", "-o", os.devnull, path],
                                 capture_output=True, text=True, env=nocache)
            values.append(int(out.stdout.strip().splitlines()[-1]) * 1024)
        return min(values)

    base, full = peak(one), peak(big)
    rows.append(("memory: peak RSS 1,000 circuits - 1 circuit / file size", f"{(full - base) / 1e6:.1f} MB / {size / 1e6:.2f} MB", f"{(full - base) / size:.1f}", "<= 20"))
    rows.append(("memory: whole-process peak RSS, 1,000 / 1 circuit (for reference)", f"{full / 1e6:.1f} MB / {base / 1e6:.1f} MB", "", ""))

    lsp_rows(t_big)
    print_rows(rows)
    shutil.rmtree(tmp, ignore_errors=True)


def print_rows(rows: list[tuple[str, str, str, str]]) -> None:
    widths = [max(len(r[i]) for r in rows + [("goal", "measured", "ratio", "target")]) for i in range(4)]
    header = ("goal", "measured", "ratio", "target")
    print(f"ctllint benchmarks, {os.cpu_count()} cores, Python {sys.version.split()[0]}")
    print("  ".join(h.ljust(w) for h, w in zip(header, widths)))
    print("  ".join("-" * w for w in widths))
    for r in rows:
        print("  ".join(c.ljust(w) for c, w in zip(r, widths)))


if __name__ == "__main__":
    main()
