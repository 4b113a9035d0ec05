"""Incremental ingest of the corpus into the store, parsing in worker processes.

What an owner can expect:
* unchanged files (same sha256, same sitemap date, same parser code: parser_fingerprint) are
  not parsed again;
* a changed file has its passages and statements replaced in one transaction;
* a file that has gone is marked 'removed' and its passages are deleted (the row stays for history);
* a file that fails gets a row in ingest_errors (kind + one line naming the file). If an earlier
  version of it had been ingested, that version stays searchable (status 'failed': the retrieval
  index is asked to keep 'failed' documents' passages), so a broken re-export does not silently
  turn answered questions into gaps; the report shows the error. The failed content's hash is kept
  (meta 'ingest:failed') so an unchanged broken file is not parsed again on every run; a timeout is
  retried only when corpus.timeout_s has grown; an unexpected parser exception or a crashed worker
  is retried on every run (the fault may be ours, not the file's).
* a new tokenizer fingerprint (meta 'tokenizer') re-tokenizes every stored passage first.

Only the main process writes to SQLite; workers read, detect, parse, segment, tokenize and extract
dated statements (the CPU-heavy part) and send plain data back.

The process pool is auditor/ingest/pool.py, the work of one file auditor/ingest/parse.py; this
module decides what to parse and writes the results.
"""

from __future__ import annotations

import hashlib
import json
import os
import sys
import time
from dataclasses import dataclass, field
from datetime import UTC, datetime
from pathlib import Path
from typing import Any

from auditor.clock import utc_now
from auditor.errors import InputError
from auditor.ingest.failures import IngestFailure
from auditor.ingest.languages import document_language, language_from_config
from auditor.ingest.owners import owner_from_config
from auditor.ingest.parse import Settings, parse_file, warm_up
from auditor.ingest.pool import run_tasks
from auditor.ingest.sitemap import lastmod_dates
from auditor.ingest.walk import SourceFile, discover, read_file, resolve_roots, sha256, storable
from auditor.models import Block
from auditor.retrieval.tokenize import Tokenizer
from auditor.retrieval.vocabulary import Vocabulary

# The code whose output is stored per file: when any of it changes, every file is parsed again
# (a better date pattern or parser must reach documents that did not change).
_PARSER_SOURCES = ("ingest/*.py", "temporal/*.py", "models.py")


def parser_fingerprint() -> str:
    """sha256 (first 16 hex digits) of the source of the parsers, segmenter and temporal stage."""
    package = Path(__file__).resolve().parent.parent
    digest = hashlib.sha256()
    for pattern in _PARSER_SOURCES:
        for source in sorted(package.glob(pattern)):
            digest.update(source.name.encode() + b"\0" + source.read_bytes())
    return digest.hexdigest()[:16]


# --- the main process ---------------------------------------------------------------------------


@dataclass
class IngestSummary:
    """What an ingest did. `passages` counts the passages written by this ingest."""

    new: int = 0
    changed: int = 0
    unchanged: int = 0
    removed: int = 0
    failed: int = 0
    passages: int = 0
    errors: list[str] = field(default_factory=list)  # one line per failed file, naming it
    failures: list[dict] = field(default_factory=list)  # the same as {"path", "kind", "error"}
    parsed: int = 0  # files sent to a parser
    retokenized: int = 0  # passages re-tokenized for a new tokenizer fingerprint
    bytes_parsed: int = 0
    seconds: float = 0.0
    cpu_by_worker: dict = field(default_factory=dict)  # worker pid -> CPU seconds spent on files

    def fail(self, path: str, kind: str, message: str) -> None:
        message = storable(message)
        self.failed += 1
        self.errors.append(message)
        self.failures.append({"path": path, "kind": kind, "error": message})

    def line(self) -> str:
        return (
            f"{self.new} new, {self.changed} changed, {self.unchanged} unchanged, "
            f"{self.removed} removed, {self.failed} failed"
        )


def ingest_corpus(store, config, *, paths=None, jobs=None, progress=False, runner=None) -> IngestSummary:
    """Bring the store up to date with the corpus at `paths` (default config.corpus.paths).

    `runner` parses the files: by default the local process pool (auditor/ingest/pool.py), else one
    with its contract (a cluster's, auditor/cluster/ingest.py).

    Never raises for a bad document (it is recorded in ingest_errors and the summary); raises
    InputError for a missing corpus path or an unreadable sitemap, before anything is written.
    """
    corpus = config.corpus
    given = list(paths) if paths is not None else list(corpus.paths)
    if not given:
        raise InputError("no corpus paths to ingest: set corpus.paths in the config or pass PATH arguments")
    # One commit per file; in WAL mode synchronous=NORMAL keeps the database safe from corruption
    # and skips an fsync per commit (sqlite.org/pragma.html#pragma_synchronous).
    previous = store.db.execute("PRAGMA synchronous").fetchone()[0]
    store.db.execute("PRAGMA synchronous = NORMAL")
    try:
        return _ingest(store, config, given, jobs, progress, runner or run_tasks)
    finally:
        store.db.execute(f"PRAGMA synchronous = {int(previous)}")


def _ingest(store, config, given: list, jobs, progress, runner) -> IngestSummary:
    started = time.monotonic()
    corpus = config.corpus
    files, skipped = discover(given, corpus)
    sitemap = lastmod_dates(corpus.sitemaps, [r for r, _ in resolve_roots(given)]) if corpus.sitemaps else {}
    summary = IngestSummary()
    tokenizer = Tokenizer(config.retrieval.language, config.retrieval.stopwords, config.retrieval.detect)
    summary.retokenized = _retokenize_if_needed(store, tokenizer)
    parser = parser_fingerprint()
    parser_changed = store.get_meta("ingest:parser") != parser
    failed_before = json.loads(store.get_meta("ingest:failed", "{}"))
    known = {
        row["path"]: row
        for row in store.query(
            "SELECT id, path, sha256, status, meta_dates, owner, owner_source, language, language_source FROM documents"
        )
    }
    now = utc_now()
    seen: set[str] = set()
    tasks: list[dict[str, Any]] = []
    unchanged: list[tuple[SourceFile, dict]] = []
    by_path: dict[str, SourceFile] = {}

    def record_failure(doc_path: str, root: Path, kind: str, message: str, sha: str | None = None) -> None:
        summary.fail(doc_path, kind, message)
        with store.transaction():
            store.db.execute(
                "INSERT INTO ingest_errors(path, source_root, kind, error, recorded_at) VALUES (?,?,?,?,?) "
                "ON CONFLICT(path) DO UPDATE SET source_root=excluded.source_root, kind=excluded.kind, "
                "error=excluded.error, recorded_at=excluded.recorded_at",
                [doc_path, storable(str(root)), kind, storable(message), now],
            )
            store.db.execute(
                "UPDATE documents SET status='failed', last_seen=? WHERE path=? AND status != 'removed'",
                [now, doc_path],
            )
        if sha is not None:
            failed_before[doc_path] = [sha, kind, corpus.timeout_s]
        else:
            failed_before.pop(doc_path, None)

    for s in skipped:
        seen.add(s.doc_path)
        record_failure(s.doc_path, s.root, s.kind, s.message)

    for f in files:
        seen.add(f.doc_path)
        try:
            data = read_file(f.file, f.doc_path)
        except IngestFailure as exc:
            record_failure(f.doc_path, f.root, exc.kind, str(exc))
            continue
        sha = sha256(data)
        del data
        row = known.get(f.doc_path)
        site = sitemap.get(str(f.file))
        earlier = failed_before.get(f.doc_path)
        if (
            row
            and row["status"] == "active"
            and row["sha256"] == sha
            and not parser_changed
            and _sitemap_date(row["meta_dates"]) == (site.value.isoformat() if site else None)
            and _same_language_rule(config, f.rel, row)
        ):
            unchanged.append((f, row))
            continue
        if (
            earlier
            and earlier[0] == sha
            and not parser_changed
            and not (earlier[1] == "timeout" and corpus.timeout_s > earlier[2])
        ):
            error = store.query("SELECT kind, error FROM ingest_errors WHERE path = ?", [f.doc_path])
            if error:
                summary.fail(f.doc_path, error[0]["kind"], error[0]["error"])
            else:
                summary.failed += 1
            store.db.execute("UPDATE documents SET last_seen=? WHERE path=?", [now, f.doc_path])
            continue
        by_path[f.doc_path] = f
        tasks.append(
            {
                "file": str(f.file),
                "doc_path": f.doc_path,
                "kind": f.kind,
                "mtime": f.mtime,
                "sitemap": site,
                "language": language_from_config(config, f.rel),
            }
        )

    _touch_unchanged(store, config, unchanged, now)
    summary.unchanged = len(unchanged)

    settings = Settings(
        config.retrieval.language,
        config.retrieval.stopwords,
        corpus.day_first,
        corpus.fiscal_year_start,
        corpus.hemisphere,
        detect=config.retrieval.detect,
    )
    jobs = jobs or corpus.jobs or os.cpu_count() or 1
    # Largest files first: with a few big files among many small ones, the pool stays busy to the end.
    tasks.sort(key=lambda t: -by_path[t["doc_path"]].size)
    vocabulary = Vocabulary(store)
    bar = _Progress(len(tasks)) if progress and sys.stderr.isatty() else None
    for task, status, value in runner(tasks, parse_file, settings, jobs=jobs, timeout=corpus.timeout_s, init=warm_up):
        f = by_path[task["doc_path"]]
        summary.parsed += 1
        if status == "ok":
            pid, cpu = value.get("cpu", (0, 0.0))
            summary.cpu_by_worker[pid] = summary.cpu_by_worker.get(pid, 0.0) + cpu
        if bar:
            bar.step(f.doc_path)
        if status == "ok" and value["ok"]:
            summary.bytes_parsed += value["size"]
            row = known.get(f.doc_path)
            if row is None or row["status"] == "removed":
                summary.new += 1
            else:
                summary.changed += 1
            summary.passages += _write_document(store, config, vocabulary, f, value, row, now)
            failed_before.pop(f.doc_path, None)
            continue
        # Remember the failed content only when the failure is the file's own (a refusal or a
        # timeout): an unexpected exception or a crash may be ours, so the file is tried again.
        failed_sha: str | None = None
        if status == "timeout" or status == "ok":
            try:
                failed_sha = sha256(read_file(f.file, f.doc_path))
            except IngestFailure:
                failed_sha = None
        if status == "ok":
            kind, message = value["kind"], value["message"]
        elif status == "timeout":
            kind, message = (
                "timeout",
                f"{str(f.file)!r}: parsing took longer than {value:g} s (corpus.timeout_s); stopped",
            )
        elif status == "crash":
            kind, message = "parse_error", f"{str(f.file)!r}: the parser crashed (worker exit code {value})"
        else:
            kind, message = "parse_error", f"{str(f.file)!r}: parser failed ({value})"
        record_failure(f.doc_path, f.root, kind, message, failed_sha)
    if bar:
        bar.done()

    summary.removed = _mark_removed(store, known, seen, now)
    with store.transaction():
        for path in [p for p in failed_before if p not in seen]:
            del failed_before[path]
        gone = [r["path"] for r in store.query("SELECT path FROM ingest_errors") if r["path"] not in seen]
        store.db.conn.executemany("DELETE FROM ingest_errors WHERE path = ?", [(p,) for p in gone])
        store.set_meta("ingest:failed", json.dumps(failed_before, sort_keys=True))
        store.set_meta("ingest:parser", parser)
        store.set_meta("tokenizer", tokenizer.fingerprint())
        store.set_meta("ingest:last", now)
    summary.seconds = time.monotonic() - started
    return summary


def _sitemap_date(meta_dates: str) -> str | None:
    for d in json.loads(meta_dates or "[]"):
        if d.get("source") == "sitemap:lastmod":
            return d.get("value")
    return None


def _touch_unchanged(store, config, unchanged, now: str) -> None:
    """Unchanged files: last_seen, and the owner again when the config's owner map changed."""
    with store.transaction():
        for f, row in unchanged:
            owner, source = row["owner"], row["owner_source"]
            if source != "front_matter":
                mapped = owner_from_config(config, f.rel)
                owner, source = (mapped, "config") if mapped else ("unassigned", "default")
            store.db.execute(
                "UPDATE documents SET last_seen=?, owner=?, owner_source=? WHERE id=?", [now, owner, source, row["id"]]
            )


def _write_document(store, config, vocabulary, f: SourceFile, value: dict, row, now: str) -> int:
    """Insert or replace one document with its passages and statements, in one transaction."""
    if value["owner"]:
        owner, owner_source = value["owner"], "front_matter"
    elif mapped := owner_from_config(config, f.rel):
        owner, owner_source = mapped, "config"
    else:
        owner, owner_source = "unassigned", "default"
    meta_dates = [{"value": d.value.isoformat(), "kind": d.kind, "source": d.source} for d in value["dates"]]
    fields = {
        "path": f.doc_path,
        "source_root": storable(str(f.root)),
        "kind": value["kind"],
        "sha256": value["sha256"],
        "size": value["size"],
        "mtime": datetime.fromtimestamp(f.mtime, UTC).isoformat(timespec="seconds"),
        "title": value["title"],
        "owner": owner,
        "owner_source": owner_source,
        "doc_date": value["doc_date"].isoformat(),
        "doc_date_source": value["doc_date_source"],
        "expires": value["expires"].isoformat() if value["expires"] else None,
        "meta_dates": json.dumps(meta_dates),
        "tags": json.dumps(value["tags"]),
        "language": value["language"],
        "language_source": value["language_source"],
        "status": "active",
        "last_seen": now,
        "ingested_at": now,
    }
    with store.transaction():
        if row is None:
            fields["first_seen"] = now
            names = ", ".join(fields)
            doc_id = store.db.execute(
                f"INSERT INTO documents({names}) VALUES ({','.join('?' * len(fields))})", list(fields.values())
            ).lastrowid
        else:
            doc_id = row["id"]
            store.db.execute(
                f"UPDATE documents SET {', '.join(k + '=?' for k in fields)} WHERE id=?", [*fields.values(), doc_id]
            )
            store.db.execute("DELETE FROM passages WHERE document_id=?", [doc_id])
        for passage, tokens, statements in value["passages"]:
            pid = store.db.execute(
                "INSERT INTO passages(document_id, ordinal, text, heading_path, page, char_start, char_end, "
                "token_ids, token_count) VALUES (?,?,?,?,?,?,?,?,?)",
                [
                    doc_id,
                    passage.ordinal,
                    passage.text,
                    json.dumps(list(passage.heading_path), ensure_ascii=False),
                    passage.page,
                    passage.char_start,
                    passage.char_end,
                    vocabulary.ids(tokens).tobytes(),
                    len(tokens),
                ],
            ).lastrowid
            store.db.conn.executemany(
                "INSERT INTO statements(passage_id, expression, sentence, start, end, granularity, role, "
                "char_start, char_end, timex_type, timex_value) VALUES (?,?,?,?,?,?,?,?,?,?,?)",
                [
                    (
                        pid,
                        s.expression,
                        s.text,
                        s.start.isoformat(),
                        s.end.isoformat(),
                        s.granularity,
                        s.role,
                        s.char_start,
                        s.char_end,
                        s.timex_type,
                        s.value,
                    )
                    for s in statements
                ],
            )
        store.db.execute("DELETE FROM ingest_errors WHERE path=?", [f.doc_path])
    return len(value["passages"])


def _mark_removed(store, known: dict, seen: set[str], now: str) -> int:
    gone = [row for path, row in known.items() if path not in seen and row["status"] != "removed"]
    with store.transaction():
        for row in gone:
            store.db.execute("DELETE FROM passages WHERE document_id=?", [row["id"]])
            store.db.execute("UPDATE documents SET status='removed', ingested_at=? WHERE id=?", [now, row["id"]])
    return len(gone)


def _same_language_rule(config, rel: str, row) -> bool:
    """False when the config's `[languages]` globs now decide this file's language differently
    from when it was stored, so that it is parsed and tokenized again."""
    mapped = language_from_config(config, rel)
    if mapped is None:
        return row["language_source"] != "config"
    return row["language_source"] == "config" and row["language"] == mapped


def _retokenize_if_needed(store, tokenizer) -> int:
    """Re-tokenize every stored passage when the tokenizer fingerprint changed; returns how many.

    A document stored before languages were recorded (schema 1 or 2) gets its language detected from
    its passages first."""
    fingerprint = tokenizer.fingerprint()
    stored = store.get_meta("tokenizer")
    if stored == fingerprint:
        return 0
    rows = store.query(
        "SELECT p.id, p.text, p.document_id, d.language FROM passages p JOIN documents d ON d.id = p.document_id "
        "ORDER BY p.document_id, p.ordinal"
    )
    unknown: dict[int, list[Block]] = {}
    for row in rows:
        if row["language"] is None:
            unknown.setdefault(row["document_id"], []).append(Block(row["text"]))
    languages = {
        doc_id: document_language(None, None, blocks, tokenizer.candidates)[0] for doc_id, blocks in unknown.items()
    }
    with store.transaction():
        for doc_id, language in languages.items():
            store.db.execute(
                "UPDATE documents SET language=?, language_source='detected' WHERE id=?", [language, doc_id]
            )
        if rows:
            store.db.execute("DELETE FROM terms")
            vocabulary = Vocabulary(store)
            for row in rows:
                tokens = tokenizer.tokenize(row["text"], row["language"] or languages[row["document_id"]])
                store.db.execute(
                    "UPDATE passages SET token_ids=?, token_count=? WHERE id=?",
                    [vocabulary.ids(tokens).tobytes(), len(tokens), row["id"]],
                )
        store.set_meta("tokenizer", fingerprint)
    return len(rows)


class _Progress:
    """A one-line progress bar on stderr (only used when stderr is a terminal)."""

    def __init__(self, total: int):
        self.total, self.count, self.started = total, 0, time.monotonic()

    def step(self, name: str) -> None:
        self.count += 1
        width = 30
        filled = int(width * self.count / max(1, self.total))
        sys.stderr.write(
            f"\ringest [{'#' * filled}{'.' * (width - filled)}] {self.count}/{self.total} {name[-40:]:<40}"
        )
        sys.stderr.flush()

    def done(self) -> None:
        sys.stderr.write(
            f"\ringest: parsed {self.count} files in {time.monotonic() - self.started:.1f} s" + " " * 60 + "\n"
        )
        sys.stderr.flush()
