"""A large site's history stays bounded: each branch keeps the parts of the inputs that move it
(not one of every input of the site), the ± steps are solved a chunk at a time, and where the
head comes from a flow reading (every input then moves every branch) a site beyond a bound gets
its figures without bands, said in a note. Peak memory as the OS counts it (VmHWM of the child,
see tests/peak_memory.py); before: 400 branches 811 MB, 800 branches 2.65 GB (measured)."""

from __future__ import annotations

from peak_memory import ON_LINUX, peak_kb


def _site(n: int, reading: str) -> str:
    lines = ['format = 1', 'name = "many"', '[fluid]', 'kind = "water"',
             'temperature = "20 degC"', '[conditions]', reading,
             f'given = "{reading.split()[0]}"']
    for i in range(n):
        lines += ['[[branches]]', f'name = "B{i}"', f'size = "{2 + i % 3} in sch 40"',
                  f'length = "{10 + (37 * i) % 190} m"', 'material = "commercial-steel"']
        if i % 3 == 0:
            lines.append(f"valve_kv = {10 + (53 * i) % 190}")
    lines += ['[[visits]]', 'date = "2024-01-01"', reading.replace("50", "48").replace(
        "1600", "1550")]
    return "\n".join(lines) + "\n"


@ON_LINUX
def test_history_of_400_branches_from_a_gauge_stays_under_300_mb(tmp_path):
    path = tmp_path / "many.toml"
    path.write_text(_site(400, 'pressure_drop = "50 kPa"'), encoding="utf-8")
    status, peak = peak_kb(["history", str(path), "--format", "json", "-o",
                            str(tmp_path / "h.json")])
    assert status == 0
    assert 10 * 1024 < peak < 300 * 1024, f"peak {peak / 1024:.0f} MB"
    assert '"band"' in (tmp_path / "h.json").read_text(encoding="utf-8")


@ON_LINUX
def test_history_of_800_branches_from_a_meter_says_why_it_has_no_bands(tmp_path):
    path = tmp_path / "many.toml"
    path.write_text(_site(800, 'total_flow = "1600 L/s"'), encoding="utf-8")
    status, peak = peak_kb(["history", str(path), "-o", str(tmp_path / "h.txt")])
    assert status == 0
    assert 10 * 1024 < peak < 300 * 1024, f"peak {peak / 1024:.0f} MB"
    text = " ".join((tmp_path / "h.txt").read_text(encoding="utf-8").split())
    assert "no band for the visit's indicators" in text and "flow reading" in text
