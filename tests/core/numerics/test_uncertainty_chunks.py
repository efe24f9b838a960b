"""The Monte Carlo run in chunks gives byte for byte the bands of the run in one piece.

The reference here is the run as it was before the chunks: one (samples × inputs) matrix of
draws from ``numpy.random.default_rng(seed)``, the ± steps of the linear estimate stacked under
it, everything solved in one call, then the same percentiles. The chunked run is forced into
tiny chunks and into its temporary-file store, and must agree exactly, in every direction.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from peak_memory import ON_LINUX, peak_kb

import branchwise.core.numerics.draws as draws
import branchwise.core.numerics.uncertainty as uncertainty
from branchwise.core.numerics.sampling import SQRT3, STEP
from branchwise.core.site.read import demo_site
from branchwise.core.site.solve import uncertainty_for_site
from branchwise.core.site.spec import SolveSpec


def _sites():
    yield "pressure drop", demo_site()
    site = demo_site()
    site.conditions.pressure_drop, site.conditions.given = None, None
    site.conditions.total_flow = "40 L/s"
    yield "total flow", site
    for quantity in ("diameter", "length", "roughness"):
        site = demo_site()
        site.solve = SolveSpec(find=quantity, branch="AHU-2 coil", target_flow="9 L/s")
        yield quantity, site


def _reference(plan, nominal, samples, seed):
    """The bands as the unchunked run worked them out."""
    n_in = len(plan.inputs)
    z = np.random.default_rng(seed).uniform(-1.0, 1.0, size=(samples, n_in))
    design = np.vstack([STEP * np.eye(n_in), -STEP * np.eye(n_in)])
    values, _ = plan.evaluate(np.vstack([z, design]))
    failed = np.zeros(samples, dtype=bool)
    for column in values.values():
        failed |= np.isnan(column[:samples])
    out = {}
    for name, column in values.items():
        plus, minus = column[samples:samples + n_in], column[samples + n_in:]
        contrib = (plus - minus) / (2 * STEP) / SQRT3
        variance = float(np.sum(contrib**2))
        mc = column[:samples][~failed]
        p5, p50, p95 = (float(v) for v in np.percentile(mc, [5.0, 50.0, 95.0]))
        out[name] = (p5, p50, p95, float(mc.mean()), float(mc.std(ddof=1)), math.sqrt(variance))
    return out, {name: column[:samples] for name, column in values.items()}


@pytest.mark.parametrize(("label", "site"), list(_sites()), ids=lambda v: v
                         if isinstance(v, str) else "")
@pytest.mark.parametrize("in_file", [False, True])
def test_chunked_bands_equal_the_one_piece_run_exactly(label, site, in_file, monkeypatch):
    captured = {}
    real_plan = uncertainty.build_plan

    def keep(*args):
        captured["plan"] = real_plan(*args)
        return captured["plan"]

    monkeypatch.setattr(uncertainty, "build_plan", keep)
    monkeypatch.setattr(draws, "MAX_CHUNK_ROWS", 37)  # many small, uneven chunks
    if in_file:
        monkeypatch.setattr(draws, "KEPT_IN_MEMORY", 0)
    seen = []
    res = uncertainty_for_site(site, samples=2_000, seed=11,
                               progress=lambda done, total: seen.append((done, total)))
    plan = captured["plan"]
    from branchwise.core.numerics.solve import solve

    reference, ref_draws = _reference(plan, solve(plan.network, plan.given, plan.find),
                                      2_000, 11)
    assert set(res.outputs) == set(reference)
    for name, band in res.outputs.items():
        got = (band.p5, band.p50, band.p95, band.mean, band.std, band.linear_sigma)
        assert got == reference[name], name  # exactly: the same numbers, bit for bit
    if in_file:
        assert res.draws == {}  # not kept in memory
    else:
        for name, column in ref_draws.items():
            assert np.array_equal(res.draws[name], column, equal_nan=True)
    # Progress: told after every chunk, rising to all the rows.
    assert len(seen) > 2_000 // 37 and seen[-1][0] == seen[-1][1]
    assert all(a[0] < b[0] for a, b in zip(seen, seen[1:], strict=False))


def test_whatever_progress_raises_ends_the_run():
    class Stop(Exception):
        pass

    def stop_at_once(done, total):
        raise Stop

    with pytest.raises(Stop):
        uncertainty_for_site(demo_site(), samples=50_000, progress=stop_at_once)


def test_chunk_sizes_keep_the_work_bounded():
    # A chunk's working arrays stay within the budget whatever the network.
    for segments, inputs in ((5, 20), (20, 90), (1_000, 5_000), (100_000, 500_000)):
        rows = draws.chunk_rows(segments, inputs)
        assert 1 <= rows <= draws.MAX_CHUNK_ROWS
        assert rows == 1 or rows * (draws.BYTES_PER_COPY_SEGMENT * segments + 24 * inputs) \
            <= draws.WORK_BYTES


def test_a_network_too_large_for_every_share_keeps_the_largest(monkeypatch):
    """Beyond the memory for every input's share of every output, each output keeps its
    variance (summed chunk by chunk: equal to round-off) and its largest shares."""
    whole = uncertainty_for_site(demo_site(), samples=500, seed=3)
    monkeypatch.setattr(draws, "CONTRIB_KEPT", 0)
    monkeypatch.setattr(draws, "MAX_CHUNK_ROWS", 9)  # the ± steps in chunks of four inputs
    monkeypatch.setattr(uncertainty, "RANKING_KEPT", 5)
    part = uncertainty_for_site(demo_site(), samples=500, seed=3)
    for name, band in whole.outputs.items():
        assert part.outputs[name].linear_sigma == pytest.approx(band.linear_sigma, rel=1e-12)
        assert part.outputs[name].p95 == band.p95  # the draws are the same
        top = whole.ranking[name][:5]
        assert [n for n, _ in part.ranking[name]] == [n for n, _ in top]
        assert [s for _, s in part.ranking[name]] == pytest.approx([s for _, s in top],
                                                                   rel=1e-12)


def _many_branches(n: int):
    from branchwise.core.site.spec import BranchSpec, SegmentSpec

    site = demo_site()
    like = site.branches[0]
    site.branches = [BranchSpec(name=f"Coil {i}", segments=[SegmentSpec(
        size=like.segments[0].size, length=f"{20 + i % 40} m", material="commercial-steel",
        minor_k="4")], valve_kv="160") for i in range(n)]
    return site


def test_every_solve_call_stays_within_the_chunk(monkeypatch):
    """The work is bounded by construction: no call solves more rows than a chunk holds (the
    bytes of a chunk are within :data:`draws.WORK_BYTES`), and what is kept besides (the
    outputs, the linear shares) is within its own limit."""
    site = _many_branches(60)
    sizes: list[int] = []
    real = uncertainty.SamplingPlan.evaluate

    def counted(self, z):
        sizes.append(len(z))
        return real(self, z)

    monkeypatch.setattr(uncertainty.SamplingPlan, "evaluate", counted)
    monkeypatch.setattr(draws, "WORK_BYTES", 2 * 1024 * 1024)  # many chunks on a small site
    res = uncertainty_for_site(site, samples=3_000)
    inputs = len(res.inputs)
    limit = draws.chunk_rows(60, inputs)
    assert max(sizes) <= limit < 3_000
    assert sum(sizes) == 3_000 + 2 * inputs  # every draw and every ± step, once


@ON_LINUX
def test_peak_memory_of_a_large_run_stays_under_300_mb(tmp_path):
    """200 branches × 10,000 draws (`solve --uncertainty`): 1.2 GB when solved in one piece
    (measured), under 300 MB now; the peak of the process that runs it (its VmHWM, see
    tests/peak_memory.py)."""
    from branchwise.core.site.write import save_site

    path = save_site(_many_branches(200), tmp_path / "big.toml")
    status, peak = peak_kb(["solve", str(path), "--uncertainty", "-o",
                            str(tmp_path / "out.txt")])
    assert status == 0
    assert 10 * 1024 < peak < 300 * 1024, f"peak {peak / 1024:.0f} MB"
