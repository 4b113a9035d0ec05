"""Stored runs: save a run, list the stored runs, load one back, keep the last N, point `latest` at a report.

A run is stored as one `runs` row (summary, corpus, thresholds, ingest errors, report-only extras as
JSON, the passages its evidence cites among them) and one `results` row per question (the results.json question object, in question-set order);
see `store.SCHEMA`. `save_run` writes them from an `auditor.results.Run`; `load_run` turns them back
into the same run, so `auditor report --run ID` renders an old run exactly as it was, with its
history, its diff against the run before it and its gate outcome. Runs stored by older versions,
which lack keys added since, load through `Run.from_json`'s defaults.

Past 400 lines because saving, reading, retention and the `latest` link of stored runs share one
store layout; the diff has its own module (history/diff.py).
"""

from __future__ import annotations

import json
import os
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path
from typing import Any, TypeVar

from auditor.clock import utc_now
from auditor.errors import AuditorError, StoreError
from auditor.history.diff import diff_runs
from auditor.results import (
    Brief,
    DocumentEntry,
    GateResult,
    HistoryEntry,
    IngestError,
    LanguageSummary,
    Passages,
    QuestionResult,
    Run,
    RunInfo,
    Summary,
    used_passages,
)
from auditor.store import Store, chunked, dumps, marks

T = TypeVar("T")


@dataclass(kw_only=True)
class StoredRun:
    """A row of the run history (`auditor runs`); `summary` is None until the run is done."""

    id: int
    started: str | None
    finished: str | None
    status: str
    as_of: str | None
    horizon_days: int | None
    summary: Summary | None


# --- saving a run ---------------------------------------------------------------------------------


def save_run(store: Store, run: Run) -> int:
    """Store `run` in one transaction: the run row ('running'), its results, then 'done' with the
    summary. Sets `run.info.id` and `run.info.finished` and returns the id."""
    info = run.info
    with store.transaction():
        cursor = store.db.execute(
            "INSERT INTO runs (started, status, as_of, horizon_days, config_fingerprint, corpus_fingerprint, "
            "thresholds) VALUES (?, 'running', ?, ?, ?, ?, ?)",
            [
                info.started,
                info.as_of,
                info.horizon_days,
                info.config_fingerprint,
                info.corpus_fingerprint,
                dumps(info.thresholds.to_json() if info.thresholds else {}),
            ],
        )
        run_id = cursor.lastrowid
        assert run_id is not None
        info.id = run_id
        store.db.conn.executemany(
            "INSERT INTO results (run_id, position, qid, verdict, weight, result) VALUES (?, ?, ?, ?, ?, ?)",
            [(run_id, i, q.id, q.verdict, q.weight, dumps(q.to_json())) for i, q in enumerate(run.questions)],
        )
        info.finished = utc_now()
        store.db.execute(
            "UPDATE runs SET status = 'done', finished = ?, corpus = ?, summary = ?, ingest_errors = ?, "
            "extras = ? WHERE id = ?",
            [
                info.finished,
                dumps(info.corpus.to_json()),
                dumps(run.summary.to_json()),
                dumps([e.to_json() for e in run.ingest_errors]),
                dumps(
                    {
                        "documents": [d.to_json() for d in run.documents],
                        "redacted": dict(run.redacted),
                        "briefs": [b.to_json() for b in run.briefs],
                        # Format 2: each passage once; the results rows name them by id.
                        "passages": [p.to_json() for p in used_passages(run.questions)],
                        "title": info.title,
                        "tokenizer": info.tokenizer.to_json() if info.tokenizer else None,
                    }
                ),
                run_id,
            ],
        )
    return run_id


# --- reading runs ---------------------------------------------------------------------------------


def list_runs(store: Store) -> list[StoredRun]:
    """Every stored run, oldest first."""
    rows = store.query("SELECT id, started, finished, status, as_of, horizon_days, summary FROM runs ORDER BY id")
    runs = []
    for row in rows:
        summary = _json(store, row["id"], "summary", row["summary"], {})
        if summary:
            summary = _parse(store, row["id"], "summary", Summary.from_json, summary)
        runs.append(StoredRun(**{**row, "summary": summary or None}))
    return runs


def load_run(store: Store, run_id: int | None = None) -> Run:
    """A stored run, as `judgement.audit.run_audit` returned it.

    `run_id=None` loads the newest run with status 'done'. `history` lists the done runs before it
    (oldest first), `diff` compares it with the newest done run before it (None for the first run),
    `gate` is the stored gate outcome (None when no gate ran). Raises StoreError naming the
    database and the run when there is no such finished run, or when its rows cannot be read.
    """
    if run_id is None:
        row = _one(store, "SELECT * FROM runs WHERE status = 'done' ORDER BY id DESC LIMIT 1")
        if row is None:
            raise StoreError(
                f"{str(store.path)!r}: no finished run in this database; run `auditor scan` or `auditor audit` first"
            )
    else:
        row = _one(store, "SELECT * FROM runs WHERE id = ?", [run_id])
        if row is None:
            raise StoreError(
                f"{str(store.path)!r}: no run {run_id} in this database; `auditor runs` lists the stored runs"
            )
        if row["status"] != "done":
            # A running or failed run has partial results; a report of it would mislead.
            raise StoreError(
                f"{str(store.path)!r}: run {run_id} is {row['status']}, not done; "
                f"only finished runs can be reported or compared"
            )
    run = _run_object(store, row)
    run.history = history(store, row["id"])
    base_id = previous_run(store, row["id"])
    if base_id is not None:
        base_row = _one(store, "SELECT * FROM runs WHERE id = ?", [base_id])
        assert base_row is not None
        run.diff = diff_runs(_run_object(store, base_row), run)
    return run


def previous_run(store: Store, run_id: int) -> int | None:
    """The id of the newest done run stored before `run_id` (the base of its diff), or None.

    "Before" is by run id, i.e. the order the runs were made in, not by audit date: a re-audit of
    an older date is still compared with the run made just before it.
    """
    row = _one(store, "SELECT id FROM runs WHERE status = 'done' AND id < ? ORDER BY id DESC LIMIT 1", [run_id])
    return row["id"] if row else None


def history(store: Store, run_id: int) -> list[HistoryEntry]:
    """Done runs before `run_id`, oldest first, for the report's trend chart."""
    rows = store.query("SELECT id, as_of, summary FROM runs WHERE status = 'done' AND id < ? ORDER BY id", [run_id])
    return [
        HistoryEntry(
            id=r["id"],
            as_of=r["as_of"],
            summary=_parse(
                store, r["id"], "summary", Summary.from_json, _json(store, r["id"], "summary", r["summary"], {})
            ),
        )
        for r in rows
    ]


def _run_object(store: Store, row: dict) -> Run:
    """The run of one `runs` row and its `results` rows (each part read as results.json format 1)."""
    run_id = row["id"]

    def part(name: str, reader: Callable[[Any], T], data: Any) -> T:
        return _parse(store, run_id, name, reader, data)

    def column(name: str, default: Any) -> Any:
        return _json(store, run_id, name, row[name], default)

    extras = column("extras", {})
    head = {
        "id": run_id,
        "as_of": row["as_of"],
        "horizon_days": row["horizon_days"],
        "started": row["started"],
        "finished": row["finished"],
        "title": extras.get("title"),
        "tokenizer": extras.get("tokenizer"),
        "corpus": column("corpus", {}),
        "thresholds": column("thresholds", {}),
        "config_fingerprint": row["config_fingerprint"],
        "corpus_fingerprint": row["corpus_fingerprint"],
    }
    results = store.query("SELECT position, result FROM results WHERE run_id = ? ORDER BY position", [run_id])
    # Format-1 runs have none: their evidence items hold their passage and add it here.
    passages = part("extras", lambda d: Passages.of(d.get("passages")), extras)
    questions = [
        part(
            f"results[{r['position']}]",
            lambda data: QuestionResult.from_json(data, passages),
            _json(store, run_id, f"results[{r['position']}]", r["result"], None),
        )
        for r in results
    ]
    return Run(
        info=part("run", RunInfo.from_json, head),
        summary=part("summary", Summary.from_json, column("summary", {})),
        languages=LanguageSummary.by_language(questions),  # recomputed from the stored questions
        questions=questions,
        ingest_errors=part(
            "ingest_errors", lambda d: [IngestError.from_json(e) for e in d], column("ingest_errors", [])
        ),
        documents=part("extras", lambda d: [DocumentEntry.from_json(e) for e in d.get("documents", [])], extras),
        briefs=part("extras", lambda d: [Brief.from_json(b) for b in d.get("briefs", [])], extras),
        gate=part("gate", GateResult.from_json, column("gate", None)),
        redacted=part("extras", lambda d: {str(k): int(n) for k, n in (d.get("redacted") or {}).items()}, extras),
    )


def _parse(store: Store, run_id: int, name: str, reader: Callable[[Any], T], data: Any) -> T:
    """`reader(data)`: a stored part of run `run_id` read into the run model, or a StoreError naming it."""
    try:
        return reader(data)
    except (KeyError, TypeError, ValueError, AttributeError) as exc:
        raise StoreError(
            f"{str(store.path)!r}: run {run_id} has an unreadable {name} ({type(exc).__name__}: {exc}); "
            f"delete the run or restore the database from a backup"
        ) from None


def _one(store: Store, sql: str, params=()) -> dict | None:
    rows = store.query(sql, params)
    return rows[0] if rows else None


def _json(store: Store, run_id: int, column: str, text: str | None, default):
    if text is None or text == "":
        return default
    try:
        return json.loads(text)
    except ValueError as exc:
        raise StoreError(
            f"{str(store.path)!r}: run {run_id} has an unreadable {column} ({exc}); "
            f"delete the run or restore the database from a backup"
        ) from None


# --- writing around a run -------------------------------------------------------------------------


def record_gate(store: Store, run_id: int, gate: GateResult | None) -> None:
    """Store a gate outcome (gate.evaluate_gate's) with its run."""
    with store.transaction():
        cursor = store.db.execute(
            "UPDATE runs SET gate = ? WHERE id = ?", [dumps(gate.to_json()) if gate is not None else None, run_id]
        )
    if cursor.rowcount == 0:
        raise StoreError(f"{str(store.path)!r}: no run {run_id} to record the gate outcome on")


def apply_retention(store: Store, keep: int) -> list[int]:
    """Keep the newest `keep` done runs; delete older runs with their results. Returns deleted ids.

    `keep <= 0` keeps everything (the config's 0 = keep every run). Runs of any status older than
    the oldest kept done run go too (failed runs, rows of killed scans); the newest run is never
    deleted, and nothing is deleted while no run is done, so history is never emptied by a
    series of failures.
    """
    if not keep or keep <= 0:
        return []
    with store.transaction():
        done = [r["id"] for r in store.query("SELECT id FROM runs WHERE status = 'done' ORDER BY id DESC")]
        if not done:
            return []
        oldest_kept = done[:keep][-1]
        newest = store.query("SELECT max(id) AS id FROM runs")[0]["id"]
        doomed = [
            r["id"]
            for r in store.query("SELECT id FROM runs WHERE id < ? AND id != ? ORDER BY id", [oldest_kept, newest])
        ]
        for chunk in chunked(doomed):
            # Results first: the foreign key cascades only when PRAGMA foreign_keys is on.
            store.db.execute(f"DELETE FROM results WHERE run_id IN ({marks(chunk)})", chunk)
            store.db.execute(f"DELETE FROM runs WHERE id IN ({marks(chunk)})", chunk)
    return doomed


def update_latest(out_dir: str | Path, link: str | Path | None = None) -> Path:
    """Point `<parent of out_dir>/latest` (or `link`) at the report folder `out_dir`, atomically.

    A relative symbolic link is made under a temporary name and renamed over the old one
    (os.replace), so a reader sees either the previous report or the new one, never neither. Where
    symbolic links are not available the link is a small text file holding the folder's path.
    Call it last, after the report files are in place.
    """
    out_dir = Path(out_dir)
    link = Path(link) if link is not None else out_dir.parent / "latest"
    if link.is_dir() and not link.is_symlink():
        raise AuditorError(
            f"{str(link)!r}: is a folder, not the link to the newest report; move it away so the link can be made"
        )
    try:
        target = os.path.relpath(out_dir.resolve(), link.parent.resolve())
    except ValueError:  # another drive (Windows)
        target = str(out_dir.resolve())
    temporary = link.with_name(f".{link.name}.{os.getpid()}.tmp")
    _remove_dead_temporaries(link)
    try:
        if temporary.is_symlink() or temporary.exists():
            temporary.unlink()
        try:
            os.symlink(target, temporary, target_is_directory=True)
        except (OSError, NotImplementedError):
            temporary.write_text(target + "\n", encoding="utf-8")
        os.replace(temporary, link)
    except OSError as exc:
        raise AuditorError(f"{str(link)!r}: cannot point it at the newest report ({exc})") from None
    return link


def _remove_dead_temporaries(link: Path) -> None:
    """Drop temporary links left by a scan killed inside update_latest (its pid no longer runs)."""
    for leftover in link.parent.glob(f".{link.name}.*.tmp"):
        try:
            pid = int(leftover.name[len(link.name) + 2 : -4])
            os.kill(pid, 0)
        except ValueError:
            continue
        except ProcessLookupError:
            try:
                leftover.unlink()
            except OSError:
                pass
        except PermissionError:  # alive, another user's
            continue


# --- text for the CLI -----------------------------------------------------------------------------


def format_runs(runs: list[StoredRun]) -> str:
    """The run history as an aligned text table, one run a line."""
    if not runs:
        return "no runs yet"
    header = (
        "run",
        "status",
        "as of",
        "started",
        "finished",
        "questions",
        "supported",
        "stale",
        "gap",
        "fallback",
        "stale exp.",
    )
    rows = [header]
    for r in runs:
        s = r.summary
        rows.append(
            (
                str(r.id),
                r.status,
                r.as_of or "",
                r.started or "",
                r.finished or "-",
                _count(s.questions if s else None),
                _count(s.supported if s else None),
                _count(s.stale if s else None),
                _count(s.gap if s else None),
                _share(s.fallback_exposure if s else None),
                _share(s.stale_exposure if s else None),
            )
        )
    widths = [max(len(row[i]) for row in rows) for i in range(len(header))]
    numeric = set(range(5, len(header))) | {0}
    lines = []
    for row in rows:
        cells = [cell.rjust(w) if i in numeric else cell.ljust(w) for i, (cell, w) in enumerate(zip(row, widths))]
        lines.append("  ".join(cells).rstrip())
    return "\n".join(lines)


def _count(value: float | None) -> str:
    return "-" if value is None else f"{value:g}" if isinstance(value, float) else str(value)


def _share(value: float | None) -> str:
    return "-" if value is None else f"{value:.2f}"
