"""Glycol given by volume: converted to the tables' mass basis, checked against volume-based data.

CoolProp's INCOMP::AEG and INCOMP::APG (ASHRAE Handbook data for ethylene and propylene glycol)
are by volume fraction; the shipped tables are CoolProp's mass-based INCOMP::MEG / INCOMP::MPG.
The two data sets differ by up to ~0.5 % in density and several % in viscosity at the same
mixture, so the bounds below are that scatter, not the conversion's own error. Reading a volume
percent as a mass percent would miss the densities by about 1 % at 50 % and fail here.
"""

from __future__ import annotations

import pytest
from CoolProp.CoolProp import PropsSI

from branchwise.core.fluids.concentration import mass_fraction_from_volume, split_basis
from branchwise.core.fluids.glycol import glycol

VOLUME_CODES = {"ethylene-glycol": "AEG", "propylene-glycol": "APG"}
T20 = 293.15


@pytest.mark.parametrize("kind", VOLUME_CODES)
@pytest.mark.parametrize("phi", [0.2, 0.3, 0.4, 0.5])
def test_volume_fraction_matches_volume_based_data(kind: str, phi: float) -> None:
    fluid_name = f"INCOMP::{VOLUME_CODES[kind]}[{phi}]"
    rho_ref = PropsSI("D", "T", T20, "P", 101325.0, fluid_name)
    mu_ref = PropsSI("V", "T", T20, "P", 101325.0, fluid_name)
    ours = glycol(kind, T20, mass_fraction_from_volume(kind, phi))  # type: ignore[arg-type]
    assert ours.density == pytest.approx(rho_ref, rel=0.006)
    assert ours.viscosity == pytest.approx(mu_ref, rel=0.08)
    as_if_mass = glycol(kind, T20, phi)  # type: ignore[arg-type]
    assert abs(ours.density - rho_ref) < abs(as_if_mass.density - rho_ref)


def test_conversion_is_more_glycol_by_mass_than_by_volume() -> None:
    # Both glycols are denser than water, so a mass fraction exceeds the volume fraction.
    for kind in VOLUME_CODES:
        assert 0.3 < mass_fraction_from_volume(kind, 0.3) < 0.34
    assert mass_fraction_from_volume("ethylene-glycol", 0.0) == 0.0
    assert mass_fraction_from_volume("ethylene-glycol", 1.0) == 1.0


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


@pytest.mark.parametrize("typed", ["30 % vol", "30 vol%", "30 % by volume"])
def test_site_file_concentration_by_volume(typed: str) -> None:
    from branchwise.core.site.build import build_fluid
    from branchwise.core.site.read import parse_site

    def site(concentration: str):
        return parse_site('format = 1\n[fluid]\nkind = "ethylene-glycol"\n'
                          'temperature = "20 degC"\n'
                          f'concentration = "{concentration}"\n[conditions]\n'
                          'pressure_drop = "10 kPa"\n[[branches]]\nname = "A"\n'
                          'diameter = "50 mm"\nlength = "10 m"\n')

    by_volume = build_fluid(site(typed))
    by_mass = build_fluid(site("30 %"))
    expected = glycol("ethylene-glycol", T20, mass_fraction_from_volume("ethylene-glycol", 0.3))
    assert by_volume.density == pytest.approx(expected.density, rel=1e-12)
    assert by_volume.density > by_mass.density  # more glycol by mass than 30 %


@pytest.mark.parametrize("spelled", ["Ethylene-Glycol", "ethylene glycol", "ETHYLENE_GLYCOL"])
def test_the_kind_is_read_however_it_is_capitalised_or_spaced(spelled: str) -> None:
    from branchwise.core.site.build import build_fluid
    from branchwise.core.site.read import parse_site

    site = parse_site(f'format = 1\n[fluid]\nkind = "{spelled}"\ntemperature = "20 degC"\n'
                      'concentration = "30 % vol"\n')
    expected = glycol("ethylene-glycol", T20, mass_fraction_from_volume("ethylene-glycol", 0.3))
    assert build_fluid(site).density == pytest.approx(expected.density, rel=1e-12)
