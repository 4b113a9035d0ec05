"""The scan on a Dask cluster (auditor/cluster/, docs/scale.md) gives the local scan's answers.

The reference is the local path itself: on the demo and on a generated corpus, results.json of a
scan on a 2-worker `LocalCluster` must equal the local scan's (one parser process, which hands
documents to the store in the same order as the cluster path does, so ids match) apart from the
run's timestamps. Faults: a worker killed mid-scan is rerun by Dask and changes nothing; when the
engine gives up, the scan stops with one line and the database and the earlier report stay as they
were.
"""

from __future__ import annotations

import dataclasses
import json
import os
import signal
import sqlite3
import subprocess
import sys
from pathlib import Path

import pytest
from click.testing import CliRunner

from auditor.cli import cli
from auditor.config import ClusterConfig, load_config

distributed = pytest.importorskip("distributed", reason="the `cluster` extra (dask, distributed) is not installed")
pytest.importorskip("pyarrow", reason="the `cluster` extra (pyarrow) is not installed")

import dask  # noqa: E402  (after the skips: these exist only with the extra)
from distributed import Client, LocalCluster, WorkerPlugin  # noqa: E402

from auditor.cluster.backend import ClusterError, connect  # noqa: E402
from auditor.scan import scan  # noqa: E402
from bench.scale import generate  # noqa: E402


def _cluster(**config) -> LocalCluster:
    with dask.config.set(config):
        return LocalCluster(n_workers=2, processes=True, threads_per_worker=1, dashboard_address=None)


@pytest.fixture(scope="module")
def cluster():
    local = _cluster()
    yield local
    local.close()


def _scan(folder: Path, name: str, scheduler: str | None):
    """A scan of `folder`/audit.toml into its own database and report folder."""
    config = load_config(folder / "audit.toml", env={})
    config = config.replace(
        database=folder / name / "auditor.db",
        report=dataclasses.replace(config.report, out=folder / name / "report"),
        cluster=ClusterConfig(scheduler=scheduler),
    )
    return scan(config, jobs=1)


def _results(outcome) -> dict:
    results = json.loads((outcome.out_dir / "results.json").read_text(encoding="utf-8"))
    for stamp in ("started", "finished"):
        assert results["run"].pop(stamp)
    return results


def test_demo_results_on_the_cluster_equal_the_local_ones(demo_copy, cluster):
    local = _results(_scan(demo_copy, "local", None))
    remote = _results(_scan(demo_copy, "cluster", cluster.scheduler_address))
    assert local["summary"]["questions"] == 43 and local["run"]["corpus"]["passages"] > 40
    assert remote == local


@pytest.fixture(scope="module")
def generated(tmp_path_factory):
    """bench/scale.py's generator, small: 120 text files of 6 passages and 60 questions."""
    folder = tmp_path_factory.mktemp("generated")
    generate(folder, files=120, per_file=6, questions=60)
    (folder / "audit.toml").write_text(
        'questions = ["questions.csv"]\nas_of = 2026-12-01\n[corpus]\npaths = ["kb"]\ninclude = ["**/*.txt"]\n',
        encoding="utf-8",
    )
    return folder


def test_generated_corpus_results_on_the_cluster_equal_the_local_ones(generated, cluster):
    local = _results(_scan(generated, "local", None))
    remote = _results(_scan(generated, "cluster", cluster.scheduler_address))
    assert local["run"]["corpus"]["passages"] == 720
    assert {q["verdict"] for q in local["questions"]} >= {"supported", "gap"}
    assert remote == local


class KillOnParse(WorkerPlugin):
    """Kills its worker process (SIGKILL, as the kernel's OOM killer would) when a parse task starts;
    with `once`, only the first time across all workers (a marker file says it happened)."""

    def __init__(self, marker: str, once: bool):
        self.marker, self.once = marker, once

    def transition(self, key, start, finish, **kwargs):
        if finish != "executing" or "parse_shard" not in str(key):
            return
        if self.once:
            try:
                os.close(os.open(self.marker, os.O_CREAT | os.O_EXCL | os.O_WRONLY))
            except FileExistsError:
                return
        os.kill(os.getpid(), signal.SIGKILL)


def test_a_worker_killed_mid_scan_is_rerun_and_changes_nothing(generated, cluster, tmp_path):
    marker = tmp_path / "killed"
    local = _results(_scan(generated, "local-kill", None))
    with Client(cluster) as client:
        client.register_plugin(KillOnParse(str(marker), once=True), name="kill-once")
        try:
            remote = _results(_scan(generated, "cluster-kill", cluster.scheduler_address))
        finally:
            client.unregister_worker_plugin("kill-once")
    assert marker.exists()  # a worker did die in the middle of the ingest
    assert remote == local


def _fingerprint(folder: Path) -> dict:
    return {p.relative_to(folder).as_posix(): p.read_bytes() for p in sorted(folder.rglob("*")) if p.is_file()}


def test_when_the_engine_gives_up_the_scan_stops_with_one_line_and_keeps_what_was_stored(demo_copy, tmp_path):
    runner = CliRunner()
    config = str(demo_copy / "audit.toml")
    first = runner.invoke(cli, ["scan", "-c", config, "-q"])
    assert first.exit_code == 0, first.output
    report = demo_copy / "work" / "report"
    before = _fingerprint(report)
    database = demo_copy / "work" / "auditor.db"
    with sqlite3.connect(database) as db:
        runs_before = db.execute("SELECT id, status, summary FROM runs").fetchall()
        documents_before = db.execute("SELECT path, sha256 FROM documents ORDER BY path").fetchall()
    changed = next((demo_copy / "kb").rglob("*.md"))
    changed.write_text(changed.read_text(encoding="utf-8") + "\nA line added after the first scan.\n", "utf-8")

    # allowed-failures 0: the first worker death of a task makes Dask give the task up.
    failing = _cluster(**{"distributed.scheduler.allowed-failures": 0})
    try:
        with Client(failing) as client:
            client.register_plugin(KillOnParse(str(tmp_path / "unused"), once=False), name="kill-always")
            second = runner.invoke(cli, ["scan", "-c", config, "-q", "--cluster", failing.scheduler_address])
    finally:
        failing.close()
    assert second.exit_code == 1
    lines = second.stderr.strip().splitlines()
    assert len(lines) == 1, second.stderr
    assert lines[0].startswith(f"error: {failing.scheduler_address!r}: Dask gave up parsing shard 0 (")
    assert lines[0].endswith(
        "after 1 worker deaths (distributed.scheduler.allowed-failures = 0); the scan stopped, what was stored stays"
    )
    assert _fingerprint(report) == before
    with sqlite3.connect(database) as db:
        assert db.execute("PRAGMA integrity_check").fetchone()[0] == "ok"
        assert db.execute("SELECT id, status, summary FROM runs").fetchall() == runs_before
        assert db.execute("SELECT path, sha256 FROM documents ORDER BY path").fetchall() == documents_before
    assert not list((database.parent / "auditor.db.cluster").glob("scan-*"))  # no shard files left behind


def test_an_unreachable_scheduler_is_one_clear_line(tmp_path, monkeypatch):
    monkeypatch.setattr("auditor.cluster.backend.CONNECT_TIMEOUT_S", 1)
    address = "tcp://127.0.0.1:9"  # the discard port: nothing of ours listens there
    with pytest.raises(ClusterError, match=r"^'tcp://127\.0\.0\.1:9': cannot reach the Dask scheduler"):
        connect(ClusterConfig(scheduler=address), tmp_path / "auditor.db")


def test_a_scan_without_a_cluster_imports_no_cluster_package(demo_copy):
    # In a fresh interpreter: this test process has imported dask already.
    code = (
        "import sys\n"
        "from auditor.cli import main\n"
        f"sys.argv = ['auditor', 'scan', '-q', '-c', {str(demo_copy / 'audit.toml')!r}]\n"
        "try:\n    main()\nexcept SystemExit as exc:\n    assert not exc.code, exc.code\n"
        "print(sorted({m.split('.')[0] for m in sys.modules} & {'dask', 'distributed', 'pyarrow'}))\n"
    )
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=120, cwd=demo_copy)
    assert done.returncode == 0, done.stderr
    assert done.stdout.strip().splitlines()[-1] == "[]"


def test_cluster_config_is_read(tmp_path):
    (tmp_path / "audit.toml").write_text('[cluster]\nscheduler = "tcp://scheduler.example:8786"\nshared = "shards"\n')
    config = load_config(tmp_path / "audit.toml", env={})
    assert config.cluster.scheduler == "tcp://scheduler.example:8786"
    assert config.cluster.shared == tmp_path / "shards"
