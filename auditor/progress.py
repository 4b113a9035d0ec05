"""A one-line progress display on stderr for the long commands (audit, report, calibrate; ingest has its own bar).

Drawn only when asked for: the CLI asks when stderr is a terminal and `--quiet` is not given
(auditor/cli.py), so logs, pipes and cron mail never get carriage returns. The line is redrawn at most
once per percent, so a 10,000-question audit writes about a hundred updates, not ten thousand.
"""

from __future__ import annotations

import sys
from typing import TextIO

WIDTH = 30  # characters of the bar


class Progress:
    """`step()` per unit of work, `done()` at the end; does nothing when `enabled` is false."""

    def __init__(self, label: str, total: int, *, enabled: bool, stream: TextIO | None = None):
        self.label, self.total, self.enabled = label, max(0, total), enabled
        self.stream = stream or sys.stderr
        self.count = 0
        self._drawn = -1

    def step(self, n: int = 1) -> None:
        if not self.enabled:
            return
        self.count = min(self.total, self.count + n)
        percent = 100 * self.count // self.total if self.total else 100
        if percent != self._drawn:
            self._drawn = percent
            filled = WIDTH * percent // 100
            self.stream.write(
                f"\r{self.label} [{'#' * filled}{'.' * (WIDTH - filled)}] {self.count}/{self.total} {percent:3d}%"
            )
            self.stream.flush()

    def done(self) -> None:
        """Clear the line, so that the command's own output starts on a clean one."""
        if self.enabled and self._drawn >= 0:
            self.stream.write("\r" + " " * (len(self.label) + WIDTH + 30) + "\r")
            self.stream.flush()
