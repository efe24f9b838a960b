"""Command line and terminal app for branchwise (the only place that imports Textual)."""
