"""The smoke set: the few checks run on a venv holding exactly the declared minimum versions
(``.ci/run``'s second stage), besides the full suite on current versions.

The command line solves the demo (run as ``python -m branchwise``, the way an installed wheel
is run), the JSON reads back, and the app comes up headless to its first answer.
"""

from __future__ import annotations

import asyncio
import json
import subprocess
import sys

MODULE = [sys.executable, "-m", "branchwise"]


def _run(*args: str, cwd=None) -> subprocess.CompletedProcess[str]:
    return subprocess.run([*MODULE, *args], capture_output=True, text=True, timeout=180,
                          cwd=cwd)


def test_the_command_line_solves_the_demo(tmp_path):
    out = _run("solve", cwd=tmp_path)
    assert out.returncode == 0, out.stderr
    assert "AHU-1 coil" in out.stdout and "Cautions:" in out.stdout
    assert "Traceback" not in out.stderr


def test_the_json_of_the_demo_reads_back(tmp_path):
    out = _run("solve", "--format", "json", "--units", "us", cwd=tmp_path)
    assert out.returncode == 0, out.stderr
    doc = json.loads(out.stdout)
    total = sum(b["flow_m3_s"] for b in doc["branches"])
    assert abs(total - doc["total_flow_m3_s"]) <= 1e-12 * doc["total_flow_m3_s"]


def test_bad_input_exits_2_with_one_line(tmp_path):
    site = tmp_path / "bad.toml"
    site.write_text('name = "x"\n[fluid]\nkind = "no-such-liquid"\n', encoding="utf-8")
    out = _run("solve", str(site), cwd=tmp_path)
    assert out.returncode == 2
    assert len(out.stderr.strip().splitlines()) == 1 and "Traceback" not in out.stderr


def test_the_app_comes_up_headless_to_its_first_answer(tmp_path, monkeypatch):
    monkeypatch.setenv("BRANCHWISE_DATA_DIR", str(tmp_path / "data"))
    from branchwise.tui.app import BranchwiseApp

    async def scenario() -> None:
        app = BranchwiseApp()
        async with app.run_test(size=(80, 24)) as pilot:
            for _ in range(400):
                await pilot.pause()
                await app.workers.wait_for_complete()
                outcome = app.outcome
                if outcome is not None and not app.solving:
                    break
            assert app.outcome is not None and app.outcome.ok, app.outcome
            assert app.screen.query("#results")  # the Split screen and its table

    asyncio.run(scenario())
