"""The worker pool: a task that hangs or kills its worker costs that task only."""

from __future__ import annotations

from auditor.ingest.pipeline import ingest_corpus
from auditor.ingest.pool import run_tasks
from auditor.store import Store
from tests.ingest_helpers import config_for, make_pdf, misbehave, replicate_pages, words, write_tree


def test_hang_crash_and_exception_cost_one_task_each():
    tasks = ["a", "hang", "b", "crash", "c", "raise", "d"]
    outcome = {task: (status, value) for task, status, value in run_tasks(tasks, misbehave, None, jobs=2, timeout=3.0)}
    assert outcome == {
        "a": ("ok", "A"),
        "b": ("ok", "B"),
        "c": ("ok", "C"),
        "d": ("ok", "D"),
        "hang": ("timeout", 3.0),
        "crash": ("crash", 3),
        "raise": ("error", "ValueError: bad input"),
    }
    # "timeout" is only reported by killing the hung worker: had the pool waited for it, the
    # generator would never have finished and "d" (queued behind it on two workers) would be missing.


def test_one_job_runs_everything_in_order():
    out = [(t, s, v) for t, s, v in run_tasks(["x", "y", "z"], misbehave, None, jobs=1, timeout=30)]
    assert out == [("x", "ok", "X"), ("y", "ok", "Y"), ("z", "ok", "Z")]


def test_a_slow_file_times_out_and_the_others_are_ingested(tmp_path):
    # 400 pages of text: parsing, segmenting and dating it takes seconds, far over 0.5 s.
    slow = replicate_pages(make_pdf([words(350)]), 400)
    root = write_tree(tmp_path / "kb", {"slow.pdf": slow, "a.md": "# A\n\nShort.\n", "b.txt": "B\n\nShort too."})
    with Store(tmp_path / "a.db") as store:
        summary = ingest_corpus(store, config_for(root, timeout_s=0.5, jobs=2))
        assert summary.line() == "2 new, 0 changed, 0 unchanged, 0 removed, 1 failed"
        error = store.query("SELECT kind, error FROM ingest_errors")[0]
        assert error["kind"] == "timeout"
        assert (
            error["error"] == f"{str(root / 'slow.pdf')!r}: parsing took longer than 0.5 s (corpus.timeout_s); stopped"
        )
        # Unchanged and still too slow for the same limit: not tried again...
        again = ingest_corpus(store, config_for(root, timeout_s=0.5))
        assert (again.parsed, again.failed, again.unchanged) == (0, 1, 2)
        # ...but tried again once the limit is raised.
        retried = ingest_corpus(store, config_for(root, timeout_s=300))
        assert (retried.parsed, retried.new, retried.failed) == (1, 1, 0)
        assert store.query("SELECT count(*) AS n FROM ingest_errors")[0]["n"] == 0
