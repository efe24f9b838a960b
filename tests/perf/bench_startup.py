"""Cold start to the first screen: branchwise against a minimal Textual app (a script, not a test).

Each run is a fresh Python process in a pseudo-terminal (80×24), so the figure includes the
interpreter, the imports, composing the first screen and drawing it to the terminal. The child
notes the moment its first screen has been drawn (``call_after_refresh`` after mount) and stops
at once. Runs alternate between the two apps; medians are compared, the process's own CPU time
first (less disturbed by other work on the machine). The goal: branchwise's first screen within
1.3× of a minimal Textual app (a Static and a Footer) started the same way (heavy modules —
numpy, scipy, pint — load only after that first screen).

    python tests/perf/bench_startup.py [--runs 7]
"""

from __future__ import annotations

import argparse
import os
import pty
import select
import statistics
import struct
import subprocess
import sys
import tempfile
import time
from pathlib import Path

CHILD = r"""
import os, sys, time
out = sys.argv[2]

def note_and_stop():
    modules = sorted(m for m in ("numpy", "scipy", "pint") if m in sys.modules)
    with open(out, "w") as f:
        f.write(f"{time.perf_counter()} {time.process_time()} {','.join(modules)}\n")
    os._exit(0)

if sys.argv[1] == "minimal":
    from textual.app import App
    from textual.widgets import Footer, Static

    class Minimal(App):
        BINDINGS = [("ctrl+q", "quit", "Quit")]

        def compose(self):
            yield Static("A minimal Textual app: a line of text, a footer.")
            yield Footer()

        def on_mount(self):
            self.call_after_refresh(note_and_stop)

    Minimal().run()
else:
    from branchwise.tui.app import BranchwiseApp

    class Probe(BranchwiseApp):
        def _first_paint(self):
            # The app's own "first screen drawn" moment (its on_mount's call_after_refresh,
            # as for the minimal app), before it starts the worker that loads the solver.
            note_and_stop()

    Probe().run()
"""


PYCACHE = Path(tempfile.gettempdir()) / "branchwise-bench-pycache"
"""Compiled modules for the runs (outside the source tree), as an installed package has them."""


def one_run(kind: str, data_dir: str) -> tuple[float, float, str]:
    """Seconds from starting the process to its first screen drawn (wall clock, and the
    process's own CPU time: less disturbed by other work on the machine); heavy modules
    loaded by then."""
    import fcntl
    import termios

    master, slave = pty.openpty()
    fcntl.ioctl(slave, termios.TIOCSWINSZ, struct.pack("HHHH", 24, 80, 0, 0))
    with tempfile.TemporaryDirectory() as tmp:
        out = Path(tmp) / "painted"
        env = {**os.environ, "BRANCHWISE_DATA_DIR": data_dir, "TERM": "xterm-256color",
               "COLUMNS": "80", "LINES": "24", "PYTHONPYCACHEPREFIX": str(PYCACHE)}
        env.pop("PYTHONDONTWRITEBYTECODE", None)  # an installed package has its .pyc files
        start = time.perf_counter()
        proc = subprocess.Popen([sys.executable, "-c", CHILD, kind, str(out)], stdin=slave,
                                stdout=slave, stderr=slave, env=env, close_fds=True)
        os.close(slave)
        screen = b""
        while proc.poll() is None:  # keep the terminal drained so the child never blocks
            ready, _, _ = select.select([master], [], [], 0.05)
            if ready:
                try:
                    screen = (screen + os.read(master, 65536))[-4000:]
                except OSError:
                    break
        proc.wait()
        os.close(master)
        if not out.exists():
            raise SystemExit(f"{kind} did not start:\n{screen.decode(errors='replace')}")
        stamp, cpu, *modules = out.read_text().split()
    # The child's perf_counter and ours share the system's monotonic clock on Linux.
    return float(stamp) - start, float(cpu), ",".join(modules)


def main(argv: list[str] | None = None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=7)
    args = parser.parse_args(argv)
    data_dir = tempfile.mkdtemp(prefix="branchwise-bench-")
    wall: dict[str, list[float]] = {"minimal": [], "branchwise": []}
    cpu: dict[str, list[float]] = {"minimal": [], "branchwise": []}
    heavy: set[str] = set()
    one_run("minimal", data_dir)  # warm the file cache for both
    one_run("branchwise", data_dir)
    for _ in range(args.runs):
        for kind in wall:
            seconds, cpu_seconds, modules = one_run(kind, data_dir)
            wall[kind].append(seconds)
            cpu[kind].append(cpu_seconds)
            if kind == "branchwise" and modules:
                heavy.update(modules.split(","))
    print(f"cold start to first screen, {args.runs} runs each, 80×24 pseudo-terminal, "
          f"Python {sys.version.split()[0]}:")
    print(f"  {'':<11} {'wall median':>11} {'wall best':>10} {'CPU median':>11}")
    for kind in wall:
        print(f"  {kind:<11} {statistics.median(wall[kind]) * 1000:8.0f} ms "
              f"{min(wall[kind]) * 1000:7.0f} ms {statistics.median(cpu[kind]) * 1000:8.0f} ms")
    ratios = [statistics.median(wall["branchwise"]) / statistics.median(wall["minimal"]),
              min(wall["branchwise"]) / min(wall["minimal"]),
              statistics.median(cpu["branchwise"]) / statistics.median(cpu["minimal"])]
    print(f"  {'ratio':<11} {ratios[0]:9.2f}× {ratios[1]:8.2f}× {ratios[2]:9.2f}×")
    print(f"  goal: CPU-time median ratio ≤ 1.3×: {ratios[2]:.2f}× "
          f"({'met' if ratios[2] <= 1.3 else 'not met'})")
    print("  heavy modules loaded before the first screen: "
          f"{', '.join(sorted(heavy)) or 'none'}")


if __name__ == "__main__":
    main()
