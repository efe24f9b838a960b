"""The numbers: friction factors, branch head losses, the parallel solve in every direction, the
unknowns, many copies at once (Monte Carlo, the system curve) and the uncertainty bands; SI floats
and numpy arrays only."""
