"""Pure hydraulics for parallel pipe branches, in SI floats and numpy arrays.

Nothing here imports textual, rich or pint; unit handling lives in ``branchwise.core.units``
and is never called from inside a solver.
"""
