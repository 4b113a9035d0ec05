"""History: stored runs, the diff between runs, the release gate and the scan lock."""
