"""The scan lock with real processes: refusal naming the holder, waiting, takeover after SIGKILL."""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
import threading
import time
from pathlib import Path

import pytest

from auditor.errors import StoreError
from auditor.history import lock as lock_module
from auditor.history.lock import ScanLock, read_holder

REPO = Path(__file__).resolve().parent.parent

# A child that takes the lock, says so, and holds it until a line arrives on stdin.
HOLDER = """
import sys
sys.path.insert(0, sys.argv[2])
from auditor.history.lock import ScanLock
lock = ScanLock(sys.argv[1]).acquire()
print("locked", flush=True)
sys.stdin.readline()
lock.release()
print("released", flush=True)
"""


def start_holder(db: Path) -> subprocess.Popen:
    child = subprocess.Popen(
        [sys.executable, "-c", HOLDER, str(db), str(REPO)], stdin=subprocess.PIPE, stdout=subprocess.PIPE, text=True
    )
    assert child.stdout.readline().strip() == "locked"
    return child


def test_second_holder_is_refused_with_the_holders_pid_and_start(tmp_path):
    db = tmp_path / "audit.db"
    child = start_holder(db)
    try:
        waits: list[str] = []
        with pytest.raises(StoreError) as refused:
            ScanLock(db, on_wait=waits.append).acquire()
        assert waits == []  # refused at once: it never started waiting
        holder = read_holder(db)
        assert holder["pid"] == child.pid
        assert str(refused.value) == (
            f"{str(db)!r}: another scan holds the lock "
            f"(pid {child.pid} since {holder['started']}); wait with --wait SECONDS"
        )
        assert holder["started"].endswith("Z") and holder["started"][:2] == "20"
    finally:
        child.stdin.write("\n")
        child.stdin.flush()
        assert child.wait(10) == 0


def test_lock_of_a_sigkilled_holder_is_taken_over(tmp_path):
    db = tmp_path / "audit.db"
    child = start_holder(db)
    with pytest.raises(StoreError):
        ScanLock(db).acquire()
    os.kill(child.pid, signal.SIGKILL)
    assert child.wait(10) == -signal.SIGKILL
    with ScanLock(db) as lock:
        # the killed holder's details were still in the file: that is how a takeover is recognised
        assert lock.taken_over["pid"] == child.pid
        assert read_holder(db)["pid"] == os.getpid()
    assert read_holder(db) is None  # a clean release empties the file
    with ScanLock(db) as again:
        assert again.taken_over is None


# A holder that forks a long-lived worker (as a parser pool does), says both pids, and waits.
FORKING_HOLDER = """
import os, sys, time, multiprocessing
sys.path.insert(0, sys.argv[2])
from auditor.history.lock import ScanLock
lock = ScanLock(sys.argv[1]).acquire()
worker = os.fork()
if worker == 0:
    time.sleep(60)
    os._exit(0)
pool = multiprocessing.get_context("fork").Pool(1)
pool_pid = pool.apply(os.getpid)
print(worker, pool_pid, flush=True)
sys.stdin.readline()
"""


def test_workers_forked_by_a_killed_holder_do_not_keep_the_lock(tmp_path):
    db = tmp_path / "audit.db"
    child = subprocess.Popen(
        [sys.executable, "-c", FORKING_HOLDER, str(db), str(REPO)],
        stdin=subprocess.PIPE,
        stdout=subprocess.PIPE,
        text=True,
    )
    worker, pool_worker = map(int, child.stdout.readline().split())
    try:
        with pytest.raises(StoreError):
            ScanLock(db).acquire()
        os.kill(child.pid, signal.SIGKILL)
        child.wait(10)
        os.kill(worker, 0)  # the forked worker outlives the killed scan ...
        os.kill(pool_worker, 0)
        with ScanLock(db) as lock:  # ... but does not hold its lock
            assert lock.taken_over["pid"] == child.pid
    finally:
        for pid in (worker, pool_worker):
            try:
                os.kill(pid, signal.SIGKILL)
            except ProcessLookupError:
                pass


def test_waiting_holder_gets_the_lock_when_it_is_released(tmp_path):
    db = tmp_path / "audit.db"
    child = start_holder(db)
    waiting = threading.Event()
    said: list[str] = []

    def release_once_waited_for():
        # The holder lets go only after the waiter has said it is waiting: the waiter really met a
        # held lock, whatever the timing of the two processes.
        if waiting.wait(60):
            child.stdin.write("\n")
            child.stdin.flush()

    def on_wait(line: str) -> None:
        said.append(line)
        waiting.set()

    releaser = threading.Thread(target=release_once_waited_for)
    releaser.start()
    try:
        with ScanLock(db, wait=120, on_wait=on_wait) as lock:
            assert lock.held
            assert child.wait(10) == 0
            assert lock.taken_over is None  # released cleanly, not killed
    finally:
        waiting.set()
        releaser.join()
        child.kill()
        child.wait(10)
    assert len(said) == 1 and said[0].startswith(f"{str(db)!r}: waiting for the lock (pid {child.pid} since 20")
    assert said[0].endswith("), up to 120 s")


class FakeClock:
    """time.monotonic and time.sleep for the lock module: sleeping advances the clock at once."""

    def __init__(self):
        self.now = 1000.0
        self.sleeps: list[float] = []

    def monotonic(self) -> float:
        return self.now

    def sleep(self, seconds: float) -> None:
        self.sleeps.append(seconds)
        self.now += seconds


def test_waiting_gives_up_after_the_wait(tmp_path, monkeypatch):
    db = tmp_path / "audit.db"
    child = start_holder(db)
    clock = FakeClock()
    monkeypatch.setattr(lock_module, "time", clock)
    said: list[str] = []
    try:
        with pytest.raises(StoreError) as refused:
            ScanLock(db, wait=0.5, on_wait=said.append).acquire()
        # It retried every POLL_SECONDS until the wait was spent (on the module's clock), not less.
        assert sum(clock.sleeps) == pytest.approx(0.5)
        assert len([s for s in clock.sleeps if s == pytest.approx(lock_module.POLL_SECONDS)]) == 5
        assert len(said) == 1 and "waiting for the lock" in said[0]
        assert str(refused.value).startswith(
            f"{str(db)!r}: another scan still holds the lock after waiting 0.5 s (pid {child.pid} since "
        )
        assert str(refused.value).endswith("; try a longer --wait SECONDS")
    finally:
        child.kill()
        child.wait(10)


def test_two_locks_in_one_process_exclude_each_other(tmp_path):
    db = tmp_path / "audit.db"
    first = ScanLock(db).acquire()
    with pytest.raises(StoreError, match=f"pid {os.getpid()} since"):
        ScanLock(db).acquire()
    first.release()
    first.release()  # releasing twice is harmless
    with ScanLock(db) as second:
        assert second.held and second.taken_over is None
    assert json.loads((tmp_path / "audit.db.lock").read_text() or "null") is None


def test_racing_processes_only_one_wins(tmp_path):
    db = tmp_path / "audit.db"
    racer = (
        "import sys; sys.path.insert(0, sys.argv[2]); from auditor.history.lock import ScanLock\n"
        "from auditor.errors import StoreError\n"
        "try:\n    lock = ScanLock(sys.argv[1]).acquire()\nexcept StoreError as e:\n"
        "    print('refused', e); sys.exit(1)\n"
        "print('won', flush=True); sys.stdin.readline()\n"
    )
    children = [
        subprocess.Popen(
            [sys.executable, "-c", racer, str(db), str(REPO)], stdin=subprocess.PIPE, stdout=subprocess.PIPE, text=True
        )
        for _ in range(4)
    ]
    # The winner holds the lock until told to stop, which happens only once the others have exited,
    # so the outcome does not depend on how fast the processes start.
    deadline = time.monotonic() + 60
    while sum(c.poll() is not None for c in children) < 3 and time.monotonic() < deadline:
        time.sleep(0.05)
    outputs = [c.communicate("\n", timeout=30)[0] for c in children]
    assert sorted(c.returncode for c in children) == [0, 1, 1, 1], outputs
    assert sum(out.startswith("won") for out in outputs) == 1
    assert sum("another scan holds the lock" in out for out in outputs) == 3


def test_lock_file_that_cannot_be_made_is_a_store_error(tmp_path):
    blocker = tmp_path / "not-a-folder"
    blocker.write_text("x")
    with pytest.raises(StoreError, match=r"audit.db.lock': cannot create the scan lock"):
        ScanLock(blocker / "audit.db").acquire()
