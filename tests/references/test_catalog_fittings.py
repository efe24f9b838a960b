"""Fitting K (Crane TP-410) and Kv/Cv conversion against the `fluids` library (PyPI, Caleb Bell).

References: fluids.friction.ft_Crane; the Crane functions of fluids.fittings (K_gate_valve_Crane,
K_globe_valve_Crane, K_ball_valve_Crane, K_plug_valve_Crane, K_butterfly_valve_Crane,
K_swing_check_valve_Crane, bend_rounded_Crane, bend_rounded(method="Crane standard"),
entrance_sharp / entrance_rounded (method="Crane"), exit_normal); fluids.fittings.Kv_to_K and
Cv_to_K (ISA-75.01 / IEC 60534). Tolerance 1 %: our f_T is Crane's formula with ε = 0.045 mm,
fluids' ft_Crane a fit to Crane's table (see branchwise.core.catalogs.fittings).
"""

from __future__ import annotations

import math

import fluids.fittings as ff
import fluids.piping as piping
import pytest
from fluids.friction import ft_Crane

from branchwise.core.catalogs import (
    crane_ft,
    crane_nominal,
    fitting_k,
    fittings,
    fittings_k,
    k_from_cv,
    k_from_kv,
    parse_size,
)
from branchwise.core.errors import InputError
from branchwise.core.model import CV_PER_KV

CRANE_NPS = [0.5, 0.75, 1, 1.25, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10, 12, 14, 16, 18, 20, 24]
BORES = {nps: piping.nearest_pipe(NPS=nps, schedule="40")[1] for nps in CRANE_NPS}


@pytest.mark.parametrize("nps", CRANE_NPS)
def test_ft_within_one_percent_of_fluids_ft_crane(nps):
    d = BORES[nps]
    assert crane_ft(d) == pytest.approx(ft_Crane(d), rel=0.01)


def _cases():
    yield "gate-valve", lambda d: ff.K_gate_valve_Crane(d, d, 0.0)
    yield "globe-valve", lambda d: ff.K_globe_valve_Crane(d, d)
    yield "ball-valve", lambda d: ff.K_ball_valve_Crane(d, d, 0.0)
    yield "plug-valve", lambda d: ff.K_plug_valve_Crane(d, d, 0.0, style=0)
    yield "swing-check-valve", lambda d: ff.K_swing_check_valve_Crane(d, angled=True)
    yield "swing-check-valve-full-port", lambda d: ff.K_swing_check_valve_Crane(d, angled=False)
    yield "elbow-90", lambda d: ff.bend_rounded(d, 90, method="Crane standard")
    yield "elbow-45", lambda d: ff.bend_rounded(d, 45, method="Crane standard")
    yield "elbow-90-long-radius", lambda d: ff.bend_rounded_Crane(d, 90, bend_diameters=1.5)
    yield "elbow-45-long-radius", lambda d: ff.bend_rounded_Crane(d, 45, bend_diameters=1.5)
    yield "entrance-sharp", lambda d: ff.entrance_sharp(method="Crane")
    yield "entrance-rounded", lambda d: ff.entrance_rounded(d, 0.15 * d, method="Crane")
    yield "exit", lambda d: ff.exit_normal()


@pytest.mark.parametrize(("key", "reference"), list(_cases()), ids=[c[0] for c in _cases()])
def test_fitting_k_within_one_percent_of_fluids_crane(key, reference):
    for nps in CRANE_NPS:
        d = BORES[nps]
        assert fitting_k(key, d) == pytest.approx(reference(d), rel=0.01), nps


def test_the_earlier_key_of_a_fitting_still_reads():
    """``swing-check-valve-clearway`` (one publication's word) is now
    ``swing-check-valve-full-port``; a site that still says the old key gets the same K,
    which stays sourced to Crane TP-410 (clearway: K = 50 f_T)."""
    from branchwise.core.catalogs.fittings import fitting

    new, old = fitting("swing-check-valve-full-port"), fitting("swing-check-valve-clearway")
    assert old is new and new.n == 50 and "Crane TP-410" in new.source
    assert fitting_k("swing-check-valve-clearway", 0.1023) == fitting_k(
        "swing-check-valve-full-port", 0.1023)
    assert all("clearway" not in f.key for f in fittings())


@pytest.mark.parametrize("nps", [n for n in CRANE_NPS if n >= 2 and n != 16])
def test_butterfly_valve_size_bands(nps):
    # fluids.fittings.K_butterfly_valve_Crane (centric): 45 f_T to NPS 8, 35 to 14, 25 from 16.
    # NPS 16 Sch 40 is skipped: its bore is exactly 0.381 m, fluids' band edge (it returns 35);
    # Crane's table puts NPS 16 in the 25 band, as here (see the STD check below).
    d = BORES[nps]
    assert fitting_k("butterfly-valve", d) == pytest.approx(ff.K_butterfly_valve_Crane(d), rel=0.01)


def test_butterfly_valve_nps16_std_bore():
    d = piping.nearest_pipe(NPS=16, schedule="STD")[1]  # 387.34 mm, past fluids' 0.381 m edge
    assert fitting_k("butterfly-valve", d) == pytest.approx(ff.K_butterfly_valve_Crane(d), rel=0.01)


def test_tees_use_crane_n_of_20_and_60():
    # Crane TP-410 (from memory): standard tee, run 20 f_T, branch 60 f_T. fluids has no fixed-n
    # tee, so the check is the ratio to its f_T at the same nominal size.
    d = BORES[3]
    assert fitting_k("tee-run", d) == pytest.approx(20 * ft_Crane(d), rel=0.01)
    assert fitting_k("tee-branch", d) == pytest.approx(60 * ft_Crane(d), rel=0.01)


def test_non_steel_pipe_takes_the_nearest_nominal_size():
    # 1 in type L copper, ID 1.025 in = 26.04 mm (ASTM B88): nearest Sch 40 bore is NPS 1.
    copper = parse_size("1 in type L")
    assert crane_nominal(copper.inner_diameter_m).nominal == "1"
    assert crane_ft(copper.inner_diameter_m) == pytest.approx(ft_Crane(BORES[1]), rel=0.01)
    # Bores outside Crane's NPS 1/2-24 take the end sizes.
    assert crane_nominal(0.005).nominal == "1/2"
    assert crane_nominal(1.2).nominal == "24"


def test_counts_and_sums():
    d = BORES[4]
    counts = {"elbow-90": 3, "gate-valve": 2, "exit": 1, "entrance-sharp": 1}
    expected = (3 * 30 + 2 * 8) * ft_Crane(d) + 1.0 + 0.5  # fluids' f_T and Crane's n
    assert fittings_k(counts, d) == pytest.approx(expected, rel=0.01)
    assert fitting_k("globe-valve", d, count=0) == 0.0
    assert fittings_k({}, d) == 0.0


def test_bad_fitting_input_names_the_field():
    with pytest.raises(InputError) as info:
        fitting_k("gate valev", 0.1, field="branches[2].fittings")
    assert info.value.field == "branches[2].fittings" and "gate-valve" in info.value.reason
    with pytest.raises(InputError) as info:
        fittings_k({"elbow-90": -1}, 0.1, field="branches[0].fittings")
    assert info.value.field == "branches[0].fittings.elbow-90"
    with pytest.raises(InputError):
        fitting_k("elbow-90", -0.1)


def test_every_fitting_has_n_or_k_and_a_crane_source():
    for f in fittings():
        assert (f.n is None) != (f.k is None) or f.n_by_nps, f.key
        assert "Crane" in f.source, f.key


@pytest.mark.parametrize(("kv", "d"), [(2.312, 0.015), (10.0, 0.05), (250.0, 0.1), (1e4, 0.6)])
def test_k_from_kv_matches_fluids(kv, d):
    # fluids.fittings.Kv_to_K: K = 1.6e9 d^4/Kv^2 (water at 60 °F); ours 1.5989e9 (ρ0 = 1000 kg/m³).
    assert k_from_kv(kv, d) == pytest.approx(ff.Kv_to_K(kv, d), rel=1e-3)
    d_mm = d * 1000  # Crane TP-410 check (from memory): K ≈ 0.0016 d⁴/Kv², d in mm
    assert k_from_kv(kv, d) == pytest.approx(0.0016 * d_mm**4 / kv**2, rel=1e-3)


def test_k_from_kv_reproduces_the_kv_definition():
    # IEC 60534: Q = Kv sqrt(Δp/1 bar · 1000/ρ). At that Δp, K ρ V²/2 must equal Δp.
    kv, d, rho, q = 40.0, 0.08, 998.2, 25.0  # m³/h, m, kg/m³, m³/h
    dp = 1e5 * (rho / 1000.0) * (q / kv) ** 2
    velocity = q / 3600.0 / (math.pi * d * d / 4.0)
    assert k_from_kv(kv, d) * rho * velocity**2 / 2.0 == pytest.approx(dp, rel=1e-12)


@pytest.mark.parametrize(("cv", "d"), [(2.712, 0.015), (12.0, 0.05), (400.0, 0.15)])
def test_k_from_cv_matches_fluids(cv, d):
    # fluids' Cv_to_K is 1.6e9·D⁴/Kv² (its docs: water at IAPWS-95 density, 999.3 kg/m³); IEC
    # 60534-2-1 takes ρ₀ = 1000 kg/m³, which gives 1.59887e9: the two are 0.0703 % apart, so the
    # tolerance sits just above that.
    assert k_from_cv(cv, d) == pytest.approx(ff.Cv_to_K(cv, d), rel=7.1e-4)


def test_cv_per_kv_matches_fluids_and_iec():
    # The constant the solve path uses (model.CV_PER_KV, through kv_from_cv and k_from_cv).
    # fluids' Cv_to_Kv documents the exact ratio from the US gallon (231 in³) and the psi:
    # 1.1560992283536566; agreement to round-off.
    assert CV_PER_KV == pytest.approx(1 / ff.Cv_to_Kv(1.0), rel=1e-15)
    assert CV_PER_KV == pytest.approx(1.156, abs=5e-4)  # IEC 60534-1 tables print 1.156


def test_bad_valve_coefficients_raise():
    with pytest.raises(InputError) as info:
        k_from_kv(0.0, 0.05, field="branches[0].valve.kv")
    assert info.value.field == "branches[0].valve.kv"
    with pytest.raises(InputError):
        k_from_cv(float("nan"), 0.05)
