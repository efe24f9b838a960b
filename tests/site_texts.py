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
