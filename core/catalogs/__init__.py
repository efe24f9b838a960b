"""Catalogs: standard pipe sizes, wall materials and fitting loss coefficients.

The data are TOML files in ``branchwise.presets`` (``pipes/<standard>.toml``, ``materials.toml``,
``fittings.toml``), each value beside its source, read lazily on first use and never written.
Everything returned is in SI units.
"""

from __future__ import annotations

from .fittings import (
    Fitting,
    crane_ft,
    crane_nominal,
    fitting,
    fitting_k,
    fittings,
    fittings_k,
    k_from_cv,
    k_from_kv,
)
from .materials import Material, material, materials
from .pipes import PipeSize, sizes, smallest_at_least, standards
from .size_text import parse_size

__all__ = [
    "Fitting",
    "Material",
    "PipeSize",
    "crane_ft",
    "crane_nominal",
    "fitting",
    "fitting_k",
    "fittings",
    "fittings_k",
    "k_from_cv",
    "k_from_kv",
    "material",
    "materials",
    "parse_size",
    "sizes",
    "smallest_at_least",
    "standards",
]
