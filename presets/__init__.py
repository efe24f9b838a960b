"""Shipped, read-only data: fluids, pipe catalogs, materials, fittings and the demo site.

Every value carries its source beside it in the data file.
"""
