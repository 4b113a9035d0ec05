"""A process pool with a per-task timeout, for parsing files in worker processes.

concurrent.futures cannot stop a task that hangs, and a worker that dies breaks its whole pool;
here each worker is a process with its own pipe, so a task that overruns its deadline costs that
worker (killed and replaced) and its one file, and the run goes on. Workers are started with
"spawn" (safe beside an open SQLite connection) and report when ready, so their start-up (imports)
does not count against the first file's timeout.
"""

from __future__ import annotations

import multiprocessing as mp
import time
from collections.abc import Callable, Iterator
from multiprocessing.connection import wait
from typing import Any

from auditor.errors import AuditorError


def _serve(conn, target: Callable, settings, init: Callable | None) -> None:
    """Worker main loop: init(settings), then receive a task, send back target(task, settings);
    None ends it."""
    if init is not None:
        init(settings)
    conn.send(("ready", None))
    while True:
        try:
            task = conn.recv()
        except (EOFError, KeyboardInterrupt):
            return
        if task is None:
            return
        try:
            result = ("ok", target(task, settings))
        except BaseException as exc:  # reported for this task only; the worker lives on
            result = ("error", f"{type(exc).__name__}: {' '.join(str(exc).split())[:200]}")
        conn.send(result)


class _Worker:
    def __init__(self, ctx, target, settings, init=None):
        self.conn, child = ctx.Pipe()
        self.process = ctx.Process(target=_serve, args=(child, target, settings, init), daemon=True)
        self.process.start()
        child.close()
        self.ready = False
        self.task: Any = None
        self.deadline: float | None = None  # set together with task

    def stop(self, kill: bool = False) -> None:
        if kill:
            self.process.kill()
        else:
            try:
                self.conn.send(None)
            except (OSError, BrokenPipeError):
                pass
        self.process.join(timeout=5)
        if self.process.is_alive():
            self.process.kill()
            self.process.join(timeout=5)
        self.conn.close()


def run_tasks(
    tasks: list, target: Callable, settings, *, jobs: int, timeout: float, init: Callable | None = None
) -> Iterator[tuple[Any, str, Any]]:
    """Run target(task, settings) for every task in `jobs` worker processes; each worker first
    runs init(settings) (imports, warm-up) before its first task's clock starts.

    Yields (task, status, value) as tasks finish, in completion order: status "ok" with the
    return value, "error" with an exception summary, "timeout" with the seconds allowed, or
    "crash" with the worker's exit code.
    """
    if not tasks:
        return
    ctx = mp.get_context("spawn")
    pending = list(reversed(tasks))
    workers = [_Worker(ctx, target, settings, init) for _ in range(max(1, min(jobs, len(tasks))))]
    startup_failures = 0

    def assign() -> None:
        for w in workers:
            if w.ready and w.task is None and pending:
                w.task = pending.pop()
                w.conn.send(w.task)
                w.deadline = time.monotonic() + timeout

    try:
        while pending or any(w.task is not None for w in workers):
            assign()
            deadlines = [w.deadline for w in workers if w.task is not None and w.deadline is not None]
            wait_for = max(0.0, min(deadlines) - time.monotonic()) if deadlines else None
            ready = wait([w.conn for w in workers], timeout=wait_for)
            finished = []
            for i, w in enumerate(workers):
                if w.conn in ready:
                    try:
                        status, value = w.conn.recv()
                    except (EOFError, OSError):
                        w.process.join(timeout=5)
                        task, code = w.task, w.process.exitcode
                        w.stop(kill=True)
                        workers[i] = _Worker(ctx, target, settings, init)
                        if task is not None:
                            finished.append((task, "crash", code))
                        else:
                            startup_failures += 1
                            if startup_failures > 3:
                                raise AuditorError(
                                    f"ingest worker processes fail to start (exit code {code})"
                                ) from None
                        continue
                    if status == "ready":
                        w.ready = True
                        continue
                    finished.append((w.task, status, value))
                    w.task, w.deadline = None, None
                elif w.task is not None and w.deadline is not None and time.monotonic() >= w.deadline:
                    finished.append((w.task, "timeout", timeout))
                    w.stop(kill=True)
                    workers[i] = _Worker(ctx, target, settings, init)
            # Hand out the next files before the caller writes these results, so that workers
            # parse while the main process writes to SQLite.
            assign()
            yield from finished
    finally:
        for w in workers:
            w.stop(kill=w.task is not None)
