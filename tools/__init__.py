"""Development scripts, run from the repository root as `python -m tools.NAME` (DEVELOPERS.md)."""
