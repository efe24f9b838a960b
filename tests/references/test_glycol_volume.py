"""Glycol given by volume, against CoolProp's volume-based data sets INCOMP::AEG and INCOMP::APG.

AEG and APG are CoolProp's fits to the ASHRAE Handbook (Fundamentals 2001) tables of ethylene
and propylene glycol in water, by volume fraction: 10–60 %, from the freezing point (CoolProp's
T_freeze of each mixture) but never below −35 °C, to 100 °C. The shipped tables hold their
values at nodes; the checks here are at fractions between the rows and at temperatures off
every row's nodes, so they measure the interpolation, not the copying.

Until now a volume fraction was converted to mass with the pure liquids' densities at 20 °C and
read from the mass-based sets (INCOMP::MEG / MPG): 20.9 % off in viscosity for ethylene glycol
at 55 % by volume and −34 °C, 35.8 % for propylene glycol at 55 % and −33 °C, and a freezing
limit up to 3.2 K colder than the volume data's (57 % ethylene glycol: −50.6 °C against
−47.4 °C). Those points are kept below as regression tests.
"""

from __future__ import annotations

import re

import pytest
from CoolProp.CoolProp import PropsSI

from branchwise.core.errors import InputError
from branchwise.core.fluids import fluid_from_spec
from branchwise.core.fluids.concentration import split_basis
from branchwise.core.fluids.glycol import (
    GlycolKind,
    freezing_point_k,
    glycol,
    lowest_temperature_k,
)

ATM = 101325.0
VOLUME_CODES: dict[GlycolKind, str] = {"ethylene-glycol": "AEG", "propylene-glycol": "APG"}
LOWEST_K = 238.15  # CoolProp's Tmin for INCOMP::AEG and INCOMP::APG (−35 °C)
# Between the 2.5 % rows (and either side of the row at the corner, where the freezing point
# crosses −35 °C: 48.45 % for AEG, 50.91 % for APG).
OFF_ROW_FRACTIONS = [0.105, 0.1875, 0.2625, 0.3333, 0.41, 0.47, 0.4975, 0.53, 0.5675, 0.595]
# Kelvin above the lowest state (cold end: where viscosity climbs fastest), then 20 °C, then
# the hot end; none coincides with a node.
ABOVE_LOWEST_K = [0.05, 0.7, 3.3, 11.9]


def coolprop(output: str, kind: GlycolKind, t: float, phi: float) -> float:
    return PropsSI(output, "T", t, "P", ATM, f"INCOMP::{VOLUME_CODES[kind]}[{phi}]")


def coolprop_freezing_k(kind: GlycolKind, phi: float) -> float:
    return coolprop("T_freeze", kind, 300.0, phi)


def coolprop_lowest_k(kind: GlycolKind, phi: float) -> float:
    return max(coolprop_freezing_k(kind, phi), LOWEST_K)


# Worst relative error measured over a sweep of 251 fractions × 110 temperatures (13 within 3 K
# of the lowest state) against CoolProp, and the bound just above it:
#   ethylene glycol (AEG): density 3.4e-7 (47.2 %, 16.7 °C), viscosity 8.3e-5 (11 %, 100 °C);
#   propylene glycol (APG): density 1.7e-7 and viscosity 1.85e-4 (49.8 %, −33.4 °C, beside the
#   corner row).
BOUNDS: dict[GlycolKind, tuple[float, float]] = {
    "ethylene-glycol": (4e-7, 9e-5),
    "propylene-glycol": (2e-7, 2e-4),
}


@pytest.mark.parametrize("kind", VOLUME_CODES)
@pytest.mark.parametrize("phi", OFF_ROW_FRACTIONS)
def test_volume_data_matches_coolprop_across_the_range(kind: GlycolKind, phi: float) -> None:
    low = coolprop_lowest_k(kind, phi)
    temperatures = [low + dt for dt in ABOVE_LOWEST_K] + [293.15, 331.7, 372.45]
    rho_bound, mu_bound = BOUNDS[kind]
    for t in temperatures:
        fluid = glycol(kind, t, phi, "volume")
        # Reference: CoolProp INCOMP::AEG / INCOMP::APG; bounds as measured (above).
        assert fluid.density == pytest.approx(coolprop("D", kind, t, phi), rel=rho_bound)
        assert fluid.viscosity == pytest.approx(coolprop("V", kind, t, phi), rel=mu_bound)


@pytest.mark.parametrize(
    ("kind", "phi", "t_celsius"),
    [("ethylene-glycol", 0.55, -34.0), ("propylene-glycol", 0.55, -33.0)],
)
def test_the_points_the_old_conversion_missed(kind: GlycolKind, phi: float,
                                              t_celsius: float) -> None:
    t = 273.15 + t_celsius
    ours = glycol(kind, t, phi, "volume")
    mu_ref = coolprop("V", kind, t, phi)  # reference: CoolProp INCOMP::AEG / APG
    # Measured now: 4.9e-9 (EG) and 3.1e-9 (PG) in viscosity, 55 % being a row of the table;
    # bounds as for any point of the table (BOUNDS).
    rho_bound, mu_bound = BOUNDS[kind]
    assert ours.viscosity == pytest.approx(mu_ref, rel=mu_bound)
    assert ours.density == pytest.approx(coolprop("D", kind, t, phi), rel=rho_bound)
    # What was done before: the volume fraction converted with the pure liquids' densities
    # at 20 °C (CRC Handbook, from memory: 1113.2 and 1036.1 kg/m³; water 998.21 kg/m³, IAPWS)
    # and read from the mass-based set. Measured: +20.9 % (EG) and +35.8 % (PG) here.
    rho_g = {"ethylene-glycol": 1113.2, "propylene-glycol": 1036.1}[kind]
    w = phi * rho_g / (phi * rho_g + (1 - phi) * 998.21)
    as_before = glycol(kind, t, w)
    assert abs(as_before.viscosity / mu_ref - 1) > 0.2


@pytest.mark.parametrize("kind", VOLUME_CODES)
@pytest.mark.parametrize("phi", [0.1, 0.123, 0.2468, 0.3333, 0.4845, 0.52, 0.57, 0.6])
def test_freezing_point_matches_coolprop(kind: GlycolKind, phi: float) -> None:
    # Reference: CoolProp's T_freeze of the same AEG / APG mixture, tabulated every 1 %.
    # Worst measured over 251 fractions: 8.3e-6 K (AEG, 10.4 %); bound 1e-5 K. (57 % ethylene
    # glycol is where the old conversion's limit was 3.2 K too cold.)
    expected = coolprop_freezing_k(kind, phi)
    assert freezing_point_k(kind, phi, "volume") == pytest.approx(expected, abs=1e-5)
    assert lowest_temperature_k(kind, phi, "volume") == pytest.approx(max(expected, LOWEST_K),
                                                                      abs=1e-5)


@pytest.mark.parametrize("kind", VOLUME_CODES)
@pytest.mark.parametrize("phi", [0.15, 0.3333, 0.45])
def test_volume_data_refuses_points_below_freezing(kind: GlycolKind, phi: float) -> None:
    t_freeze = coolprop_freezing_k(kind, phi)  # reference: CoolProp T_freeze
    with pytest.raises(InputError) as err:
        glycol(kind, t_freeze - 0.05, phi, "volume")
    assert err.value.field == "fluid.temperature"
    said = re.search(r"by volume freezes at (-?[\d.]+) °C", str(err.value))
    # The message gives 0.01 °C: half of it, plus the 1e-5 K of the table.
    assert said is not None and float(said.group(1)) == pytest.approx(t_freeze - 273.15,
                                                                      abs=0.0051)
    with pytest.raises(ValueError, match="freezing point"):  # CoolProp refuses it too
        coolprop("D", kind, t_freeze - 0.05, phi)


@pytest.mark.parametrize("kind", VOLUME_CODES)
@pytest.mark.parametrize("phi", [0.55, 0.6])
def test_volume_data_refuses_points_below_its_range(kind: GlycolKind, phi: float) -> None:
    # These mixtures freeze below −35 °C, where the data set stops (CoolProp's Tmin).
    assert coolprop_freezing_k(kind, phi) < LOWEST_K - 5
    with pytest.raises(InputError) as err:
        glycol(kind, LOWEST_K - 0.05, phi, "volume")
    assert err.value.field == "fluid.temperature"
    assert "must be at least -35 °C (the tabulated range" in str(err.value)
    said = re.search(r"the mixture freezes at (-?[\d.]+) °C", str(err.value))
    assert said is not None
    assert float(said.group(1)) == pytest.approx(coolprop_freezing_k(kind, phi) - 273.15,
                                                 abs=0.0051)  # as in the test above
    with pytest.raises(ValueError, match="not between"):  # CoolProp refuses it too
        coolprop("D", kind, LOWEST_K - 0.05, phi)
    at_the_limit = glycol(kind, LOWEST_K, phi, "volume")
    assert at_the_limit.density == pytest.approx(coolprop("D", kind, LOWEST_K, phi),
                                                 rel=BOUNDS[kind][0])


@pytest.mark.parametrize(
    ("t", "phi", "field", "words"),
    [
        (293.15, 0.05, "fluid.concentration", "between 10 % and 60 % glycol by volume"),
        (293.15, 0.65, "fluid.concentration", "between 10 % and 60 % glycol by volume"),
        (373.5, 0.3, "fluid.temperature", "at most 100 °C (the tabulated range)"),
        (float("nan"), 0.3, "fluid.temperature", ""),
    ],
)
def test_volume_data_refuses_outside_its_table(t: float, phi: float, field: str,
                                               words: str) -> None:
    # CoolProp's own AEG / APG range: 10–60 % ("not between 0.1 and 0.6"), up to 373.15 K.
    with pytest.raises(InputError) as err:
        glycol("ethylene-glycol", t, phi, "volume")
    assert err.value.field == field
    assert words in str(err.value)


def test_names_say_the_basis() -> None:
    fluid = glycol("propylene-glycol", 240.15, 0.55, "volume")
    assert fluid.name == "Propylene glycol 55 % by volume at -33.0 °C"
    assert "INCOMP::APG" in fluid.source
    assert "INCOMP::MPG" in glycol("propylene-glycol", 240.15, 0.55).source


@pytest.mark.parametrize(("text", "expected"), [
    ("30 %", ("30 %", "mass")),
    ("30 % vol", ("30 %", "volume")),
    ("30 vol%", ("30 %", "volume")),
    ("30 %v/v", ("30 %", "volume")),
    ("30 % by volume", ("30 %", "volume")),
    ("30 % by mass", ("30 %", "mass")),
    ("30 wt%", ("30 %", "mass")),
    ("0.3 vol", ("0.3", "volume")),
    ("vol", ("vol", "mass")),  # no number: left for the unit parser to refuse
])
def test_basis_words(text: str, expected: tuple[str, str]) -> None:
    assert split_basis(text) == expected


def _site(kind: GlycolKind, concentration: str, temperature: str = "20 degC"):
    from branchwise.core.site.read import parse_site

    return parse_site(f'format = 1\n[fluid]\nkind = "{kind}"\ntemperature = "{temperature}"\n'
                      f'concentration = "{concentration}"\n[conditions]\n'
                      'pressure_drop = "10 kPa"\n[[branches]]\nname = "A"\n'
                      'diameter = "50 mm"\nlength = "10 m"\n')


@pytest.mark.parametrize("typed", ["30 % vol", "30 vol%", "30 % by volume", "0.3 v/v"])
def test_site_file_concentration_by_volume(typed: str) -> None:
    from branchwise.core.site.build import build_fluid

    by_volume = build_fluid(_site("ethylene-glycol", typed))
    assert by_volume == glycol("ethylene-glycol", 293.15, 0.3, "volume")
    # Reference: CoolProp INCOMP::AEG[0.3] at 20 °C.
    assert by_volume.density == pytest.approx(coolprop("D", "ethylene-glycol", 293.15, 0.3),
                                              rel=BOUNDS["ethylene-glycol"][0])
    assert build_fluid(_site("ethylene-glycol", "30 %")) == glycol("ethylene-glycol", 293.15, 0.3)


def test_site_file_at_the_cold_regression_point() -> None:
    from branchwise.core.site.build import build_fluid

    fluid = build_fluid(_site("propylene-glycol", "55 % vol", "-33 degC"))
    reference = coolprop("V", "propylene-glycol", 240.15, 0.55)  # CoolProp INCOMP::APG
    assert fluid.viscosity == pytest.approx(reference, rel=BOUNDS["propylene-glycol"][1])
    with pytest.raises(InputError) as err:
        build_fluid(_site("propylene-glycol", "55 % vol", "-36 degC"))
    assert err.value.field == "fluid.temperature"


@pytest.mark.parametrize("spelled", ["Ethylene-Glycol", "ethylene glycol", "ETHYLENE_GLYCOL"])
def test_the_kind_is_read_however_it_is_capitalised_or_spaced(spelled: str) -> None:
    from branchwise.core.site.build import build_fluid

    assert build_fluid(_site(spelled, "30 % vol")) == glycol("ethylene-glycol", 293.15, 0.3,
                                                               "volume")


def test_spec_takes_one_basis_only() -> None:
    fluid = fluid_from_spec("ethylene-glycol", temperature_k=293.15, volume_fraction=0.3)
    assert fluid == glycol("ethylene-glycol", 293.15, 0.3, "volume")
    with pytest.raises(InputError) as err:
        fluid_from_spec("ethylene-glycol", temperature_k=293.15, mass_fraction=0.3,
                        volume_fraction=0.3)
    assert err.value.field == "fluid.concentration"
    with pytest.raises(InputError) as err:  # by volume is for a glycol only
        fluid_from_spec("water", temperature_k=293.15, volume_fraction=0.3)
    assert err.value.field == "fluid.concentration"
