"""Judgement: support signals, answer types, freshness, verdicts, calibration and the audit stage."""
