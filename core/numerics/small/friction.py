"""The Darcy friction factor of one segment in plain floats: the same equations as
:mod:`branchwise.core.numerics.friction`, written with :mod:`math` for a network of a few
branches, where numpy's cost per call outweighs the arithmetic.

Every function returns ``(f, slope)`` with slope = d ln f / d ln Re, as the vectorised ones do;
:func:`darcy_rr` also gives d ln f / d ln(ε/D) (the exact slope of a diameter's Newton step).
The sources of each correlation are in the vectorised module's docstrings. A value the
vectorised module would give as inf or NaN raises here (ArithmeticError or ValueError), and the
caller then hands the network to the vectorised path, which words the answer.
"""

from __future__ import annotations

import math

from ..friction import (
    COLEBROOK_RTOL,
    HW_D_EXP,
    HW_K_SI,
    HW_Q_EXP,
    HW_SLOPE,
    RE_LAMINAR,
    RE_TURBULENT,
)

LN10 = math.log(10.0)
TWO_LN10 = 2.0 / LN10
_log10 = math.log10
_log = math.log
_exp = math.exp


def swamee_jain(re: float, rr: float) -> tuple[float, float]:
    b = 5.74 * re**-0.9
    arg = rr / 3.7 + b
    lg = _log10(arg)
    return 0.25 / lg**2, 1.8 * b / (lg * LN10 * arg)


def haaland(re: float, rr: float) -> tuple[float, float]:
    b = 6.9 / re
    arg = (rr / 3.7) ** 1.11 + b
    x = -1.8 * _log10(arg)
    dx = 1.8 * b / (LN10 * arg)
    return x**-2.0, -2.0 * dx / x


def colebrook_x(re: float, rr: float) -> float:
    """1/√f by Newton from Swamee–Jain, stopped as the vectorised solver stops."""
    a = rr / 3.7
    c = 2.51 / re
    lg = _log10(a + 5.74 * re**-0.9)  # Swamee–Jain's f (as swamee_jain) is the start
    x = 1.0 / math.sqrt(0.25 / lg**2)
    for i in range(50):
        arg = a + c * x
        step = (x + 2.0 * _log10(arg)) / (1.0 + 2.0 * c / (LN10 * arg))
        x = x - step
        if i >= 2 and abs(step) <= COLEBROOK_RTOL * abs(x):
            break
    return x


def colebrook_slopes(x: float, re: float, rr: float) -> tuple[float, float]:
    """d ln f / d ln Re and d ln f / d ln(ε/D) at the root x = 1/√f (implicit derivatives)."""
    a = rr / 3.7
    c = 2.51 / re
    arg = a + c * x
    dg_dx = 1.0 + 2.0 * c / (LN10 * arg)
    dx_re = 2.0 * c * x / (LN10 * arg) / dg_dx
    dx_rr = -2.0 * a / (LN10 * arg) / dg_dx
    return -2.0 * dx_re / x, -2.0 * dx_rr / x


def colebrook(re: float, rr: float) -> tuple[float, float]:
    x = colebrook_x(re, rr)
    return x**-2.0, colebrook_slopes(x, re, rr)[0]


def _logaddexp(a: float, b: float) -> float:
    big, small = (a, b) if a >= b else (b, a)
    if small == -math.inf:
        return big
    return big + math.log1p(_exp(small - big))


def _churchill(re: float, rr: float) -> float:
    ln_a = 16.0 * _log(abs(2.457 * _log(1.0 / ((7.0 / re) ** 0.9 + 0.27 * rr))))
    ln_b = 16.0 * _log(37530.0 / re)
    ln_term = _logaddexp(12.0 * _log(8.0 / re), -1.5 * _logaddexp(ln_a, ln_b))
    return 8.0 * _exp(ln_term / 12.0)


def churchill(re: float, rr: float) -> tuple[float, float]:
    h = 1e-6
    f = _churchill(re, rr)
    slope = (_log(_churchill(re * (1 + h), rr)) - _log(_churchill(re * (1 - h), rr))) / (
        math.log1p(h) - math.log1p(-h))
    return f, slope


TURBULENT = {"colebrook": colebrook, "haaland": haaland, "swamee-jain": swamee_jain,
             "churchill": churchill}


def bridged(re: float, rr: float, turbulent_hi: float) -> tuple[float, float]:
    """Churchill in the transition zone shifted to meet 64/Re and the turbulent model, whose
    value at RE_TURBULENT is ``turbulent_hi``."""
    ch, ch_slope = churchill(re, rr)
    off_lo = 64.0 / RE_LAMINAR - _churchill(RE_LAMINAR, rr)
    off_hi = turbulent_hi - _churchill(RE_TURBULENT, rr)
    w = (re - RE_LAMINAR) / (RE_TURBULENT - RE_LAMINAR)
    f = ch + (1 - w) * off_lo + w * off_hi
    df_dre = ch * ch_slope / re + (off_hi - off_lo) / (RE_TURBULENT - RE_LAMINAR)
    return f, df_dre * re / f


def darcy(re: float, rr: float, model: str) -> tuple[float, float]:
    """f and d ln f / d ln Re over every regime (as :func:`..friction.darcy`; Re > 0)."""
    if model == "laminar":
        return 64.0 / re, -1.0
    if model == "churchill":
        return churchill(max(re, 1e-300), rr)
    if re >= RE_TURBULENT:
        return TURBULENT[model](re, rr)
    if re < RE_LAMINAR:
        return 64.0 / re, -1.0
    return bridged(re, rr, TURBULENT[model](RE_TURBULENT, rr)[0])


def hw_f(speed: float, diameter: float, c: float, gravity: float) -> float:
    """The Darcy f that gives the Hazen–Williams loss at this speed (speed > 0)."""
    area = math.pi * diameter**2 / 4
    per_metre = HW_K_SI * 1.0 * abs(speed * area) ** HW_Q_EXP / (c**HW_Q_EXP
                                                                  * diameter**HW_D_EXP)
    return float(per_metre * 2 * gravity * diameter / speed**2)


def hazen_williams(re: float, rr: float, diameter: float, c: float, nu: float,
                   gravity: float) -> tuple[float, float]:
    """As :func:`..friction.hazen_williams` for one segment (Re > 0)."""
    if re >= RE_TURBULENT:
        return hw_f(re * nu / diameter, diameter, c, gravity), HW_SLOPE
    if re < RE_LAMINAR:
        return 64.0 / re, -1.0
    return bridged(re, rr, hw_f(RE_TURBULENT * nu / diameter, diameter, c, gravity))


def darcy_rr(re: float, rr: float, model: str) -> float:
    """d ln f / d ln(ε/D) at fixed Re, turbulent regime of a Darcy model (0 where ε is 0);
    central differences for Churchill and the transition zone."""
    if rr <= 0 or model == "laminar" or (re < RE_LAMINAR and model != "churchill"):
        return 0.0
    if model == "colebrook" and re >= RE_TURBULENT:
        return colebrook_slopes(colebrook_x(re, rr), re, rr)[1]
    if model == "swamee-jain" and re >= RE_TURBULENT:
        b = 5.74 * re**-0.9
        arg = rr / 3.7 + b
        return float(-2.0 * (rr / 3.7) / (_log10(arg) * LN10 * arg))
    if model == "haaland" and re >= RE_TURBULENT:
        b = 6.9 / re
        p = (rr / 3.7) ** 1.11
        arg = p + b
        x = -1.8 * _log10(arg)
        return float(-2.0 * (-1.8 * 1.11 * p / (LN10 * arg)) / x)
    h = 1e-6
    return (_log(darcy(re, rr * (1 + h), model)[0]) - _log(darcy(re, rr * (1 - h), model)[0])) / (
        math.log1p(h) - math.log1p(-h))
