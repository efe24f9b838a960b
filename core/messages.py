"""Short SI texts for messages raised from the core (the boundary may re-state them in other units).

Flows in L/s, heads in m, pressures in kPa, diameters in mm: the units a site engineer reads most
easily when an answer does not exist.
"""

from __future__ import annotations


def flow_text(q_m3_s: float) -> str:
    return f"{q_m3_s * 1000:.4g} L/s"


def head_text(h_m: float) -> str:
    return f"{h_m:.4g} m"


def pressure_text(p_pa: float) -> str:
    return f"{p_pa / 1000:.4g} kPa"


def diameter_text(d_m: float) -> str:
    return f"{d_m * 1000:.4g} mm" if d_m < 1 else f"{d_m:.4g} m"


def length_text(length_m: float) -> str:
    return f"{length_m:.4g} m"
