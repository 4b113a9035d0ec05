"""A CPU-time budget for tests of worst-case inputs, that always ends the work.

The call runs in a forked child process. Two limits hold it there:

* an ITIMER_PROF timer (CPU time, not wall time, so a busy shared machine does not make a test
  flaky) raises OverBudget in the child at the budget — quick, but Python only runs a signal
  handler between bytecodes, so a long C loop (`sum` over a huge iterator) or code that swallows
  the exception (`except Exception: pass` in the code under test) would carry on past it;
* RLIMIT_CPU (POSIX setrlimit) on the child: the kernel sends SIGXCPU, whose default action ends
  the process, a second or two past the budget (the limit is in whole seconds), and SIGKILL a
  second later should SIGXCPU be caught. Nothing the call does can keep it running.

Either way the parent sees an overrun and raises OverBudget, so a test fails fast instead of
hanging. The child's result comes back pickled; side effects of the call stay in the child.
"""

from __future__ import annotations

import math
import multiprocessing
import resource
import signal
import time
import traceback
from collections.abc import Callable
from typing import Any

# Wall-clock wait for a child that neither answers nor uses CPU (blocked): a last resort only.
_WALL_FACTOR = 30.0
_WALL_MINIMUM_S = 60.0


class OverBudget(Exception):
    """The call used more CPU time than its budget."""


def _alarm(signum, frame):
    raise OverBudget


def _child(fn: Callable[[], Any], budget: float, conn) -> None:
    used = resource.getrusage(resource.RUSAGE_SELF)
    spent = used.ru_utime + used.ru_stime
    soft = math.ceil(spent + budget) + 1
    _, hard = resource.getrlimit(resource.RLIMIT_CPU)
    limit = soft + 1 if hard == resource.RLIM_INFINITY else min(soft + 1, hard)
    resource.setrlimit(resource.RLIMIT_CPU, (min(soft, limit), limit))
    signal.signal(signal.SIGPROF, _alarm)
    started = time.process_time()
    signal.setitimer(signal.ITIMER_PROF, budget)
    try:
        result = fn()
        signal.setitimer(signal.ITIMER_PROF, 0)
        message = ("ok", result, time.process_time() - started)
    except OverBudget:
        message = ("over", None, time.process_time() - started)
    except BaseException as exc:  # the call's own failure: carried to the parent as text
        message = ("error", f"{type(exc).__name__}: {exc}\n{traceback.format_exc()}", 0.0)
    conn.send(message)
    conn.close()


def run_in_budget(fn: Callable[[], Any], budget: float) -> tuple[Any, float]:
    """(fn's result, CPU seconds it took), run in a child process; OverBudget past `budget`.

    An exception raised by `fn` fails the caller with an AssertionError holding its traceback."""
    context = multiprocessing.get_context("fork")
    receive, send = context.Pipe(duplex=False)
    process = context.Process(target=_child, args=(fn, budget, send), daemon=True)
    process.start()
    send.close()
    try:
        if not receive.poll(max(_WALL_MINIMUM_S, _WALL_FACTOR * budget)):
            raise OverBudget(f"no answer from the child within {_WALL_FACTOR}x the budget")
        status, payload, seconds = receive.recv()
    except EOFError:  # the child died without answering: the kernel's CPU limit ended it
        process.join()
        raise OverBudget(f"ended by the CPU limit (exit {process.exitcode})") from None
    finally:
        if process.is_alive():
            process.kill()
        process.join()
        receive.close()
    if status == "over":
        raise OverBudget(f"stopped by the {budget} s CPU alarm")
    if seconds > budget:
        raise OverBudget(f"{seconds:.2f} s CPU, budget {budget} s")
    if status == "error":
        raise AssertionError(f"the budgeted call failed: {payload}")
    return payload, seconds


def cpu_seconds(fn: Callable[[], Any], budget: float) -> float:
    """CPU seconds `fn()` takes in a child process; raises OverBudget past `budget`."""
    return run_in_budget(fn, budget)[1]
