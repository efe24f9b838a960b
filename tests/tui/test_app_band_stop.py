"""A long band never holds the app: Ctrl+Q during it stops the run at its next chunk, and the
band shows how far it has got while it runs."""

from __future__ import annotations

import threading

import branchwise.core.site.solve as site_solve
from branchwise.core.site.read import demo_site
from branchwise.core.site.spec import BranchSpec, SegmentSpec
from branchwise.core.site.write import save_site
from branchwise.tui.state.outcome import BandStopped

HANG = 60.0
"""A guard against a hang only."""


def _big_site(tmp_path, n: int = 400):
    site = demo_site()
    site.branches = [BranchSpec(name=f"Coil {i}", segments=[SegmentSpec(
        size="3 in sch 40", length=f"{20 + i % 40} m", material="commercial-steel",
        minor_k="4")], valve_kv="160") for i in range(n)]
    return save_site(site, tmp_path / "big.toml")


def test_ctrl_q_during_a_long_band_stops_it_at_the_next_chunk(ui, tmp_path, monkeypatch):
    path = _big_site(tmp_path)
    calls: list[tuple[int, int]] = []
    ended = threading.Event()
    outcome: dict[str, object] = {}
    real = site_solve.with_uncertainty

    def watched(sr, samples=10_000, seed=0, presets=None, progress=None):
        def spy(done, total):
            calls.append((done, total))
            progress(done, total)

        try:
            return real(sr, samples, seed, presets, progress=spy)
        except BandStopped:
            outcome["stopped"] = True
            raise
        finally:
            ended.set()

    monkeypatch.setattr(site_solve, "with_uncertainty", watched)

    async def scenario() -> None:
        async with ui.started(site=path) as (app, pilot):
            await pilot.press("b")
            band = app.screen.views.band_panel
            for _ in range(600):  # until the band has run long enough to show its progress
                await pilot.pause(0.05)
                if band._band_share > 0:
                    break
            assert band._band_share > 0
            assert "% done" in ui.text(app)
            await pilot.press("ctrl+q")
            await pilot.pause()

    ui.run(scenario)
    assert ended.wait(HANG)
    assert outcome.get("stopped") is True
    done, total = calls[-1]
    assert done < total  # stopped part way, not run to the end
