"""One scan at a time per database: an exclusive lock file beside it.

`<db>.lock` is locked with flock(2) and holds the holder's pid, host and start time (JSON), so a
second scan can say who is in the way. The kernel drops a flock when its holder dies, however it
dies (SIGKILL included), so a lock left by a killed scan is never "stuck": the next scan simply
gets it. The file itself is never deleted: deleting a lock file races with a waiter that has it
open already. A clean release empties it, so a non-empty file found on taking the lock means the
previous holder was killed (`ScanLock.taken_over` then tells who it was).

flock is advisory and local: it does not protect a database on a network file system shared by
several machines (docs/scheduling.md).
"""

from __future__ import annotations

import fcntl
import json
import os
import socket
import sys
import time
import weakref
from collections.abc import Callable
from pathlib import Path

from auditor.clock import utc_now
from auditor.errors import StoreError

POLL_SECONDS = 0.1  # how often a waiting scan retries; flock(2) itself has no timeout

# Locks held by this process. A forked child (a parser worker) inherits the lock's descriptor,
# and a flock lives until every descriptor of it is closed: a worker outliving a killed scan would
# keep the database locked. So forked children close their copies at once.
_HELD: weakref.WeakSet[ScanLock] = weakref.WeakSet()


def _forget_in_child() -> None:
    for lock in list(_HELD):
        fd, lock._fd = lock._fd, None
        if fd is not None:
            try:
                os.close(fd)
            except OSError:
                pass
    _HELD.clear()


os.register_at_fork(after_in_child=_forget_in_child)


class ScanLock:
    """Exclusive lock on the audit database at `db_path`; a context manager.

    With `wait=0` a second holder is refused at once with StoreError; with `wait > 0` it retries
    for up to that many seconds first, and says once, through `on_wait` (default: a line on stderr),
    that it is waiting and for whom.
    """

    def __init__(self, db_path: str | Path, wait: float = 0.0, on_wait: Callable[[str], object] | None = None):
        self.db_path = Path(db_path)
        self.path = self.db_path.with_name(self.db_path.name + ".lock")
        self.wait = max(0.0, float(wait or 0.0))
        self.on_wait = on_wait or _tell_stderr
        self.taken_over: dict | None = None  # holder info left by a killed scan, if any
        self._fd: int | None = None

    # -- acquire / release ---------------------------------------------------------------------
    def acquire(self) -> ScanLock:
        if self._fd is not None:
            raise StoreError(f"{str(self.db_path)!r}: this scan already holds the lock")
        try:
            self.path.parent.mkdir(parents=True, exist_ok=True)
            fd = os.open(self.path, os.O_RDWR | os.O_CREAT, 0o644)
        except OSError as exc:
            raise StoreError(f"{str(self.path)!r}: cannot create the scan lock ({exc.strerror})") from None
        deadline = time.monotonic() + self.wait
        waiting = False
        try:
            while True:
                try:
                    fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
                    break
                except BlockingIOError:
                    if time.monotonic() >= deadline:
                        raise StoreError(self._refusal(fd)) from None
                    if not waiting:
                        waiting = True
                        self.on_wait(
                            f"{str(self.db_path)!r}: waiting for the lock ({describe_holder(_read_holder(fd))}), "
                            f"up to {self.wait:g} s"
                        )
                    time.sleep(min(POLL_SECONDS, max(0.0, deadline - time.monotonic())))
            left = _read_holder(fd)
            self.taken_over = left or None
            self.holder = {"pid": os.getpid(), "host": socket.gethostname(), "started": utc_now()}
            _write(fd, json.dumps(self.holder) + "\n")
        except BaseException:
            os.close(fd)  # closing drops the flock too
            raise
        self._fd = fd
        _HELD.add(self)
        return self

    def release(self) -> None:
        if self._fd is None:
            return
        fd, self._fd = self._fd, None
        _HELD.discard(self)
        try:
            _write(fd, "")  # empty = released cleanly; see the module docstring
        except OSError:
            pass  # the lock is dropped on close either way
        finally:
            os.close(fd)

    def __enter__(self) -> ScanLock:
        return self.acquire()

    def __exit__(self, *exc) -> None:
        self.release()

    @property
    def held(self) -> bool:
        return self._fd is not None

    # -- messages ------------------------------------------------------------------------------
    def _refusal(self, fd: int) -> str:
        holder = _read_holder(fd)
        # The holder writes its details just after locking; give it a moment if we were faster.
        for _ in range(5):
            if holder:
                break
            time.sleep(0.02)
            holder = _read_holder(fd)
        who = describe_holder(holder)
        if self.wait:
            return (
                f"{str(self.db_path)!r}: another scan still holds the lock after waiting "
                f"{self.wait:g} s ({who}); try a longer --wait SECONDS"
            )
        return f"{str(self.db_path)!r}: another scan holds the lock ({who}); wait with --wait SECONDS"


def describe_holder(holder: dict | None) -> str:
    """'pid 1234 since 2026-12-01T06:00:00Z' (with 'on HOST' when it is another machine)."""
    if not holder:
        return "holder unknown"
    text = f"pid {holder.get('pid', '?')}"
    host = holder.get("host")
    if host and host != socket.gethostname():
        text += f" on {host}"
    return text + f" since {holder.get('started', '?')}"


def read_holder(db_path: str | Path) -> dict | None:
    """Who holds (or, after a kill, last held) the lock of the database at `db_path`."""
    path = Path(str(db_path) + ".lock")
    try:
        fd = os.open(path, os.O_RDONLY)
    except OSError:
        return None
    try:
        return _read_holder(fd) or None
    finally:
        os.close(fd)


def _read_holder(fd: int) -> dict:
    try:
        text = os.pread(fd, 4096, 0).decode("utf-8", "replace").strip()
        holder = json.loads(text) if text else {}
        return holder if isinstance(holder, dict) else {}
    except (OSError, ValueError):
        return {}


def _write(fd: int, text: str) -> None:
    os.ftruncate(fd, 0)
    os.pwrite(fd, text.encode("utf-8"), 0)


def _tell_stderr(line: str) -> None:
    print(line, file=sys.stderr, flush=True)
