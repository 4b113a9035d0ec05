"""The package's one way to write the current time: UTC, to the second, ISO 8601 with a `Z`.

Runs, calibrations, ingest records and the scan lock all store this form, so that stored times
compare as text and read the same everywhere.
"""

from __future__ import annotations

from datetime import UTC, datetime


def utc_now() -> str:
    """The current time, e.g. "2026-12-01T06:00:00Z"."""
    return datetime.now(UTC).strftime("%Y-%m-%dT%H:%M:%SZ")
