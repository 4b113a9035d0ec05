"""The main job as library functions: ingest, audit, compare with the last run, gate, report.

The CLI commands are thin wrappers over these; each stage function can also be called alone.
"""

from __future__ import annotations

import contextlib
from dataclasses import dataclass, field
from datetime import date
from pathlib import Path

from auditor.cluster import open_scan  # imports no cluster package itself (auditor/cluster/__init__.py)
from auditor.config import Config
from auditor.errors import InputError
from auditor.history.diff import diff_runs
from auditor.history.gate import evaluate_gate
from auditor.history.lock import ScanLock
from auditor.history.runs import apply_retention, load_run, previous_run, record_gate, update_latest
from auditor.ingest.pipeline import ingest_corpus
from auditor.judgement.audit import Backend, run_audit
from auditor.models import Question
from auditor.questions.querylog import QueryLogSummary, store_redaction_counts
from auditor.questions.sets import read_question_file, store_questions
from auditor.report import write_report
from auditor.results import GateResult, Run
from auditor.store import Store


@dataclass
class ScanOutcome:
    run: Run
    out_dir: Path
    ingest_line: str
    gate: GateResult | None
    question_lines: list[str]


def default_out_dir(config: Config, as_of: date) -> Path:
    """`--out`, else the config's report folder, else reports/<as-of date>/ (docs/cli.md)."""
    return config.report.out or Path("reports") / as_of.isoformat()


@dataclass
class QuestionSet:
    path: Path
    questions: list[Question]
    log_summary: QueryLogSummary | None  # when the file was a query log
    notes: list[str] = field(default_factory=list)  # e.g. the columns kept beyond the known ones


def load_question_files(config: Config, paths: list[Path] | None = None) -> list[QuestionSet]:
    """Every configured question file, in order; ids must stay unique across files."""
    files = list(paths or config.questions)
    if not files:
        where = repr(str(config.source)) if config.source else "the command line"
        raise InputError(f"{where}: no question file given (set `questions` in the config or pass --questions)")
    sets: list[QuestionSet] = []
    seen: dict[str, Path] = {}
    for path in files:
        notes: list[str] = []
        questions, log_summary = read_question_file(path, config.redaction, warn=notes.append)
        for question in questions:
            if question.id in seen:
                raise InputError(
                    f"{str(path)!r}: question id {question.id!r} is also used in "
                    f"{str(seen[question.id])!r}; give the files an `id` column with distinct ids"
                )
            seen[question.id] = path
        sets.append(QuestionSet(Path(path), questions, log_summary, notes))
    return sets


def store_question_sets(store: Store, sets: list[QuestionSet]) -> list[Question]:
    """Keep each set in the store (redacted already: query logs are cleaned on import) and return
    all questions in order."""
    for qset in sets:
        store_questions(store, qset.questions, qset.path.name)
        if qset.log_summary is not None:
            store_redaction_counts(store, qset.path.name, qset.log_summary)
    return [q for qset in sets for q in qset.questions]


def audit_and_report(
    store: Store,
    config: Config,
    sets: list[QuestionSet],
    *,
    as_of: date,
    horizon_days: int | None = None,
    out_dir: Path | None = None,
    gate: bool = True,
    backend: Backend | None = None,
    progress: bool = False,
) -> tuple[Run, Path]:
    """Audit, attach the diff against the previous run and the gate outcome, write the report."""
    questions = store_question_sets(store, sets)
    run = run_audit(
        store, config, questions, as_of=as_of, horizon_days=horizon_days, backend=backend, progress=progress
    )
    run_id = run.info.id
    assert run_id is not None  # run_audit stored it
    base_id = previous_run(store, run_id)
    run.diff = diff_runs(load_run(store, base_id), run) if base_id is not None else None
    run.gate = evaluate_gate(run, run.diff, config.gate) if gate else None
    if run.gate is not None:
        record_gate(store, run_id, run.gate)
    out_dir = out_dir or default_out_dir(config, as_of)
    write_report(
        run, out_dir, outputs=config.report.outputs, stale_in_junit=config.report.stale_in_junit, progress=progress
    )
    update_latest(out_dir)
    if config.report.keep_runs:
        apply_retention(store, config.report.keep_runs)
    return run, out_dir


def scan(
    config: Config,
    *,
    as_of: date | None = None,
    out_dir: Path | None = None,
    wait: float = 0.0,
    progress: bool = False,
    jobs: int | None = None,
) -> ScanOutcome:
    """The whole job under the scan lock: ingest, audit, diff, gate, report; on the Dask cluster of
    `[cluster] scheduler` when one is set (docs/scale.md)."""
    as_of = as_of or config.audit_date()
    sets = load_question_files(config)  # fail on a bad question file before any work
    with ScanLock(config.database, wait=wait):
        cluster = open_scan(config) if config.cluster.scheduler else contextlib.nullcontext()
        with Store(config.database) as store, cluster as backend:
            runner = backend.runner if backend is not None else None
            summary = ingest_corpus(store, config, jobs=jobs, progress=progress, runner=runner)
            run, out_dir = audit_and_report(
                store, config, sets, as_of=as_of, out_dir=out_dir, backend=backend, progress=progress
            )
    return ScanOutcome(
        run=run, out_dir=out_dir, ingest_line=summary.line(), gate=run.gate, question_lines=question_lines(sets)
    )


def question_lines(sets: list[QuestionSet]) -> list[str]:
    """What a query-log import merged and redacted, one line per log, and each set's notes."""
    lines = []
    for qset in sets:
        if qset.log_summary is not None:
            lines.append(f"{qset.path.name}: {qset.log_summary.line()}")
        lines.extend(f"warning: {note}" for note in qset.notes)
    return lines


def summary_lines(run: Run) -> list[str]:
    """The few lines a lead reads in the terminal after a scan or audit."""
    s, info = run.summary, run.info
    corpus = info.corpus
    lines = [
        f"audit {info.as_of} (run {info.id}, horizon {info.horizon_days} days): "
        f"{corpus.documents} documents, {corpus.passages} passages, {corpus.failed} failed",
        f"{s.questions} questions: {s.supported} supported, {s.stale} stale, {s.gap} gap",
        f"weighted fallback exposure {s.fallback_exposure:.1%}, stale exposure {s.stale_exposure:.1%}",
    ]
    if run.diff:
        lines.append(f"since run {run.diff.base_run}: {run.diff.summary}")
    return lines
