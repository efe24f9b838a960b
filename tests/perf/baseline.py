"""Helpers of the benchmark scripts (not a test): an earlier core as a baseline in the same
process, and interleaved CPU-time medians.

``load_core(rev)`` lays ``core/`` of git revision ``rev`` of this repository in a temporary
folder as the package ``bw_baseline_core`` (core/ imports only itself, numpy and pint, by
relative imports), so that a script can time today's code and the earlier one alternately in
one process: the same machine state for both, which is what makes the ratio trustworthy on a
shared, noisy machine.
"""

from __future__ import annotations

import dataclasses
import importlib
import io
import os
import platform
import statistics
import subprocess
import sys
import tarfile
import tempfile
import time
from collections.abc import Callable
from pathlib import Path
from types import ModuleType

import numpy as np

ROOT = Path(__file__).resolve().parents[2]
BASELINE_REV = "e26009a"
"""The tree before the speed work (issue 15): "today" in the goals' "faster than today"."""


def load_core(rev: str = BASELINE_REV, name: str = "bw_baseline_core") -> ModuleType:
    """The package ``core`` of revision ``rev``, imported as ``name``."""
    if name in sys.modules:
        return sys.modules[name]
    archive = subprocess.run(["git", "-C", str(ROOT), "archive", rev, "core"],
                             check=True, capture_output=True).stdout
    folder = Path(tempfile.mkdtemp(prefix="bw-baseline-"))
    with tarfile.open(fileobj=io.BytesIO(archive)) as tar:
        tar.extractall(folder, filter="data")
    (folder / "core").rename(folder / name)
    sys.path.insert(0, str(folder))
    return importlib.import_module(name)


def module(core: ModuleType, name: str) -> ModuleType:
    """``core``'s submodule ``name`` (``numerics.solve``)."""
    return importlib.import_module(f"{core.__name__}.{name}")


def interleaved(fns: dict[str, Callable[[], object]], rounds: int = 15,
                number: int = 1, span: float | None = None,
                wall: dict[str, float] | None = None) -> dict[str, float]:
    """Median CPU seconds per call of each function, the functions run in turn ``rounds``
    times (each turn ``number`` calls), so that load on the machine falls on all alike. The
    order turns by one each round, so that none is always the first to read its data after
    the others have filled the caches.

    ``span`` (s): instead of ``number``, each turn of each function lasts about that long (the
    count per turn worked out from the warm-up). The first call of a turn pays for the caches
    the others have used; in turns of equal length every function pays that in the same
    proportion, where in turns of equal count a fast function pays it over far less time
    than a slow one. ``wall``: filled with the median wall-clock seconds per call of the same
    turns."""
    counts = dict.fromkeys(fns, number)
    for key, fn in fns.items():
        fn()  # warm-up
        if span is not None:  # calls for about a fifth of the span give the count
            calls, start = 0, time.process_time()
            while (spent := time.process_time() - start) < span / 5:
                fn()
                calls += 1
            counts[key] = max(1, round(span * calls / spent))
    times: dict[str, list[float]] = {k: [] for k in fns}
    walls: dict[str, list[float]] = {k: [] for k in fns}
    keys = list(fns)
    for r in range(rounds):
        for key in keys[r % len(keys):] + keys[:r % len(keys)]:
            fn, n = fns[key], counts[key]
            start, start_wall = time.process_time(), time.perf_counter()
            for _ in range(n):
                fn()
            times[key].append((time.process_time() - start) / n)
            walls[key].append((time.perf_counter() - start_wall) / n)
    if wall is not None:
        wall.update({k: statistics.median(v) for k, v in walls.items()})
    return {k: statistics.median(v) for k, v in times.items()}


def verdict(met: bool) -> str:
    return "met" if met else "NOT met"


def convert(core: ModuleType, value: object) -> object:
    """``value`` (a model object of today's core: a network, a given, a find) rebuilt from the
    classes of the same names in ``core.model``, so that both cores solve the same input."""
    if isinstance(value, tuple):
        return tuple(convert(core, v) for v in value)
    if dataclasses.is_dataclass(value) and not isinstance(value, type):
        cls = getattr(module(core, "model"), type(value).__name__)
        return cls(**{f.name: convert(core, getattr(value, f.name))
                      for f in dataclasses.fields(value) if f.init})
    return value


def ratio_line(label: str, slow: float, fast: float, goal: float | None = None) -> str:
    """One printed comparison: both medians, the ratio, and the goal if there is one."""
    text = f"  {label:<52} {slow * 1e6:10.1f} µs / {fast * 1e6:8.1f} µs = {slow / fast:6.1f}×"
    if goal is not None:
        text += f"   goal ≥ {goal:g}×: {verdict(slow / fast >= goal)}"
    return text


def machine() -> str:
    return (f"{platform.machine()}, {os.cpu_count()} cores, Python {platform.python_version()}, "
            f"numpy {np.__version__}; CPU-time medians of interleaved rounds")
