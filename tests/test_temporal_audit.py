"""TIMEX3 kinds through ingest, the store and the audit: what the extractor reads reaches the
passage's freshness in the run object, and an older store is migrated to hold it."""

from __future__ import annotations

import sqlite3
from datetime import date

from auditor.config import Config
from auditor.ingest.pipeline import ingest_corpus
from auditor.judgement.audit import run_audit
from auditor.models import Question
from auditor.store import SCHEMA, SCHEMA_VERSION, Store
from tests.ingest_helpers import config_for, write_tree


def test_currently_in_a_document_dated_2026_11_20_is_as_of_that_date_in_the_audit(tmp_path):
    root = write_tree(
        tmp_path / "kb",
        {
            "fees.md": "---\nupdated: 2026-11-20\n---\n# Late fees\n\n"
            "Updated March 2025: the late payment fee is currently $12 per bill.\n"
        },
    )
    with Store(tmp_path / "audit.db") as store:
        ingest_corpus(store, config_for(root), jobs=1)
        row = store.query("SELECT timex_type, timex_value, role FROM statements WHERE expression = 'currently'")
        assert row == [{"timex_type": "DATE", "timex_value": "PRESENT_REF", "role": "as_of"}]
        questions = [Question("q1", "What is the late payment fee?")]
        run = run_audit(store, Config(), questions, as_of=date(2027, 1, 15))
    evidence = run.questions[0].evidence[0]
    # without "currently" the passage would be as of 2025-03-31 and too old at a 365-day horizon
    assert (evidence.as_of, evidence.as_of_source) == ("2026-11-20", "statement")


def test_a_version_1_store_gains_the_timex_columns(tmp_path):
    # the version-1 schema is today's without the two TIMEX3 columns (version 3) and the document
    # language columns (version 4)
    path = tmp_path / "old.db"
    lines = [line for line in SCHEMA.splitlines() if not line.lstrip().startswith(("timex_", "language"))]
    old = "\n".join(lines).replace("char_end    INTEGER NOT NULL,\n);", "char_end    INTEGER NOT NULL\n);")
    db = sqlite3.connect(path)
    db.executescript(old)
    db.execute("INSERT INTO meta (key, value) VALUES ('schema_version', '1')")
    db.commit()
    db.close()
    assert "timex_type" not in [r[1] for r in sqlite3.connect(path).execute("PRAGMA table_info(statements)")]
    with Store(path) as store:
        assert store.get_meta("schema_version") == str(SCHEMA_VERSION) == "4"
    columns = [r[1] for r in sqlite3.connect(path).execute("PRAGMA table_info(statements)")]
    assert columns[-2:] == ["timex_type", "timex_value"]
