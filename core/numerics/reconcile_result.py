"""What weighing a header's readings gives (:mod:`.reconcile`): each reading in SI
(:class:`Observation`), each against the reconciled state (:class:`ReadingFit`), the state and the
tests of agreement (:class:`Reconciliation`), the χ² test's p-value and the verdict in words.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

ALPHA = 0.05
"""The test's significance: readings are consistent when p ≥ 5 % (common practice)."""
READING_WORDS = {"pressure_drop": "differential gauge", "total_flow": "total-flow meter",
                 "measured_flow": "clamp-on"}
ADVICE = {
    "pressure_drop": "check the gauge's zero, its range and the tapping points",
    "total_flow": "check the meter's calibration and its straight run",
    "measured_flow": "check the meter's pipe data and mounting",
}


@dataclass(frozen=True)
class Observation:
    """One reading in SI: ``kind`` pressure_drop | total_flow | measured_flow; ``branch`` the
    index of the measured branch (else None); ``value`` Pa or m³/s."""

    kind: str
    branch: int | None
    value: float


@dataclass(frozen=True)
class ReadingFit:
    """One reading against the reconciled state (SI: Pa or m³/s): sigma_si is the standard
    deviation of its residual before reconciliation (instrument and model together)."""

    reading: str
    branch: str | None
    measured_si: float
    reconciled_si: float
    sigma_si: float
    normalised_residual: float

    @property
    def label(self) -> str:
        """``the clamp-on on 'AHU-3 coil'``, ``the differential gauge``."""
        words = READING_WORDS[self.reading]
        return f"the {words} on '{self.branch}'" if self.branch else f"the {words}"


@dataclass(frozen=True)
class Reconciliation:
    """The reconciled state of a header from all its readings, and the tests of their agreement.

    head_m, pressure_drop_pa, total_flow_m3_s, flows_m3_s (per branch): the reconciled state.
    chi_square, degrees_of_freedom, p_value: the global test; consistent: p ≥ :data:`ALPHA`.
    suspect: the reading most likely at fault when the test fails and there are three readings
    or more (None otherwise); without_suspect: (χ², p) once it is left out. verdict: in words.
    """

    head_m: float
    pressure_drop_pa: float
    total_flow_m3_s: float
    flows_m3_s: tuple[float, ...]
    chi_square: float
    degrees_of_freedom: int
    p_value: float
    consistent: bool
    suspect: ReadingFit | None
    without_suspect: tuple[float, float] | None
    readings: tuple[ReadingFit, ...]
    verdict: str
    covariance: tuple[tuple[float, ...], ...] = ()
    """V, the residuals' covariance the optimum was found with (SI², readings' order)."""
    head_sigma_m: float = math.nan
    """The reconciled head's standard uncertainty, (Jᵀ V⁻¹ J)^(−½) (m): what the readings
    weighed together and the model's uncertainty leave of it (first order)."""
    pressure_drop_sigma_pa: float = math.nan
    """The reconciled pressure drop's standard uncertainty (Pa): ρ g times the head's."""
    pressure_drop_sigma_instruments_pa: float = math.nan
    """The part of it the instruments alone leave (Pa): to first order the estimate is
    ρ g Σ aₖ yₖ with a = V⁻¹J / (Jᵀ V⁻¹ J), so this is ρ g (Σ aₖ² uₖ²)^½, uₖ each
    instrument's standard uncertainty. Where the model's inputs are drawn on their own (the
    bands of a change between visits, where they are shared), this is the head's own spread
    to draw; the whole σ would count the model's part twice."""

    def to_json(self) -> dict[str, Any]:
        """The JSON's ``reconciliation`` object (SI)."""
        without = self.without_suspect
        return {
            "head_m": self.head_m, "pressure_drop_pa": self.pressure_drop_pa,
            "total_flow_m3_s": self.total_flow_m3_s, "head_sigma_m": self.head_sigma_m,
            "pressure_drop_sigma_pa": self.pressure_drop_sigma_pa,
            "chi_square": self.chi_square,
            "degrees_of_freedom": self.degrees_of_freedom, "p_value": self.p_value,
            "consistent": self.consistent,
            "suspect": None if self.suspect is None else _fit_json(self.suspect),
            "without_suspect": None if without is None else
            {"chi_square": without[0], "p_value": without[1]},
            "readings": [_fit_json(f) for f in self.readings],
        }


def _fit_json(f: ReadingFit) -> dict[str, Any]:
    return {"reading": f.reading, "branch": f.branch, "measured_si": f.measured_si,
            "reconciled_si": f.reconciled_si, "sigma_si": f.sigma_si,
            "normalised_residual": f.normalised_residual}


def chi_square_p(chi2: float, dof: int) -> float:
    """P(χ²_dof ≥ chi2), the upper tail, in closed form for whole degrees of freedom
    (Abramowitz & Stegun 26.4.4–5): even k = 2n: e^(−x/2) Σᵢ₍₀…ₙ₋₁₎ (x/2)ⁱ/i!; odd k = 2n+1:
    erfc(√(x/2)) + e^(−x/2) Σᵢ₍₀…ₙ₋₁₎ (x/2)^(i+½)/Γ(i+3/2)."""
    if dof <= 0:
        return 1.0
    half = max(chi2, 0.0) / 2.0
    n, odd = divmod(dof, 2)
    total, term = 0.0, 0.0
    if odd:
        total = math.erfc(math.sqrt(half))
        term = math.sqrt(half) / math.gamma(1.5)  # (x/2)^(1/2) / Γ(3/2)
        for i in range(n):
            total += math.exp(-half) * term
            term *= half / (i + 1.5)
    else:
        term = 1.0
        for i in range(n):
            total += math.exp(-half) * term
            term *= half / (i + 1)
    return min(1.0, max(0.0, total))


def verdict_words(fits: Sequence[ReadingFit], chi2: float, dof: int, p: float,
                  consistent: bool, suspect: ReadingFit | None,
                  without: tuple[float, float] | None) -> str:
    """The test's outcome in words: the readings agree; two disagree (the test cannot say
    which); or the suspect reading, what to check on it, and whether the rest then agree."""
    m = len(fits)
    if consistent:
        return (f"The {m} readings agree (χ² {chi2:.2f} on {dof} degree"
                f"{'s' if dof != 1 else ''} of freedom, p = {p:.2f}).")
    if suspect is None:
        a, b = fits
        return (f"{_first_up(a.label)} and {b.label} disagree (χ² {chi2:.2f}, p {p_said(p)}); "
                "with two readings the test cannot tell which one is off: a third reading "
                "would.")
    rest_p = without[1] if without is not None else float("nan")
    tail = (f"without it the rest agree (p = {rest_p:.2f})" if rest_p >= ALPHA else
            f"without it the rest still disagree (p {p_said(rest_p)}): more than one reading "
            "may be off")
    return (f"{_first_up(suspect.label)} disagrees with the other {m - 1} readings "
            f"({abs(suspect.normalised_residual):.1f} σ): {ADVICE[suspect.reading]}; {tail}.")


def p_said(p: float) -> str:
    """A small p-value said with its sign, ``= 3.3e-224``; one below what a float holds (χ² in
    the thousands) as a bound, ``< 1e-300``, not "= 0"."""
    return f"= {p:.2g}" if p > 0 else "< 1e-300"


def _first_up(text: str) -> str:
    return text[:1].upper() + text[1:]


__all__ = ["ADVICE", "ALPHA", "READING_WORDS", "Observation", "ReadingFit", "Reconciliation",
           "chi_square_p", "verdict_words"]
