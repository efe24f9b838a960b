"""What the tool took for granted or worked out from a site, said in words.

Every default taken (pressure 1 atm, elevation 0, g, the friction model, the velocity limit)
and every value resolved from a name (a size's bore, a material's ε and its source, the
fittings' ΣK by Crane's n·f_T, the Kv a Cv became, a Hazen–Williams C from the material, a C
left unused by a Darcy model) becomes one :class:`Assumption`, so that an engineer can check the
reading of the input without opening the JSON. The reports list them under *Assumed*; the JSON
under ``assumptions``.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from functools import cached_property
from typing import TYPE_CHECKING

from ..catalogs import crane_ft, crane_nominal
from ..messages import marked
from ..model import CV_PER_KV, STANDARD_GRAVITY, Segment
from .spec import SegmentSpec, Site, Value

if TYPE_CHECKING:
    from ..catalogs.materials import Material
    from .build import Built


EARTH_GRAVITY = (9.76, 9.84)
"""m/s²: about the least and the most gravity on the Earth's surface (a mountain summit near the
equator, a pole at sea level; from memory, rounded outward)."""


def on_earth(gravity: float) -> bool:
    """Whether ``gravity`` (m/s²) is one found somewhere on the Earth's surface."""
    low, high = EARTH_GRAVITY
    return low <= gravity <= high


@dataclass(frozen=True)
class Assumption:
    """One thing assumed or resolved. ``code`` is stable for scripts; ``branch`` the branch's
    name (None for the site as a whole); ``marked`` the words with their quantities marked
    (restated in the reader's units by ``Units.say``); ``message`` the words in SI."""

    code: str
    branch: str | None
    marked: str

    @cached_property
    def message(self) -> str:
        from ..messages import render

        return render(self.marked)


def assumptions_of(site: Site, built: Built,
                   found: tuple[int, int, float] | None = None) -> tuple[Assumption, ...]:
    """Everything ``built`` took for granted or resolved from ``site``, site-wide first.

    found: (branch, segment, bore in m) of a diameter found: that segment's fittings K is the
    found bore's (Crane's f_T by its nominal size), and is said so."""
    from ..storage.user_presets import material_for

    out = _site_wide(site, built)
    net = built.network
    materials: dict[str, Material] = {}

    def material(key: str) -> Material:  # each key looked up once (a lookup checks a file)
        if key not in materials:
            materials[key] = material_for(key, "material")
        return materials[key]

    for i, (spec, branch) in enumerate(zip(site.branches, net.branches, strict=True)):
        many = len(branch.segments) > 1
        for j, (seg_spec, seg) in enumerate(zip(spec.segments, branch.segments, strict=True)):
            where = f"segment {j + 1}: " if many else ""
            bore = found[2] if found is not None and found[:2] == (i, j) else None
            for code, words in _segment(seg_spec, seg, built.sizes[i][j], built.fittings_k[i][j],
                                        net.friction, material, bore):
                out.append(Assumption(code, branch.name, where + words))
        if spec.valve_cv is not None and branch.valve_kv is not None:
            out.append(Assumption(
                "kv-from-cv", branch.name,
                f"valve Cv {_typed(spec.valve_cv)} taken as "
                f"Kv {branch.valve_kv:.4g} (m³/h at 1 bar; Cv = {CV_PER_KV:.5f} Kv, from the US "
                "gallon and the psi)"))
    return tuple(out)


def _site_wide(site: Site, built: Built) -> list[Assumption]:
    from ..fluids import liquid
    from ..fluids.water import STANDARD_ATMOSPHERE_PA

    c, net, out = site.conditions, built.network, []
    kind = liquid(net.fluid.kind)
    if kind is not None and "pressure" in kind.inputs and site.fluid.pressure is None:
        out.append(Assumption("pressure-default", None,
                              "the liquid's pressure taken as 1 atm ("
                              f"{marked('pressure', STANDARD_ATMOSPHERE_PA)} absolute) for its "
                              "properties"))
    if c.friction is None:
        out.append(Assumption("friction-default", None,
                              "friction by Colebrook (Darcy–Weisbach), the default"))
    if c.elevation_change is None:
        out.append(Assumption("elevation-default", None,
                              "both headers at one height (elevation change 0)"))
    if c.gravity is None:
        out.append(Assumption("gravity-default", None,
                              f"g = {STANDARD_GRAVITY} m/s² (standard gravity)"))
    else:
        g = net.gravity
        words = (f"g = {g:.6g} m/s² as typed (standard gravity {STANDARD_GRAVITY} m/s²)")
        if not on_earth(g):
            low, high = EARTH_GRAVITY
            words += (f": not Earth's — about {low:g} to {high:g} m/s² anywhere on its surface "
                      "(from memory); check conditions.gravity")
        out.append(Assumption("gravity-typed", None, words))
    if c.velocity_limit is None:
        out.append(Assumption("velocity-limit-default", None,
                              f"velocities above {marked('velocity~', net.velocity_limit)} are "
                              "flagged (common practice for liquid lines)"))
    return out


def _segment(spec: SegmentSpec, seg: Segment, size: object, k_fittings: float,
             friction: str, material_of: Callable[[str], Material],
             found_bore: float | None = None) -> list[tuple[str, str]]:
    out: list[tuple[str, str]] = []
    if size is not None:
        label = getattr(size, "label", str(size))
        standard = getattr(size, "standard", "")
        out.append(("bore-from-size",
                    f"{label}: bore {marked('diameter', seg.diameter)} ({standard})"))
    material = _typed(spec.material) or None
    if spec.roughness is None:
        key = material or getattr(size, "material_hint", None)
        if key is not None:
            mat = material_of(key)
            is_aged = _typed(spec.condition) == "aged"
            parts = mat.source.split("; ")  # "roughness: …; aged: …; Hazen-Williams C: …"
            part = "aged: " if is_aged else "roughness: "
            source = next((p.removeprefix(part) for p in parts if p.startswith(part)),
                          parts[0].removeprefix("roughness: "))
            how = "" if material else ", the material the size's standard is made in"
            aged = " (aged)" if is_aged else ""
            out.append(("roughness-from-material",
                        f"{mat.name}{aged}{how}: ε = {marked('roughness', seg.roughness)} "
                        f"({source})"))
            if friction == "hazen-williams" and spec.hw_c is None and seg.hw_c is not None:
                out.append(("hw-c-from-material",
                            f"Hazen–Williams C {seg.hw_c:g} from {mat.name}"))
    if friction != "hazen-williams" and spec.hw_c is not None:
        out.append(("hw-c-unused",
                    f"hw_c {_typed(spec.hw_c)} is not used: friction is "
                    f"{friction} (Darcy–Weisbach), which takes the roughness instead"))
    if k_fittings:
        bore = seg.diameter if found_bore is None else found_bore
        nominal = crane_nominal(bore).nominal
        of = "" if found_bore is None else ", the size of the bore found"
        out.append(("fittings-k",
                    f"fittings ΣK {k_fittings:.3g} (Crane TP-410: K = n·f_T, f_T "
                    f"{crane_ft(bore):.4f} at NPS {nominal}{of})"))
    return out


def _typed(value: Value) -> str:
    """A value as it was typed (built already checked it)."""
    return "" if value is None else str(value).strip()
