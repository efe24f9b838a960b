"""``python -m branchwise``: the ``branchwise`` command run by the interpreter.

Installed as ``branchwise/__main__.py`` (pyproject maps the package ``branchwise`` to this
folder), so that ``python -m branchwise solve site.toml`` works where the ``branchwise`` script
is not on the PATH (a venv not activated, a locked-down plant PC).
"""

from __future__ import annotations

import sys

from branchwise.tui.cli import main

if __name__ == "__main__":
    sys.exit(main())
