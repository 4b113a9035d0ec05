"""Connecting to a Dask distributed cluster, and turning the engine's faults into one-line errors.

`connect` takes the configured scheduler (docs/scale.md): "tcp://host:8786" joins a running
scheduler; "local" or "local:N" starts a `LocalCluster` of N single-threaded worker processes on this
machine (N defaults to the number of cores). The workers must import the same auditor code: a worker
whose parser fingerprint differs from this process's would store passages this database cannot
vouch for, so `connect` refuses it.

Faults: Dask reruns the tasks of a worker that dies on the other workers (up to the scheduler's
`distributed.scheduler.allowed-failures`, 3 by default; every task of ours is idempotent: it rewrites
its own shard file). When the engine gives up, or the scheduler goes away, `Cluster.result` raises a
ClusterError naming the scheduler and what was running; the caller has written nothing for that
shard, and each document already written was written in its own transaction.
"""

from __future__ import annotations

import os
import shutil
import uuid
from collections.abc import Iterable
from dataclasses import dataclass
from pathlib import Path

import dask
from dask.distributed import Client, Future, LocalCluster, wait
from distributed.comm.core import CommClosedError
from distributed.scheduler import KilledWorker

from auditor.config import ClusterConfig
from auditor.errors import AuditorError
from auditor.ingest.pipeline import parser_fingerprint

CONNECT_TIMEOUT_S = 30


class ClusterError(AuditorError):
    """The cluster cannot be reached, refuses the work, or lost it for good."""


@dataclass
class Cluster:
    """A client of a Dask cluster with a per-scan work folder in the shared folder."""

    client: Client
    address: str
    work: Path  # shard files of this scan; removed by close()
    local: LocalCluster | None = None  # started by us, stopped by close()

    @property
    def threads(self) -> int:
        """Worker threads in the cluster now (the unit work is split by)."""
        return max(1, sum(self.client.nthreads().values()))

    def result(self, future: Future, what: str):
        """The value of `future`, or ClusterError in one line when the engine lost it for good."""
        try:
            return future.result()
        except KilledWorker as exc:
            # The scheduler's limit, which may differ from this process's dask config.
            limit = getattr(exc, "allowed_failures", dask.config.get("distributed.scheduler.allowed-failures"))
            raise ClusterError(
                f"{self.address!r}: Dask gave up {what} after {limit + 1} worker deaths "
                f"(distributed.scheduler.allowed-failures = {limit}); the scan stopped, what was stored stays"
            ) from exc
        except CommClosedError as exc:
            raise ClusterError(
                f"{self.address!r}: lost the Dask scheduler while {what} ({type(exc).__name__}); "
                "the scan stopped, what was stored stays"
            ) from exc
        except AuditorError:
            raise
        except Exception as exc:  # raised by the task on a worker, e.g. the shared folder is not writable there
            message = " ".join(str(exc).split())[:200]
            raise ClusterError(
                f"{self.address!r}: {what} failed on a worker ({type(exc).__name__}: {message}); "
                "the scan stopped, what was stored stays"
            ) from exc

    def wait_all(self, futures: Iterable[Future], what: str) -> None:
        """Wait for every future, raising the first loss as a ClusterError."""
        futures = list(futures)
        wait(futures)
        for future in futures:
            if future.status != "finished":
                self.result(future, what)

    def close(self) -> None:
        shutil.rmtree(self.work, ignore_errors=True)
        self.client.close()
        if self.local is not None:
            self.local.close()


def connect(cluster: ClusterConfig, database: Path) -> Cluster:
    """A client of the configured cluster, checked to run the same parser code as this process."""
    address = cluster.scheduler or "local"
    local = None
    try:
        if address == "local" or address.startswith("local:"):
            workers = int(address.partition(":")[2] or os.cpu_count() or 1)
            local = LocalCluster(n_workers=workers, threads_per_worker=1, processes=True, dashboard_address=None)
            client = Client(local)
        else:
            client = Client(address, timeout=CONNECT_TIMEOUT_S)
    except ValueError as exc:
        raise ClusterError(f"{address!r}: not a scheduler address; use tcp://host:port, local or local:N") from exc
    except OSError as exc:
        raise ClusterError(f"{address!r}: cannot reach the Dask scheduler ({exc})") from exc
    shared = cluster.shared or Path(str(database) + ".cluster")
    work = Path(shared) / f"scan-{uuid.uuid4().hex[:12]}"
    try:
        work.mkdir(parents=True)
        ours = parser_fingerprint()
        theirs = client.run(parser_fingerprint)
    except OSError as exc:
        client.close()
        if local is not None:
            local.close()
        raise ClusterError(f"{str(shared)!r}: cannot use as the cluster's shared folder ({exc})") from exc
    others = sorted(worker for worker, fingerprint in theirs.items() if fingerprint != ours)
    if others:
        client.close()
        if local is not None:
            local.close()
        shutil.rmtree(work, ignore_errors=True)
        raise ClusterError(
            f"{address!r}: workers {', '.join(others)} run other auditor parser code than this machine "
            f"(fingerprint {ours}); install the same auditor version on every worker"
        )
    return Cluster(client, address, work, local)
