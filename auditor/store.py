"""The SQLite store: schema (versioned), connection and transactions.

Every stage reads and writes through this one file, so each stage can be re-run alone. The schema is
a commented constant; `schema_version` in the `meta` table says which one a database holds. A
database of a newer version is refused; an older one is migrated by the steps in `MIGRATIONS`.
"""

from __future__ import annotations

import contextlib
import json
import sqlite3
from collections.abc import Iterator, Sequence, Sized
from pathlib import Path
from typing import TypeVar

import sqlite_utils

from auditor.errors import StoreError

SCHEMA_VERSION = 4

SCHEMA = """
-- Key/value facts about the database itself: schema_version, tokenizer fingerprint, ...
CREATE TABLE IF NOT EXISTS meta (
    key   TEXT PRIMARY KEY,
    value TEXT NOT NULL
);

-- One row per file ever seen under a source root. `path` is relative to the root and is the
-- identity; `sha256` decides whether the file is re-parsed. Removed files stay (status 'removed')
-- so run history can still name them, but their passages are not searched.
CREATE TABLE IF NOT EXISTS documents (
    id              INTEGER PRIMARY KEY,
    path            TEXT NOT NULL UNIQUE,
    source_root     TEXT NOT NULL,
    kind            TEXT NOT NULL,          -- pdf | html | markdown | text
    sha256          TEXT NOT NULL,
    size            INTEGER NOT NULL,
    mtime           TEXT NOT NULL,          -- ISO 8601 file modification time (last-resort date)
    title           TEXT,
    owner           TEXT NOT NULL DEFAULT 'unassigned',
    owner_source    TEXT NOT NULL DEFAULT 'default',  -- front_matter | config | default
    doc_date        TEXT,                   -- ISO date: the most specific metadata date
    doc_date_source TEXT,                   -- e.g. 'front_matter:updated', 'pdf:info:ModDate', 'file:mtime'
    expires         TEXT,                   -- ISO date from metadata (front matter, schema.org, OG)
    meta_dates      TEXT NOT NULL DEFAULT '[]',  -- JSON list of every MetaDate found
    tags            TEXT NOT NULL DEFAULT '[]',
    language        TEXT,                   -- Snowball name, e.g. 'german' (docs/languages.md)
    language_source TEXT,                   -- config | document | detected | fallback
    status          TEXT NOT NULL DEFAULT 'active',  -- active | removed | failed
    first_seen      TEXT NOT NULL,
    last_seen       TEXT NOT NULL,
    ingested_at     TEXT NOT NULL
);

-- Passages: the retrievable units. `token_ids` is a little-endian int32 array of `terms.id`, stored
-- at ingest so the BM25 index builds without re-tokenizing.
CREATE TABLE IF NOT EXISTS passages (
    id           INTEGER PRIMARY KEY,
    document_id  INTEGER NOT NULL REFERENCES documents(id) ON DELETE CASCADE,
    ordinal      INTEGER NOT NULL,
    text         TEXT NOT NULL,
    heading_path TEXT NOT NULL DEFAULT '[]',  -- JSON list, e.g. ["Billing", "Late fees"]
    page         INTEGER,
    char_start   INTEGER NOT NULL,
    char_end     INTEGER NOT NULL,
    token_ids    BLOB NOT NULL,
    token_count  INTEGER NOT NULL,
    UNIQUE (document_id, ordinal)
);
CREATE INDEX IF NOT EXISTS passages_document ON passages(document_id);

-- Vocabulary of the stored token ids. A change of tokenizer settings (meta 'tokenizer')
-- invalidates it together with passages.token_ids.
CREATE TABLE IF NOT EXISTS terms (
    id   INTEGER PRIMARY KEY,
    term TEXT NOT NULL UNIQUE
);

-- Dated statements: every temporal expression found in a passage, normalized (docs/dates.md).
CREATE TABLE IF NOT EXISTS statements (
    id          INTEGER PRIMARY KEY,
    passage_id  INTEGER NOT NULL REFERENCES passages(id) ON DELETE CASCADE,
    expression  TEXT NOT NULL,
    sentence    TEXT NOT NULL,
    start       TEXT NOT NULL,
    end         TEXT NOT NULL,
    granularity TEXT NOT NULL,
    role        TEXT NOT NULL,
    char_start  INTEGER NOT NULL,
    char_end    INTEGER NOT NULL,
    timex_type  TEXT NOT NULL DEFAULT 'DATE',  -- TIMEX3 type: DATE, TIME, DURATION, SET
    timex_value TEXT                           -- TIMEX3 value (2026-03-05, P3D, PRESENT_REF); NULL for a range
);
CREATE INDEX IF NOT EXISTS statements_passage ON statements(passage_id);

-- Files that could not be ingested in the latest ingest of their root, with the reason. Replaced
-- per file on every ingest, so a fixed file drops out.
CREATE TABLE IF NOT EXISTS ingest_errors (
    path        TEXT PRIMARY KEY,
    source_root TEXT NOT NULL,
    kind        TEXT NOT NULL,              -- e.g. encrypted, needs_ocr, too_large, unreadable, parse
    error       TEXT NOT NULL,
    recorded_at TEXT NOT NULL
);

-- Question sets as last loaded, in file order. Query-log text is redacted before it gets here:
-- nothing personal is ever stored.
CREATE TABLE IF NOT EXISTS questions (
    set_name     TEXT NOT NULL,             -- the question file's name
    position     INTEGER NOT NULL,
    qid          TEXT NOT NULL,
    question     TEXT NOT NULL,
    owner        TEXT,
    topic        TEXT,
    weight       REAL NOT NULL DEFAULT 1.0,
    horizon_days INTEGER,
    PRIMARY KEY (set_name, position)
);

-- What each query-log import redacted, by kind (docs/question-sets.md): counts only, never a
-- value. Kind 'dropped_strict' counts the records the `strict` option dropped.
CREATE TABLE IF NOT EXISTS redaction_counts (
    set_name TEXT NOT NULL,                 -- the query log's file name, as in questions.set_name
    kind     TEXT NOT NULL,                 -- email | iban | national_id | card | ... | dropped_strict
    count    INTEGER NOT NULL,
    PRIMARY KEY (set_name, kind)
);

-- Audit runs: what was audited with which settings, and the summary.
CREATE TABLE IF NOT EXISTS runs (
    id                 INTEGER PRIMARY KEY,
    started            TEXT NOT NULL,
    finished           TEXT,
    status             TEXT NOT NULL DEFAULT 'running',  -- running | done | failed
    as_of              TEXT NOT NULL,
    horizon_days       INTEGER NOT NULL,
    config_fingerprint TEXT NOT NULL DEFAULT '',
    corpus_fingerprint TEXT NOT NULL DEFAULT '',
    thresholds         TEXT NOT NULL DEFAULT '{}',  -- JSON: the support thresholds used
    corpus             TEXT NOT NULL DEFAULT '{}',  -- JSON: results.json run.corpus
    summary            TEXT NOT NULL DEFAULT '{}',  -- JSON: results.json summary
    gate               TEXT,                        -- JSON: gate outcome, when a gate ran
    ingest_errors      TEXT NOT NULL DEFAULT '[]',  -- JSON: results.json ingest_errors at run time
    extras             TEXT NOT NULL DEFAULT '{}'   -- JSON: report-only parts (documents inventory, briefs)
);

-- Per-question results of a run, in question-set order. `result` is the results.json question
-- object, so a stored run can be reported again without re-auditing.
CREATE TABLE IF NOT EXISTS results (
    run_id   INTEGER NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
    position INTEGER NOT NULL,
    qid      TEXT NOT NULL,
    verdict  TEXT NOT NULL,
    weight   REAL NOT NULL,
    result   TEXT NOT NULL,
    PRIMARY KEY (run_id, position)
);
CREATE INDEX IF NOT EXISTS results_qid ON results(run_id, qid);

-- Thresholds chosen by `auditor calibrate`; the newest row is used by later audits.
CREATE TABLE IF NOT EXISTS calibrations (
    id         INTEGER PRIMARY KEY,
    created    TEXT NOT NULL,
    labels     TEXT NOT NULL,       -- the labels file it was computed from
    thresholds TEXT NOT NULL,       -- JSON: {"support": 0.42, "weak_margin": 0.05, ...}
    metrics    TEXT NOT NULL DEFAULT '{}'
);
"""

# Documents whose passages are searched: a file that failed to re-parse keeps its last good version
# searchable (the assistant's own index most likely still holds it) while the report lists the error.
SEARCHED = ("active", "failed")
SEARCHED_STATUSES = "(" + ", ".join(f"'{status}'" for status in SEARCHED) + ")"  # the same, as SQL

# Values bound in one `IN (?, ...)` list: under SQLite's default limit on bound parameters
# (SQLITE_MAX_VARIABLE_NUMBER, sqlite.org/limits.html: 999 before 3.32.0, 32766 since).
CHUNK = 500
_T = TypeVar("_T")

# version -> SQL that brings a database of version-1 to that version.
MIGRATIONS: dict[int, str] = {
    2: """
CREATE TABLE IF NOT EXISTS redaction_counts (
    set_name TEXT NOT NULL,
    kind     TEXT NOT NULL,
    count    INTEGER NOT NULL,
    PRIMARY KEY (set_name, kind)
);
""",
    # 3: the TIMEX3 type and value of each dated statement (docs/dates.md); statements stored before
    # read as DATE with no value until their file is ingested again (the temporal code is part of
    # the parser fingerprint, so the next ingest re-reads every file)
    3: """
ALTER TABLE statements ADD COLUMN timex_type TEXT NOT NULL DEFAULT 'DATE';
ALTER TABLE statements ADD COLUMN timex_value TEXT;
""",
    # The language of each document (NULL until the ingest re-tokenizes or re-parses it).
    4: """
ALTER TABLE documents ADD COLUMN language TEXT;
ALTER TABLE documents ADD COLUMN language_source TEXT;
""",
}


class Store:
    """A connection to the audit database (sqlite-utils `Database`) with the schema ensured."""

    def __init__(self, path: str | Path):
        self.path = Path(path)
        try:
            if self.path.parent and not self.path.parent.exists():
                self.path.parent.mkdir(parents=True, exist_ok=True)
            conn = sqlite3.connect(str(self.path), timeout=30, isolation_level=None)
            self.db = sqlite_utils.Database(conn)
            self.db.execute("PRAGMA foreign_keys = ON")
            self.db.execute("PRAGMA busy_timeout = 30000")
            if self.db.journal_mode != "wal":
                self.db.enable_wal()
            self._ensure_schema()
        except sqlite3.DatabaseError as exc:
            raise StoreError(f"{str(self.path)!r}: cannot open the audit database ({exc})") from exc

    # -- schema ------------------------------------------------------------------------------------
    def _ensure_schema(self) -> None:
        tables = set(self.db.table_names())
        if "meta" in tables:
            row = self.db.execute("SELECT value FROM meta WHERE key = 'schema_version'").fetchone()
            version = int(row[0]) if row else 0
            if version > SCHEMA_VERSION:
                raise StoreError(
                    f"{str(self.path)!r}: database schema version {version} is newer than this "
                    f"auditor's ({SCHEMA_VERSION}); upgrade the auditor or use another --db"
                )
            if version < SCHEMA_VERSION:
                self._migrate(version)
            return
        if tables:
            raise StoreError(f"{str(self.path)!r}: not an audit database (no meta table); use another --db")
        with self.transaction():
            self._executescript(SCHEMA)
            self.set_meta("schema_version", str(SCHEMA_VERSION))

    def _executescript(self, sql: str) -> None:
        # executescript() would COMMIT our open transaction; run statement by statement instead,
        # letting SQLite's own tokenizer say where a statement ends (comments may hold semicolons).
        buffer = ""
        for line in sql.splitlines(keepends=True):
            buffer += line
            if sqlite3.complete_statement(buffer):
                self.db.execute(buffer)
                buffer = ""

    def _migrate(self, version: int) -> None:
        with self.transaction():
            for target in range(version + 1, SCHEMA_VERSION + 1):
                self._executescript(MIGRATIONS[target])
            self.set_meta("schema_version", str(SCHEMA_VERSION))
        ok = self.db.execute("PRAGMA integrity_check").fetchone()[0]
        if ok != "ok":
            raise StoreError(f"{str(self.path)!r}: integrity check failed after migration: {ok}")

    # -- helpers -----------------------------------------------------------------------------------
    @contextlib.contextmanager
    def transaction(self) -> Iterator[sqlite_utils.Database]:
        """All-or-nothing writes; nested calls become savepoints."""
        with self.db.atomic() as db:
            yield db

    def get_meta(self, key: str, default: str | None = None) -> str | None:
        row = self.db.execute("SELECT value FROM meta WHERE key = ?", [key]).fetchone()
        return row[0] if row else default

    def set_meta(self, key: str, value: str) -> None:
        self.db.execute(
            "INSERT INTO meta(key, value) VALUES (?, ?) ON CONFLICT(key) DO UPDATE SET value = excluded.value",
            [key, value],
        )

    def query(self, sql: str, params=()) -> list[dict]:
        return list(self.db.query(sql, params))

    def close(self) -> None:
        self.db.conn.close()

    def __enter__(self) -> Store:
        return self

    def __exit__(self, *exc) -> None:
        self.close()


def chunked(values: Sequence[_T], size: int = CHUNK) -> Iterator[Sequence[_T]]:
    """`values` in slices of at most `size`, for `IN (...)` queries over long id lists."""
    for start in range(0, len(values), size):
        yield values[start : start + size]


def marks(values: Sized) -> str:
    """The `?, ?, ...` placeholders of an `IN (...)` list of `values`."""
    return ",".join("?" * len(values))


def dumps(value) -> str:
    """JSON as stored: compact and key-sorted so that equal data gives equal bytes."""
    return json.dumps(value, sort_keys=True, separators=(",", ":"), ensure_ascii=False, default=str)
