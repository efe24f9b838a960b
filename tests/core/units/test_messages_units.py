"""Quantities quoted by the core's errors and warnings can be restated in the user's units.

Conversion factors are the exact definitions of NIST SP 811 (2008), appendix B: 1 ft = 0.3048 m,
1 in = 0.0254 m, 1 US gallon = 231 in³ (so 1 gpm = 6.30901964e-5 m³/s), 1 psi = 6894.757 Pa.
"""

from __future__ import annotations

import re

import pytest

from branchwise.core import units
from branchwise.core.errors import NoSolutionError
from branchwise.core.messages import flow_text, marked, render
from branchwise.core.model import FindUnknown, Fluid, Network, PressureDrop, branch
from branchwise.core.numerics.solve import solve

WATER = Fluid("water", 998.2, 1.0016e-3, "water")  # 20 °C, values from the iapws package
GPM = 0.0254**3 * 231 / 60  # NIST SP 811: US gallon = 231 in³
FT = 0.3048  # NIST SP 811, exact
PSI = 6894.757  # NIST SP 811: pound-force per square inch, Pa

_PRIVATE = re.compile("[\ue000-\uf8ff]")


def _numbers(text: str) -> list[float]:
    return [float(x) for x in re.findall(r"[-+]?\d+(?:\.\d+)?(?:e[-+]?\d+)?", text)]


def test_a_no_solution_error_states_its_flows_in_gpm_and_psi_when_asked():
    net = Network(WATER, (branch("A", 0.05, 100, 4.5e-5, 2), branch("B", 0.05, 100, 4.5e-5, 2)))
    target = 0.5  # m³/s: far beyond what any length of a 50 mm line passes at 10 kPa
    with pytest.raises(NoSolutionError) as caught:
        solve(net, PressureDrop(10_000), FindUnknown("length", "A", target))
    err = caught.value
    assert not _PRIVATE.search(str(err)), "the plain message never shows a marker"
    assert "L/s" in str(err) and "kPa" in str(err)
    us = units.say(err, "us")
    assert not _PRIVATE.search(us) and "L/s" not in us and "kPa" not in us
    assert f"{target / GPM:.4g}".rstrip("0") in us.replace(",", "")
    pressures = [float(m) for m in re.findall(r"([\d.]+) psi", us)]
    assert pressures and pressures[0] == pytest.approx(10_000 / PSI, rel=1e-3)


def test_a_velocity_warning_restated_in_feet_per_second():
    # 40 L/s in a 100 mm line is 5.1 m/s: above the 3 m/s common-practice limit for water.
    net = Network(WATER, (branch("A", 0.1, 20, 4.5e-5), branch("B", 0.1, 20, 4.5e-5)))
    result = solve(net, PressureDrop(60_000))
    fast = [w for w in result.warnings if w.code == "velocity-high"]
    assert fast, "the network was built to run fast"
    w = fast[0]
    assert "m/s" in w.message and not _PRIVATE.search(w.message)
    us = units.say(w, "us")
    assert "ft/s" in us and "m/s" not in us
    speed_si = abs(result.flows[0]) / (3.141592653589793 * 0.1**2 / 4)
    assert _numbers(us)[0] == pytest.approx(speed_si / FT, rel=2e-3)


def test_per_quantity_units_override_the_system():
    text = f"carries {flow_text(0.01)}"
    assert units.restate(text, "si", {"flow": "m^3/h"}) == "carries 36.00 m³/h"
    assert units.restate(text, "si") == render(text) == "carries 10 L/s"


def test_plain_text_passes_through_and_unknown_kinds_keep_si():
    assert units.restate("nothing marked", "us") == "nothing marked"
    assert render(marked("reynolds", 1234.5)) == "1234"  # not a unit kind: the number only


def test_a_valve_coefficient_reads_as_cv_in_us_units():
    from branchwise.core.messages import kv_text

    # IEC 60534-1: Cv = 1.156 Kv (US gpm at 1 psi against m³/h at 1 bar).
    assert units.restate(f"needs {kv_text(35.2)}", "us") == "needs Cv 40.7"
    assert units.restate(f"needs {kv_text(35.2)}", "si") == "needs Kv 35.2"


def test_text_that_only_looks_like_a_marker_is_left_alone():
    from branchwise.core.messages import render

    assert render("name \ue000flow x\ue001 end") == "name \ue000flow x\ue001 end"  # no crash


def test_a_file_holding_the_marker_characters_is_refused_by_line():
    from branchwise.core.errors import InputError
    from branchwise.core.site.read import parse_site

    text = 'format = 1\n[fluid]\nkind = "\ue000flow 1e-3\ue001"\n'
    with pytest.raises(InputError) as caught:
        parse_site(text, "site.toml")
    assert caught.value.field == "site.toml line 3" and "private-use" in caught.value.reason
