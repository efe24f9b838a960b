"""The model's spread in a reconciliation: memory bounded, the same numbers in any chunking.

Each uncertain input moved alone by ± δ used to copy the whole network 2 · (inputs) times:
1.3 GB at 1,000 branches, 11.4 GB at 3,000 (measured, `given = "all"`, gauge and meter). Only
the branches an input moves are solved again now, the copies made in chunks.
"""

from __future__ import annotations

import numpy as np
import pytest
from networks import test_header
from peak_memory import ON_LINUX, peak_kb

from branchwise.core.numerics import nudges as nudges_module
from branchwise.core.numerics.reconcile import reconcile
from branchwise.core.numerics.reconcile_result import Observation
from branchwise.core.numerics.tolerances import Tolerances


def _big_site(n: int) -> str:
    lines = ['format = 1', 'name = "big header"', '[fluid]', 'kind = "water"',
             'temperature = "20 degC"', '[conditions]', 'pressure_drop = "50 kPa"',
             f'total_flow = "{n * 10} L/s"', 'given = "all"']
    for i in range(n):
        lines += ['[[branches]]', f'name = "b{i}"', f'diameter = "{80 + i % 5 * 5} mm"',
                  'length = "50 m"', 'roughness = "0.045 mm"', 'minor_k = 3']
    return "\n".join(lines) + "\n"


def test_the_spread_is_the_same_in_chunks_of_one_input():
    obs = [Observation("pressure_drop", None, 40e3), Observation("total_flow", None, 0.03),
           Observation("measured_flow", 0, 0.0105)]
    tol = Tolerances(gauge_full_scale=100e3, temperature_k=0.0)
    whole = reconcile(test_header(), obs, tol)
    real = nudges_module.nudges

    def one_at_a_time(plan, base, step, gravity, budget=0):
        return real(plan, base, step, gravity, budget=1)

    with pytest.MonkeyPatch.context() as mp:
        mp.setattr("branchwise.core.numerics.reconcile.nudges", one_at_a_time)
        chunked = reconcile(test_header(), obs, tol)
    assert np.allclose(chunked.covariance, whole.covariance, rtol=1e-9, atol=0)
    assert chunked.head_m == pytest.approx(whole.head_m, rel=1e-12)


@ON_LINUX
def test_peak_memory_of_weighing_1000_branches_stays_under_250_mb(tmp_path):
    """1,000 branches, `given = "all"` (`branchwise solve`): 1.3 GB before (measured), about
    90 MB now; the peak of the process that runs it (its VmHWM, see tests/peak_memory.py)."""
    path = tmp_path / "big.toml"
    path.write_text(_big_site(1000), encoding="utf-8")
    status, peak = peak_kb(["solve", str(path), "-o", str(tmp_path / "out.txt")])
    assert status == 0
    assert 10 * 1024 < peak < 250 * 1024, f"peak {peak / 1024:.0f} MB"
