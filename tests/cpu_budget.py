"""A CPU-time budget for tests of worst-case inputs.

SIGPROF counts the process's CPU time, not wall time, so a busy shared machine does not make a
budgeted test flaky; past the budget the call is interrupted with OverBudget.
"""

from __future__ import annotations

import signal
import time


class OverBudget(Exception):
    """The call used more CPU time than its budget."""


def _alarm(signum, frame):
    raise OverBudget


def cpu_seconds(fn, budget: float) -> float:
    """CPU seconds `fn()` takes; raises OverBudget past `budget`."""
    previous = signal.signal(signal.SIGPROF, _alarm)
    started = time.process_time()
    signal.setitimer(signal.ITIMER_PROF, budget)
    try:
        fn()
    finally:
        signal.setitimer(signal.ITIMER_PROF, 0)
        signal.signal(signal.SIGPROF, previous)
    return time.process_time() - started
