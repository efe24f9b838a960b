"""A site as the person keeps it: the site file as typed (spec, read, write), its values checked
and built into the engine's objects (build, values, liquid, valves, tolerances, readings), its
fields named (fields), and the site solved (solve)."""
