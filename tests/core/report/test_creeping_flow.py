"""A creeping flow (a Δp of almost nothing) is said as it is: its Reynolds number to two
significant figures, never "0", and its friction factor 64/Re as a number, not thirty digits.

Reference: Hagen–Poiseuille (laminar pipe flow, any fluid-mechanics text):
Q = π D⁴ Δp / (128 μ L), so V = Q / (π D²/4) and Re = ρ V D / μ; f = 64/Re.
"""

from __future__ import annotations

import math

import pytest

from branchwise.core.messages import reynolds_text
from branchwise.core.model import Branch, Fluid, Network, PressureDrop, Segment
from branchwise.core.numerics.solve import solve

RHO, MU = 998.2, 1.0016e-3  # water near 20 °C (IAPWS values, from memory)
D, L, DP = 0.05, 20.0, 1e-24


def _hagen_poiseuille_re() -> float:
    q = math.pi * D**4 * DP / (128 * MU * L)
    v = q / (math.pi * D**2 / 4)
    return RHO * v * D / MU


def _result():
    net = Network(Fluid("water", RHO, MU, "custom"),
                  (Branch("Coil", (Segment(D, L, 4.5e-5, 0.0),)),))
    return solve(net, PressureDrop(DP))


def test_the_warning_gives_the_creeping_flows_reynolds_number() -> None:
    re = _hagen_poiseuille_re()
    assert re < 1e-15  # the case: a flow far below any Re of 1
    result = _result()
    assert float(result.arrays.reynolds[0]) == pytest.approx(re, rel=1e-9)
    laminar = [w.message for w in result.warnings if w.code == "laminar"]
    assert laminar and f"(Re {reynolds_text(re)})" in laminar[0]
    assert "(Re 0)" not in laminar[0]
    assert reynolds_text(re) == f"{re:.2g}"


def test_the_report_row_and_the_app_cells_say_re_and_f_as_numbers() -> None:
    from branchwise.tui.screens.split.views import _compact, _friction

    re = _hagen_poiseuille_re()
    result = _result()
    seg = result.branches[0].segments[0]
    assert _compact(seg.reynolds) == f"{re:.2g}"
    f_text = _friction(seg.friction_factor)
    assert len(f_text) <= 10 and float(f_text) == pytest.approx(64 / re, rel=1e-3)


def test_the_text_report_says_the_reynolds_number(tmp_path, capsys) -> None:
    from branchwise.core.site.read import demo_text
    from branchwise.tui.cli import main

    lines = demo_text().splitlines()
    given = [i for i, line in enumerate(lines) if line.startswith("pressure_drop = ")][0]
    lines[given] = 'pressure_drop = "1e-24 Pa"'
    site = tmp_path / "creeping.toml"
    site.write_text("\n".join(lines) + "\n", encoding="utf-8")
    assert main(["solve", str(site)]) == 0
    out = capsys.readouterr().out
    assert "(Re 0)" not in out
    first_row = out.split("Regime")[1].splitlines()[2].split()
    assert first_row[-1] == "laminar"
    assert 0 < float(first_row[-2]) < 1e-10  # the Re column, before the regime


@pytest.mark.parametrize(("re", "plain", "grouped"), [
    (0.0, "0", "0"), (0.52, "0.52", "0.52"), (3.7e-28, "3.7e-28", "3.7e-28"),
    (9.94, "9.9", "9.9"), (10.0, "10", "10"), (1999.6, "2000", "2,000"),
    (180266.0, "180266", "180,266"), (math.nan, "—", "—"),
])
def test_reynolds_text(re: float, plain: str, grouped: str) -> None:
    # Whole numbers from 10 up; below, two significant figures (common practice for a
    # dimensionless group near or below one).
    assert reynolds_text(re) == plain
    assert reynolds_text(re, grouped=True) == grouped


def test_a_huge_reynolds_number_keeps_its_scale_in_the_narrow_table():
    from branchwise.tui.screens.split.views import _compact

    assert _compact(1.39128908258e11) == "139G"  # it read "1.39e+05M"
    assert _compact(180266.0) == "180k" and _compact(1234567.0) == "1.23M"
