"""Site files of our own that several tests share (invented for the tests; no plant's data)."""

from __future__ import annotations

PUMP_ROOM = """format = 1
name = "Pump room"

[fluid]
kind = "water"
temperature = "18 degC"

[conditions]
pressure_drop = "68 kPa"

[[branches]]
name = "Condenser A"
diameter = "102.26 mm"
length = "64 m"
roughness = "0.045 mm"
minor_k = 6.2

[[branches]]
name = "Jacket loop"
size = "3 in sch 40"
length = "180 ft"
material = "commercial-steel"
"""
"""Two branches off a water header at 68 kPa: a bore with fittings, and a catalog size."""


def demo_with(*changes: tuple[str, str]) -> str:
    """The demo site with each ``(old, new)`` text replaced (each ``old`` must be there)."""
    from branchwise.core.site.read import demo_text

    text = demo_text()
    for old, new in changes:
        assert old in text, old
        text = text.replace(old, new)
    return text


def too_big_for_the_catalog() -> str:
    """The demo with AHU-2 sized for a flow no NPS of its schedule carries (its valve taken
    out, so that the valve does not stop the search first)."""
    return demo_with(
        ("valve_cv = 110", "# valve_cv = 110"),
        ('# [solve]                          # find one unknown instead of the flows\n'
         '# find = "diameter"                # flows | diameter | length | roughness\n'
         '# branch = "AHU-2 coil"\n'
         '# target_flow = "220 gpm"',
         '[solve]\nfind = "diameter"\nbranch = "AHU-2 coil"\ntarget_flow = "800000 gpm"'))
