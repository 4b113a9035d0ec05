"""Benchmarks: each module runs our code and a reference side by side and prints ratios and peak memory.

Run them from the repository root as modules, `python -m bench.NAME` (bench/README.md); tests import
what they share the same way (`from bench.claims_data import load_scifact`).
"""
