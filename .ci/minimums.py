"""Print ``name==minimum`` for every runtime dependency in pyproject.toml (pip --constraint).

Used by .ci/run's second stage, which installs exactly the declared minimums and runs the
smoke set. A dependency without a ``>=`` minimum is an error: every one must declare one.
"""

import re
import sys
import tomllib
from pathlib import Path

root = Path(__file__).resolve().parent.parent
deps = tomllib.loads((root / "pyproject.toml").read_text(encoding="utf-8"))["project"][
    "dependencies"]
for dep in deps:
    m = re.match(r"^\s*([A-Za-z0-9_.-]+)\s*(?:\[[^\]]*\])?\s*(.*)$", dep)
    low = re.search(r">=\s*([^,;\s]+)", m.group(2)) if m else None
    if m is None or low is None:
        sys.exit(f"minimums: {dep!r} declares no minimum (>=)")
    print(f"{m.group(1)}=={low.group(1)}")
