"""Monte Carlo draws in chunks, so that memory stays bounded whatever the size of the run.

The draws are made chunk by chunk from the one generator (numpy's ``Generator.uniform`` fills
row after row, so the chunks joined are the very matrix one call would give), each chunk is
solved on its own (every copy is solved independently, so its answer does not depend on the
chunk it is in), and only the outputs are kept: in memory while they are small, else in a
temporary file, from which each output's column is read back on its own for its percentiles.
The linear estimate's ± steps are made and solved in chunks as well.

``progress(done, total)`` is told after every chunk (rows solved, rows in all); whatever it
raises ends the run there (the app stops a band this way when it closes).
"""

from __future__ import annotations

import os
import tempfile
from collections.abc import Callable, Iterator
from typing import IO

import numpy as np
import numpy.typing as npt

from .hydraulics import Array

Index = npt.NDArray[np.intp]

Progress = Callable[[int, int], None]
"""Told (rows solved, rows in all) after every chunk."""

WORK_BYTES = 48 * 1024 * 1024
"""Working memory one chunk may use while it is solved (measured: about 600 bytes per copy of
a segment for the arrays of a solve, with the draws themselves besides)."""
BYTES_PER_COPY_SEGMENT = 640
MAX_CHUNK_ROWS = 4096
"""Rows at most in one chunk: the time between two progress reports (and the moment a stop
is seen) stays a small fraction of a second."""
KEPT_IN_MEMORY = 96 * 1024 * 1024
"""Outputs of all draws up to this many bytes stay in memory; more go to a temporary file."""


def chunk_rows(segments: int, inputs: int) -> int:
    """Rows per chunk for a network of ``segments`` segments and ``inputs`` drawn inputs."""
    per_row = BYTES_PER_COPY_SEGMENT * max(segments, 1) + 8 * 3 * max(inputs, 1)
    return int(max(1, min(MAX_CHUNK_ROWS, WORK_BYTES // per_row)))


def chunks(total: int, size: int) -> Iterator[tuple[int, int]]:
    """(start, stop) of consecutive chunks of at most ``size`` rows covering ``total``."""
    for start in range(0, total, size):
        yield start, min(total, start + size)


class OutputStore:
    """Every draw's value of each output, filled chunk by chunk; each output read back whole.

    In memory when ``rows × outputs`` doubles fit in :data:`KEPT_IN_MEMORY`; else written to
    a temporary file (one block per chunk, each output's values together), deleted on close.
    """

    def __init__(self, rows: int, names: list[str], limit: int | None = None) -> None:
        self.rows, self.names = rows, names
        self.in_memory = rows * len(names) * 8 <= (KEPT_IN_MEMORY if limit is None else limit)
        self._arrays = ({name: np.empty(rows) for name in names} if self.in_memory else {})
        self._blocks: list[tuple[int, int, int]] = []  # (start, stop, offset in the file)
        self._file: IO[bytes] | None = None
        if not self.in_memory:
            self._file = tempfile.TemporaryFile(prefix="branchwise-draws-")

    def add(self, start: int, stop: int, values: dict[str, Array]) -> None:
        """The outputs of rows ``start:stop``."""
        if self._file is None:
            for name in self.names:
                self._arrays[name][start:stop] = values[name]
            return
        self._file.seek(0, os.SEEK_END)
        offset = self._file.tell()
        block = np.stack([np.asarray(values[name], dtype=float) for name in self.names])
        self._file.write(block.tobytes())
        self._blocks.append((start, stop, offset))

    def column(self, name: str) -> Array:
        """Every row's value of output ``name``."""
        if self._file is None:
            return self._arrays[name]
        j = self.names.index(name)
        out = np.empty(self.rows)
        for start, stop, offset in self._blocks:
            size = stop - start
            self._file.seek(offset + j * size * 8)
            out[start:stop] = np.frombuffer(self._file.read(size * 8), dtype=float)
        return out

    def all_kept(self) -> dict[str, Array] | None:
        """The outputs as arrays when they are kept in memory (None when in a file)."""
        return self._arrays if self._file is None else None

    def close(self) -> None:
        if self._file is not None:
            self._file.close()
            self._file = None


CONTRIB_KEPT = 64 * 1024 * 1024
"""The linear estimate's contributions (inputs × outputs) are kept whole up to this many bytes;
beyond, each output keeps its running variance and its largest contributions only."""


class LinearShares:
    """c_i u(x_i) of every input for every output, filled in chunks of inputs: whole while
    they fit :data:`CONTRIB_KEPT` (the variance then summed in one go, as it always was); for
    a very large network, each output's variance summed chunk by chunk and only its ``kept``
    largest contributions kept (all the ranking shows)."""

    def __init__(self, inputs: int, names: list[str], kept: int) -> None:
        self.inputs, self.kept = inputs, kept
        self.whole = inputs * len(names) * 8 <= CONTRIB_KEPT
        self._full = {name: np.empty(inputs) for name in names} if self.whole else {}
        self._sum: dict[str, float] = {name: 0.0 for name in names}
        self._top: dict[str, tuple[Index, Array]] = {
            name: (np.empty(0, dtype=np.intp), np.empty(0)) for name in names}

    def add(self, start: int, stop: int, name: str, part: Array) -> None:
        if self.whole:
            self._full[name][start:stop] = part
            return
        squares = part**2
        self._sum[name] += float(np.sum(squares))
        index, value = self._top[name]
        index = np.concatenate([index, np.arange(start, stop)])
        value = np.concatenate([value, squares])
        if value.size > self.kept:
            keep = np.sort(np.argpartition(-value, self.kept - 1)[:self.kept])
            index, value = index[keep], value[keep]
        self._top[name] = (index, value)

    def variance(self, name: str) -> float:
        """Σ c_i² u_i² for output ``name`` (JCGM 100:2008, 5.1.2)."""
        if self.whole:
            return float(np.sum(self._full[name]**2))
        return self._sum[name]

    def squares(self, name: str) -> tuple[Index, Array]:
        """(input indices, c_i² u_i²): every input's, or the largest ``kept`` of them."""
        if self.whole:
            return np.arange(self.inputs), self._full[name]**2
        return self._top[name]
