"""branchwise's engine, for scripts and notebooks: parallel pipe branches in SI units.

The public names below are the stable API (see the README, "Using branchwise from Python")::

    from branchwise.core import load_site, solve_site
    result = solve_site(load_site("north-header.toml")).result
    print(result.total_flow, [b.flow for b in result.branches])   # m³/s

Everything is SI (m, Pa, m³/s, kg/m³, Pa·s); text with units is read by
:func:`parse_quantity` and written back by :class:`Units`. The names load on first use, so
that importing the package (which the app does before its first screen) loads neither numpy
nor pint.
"""

from __future__ import annotations

from importlib import import_module
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from .errors import BranchwiseError, InputError, NoSolutionError
    from .fluids import fluid_from_spec
    from .model import (
        Branch,
        FindFlows,
        FindUnknown,
        Fluid,
        MeasuredFlow,
        Network,
        PressureDrop,
        Segment,
        TotalFlow,
        branch,
    )
    from .numerics.curve import SystemCurve, system_curve
    from .numerics.results import BranchResult, Result, SegmentResult
    from .numerics.solve import solve
    from .numerics.tolerances import Tolerances
    from .numerics.uncertainty import UncertaintyResult, monte_carlo
    from .report import render
    from .site.read import load_site, parse_site
    from .site.solve import SiteResult, solve_site, with_uncertainty
    from .site.spec import Site
    from .site.write import save_site
    from .units import Units, parse_quantity

_PUBLIC = {
    "BranchwiseError": "errors", "InputError": "errors", "NoSolutionError": "errors",
    "fluid_from_spec": "fluids",
    "Branch": "model", "FindFlows": "model", "FindUnknown": "model", "Fluid": "model",
    "MeasuredFlow": "model", "Network": "model", "PressureDrop": "model", "Segment": "model",
    "TotalFlow": "model", "branch": "model",
    "SystemCurve": "numerics.curve", "system_curve": "numerics.curve",
    "BranchResult": "numerics.results", "Result": "numerics.results",
    "SegmentResult": "numerics.results",
    "solve": "numerics.solve",
    "Tolerances": "numerics.tolerances",
    "UncertaintyResult": "numerics.uncertainty", "monte_carlo": "numerics.uncertainty",
    "render": "report",
    "load_site": "site.read", "parse_site": "site.read",
    "SiteResult": "site.solve", "solve_site": "site.solve", "with_uncertainty": "site.solve",
    "Site": "site.spec",
    "save_site": "site.write",
    "Units": "units", "parse_quantity": "units",
}
"""Each public name and the module (under this package) that defines it."""

__all__ = [
    "Branch",
    "BranchResult",
    "BranchwiseError",
    "FindFlows",
    "FindUnknown",
    "Fluid",
    "InputError",
    "MeasuredFlow",
    "Network",
    "NoSolutionError",
    "PressureDrop",
    "Result",
    "Segment",
    "SegmentResult",
    "Site",
    "SiteResult",
    "SystemCurve",
    "Tolerances",
    "TotalFlow",
    "UncertaintyResult",
    "Units",
    "branch",
    "fluid_from_spec",
    "load_site",
    "monte_carlo",
    "parse_quantity",
    "parse_site",
    "render",
    "save_site",
    "solve",
    "solve_site",
    "system_curve",
    "with_uncertainty",
]


def __getattr__(name: str) -> Any:
    """A public name, imported from its module on first use (PEP 562)."""
    module = _PUBLIC.get(name)
    if module is None:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    value = getattr(import_module(f"{__name__}.{module}"), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(__all__))
