"""The scan on a 2-worker Dask LocalCluster against the local path, stage by stage, and a projection.

    python -m bench.cluster                      # 1,000,000 passages (100,000 files), 10,000 questions
    python -m bench.cluster --passages 100000    # a quicker look at the same comparison
    python -m bench.cluster --skip-local         # the cluster path only

The corpus is bench/scale.py's (generated, seeded, cached under ~/.cache/corpus-auditor/scale/).
Both paths start from an empty database and run the stages `auditor scan` runs: ingest, BM25 index
build, audit (retrieval and judging; the run stored), report. The local path uses `--jobs` parser
processes (default 2, as many as the cluster has workers); the cluster path a
`LocalCluster(n_workers=2, threads_per_worker=1, processes=True)`.

Printed per stage and path: seconds and the peak resident memory of the whole process tree
(workers included, sampled every 0.2 s with psutil), then the per-shard costs Dask recorded for
each kind of task (its task stream: worker seconds per task) and the client's own share of each
stage (the stage's time minus the time it waited for the workers), and from these a projection of
the cluster path to `--project` passages on N workers: worker work divides by N, the client's share
does not. bench/README.md keeps the figures of a run.
"""

from __future__ import annotations

import argparse
import shutil
import sys
import time
from collections import defaultdict
from pathlib import Path

from dask.utils import key_split
from distributed import get_task_stream

from auditor.cluster import backend as cluster_backend
from auditor.cluster import retrieve
from auditor.cluster.session import ClusterScan
from auditor.config import ClusterConfig, load_config
from auditor.ingest.pipeline import ingest_corpus
from auditor.judgement.audit import run_audit
from auditor.questions.sets import load_questions
from auditor.report import write_report
from auditor.retrieval.index import PassageIndex
from auditor.store import Store
from bench.scale import AS_OF, CACHE, TreeMemory, generate

STAGES = ("ingest", "index", "audit", "report")


class Waits:
    """Seconds the client spent waiting for the workers (Cluster.result and wait_all), per stage."""

    def __init__(self):
        self.by_stage: dict[str, float] = defaultdict(float)
        self.stage = ""

    def wrap(self, cluster):
        result, wait_all = cluster.result, cluster.wait_all

        def timed_result(future, what):
            started = time.monotonic()
            try:
                return result(future, what)
            finally:
                self.by_stage[self.stage] += time.monotonic() - started

        def timed_wait_all(futures, what):
            started = time.monotonic()
            try:
                return wait_all(futures, what)
            finally:
                self.by_stage[self.stage] += time.monotonic() - started

        cluster.result, cluster.wait_all = timed_result, timed_wait_all


def run_path(name: str, folder: Path, questions, args, memory: TreeMemory, cluster=None) -> dict:
    """One scan of the cached corpus into `folder`/<name>: seconds and tree peak per stage."""
    work = folder / name
    shutil.rmtree(work, ignore_errors=True)
    work.mkdir()
    config = load_config(folder / "audit.toml", env={})
    config = config.replace(database=work / "auditor.db")
    figures: dict = {"seconds": {}, "peak_gb": {}}
    waits = Waits()
    scan = None
    if cluster is not None:
        scan = ClusterScan(cluster)
        waits.wrap(cluster)

    def stage(label, fn):
        waits.stage = label
        memory.peak_tree = 0
        started = time.monotonic()
        value = fn()
        figures["seconds"][label] = time.monotonic() - started
        figures["peak_gb"][label] = memory.peak_tree / 1e9
        print(
            f"{name:>8} {label:>7}: {figures['seconds'][label]:8.1f} s   tree peak {figures['peak_gb'][label]:.2f} GB"
        )
        return value

    with Store(config.database) as store:
        runner = scan.runner if scan else None
        summary = stage("ingest", lambda: ingest_corpus(store, config, jobs=args.jobs, runner=runner))
        if scan:
            index = stage("index", lambda: scan.passage_index(store, config.retrieval))
        else:
            index = stage("index", lambda: PassageIndex.load_or_build(store, config.retrieval))
        figures["passages"] = index.passage_count
        if scan:
            # The audit builds its own index on the cluster; reuse this one so `index` is timed once.
            scan.passage_index = lambda store, retrieval: index  # type: ignore[method-assign]
        else:
            del index
        run = stage("audit", lambda: run_audit(store, config, questions, as_of=AS_OF, backend=scan))
    stage("report", lambda: write_report(run, work / "report"))
    figures["summary"] = run.summary
    figures["ingest"] = summary.line()
    figures["waits"] = dict(waits.by_stage)
    return figures


def task_costs(stream: list[dict]) -> dict[str, tuple[int, float]]:
    """Tasks and worker seconds by kind of task (the function name in the task's key)."""
    out: dict[str, list] = defaultdict(lambda: [0, 0.0])
    for task in stream:
        kind = key_split(task["key"])
        for part in task["startstops"]:
            if part["action"] == "compute":
                out[kind][0] += 1
                out[kind][1] += part["stop"] - part["start"]
    return {k: (n, s) for k, (n, s) in out.items()}


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--passages", type=int, default=1_000_000)
    parser.add_argument("--per-file", type=int, default=10)
    parser.add_argument("--questions", type=int, default=10_000)
    parser.add_argument("--jobs", type=int, default=2, help="parser processes of the local path")
    parser.add_argument("--workers", type=int, default=2, help="LocalCluster worker processes")
    parser.add_argument("--skip-local", action="store_true")
    parser.add_argument("--project", type=int, default=100_000_000, help="passages to project to")
    parser.add_argument("--cache", type=Path, default=CACHE)
    args = parser.parse_args(argv)

    files = max(1, args.passages // args.per_file)
    folder = args.cache / f"{files}x{args.per_file}-{args.questions}q"
    generate(folder, files, args.per_file, args.questions)
    (folder / "audit.toml").write_text(
        'questions = ["questions.csv"]\n[corpus]\npaths = ["kb"]\ninclude = ["**/*.txt"]\ntimeout_s = 300\n'
        '[report]\ntitle = "Cluster bench"\n',
        encoding="utf-8",
    )
    questions = load_questions(folder / "questions.csv")
    memory = TreeMemory().start()
    results = {}
    if not args.skip_local:
        results["local"] = run_path("local", folder, questions, args, memory)
    cluster = cluster_backend.connect(ClusterConfig(scheduler=f"local:{args.workers}"), folder / "cluster")
    try:
        with get_task_stream(client=cluster.client) as stream:
            results["cluster"] = run_path("cluster", folder, questions, args, memory, cluster)
        costs = task_costs(stream.data)
    finally:
        cluster.close()
    memory.stop()

    print()
    print(f"corpus: {files:,} files, {results['cluster']['passages']:,} passages; {len(questions):,} questions")
    for name, figures in results.items():
        s = figures["summary"]
        print(f"{name}: ingest {figures['ingest']}; {s.covered} covered, {s.stale} stale, {s.gap} gap")
    print(f"\n{'stage':<8}" + "".join(f"{n + ' s':>12}{n + ' GB':>12}" for n in results))
    for label in STAGES:
        row = "".join(f"{r['seconds'][label]:12.1f}{r['peak_gb'][label]:12.2f}" for r in results.values())
        print(f"{label:<8}{row}")
    totals = {n: sum(r["seconds"].values()) for n, r in results.items()}
    print(f"{'scan':<8}" + "".join(f"{totals[n]:12.1f}{max(r['peak_gb'].values()):12.2f}" for n, r in results.items()))
    if "local" in totals:
        print(f"cluster / local time: {totals['cluster'] / totals['local']:.2f}")

    passages = results["cluster"]["passages"]
    print("\nper-shard costs (Dask task stream, worker seconds):")
    for kind, (n, seconds) in sorted(costs.items(), key=lambda kv: -kv[1][1]):
        print(
            f"  {kind:<24} {n:6d} tasks {seconds:9.1f} s  {seconds / n:8.3f} s/task  {seconds / passages * 1e6:8.2f} s/M passages"
        )
    waits = results["cluster"]["waits"]
    client = {label: results["cluster"]["seconds"][label] - waits.get(label, 0.0) for label in STAGES}
    print("client's own share (stage time minus waiting for workers):")
    for label in STAGES:
        print(f"  {label:<8} {client[label]:8.1f} s  {client[label] / passages * 1e6:8.2f} s/M passages")

    # Worker work grows with the passages (parsing, counting, indexing, and scoring the same questions
    # against more postings), except judging, which grows with the questions only; the client's share
    # is taken to grow with the passages in every stage (an upper bound for the audit, whose
    # per-question part does not).
    scale = args.project / passages
    worker_s = sum(seconds * (1 if kind == "judge_batch" else scale) for kind, (_, seconds) in costs.items())
    client_s = sum(client.values()) * scale
    print(f"\nprojection to {args.project:,} passages ({scale:,.0f} x) and the same {len(questions):,} questions:")
    print(f"  {'N workers':>10} {'workers s':>12} {'client s':>12} {'scan h':>8}  bottleneck")
    for n in (2, 8, 32, 128, 512):
        total = max(worker_s / n, client_s)  # the client writes while the workers parse: the longer wins
        print(
            f"  {n:>10} {worker_s / n:12.0f} {client_s:12.0f} {total / 3600:8.1f}  "
            f"{'workers' if worker_s / n > client_s else 'the client (SQLite writes, export, inventory)'}"
        )
    print(f"  index shards at {args.project:,} passages: {args.project // retrieve.MAX_SHARD_PASSAGES:,}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
