"""Darcy friction factors, vectorised over numpy arrays.

Every function takes the Reynolds number ``re`` (–) and the relative roughness ``rr`` = ε/D (–)
as arrays and returns ``(f, slope)``: the Darcy friction factor and d ln f / d ln Re, which the
hydraulic solver uses for its Newton steps. The slope only speeds convergence; answers are
checked on their residual, never on the slope.

Regimes (see :func:`darcy`): laminar below ``RE_LAMINAR``, the chosen turbulent correlation above
``RE_TURBULENT``, and in between Churchill (1977), shifted linearly so that it meets the laminar
value at the lower edge and the turbulent one at the upper edge. No correlation is reliable in
that zone; the shift keeps head loss continuous and increasing with flow, so that every
branch's Q(h) has exactly one answer, and results there are flagged.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np
from numpy.typing import NDArray

Array = NDArray[np.float64]

RE_LAMINAR = 2000.0
"""Upper end of the laminar regime (common practice: 2000–2300)."""
RE_TURBULENT = 4000.0
"""Lower end of the fully turbulent regime (common practice)."""

LN10 = float(np.log(10.0))
COLEBROOK_RTOL = 1e-14


def laminar(re: Array, rr: Array | None = None) -> tuple[Array, Array]:
    """Hagen–Poiseuille: f = 64/Re, exact for laminar flow in a round pipe."""
    re = np.asarray(re, dtype=float)
    return 64.0 / re, np.full_like(re, -1.0)


def swamee_jain(re: Array, rr: Array) -> tuple[Array, Array]:
    """Swamee & Jain (1976): f = 0.25 / [log10(ε/(3.7D) + 5.74/Re^0.9)]².

    Swamee, P.K. & Jain, A.K., J. Hydraulics Div. ASCE 102(5), 657–664 (1976).
    """
    re = np.asarray(re, dtype=float)
    rr = np.asarray(rr, dtype=float)
    b = 5.74 * re**-0.9
    arg = rr / 3.7 + b
    lg = np.log10(arg)
    f = 0.25 / lg**2
    # d ln f / d ln Re = -2 d ln|lg| / d ln Re = -2 (1/(lg ln10 arg)) (-0.9 b)
    slope = 1.8 * b / (lg * LN10 * arg)
    return f, slope


def haaland(re: Array, rr: Array) -> tuple[Array, Array]:
    """Haaland (1983): 1/√f = −1.8 log10[(ε/D / 3.7)^1.11 + 6.9/Re].

    Haaland, S.E., J. Fluids Eng. 105(1), 89–90 (1983).
    """
    re = np.asarray(re, dtype=float)
    rr = np.asarray(rr, dtype=float)
    b = 6.9 / re
    arg = (rr / 3.7) ** 1.11 + b
    x = -1.8 * np.log10(arg)
    f = x**-2.0
    # d x / d ln Re = -1.8/(ln10 arg) * (-b)
    dx = 1.8 * b / (LN10 * arg)
    return f, -2.0 * dx / x


def colebrook(re: Array, rr: Array, start: Array | None = None) -> tuple[Array, Array]:
    """Colebrook–White (1939), solved to machine precision.

    1/√f = −2 log10(ε/(3.7 D) + 2.51/(Re √f)). Newton on x = 1/√f from ``start`` (x of a
    nearby flow, e.g. the solver's last pass: a step or two then suffices) or else from the
    Swamee–Jain estimate; stops when the step is below 1e-14 relative (the residual of the
    equation is then at round-off level, far below the 1e-12 asked of it). Newton cannot fail
    from any x > 0: g(x) = x + 2 log10(a + c x) is increasing and concave, so a start below
    the root steps above it and from above the steps fall to it.
    Colebrook, C.F., J. ICE 11(4), 133–156 (1939).
    """
    re = np.asarray(re, dtype=float)
    rr = np.asarray(rr, dtype=float)
    a = rr / 3.7
    c = 2.51 / re
    warm = start is not None and start.shape == re.shape and bool(np.all(start > 0)) and bool(
        np.all(np.isfinite(start)))
    if warm:
        assert start is not None
        x = start
        first = 0
    else:
        x = 1.0 / np.sqrt(swamee_jain(re, rr)[0])
        first = 2  # from Swamee–Jain (≲3 % off) Newton needs about three steps
    for i in range(50):
        arg = a + c * x
        g = x + 2.0 * np.log10(arg)
        dg = 1.0 + 2.0 * c / (LN10 * arg)
        step = g / dg
        x = x - step
        if i >= first and np.all(np.abs(step) <= COLEBROOK_RTOL * np.abs(x)):
            break
    arg = a + c * x
    # implicit derivative: g(x, Re) = 0 → dx/dlnRe = -(∂g/∂lnRe)/(∂g/∂x)
    dg_dx = 1.0 + 2.0 * c / (LN10 * arg)
    dg_dlnre = -2.0 * c * x / (LN10 * arg)
    dx = -dg_dlnre / dg_dx
    return x**-2.0, -2.0 * dx / x


def colebrook_residual(f: Array, re: Array, rr: Array) -> Array:
    """Relative residual of the Colebrook equation in its 1/√f form (for tests and reports)."""
    x = 1.0 / np.sqrt(f)
    return np.abs(x + 2.0 * np.log10(rr / 3.7 + 2.51 * x / re)) / x


def churchill(re: Array, rr: Array) -> tuple[Array, Array]:
    """Churchill (1977): one expression for laminar, transition and turbulent flow.

    f = 8 [(8/Re)^12 + (A + B)^−1.5]^(1/12), A = [2.457 ln(1/((7/Re)^0.9 + 0.27 ε/D))]^16,
    B = (37530/Re)^16. Churchill, S.W., Chem. Eng. 84(24), 91–92 (1977).
    The slope is a central difference (the function is smooth).
    """
    re = np.asarray(re, dtype=float)
    rr = np.asarray(rr, dtype=float)
    f = _churchill(re, rr)
    h = 1e-6
    slope = (np.log(_churchill(re * (1 + h), rr)) - np.log(_churchill(re * (1 - h), rr))) / (
        np.log1p(h) - np.log1p(-h)
    )
    return f, slope


def _churchill(re: Array, rr: Array) -> Array:
    # Work in logs: A and B reach 1e300 and beyond at either end of the range.
    # A is a 16th power: below Re ≈ 7 its base is negative, hence the absolute value.
    ln_a = 16.0 * np.log(np.abs(2.457 * np.log(1.0 / ((7.0 / re) ** 0.9 + 0.27 * rr))))
    ln_b = 16.0 * np.log(37530.0 / re)
    ln_ab = np.logaddexp(ln_a, ln_b)
    ln_term = np.logaddexp(12.0 * np.log(8.0 / re), -1.5 * ln_ab)
    return 8.0 * np.exp(ln_term / 12.0)


TURBULENT = {
    "colebrook": colebrook,
    "haaland": haaland,
    "swamee-jain": swamee_jain,
    "churchill": churchill,
}


def darcy(re: Array, rr: Array, model: str = "colebrook",
          start: Array | None = None) -> tuple[Array, Array]:
    """Darcy friction factor over all regimes with the chosen turbulent correlation.

    ``churchill`` is used as is at every Re. The others: 64/Re below RE_LAMINAR, the model above
    RE_TURBULENT, and Churchill shifted to meet both in between (see the module docstring).
    ``laminar`` forces 64/Re at every Re. Re = 0 gives f = inf with slope −1 (no flow).
    ``start``: 1/√f per item from a nearby flow, where Colebrook is solved (:func:`colebrook`).
    """
    re = np.asarray(re, dtype=float)
    rr = np.asarray(rr, dtype=float)
    if model == "laminar":
        return laminar(re)
    if model == "churchill":
        return churchill(np.maximum(re, 1e-300), rr)
    warm = start is not None and model == "colebrook"
    if re.size and re.min() >= RE_TURBULENT:  # the usual case on a plant: skip the masks
        return colebrook(re, rr, start) if warm else TURBULENT[model](re, rr)
    turbulent = TURBULENT[model]
    f = np.empty_like(re)
    slope = np.empty_like(re)
    lam = re < RE_LAMINAR
    turb = re >= RE_TURBULENT
    mid = ~(lam | turb)
    if lam.any():
        with np.errstate(divide="ignore"):
            f[lam], slope[lam] = laminar(re[lam])
    if turb.any():
        f[turb], slope[turb] = (colebrook(re[turb], rr[turb], start[turb]) if warm and (
            start is not None) else turbulent(re[turb], rr[turb]))
    if mid.any():
        f[mid], slope[mid] = _bridged(re[mid], rr[mid], turbulent)
    return f, slope


def _bridged(
    re: Array, rr: Array, turbulent: Callable[[Array, Array], tuple[Array, Array]]
) -> tuple[Array, Array]:
    """Churchill in the transition zone, shifted to meet 64/Re and the turbulent model."""
    lo = np.full_like(re, RE_LAMINAR)
    hi = np.full_like(re, RE_TURBULENT)
    ch, ch_slope = churchill(re, rr)
    off_lo = 64.0 / RE_LAMINAR - _churchill(lo, rr)
    off_hi = turbulent(hi, rr)[0] - _churchill(hi, rr)
    w = (re - RE_LAMINAR) / (RE_TURBULENT - RE_LAMINAR)
    f = ch + (1 - w) * off_lo + w * off_hi
    df_dre = ch * ch_slope / re + (off_hi - off_lo) / (RE_TURBULENT - RE_LAMINAR)
    return f, df_dre * re / f


def regime(re: Array) -> NDArray[np.str_]:
    """'laminar', 'transition' or 'turbulent' for each Reynolds number; 'none' where nothing
    flows (a zero reading given: no regime, and no friction factor either)."""
    re = np.abs(np.asarray(re, dtype=float))
    return np.where(re == 0, "none", np.where(
        re < RE_LAMINAR, "laminar", np.where(re < RE_TURBULENT, "transition", "turbulent")))


# ---- Hazen–Williams ---------------------------------------------------------------------------

HW_K_SI = 10.67
"""SI coefficient of h_f = 10.67 L Q^1.852 / (C^1.852 D^4.8704) (Williams & Hazen, 1905/1920;
as printed in most SI hydraulics texts, e.g. Mays, Water Resources Engineering)."""
HW_Q_EXP = 1.852
HW_D_EXP = 4.8704


def hazen_williams_head(q: Array, length: Array | float, diameter: Array, c: Array) -> Array:
    """Friction head loss, m, by Hazen–Williams in SI units (q m³/s, length and diameter m)."""
    q = np.asarray(q, dtype=float)
    return HW_K_SI * length * np.abs(q) ** HW_Q_EXP / (c**HW_Q_EXP * diameter**HW_D_EXP)


def hazen_williams_f(velocity: Array, diameter: Array, c: Array, gravity: float) -> Array:
    """The Darcy f that gives the Hazen–Williams friction loss at this velocity (–).

    h_f/L does not depend on L, so f = (h_f/L) · 2 g D / V². Since h_f ∝ Q^1.852, f ∝ V^−0.148
    and d ln f/d ln Re = 1.852 − 2 (see ``HW_SLOPE``).
    """
    velocity = np.abs(np.asarray(velocity, dtype=float))
    area = np.pi * diameter**2 / 4
    per_metre = hazen_williams_head(velocity * area, 1.0, diameter, c)
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(velocity > 0, per_metre * 2 * gravity * diameter / velocity**2, np.inf)


HW_SLOPE = HW_Q_EXP - 2.0


def hazen_williams(
    re: Array, rr: Array, diameter: Array, c: Array, nu: Array, gravity: float
) -> tuple[Array, Array]:
    """The Darcy f under Hazen–Williams over all regimes, and d ln f / d ln Re.

    Hazen–Williams is an empirical fit for water in turbulent flow: it is used where Re ≥
    ``RE_TURBULENT``. Below ``RE_LAMINAR`` the flow is laminar and its loss is Hagen–Poiseuille's,
    f = 64/Re, whatever formula was chosen; in between, Churchill shifted to meet both (as for
    the Darcy models, :func:`darcy`), so that the loss stays continuous and rising with flow.
    diameter: m; c: Hazen–Williams C (–); nu: kinematic viscosity, m²/s; per segment.
    """
    re = np.asarray(re, dtype=float)
    f = np.empty_like(re)
    slope = np.empty_like(re)
    lam = re < RE_LAMINAR
    turb = re >= RE_TURBULENT
    mid = ~(lam | turb)

    def turbulent_at(sel: NDArray[np.bool_]) -> Callable[[Array, Array], tuple[Array, Array]]:
        def hw(re_: Array, rr_: Array) -> tuple[Array, Array]:
            d = diameter[sel]
            f_hw = hazen_williams_f(re_ * nu[sel] / d, d, c[sel], gravity)
            return f_hw, np.full_like(f_hw, HW_SLOPE)
        return hw

    if lam.any():
        with np.errstate(divide="ignore"):
            f[lam], slope[lam] = laminar(re[lam])
    if turb.any():
        f[turb], slope[turb] = turbulent_at(turb)(re[turb], rr[turb])
    if mid.any():
        f[mid], slope[mid] = _bridged(re[mid], rr[mid], turbulent_at(mid))
    return f, slope
