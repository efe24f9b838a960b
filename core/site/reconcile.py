"""A site's readings weighed against each other (:mod:`branchwise.core.numerics.reconcile`).

Every reading the site holds — the gauge's ``pressure_drop``, a ``total_flow``, each branch's
``measured_flow`` — enters, whichever one is the given; with ``conditions.given = "all"`` the
site is solved from the reconciled head (:func:`.solve.solve_site`). The instruments' accuracy
and the model's tolerances come from the site's ``[tolerances]`` table (common-practice
defaults without one).
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from ..errors import InputError, describe
from ..givens import GIVENS
from .readings import readings
from .spec import Site

if TYPE_CHECKING:
    from ..numerics.reconcile_result import Reconciliation
    from ..storage.presets import PresetSource
    from .build import Built

ALL = "all"
"""``conditions.given`` that solves from every reading at once."""


def solves_from_all(site: Site) -> bool:
    """Whether ``conditions.given`` is ``"all"`` (any capitals, blanks around it)."""
    given = site.conditions.given
    return isinstance(given, str) and given.strip().casefold() == ALL


_NO_SPREAD = {
    "pressure_drop": "cannot be weighed against the other readings: the gauge's tolerance is a "
                     "share of its full scale (tolerances.gauge_full_scale, else the reading "
                     "itself), and here that is zero; give the full scale, or take this "
                     "reading out",
    "total_flow": "cannot be weighed against the other readings: a flow meter's tolerance is a "
                  "share of its reading, and here that is zero (a reading of 0, or "
                  "tolerances.total_flow_meter_accuracy — else flow_meter_accuracy — of 0 %); "
                  "take this reading out",
    "measured_flow": "cannot be weighed against the other readings: a flow meter's tolerance "
                     "is a share of its reading, and here that is zero (a reading of 0, or "
                     "tolerances.flow_meter_accuracy of 0 %); take this reading out",
}
"""Why a reading has no spread to weigh it by, per kind of reading."""


def reconcile_site(site: Site, built: Built | None = None,
                   presets: PresetSource | None = None) -> Reconciliation | None:
    """The site's readings reconciled, or None when it holds fewer than two.

    built: the site already built (saves a build). A reading that cannot be read is an
    InputError naming its field.
    """
    from ..numerics.reconcile import instrument_sigma, reconcile
    from ..numerics.reconcile_result import Observation
    from ..numerics.tolerances import Tolerances
    from ..units import parse_quantity
    from .build import build
    from .tolerances import site_thermal

    held = readings(site)
    if len(held) < 2:
        return None
    built = build(site, presets) if built is None else built
    obs = [Observation(r.kind, r.branch,
                       parse_quantity(r.value, GIVENS[r.kind].quantity, r.path)) for r in held]
    tol, thermal, _ = site_thermal(site, built.tolerances or Tolerances(), presets)
    for r, o in zip(held, obs, strict=True):
        if not instrument_sigma(o, tol) ** 2 > 0:  # (a spread so small its square is 0 too)
            raise InputError(r.path, describe(r.value), _NO_SPREAD[o.kind])
    try:
        return reconcile(built.network, obs, tol, thermal)
    except InputError as exc:
        raise exc.naming([b.name for b in built.network.branches]) from None
