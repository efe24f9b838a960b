"""Valves, strainers and coils in series on one branch, given as ``valve_kv = "160 + 40"``.

In series the same flow passes each one and the losses add, so the branch's loss coefficient
must be the sum of each one's K. Reference: the ``fluids`` library's ``Kv_to_K`` / ``Cv_to_K``
(Caleb Bell, fluids.fittings), summed here.
"""

from __future__ import annotations

import fluids
import pytest

from branchwise.core.catalogs import k_from_kv
from branchwise.core.errors import InputError
from branchwise.core.site.build import build
from branchwise.core.site.read import parse_site

BORE = 0.1  # m


def _site(valve: str) -> str:
    return ('format = 1\n[fluid]\nkind = "water"\ntemperature = "20 degC"\n[conditions]\n'
            'pressure_drop = "50 kPa"\n[[branches]]\nname = "A"\ndiameter = "100 mm"\n'
            f'length = "10 m"\nroughness = "0.045 mm"\n{valve}\n')


@pytest.mark.parametrize(("line", "reference_k"), [
    ('valve_kv = "160 + 40"', fluids.Kv_to_K(160, BORE) + fluids.Kv_to_K(40, BORE)),
    ('valve_kv = "160 + 40 + 55.5"',
     fluids.Kv_to_K(160, BORE) + fluids.Kv_to_K(40, BORE) + fluids.Kv_to_K(55.5, BORE)),
    ('valve_cv = "110+48"', fluids.Cv_to_K(110, BORE) + fluids.Cv_to_K(48, BORE)),
    ("valve_kv = 160", fluids.Kv_to_K(160, BORE)),
])
def test_series_loss_is_the_sum_of_each(line: str, reference_k: float) -> None:
    kv = build(parse_site(_site(line))).network.branches[0].valve_kv
    # fluids' Kv_to_K is 1.6e9·D⁴/Kv² (its docs: water at 999.3 kg/m³); IEC 60534-2-1 takes
    # ρ₀ = 1000 kg/m³ (1.59887e9), as we do: 0.0703 % apart, the tolerance just above that.
    assert k_from_kv(kv, BORE) == pytest.approx(reference_k, rel=7.1e-4)


@pytest.mark.parametrize(("value", "reason"), [
    ('"160 +"', "160 + 40"),
    ('"160,5"', "decimal point"),
    ('"160 + 0"', "positive"),
    ('"160 + x"', "plain number"),
])
def test_bad_series_text_names_the_field(value: str, reason: str) -> None:
    with pytest.raises(InputError) as caught:
        build(parse_site(_site(f"valve_kv = {value}")))
    assert caught.value.field == "branches[0].valve_kv" and reason in str(caught.value)


def test_an_exponent_is_not_a_series() -> None:
    assert build(parse_site(_site('valve_kv = "1.6e+2"'))).network.branches[0].valve_kv == 160


@pytest.mark.parametrize(("line", "reference_k"), [
    ('valve_cv = "Cv 45 + Cv 95"', fluids.Cv_to_K(45, BORE) + fluids.Cv_to_K(95, BORE)),
    ('valve_kv = "Kv 160 + Cv 48"', fluids.Kv_to_K(160, BORE) + fluids.Cv_to_K(48, BORE)),
    ('valve_kv = "160 + cv: 48"', fluids.Kv_to_K(160, BORE) + fluids.Cv_to_K(48, BORE)),
])
def test_each_term_may_name_its_coefficient(line: str, reference_k: float) -> None:
    kv = build(parse_site(_site(line))).network.branches[0].valve_kv
    # fluids' Kv_to_K and Cv_to_K use 1.6e9·D⁴/Kv² (water at 999.3 kg/m³, its docs say); IEC
    # 60534-2-1 takes ρ₀ = 1000 kg/m³ (1.59887e9). Both use the exact Cv/Kv = 1.1560992…: the
    # answers are 0.0703 % apart, so the tolerance sits just above that.
    assert k_from_kv(kv, BORE) == pytest.approx(reference_k, rel=7.1e-4)


@pytest.mark.parametrize(("value", "words"), [
    ('"Kv 160 + Cv"', "term 2 has no number"),
    ('"160 ++ 40"', "term 2 is not a plain number"),
    ('"1e-320 + 1"', "term 1 is not a valve's flow coefficient"),
    ('"160 + nan"', "term 2 must be a positive number"),
])
def test_a_bad_term_is_named_and_the_whole_text_quoted(value: str, words: str) -> None:
    with pytest.raises(InputError) as caught:
        build(parse_site(_site(f"valve_kv = {value}")))
    assert words in caught.value.reason and caught.value.value == value.strip('"')
