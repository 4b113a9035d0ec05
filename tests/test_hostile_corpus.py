"""A hostile corpus (tests/hostile_corpus.py) mixed with good files, ingested through the CLI: the run
finishes with exit code 0, every file is accounted for — an active document or a row in
ingest_errors with a kind and a one-line message naming the file — and every good file is ingested
with its words searchable."""

from __future__ import annotations

import os
import sqlite3
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

from auditor.store import Store
from tests import hostile_corpus

REPO = Path(__file__).resolve().parent.parent


def run_cli(args: list[str], cwd: Path) -> subprocess.CompletedProcess:
    env = dict(os.environ, PYTHONPATH=str(REPO))
    return subprocess.run(
        [sys.executable, "-c", "from auditor.cli import main; main()", *args],
        cwd=cwd,
        env=env,
        capture_output=True,
        timeout=600,
    )


@pytest.fixture(scope="module")
def ingested(tmp_path_factory):
    base = tmp_path_factory.mktemp("hostile")
    corpus = hostile_corpus.build(base / "kb")
    (base / "audit.toml").write_text("[corpus]\ntimeout_s = 120\n", encoding="utf-8")
    result = run_cli(
        ["ingest", str(corpus.root), "-c", str(base / "audit.toml"), "--db", str(base / "a.db"), "-q"], base
    )
    return corpus, result, base / "a.db"


def test_the_run_finishes_with_exit_code_0(ingested):
    corpus, result, _ = ingested
    assert result.returncode == 0, result.stderr.decode(errors="replace")[-2000:]
    import re

    line = result.stdout.decode().strip().splitlines()[-1]
    new, failed = map(int, re.fullmatch(r"(\d+) new, 0 changed, 0 unchanged, 0 removed, (\d+) failed", line).groups())
    assert new + failed == len(corpus.all_files()) and new >= len(corpus.good)


def _rows(db: Path):
    with Store(db) as store:
        docs = {r["path"]: r for r in store.query("SELECT id, path, status FROM documents")}
        errors = {r["path"]: r for r in store.query("SELECT path, kind, error FROM ingest_errors")}
    return docs, errors


def test_every_file_is_accounted_for(ingested):
    corpus, result, db = ingested
    assert result.returncode == 0
    docs, errors = _rows(db)
    active = {p for p, r in docs.items() if r["status"] == "active"}
    assert active | set(errors) == {hostile_corpus.storable(p) for p in corpus.all_files()}
    assert not active & set(errors)
    root = str(corpus.root)
    for path, row in errors.items():
        assert row["kind"] and row["error"]
        assert row["error"].startswith(repr(os.path.join(root, path)) + ": "), row["error"]
        assert "\n" not in row["error"].replace("\\n", "")
        if path in corpus.expected_kinds:
            assert row["kind"] in corpus.expected_kinds[path], (path, row)


def test_every_good_file_is_ingested_with_its_words(ingested):
    corpus, result, db = ingested
    assert result.returncode == 0
    from auditor.retrieval.tokenize import Tokenizer
    from auditor.retrieval.vocabulary import Vocabulary

    with Store(db) as store:
        terms = Vocabulary(store).terms()
        for path, word in corpus.good.items():
            rows = store.query(
                "SELECT p.token_ids FROM passages p JOIN documents d ON d.id = p.document_id "
                "WHERE d.path = ? AND d.status = 'active'",
                [hostile_corpus.storable(path)],
            )
            assert rows, path
            found = {terms[int(i)] for r in rows for i in np.frombuffer(r["token_ids"], dtype="<i4")}
            assert Tokenizer().tokenize(word)[0] in found, (path, word, sorted(found)[:20])


def test_the_sparse_gigabyte_is_refused_by_size_unread(ingested):
    corpus, result, db = ingested
    assert result.returncode == 0
    _, errors = _rows(db)
    row = errors["sparse-1gb.txt"]
    assert row["kind"] == "too_large" and "1024.0 MB, over the 50 MB limit" in row["error"]
    # os.truncate made it sparse: the test used no disk for it.
    assert (corpus.root / "sparse-1gb.txt").stat().st_blocks == 0


def test_a_deep_page_tree_is_an_ingest_failure():
    from auditor.ingest.failures import IngestFailure
    from auditor.ingest.pdf import parse_pdf

    with pytest.raises(IngestFailure, match="damaged PDF"):
        parse_pdf(hostile_corpus.pdf_deep_page_tree(), "deep.pdf")


def test_a_corpus_of_more_files_than_sql_variables_ingests(tmp_path):
    # Stock SQLite (and Python's bundled builds) allow 32,766 host parameters, Debian's 250,000; the
    # limit is lowered here so that 300 files stand for 33,000 (sqlite3.Connection.setlimit, 3.11+).
    from auditor.config import Config, CorpusConfig
    from auditor.ingest.pipeline import ingest_corpus

    root = tmp_path / "kb"
    root.mkdir()
    for i in range(300):
        (root / f"doc{i:03d}.txt").write_text(f"Note {i}\n\nMeters are read every month in zone {i}.\n")
    with Store(tmp_path / "a.db") as store:
        store.db.conn.setlimit(sqlite3.SQLITE_LIMIT_VARIABLE_NUMBER, 250)
        summary = ingest_corpus(store, Config(corpus=CorpusConfig(paths=(root,), jobs=1)), jobs=1)
        assert summary.new == 300


def test_a_file_name_that_is_not_utf8_costs_nothing_but_itself(tmp_path):
    root = tmp_path / "kb"
    root.mkdir()
    (root / "good.md").write_text("# Leaks\n\nReport a leak on the hotline.\n", encoding="utf-8")
    with open(os.path.join(os.fsencode(root), hostile_corpus.UNDECODABLE), "wb") as handle:
        handle.write(b"# Summer\n\nThe summer watering schedule.\n")
    result = run_cli(["ingest", str(root), "--db", str(tmp_path / "a.db"), "-q"], tmp_path)
    assert result.returncode == 0, result.stderr.decode(errors="replace")[-500:]
    with Store(tmp_path / "a.db") as store:
        paths = {r["path"] for r in store.query("SELECT path FROM documents WHERE status = 'active'")}
        errors = {r["path"] for r in store.query("SELECT path FROM ingest_errors")}
    # Ingested (under an escaped name) or recorded: either way accounted for, and the good file in.
    assert "good.md" in paths
    assert hostile_corpus.storable(os.fsdecode(hostile_corpus.UNDECODABLE)) in paths | errors
