"""One scan's use of a Dask cluster: what the scan hands to the ingest and audit stages.

`ClusterScan` bundles the three stand-ins (docs/scale.md): the parse runner for the ingest pipeline
(auditor/cluster/ingest.py), the sharded BM25 index for the audit (auditor/cluster/retrieve.py) and
the judging on the workers (auditor/cluster/judge.py). It closes the client, the LocalCluster it
may have started and the scan's shard files when the scan ends, whether it succeeded or not.
"""

from __future__ import annotations

from collections.abc import Callable

from auditor.cluster.backend import Cluster, connect
from auditor.cluster.ingest import ShardRunner
from auditor.cluster.judge import ClusterJudge
from auditor.cluster.retrieve import ClusterPassageIndex, build
from auditor.config import Config, RetrievalConfig
from auditor.store import Store


class ClusterScan:
    def __init__(self, cluster: Cluster):
        self.cluster = cluster
        self.runner = ShardRunner(cluster)

    def passage_index(self, store: Store, retrieval: RetrievalConfig) -> ClusterPassageIndex:
        return build(self.cluster, store, retrieval)

    def judge(self, judge: Callable) -> ClusterJudge:
        return ClusterJudge(self.cluster, judge)

    def close(self) -> None:
        self.cluster.close()

    def __enter__(self) -> ClusterScan:
        return self

    def __exit__(self, *exc) -> None:
        self.close()


def open_scan(config: Config) -> ClusterScan:
    return ClusterScan(connect(config.cluster, config.database))
